/**
 * Desktop shell (Electron main process): one instance, one window, the field log in userData
 * (field-log.ts), the services behind IPC (ipc.ts), the window and session hardened after
 * Electron's security checklist (window.ts).
 */
import { app, BrowserWindow, dialog, session } from 'electron';
import { userInfo } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../../shared/errors.js';
import type { FieldDb } from '../db/database.js';
import { createServices } from '../services/index.js';
import { ELECTRON_ADDON, electronAddonPath, openDesktopFieldLog } from './field-log.js';
import { registerIpc } from './ipc.js';
import { appLocation, createMainWindow, devServerLocation, hardenContents, hardenSession } from './window.js';

// out/main/desktop/index.js, two folders below out/preload/ and out/renderer/ (electron.vite.config.ts).
const PRELOAD = join(import.meta.dirname, '../../preload/preload.cjs');
const RENDERER_INDEX = join(import.meta.dirname, '../../renderer/index.html');

let fdb: FieldDb | undefined;
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
  try {
    fdb = openDesktopFieldLog(app.getPath('userData'), nativeBinding !== undefined ? { nativeBinding } : {}).fdb;
  } catch (e) {
    const detail = e instanceof InputError
      ? e.message
      : `${e instanceof Error ? e.message : String(e)}\n\nThe SQLite addon may be the Node build: make the Electron build at ${ELECTRON_ADDON} as DEVELOPERS.md describes.`;
    dialog.showErrorBox('Tauwell cannot open its field log', detail);
    app.exit(1);
    return;
  }
  const devUrl = app.isPackaged ? undefined : process.env.ELECTRON_RENDERER_URL;
  const location = devUrl !== undefined ? devServerLocation(devUrl) : appLocation(RENDERER_INDEX);
  hardenSession(session.defaultSession, location);
  registerIpc({ services: createServices(fdb, { who: who() }), isAppDocument: location.isAppDocument });
  mainWindow = createMainWindow({ preloadPath: PRELOAD, location, version: app.getVersion() });
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
  app.on('will-quit', () => fdb?.close());
  void app.whenReady().then(start);
}
