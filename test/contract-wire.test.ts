// The wire encoding both transports use (src/shared/contract/channels.ts) and the dispatcher behind
// them (src/shared/contract/dispatch.ts).
import { describe, expect, it, vi } from 'vitest';
import { CHANNELS, SERVICE_METHODS, channelOf, isServiceMethod, methodOfChannel, toWire } from '../src/shared/contract/channels.js';
import { bridgeTransport, createClient, unwrapReply } from '../src/shared/contract/client.js';
import { createDispatcher, INTERNAL_ERROR_MESSAGE } from '../src/shared/contract/dispatch.js';
import { REQUEST_SCHEMAS, type TauwellServices } from '../src/shared/contract/index.js';
import { InputError } from '../src/shared/errors.js';

describe('toWire: JSON-safe, the same over IPC and HTTP', () => {
  it('non-finite numbers become null, typed arrays plain arrays', () => {
    const value = { a: NaN, b: Infinity, c: -Infinity, d: 1.5, e: new Float64Array([1, NaN, Infinity, -0.25]), f: [NaN, 2], g: { h: new Int32Array([3]) } };
    // Worked by the rule itself: every non-finite number → null, every typed array → a list.
    expect(toWire(value)).toEqual({ a: null, b: null, c: null, d: 1.5, e: [1, null, null, -0.25], f: [null, 2], g: { h: [3] } });
  });

  it('agrees with JSON.stringify on undefined and dates, and survives a JSON round trip unchanged', () => {
    const value = { keep: 'x', gone: undefined, list: [undefined, true], when: new Date(Date.UTC(2025, 2, 1, 12)) };
    const wire = toWire(value);
    expect(wire).toEqual({ keep: 'x', list: [null, true], when: '2025-03-01T12:00:00.000Z' });
    expect(JSON.parse(JSON.stringify(value))).toEqual(wire); // ECMA-262 JSON.stringify: undefined keys dropped, undefined entries null
    expect(JSON.parse(JSON.stringify(wire))).toEqual(wire);
  });

  it('keeps a key named __proto__ a plain key', () => {
    const wire = toWire(JSON.parse('{"__proto__": {"polluted": true}}')) as Record<string, unknown>;
    expect(Object.keys(wire)).toEqual(['__proto__']);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.getPrototypeOf(wire)).toBe(Object.prototype);
  });

  it('refuses what JSON cannot carry, loudly', () => {
    const cycle: Record<string, unknown> = {};
    cycle.self = cycle;
    expect(() => toWire(cycle)).toThrow(/cycle/);
    expect(() => toWire({ f: () => 1 })).toThrow(/function cannot cross/);
    expect(() => toWire(new Map())).toThrow(/Map cannot cross/);
    expect(() => toWire({ n: 1n })).toThrow(/bigint/);
  });
});

describe('the channel allowlist', () => {
  it('is one channel per method of REQUEST_SCHEMAS', () => {
    expect([...SERVICE_METHODS]).toEqual(Object.keys(REQUEST_SCHEMAS).sort());
    expect(CHANNELS.length).toBe(SERVICE_METHODS.length);
    for (const m of SERVICE_METHODS) expect(methodOfChannel(channelOf(m))).toBe(m);
  });

  it('finds nothing for names every object has', () => {
    for (const name of ['__proto__', 'constructor', 'toString', 'hasOwnProperty', 'tauwell:__proto__', 'tauwell:toString', 'listWells']) {
      expect(methodOfChannel(name), name).toBeUndefined();
    }
    expect(isServiceMethod('toString')).toBe(false);
    expect(isServiceMethod('listWells')).toBe(true);
  });
});

describe('the dispatcher', () => {
  const fakeServices = (impl: Partial<Record<keyof TauwellServices, (...a: unknown[]) => unknown>>): TauwellServices => impl as unknown as TauwellServices;

  it('checks the payload before the service runs', async () => {
    const logReading = vi.fn();
    const call = createDispatcher(fakeServices({ logReading }));
    const outcome = await call('logReading', { well: 'KR-1', time: '2025-03-01T12:00:00Z', productionTemperature: '150' });
    expect(outcome).toMatchObject({ ok: false, kind: 'input', field: 'productionTemperature' });
    expect(logReading).not.toHaveBeenCalled();
  });

  it('passes the checked request and encodes the response', async () => {
    const listWells = vi.fn(() => ({ fields: [], x: NaN, r: new Float64Array([1]) }));
    const outcome = await createDispatcher(fakeServices({ listWells }))('listWells', { field: '  Kettle  ' });
    expect(listWells).toHaveBeenCalledWith({ field: 'Kettle' }); // the schema trims text
    expect(outcome).toEqual({ ok: true, method: 'listWells', value: { fields: [], x: null, r: [1] } });
  });

  it('hides internal errors behind a generic message', async () => {
    const bug = new Error('stack trace detail');
    const outcome = await createDispatcher(fakeServices({ listWells: () => { throw bug; } }))('listWells', {});
    expect(outcome).toEqual({ ok: false, kind: 'internal', method: 'listWells', error: INTERNAL_ERROR_MESSAGE, cause: bug });
  });

  it('runs calls one at a time, in arrival order', async () => {
    const events: string[] = [];
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const call = createDispatcher(fakeServices({
      listWells: async () => { events.push('slow start'); await gate; events.push('slow end'); return { fields: [] }; },
      auditLog: () => { events.push('quick'); return { entries: [] }; },
    }));
    const slow = call('listWells', {});
    const quick = call('auditLog', {});
    await new Promise((r) => setTimeout(r, 10));
    expect(events).toEqual(['slow start']);
    release();
    await Promise.all([slow, quick]);
    expect(events).toEqual(['slow start', 'slow end', 'quick']);
  });

  it('refuses an unknown method', async () => {
    expect(await createDispatcher(fakeServices({}))('toString', {})).toMatchObject({ ok: false, kind: 'unknown-method' });
  });
});

describe('the client', () => {
  it('sends {} for an optional request and unwraps bridge replies', async () => {
    const invoke = vi.fn(async () => ({ ok: true as const, value: { fields: [] } }));
    const client = createClient(bridgeTransport({ version: 't', invoke }));
    expect(await client.listWells()).toEqual({ fields: [] });
    expect(invoke).toHaveBeenCalledWith('tauwell:listWells', {});
  });

  it('turns a refusal of input into an InputError naming the field', () => {
    const e = (() => {
      try {
        unwrapReply({ ok: false, kind: 'input', error: 'field "well": missing', reason: 'missing', field: 'well' });
      } catch (x) {
        return x;
      }
    })();
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).message).toBe('field "well": missing');
    expect(() => unwrapReply({ ok: false, kind: 'refused', error: 'no' })).toThrow(expect.objectContaining({ name: 'CallError', kind: 'refused' }));
  });
});
