/**
 * One call from an untrusted transport into the services: the method must be on the allowlist,
 * the payload must pass the method's schema before the service runs (so a refused payload writes
 * nothing), and the response is put in the wire encoding (channels.ts). Both the IPC handlers and
 * the loopback server go through here, so they accept and refuse exactly the same things.
 *
 * Calls run one at a time, in arrival order: every front end shares one SQLite connection, and a
 * service that awaits (the CSV import holds its write transaction across reads of the file) must
 * not have another call's writes land inside its transaction.
 *
 *   createDispatcher(services): (method: string, payload: unknown) => Promise<CallOutcome>
 */
import { InputError } from '../errors.js';
import { isServiceMethod, toWire } from './channels.js';
import { REQUEST_SCHEMAS, type ServiceName, type TauwellServices } from './index.js';
import { validate } from './schema.js';

export type CallOutcome =
  | { ok: true; method: ServiceName; value: unknown }
  /** Not an allowlisted method. */
  | { ok: false; kind: 'unknown-method'; error: string }
  /** The payload failed its schema (nothing ran), or the service refused it with an InputError. */
  | { ok: false; kind: 'input'; method: ServiceName; error: string; reason: string; field?: string }
  /** Anything else: a bug. `cause` is for the back end's log and must not be sent to the renderer. */
  | { ok: false; kind: 'internal'; method: ServiceName; error: string; cause: unknown };

export const INTERNAL_ERROR_MESSAGE = 'internal error in the Tauwell back end; the details are in its log';

export type Dispatcher = (method: string, payload: unknown) => Promise<CallOutcome>;

export function createDispatcher(services: TauwellServices): Dispatcher {
  let queue: Promise<unknown> = Promise.resolve();
  return (method, payload) => {
    const run = queue.then(() => callOnce(services, method, payload));
    queue = run.catch(() => undefined);
    return run;
  };
}

async function callOnce(services: TauwellServices, method: string, payload: unknown): Promise<CallOutcome> {
  if (!isServiceMethod(method)) return { ok: false, kind: 'unknown-method', error: `no such method ${JSON.stringify(method)}` };
  try {
    const request = validate(REQUEST_SCHEMAS[method], payload);
    const call = services[method] as (request: unknown) => unknown;
    const value = await call.call(services, request);
    return { ok: true, method, value: toWire(value) };
  } catch (e) {
    if (e instanceof InputError) {
      return {
        ok: false, kind: 'input', method, error: oneLine(e.message), reason: oneLine(e.reason),
        ...(e.where.field !== undefined ? { field: e.where.field } : {}),
      };
    }
    return { ok: false, kind: 'internal', method, error: INTERNAL_ERROR_MESSAGE, cause: e };
  }
}

function oneLine(text: string): string {
  return text.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}
