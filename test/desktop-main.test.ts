// The desktop shell without an Electron binary: `electron` is replaced by recording fakes, and the
// window, session, IPC and preload set-up is checked against Electron's security checklist
// (electronjs.org/docs/latest/tutorial/security, "Checklist: Security recommendations"; the item
// numbers below are that list's order, recalled from memory).
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { CHANNELS } from '../src/shared/contract/channels.js';
import type { TauwellServices } from '../src/shared/contract/index.js';
import { tempDir } from './db-helpers.js';

type Listener = (...args: any[]) => unknown; // eslint-disable-line @typescript-eslint/no-explicit-any

const h = vi.hoisted(() => {
  class FakeContents {
    listeners = new Map<string, Listener[]>();
    windowOpenHandler: Listener | undefined;
    on(name: string, fn: Listener) {
      this.listeners.set(name, [...(this.listeners.get(name) ?? []), fn]);
      return this;
    }
    setWindowOpenHandler(fn: Listener) {
      this.windowOpenHandler = fn;
    }
    reload() {}
    send() {}
    /** Emits `name` with a fresh event and says whether any listener prevented it. */
    emit(name: string, ...args: unknown[]): boolean {
      let prevented = false;
      const event = { preventDefault: () => (prevented = true), isMainFrame: args[1] ?? true };
      for (const fn of this.listeners.get(name) ?? []) fn(event, ...args);
      return prevented;
    }
  }
  class FakeWindow {
    static all: FakeWindow[] = [];
    webContents = new FakeContents();
    loaded: string[] = [];
    constructor(public options: Record<string, any>) { // eslint-disable-line @typescript-eslint/no-explicit-any
      FakeWindow.all.push(this);
    }
    once() {}
    on() {}
    loadURL(url: string) {
      this.loaded.push(url);
      return Promise.resolve();
    }
  }
  const session = {
    permissionRequest: undefined as Listener | undefined,
    permissionCheck: undefined as Listener | undefined,
    beforeRequest: undefined as Listener | undefined,
    headersReceived: undefined as Listener | undefined,
    on: vi.fn(),
    setPermissionRequestHandler(fn: Listener) { session.permissionRequest = fn; },
    setPermissionCheckHandler(fn: Listener) { session.permissionCheck = fn; },
    webRequest: {
      onBeforeRequest(fn: Listener) { session.beforeRequest = fn; },
      onHeadersReceived(fn: Listener) { session.headersReceived = fn; },
    },
  };
  const handlers = new Map<string, Listener>();
  const appListeners = new Map<string, Listener>();
  const app = {
    lock: true,
    userData: '',
    appRoot: '',
    quit: vi.fn(),
    exit: vi.fn(),
    requestSingleInstanceLock: () => app.lock,
    whenReady: () => Promise.resolve(),
    on: (name: string, fn: Listener) => appListeners.set(name, fn),
    getPath: (name: string) => (name === 'userData' ? app.userData : name === 'documents' ? join(app.userData, 'Documents') : ''),
    getAppPath: () => app.appRoot,
    getVersion: () => '0.1.0',
    isPackaged: true,
  };
  const exposed = new Map<string, unknown>();
  return {
    FakeWindow, session, handlers, app, appListeners, exposed,
    ipcMain: { handle: vi.fn((channel: string, fn: Listener) => handlers.set(channel, fn)), removeHandler: vi.fn((channel: string) => handlers.delete(channel)) },
    ipcRenderer: { invoke: vi.fn(async () => ({ ok: true, value: 'sent' })), on: vi.fn(), removeListener: vi.fn() },
    dialog: { showErrorBox: vi.fn(), showMessageBox: vi.fn(async () => ({ response: 0 })) },
    Menu: { buildFromTemplate: vi.fn((template: unknown) => template), setApplicationMenu: vi.fn() },
    shell: { openPath: vi.fn(async () => ''), showItemInFolder: vi.fn() },
  };
});

vi.mock('electron', () => ({
  app: h.app,
  BrowserWindow: h.FakeWindow,
  ipcMain: h.ipcMain,
  ipcRenderer: h.ipcRenderer,
  session: { defaultSession: h.session },
  dialog: h.dialog,
  Menu: h.Menu,
  shell: h.shell,
  contextBridge: { exposeInMainWorld: (key: string, api: unknown) => h.exposed.set(key, api) },
}));

const { appLocation, createMainWindow, hardenSession, windowOptions } = await import('../src/main/desktop/window.js');
const { registerIpc, REFUSED_SENDER } = await import('../src/main/desktop/ipc.js');

const INDEX = join(tempDir(), 'renderer', 'index.html');
const location = appLocation(INDEX);
const APP_URL = pathToFileURL(INDEX).href;

beforeEach(() => {
  h.handlers.clear();
  h.FakeWindow.all.length = 0;
  vi.clearAllMocks();
});

describe('the window (security checklist items 2–4, 6, 8–10, 12–14)', () => {
  it('isolates and sandboxes the renderer, without Node, with web security on', () => {
    const prefs = windowOptions('/app/out/preload/preload.cjs', '0.1.0').webPreferences!;
    expect(prefs).toMatchObject({
      contextIsolation: true, sandbox: true, nodeIntegration: false, nodeIntegrationInWorker: false, nodeIntegrationInSubFrames: false,
      webSecurity: true, allowRunningInsecureContent: false, experimentalFeatures: false, webviewTag: false, navigateOnDragDrop: false,
      preload: '/app/out/preload/preload.cjs',
    });
    expect(prefs.enableBlinkFeatures).toBeUndefined();
  });

  it('loads only the app\'s own file, and denies navigation, redirects, new windows and webviews', () => {
    createMainWindow({ preloadPath: '/p.cjs', location, version: '0.1.0' });
    const [win] = h.FakeWindow.all;
    expect(win.loaded).toEqual([APP_URL]);
    expect(new URL(win.loaded[0]).protocol).toBe('file:');
    const contents = win.webContents;
    expect(contents.windowOpenHandler?.({ url: 'https://evil.example/' })).toEqual({ action: 'deny' });
    expect(contents.windowOpenHandler?.({ url: APP_URL })).toEqual({ action: 'deny' });
    expect(contents.emit('will-navigate', 'https://evil.example/')).toBe(true);
    expect(contents.emit('will-navigate', 'file:///etc/passwd')).toBe(true);
    expect(contents.emit('will-redirect', 'https://evil.example/')).toBe(true);
    expect(contents.emit('will-attach-webview', {}, {})).toBe(true);
    expect(contents.emit('will-frame-navigate', 'https://evil.example/', false)).toBe(true);
  });
});

describe('the session (checklist items 1, 5, 7)', () => {
  beforeEach(() => hardenSession(h.session as never, location));

  it('denies every permission request and check', () => {
    for (const permission of ['media', 'geolocation', 'notifications', 'openExternal', 'clipboard-read', 'unknown']) {
      const callback = vi.fn();
      h.session.permissionRequest!({}, permission, callback, {});
      expect(callback, permission).toHaveBeenCalledWith(false);
      expect(h.session.permissionCheck!({}, permission, 'file://', {}), permission).toBe(false);
    }
  });

  it('cancels every request outside the app\'s own files (no remote content)', () => {
    const cancelled = (url: string): boolean => {
      let answer: boolean | undefined;
      h.session.beforeRequest!({ url }, (r: { cancel: boolean }) => (answer = r.cancel));
      return answer as boolean;
    };
    expect(cancelled(APP_URL)).toBe(false);
    expect(cancelled(pathToFileURL(join(INDEX, '..', 'assets', 'index-1.js')).href)).toBe(false);
    expect(cancelled('data:image/png;base64,AA==')).toBe(false);
    for (const url of ['https://cdn.example/lib.js', 'http://127.0.0.1:8080/api/listWells', 'ws://evil.example/', 'file:///etc/passwd', pathToFileURL(join(INDEX, '..', '..', 'secret.txt')).href]) {
      expect(cancelled(url), url).toBe(true);
    }
  });

  it('puts the strict CSP on every response, replacing any other', () => {
    let headers: Record<string, string[]> = {};
    h.session.headersReceived!({ responseHeaders: { 'content-security-policy': ["default-src *"], 'Content-Type': ['text/html'] } }, (r: { responseHeaders: Record<string, string[]> }) => (headers = r.responseHeaders));
    expect(headers['content-security-policy']).toBeUndefined();
    expect(headers['Content-Type']).toEqual(['text/html']);
    const [csp] = headers['Content-Security-Policy'];
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval/);
  });

  it('knows the app\'s page from any other', () => {
    expect(location.isAppDocument(APP_URL)).toBe(true);
    expect(location.isAppDocument(`${APP_URL}#/wells`)).toBe(true);
    for (const url of ['https://evil.example/', 'file:///tmp/other.html', pathToFileURL(join(INDEX, '..', 'other.html')).href, 'not a url', '']) {
      expect(location.isAppDocument(url), url).toBe(false);
    }
  });
});

describe('IPC (checklist item 17: validate the sender of every IPC message)', () => {
  const spyServices = () => {
    const calls: [string, unknown][] = [];
    const services = new Proxy({}, {
      get: (_t, name: string) => (request: unknown) => {
        calls.push([name, request]);
        return { called: name, nan: NaN, list: new Float64Array([1, Infinity]) };
      },
    }) as TauwellServices;
    return { services, calls };
  };
  const fromApp = { senderFrame: { url: APP_URL, parent: null } };

  it('registers exactly the allowlisted channels, and removes them again', () => {
    const unregister = registerIpc({ services: spyServices().services, isAppDocument: location.isAppDocument });
    expect([...h.handlers.keys()].sort()).toEqual([...CHANNELS].sort());
    expect(h.ipcMain.handle).toHaveBeenCalledTimes(CHANNELS.length);
    unregister();
    expect(h.handlers.size).toBe(0);
  });

  it('answers the app\'s page with the wire encoding', async () => {
    const { services, calls } = spyServices();
    registerIpc({ services, isAppDocument: location.isAppDocument });
    const reply = await h.handlers.get('tauwell:listWells')!(fromApp, { field: 'Kettle Ridge (invented)' });
    expect(reply).toEqual({ ok: true, value: { called: 'listWells', nan: null, list: [1, null] } });
    expect(calls).toEqual([['listWells', { field: 'Kettle Ridge (invented)' }]]);
  });

  it('refuses a payload that fails its schema without calling the service', async () => {
    const { services, calls } = spyServices();
    registerIpc({ services, isAppDocument: location.isAppDocument });
    const reply = await h.handlers.get('tauwell:logReading')!(fromApp, { well: 'KR-1', time: '2025-03-01T12:00:00Z', productionTemperature: '150' });
    expect(reply).toEqual({
      ok: false, kind: 'input', field: 'productionTemperature', reason: 'must be a finite number (got "150")',
      error: 'field "productionTemperature": must be a finite number (got "150")',
    });
    expect(await h.handlers.get('tauwell:getWell')!(fromApp, undefined)).toMatchObject({ ok: false, kind: 'input', error: 'must be an object (got nothing)' });
    expect(calls).toEqual([]);
  });

  it('refuses a foreign sender frame, a sub-frame and a frame that is gone', async () => {
    const { services, calls } = spyServices();
    const log: string[] = [];
    registerIpc({ services, isAppDocument: location.isAppDocument, log: (t) => log.push(t) });
    const handler = h.handlers.get('tauwell:listWells')!;
    for (const event of [
      { senderFrame: { url: 'https://evil.example/', parent: null } },
      { senderFrame: { url: 'file:///tmp/other.html', parent: null } },
      { senderFrame: { url: APP_URL, parent: { url: 'https://evil.example/' } } },
      { senderFrame: null },
    ]) {
      expect(await handler(event, {}), JSON.stringify(event)).toEqual({ ok: false, kind: 'refused', error: REFUSED_SENDER });
    }
    expect(calls).toEqual([]);
    expect(log.join('')).toMatch(/refused tauwell:listWells from https:\/\/evil\.example\//);
  });

  it('sends no stack to the renderer', async () => {
    const log: string[] = [];
    const services = { listWells: () => { throw new Error('internal detail'); } } as unknown as TauwellServices;
    registerIpc({ services, isAppDocument: location.isAppDocument, log: (t) => log.push(t) });
    const reply = await h.handlers.get('tauwell:listWells')!(fromApp, {});
    expect(reply).toMatchObject({ ok: false, kind: 'internal' });
    expect(JSON.stringify(reply)).not.toMatch(/internal detail/);
    expect(log.join('')).toMatch(/internal detail/);
  });
});

describe('the preload bridge (checklist item 20: do not expose Electron APIs to untrusted content)', () => {
  it('exposes only invoke for the allowlist, the menu\'s screen requests, and the version', async () => {
    process.argv.push('--tauwell-version=9.9.9');
    try {
      vi.resetModules();
      await import('../src/main/desktop/preload.js');
    } finally {
      process.argv.pop();
    }
    const bridge = h.exposed.get('tauwell') as { version: string; invoke: (c: unknown, p: unknown) => Promise<unknown> };
    expect([...h.exposed.keys()]).toEqual(['tauwell']);
    expect(Object.keys(bridge).sort()).toEqual(['invoke', 'onNavigate', 'version']);
    expect(bridge.version).toBe('9.9.9');
    expect(Object.isFrozen(bridge)).toBe(true);
    expect(await bridge.invoke('tauwell:listWells', {})).toEqual({ ok: true, value: 'sent' });
    expect(h.ipcRenderer.invoke).toHaveBeenCalledWith('tauwell:listWells', {});
    for (const channel of ['tauwell:__proto__', 'ELECTRON_BROWSER_REQUIRE', 'listWells', 42]) {
      await expect(bridge.invoke(channel, {})).rejects.toThrow(/not a Tauwell channel/);
    }
    expect(h.ipcRenderer.invoke).toHaveBeenCalledTimes(1);
  });
});

describe('the main process', () => {
  let root: string;
  beforeEach(() => {
    root = tempDir();
    h.app.userData = join(root, 'userData');
    h.app.appRoot = root;
    mkdirSync(h.app.userData);
    h.appListeners.clear();
    vi.resetModules();
  });
  afterEach(() => {
    h.appListeners.get('will-quit')?.();
  });

  it('quits at once when another instance holds the lock', async () => {
    h.app.lock = false;
    try {
      await import('../src/main/desktop/index.js');
    } finally {
      h.app.lock = true;
    }
    expect(h.app.quit).toHaveBeenCalled();
    expect(h.FakeWindow.all).toEqual([]);
    expect(h.handlers.size).toBe(0);
  });

  it('builds the demo into userData/tauwell.sqlite the first time, then serves it over IPC to one hardened window', async () => {
    await import('../src/main/desktop/index.js');
    await vi.waitFor(() => expect(h.FakeWindow.all).toHaveLength(1));
    expect(existsSync(join(h.app.userData, 'tauwell.sqlite'))).toBe(true);
    expect([...h.handlers.keys()].sort()).toEqual([...CHANNELS].sort());
    const [win] = h.FakeWindow.all;
    expect(win.options.webPreferences.preload).toMatch(/[/\\]preload[/\\]preload\.cjs$/);
    expect(win.loaded[0]).toMatch(/^file:.*\/renderer\/index\.html$/);
    expect(h.appListeners.has('web-contents-created')).toBe(true);
    expect(h.appListeners.has('second-instance')).toBe(true);
    const wells = await h.handlers.get('tauwell:listWells')!({ senderFrame: { url: win.loaded[0], parent: null } }, {}) as { ok: boolean; value: { fields: { name: string }[] } };
    expect(wells.ok).toBe(true);
    // The invented demo field has wells KR-1, KR-2, KR-3 and an injection well (src/shared/demo/invented-field.ts).
    expect(wells.value.fields[0].name).toBe('Kettle Ridge (invented)');
    expect(h.dialog.showErrorBox).not.toHaveBeenCalled();
  });
});

describe('the desktop field log', () => {
  it('is built from the demo only the first time', async () => {
    const { openDesktopFieldLog } = await import('../src/main/desktop/field-log.js');
    const folder = tempDir();
    const first = openDesktopFieldLog(folder);
    expect(first.builtDemo).toBe(true);
    expect(first.file).toBe(join(folder, 'tauwell.sqlite'));
    first.fdb.db.prepare("UPDATE fields SET notes = 'kept'").run();
    first.fdb.close();
    const second = openDesktopFieldLog(folder);
    try {
      expect(second.builtDemo).toBe(false);
      expect((second.fdb.db.prepare('SELECT notes FROM fields').get() as { notes: string }).notes).toBe('kept');
    } finally {
      second.fdb.close();
    }
  });

  it('uses a separate Electron build of the SQLite addon only where one was made', async () => {
    const { ELECTRON_ADDON, electronAddonPath } = await import('../src/main/desktop/field-log.js');
    const root = tempDir();
    expect(electronAddonPath(root)).toBeUndefined();
    mkdirSync(join(root, 'native', 'electron'), { recursive: true });
    writeFileSync(join(root, ELECTRON_ADDON), '');
    expect(electronAddonPath(root)).toBe(join(root, 'native', 'electron', 'better_sqlite3.node'));
  });
});
