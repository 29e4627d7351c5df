/**
 * The loopback server: the same service API the desktop window reaches over IPC, for a browser on
 * this machine, plus the built renderer as static files. It binds 127.0.0.1 only (never 0.0.0.0 or
 * ::), checks Host and Origin on every request and the launch's random token on every API call
 * (guard.ts), and exposes exactly the channel allowlist (channels.ts) as `POST /api/<method>`.
 *
 *   startLoopbackServer({ services, port?, staticDir?, maxBodyBytes?, log? }): Promise<LoopbackServer>
 *
 * Open `url` + `?token=` + token in a browser; the renderer takes the token from there.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { createDispatcher } from '../../shared/contract/dispatch.js';
import type { TauwellServices } from '../../shared/contract/index.js';
import { InputError } from '../../shared/errors.js';
import { API_PREFIX, handleApi, type ApiContext } from './api.js';
import { hostAllowed, newToken, originAllowed } from './guard.js';
import { sendError } from './headers.js';
import { serveStatic } from './static-files.js';

/** The only address the server ever listens on. */
export const LOOPBACK_ADDRESS = '127.0.0.1';
export const DEFAULT_MAX_BODY_BYTES = 1024 * 1024;

/** electron-vite's output for the renderer; three folders up from both src/main/server and dist/main/server. */
export const DEFAULT_STATIC_DIR = fileURLToPath(new URL('../../../out/renderer/', import.meta.url));

export interface LoopbackServerOptions {
  services: TauwellServices;
  /** Default 0: a free port chosen by the system. */
  port?: number;
  /** Folder of the built renderer; default out/renderer/ of the project. */
  staticDir?: string;
  /** Largest API request body accepted; default 1 MiB. */
  maxBodyBytes?: number;
  /** Where stacks of internal errors go; default stderr. */
  log?: (text: string) => void;
}

export interface LoopbackServer {
  /** http://127.0.0.1:PORT/ */
  url: string;
  /** 64 hex digits, new at every launch. */
  token: string;
  port: number;
  /** The socket address actually bound, as node reports it. */
  address(): AddressInfo;
  /** Stops listening and drops open connections. */
  close(): Promise<void>;
}

export async function startLoopbackServer(options: LoopbackServerOptions): Promise<LoopbackServer> {
  const wanted = options.port ?? 0;
  if (!Number.isInteger(wanted) || wanted < 0 || wanted > 65535) {
    throw new InputError(`must be a whole number from 0 to 65535 (got ${wanted})`, { field: 'port' });
  }
  const token = newToken();
  const staticDir = options.staticDir ?? DEFAULT_STATIC_DIR;
  const log = options.log ?? ((text: string) => void process.stderr.write(text));
  const api: ApiContext = { dispatch: createDispatcher(options.services), token, maxBodyBytes: options.maxBodyBytes ?? DEFAULT_MAX_BODY_BYTES, log };
  let port = wanted;

  const handle = async (req: IncomingMessage, res: ServerResponse): Promise<void> => {
    if (!hostAllowed(req.headers.host, port)) return sendError(res, 403, `refused: the Host header must be 127.0.0.1:${port} or localhost:${port}`);
    if (!originAllowed(req.headers.origin, port)) return sendError(res, 403, 'refused: requests from other origins are not accepted');
    const url = req.url ?? '';
    if (url.startsWith(API_PREFIX)) return handleApi(req, res, api);
    return serveStatic(req, res, staticDir);
  };

  const server = createServer((req, res) => {
    handle(req, res).catch((e: unknown) => {
      log(`tauwell serve: internal error on ${req.method} ${req.url}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
      if (!res.headersSent) sendError(res, 500, 'internal error in the Tauwell server; the details are in its log');
      else res.destroy();
    });
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', (e: NodeJS.ErrnoException) => {
      if (e.code === 'EADDRINUSE') reject(new InputError(`port ${wanted} on ${LOOPBACK_ADDRESS} is in use by another program; choose another, or 0 for a free one`, { field: 'port' }));
      else if (e.code === 'EACCES') reject(new InputError(`not allowed to listen on port ${wanted}; choose one above 1023, or 0 for a free one`, { field: 'port' }));
      else reject(e);
    });
    server.listen({ port: wanted, host: LOOPBACK_ADDRESS, exclusive: true }, () => resolve());
  });
  port = (server.address() as AddressInfo).port;

  return {
    url: `http://${LOOPBACK_ADDRESS}:${port}/`,
    token,
    port,
    address: () => server.address() as AddressInfo,
    close: () => new Promise<void>((resolve, reject) => {
      server.close((e) => (e === undefined ? resolve() : reject(e)));
      server.closeAllConnections();
    }),
  };
}
