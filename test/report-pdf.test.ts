// The PDF report of the invented demo field, printed by Chromium and read back with poppler-utils:
// it shows the same τ, interval and end-of-life dates as `tauwell forecast --json` for the same well,
// to the precision it prints them; it has running headers, footers and page numbers; A4 and Letter
// have the right page size. Pages are rendered to PNG in test-artifacts/report/ (CI keeps them).
import { execFileSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../src/main/db/database.js';
import { createServices } from '../src/main/services/index.js';
import { cli, cliJson } from './cli-helpers.js';
import { CHROMIUM, buildReportPage, missingChromium, missingPoppler, savePngs, tempDir } from './report-helpers.js';

const missing = missingChromium() ?? missingPoppler();
if (missing !== null) console.warn(`report PDF tests skipped: ${missing}`);

/** Julian year, 365.25 d (DOMAIN.md §9). */
const YEAR_S = 365.25 * 86400;
const ZONE = 'Pacific/Auckland'; // the demo field's zone; the report shows dates in it (settings: each field's own)

function pdfText(file: string): string {
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}

function pdfPages(file: string): number {
  return Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))?.[1]);
}

function pageSize(file: string): string {
  return /Page size:\s+([^\n]+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))?.[1] ?? '';
}

function dateInZone(ms: number): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone: ZONE, year: 'numeric', month: '2-digit', day: '2-digit' }).format(ms);
}

describe.skipIf(missing !== null)('PDF report', () => {
  let dir: string;
  let env: Record<string, string>;

  beforeAll(async () => {
    const page = await buildReportPage();
    dir = tempDir();
    env = { TAUWELL_REPORT_PAGE: page, TAUWELL_CHROMIUM: CHROMIUM };
    const demo = await cli(['demo', '--db', 'demo.sqlite'], dir);
    expect(demo.code, demo.stderr).toBe(0);
  }, 180_000);

  it('of a demo well shows the τ, interval and end-of-life dates of `tauwell forecast --json`, to the printed precision', async () => {
    const run = await cli(['report', '--db', 'demo.sqlite', '--well', 'KR-3', '--out', 'kr3.pdf', '--limit-temp', '115'], dir, env);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/wrote kr3\.pdf \(PDF, A4/);
    // The demo has no stored fit of KR-3: the report used the best model by AICc on the time basis, and says so.
    const text = pdfText(join(dir, 'kr3.pdf'));
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain('no fit of this well is stored: the best model by AICc (auto), on the time basis, over all readings');

    // The same request on the command line: same model choice, basis, limit, and the defaults of the settings.
    const json = (await cliJson(['forecast', '--db', 'demo.sqlite', '--well', 'KR-3', '--model', 'auto', '--basis', 'time', '--limit-temp', '115'], dir)).forecasts[0];
    const tau = json.fit.parameters.tau;
    const origin = Date.parse(json.timeOrigin);

    const said = /Fitted τ (\d+\.\d+) yr \(95 %: (\d+\.\d+)–(\d+\.\d+) yr\)/.exec(flat);
    expect(said, 'the summary line names τ and its interval').not.toBeNull();
    const [, value, low, high] = said as RegExpExecArray;
    const decimals = value.split('.')[1].length;
    expect(value).toBe((tau.value / YEAR_S).toFixed(decimals));
    expect(low).toBe((tau.ci95[0] / YEAR_S).toFixed(decimals));
    expect(high).toBe((tau.ci95[1] / YEAR_S).toFixed(decimals));
    expect(flat).toContain(`95 %: ${low}–${high} yr`); // the facts strip prints the same interval

    const eol = /reaches its economic limit \(115\.0 °C\) on (\d{4}-\d{2}-\d{2}) \(P50; P90 (\d{4}-\d{2}-\d{2}), P10 (\d{4}-\d{2}-\d{2})\)/.exec(flat);
    expect(eol, 'the summary line names the end-of-life dates').not.toBeNull();
    const [, p50, p90, p10] = eol as RegExpExecArray;
    expect(p90).toBe(dateInZone(origin + 1000 * json.endOfLife.p90));
    expect(p50).toBe(dateInZone(origin + 1000 * json.endOfLife.p50));
    expect(p10).toBe(dateInZone(origin + 1000 * json.endOfLife.p10));
    for (const d of [p90, p50, p10]) expect(text).toContain(d);

    // Running header and footer on every page; "page N of M" counts right.
    const pages = pdfPages(join(dir, 'kr3.pdf'));
    expect(pages).toBeGreaterThanOrEqual(3);
    expect(text.split('Decline report — well KR-3').length - 1).toBeGreaterThanOrEqual(pages);
    for (let n = 1; n <= pages; n++) expect(text).toContain(`page ${n} of ${pages}`);
    expect(text.split('Tauwell 0.1.0').length - 1).toBeGreaterThanOrEqual(pages);
    expect(text.split('Kettle Ridge (invented) · reservoir Kettle Ridge slab (invented)').length - 1).toBeGreaterThanOrEqual(pages);
    // The rest of what the issue lists is there.
    for (const words of ['Model comparison', 'Reservoir parameters', 'version 2 of 2', 'Data quality', 'Excluded periods', 'The method in short',
      'IAPWS-IF97', 'NIST Special Publication 811', 'Before you act on these numbers', 'Data fingerprint', 'Recharge fraction f']) {
      expect(flat).toContain(words);
    }
    expect(pageSize(join(dir, 'kr3.pdf'))).toMatch(/\(A4\)/);
    expect(savePngs(join(dir, 'kr3.pdf'), 'well-KR-3-a4').length).toBe(pages);
  }, 120_000);

  it('of the demo field on US Letter ranks the wells, counts the imports and gives each well its pages', async () => {
    // demo/README.md: the plant export with planted faults reads 16 rows = 4 imported + 6 duplicates + 1 conflict + 5 rejected.
    const imported = await cli(['import', resolve('demo/invented-export-with-faults.csv'), '--db', 'demo.sqlite', '--date-order', 'dmy'], dir);
    expect(imported.code, imported.stderr).toBe(0);
    const run = await cli(['report', '--db', 'demo.sqlite', '--field', 'Kettle Ridge (invented)', '--out', 'field.pdf', '--paper', 'letter', '--units', 'us'], dir, env);
    expect(run.code, run.stderr).toBe(0);
    const file = join(dir, 'field.pdf');
    expect(pageSize(file)).toMatch(/612 x 792 pts \(letter\)/);
    const text = pdfText(file);
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain('Wells ranked by the years from the latest reading to the economic limit');
    expect(flat).toContain('Thermal output of the field');
    for (const well of ['KR-1', 'KR-2', 'KR-3']) expect(text).toContain(`well ${well} · Kettle Ridge (invented)`);
    expect(flat).toMatch(/KR-4I .*injection well/);
    expect(text).toMatch(/°F/); // --units us
    // The import history reaches the report once the service layer lists imports (services/index.ts merges the import API).
    const fdb = openDatabase(join(dir, 'demo.sqlite'));
    const listsImports = typeof createServices(fdb).listImports === 'function';
    fdb.close();
    if (listsImports) expect(flat).toContain('1 file: 16 rows read, 4 imported, 6 duplicates skipped, 1 conflicts held, 5 rejected.');
    else expect(flat).toContain('The import history of this field log could not be read');
    const pages = pdfPages(file);
    for (let n = 1; n <= pages; n++) expect(text).toContain(`page ${n} of ${pages}`);
    expect(savePngs(file, 'field-letter').length).toBe(pages);
  }, 180_000);
});
