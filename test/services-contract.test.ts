// The contract's hand-written schemas: untrusted payloads are refused with one line naming the field.
import { describe, expect, it } from 'vitest';
import { REQUEST_SCHEMAS } from '../src/shared/contract/index.js';
import { ASSUMED_MARGIN_OVER_SATURATION_PA, PLAUSIBLE_TEMPERATURE_C, STATUS_WORDS, parseStatus } from '../src/shared/contract/reading-rules.js';
import { ASSUMED_OVERPRESSURE_PA, MAX_TEMPERATURE_C, MIN_TEMPERATURE_C, STATUS_SYNONYMS } from '../src/shared/import/row-validator.js';
import { LOG_READING_REQUEST } from '../src/shared/contract/readings.js';
import { FORECAST_WELL_REQUEST } from '../src/shared/contract/fits.js';
import { EXPORT_REQUEST } from '../src/shared/contract/exports.js';
import { array, instantMs, number, object, optional, string, unitName, validate } from '../src/shared/contract/schema.js';
import { createServices } from '../src/main/services/index.js';
import { freshDb } from './db-helpers.js';
import { inputError } from './services-helpers.js';

const GOOD_LOG = { well: 'KR-1', time: '2025-03-01T12:00:00Z', productionTemperature: 150 };

describe('schemas refuse malformed payloads, naming the field', () => {
  const cases: [string, unknown, string | undefined, RegExp][] = [
    ['a payload that is not an object', 'KR-1', undefined, /must be an object \(got string\)/],
    ['a missing well', { time: GOOD_LOG.time }, 'well', /missing: a non-empty text/],
    ['a blank well', { ...GOOD_LOG, well: '   ' }, 'well', /must be a non-empty text/],
    ['a local time without Z', { ...GOOD_LOG, time: '2025-03-01T12:00:00' }, 'time', /UTC, ending in Z/],
    ['a time with an offset', { ...GOOD_LOG, time: '2025-03-01T12:00:00+13:00' }, 'time', /ending in Z/],
    ['a date that does not exist', { ...GOOD_LOG, time: '2025-02-30T12:00:00Z' }, 'time', /ISO 8601 UTC instant/],
    ['a number sent as text', { ...GOOD_LOG, productionTemperature: '150' }, 'productionTemperature', /must be a finite number \(got "150"\)/],
    ['a misspelt key', { ...GOOD_LOG, productionTemprature: 150 }, 'productionTemprature', /unknown key; expected one of well, field, time/],
    ['an unknown unit', { ...GOOD_LOG, pressure: 2, pressureUnit: 'barg' }, 'pressureUnit', /unknown unit "barg"/],
    ['a flag that is not a word', { ...GOOD_LOG, flags: ['bad', 'Spike!'] }, 'flags[1]', /lower-case letters/],
    ['flags that are not a list', { ...GOOD_LOG, flags: 'bad' }, 'flags', /must be a list/],
  ];
  it.each(cases)('LOG_READING_REQUEST refuses %s', (_what, payload, field, message) => {
    const e = inputError(() => validate(LOG_READING_REQUEST, payload));
    expect(e.where.field).toBe(field);
    expect(e.reason).toMatch(message);
    expect(e.message).not.toMatch(/\n/);
  });

  it('nested fields are named by their dotted path', () => {
    const base = { well: 'KR-1', limit: { kind: 'production-temperature', temperatureC: 120 } };
    expect(validate(FORECAST_WELL_REQUEST, base).limit).toEqual(base.limit);
    const wrongKind = inputError(() => validate(FORECAST_WELL_REQUEST, { ...base, limit: { kind: 'money' } }));
    expect(wrongKind.where.field).toBe('limit.kind');
    const wrongValue = inputError(() => validate(FORECAST_WELL_REQUEST, { ...base, limit: { kind: 'theta', thetaK: -5 } }));
    expect(wrongValue.where.field).toBe('limit.thetaK');
    expect(wrongValue.reason).toBe('must be > 0 K (got -5 K)');
    const extra = inputError(() => validate(FORECAST_WELL_REQUEST, { ...base, limit: { kind: 'theta', thetaK: 5, temperatureC: 1 } }));
    expect(extra.where.field).toBe('limit.temperatureC');
  });

  it('numbers are checked with their unit named', () => {
    const e = inputError(() => validate(FORECAST_WELL_REQUEST, { well: 'KR-1', limit: { kind: 'theta', thetaK: 5 }, plannedFlowKgPerS: 0 }));
    expect(e.where.field).toBe('plannedFlowKgPerS');
    expect(e.reason).toBe('must be > 0 kg/s (got 0 kg/s)');
    const n = inputError(() => validate(EXPORT_REQUEST, { kind: 'rejected', importId: 1.5 }));
    expect(n.where.field).toBe('importId');
    expect(n.reason).toMatch(/whole number/);
    expect(inputError(() => validate(EXPORT_REQUEST, { kind: 'everything' })).where.field).toBe('kind');
  });

  it('the building blocks compose', () => {
    const s = object({ a: array(object({ b: optional(number({ min: 0, unit: 'kg/s' })) })), u: unitName('temperature'), t: string({ allowEmpty: true }) });
    expect(validate(s, { a: [{}, { b: 1 }], u: '°F', t: '' })).toEqual({ a: [{}, { b: 1 }], u: 'degF', t: '' }); // '°F' → canonical 'degF'
    const e = inputError(() => validate(s, { a: [{ b: 1 }, { b: -1 }], u: 'K', t: '' }));
    expect(e.where.field).toBe('a[1].b');
    expect(e.reason).toBe('must be ≥ 0 kg/s (got -1 kg/s)');
  });

  it('instants: ISO 8601 UTC to the epoch and back', () => {
    // 2025-03-01T12:00:00Z = 20 148 days × 86 400 s + 12 h (db-helpers T0_MS, worked there)
    expect(instantMs('2025-03-01T12:00:00Z')).toBe(1_740_830_400_000);
    expect(instantMs('2025-03-01T12:00Z')).toBe(1_740_830_400_000);
    expect(instantMs('2025-03-01T12:00:00.5Z')).toBe(1_740_830_400_500);
    expect(instantMs('2024-02-29T00:00:00Z')).toBe(Date.UTC(2024, 1, 29)); // 2024 is a leap year (Gregorian rule)
    for (const bad of ['2023-02-29T00:00:00Z', '2025-03-01T24:00:00Z', '2025-03-01', '2025-03-01 12:00:00Z']) expect(instantMs(bad)).toBeNaN();
  });
});

describe('every service has a request schema', () => {
  it('REQUEST_SCHEMAS names exactly the methods of createServices', () => {
    const fdb = freshDb();
    try {
      expect(Object.keys(REQUEST_SCHEMAS).sort()).toEqual(Object.keys(createServices(fdb)).sort());
    } finally {
      fdb.close();
    }
  });

  it('the services themselves refuse an unchecked payload, naming the field', () => {
    const fdb = freshDb();
    try {
      const s = createServices(fdb);
      const e = inputError(() => s.createWell({ field: 'F', name: 'W', kind: 'geyser' } as never));
      expect(e.where.field).toBe('kind');
      expect(e.reason).toBe('must be one of "production", "injection" (got "geyser")');
      expect(inputError(() => s.exportData({} as never)).where.field).toBe('kind');
    } finally {
      fdb.close();
    }
  });
});

describe('reading rules: the manual log and the CSV import judge alike', () => {
  it('accepts the common spellings of a status and refuses the rest', () => {
    expect(['producing', 'Producing', 'shut-in', 'Shut in', 'SHUTIN', 'shut_in', 'test', 'Testing', ' Online '].map((t) => parseStatus(t)))
      .toEqual(['producing', 'producing', 'shut-in', 'shut-in', 'shut-in', 'shut-in', 'test', 'test', 'producing']);
    const e = inputError(() => parseStatus('pumping', 'Status'));
    expect(e.where.field).toBe('Status');
    expect(e.reason).toBe('unknown status "pumping"; one of producing, shut-in, test');
  });

  it('has the same limits, pressure assumption and status words as the import\'s row validator', () => {
    expect([PLAUSIBLE_TEMPERATURE_C.min, PLAUSIBLE_TEMPERATURE_C.max]).toEqual([MIN_TEMPERATURE_C, MAX_TEMPERATURE_C]);
    expect(ASSUMED_MARGIN_OVER_SATURATION_PA).toBe(ASSUMED_OVERPRESSURE_PA);
    expect(STATUS_WORDS).toEqual(STATUS_SYNONYMS);
  });
});
