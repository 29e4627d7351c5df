// The self-contained HTML report of the invented demo field, opened in headless Chromium with the
// network cut (every request routed to abort, and counted): it makes no request at all, breaks no
// rule of its own Content-Security-Policy, and draws every chart — each canvas is sampled and must
// hold the colours of its data, not only axes. A full-page screenshot goes to test-artifacts/report/.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FieldDb } from '../src/main/db/database.js';
import { createReportService } from '../src/main/services/report.js';
import { artifactsDir, buildReportPage, demoLog, launch, missingChromium, tempDir } from './report-helpers.js';

const missing = missingChromium();
if (missing !== null) console.warn(`report HTML tests skipped: ${missing}`);

interface CanvasInk {
  label: string;
  width: number;
  height: number;
  /** Share of pixels drawn at all (alpha > 0). */
  inked: number;
  /** Pixels within 40 (sum of |Δ| over R, G, B) of the readings' teal #1f6f8b and of the fit's ember #b3441e (charts/setup.ts COLOURS). */
  teal: number;
  ember: number;
}

/**
 * Every canvas of the page, sampled pixel by pixel. Browser-side code, given as source text: the tests
 * are type-checked for Node (tsconfig.node.json), which has no DOM.
 */
const INK_SCRIPT = `Array.from(document.querySelectorAll('canvas'), (c) => {
  const ctx = c.getContext('2d');
  const out = { label: c.getAttribute('aria-label') || '', width: c.width, height: c.height, inked: 0, teal: 0, ember: 0 };
  if (ctx === null || c.width === 0 || c.height === 0) return out;
  const data = ctx.getImageData(0, 0, c.width, c.height).data;
  let inked = 0;
  for (let i = 0; i < data.length; i += 4) {
    if (data[i + 3] === 0) continue;
    inked++;
    const r = data[i], g = data[i + 1], b = data[i + 2];
    if (Math.abs(r - 31) + Math.abs(g - 111) + Math.abs(b - 139) < 40) out.teal++;
    if (Math.abs(r - 179) + Math.abs(g - 68) + Math.abs(b - 30) < 40) out.ember++;
  }
  out.inked = inked / (c.width * c.height);
  return out;
})`;

function inkOf(page: Page): Promise<CanvasInk[]> {
  return page.evaluate<CanvasInk[]>(INK_SCRIPT);
}

interface Watch {
  requests: string[];
  aborted: string[];
  errors: string[];
}

/** A page with every request counted and aborted, except the document `allowed` itself. */
async function watched(browser: Browser, allowed?: string): Promise<{ page: Page; watch: Watch }> {
  const page = await browser.newPage({ viewport: { width: 1000, height: 1200 } });
  const watch: Watch = { requests: [], aborted: [], errors: [] };
  page.on('request', (r) => watch.requests.push(r.url()));
  page.on('console', (m) => { if (m.type() === 'error' || m.type() === 'warning') watch.errors.push(m.text()); });
  page.on('pageerror', (e) => watch.errors.push(e.message));
  await page.route('**', (route) => {
    if (route.request().url() === allowed) return route.continue();
    watch.aborted.push(route.request().url());
    return route.abort();
  });
  // Injected by the browser itself, so not subject to the page's CSP: records any violation of it.
  await page.addInitScript({ content: "document.addEventListener('securitypolicyviolation', (e) => console.error('CSP violation: ' + e.violatedDirective + ' ' + e.blockedURI));" });
  return { page, watch };
}

describe.skipIf(missing !== null)('HTML report, offline', () => {
  let browser: Browser;
  let fdb: FieldDb;
  let html: string;
  let file: string;

  beforeAll(async () => {
    const pageFile = await buildReportPage();
    const dir = tempDir();
    const demo = demoLog(dir);
    fdb = demo.fdb;
    const report = createReportService(demo.s, fdb, { pageFile });
    const model = report.buildModel({ field: 'Kettle Ridge (invented)' });
    html = report.renderReportHtml(model, { paper: 'a4' });
    file = join(dir, 'field.html');
    writeFileSync(file, html);
    browser = await launch();
  }, 180_000);

  afterAll(async () => {
    await browser?.close();
    fdb?.close();
  });

  it('is one file whose policy lets only its own inlined code run and forbids every fetch', () => {
    const csp = /<meta http-equiv="Content-Security-Policy" content="([^"]+)">/.exec(html)?.[1] ?? '';
    expect(csp).toMatch(/default-src 'none'/);
    expect(csp).toMatch(/connect-src 'none'/);
    expect(csp).toMatch(/script-src 'sha256-[A-Za-z0-9+/=]+'(;|$)/);
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval|https?:|\*/);
    expect(html).not.toMatch(/<script[^>]*\bsrc=|<link[^>]*\bhref=/);
  });

  it('loaded as page content makes zero requests, keeps its CSP and draws every chart', async () => {
    const { page, watch } = await watched(browser);
    await page.setContent(html, { waitUntil: 'load' });
    await page.waitForSelector('html[data-report-ready="true"]', { timeout: 20_000 });
    const charts = Number(await page.getAttribute('html', 'data-report-charts'));
    const ink = await inkOf(page);
    expect(watch.requests).toEqual([]);
    expect(watch.aborted).toEqual([]);
    expect(watch.errors).toEqual([]);
    // The field's output chart and one decline chart per production well (KR-1, KR-2, KR-3).
    expect(charts).toBe(4);
    expect(ink.length).toBe(charts);
    for (const c of ink) {
      expect(c.width * c.height, c.label).toBeGreaterThan(100_000);
      expect(c.inked, c.label).toBeGreaterThan(0.02);
      // Every chart draws the fit's ember (the output line or the fitted curve) in quantity, not only axes.
      expect(c.ember, c.label).toBeGreaterThan(500);
    }
    const declines = ink.filter((c) => c.label.startsWith('Decline of'));
    expect(declines.length).toBe(3);
    for (const c of declines) expect(c.teal, c.label).toBeGreaterThan(500); // the readings and residuals
    await page.screenshot({ path: join(artifactsDir(), 'field-html.png'), fullPage: true });
    await page.close();
  }, 60_000);

  it('opened from disk (file://) requests nothing beyond itself', async () => {
    const url = pathToFileURL(file).href;
    const { page, watch } = await watched(browser, url);
    await page.goto(url, { waitUntil: 'load' });
    await page.waitForSelector('html[data-report-ready="true"]', { timeout: 20_000 });
    expect(watch.requests.filter((r) => r !== url)).toEqual([]);
    expect(watch.aborted).toEqual([]);
    expect(watch.errors).toEqual([]);
    const text = await page.innerText('body');
    expect(text).toContain('Wells ranked by the years from the latest reading to the economic limit');
    expect(text).toContain('Before you act on these numbers');
    await page.close();
  }, 60_000);
});
