// scripts/build-electron-sqlite.mjs: its arguments, the paths it builds from and to, and that it
// stops with one line when Electron's headers cannot be had. The compile itself needs Electron's
// headers from the network and cannot run on this machine; here node-gyp is a fake that writes a
// file. The node-gyp flags are those of Electron's guide "Using Native Node Modules", "Manually
// building for Electron" (electronjs.org/docs/latest/tutorial/using-native-node-modules; recalled
// from memory): --target=<Electron version> --arch=<arch> --dist-url=https://electronjs.org/headers.
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import {
  checkHeaders, ELECTRON_ADDON, electronVersion, main, nodeGypCandidates, parseArgs, planBuild, PROJECT_ROOT, UsageError,
} from '../scripts/build-electron-sqlite.mjs';
import { ELECTRON_ADDON as SHELL_ADDON } from '../src/main/desktop/field-log.js';
import { tempDir } from './db-helpers.js';

vi.mock('electron', () => {
  throw new Error('the build script must not load electron');
});

/** A project with node_modules/electron (version only) and a better-sqlite3 holding a Node build. */
function fakeProject(version = '45.5.0') {
  const root = tempDir();
  mkdirSync(join(root, 'node_modules', 'electron'), { recursive: true });
  writeFileSync(join(root, 'node_modules', 'electron', 'package.json'), JSON.stringify({ name: 'electron', version }));
  const bs3 = join(root, 'node_modules', 'better-sqlite3');
  mkdirSync(join(bs3, 'build', 'Release'), { recursive: true });
  mkdirSync(join(bs3, 'src'));
  writeFileSync(join(bs3, 'binding.gyp'), '{}');
  writeFileSync(join(bs3, 'src', 'better_sqlite3.cpp'), '// source');
  writeFileSync(join(bs3, 'build', 'Release', 'better_sqlite3.node'), 'NODE BUILD');
  const nodeGyp = join(root, 'node_modules', 'node-gyp', 'bin', 'node-gyp.js');
  mkdirSync(join(nodeGyp, '..'), { recursive: true });
  writeFileSync(nodeGyp, '');
  return { root, bs3, nodeGyp, home: join(root, 'home'), tmp: tempDir() };
}

const machine = (p: ReturnType<typeof fakeProject>) => ({ root: p.root, env: {}, execPath: '/usr/bin/node', platform: 'linux', arch: 'x64', home: p.home });

describe('arguments', () => {
  it('defaults, and --name=value options', () => {
    expect(parseArgs([])).toEqual({ dryRun: false, help: false });
    expect(parseArgs(['--electron-version=45.5.0', '--arch=arm64', '--nodedir=/h', '--node-gyp=/g.js', '--dry-run'])).toEqual({
      dryRun: true, help: false, electronVersion: '45.5.0', arch: 'arm64', nodedir: '/h', nodeGyp: '/g.js',
    });
  });

  it('refuses what it does not know, with the reason', () => {
    expect(() => parseArgs(['--target'])).toThrow(UsageError);
    expect(() => parseArgs(['--arch'])).toThrow(/--arch needs a value/);
    expect(() => parseArgs(['--arch='])).toThrow(/--arch needs a value/);
    expect(() => parseArgs(['--electron-version=latest'])).toThrow(/must be a version such as 45\.5\.0/);
    expect(() => parseArgs(['rebuild'])).toThrow(/unknown argument "rebuild"/);
  });
});

describe('the plan', () => {
  it('writes where the desktop shell looks, never into the Node build', () => {
    // The same relative path on both sides: field-log.ts reads what the script writes.
    expect(ELECTRON_ADDON).toBe(SHELL_ADDON);
    const p = fakeProject('45.5.0');
    const plan = planBuild(parseArgs([]), machine(p));
    expect(plan.version).toBe('45.5.0');
    expect(plan.output).toBe(join(p.root, 'native', 'electron', 'better_sqlite3.node'));
    expect(plan.source).toBe(p.bs3);
    expect(plan.nodeBuild).toBe(join(p.bs3, 'build'));
    expect(plan.output.startsWith(plan.nodeBuild)).toBe(false);
    expect(plan.headersUrl).toBe('https://electronjs.org/headers/v45.5.0/node-v45.5.0-headers.tar.gz');
    expect(plan.gypArgs).toEqual([
      'rebuild', '--release', '--target=45.5.0', '--arch=x64', '--dist-url=https://electronjs.org/headers', `--devdir=${join(p.home, '.electron-gyp')}`,
    ]);
    const pinned = planBuild(parseArgs(['--electron-version=46.0.1', '--arch=arm64', '--nodedir=rel/headers']), machine(p));
    expect(pinned.gypArgs).toContain('--target=46.0.1');
    expect(pinned.gypArgs).toContain('--arch=arm64');
    expect(pinned.gypArgs.at(-1)).toBe(`--nodedir=${join(process.cwd(), 'rel', 'headers')}`);
  });

  it('reads the Electron version from the installed package, or says what is missing', () => {
    // package.json pins "electron": "45.5.0" (devDependencies), and that package is installed here.
    expect(electronVersion(PROJECT_ROOT)).toBe('45.5.0');
    expect(() => electronVersion(tempDir())).toThrow(/node_modules[/\\]electron[/\\]package\.json is missing/);
  });

  it('looks for node-gyp where npm, the project and npm\'s own copy keep it', () => {
    const ctx = { root: '/p', env: { npm_config_node_gyp: '/npm/node-gyp.js' }, execPath: '/usr/bin/node', platform: 'linux', arch: 'x64', home: '/h' };
    expect(nodeGypCandidates({ ...ctx, nodeGyp: '/mine.js' })).toEqual([
      '/mine.js', '/npm/node-gyp.js', '/p/node_modules/node-gyp/bin/node-gyp.js', '/usr/lib/node_modules/npm/node_modules/node-gyp/bin/node-gyp.js',
    ]);
    // Windows keeps npm beside node.exe (common practice of the Node installer).
    expect(nodeGypCandidates({ ...ctx, env: {}, execPath: '/nodejs/node.exe', platform: 'win32' }).at(-1))
      .toBe('/nodejs/node_modules/npm/node_modules/node-gyp/bin/node-gyp.js');
  });
});

describe('the headers', () => {
  const p = fakeProject();
  const plan = planBuild(parseArgs([]), machine(p));
  const unreachable = vi.fn(async () => 'fetch failed: ENOTFOUND');

  it('an unpacked copy named with --nodedir is used as it is, or refused when it is not one', async () => {
    const headers = join(p.root, 'headers');
    mkdirSync(join(headers, 'include', 'node'), { recursive: true });
    expect(await checkHeaders(planBuild(parseArgs([`--nodedir=${p.root}`]), machine(p)), unreachable)).toMatch(/holds no include\/node\/node\.h/);
    writeFileSync(join(headers, 'include', 'node', 'node.h'), '');
    expect(await checkHeaders(planBuild(parseArgs([`--nodedir=${headers}`]), machine(p)), unreachable)).toBeUndefined();
    expect(unreachable).not.toHaveBeenCalled();
  });

  it('unreachable: one line naming the address and the way out', async () => {
    const problem = await checkHeaders(plan, unreachable);
    expect(problem).toBe("cannot reach Electron 45.5.0's headers at https://electronjs.org/headers/v45.5.0/node-v45.5.0-headers.tar.gz (fetch failed: ENOTFOUND); run this on a machine with network access, or pass --nodedir=<unpacked Electron headers>");
    expect(problem).not.toContain('\n');
  });

  it('already in node-gyp\'s cache: no network needed', async () => {
    mkdirSync(join(plan.devdir, '45.5.0', 'include', 'node'), { recursive: true });
    writeFileSync(join(plan.devdir, '45.5.0', 'include', 'node', 'node.h'), '');
    const probe = vi.fn(async () => 'should not be asked');
    expect(await checkHeaders(plan, probe)).toBeUndefined();
    expect(probe).not.toHaveBeenCalled();
  });
});

describe('main', () => {
  function run(argv: string[], p: ReturnType<typeof fakeProject>, over: Record<string, unknown> = {}) {
    const out: string[] = [];
    const err: string[] = [];
    const gyp = vi.fn((_command: string, _args: string[], cwd: string) => {
      // The copy it compiles in has no build/ of its own: the Node build stayed behind.
      expect(existsSync(join(cwd, 'build'))).toBe(false);
      expect(existsSync(join(cwd, 'src', 'better_sqlite3.cpp'))).toBe(true);
      mkdirSync(join(cwd, 'build', 'Release'), { recursive: true });
      writeFileSync(join(cwd, 'build', 'Release', 'better_sqlite3.node'), 'ELECTRON BUILD');
      return 0;
    });
    const deps = { ...machine(p), tmp: p.tmp, probe: async () => undefined, run: gyp, out: (t: string) => out.push(t), err: (t: string) => err.push(t), ...over };
    return { status: main(argv, deps), out, err, gyp };
  }

  it('without the headers: exit 1, one line, nothing copied or compiled', async () => {
    const p = fakeProject();
    const r = run([], p, { probe: async () => 'fetch failed: ENOTFOUND' });
    expect(await r.status).toBe(1);
    expect(r.err.join('').trimEnd().split('\n')).toHaveLength(1);
    expect(r.err[0]).toMatch(/^build-electron-sqlite: cannot reach Electron 45\.5\.0's headers/);
    expect(r.gyp).not.toHaveBeenCalled();
    expect(existsSync(join(p.root, 'native'))).toBe(false);
    expect(readdirSync(p.tmp)).toEqual([]);
  });

  it('with them: compiles a copy and puts the result in native/electron, leaving the Node build as it was', async () => {
    const p = fakeProject();
    const r = run([], p);
    expect(await r.status).toBe(0);
    const [command, args] = r.gyp.mock.calls[0];
    expect(command).toBe('/usr/bin/node');
    expect(args[0]).toBe(p.nodeGyp);
    expect(args.slice(1)).toContain('--target=45.5.0');
    expect(readFileSync(join(p.root, 'native', 'electron', 'better_sqlite3.node'), 'utf8')).toBe('ELECTRON BUILD');
    expect(readFileSync(join(p.bs3, 'build', 'Release', 'better_sqlite3.node'), 'utf8')).toBe('NODE BUILD');
    expect(readdirSync(p.tmp)).toEqual([]); // the temporary copy is gone
    expect(r.out.join('')).toBe('build-electron-sqlite: wrote native/electron/better_sqlite3.node for Electron 45.5.0 (x64)\n');
  });

  it('a failed compile: exit 1, one line, nothing written', async () => {
    const p = fakeProject();
    const r = run([], p, { run: () => 2 });
    expect(await r.status).toBe(1);
    expect(r.err).toEqual(['build-electron-sqlite: node-gyp failed (exit 2); its output is above\n']);
    expect(existsSync(join(p.root, 'native'))).toBe(false);
  });

  it('bad arguments and a missing package: one line each', async () => {
    const p = fakeProject();
    const bad = run(['--bogus'], p);
    expect(await bad.status).toBe(1);
    expect(bad.err).toHaveLength(1);
    const bare = tempDir();
    const missing = run([], { ...p, root: bare }, { root: bare });
    expect(await missing.status).toBe(1);
    expect(missing.err[0]).toMatch(/electron[/\\]package\.json is missing/);
  });

  it('--dry-run on this project prints the plan and touches nothing', async () => {
    const out: string[] = [];
    const probe = vi.fn(async () => undefined);
    const gyp = vi.fn(() => 0);
    expect(await main(['--dry-run'], { probe, run: gyp, out: (t) => out.push(t), err: (t) => out.push(t) })).toBe(0);
    const plan = JSON.parse(out.join(''));
    expect(plan.output).toBe(join(PROJECT_ROOT, 'native', 'electron', 'better_sqlite3.node'));
    expect(plan.version).toBe('45.5.0');
    expect(probe).not.toHaveBeenCalled();
    expect(gyp).not.toHaveBeenCalled();
  });
});
