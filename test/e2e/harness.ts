/**
 * End-to-end harness: the real renderer (out/renderer, built by `npx electron-vite build`) served
 * on loopback by the real server and services over a fresh copy of the invented demo field log,
 * driven in Debian's Chromium through playwright-core. No browser is ever downloaded: the harness
 * uses /usr/bin/chromium (apt-get install chromium) and says so in one line when it is missing.
 *
 *   const app = await startApp();      app.url, app.page, app.fdb, app.shot(name), app.close()
 *
 * Screenshots go to test-artifacts/e2e/<name>.png (git-ignored; CI keeps them as artefacts).
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { openDatabase, type FieldDb } from '../../src/main/db/database.js';
import { startLoopbackServer, type LoopbackServer } from '../../src/main/server/index.js';
import { closeServices, createServices } from '../../src/main/services/index.js';
import type { TauwellServices } from '../../src/shared/contract/index.js';

export const CHROMIUM = process.env.TAUWELL_CHROMIUM ?? '/usr/bin/chromium';
export const CHROMIUM_ARGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking',
  '--disable-component-update', '--disable-sync', '--no-first-run',
];
export const RENDERER_DIR = resolve('out/renderer');
export const ARTIFACTS = resolve('test-artifacts/e2e');

export interface RunningApp {
  url: string;
  token: string;
  page: Page;
  browser: Browser;
  fdb: FieldDb;
  /** The back end's services, to check what the screens stored. */
  services: TauwellServices;
  dbFile: string;
  /** Console errors and uncaught page errors seen so far. */
  errors: string[];
  /** Every request the page made, by URL. */
  requests: string[];
  shot(name: string): Promise<string>;
  /** Opens a route (`#/field`) and waits for the screen's heading. */
  go(route: string): Promise<void>;
  close(): Promise<void>;
}

export function missingPrerequisite(): string | null {
  if (!existsSync(CHROMIUM)) return `Chromium not found at ${CHROMIUM}: install it with \`apt-get install chromium\` (CI's .ci/run does).`;
  if (!existsSync(join(RENDERER_DIR, 'index.html'))) return `the renderer is not built: run \`npx electron-vite build\` (npm test does) to make ${RENDERER_DIR}.`;
  return null;
}

export async function startApp(options: { viewport?: { width: number; height: number }; demo?: boolean } = {}): Promise<RunningApp> {
  const missing = missingPrerequisite();
  if (missing !== null) throw new Error(missing);
  const dir = mkdtempSync(join(tmpdir(), 'tauwell-e2e-'));
  const dbFile = join(dir, 'field-log.sqlite');
  const fdb = openDatabase(dbFile);
  const services = createServices(fdb, { who: 'e2e' });
  if (options.demo !== false) services.buildDemo({});
  let server: LoopbackServer | undefined;
  let browser: Browser | undefined;
  try {
    server = await startLoopbackServer({ services, staticDir: RENDERER_DIR, log: () => undefined });
    browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
    const page = await browser.newPage({ viewport: options.viewport ?? { width: 1400, height: 1000 } });
    const errors: string[] = [];
    const requests: string[] = [];
    page.on('console', (m) => { if (m.type() === 'error') errors.push(`console: ${m.text()}`); });
    page.on('pageerror', (e) => errors.push(`page: ${e.message}`));
    page.on('request', (r) => requests.push(r.url()));
    await page.goto(`${server.url}?token=${server.token}#/field`);
    mkdirSync(ARTIFACTS, { recursive: true });
    const srv = server;
    const br = browser;
    return {
      url: server.url,
      token: server.token,
      page,
      browser,
      fdb,
      services,
      dbFile,
      errors,
      requests,
      async shot(name) {
        const file = join(ARTIFACTS, `${name}.png`);
        await page.screenshot({ path: file, fullPage: true });
        return file;
      },
      async go(route) {
        await page.evaluate((r) => { (globalThis as unknown as { location: { hash: string } }).location.hash = r; }, route);
        await page.locator('#screen h1').first().waitFor();
      },
      async close() {
        await br.close();
        await srv.close();
        await closeServices(services);
        fdb.close();
        rmSync(dir, { recursive: true, force: true });
      },
    };
  } catch (e) {
    await browser?.close();
    await server?.close();
    await closeServices(services);
    fdb.close();
    rmSync(dir, { recursive: true, force: true });
    throw e;
  }
}
