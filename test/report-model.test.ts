// The report model and its assembly into one HTML file, without a browser: thinning for print keeps
// every extreme, the model carries the forecast's own numbers, the field's summed forecast adds the
// wells' curves, and the assembled file inlines its code under a CSP whose hashes match it.
import { createHash } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FieldDb } from '../src/main/db/database.js';
import { assembleReportHtml, jsonForScript, reportPageCss } from '../src/main/report/assemble.js';
import { createReportService } from '../src/main/services/report.js';
import type { Services } from '../src/main/services/index.js';
import { minMaxDecimate, minMaxIndices } from '../src/shared/report/decimate.js';
import { importSummary, type ReportModel } from '../src/shared/report/model.js';
import { PRINT_POINTS } from '../src/shared/report/well-section.js';
import { demoLog, tempDir } from './report-helpers.js';

describe('min–max thinning for print', () => {
  it('keeps at most the budget, in order, with every bucket\'s extremes (so a lone spike survives)', () => {
    const n = 1_000_000;
    const x = Array.from({ length: n }, (_, i) => i);
    // A slow decline with a small ripple, one spike up at 123 457 and one dip at 876 543.
    const y = x.map((i) => 100 - i * 1e-5 + 0.1 * Math.sin(i / 50));
    y[123_457] = 500;
    y[876_543] = -50;
    const d = minMaxDecimate(x, y, 2000);
    expect(d.x.length).toBeLessThanOrEqual(2000);
    expect(d.x.length).toBeGreaterThan(1900);
    expect(d.x.every((v, i) => i === 0 || v > d.x[i - 1])).toBe(true);
    expect(d.x).toContain(123_457);
    expect(d.x).toContain(876_543);
    expect(Math.max(...d.y)).toBe(500);
    expect(Math.min(...d.y)).toBe(-50);
  });

  it('leaves a short series whole and drops missing values', () => {
    expect(minMaxDecimate([1, 2, 3, 4], [5, null, NaN, 7], 2000)).toEqual({ x: [1, 4], y: [5, 7] });
    expect(minMaxIndices([3, 1, 2, 9, 0, 4], [0, 1, 2, 3, 4, 5], 4)).toEqual([0, 1, 3, 4]); // buckets [3,1,2] → 1 (min) and 0 (max); [9,0,4] → 3 (max), 4 (min)
  });
});

describe('import summary', () => {
  const record = (id: number, field: string | null, rejected: number) => ({
    id, file: `f${id}.csv`, sizeBytes: 10, sha256: 'x', field, status: 'complete' as const, message: '', rowsRead: 10 + rejected,
    imported: 8, duplicates: 1, conflicts: 1, rejected, flagged: 0, started: '2025-01-01T00:00:00.000Z', finished: null, mapping: {}, units: {}, options: {},
  });

  it('counts the field\'s imports only, and tells "none" from "not available"', () => {
    const s = importSummary('A', [record(3, 'A', 2), record(2, 'B', 7), record(1, 'A', 0)]);
    // Field A: files 3 and 1; rows read (10 + 2) + (10 + 0) = 22, imported 8 + 8 = 16, rejected 2 + 0 = 2.
    expect([s.available, s.files, s.rowsRead, s.imported, s.rejected, s.duplicates, s.conflicts]).toEqual([true, 2, 22, 16, 2, 2, 2]);
    expect(s.rows.map((r) => r.id)).toEqual([3, 1]);
    expect(importSummary('A', null).available).toBe(false);
    expect(importSummary('A', []).available).toBe(true);
  });
});

describe('report model of the demo field', () => {
  let fdb: FieldDb;
  let s: Services;
  let model: ReportModel;

  beforeAll(() => {
    const demo = demoLog(tempDir());
    fdb = demo.fdb;
    s = demo.s;
    model = createReportService(s, fdb).buildModel({ field: 'Kettle Ridge (invented)', limit: { kind: 'production-temperature', temperatureC: 115 } });
  });

  afterAll(() => fdb?.close());

  it('carries the meta a report must show', () => {
    expect(model.meta.generatedAt).toBe('2026-01-05T00:00:00.000Z'); // the pinned clock of demoLog
    expect(model.meta.database).toMatch(/demo\.sqlite$/);
    expect(model.meta.units).toBe('si');
    expect(model.meta.timeZone).toBe('Pacific/Auckland');
    expect(model.meta.cautions.length).toBe(3);
    expect(model.meta.fits.map((f) => f.well)).toEqual(['KR-1', 'KR-2', 'KR-3']);
    // SHA-256 over "tauwell-report-data 1\n" and "<well id> <fit fingerprint>\n" per fitted well (services/report.ts).
    const hash = createHash('sha256').update('tauwell-report-data 1\n');
    for (const w of model.wells) hash.update(`${w.well.id} ${w.fit?.fingerprint}\n`);
    expect(model.meta.fingerprint).toBe(hash.digest('hex'));
    expect(model.method.sources.some((x) => x.includes('IAPWS-IF97'))).toBe(true);
  });

  it('holds each well\'s forecast numbers as the service gave them, the per-reading arrays thinned', () => {
    for (const w of model.wells) {
      expect(w.status).toBe('ok');
      const f = w.forecast;
      if (f === null || w.headline === null) throw new Error(`${w.well.name} has no forecast`);
      const origin = Date.parse(f.fit.timeOrigin);
      expect(w.headline.endOfLife.p50).toBe(f.forecast.endOfLife.p50 === null ? null : new Date(origin + 1000 * f.forecast.endOfLife.p50).toISOString());
      expect(w.headline.tau?.valueS).toBe(f.fit.fit.parameters.tau?.value);
      expect(f.fit.fit.residuals).toEqual([]);
      expect(f.fit.points).toEqual([]);
      expect(w.residuals?.points).toBe(f.fit.fit.n);
      expect(w.series?.drawn).toBeLessThanOrEqual(PRINT_POINTS.included + PRINT_POINTS.excluded);
      expect(w.series?.readings).toBe(624); // 12 years × 52 weekly readings (invented-field.ts)
    }
  });

  it('ranks the wells soonest first and sums their best-fit forecasts', () => {
    const ranked = model.field?.ranking ?? [];
    expect(ranked.at(-1)?.well).toBe('KR-4I'); // the injection well has no forecast and comes last
    const p50 = ranked.filter((r) => r.yearsToLimit?.p50 !== null && r.yearsToLimit !== null).map((r) => r.yearsToLimit?.p50 as number);
    expect(p50).toEqual([...p50].sort((a, b) => a - b));
    // At the first grid point (the latest reading) the sum is Σ ṁplan·cw·θcentral of the three wells (field-section.ts).
    const sum = model.wells.reduce((acc, w) => {
      const f = w.forecast;
      return f === null ? acc : acc + f.plannedFlow.valueKgPerS * f.specificHeat.valueJPerKgK * (f.forecast.band.central[0] as number);
    }, 0);
    expect(model.field?.forecast?.y[0]).toBeCloseTo(sum, 0);
  });
});

describe('assembly into one HTML file', () => {
  let model: ReportModel;
  let fdb: FieldDb;

  beforeAll(() => {
    const demo = demoLog(tempDir());
    fdb = demo.fdb;
    model = createReportService(demo.s, fdb).buildModel({ field: 'Kettle Ridge (invented)' });
    // A well name is the field log's data: it must reach the page as text, never as markup.
    model.wells[0].header = 'well KR-1 "</style><script>alert(1)</script>';
    model.title = 'Decline report — field </script><b>';
  });

  afterAll(() => fdb?.close());

  /** A page as vite.report.config.ts builds it, with code that holds the two sequences that end or change a script element. */
  function fakePage(): string {
    const dir = join(tempDir(), 'page');
    mkdirSync(join(dir, 'assets'), { recursive: true });
    writeFileSync(join(dir, 'report.html'), [
      '<!doctype html>', '<html lang="en">', '  <head>', '    <meta charset="utf-8" />', '    <title>Tauwell decline report</title>',
      '    <script type="module" crossorigin src="./assets/report-x.js"></script>', '    <link rel="stylesheet" crossorigin href="./assets/style-x.css">',
      '  </head>', '  <body>', '    <script type="application/json" id="tauwell-report">null</script>', '    <main id="report" class="report"></main>', '  </body>', '</html>', '',
    ].join('\r\n'));
    writeFileSync(join(dir, 'assets', 'report-x.js'), 'const a = "</script>";\r\nconst b = `<!-- x`;\nconsole.log(a, b);\n');
    writeFileSync(join(dir, 'assets', 'style-x.css'), 'body { color: red; }\n.x::after { content: "</style>"; }\n');
    return join(dir, 'report.html');
  }

  it('inlines the code and styles under a CSP whose hashes are theirs, and the model as inert JSON', () => {
    const html = assembleReportHtml(model, { paper: 'letter', pageFile: fakePage() });
    const csp = /<meta http-equiv="Content-Security-Policy" content="([^"]+)">/.exec(html)?.[1] ?? '';
    const hashes = (directive: string): string[] => [...(new RegExp(`${directive} ([^;]+)`).exec(csp)?.[1] ?? '').matchAll(/'sha256-([^']+)'/g)].map((m) => m[1]);
    const sha = (text: string): string => createHash('sha256').update(text, 'utf8').digest('base64');
    const scripts = [...html.matchAll(/<script type="module">([\s\S]*?)<\/script>/g)].map((m) => m[1]);
    const styles = [...html.matchAll(/<style>([\s\S]*?)<\/style>/g)].map((m) => m[1]);
    expect(scripts.length).toBe(1);
    expect(styles.length).toBe(2); // the page's stylesheet and the print rules
    expect(hashes('script-src')).toEqual(scripts.map(sha));
    expect(hashes('style-src').sort()).toEqual(styles.map(sha).sort());
    expect(html).not.toMatch(/\r/);
    expect(scripts[0]).toContain('const a = "\\x3C/script>"'); // the same string, spelled so it cannot end the element
    expect(scripts[0]).toContain('`\\x3C!-- x`');
    const json = /<script type="application\/json" id="tauwell-report">([\s\S]*?)<\/script>/.exec(html)?.[1] ?? '';
    expect(json).not.toContain('<');
    expect(JSON.parse(json)).toEqual(JSON.parse(JSON.stringify(model)));
    expect(html).toContain('<title>Decline report — field &lt;/script&gt;&lt;b&gt;</title>');
    expect(html).toContain('<html lang="en" data-paper="letter">');
    expect(html.match(/<\/script/gi)?.length).toBe(2); // the closing tags of the module and of the JSON, nothing else
  });

  it('writes the paper, running headers and page numbers as CSS strings', () => {
    const css = reportPageCss(model, 'a4');
    expect(css).toContain('size: A4;');
    expect(css).toContain('@bottom-right { content: "page " counter(page) " of " counter(pages);');
    expect(css).toContain('@page well-1 { @top-right { content: "well KR-1 \\"\\3c /style>\\3c script>alert(1)\\3c /script>";');
    expect(css).toContain('[data-report-page="well-3"] { page: well-3; }'); // one named page per production well of the field
    expect(css).toContain('[data-report-page="well-1"] { page: well-1; }');
    expect(reportPageCss(model, 'letter')).toContain('size: letter;');
  });

  it('escapes the JSON of the model so no text can close its element', () => {
    const text = jsonForScript({ a: '</script><!-- \u2028' });
    expect(text).toBe('{"a":"\\u003c/script>\\u003c!-- \\u2028"}');
    expect(JSON.parse(text)).toEqual({ a: '</script><!-- \u2028' });
  });
});
