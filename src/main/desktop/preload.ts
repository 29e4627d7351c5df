// Preload bridge: the renderer's only door to the back end. It exposes `invoke` for the allowlisted
// channels and the version, nothing else (no ipcRenderer, no Node): window.tauwell is a TauwellBridge.
// Bundled as CommonJS (electron.vite.config.ts) because the renderer is sandboxed.
import { contextBridge, ipcRenderer } from 'electron';
import { CHANNELS, type CallReply, type TauwellBridge } from '../../shared/contract/channels.js';

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
};

contextBridge.exposeInMainWorld('tauwell', Object.freeze(bridge));
