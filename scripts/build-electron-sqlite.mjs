/**
 * `npm run build:electron-sqlite`: compiles better-sqlite3 for Electron's ABI into
 * native/electron/better_sqlite3.node, where the desktop shell looks for it
 * (src/main/desktop/field-log.ts: electronAddonPath). The Node build in
 * node_modules/better-sqlite3/build/, which the tests and the command line load, is never touched:
 * the package is copied to a temporary folder (without its build/) and compiled there with node-gyp
 * against Electron's headers (electronjs.org/docs/latest/tutorial/using-native-node-modules,
 * "Manually building for Electron").
 *
 * It needs Electron's headers: downloaded from https://electronjs.org/headers by node-gyp, already in
 * node-gyp's cache (~/.electron-gyp), or unpacked somewhere and named with --nodedir. Without any of
 * them it stops with one line saying so, before it copies or compiles anything. It also needs what
 * any node-gyp build needs (Python 3 and a C++ compiler).
 *
 *   node scripts/build-electron-sqlite.mjs [--electron-version=X] [--arch=X] [--nodedir=DIR]
 *                                         [--node-gyp=FILE] [--dry-run]
 *
 *   parseArgs(argv), electronVersion(root), nodeGypCandidates(ctx), planBuild(options, ctx),
 *   checkHeaders(plan, probe), main(argv, deps): exit status
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { homedir, tmpdir } from 'node:os';
import { dirname, join, relative, resolve, isAbsolute } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The project folder: scripts/ is one folder down. */
export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
/** Below the project folder; the same path as ELECTRON_ADDON in src/main/desktop/field-log.ts. */
export const ELECTRON_ADDON = join('native', 'electron', 'better_sqlite3.node');
export const HEADERS_URL = 'https://electronjs.org/headers';

const NAME = 'build-electron-sqlite';
const USAGE = `usage: node scripts/${NAME}.mjs [--electron-version=X] [--arch=X] [--nodedir=DIR] [--node-gyp=FILE] [--dry-run]`;

export class UsageError extends Error {}

/** `--name=value` options; anything else is a usage error. */
export function parseArgs(argv) {
  const options = { dryRun: false, help: false };
  const valued = { '--electron-version': 'electronVersion', '--arch': 'arch', '--nodedir': 'nodedir', '--node-gyp': 'nodeGyp' };
  for (const arg of argv) {
    if (arg === '--dry-run') options.dryRun = true;
    else if (arg === '--help' || arg === '-h') options.help = true;
    else {
      const eq = arg.indexOf('=');
      const key = valued[eq < 0 ? arg : arg.slice(0, eq)];
      if (key === undefined) throw new UsageError(`unknown argument ${JSON.stringify(arg)}; ${USAGE}`);
      const value = eq < 0 ? '' : arg.slice(eq + 1);
      if (value === '') throw new UsageError(`${arg.split('=')[0]} needs a value (${arg.split('=')[0]}=…)`);
      options[key] = value;
    }
  }
  if (options.electronVersion !== undefined && !/^\d+\.\d+\.\d+(-[0-9A-Za-z.-]+)?$/.test(options.electronVersion)) {
    throw new UsageError(`--electron-version must be a version such as 45.5.0 (got ${JSON.stringify(options.electronVersion)})`);
  }
  return options;
}

/** The installed electron package's version: the ABI its binary expects. */
export function electronVersion(root) {
  const pkg = join(root, 'node_modules', 'electron', 'package.json');
  if (!existsSync(pkg)) throw new UsageError(`${pkg} is missing: install the project's packages first, or pass --electron-version=X`);
  const { version } = JSON.parse(readFileSync(pkg, 'utf8'));
  if (typeof version !== 'string' || version === '') throw new UsageError(`${pkg} names no version; pass --electron-version=X`);
  return version;
}

/**
 * Where node-gyp may be, best first: the one named, the one npm hands to scripts it runs
 * (npm_config_node_gyp), a project-local one, and the one bundled with npm beside this Node.
 */
export function nodeGypCandidates({ root, env, execPath, platform, nodeGyp }) {
  const nodeDir = dirname(execPath);
  const npmDir = platform === 'win32' ? join(nodeDir, 'node_modules', 'npm') : join(nodeDir, '..', 'lib', 'node_modules', 'npm');
  return [
    nodeGyp,
    env.npm_config_node_gyp,
    join(root, 'node_modules', 'node-gyp', 'bin', 'node-gyp.js'),
    join(npmDir, 'node_modules', 'node-gyp', 'bin', 'node-gyp.js'),
  ].filter((p) => typeof p === 'string' && p !== '').map((p) => resolve(p));
}

function isInside(child, parent) {
  const rel = relative(parent, child);
  return rel === '' || (!rel.startsWith('..') && !isAbsolute(rel));
}

/**
 * Everything the build will do, decided before it does any of it. `ctx` is the machine
 * ({ root, env, execPath, platform, arch, home }), so tests can describe one of their own.
 */
export function planBuild(options, ctx) {
  const version = options.electronVersion ?? electronVersion(ctx.root);
  const arch = options.arch ?? ctx.arch;
  const source = join(ctx.root, 'node_modules', 'better-sqlite3');
  const nodeBuild = join(source, 'build');
  const output = join(ctx.root, ELECTRON_ADDON);
  // Electron's headers get a cache of their own, apart from Node's, as Electron's guide does (~/.electron-gyp).
  const devdir = join(ctx.home, '.electron-gyp');
  const nodedir = options.nodedir === undefined ? undefined : resolve(options.nodedir);
  if (isInside(output, nodeBuild)) throw new UsageError(`refusing to write ${output}: it is inside the Node build ${nodeBuild}`);
  return {
    version,
    arch,
    source,
    nodeBuild,
    output,
    devdir,
    nodedir,
    headersUrl: `${HEADERS_URL}/v${version}/node-v${version}-headers.tar.gz`,
    nodeGypCandidates: nodeGypCandidates({ ...ctx, nodeGyp: options.nodeGyp }),
    gypArgs: [
      'rebuild',
      '--release',
      `--target=${version}`,
      `--arch=${arch}`,
      `--dist-url=${HEADERS_URL}`,
      `--devdir=${devdir}`,
      ...(nodedir === undefined ? [] : [`--nodedir=${nodedir}`]),
    ],
  };
}

const hasNodeH = (folder) => existsSync(join(folder, 'include', 'node', 'node.h'));

/** undefined when the headers are at hand; otherwise the one line that says why not. */
export async function checkHeaders(plan, probe) {
  if (plan.nodedir !== undefined) {
    return hasNodeH(plan.nodedir) ? undefined : `--nodedir=${plan.nodedir} holds no include/node/node.h: it is not an unpacked copy of Electron's headers`;
  }
  if (hasNodeH(join(plan.devdir, plan.version))) return undefined;
  const problem = await probe(plan.headersUrl);
  if (problem === undefined) return undefined;
  return `cannot reach Electron ${plan.version}'s headers at ${plan.headersUrl} (${problem}); run this on a machine with network access, or pass --nodedir=<unpacked Electron headers>`;
}

/** A HEAD request: enough to learn whether node-gyp's download would work. */
async function probeUrl(url) {
  try {
    const response = await fetch(url, { method: 'HEAD', redirect: 'follow', signal: AbortSignal.timeout(15_000) });
    return response.ok ? undefined : `HTTP ${response.status}`;
  } catch (e) {
    const cause = e?.cause?.code ?? e?.cause?.message;
    return cause === undefined ? String(e?.message ?? e) : `${e.message}: ${cause}`;
  }
}

const MACHINE = {
  root: PROJECT_ROOT,
  env: process.env,
  execPath: process.execPath,
  platform: process.platform,
  arch: process.arch,
  home: homedir(),
  tmp: tmpdir(),
  probe: probeUrl,
  run: (command, args, cwd) => spawnSync(command, args, { cwd, stdio: 'inherit' }).status ?? 1,
  out: (text) => process.stdout.write(text),
  err: (text) => process.stderr.write(text),
};

/** Returns the exit status; every failure is one line on stderr. */
export async function main(argv, deps = MACHINE) {
  const m = { ...MACHINE, ...deps };
  const fail = (line) => {
    m.err(`${NAME}: ${line}\n`);
    return 1;
  };
  let plan;
  let options;
  try {
    options = parseArgs(argv);
    if (options.help) {
      m.out(`${USAGE}\n`);
      return 0;
    }
    plan = planBuild(options, m);
  } catch (e) {
    if (e instanceof UsageError) return fail(e.message);
    throw e;
  }
  if (!existsSync(join(plan.source, 'binding.gyp'))) return fail(`${plan.source} is missing or has no binding.gyp: install the project's packages first`);
  const nodeGyp = plan.nodeGypCandidates.find((p) => existsSync(p));
  if (options.dryRun) {
    m.out(`${JSON.stringify({ ...plan, nodeGyp: nodeGyp ?? null }, null, 2)}\n`);
    return 0;
  }
  if (nodeGyp === undefined) return fail(`node-gyp not found (looked at ${plan.nodeGypCandidates.join(', ')}); pass --node-gyp=<path to bin/node-gyp.js>`);
  const headers = await checkHeaders(plan, m.probe);
  if (headers !== undefined) return fail(headers);

  const work = mkdtempSync(join(m.tmp, 'tauwell-bs3-electron-'));
  try {
    const copy = join(work, 'better-sqlite3');
    cpSync(plan.source, copy, { recursive: true, filter: (path) => !isInside(path, plan.nodeBuild) });
    const status = m.run(m.execPath, [nodeGyp, ...plan.gypArgs], copy);
    if (status !== 0) return fail(`node-gyp failed (exit ${status}); its output is above`);
    const built = join(copy, 'build', 'Release', 'better_sqlite3.node');
    if (!existsSync(built)) return fail(`node-gyp finished but ${built} is missing`);
    mkdirSync(dirname(plan.output), { recursive: true });
    copyFileSync(built, plan.output);
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
  m.out(`${NAME}: wrote ${relative(m.root, plan.output)} for Electron ${plan.version} (${plan.arch})\n`);
  return 0;
}

if (process.argv[1] !== undefined && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  process.exitCode = await main(process.argv.slice(2));
}
