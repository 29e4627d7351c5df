/**
 * A PDF of an assembled report page, printed by headless Chromium from a private temporary folder:
 * the page's own @page rules set the paper, margins, running headers and page numbers. Chromium is
 * the one named by TAUWELL_CHROMIUM, else /usr/bin/chromium; it runs with a throw-away profile and
 * without network features, and the page's CSP forbids every request anyway.
 *
 * Exported API:
 *   chromiumPath(env): string                 (an InputError naming what to install when there is none)
 *   printPdf(html, { env?, timeoutMs? }): Promise<Buffer>
 */
import { execFile } from 'node:child_process';
import { accessSync, constants, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { InputError } from '../../shared/errors.js';

export const DEFAULT_CHROMIUM = '/usr/bin/chromium';
/** Long enough for a field of many wells on a slow machine; a hung browser is stopped after it. */
const DEFAULT_TIMEOUT_MS = 120_000;
/** Scripts get this much virtual time to draw the charts before the page is printed. */
const VIRTUAL_TIME_BUDGET_MS = 10_000;

export function chromiumPath(env: Readonly<Record<string, string | undefined>>): string {
  const given = env.TAUWELL_CHROMIUM;
  if (given !== undefined && given.trim() !== '') {
    if (!isExecutable(given)) throw new InputError('no Chromium at this path; TAUWELL_CHROMIUM must name the Chromium (or Chrome) program', { file: given, field: 'TAUWELL_CHROMIUM' });
    return given;
  }
  if (isExecutable(DEFAULT_CHROMIUM)) return DEFAULT_CHROMIUM;
  throw new InputError(
    'a PDF report is printed by Chromium, which was not found: install it (Debian/Ubuntu: apt-get install chromium) or set TAUWELL_CHROMIUM to its path; an HTML report (--out FILE.html) needs no browser',
    { field: 'TAUWELL_CHROMIUM' },
  );
}

function isExecutable(path: string): boolean {
  try {
    accessSync(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

export async function printPdf(html: string, options: { env?: Readonly<Record<string, string | undefined>>; timeoutMs?: number } = {}): Promise<Buffer> {
  const chromium = chromiumPath(options.env ?? process.env);
  const dir = mkdtempSync(join(tmpdir(), 'tauwell-report-'));
  try {
    const page = join(dir, 'report.html');
    const pdf = join(dir, 'report.pdf');
    writeFileSync(page, html);
    const args = [
      '--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update',
      '--disable-sync', '--no-first-run', '--no-default-browser-check', `--user-data-dir=${join(dir, 'profile')}`,
      '--no-pdf-header-footer', `--virtual-time-budget=${VIRTUAL_TIME_BUDGET_MS}`, `--print-to-pdf=${pdf}`,
      pathToFileURL(page).href,
    ];
    const stderr = await new Promise<string>((done, fail) => {
      execFile(chromium, args, { timeout: options.timeoutMs ?? DEFAULT_TIMEOUT_MS, maxBuffer: 16 * 1024 * 1024 }, (error, _stdout, err) => {
        if (error === null) done(String(err));
        else fail(new Error(`Chromium could not print the report (${error.killed ? 'stopped after the time limit' : `exit ${String(error.code)}`}): ${lastLine(String(err)) || error.message}`));
      });
    });
    if (!existsSync(pdf)) throw new Error(`Chromium wrote no PDF: ${lastLine(stderr) || 'no message'}`);
    return readFileSync(pdf);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function lastLine(text: string): string {
  const lines = text.split(/\r?\n/).map((l) => l.trim()).filter((l) => l !== '');
  return lines.length === 0 ? '' : lines[lines.length - 1].slice(0, 300);
}
