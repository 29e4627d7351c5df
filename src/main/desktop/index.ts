/**
 * Desktop shell (Electron main process): one instance, one window, the field log of the last
 * session (or the demo one in userData) with File → New…/Open…/recent to switch (log-switch.ts,
 * commands.ts), the services behind IPC (ipc.ts), the application menu (menu.ts), exports saved
 * through the native dialog (downloads.ts), the window and session hardened after Electron's
 * security checklist (window.ts).
 */
import { app, BrowserWindow, dialog, session } from 'electron';
import { userInfo } from 'node:os';
import { join, resolve } from 'node:path';
import { createServices } from '../services/index.js';
import { createDesktopShell } from './commands.js';
import { handleDownloads } from './downloads.js';
import { electronAddonPath, FIELD_LOG_FILE, openFailureDetail, openFieldLogFile } from './field-log.js';
import { registerIpc } from './ipc.js';
import { createLogSwitcher, type LogSwitcher } from './log-switch.js';
import { appLocation, createMainWindow, devServerLocation, hardenContents, hardenSession } from './window.js';

// out/main/desktop/index.js, two folders below out/preload/ and out/renderer/ (electron.vite.config.ts).
const PRELOAD = join(import.meta.dirname, '../../preload/preload.cjs');
const RENDERER_INDEX = join(import.meta.dirname, '../../renderer/index.html');

let switcher: LogSwitcher | undefined;
let mainWindow: BrowserWindow | undefined;

function who(): string {
  try {
    return userInfo().username;
  } catch {
    return process.env.USER ?? process.env.USERNAME ?? 'tauwell';
  }
}

function start(): void {
  const nativeBinding = electronAddonPath(app.getAppPath());
  const userData = app.getPath('userData');
  const defaultLog = resolve(userData, FIELD_LOG_FILE);
  const devUrl = app.isPackaged ? undefined : process.env.ELECTRON_RENDERER_URL;
  const location = devUrl !== undefined ? devServerLocation(devUrl) : appLocation(RENDERER_INDEX);
  hardenSession(session.defaultSession, location);
  handleDownloads(session.defaultSession, { location, documentsFolder: () => app.getPath('documents') });

  switcher = createLogSwitcher({
    // Only the default log is built from the demo: a log the user creates starts empty.
    open: (file) => openFieldLogFile(file, { ...(nativeBinding !== undefined ? { nativeBinding } : {}), demoWhenNew: resolve(file) === defaultLog }),
    services: (fdb) => createServices(fdb, { who: who(), parallelReads: true, ...(nativeBinding !== undefined ? { nativeBinding } : {}) }),
    register: (services) => registerIpc({ services, isAppDocument: location.isAppDocument }),
    reload: () => mainWindow?.webContents.reload(),
  });
  const desktop = createDesktopShell({
    userData,
    appRoot: app.getAppPath(),
    version: app.getVersion(),
    engine: { electron: process.versions.electron, chrome: process.versions.chrome, node: process.versions.node },
    platform: process.platform,
    devTools: !app.isPackaged,
    switcher,
    window: () => mainWindow,
    documentsFolder: () => app.getPath('documents'),
  });
  let notes: string[];
  try {
    notes = desktop.openAtStart();
  } catch (e) {
    dialog.showErrorBox('Tauwell cannot open its field log', openFailureDetail(e));
    app.exit(1);
    return;
  }
  mainWindow = createMainWindow({ preloadPath: PRELOAD, location, version: app.getVersion() });
  mainWindow.once('ready-to-show', () => desktop.showNotes(notes));
  mainWindow.on('closed', () => {
    mainWindow = undefined;
  });
}

if (!app.requestSingleInstanceLock()) {
  app.quit();
} else {
  app.on('second-instance', () => {
    if (mainWindow === undefined) return;
    if (mainWindow.isMinimized()) mainWindow.restore();
    mainWindow.focus();
  });
  // Every web contents, including any a future change creates, gets the same restrictions.
  app.on('web-contents-created', (_event, contents) => hardenContents(contents));
  app.on('window-all-closed', () => app.quit());
  app.on('will-quit', () => switcher?.close());
  void app.whenReady().then(start);
}
