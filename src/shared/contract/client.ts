/**
 * The typed client the renderer uses: one async method per service, whatever carries the call.
 *
 *   createClient(transport): TauwellClient
 *   bridgeTransport(bridge)             over the preload's window.tauwell (Electron IPC)
 *   fetchTransport(fetch, { token })    over POST /api/<method> of the loopback server
 *   class CallError                     a call that failed for a reason other than bad input
 *
 * A transport resolves with the response in the wire encoding (channels.ts) or rejects: with an
 * InputError (field and reason as the back end named them) when the request was refused as bad
 * input, else with a CallError. fetchTransport takes `fetch` as a parameter so that this file needs
 * no DOM; src/renderer/api.ts hands it the browser's.
 */
import { InputError } from '../errors.js';
import { CHANNEL_PREFIX, SERVICE_METHODS, channelOf, type CallReply, type Channel, type TauwellBridge, type Wire } from './channels.js';
import type { ServiceName, TauwellServices } from './index.js';

export type Transport = (channel: Channel, payload: unknown) => Promise<unknown>;

/** A service's request, required or optional as the service has it; further parameters stay in the back end. */
type RequestOf<F extends (...args: never[]) => unknown> =
  Parameters<F> extends [] ? [] : Parameters<F> extends [infer R, ...unknown[]] ? [request: R] : [request?: Parameters<F>[0]];

export type TauwellClient = {
  readonly [K in ServiceName]: (...request: RequestOf<TauwellServices[K]>) => Promise<Wire<Awaited<ReturnType<TauwellServices[K]>>>>;
};

export class CallError extends Error {
  /** 'refused': the back end would not take the call (not the app's window, no or a wrong token, …). */
  readonly kind: 'refused' | 'internal' | 'transport';
  /** HTTP status, when the call went over HTTP. */
  readonly status: number | undefined;

  constructor(message: string, kind: CallError['kind'], status?: number) {
    super(message);
    this.name = 'CallError';
    this.kind = kind;
    this.status = status;
  }
}

export function createClient(transport: Transport): TauwellClient {
  const client: Record<string, (request?: unknown) => Promise<unknown>> = {};
  for (const method of SERVICE_METHODS) {
    const channel = channelOf(method);
    // Methods whose request is optional are sent {}: the back end checks every payload as given.
    client[method] = (request?: unknown) => transport(channel, request === undefined ? {} : request);
  }
  return Object.freeze(client) as unknown as TauwellClient;
}

/** Over the preload bridge: unwraps its `{ ok, value } | { ok: false, … }` replies. */
export function bridgeTransport(bridge: TauwellBridge): Transport {
  return async (channel, payload) => unwrapReply(await bridge.invoke(channel, payload));
}

export function unwrapReply(reply: CallReply): unknown {
  if (reply.ok) return reply.value;
  if (reply.kind === 'input') throw new InputError(reply.reason, reply.field === undefined ? {} : { field: reply.field });
  throw new CallError(reply.error, reply.kind);
}

/** The part of a fetch Response this client reads. */
export interface FetchResponseLike {
  readonly ok: boolean;
  readonly status: number;
  text(): Promise<string>;
}

export type FetchLike = (url: string, init: {
  method: 'POST';
  headers: Record<string, string>;
  body: string;
  credentials: 'omit';
  cache: 'no-store';
}) => Promise<FetchResponseLike>;

/**
 * Over the loopback server: `POST {base}/api/<method>` with the JSON payload and the launch's
 * token. 200 carries the response itself; an error status carries `{ error, reason?, field? }`.
 */
export function fetchTransport(fetchFn: FetchLike, options: { token: string; base?: string }): Transport {
  const base = (options.base ?? '').replace(/\/+$/, '');
  return async (channel, payload) => {
    const method = channel.slice(CHANNEL_PREFIX.length);
    let response: FetchResponseLike;
    try {
      response = await fetchFn(`${base}/api/${encodeURIComponent(method)}`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${options.token}` },
        body: JSON.stringify(payload),
        credentials: 'omit',
        cache: 'no-store',
      });
    } catch (e) {
      throw new CallError(`the Tauwell server did not answer (${e instanceof Error ? e.message : String(e)}); is \`tauwell serve\` still running?`, 'transport');
    }
    const text = await response.text();
    let body: unknown;
    try {
      body = text === '' ? null : JSON.parse(text);
    } catch {
      throw new CallError(`the Tauwell server answered ${response.status} with something that is not JSON`, 'transport', response.status);
    }
    if (response.ok) return body;
    const { error, reason, field } = (typeof body === 'object' && body !== null ? body : {}) as { error?: unknown; reason?: unknown; field?: unknown };
    const message = typeof error === 'string' ? error : `the Tauwell server answered ${response.status}`;
    if (response.status === 400 && typeof reason === 'string') {
      throw new InputError(reason, typeof field === 'string' ? { field } : {});
    }
    throw new CallError(message, response.status >= 500 ? 'internal' : 'refused', response.status);
  };
}
