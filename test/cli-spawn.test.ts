// The installed entry point, `node bin/tauwell.mjs`, as a user's shell runs it: built JavaScript
// in dist/, exit status and streams of a real process.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { describe, it, expect, beforeAll } from 'vitest';
import { tempDir, writeFile } from './cli-helpers.js';

const root = fileURLToPath(new URL('..', import.meta.url));
const bin = join(root, 'bin', 'tauwell.mjs');

function tauwell(args: string[], cwd = root): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { cwd, encoding: 'utf8', env: { ...process.env, TAUWELL_DEBUG: '' } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

beforeAll(() => {
  // `npm run build:cli`, without npm's start-up time. tsc emits even when files outside the command
  // line have type errors, so the build is judged by what it produced.
  try {
    execFileSync(process.execPath, [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', 'tsconfig.cli.json'], { cwd: root, stdio: 'pipe' });
  } catch {
    // Reported below if the entry point is missing.
  }
  expect(existsSync(join(root, 'dist', 'main', 'cli', 'index.js'))).toBe(true);
}, 120_000);

describe('node bin/tauwell.mjs', () => {
  it('--version exits 0', () => {
    const r = tauwell(['--version']);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^tauwell \d+\.\d+\.\d+\n$/);
  });

  it('water --json prints IAPWS-IF97 (2007) Table 5 density at 300 K, 3 MPa', () => {
    const r = tauwell(['water', '--temperature', '26.85', '--pressure', '3', '--json']);
    expect(r.status).toBe(0);
    const density = JSON.parse(r.stdout).density.value as number;
    expect(Math.abs(density * 0.100215168e-2 - 1)).toBeLessThan(1e-8); // v = 0.100215168e-2 m³/kg
  });

  it('fit --json reads a CSV relative to the working folder', () => {
    const dir = tempDir();
    // θ = 40·e^(−t/2000 d), no noise: the fit returns τ = 2000 d = 1.728e8 s.
    const rows = Array.from({ length: 60 }, (_, i) => `${i * 30},${(40 * Math.exp(-(i * 30) / 2000)).toFixed(8)}`);
    writeFile(dir, 'well.csv', ['day,theta', ...rows].join('\n') + '\n');
    const r = tauwell(['fit', '--csv', 'well.csv', '--time', 'day', '--value', 'theta', '--json'], dir);
    expect(r.status).toBe(0);
    const tau = JSON.parse(r.stdout).fits[0].parameters.tau.value as number;
    expect(Math.abs(tau / (2000 * 86400) - 1)).toBeLessThan(1e-6);
    rmSync(dir, { recursive: true, force: true });
  });

  it('bad input exits 2 with one line on stderr', () => {
    const r = tauwell(['fit', '--csv', 'missing.csv', '--time', 'day', '--value', 'theta']);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe('tauwell: missing.csv: cannot read the file: no such file\n');
  });
});
