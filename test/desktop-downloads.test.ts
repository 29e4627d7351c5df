// Exports leave the renderer as `<a download>` of a Blob's object URL (src/main/desktop/downloads.ts):
// only the app page's own blob: URLs are saved, through the native save dialog in Documents; every
// other download is cancelled. Chromium names an object URL `blob:<origin of the page>/<uuid>`
// (W3C File API, "blob URL"), and a page loaded from a file gets `blob:file:///<uuid>` in Electron
// (recalled from memory, consistent with public Electron apps' tests that use that form).
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it, vi } from 'vitest';
import { tempDir } from './db-helpers.js';

vi.mock('electron', () => ({ BrowserWindow: class {} }));

const { decideDownload, handleDownloads, isAppBlobUrl, saveDialogOptions } = await import('../src/main/desktop/downloads.js');
const { appLocation, devServerLocation, hardenSession } = await import('../src/main/desktop/window.js');

const INDEX = join(tempDir(), 'renderer', 'index.html');
const fileApp = appLocation(INDEX);
const PAGE = pathToFileURL(INDEX).href;
const dev = devServerLocation('http://localhost:5173/');
const ID = '0f8e1c9a-1b2c-4d3e-9f00-123456789abc';

describe('which blob: URLs are the app\'s own', () => {
  it('a file-loaded page: blob:file:///<uuid> only', () => {
    expect(isAppBlobUrl(`blob:file:///${ID}`, fileApp)).toBe(true);
    for (const url of [
      `blob:null/${ID}`, // an opaque origin proves nothing about who made it
      `blob:file://host/${ID}`, `blob:http://localhost:5173/${ID}`, `blob:https://evil.example/${ID}`,
      `blob:file:///${ID}#x`, `blob:file:///${ID}?x=1`, `blob:file:///etc/passwd`, `blob:file:///${ID}/x`,
      `file:///${ID}`, `data:text/csv,a,b`, 'https://evil.example/export.csv', 'blob:', 'not a url', '',
    ]) {
      expect(isAppBlobUrl(url, fileApp), url).toBe(false);
    }
  });

  it('the development server: blob:<its origin>/<uuid> only', () => {
    expect(isAppBlobUrl(`blob:http://localhost:5173/${ID}`, dev)).toBe(true);
    for (const url of [`blob:http://localhost:5174/${ID}`, `blob:https://localhost:5173/${ID}`, `blob:http://u:p@localhost:5173/${ID}`, `blob:file:///${ID}`]) {
      expect(isAppBlobUrl(url, dev), url).toBe(false);
    }
  });
});

describe('the download decision', () => {
  it('saves the page\'s own export', () => {
    expect(decideDownload({ url: `blob:file:///${ID}`, pageUrl: `${PAGE}#/decline/Kettle%20Ridge/KR-3` }, fileApp)).toEqual({ allow: true });
  });

  it('cancels anything else, saying why', () => {
    const cases = [
      { url: 'https://evil.example/payload.exe', pageUrl: PAGE },
      { url: pathToFileURL('/etc/passwd').href, pageUrl: PAGE },
      { url: `blob:https://evil.example/${ID}`, pageUrl: PAGE },
      { url: `blob:file:///${ID}`, pageUrl: 'https://evil.example/' },
      { url: `blob:file:///${ID}`, pageUrl: pathToFileURL(join(INDEX, '..', 'other.html')).href },
      { url: `blob:file:///${ID}`, pageUrl: undefined },
    ];
    for (const c of cases) {
      const d = decideDownload(c, fileApp);
      expect(d.allow, JSON.stringify(c)).toBe(false);
      if (!d.allow) expect(d.reason).toMatch(/not started by the Tauwell page|only the page's own exports/);
    }
  });
});

describe('the save dialog', () => {
  it('starts in Documents with the suggested name and a filter for its kind', () => {
    expect(saveDialogOptions('KR-3 forecast.csv', '/home/op/Documents')).toEqual({
      title: 'Save export',
      defaultPath: join('/home/op/Documents', 'KR-3 forecast.csv'),
      filters: [{ name: 'CSV table', extensions: ['csv'] }, { name: 'All files', extensions: ['*'] }],
      properties: ['createDirectory', 'showOverwriteConfirmation'],
    });
    expect(saveDialogOptions('report.XYZ', '/d').filters?.[0]).toEqual({ name: 'XYZ file', extensions: ['xyz'] });
    expect(saveDialogOptions('noext', '/d').filters).toEqual([{ name: 'All files', extensions: ['*'] }]);
  });

  it('never leaves Documents through the suggested name', () => {
    expect(saveDialogOptions('../../.bashrc', '/d').defaultPath).toBe(join('/d', '.bashrc'));
    expect(saveDialogOptions('..\\..\\evil.csv', '/d').defaultPath).toBe(join('/d', 'evil.csv'));
    expect(saveDialogOptions('', '/d').defaultPath).toBe(join('/d', 'tauwell-export'));
  });
});

describe('the session', () => {
  function fakeSession() {
    const listeners = new Map<string, (...args: unknown[]) => void>();
    return {
      listeners,
      beforeRequest: undefined as undefined | ((details: { url: string }, cb: (r: { cancel: boolean }) => void) => void),
      on: (name: string, fn: (...args: unknown[]) => void) => void listeners.set(name, fn),
      setPermissionRequestHandler() {},
      setPermissionCheckHandler() {},
      webRequest: {
        onBeforeRequest(fn: never) { s.beforeRequest = fn; },
        onHeadersReceived() {},
      },
    };
  }
  let s = fakeSession();

  function download(url: string, pageUrl: string | undefined) {
    s = fakeSession();
    const log: string[] = [];
    handleDownloads(s as never, { location: fileApp, documentsFolder: () => '/home/op/Documents', log: (t) => log.push(t) });
    const event = { preventDefault: vi.fn() };
    const item = { getURL: () => url, getFilename: () => 'KR-3 readings.csv', setSaveDialogOptions: vi.fn() };
    s.listeners.get('will-download')!(event, item, pageUrl === undefined ? undefined : { getURL: () => pageUrl });
    return { event, item, log };
  }

  it('will-download: an own export gets the native save dialog in Documents', () => {
    const { event, item } = download(`blob:file:///${ID}`, PAGE);
    expect(event.preventDefault).not.toHaveBeenCalled();
    expect(item.setSaveDialogOptions).toHaveBeenCalledWith(expect.objectContaining({ defaultPath: join('/home/op/Documents', 'KR-3 readings.csv') }));
  });

  it('will-download: anything else is cancelled and logged', () => {
    for (const [url, page] of [['https://evil.example/x.exe', PAGE], [`blob:file:///${ID}`, 'https://evil.example/'], [`blob:file:///${ID}`, undefined]] as const) {
      const { event, item, log } = download(url, page);
      expect(event.preventDefault, url).toHaveBeenCalled();
      expect(item.setSaveDialogOptions).not.toHaveBeenCalled();
      expect(log.join('')).toMatch(/download cancelled/);
    }
  });

  it('the request filter lets the page\'s own blob: URLs through and still cancels foreign ones', () => {
    s = fakeSession();
    hardenSession(s as never, fileApp);
    const cancelled = (url: string) => {
      let answer: boolean | undefined;
      s.beforeRequest!({ url }, (r) => (answer = r.cancel));
      return answer;
    };
    expect(cancelled(`blob:file:///${ID}`)).toBe(false);
    expect(cancelled(PAGE)).toBe(false);
    expect(cancelled(`blob:https://evil.example/${ID}`)).toBe(true);
    expect(cancelled(`blob:null/${ID}`)).toBe(true);
    expect(cancelled('https://evil.example/')).toBe(true);
  });
});
