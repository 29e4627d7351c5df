/**
 * The renderer's way to the back end, whichever shell it runs in: in the desktop window the
 * preload's `window.tauwell` bridge (Electron IPC); in a browser opened by `tauwell serve`, the
 * loopback server's `POST /api/<method>` with the launch's token.
 *
 *   connect(): TauwellClient
 *   takeToken(): string | undefined
 *
 * The server prints the page's address as `http://127.0.0.1:PORT/?token=…`. takeToken moves the
 * token from the address bar into this tab's sessionStorage and out of the URL, so it does not
 * linger in the history or get copied with the address (the server also sends no Referer).
 */
import type { TauwellBridge } from '../shared/contract/channels.js';
import { bridgeTransport, createClient, fetchTransport, type TauwellClient } from '../shared/contract/client.js';

declare global {
  interface Window {
    /** Set by the desktop shell's preload script; absent in a browser. */
    readonly tauwell?: TauwellBridge;
  }
}

const TOKEN_KEY = 'tauwell.token';

export function takeToken(): string | undefined {
  const url = new URL(window.location.href);
  const fromUrl = url.searchParams.get('token');
  if (fromUrl !== null && fromUrl !== '') {
    window.sessionStorage.setItem(TOKEN_KEY, fromUrl);
    url.searchParams.delete('token');
    window.history.replaceState(window.history.state, '', url.pathname + url.search + url.hash);
    return fromUrl;
  }
  return window.sessionStorage.getItem(TOKEN_KEY) ?? undefined;
}

export function connect(): TauwellClient {
  const bridge = window.tauwell;
  if (bridge !== undefined) return createClient(bridgeTransport(bridge));
  const token = takeToken();
  if (token === undefined) {
    throw new Error('no token: open the address that `tauwell serve` printed, including its ?token=… part');
  }
  return createClient(fetchTransport((url, init) => window.fetch(url, init), { token }));
}
