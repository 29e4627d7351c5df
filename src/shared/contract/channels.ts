/**
 * The channels between the renderer and the back end, and how values cross them. Both transports
 * (Electron IPC and the loopback HTTP server) expose exactly these channels and encode every
 * response with `toWire`, so the renderer sees the same data whichever one it talks to.
 *
 * One channel per service method, derived from REQUEST_SCHEMAS so a method cannot be reachable
 * without a schema: `tauwell:listWells`, `tauwell:logReading`, … (HTTP: `POST /api/listWells`).
 *
 * The wire encoding is JSON-safe. The engine's records (fits, forecasts, recharge) use NaN where a
 * value does not exist, ±Infinity for "never" (an economic limit not reached) and Float64Array for
 * residuals; JSON can spell none of these. On the wire:
 *   - a non-finite number (NaN, +Infinity, −Infinity) is null — test a value with
 *     Number.isFinite(x), which is false for null as it is for NaN;
 *   - a typed array is a plain array (its non-finite entries null as well);
 *   - a Date is its ISO 8601 text; an object key whose value is undefined is left out, and an
 *     undefined list entry is null, as JSON.stringify does.
 * The encoding is the same over IPC (which could carry NaN and typed arrays) so that the renderer
 * never depends on which transport it has.
 *
 * Exported API:
 *   CHANNEL_PREFIX, type Channel, SERVICE_METHODS, CHANNELS
 *   channelOf(method), methodOfChannel(channel), isServiceMethod(name)
 *   toWire(value), type Wire<T>
 *   type CallReply, interface TauwellBridge (what the preload puts on window.tauwell)
 *   NAVIGATE_CHANNEL, NAVIGATE_ROUTES, type NavigateRoute, isNavigateRoute(value)
 */
import { REQUEST_SCHEMAS, type ServiceName } from './index.js';

export const CHANNEL_PREFIX = 'tauwell:';
export type Channel = `tauwell:${ServiceName}`;

/** Every service method, sorted: the one allowlist both transports expose. */
export const SERVICE_METHODS: readonly ServiceName[] = Object.freeze((Object.keys(REQUEST_SCHEMAS) as ServiceName[]).sort());

export function channelOf(method: ServiceName): Channel {
  return `${CHANNEL_PREFIX}${method}` as Channel;
}

export const CHANNELS: readonly Channel[] = Object.freeze(SERVICE_METHODS.map(channelOf));

// Maps and Sets, not property lookups, so names such as `__proto__` or `toString` find nothing.
const METHOD_OF_CHANNEL: ReadonlyMap<string, ServiceName> = new Map(SERVICE_METHODS.map((m) => [channelOf(m), m]));
const METHODS: ReadonlySet<string> = new Set(SERVICE_METHODS);

/** The service method of an allowlisted channel, or undefined for anything else. */
export function methodOfChannel(channel: unknown): ServiceName | undefined {
  return typeof channel === 'string' ? METHOD_OF_CHANNEL.get(channel) : undefined;
}

export function isServiceMethod(name: unknown): name is ServiceName {
  return typeof name === 'string' && METHODS.has(name);
}

/**
 * A response as the renderer receives it: typed arrays become lists whose entries may be null.
 * A `number` elsewhere keeps its type for readability, but may be null where the engine's record
 * documents NaN or Infinity (see the header).
 */
export type Wire<T> =
  T extends ArrayBufferView ? (number | null)[]
    : T extends readonly (infer U)[] ? Wire<U>[]
      : T extends object ? { [K in keyof T]: Wire<T[K]> }
        : T;

/** Deep copy of `value` in the wire encoding above; throws a TypeError for what JSON cannot carry. */
export function toWire(value: unknown): unknown {
  return encode(value, new Set<object>(), '');
}

function encode(value: unknown, seen: Set<object>, path: string): unknown {
  switch (typeof value) {
    case 'number':
      return Number.isFinite(value) ? value : null;
    case 'string':
    case 'boolean':
      return value;
    case 'undefined':
      return null;
    case 'object':
      break;
    default:
      // bigint, function, symbol: no service returns one, so this is a bug worth a loud failure.
      throw new TypeError(`a ${typeof value} cannot cross the transport (at ${path === '' ? 'the response' : path})`);
  }
  if (value === null) return null;
  if (value instanceof Date) return Number.isFinite(value.getTime()) ? value.toISOString() : null;
  if (ArrayBuffer.isView(value)) {
    if (value instanceof DataView) throw new TypeError(`a DataView cannot cross the transport (at ${path})`);
    return Array.from(value as unknown as ArrayLike<number | bigint>, (n) => (typeof n === 'number' && Number.isFinite(n) ? n : null));
  }
  if (value instanceof Map || value instanceof Set) throw new TypeError(`a ${value.constructor.name} cannot cross the transport (at ${path})`);
  if (seen.has(value)) throw new TypeError(`a cycle cannot cross the transport (at ${path})`);
  seen.add(value);
  try {
    if (Array.isArray(value)) return value.map((item, i) => encode(item, seen, `${path}[${i}]`));
    const out: Record<string, unknown> = {};
    for (const [key, item] of Object.entries(value)) {
      if (item === undefined) continue;
      // defineProperty, so that a key named "__proto__" stays a plain key rather than a prototype.
      Object.defineProperty(out, key, { value: encode(item, seen, path === '' ? key : `${path}.${key}`), enumerable: true, writable: true, configurable: true });
    }
    return out;
  } finally {
    seen.delete(value);
  }
}

/**
 * What one call returns over IPC. A refusal of bad input carries the InputError's parts, so the
 * renderer can point at the field; an internal error carries only a generic message (the details
 * go to the back end's log, never to the renderer).
 */
export type CallReply =
  | { ok: true; value: unknown }
  | { ok: false; kind: 'input'; error: string; reason: string; field?: string }
  | { ok: false; kind: 'refused' | 'internal'; error: string };

/**
 * The one message the main process sends unasked: the desktop menu (View, File → Import CSV…) asks
 * the page to show a screen. One-way, main → renderer; its payload is one of NAVIGATE_ROUTES, and
 * the preload drops anything else. Not a service method, so it is not in CHANNELS.
 */
export const NAVIGATE_CHANNEL = 'tauwell:navigate';

/** The screens the menu can open, as hash routes (src/renderer/app/router.ts). */
export const NAVIGATE_ROUTES = Object.freeze(['#/field', '#/decline', '#/log', '#/import', '#/reservoir', '#/recharge', '#/settings'] as const);
export type NavigateRoute = (typeof NAVIGATE_ROUTES)[number];

const ROUTES: ReadonlySet<string> = new Set(NAVIGATE_ROUTES);

export function isNavigateRoute(value: unknown): value is NavigateRoute {
  return typeof value === 'string' && ROUTES.has(value);
}

/** The preload's bridge, on `window.tauwell` in the desktop renderer. */
export interface TauwellBridge {
  readonly version: string;
  /** Rejects without sending anything when `channel` is not in CHANNELS. */
  invoke(channel: Channel, payload: unknown): Promise<CallReply>;
  /**
   * Calls `listener` with the route each time the desktop menu asks for a screen (set
   * `location.hash` to it); returns the function that stops listening. The desktop preload always
   * has it; optional so that a bridge made for a test needs only `invoke`.
   */
  onNavigate?(listener: (route: NavigateRoute) => void): () => void;
}
