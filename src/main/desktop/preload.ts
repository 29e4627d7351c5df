// Preload bridge: the renderer's only door to the back end. It exposes `invoke` for the allowlisted
// channels, `onNavigate` for the menu's screen requests and the version, nothing else (no
// ipcRenderer, no Node, no IPC event objects): window.tauwell is a TauwellBridge.
// Bundled as CommonJS (electron.vite.config.ts) because the renderer is sandboxed.
import { contextBridge, ipcRenderer, type IpcRendererEvent } from 'electron';
import { CHANNELS, NAVIGATE_CHANNEL, isNavigateRoute, type CallReply, type TauwellBridge } from '../../shared/contract/channels.js';

const ALLOWED: ReadonlySet<string> = new Set(CHANNELS);

/** Passed by the main process as --tauwell-version=X (window.ts). */
function versionArgument(): string {
  const arg = process.argv.find((a) => a.startsWith('--tauwell-version='));
  return arg === undefined ? 'unknown' : arg.slice('--tauwell-version='.length);
}

const bridge: TauwellBridge = {
  version: versionArgument(),
  invoke(channel, payload) {
    if (typeof channel !== 'string' || !ALLOWED.has(channel)) {
      return Promise.reject(new Error(`tauwell: ${JSON.stringify(String(channel))} is not a Tauwell channel`));
    }
    return ipcRenderer.invoke(channel, payload) as Promise<CallReply>;
  },
  onNavigate(listener) {
    if (typeof listener !== 'function') throw new TypeError('tauwell: onNavigate needs a function');
    // The page gets the route only: the event would hand it `sender`, an ipcRenderer.
    const relay = (_event: IpcRendererEvent, route: unknown): void => {
      if (isNavigateRoute(route)) listener(route);
    };
    ipcRenderer.on(NAVIGATE_CHANNEL, relay);
    return () => {
      ipcRenderer.removeListener(NAVIGATE_CHANNEL, relay);
    };
  },
};

contextBridge.exposeInMainWorld('tauwell', Object.freeze(bridge));
