// `tauwell serve`: opens the field log, prints the address with the token on a line of its own,
// serves until told to stop, then closes the field log.
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseArgs } from '../src/main/cli/args.js';
import { SERVE_COMMAND, serve } from '../src/main/cli/commands/serve.js';
import { openDatabase } from '../src/main/db/database.js';
import { startLoopbackServer } from '../src/main/server/index.js';
import { createServices } from '../src/main/services/index.js';
import { cli, tempDir } from './cli-helpers.js';

function demoLog(): { dir: string; file: string } {
  const dir = tempDir();
  const fdb = openDatabase(join(dir, 'demo.sqlite'));
  createServices(fdb).buildDemo();
  fdb.close();
  return { dir, file: 'demo.sqlite' };
}

describe('tauwell serve', () => {
  it('prints the address with the token, serves the field log, and stops on request', async () => {
    const { dir, file } = demoLog();
    let stdout = '';
    let stop!: (reason: string) => void;
    const stopped = new Promise<string>((resolve) => (stop = resolve));
    const io = { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: () => undefined }, env: {}, cwd: dir };
    const run = serve(parseArgs(SERVE_COMMAND, ['--db', file, '--port', '0']), io, () => stopped);
    await expect.poll(() => stdout).toMatch(/\?token=/);

    const lines = stdout.trim().split('\n');
    const address = lines.find((l) => /^http:\/\/127\.0\.0\.1:\d+\/\?token=[0-9a-f]{64}$/.test(l));
    expect(address, stdout).toBeDefined();
    expect(lines[0]).toMatch(/127\.0\.0\.1 only.*Ctrl\+C to stop/);
    const url = new URL(address!);
    const r = await fetch(new URL('/api/listWells', url), {
      method: 'POST', headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${url.searchParams.get('token')}` }, body: '{}',
    });
    expect(r.status).toBe(200);
    expect(((await r.json()) as { fields: { name: string }[] }).fields[0].name).toBe('Kettle Ridge (invented)');

    stop('SIGINT');
    expect(await run).toBe(0);
    expect(stdout).toMatch(/stopped \(SIGINT\); field log closed\n$/);
    await expect(fetch(new URL('/', url))).rejects.toThrow();
  });

  it('lists every option in its help', async () => {
    const run = await cli(['serve', '--help'], tempDir());
    expect(run.code).toBe(0);
    for (const option of SERVE_COMMAND.options) expect(run.stdout).toContain(`--${option.name}`);
    expect(run.stdout).toContain('--help');
  });

  it('refuses a missing field log and a port out of range, naming the option', async () => {
    const dir = tempDir();
    const missing = await cli(['serve', '--db', 'nope.sqlite'], dir);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/--db.*no such field log/);
    const { dir: demoDir, file } = demoLog();
    const port = await cli(['serve', '--db', file, '--port', '70000'], demoDir);
    expect(port.code).toBe(2);
    expect(port.stderr).toMatch(/field "--port": must be a whole number from 0 to 65535/);
    const holder = await startLoopbackServer({ services: {} as never, port: 0 });
    try {
      const taken = await cli(['serve', '--db', file, '--port', String(holder.port)], demoDir);
      expect(taken.code).toBe(2);
      expect(taken.stderr).toMatch(new RegExp(`field "--port": port ${holder.port} on 127\\.0\\.0\\.1 is in use`));
    } finally {
      await holder.close();
    }
  });
});
