// The desktop shell with Electron replaced by recording fakes: switching field logs (the old log
// closed, IPC handlers removed before the new ones are registered, the window reloaded), the menu's
// commands (New…/Open…/recent, About, cautions, user guide, show in folder, screens), the log the
// next start reopens, and the preload's one-way screen channel.
//
// A closed SQLite connection in WAL mode removes its -wal file when it is the last one (SQLite
// documentation, "Write-Ahead Logging", section on the WAL file's persistence; recalled from
// memory): that is how these tests see that a log was closed from outside the main process.
import { existsSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import type { MenuItemConstructorOptions } from 'electron';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { CAUTIONS } from '../src/shared/cautions.js';
import { CHANNELS, NAVIGATE_CHANNEL } from '../src/shared/contract/channels.js';
import { tempDir } from './db-helpers.js';

type Listener = (...args: any[]) => any; // eslint-disable-line @typescript-eslint/no-explicit-any

const h = vi.hoisted(() => {
  class FakeContents {
    reload = vi.fn();
    send = vi.fn();
    on() {
      return this;
    }
    setWindowOpenHandler() {}
  }
  class FakeWindow {
    static all: FakeWindow[] = [];
    webContents = new FakeContents();
    loaded: string[] = [];
    onceListeners = new Map<string, Listener>();
    constructor(public options: unknown) {
      FakeWindow.all.push(this);
    }
    once(name: string, fn: Listener) {
      this.onceListeners.set(name, fn);
    }
    on() {}
    loadURL(url: string) {
      this.loaded.push(url);
      return Promise.resolve();
    }
  }
  const handlers = new Map<string, Listener>();
  const appListeners = new Map<string, Listener>();
  const menus: MenuItemConstructorOptions[][] = [];
  const app = {
    userData: '',
    appRoot: '',
    quit: vi.fn(),
    exit: vi.fn(),
    requestSingleInstanceLock: () => true,
    whenReady: () => Promise.resolve(),
    on: (name: string, fn: Listener) => appListeners.set(name, fn),
    getPath: (name: string) => (name === 'userData' ? app.userData : name === 'documents' ? join(app.appRoot, 'Documents') : ''),
    getAppPath: () => app.appRoot,
    getVersion: () => '0.1.0',
    isPackaged: true,
  };
  const rendererListeners = new Map<string, Listener>();
  return {
    FakeWindow, handlers, appListeners, menus, app, rendererListeners,
    exposed: new Map<string, unknown>(),
    session: {
      on: vi.fn(),
      setPermissionRequestHandler() {},
      setPermissionCheckHandler() {},
      webRequest: { onBeforeRequest() {}, onHeadersReceived() {} },
    },
    ipcMain: {
      // As Electron does: a second handler for a channel is an error, so a switch must remove the old ones first.
      handle: vi.fn((channel: string, fn: Listener) => {
        if (handlers.has(channel)) throw new Error(`Attempted to register a second handler for '${channel}'`);
        handlers.set(channel, fn);
      }),
      removeHandler: vi.fn((channel: string) => handlers.delete(channel)),
    },
    ipcRenderer: {
      invoke: vi.fn(),
      on: vi.fn((channel: string, fn: Listener) => rendererListeners.set(channel, fn)),
      removeListener: vi.fn((channel: string, fn: Listener) => {
        if (rendererListeners.get(channel) === fn) rendererListeners.delete(channel);
      }),
    },
    dialog: {
      showErrorBox: vi.fn(),
      showMessageBox: vi.fn(async (..._args: unknown[]) => ({ response: 0 })),
      showOpenDialog: vi.fn(async (..._args: unknown[]) => ({ canceled: true, filePaths: [] as string[] })),
      showSaveDialog: vi.fn(async (..._args: unknown[]) => ({ canceled: true, filePath: '' })),
    },
    Menu: { buildFromTemplate: vi.fn((t: MenuItemConstructorOptions[]) => t), setApplicationMenu: vi.fn((m: MenuItemConstructorOptions[]) => void menus.push(m)) },
    shell: { openPath: vi.fn(async (_path: string) => ''), showItemInFolder: vi.fn() },
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

const { openFieldLogFile } = await import('../src/main/desktop/field-log.js');
const { createLogSwitcher } = await import('../src/main/desktop/log-switch.js');
const { registerIpc } = await import('../src/main/desktop/ipc.js');
const { createServices } = await import('../src/main/services/index.js');

beforeEach(() => {
  h.handlers.clear();
  h.menus.length = 0;
  h.FakeWindow.all.length = 0;
  vi.clearAllMocks();
});

describe('switching field logs (log-switch.ts)', () => {
  function recordingSwitcher() {
    const events: string[] = [];
    const switcher = createLogSwitcher({
      open: (file) => {
        events.push(`open ${basename(file)}`);
        const opened = openFieldLogFile(file);
        const close = opened.fdb.close;
        return { ...opened, fdb: { ...opened.fdb, close: () => { events.push(`close ${basename(file)}`); close(); } } };
      },
      services: (fdb) => createServices(fdb),
      register: (services) => {
        events.push('register');
        const unregister = registerIpc({ services, isAppDocument: () => true });
        return () => {
          events.push('unregister');
          unregister();
        };
      },
      reload: () => events.push('reload'),
    });
    return { switcher, events };
  }

  it('opens the new log, removes the handlers, closes the old log, registers again and reloads', () => {
    const folder = tempDir();
    const { switcher, events } = recordingSwitcher();
    const a = switcher.open(join(folder, 'a.sqlite'));
    expect(events).toEqual(['open a.sqlite', 'register']);
    expect([...h.handlers.keys()].sort()).toEqual([...CHANNELS].sort());
    events.length = 0;

    const b = switcher.open(join(folder, 'b.sqlite'));
    expect(events).toEqual(['open b.sqlite', 'unregister', 'close a.sqlite', 'register', 'reload']);
    expect(a.fdb.db.open).toBe(false);
    expect(b.fdb.db.open).toBe(true);
    expect(switcher.active?.file).toBe(join(folder, 'b.sqlite'));
    expect(h.ipcMain.removeHandler).toHaveBeenCalledTimes(CHANNELS.length);
    expect([...h.handlers.keys()].sort()).toEqual([...CHANNELS].sort());

    events.length = 0;
    expect(switcher.open(join(folder, '.', 'b.sqlite'))).toBe(b); // the open log: nothing to do
    expect(events).toEqual([]);
    switcher.close();
    expect(events).toEqual(['unregister', 'close b.sqlite']);
    expect(h.handlers.size).toBe(0);
  });

  it('a log that cannot be opened changes nothing', () => {
    const folder = tempDir();
    const bad = join(folder, 'not-a-log.sqlite');
    writeFileSync(bad, 'this is not an SQLite file, just text long enough to be read as a header '.repeat(20));
    const { switcher, events } = recordingSwitcher();
    const a = switcher.open(join(folder, 'a.sqlite'));
    events.length = 0;
    expect(() => switcher.open(bad)).toThrow(/not a Tauwell field log/);
    expect(events).toEqual(['open not-a-log.sqlite']);
    expect(switcher.active).toBe(a);
    expect(a.fdb.db.open).toBe(true);
    expect(h.handlers.size).toBe(CHANNELS.length);
    switcher.close();
  });
});

// ---- the main process, through its menu ----

const plain = (label: string | undefined) => label?.replace(/&(?!&)/g, '').replace(/&&/g, '&');
function menuItem(...path: string[]): MenuItemConstructorOptions {
  let items = h.menus.at(-1) ?? [];
  let found: MenuItemConstructorOptions | undefined;
  for (const label of path) {
    found = items.find((i) => plain(i.label) === label);
    if (found === undefined) throw new Error(`no menu item ${path.join(' → ')}`);
    items = (found.submenu ?? []) as MenuItemConstructorOptions[];
  }
  return found!;
}
const click = (...path: string[]) => (menuItem(...path).click as unknown as () => void)();
const recentLabels = () => ((menuItem('File', 'Open recent').submenu ?? []) as MenuItemConstructorOptions[]).map((i) => plain(i.label ?? i.type));

describe('the main process', () => {
  let root: string;
  let defaultLog: string;
  beforeEach(() => {
    root = tempDir();
    h.app.appRoot = root;
    h.app.userData = root;
    defaultLog = join(root, 'tauwell.sqlite');
    h.appListeners.clear();
    vi.resetModules();
  });
  afterEach(() => h.appListeners.get('will-quit')?.());

  async function start() {
    h.FakeWindow.all.length = 0;
    await import('../src/main/desktop/index.js');
    await vi.waitFor(() => expect(h.FakeWindow.all).toHaveLength(1));
    return h.FakeWindow.all[0];
  }
  async function quit() {
    h.appListeners.get('will-quit')?.();
    h.appListeners.clear();
    h.handlers.clear();
    vi.resetModules();
  }
  async function fields(win: InstanceType<typeof h.FakeWindow>): Promise<string[]> {
    const reply = await h.handlers.get('tauwell:listWells')!({ senderFrame: { url: win.loaded[0], parent: null } }, {});
    expect(reply.ok).toBe(true);
    return reply.value.fields.map((f: { name: string }) => f.name);
  }
  const recentJson = () => JSON.parse(readFileSync(join(root, 'recent-field-logs.json'), 'utf8'));
  const emptyLog = (name: string) => {
    const file = join(root, name);
    openFieldLogFile(file).fdb.close();
    return file;
  };

  it('first start: the demo in userData, remembered as the last log; downloads go through the handler', async () => {
    const win = await start();
    // The invented demo field (src/shared/demo/invented-field.ts).
    expect(await fields(win)).toEqual(['Kettle Ridge (invented)']);
    expect(recentJson()).toEqual({ version: 1, last: defaultLog, files: [defaultLog] });
    expect(recentLabels()).toEqual([defaultLog, 'separator', 'Clear recent']);
    expect(h.session.on).toHaveBeenCalledWith('will-download', expect.any(Function));
  });

  it('Open…: a native dialog for SQLite files, then the switch: old log closed, IPC re-registered, window reloaded', async () => {
    const other = emptyLog('other.sqlite');
    const win = await start();
    expect(existsSync(`${defaultLog}-wal`)).toBe(true);
    h.dialog.showOpenDialog.mockResolvedValueOnce({ canceled: false, filePaths: [other] });
    click('File', 'Open field log…');
    await vi.waitFor(() => expect(win.webContents.reload).toHaveBeenCalledTimes(1));
    const [, options] = h.dialog.showOpenDialog.mock.calls[0] as [unknown, { filters: unknown[]; properties: string[] }];
    expect(options.filters[0]).toEqual({ name: 'SQLite field log', extensions: ['sqlite', 'db'] });
    expect(options.properties).toEqual(['openFile']);
    expect(existsSync(`${defaultLog}-wal`)).toBe(false); // the demo log was closed
    expect(h.ipcMain.removeHandler).toHaveBeenCalledTimes(CHANNELS.length);
    expect(h.ipcMain.handle).toHaveBeenCalledTimes(2 * CHANNELS.length);
    expect(await fields(win)).toEqual([]); // the new log is the empty one
    expect(recentJson()).toEqual({ version: 1, last: other, files: [other, defaultLog] });
    expect(recentLabels()).toEqual([other, defaultLog, 'separator', 'Clear recent']);

    // The next start reopens it, and does not touch the demo log.
    await quit();
    const again = await start();
    expect(await fields(again)).toEqual([]);
    expect(existsSync(`${defaultLog}-wal`)).toBe(false);
  });

  it('Open recent switches back; "Clear recent" empties the list but the next start still reopens the last log', async () => {
    const other = emptyLog('other.sqlite');
    const win = await start();
    h.dialog.showOpenDialog.mockResolvedValueOnce({ canceled: false, filePaths: [other] });
    click('File', 'Open field log…');
    await vi.waitFor(() => expect(win.webContents.reload).toHaveBeenCalledTimes(1));
    click('File', 'Open recent', defaultLog);
    expect(win.webContents.reload).toHaveBeenCalledTimes(2);
    expect(await fields(win)).toEqual(['Kettle Ridge (invented)']);
    click('File', 'Open recent', other);
    expect(win.webContents.reload).toHaveBeenCalledTimes(3);
    expect(await fields(win)).toEqual([]);
    click('File', 'Open recent', 'Clear recent');
    expect(recentLabels()).toEqual(['No recent field logs', 'separator', 'Clear recent']);
    expect(recentJson()).toEqual({ version: 1, last: other, files: [] });

    await quit();
    const again = await start();
    expect(await fields(again)).toEqual([]);
    expect(recentLabels()).toEqual([other, 'separator', 'Clear recent']);
  });

  it('New…: an empty log, named .sqlite; an existing file is never overwritten', async () => {
    const win = await start();
    h.dialog.showSaveDialog.mockResolvedValueOnce({ canceled: false, filePath: join(root, 'pad-2') });
    click('File', 'New field log…');
    await vi.waitFor(() => expect(win.webContents.reload).toHaveBeenCalledTimes(1));
    const created = join(root, 'pad-2.sqlite');
    expect(existsSync(created)).toBe(true);
    expect(await fields(win)).toEqual([]);
    expect(recentJson().last).toBe(created);
    const [, options] = h.dialog.showSaveDialog.mock.calls[0] as [unknown, { defaultPath: string; filters: unknown[] }];
    expect(options.defaultPath).toBe(join(root, 'Documents', 'field-log.sqlite'));
    expect(options.filters).toEqual([{ name: 'SQLite field log', extensions: ['sqlite', 'db'] }]);

    // Choosing the demo log's file: asked, and "Cancel" leaves everything as it is.
    h.dialog.showSaveDialog.mockResolvedValueOnce({ canceled: false, filePath: defaultLog });
    h.dialog.showMessageBox.mockResolvedValueOnce({ response: 1 });
    click('File', 'New field log…');
    await vi.waitFor(() => expect(h.dialog.showMessageBox).toHaveBeenCalledTimes(1));
    expect(h.dialog.showMessageBox.mock.calls[0][1]).toMatchObject({ buttons: ['Open it', 'Cancel'], message: `${defaultLog} already exists.` });
    await new Promise((r) => setTimeout(r, 20));
    expect(win.webContents.reload).toHaveBeenCalledTimes(1);
    expect(await fields(win)).toEqual([]);
    expect(statSync(defaultLog).size).toBeGreaterThan(0);
  });

  it('a file that is not a field log: the reason is shown and the open log stays', async () => {
    const bad = join(root, 'notes.db');
    writeFileSync(bad, 'plain text, not SQLite '.repeat(40));
    const win = await start();
    h.dialog.showOpenDialog.mockResolvedValueOnce({ canceled: false, filePaths: [bad] });
    click('File', 'Open field log…');
    await vi.waitFor(() => expect(h.dialog.showErrorBox).toHaveBeenCalledTimes(1));
    expect(h.dialog.showErrorBox.mock.calls[0][1]).toMatch(/notes\.db.*not a Tauwell field log/);
    expect(win.webContents.reload).not.toHaveBeenCalled();
    expect(await fields(win)).toEqual(['Kettle Ridge (invented)']);
    expect(recentJson().files).toEqual([defaultLog]);
  });

  it('a last log that has gone: the default log opens, and a note says what was dropped', async () => {
    const gone = join(root, 'gone.sqlite');
    writeFileSync(join(root, 'recent-field-logs.json'), JSON.stringify({ version: 1, last: gone, files: [gone] }));
    const win = await start();
    expect(await fields(win)).toEqual(['Kettle Ridge (invented)']);
    win.onceListeners.get('ready-to-show')!();
    await vi.waitFor(() => expect(h.dialog.showMessageBox).toHaveBeenCalled());
    expect(h.dialog.showMessageBox.mock.calls[0][1]).toMatchObject({ detail: expect.stringContaining(`which no longer exists:\n${gone}`) });
    expect(recentJson()).toEqual({ version: 1, last: defaultLog, files: [defaultLog] });
  });

  it('a recent file deleted while the app runs is dropped when clicked, with a note', async () => {
    const other = emptyLog('other.sqlite');
    writeFileSync(join(root, 'recent-field-logs.json'), JSON.stringify({ version: 1, files: [other] }));
    const win = await start();
    rmSync(other);
    click('File', 'Open recent', other);
    expect(recentLabels()).toEqual([defaultLog, 'separator', 'Clear recent']);
    expect(win.webContents.reload).not.toHaveBeenCalled();
    await vi.waitFor(() => expect(h.dialog.showMessageBox).toHaveBeenCalled());
    expect(h.dialog.showMessageBox.mock.calls[0][1]).toMatchObject({ message: expect.stringContaining(other) });
  });

  it('View and Import CSV… ask the page for a screen on the one-way channel', async () => {
    const win = await start();
    click('View', 'Weekly log');
    click('File', 'Import CSV…');
    click('View', 'Settings');
    expect(win.webContents.send.mock.calls).toEqual([[NAVIGATE_CHANNEL, '#/log'], [NAVIGATE_CHANNEL, '#/import'], [NAVIGATE_CHANNEL, '#/settings']]);
  });

  it('Help and File: About, cautions, the user guide (a local file) and the log in its folder', async () => {
    await start();
    click('Help', 'About Tauwell');
    await vi.waitFor(() => expect(h.dialog.showMessageBox).toHaveBeenCalledTimes(1));
    const about = h.dialog.showMessageBox.mock.calls[0][1] as { detail: string };
    expect(about.detail).toContain('Version 0.1.0');
    expect(about.detail).toMatch(/Engine: Electron .* Node \d+\.\d+\.\d+\), SQLite 3\.\d+/);
    expect(about.detail).toContain(`Field log: ${defaultLog}`);

    click('Help', 'Cautions');
    await vi.waitFor(() => expect(h.dialog.showMessageBox).toHaveBeenCalledTimes(2));
    const cautions = h.dialog.showMessageBox.mock.calls[1][1] as { detail: string };
    for (const c of CAUTIONS) expect(cautions.detail).toContain(c);

    click('Help', 'Open the user guide');
    await vi.waitFor(() => expect(h.dialog.showMessageBox).toHaveBeenCalledTimes(3));
    expect(h.shell.openPath).not.toHaveBeenCalled(); // no README in this app folder
    writeFileSync(join(root, 'README.md'), '# Tauwell\n');
    click('Help', 'Open the user guide');
    await vi.waitFor(() => expect(h.shell.openPath).toHaveBeenCalledWith(join(root, 'README.md')));

    click('File', 'Show field log in folder');
    expect(h.shell.showItemInFolder).toHaveBeenCalledWith(defaultLog);
  });
});

describe('the preload\'s screen channel (checklist item 20: no IPC objects reach the page)', () => {
  it('relays known routes only, without the event, and stops when asked', async () => {
    vi.resetModules();
    await import('../src/main/desktop/preload.js');
    const bridge = h.exposed.get('tauwell') as { onNavigate: (cb: (...args: unknown[]) => void) => () => void };
    const seen: unknown[][] = [];
    const stop = bridge.onNavigate((...args) => seen.push(args));
    const relay = h.rendererListeners.get(NAVIGATE_CHANNEL)!;
    const event = { sender: h.ipcRenderer };
    relay(event, '#/import');
    relay(event, 'javascript:alert(1)');
    relay(event, { toString: () => '#/log' });
    relay(event, '#/field/../settings');
    relay(event, '#/settings');
    expect(seen).toEqual([['#/import'], ['#/settings']]);
    stop();
    expect(h.ipcRenderer.removeListener).toHaveBeenCalledWith(NAVIGATE_CHANNEL, relay);
    expect(h.rendererListeners.has(NAVIGATE_CHANNEL)).toBe(false);
    expect(() => bridge.onNavigate('not a function' as never)).toThrow(/needs a function/);
  });
});
