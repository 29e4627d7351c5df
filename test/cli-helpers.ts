// Helpers for the command-line tests: run `main` in-process and write temporary input files.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../src/main/cli/index.js';
import { createRng } from '../src/shared/stats/random.js';

export const YEAR_S = 365.25 * 86400; // Julian year, DOMAIN.md §9
export const DAY_S = 86400;

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

/** A fresh folder under the OS temp dir; relative file names in `cli` resolve against it. */
export function tempDir(): string {
  return mkdtempSync(join(tmpdir(), 'tauwell-cli-'));
}

export function writeFile(dir: string, name: string, text: string): string {
  writeFileSync(join(dir, name), text);
  return name;
}

export async function cli(argv: string[], cwd: string, env: Record<string, string | undefined> = {}): Promise<CliRun> {
  let stdout = '';
  let stderr = '';
  const code = await main(argv, {
    stdout: { write: (s: string) => { stdout += s; } },
    stderr: { write: (s: string) => { stderr += s; } },
    env,
    cwd,
  });
  return { code, stdout, stderr };
}

/** Runs and parses the JSON on stdout, failing loudly with stderr when the run did not succeed. */
export async function cliJson<T = any>(argv: string[], cwd: string): Promise<T> { // eslint-disable-line @typescript-eslint/no-explicit-any
  const run = await cli([...argv, '--json'], cwd);
  if (run.code !== 0) throw new Error(`exit ${run.code}: ${run.stderr}`);
  return JSON.parse(run.stdout) as T;
}

/**
 * Weekly readings of θ(t) = f(t) plus Gaussian noise of `noiseK` (seeded), as CSV rows of
 * elapsed days. The test data are generated from the formula, so the formula's parameters
 * are the check values.
 */
export function weeklyRows(weeks: number, f: (tS: number) => number, noiseK: number, seed: number): { day: number; theta: number }[] {
  const rng = createRng(seed);
  return Array.from({ length: weeks + 1 }, (_, i) => {
    const day = 7 * i;
    return { day, theta: f(day * DAY_S) + noiseK * rng.normal() };
  });
}

export function exponential(theta0K: number, tauS: number): (tS: number) => number {
  return (t) => theta0K * Math.exp(-t / tauS);
}
