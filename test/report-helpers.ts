// Helpers for the report tests: the report page built into a private folder (vite.report.config.ts),
// Chromium (Debian's, never downloaded), a field log with the invented demo field, and playwright-core.
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { build } from 'vite';
import { chromium, type Browser } from 'playwright-core';
import { openDatabase, type FieldDb } from '../src/main/db/database.js';
import { createServices, type Services } from '../src/main/services/index.js';

export const CHROMIUM = process.env.TAUWELL_CHROMIUM ?? '/usr/bin/chromium';
export const CHROMIUM_ARGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking',
  '--disable-component-update', '--disable-sync', '--no-first-run',
];
export const ARTIFACTS = resolve('test-artifacts/report');

/** Why the browser tests cannot run here, or null. */
export function missingChromium(): string | null {
  return existsSync(CHROMIUM) ? null : `Chromium not found at ${CHROMIUM}: install it with \`apt-get install chromium\` (CI's .ci/run does), or set TAUWELL_CHROMIUM.`;
}

export function missingPoppler(): string | null {
  return existsSync('/usr/bin/pdftotext') && existsSync('/usr/bin/pdftoppm') ? null : 'poppler-utils (pdftotext, pdftoppm) not found: apt-get install poppler-utils';
}

export function tempDir(): string {
  return mkdtempSync(join(tmpdir(), 'tauwell-report-test-'));
}

/** Builds the report page as `npm run build:renderer` does, but into a folder of its own; returns report.html. */
export async function buildReportPage(): Promise<string> {
  const outDir = join(tempDir(), 'report');
  await build({ configFile: resolve('vite.report.config.ts'), logLevel: 'error', build: { outDir, emptyOutDir: true } });
  return join(outDir, 'report.html');
}

export function artifactsDir(): string {
  mkdirSync(ARTIFACTS, { recursive: true });
  return ARTIFACTS;
}

/** Each page of a PDF as PNG (80 dpi) in test-artifacts/report/<name>-<n>.png; returns the file names. */
export function savePngs(pdf: string, name: string): string[] {
  const dir = artifactsDir();
  for (const old of readdirSync(dir)) if (old.startsWith(`${name}-`)) rmSync(join(dir, old));
  execFileSync('pdftoppm', ['-r', '80', '-png', pdf, join(dir, name)]);
  return readdirSync(dir).filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png'));
}

/** A field-log file with the invented demo field, its services, and a clock pinned to 2026-01-05T00:00:00Z. */
export function demoLog(dir: string): { fdb: FieldDb; s: Services; file: string } {
  const file = join(dir, 'demo.sqlite');
  // 2026-01-05T00:00:00Z = 20 458 days × 86 400 000 ms: three weeks after the demo's last reading (2025-12-15).
  const fdb = openDatabase(file, { now: () => 1_767_571_200_000 });
  const s = createServices(fdb, { who: 'report test' });
  s.buildDemo({});
  return { fdb, s, file };
}

export async function launch(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
}
