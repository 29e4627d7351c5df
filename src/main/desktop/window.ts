/**
 * The desktop window and its session, set up after Electron's security checklist
 * (electronjs.org/docs/latest/tutorial/security): context isolation, a sandboxed renderer without
 * Node, web security on, no remote content (every request outside the app's own files is
 * cancelled), a Content-Security-Policy on every response, navigation, redirects, new windows and
 * <webview> denied, and every permission request and check answered "no".
 *
 *   appLocation(indexFile) / devServerLocation(url): AppLocation
 *   windowOptions(preloadPath, version): BrowserWindowConstructorOptions
 *   hardenSession(session, location)     permissions, request filter (the page's own blob: URLs pass), CSP header
 *   hardenContents(webContents)          navigation, redirects, new windows, webviews
 *   createMainWindow({ preloadPath, location, version }): BrowserWindow
 */
import { BrowserWindow, type BrowserWindowConstructorOptions, type Session, type WebContents } from 'electron';
import { dirname } from 'node:path';
import { pathToFileURL } from 'node:url';
import { RENDERER_CSP } from '../server/headers.js';
import { isAppBlobUrl } from './downloads.js';

/** Where the renderer comes from, and which URLs are its own. */
export interface AppLocation {
  /** What the window loads. */
  readonly url: string;
  /** The app's own page: the only sender IPC accepts. */
  isAppDocument(url: string): boolean;
  /** What the page may load: its own files (and data: images, which the CSP allows). */
  isAppResource(url: string): boolean;
}

function parsed(url: string): URL | undefined {
  try {
    return new URL(url);
  } catch {
    return undefined;
  }
}

/** The built renderer: index.html and the files beside it, as file: URLs. */
export function appLocation(indexFile: string): AppLocation {
  const page = pathToFileURL(indexFile);
  const folder = pathToFileURL(dirname(indexFile) + '/').pathname;
  return {
    url: page.href,
    isAppDocument: (url) => {
      const u = parsed(url);
      return u !== undefined && u.protocol === 'file:' && u.host === '' && u.pathname === page.pathname;
    },
    isAppResource: (url) => {
      const u = parsed(url);
      if (u === undefined) return false;
      if (u.protocol === 'data:' || u.protocol === 'devtools:') return true;
      return u.protocol === 'file:' && u.host === '' && u.pathname.startsWith(folder) && !u.pathname.slice(folder.length).split('/').includes('..');
    },
  };
}

/** electron-vite's development server (`electron-vite dev`), never used by a packaged app. */
export function devServerLocation(serverUrl: string): AppLocation {
  const origin = new URL(serverUrl);
  const sameServer = (u: URL | undefined, protocols: readonly string[]): boolean =>
    u !== undefined && protocols.includes(u.protocol) && u.host === origin.host;
  return {
    url: origin.href,
    isAppDocument: (url) => sameServer(parsed(url), [origin.protocol]),
    // ws: is the development server's hot reload.
    isAppResource: (url) => {
      const u = parsed(url);
      return u?.protocol === 'data:' || u?.protocol === 'devtools:' || sameServer(u, [origin.protocol, 'ws:']);
    },
  };
}

export function windowOptions(preloadPath: string, version: string): BrowserWindowConstructorOptions {
  return {
    width: 1280,
    height: 820,
    show: false,
    webPreferences: {
      preload: preloadPath,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      experimentalFeatures: false,
      webviewTag: false,
      navigateOnDragDrop: false,
      safeDialogs: true,
      spellcheck: false,
      // The preload reads the version from here: a sandboxed preload cannot read package.json.
      additionalArguments: [`--tauwell-version=${version}`],
    },
  };
}

export function hardenSession(session: Session, location: AppLocation): void {
  session.setPermissionRequestHandler((_contents, _permission, callback) => callback(false));
  session.setPermissionCheckHandler(() => false);
  // The page's own object URLs stay reachable: its exports are downloads of them (downloads.ts).
  session.webRequest.onBeforeRequest((details, callback) =>
    callback({ cancel: !(location.isAppResource(details.url) || isAppBlobUrl(details.url, location)) }));
  session.webRequest.onHeadersReceived((details, callback) => {
    const headers: Record<string, string[]> = {};
    for (const [name, value] of Object.entries(details.responseHeaders ?? {})) {
      if (name.toLowerCase() !== 'content-security-policy') headers[name] = value;
    }
    headers['Content-Security-Policy'] = [RENDERER_CSP];
    callback({ responseHeaders: headers });
  });
}

/** For every web contents the app creates: it stays on its page and opens nothing. */
export function hardenContents(contents: WebContents): void {
  contents.setWindowOpenHandler(() => ({ action: 'deny' }));
  contents.on('will-navigate', (event) => event.preventDefault());
  contents.on('will-frame-navigate', (event) => {
    if (!event.isMainFrame) event.preventDefault();
  });
  contents.on('will-redirect', (event) => event.preventDefault());
  contents.on('will-attach-webview', (event) => event.preventDefault());
}

export function createMainWindow(options: { preloadPath: string; location: AppLocation; version: string }): BrowserWindow {
  const window = new BrowserWindow(windowOptions(options.preloadPath, options.version));
  hardenContents(window.webContents);
  window.once('ready-to-show', () => window.show());
  void window.loadURL(options.location.url);
  return window;
}
