// Reports of what cannot be forecast say so plainly instead of failing: a field with no readings,
// a well with too few points to fit, a fit that did not converge. Checked in the report model, in
// the PDF's text (pdftotext) and in the HTML page drawn by Chromium.
import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type FieldDb } from '../src/main/db/database.js';
import { createReportService, type ReportService } from '../src/main/services/report.js';
import { createServices, type Services } from '../src/main/services/index.js';
import { buildReportPage, launch, missingChromium, missingPoppler, savePngs, tempDir } from './report-helpers.js';

const missingBrowser = missingChromium();
const missingPdf = missingBrowser ?? missingPoppler();
if (missingPdf !== null) console.warn(`report statement tests in the browser skipped: ${missingPdf}`);

const WEEK_MS = 7 * 86_400_000; // 7 d × 86 400 s × 1000 ms
/** 2024-01-01T00:00:00Z = 19 723 days × 86 400 000 ms after the epoch. */
const START_MS = 1_704_067_200_000;

function iso(ms: number): string {
  return new Date(ms).toISOString();
}

/**
 * "Quiet field": one production well, no readings. "Trouble field": T-FEW with two readings (the
 * exponential needs at least four points, fit.ts) and T-RISE whose production temperature rises week
 * by week from 150 °C by 0.5 K (θ does not decline, so there is nothing to fit).
 */
function troubleLog(dir: string): { fdb: FieldDb; s: Services } {
  const fdb = openDatabase(join(dir, 'trouble.sqlite'), { now: () => START_MS + 60 * WEEK_MS });
  const s = createServices(fdb, { who: 'report test' });
  s.createField({ name: 'Quiet field', timeZone: 'UTC' });
  s.createWell({ field: 'Quiet field', name: 'Q-1', kind: 'production', referenceTemperatureC: 70 });
  s.createField({ name: 'Trouble field', timeZone: 'UTC' });
  for (const name of ['T-FEW', 'T-RISE']) s.createWell({ field: 'Trouble field', name, kind: 'production', referenceTemperatureC: 70, productionStart: iso(START_MS) });
  const log = (well: string, week: number, celsius: number): void => {
    s.logReading({ field: 'Trouble field', well, time: iso(START_MS + week * WEEK_MS), productionTemperature: celsius, flow: 40, flowUnit: 'kg/s', status: 'producing' });
  };
  log('T-FEW', 1, 160);
  log('T-FEW', 2, 159);
  for (let week = 1; week <= 20; week++) log('T-RISE', week, 150 + 0.5 * week);
  return { fdb, s };
}

describe('report statements', () => {
  let fdb: FieldDb;
  let report: ReportService;
  let pageFile: string | null = null;

  beforeAll(async () => {
    const dir = tempDir();
    const log = troubleLog(dir);
    fdb = log.fdb;
    if (missingBrowser === null) pageFile = await buildReportPage();
    report = createReportService(log.s, fdb, pageFile === null ? {} : { pageFile });
  }, 120_000);

  afterAll(() => fdb?.close());

  it('say in the model what each section cannot show', () => {
    const quiet = report.buildModel({ field: 'Quiet field' });
    expect(quiet.field?.statement).toBe('No readings have been logged in the field Quiet field yet: there is nothing to fit or forecast. Its wells are listed below.');
    expect(quiet.field?.outputStatement).toMatch(/^No producing reading with a flow and a production temperature has been logged/);
    expect(quiet.wells.map((w) => [w.status, w.statement])).toEqual([['no-readings', 'No readings of Q-1 have been logged yet: there is nothing to fit or forecast.']]);
    expect(quiet.meta.fingerprint).toBeNull();

    const trouble = report.buildModel({ field: 'Trouble field' });
    const few = trouble.wells.find((w) => w.well.name === 'T-FEW');
    const rise = trouble.wells.find((w) => w.well.name === 'T-RISE');
    expect(few?.status).toBe('too-few-points');
    // fit.ts: "n usable points; the <model> model needs at least p + 2" with p = 2 for the exponential.
    expect(few?.statement).toBe('Too few readings to fit a decline to T-FEW: 2 usable points; the exponential model needs at least 4. The readings are shown; no forecast is made.');
    expect(rise?.status).toBe('not-converged');
    expect(rise?.statement).toBe('The fit did not converge: θ does not decline over the fit window (its least-squares slope is not negative); nothing to fit. No forecast is made from it.');
    for (const w of [few, rise]) {
      expect(w?.headline).toBeNull();
      expect(w?.series?.readings).toBeGreaterThan(0); // the readings are still drawn
      expect(w?.fit?.fitId).toBeGreaterThan(0); // and the failed fit is stored and named
    }
    expect(trouble.field?.ranking.map((r) => r.well)).toEqual(['T-FEW', 'T-RISE']);
    expect(trouble.field?.forecast).toBeNull();
  });

  it('refuse only what is not a report: no such well or field', () => {
    expect(() => report.buildModel({ well: 'NOPE' })).toThrow(/no well named "NOPE"/);
    expect(() => report.buildModel({ field: 'Nowhere' })).toThrow(/no field named "Nowhere"/);
    expect(() => report.buildModel({})).toThrow(/name the well or the field/);
  });

  it.skipIf(missingPdf !== null)('say it in the PDF', async () => {
    const pdf = await report.renderReportPdf(report.buildModel({ field: 'Trouble field' }), { paper: 'a4' });
    const file = join(tempDir(), 'trouble.pdf');
    writeFileSync(file, pdf);
    const flat = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(flat).toContain('Too few readings to fit a decline to T-FEW: 2 usable points; the exponential model needs at least 4.');
    expect(flat).toContain('The fit did not converge: θ does not decline over the fit window (its least-squares slope is not negative); nothing to fit.');
    expect(flat).toContain('well T-RISE · Trouble field');
    expect(savePngs(file, 'trouble-field-a4').length).toBeGreaterThan(0);
  }, 120_000);

  it.skipIf(missingBrowser !== null)('say it in the HTML page, which still draws the readings', async () => {
    const browser = await launch();
    const errors: string[] = [];
    // A fresh page per report: a policy set by a meta tag stays with the document it came with.
    const open = async (html: string): Promise<{ text: string; charts: string | null }> => {
      const page = await browser.newPage();
      page.on('pageerror', (e) => errors.push(e.message));
      page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
      await page.setContent(html, { waitUntil: 'load' });
      await page.waitForSelector('html[data-report-ready="true"]');
      const out = { text: await page.innerText('body'), charts: await page.getAttribute('html', 'data-report-charts') };
      await page.close();
      return out;
    };
    try {
      const quiet = await open(report.renderReportHtml(report.buildModel({ field: 'Quiet field' })));
      expect(quiet.text).toContain('No readings have been logged in the field Quiet field yet');
      expect(quiet.text).toContain('No readings of Q-1 have been logged yet');
      expect(quiet.charts).toBe('0');
      const rise = await open(report.renderReportHtml(report.buildModel({ well: 'T-RISE' })));
      expect(rise.text).toContain('The fit did not converge: θ does not decline over the fit window');
      expect(rise.charts).toBe('1');
      expect(errors).toEqual([]);
    } finally {
      await browser.close();
    }
  }, 60_000);
});
