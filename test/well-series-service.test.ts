// wellSeries: a well's readings in columns, with the fit's own exclusion rule, time zero and produced
// mass; chartSeries, the same packed for a chart; and fitWell / forecastWell with points: false.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ReadingRepository } from '../src/main/db/readings.js';
import { decodeChartSeries } from '../src/renderer/charts/packed-series.js';
import { toWire, type Wire } from '../src/shared/contract/channels.js';
import { EXCLUSION_CODES, type ChartSeriesResponse, type WellSeriesRequest } from '../src/shared/contract/overview.js';
import { START_MS, fixture, inputError, iso, type Fixture } from './services-helpers.js';

const H_MS = 3_600_000;
const H_S = 3600;

// A hand-made log of W-1 (Tref 70 °C, production start START_MS), one reading an hour:
//   −1 h  160 °C, 10 kg/s            before time zero
//   +1 h  159 °C, 10 kg/s            included        M = 10·3600                  =  36 000 kg
//   +2 h  158 °C, 10 kg/s, shut-in    not producing   M = 36 000 (the interval counts zero)
//   +3 h  157 °C, 20 kg/s, bad        flagged         bridged by +4 h: M = 36 000 + 30·3600 = 144 000 kg
//   +4 h  156 °C, 30 kg/s            included        M = 36 000 + 30·7200          = 252 000 kg
//   +4.5 h 150 °C, 1000 kg/s          deleted         not in the flow history; M there = 252 000 + 40·1800 = 324 000 kg
//   +5 h  no temperature, 40 kg/s     no temperature  its flow counts: M = 252 000 + 40·3600 = 396 000 kg
//   +6 h  154 °C, 10 kg/s            included        M = 396 000 + 10·3600         = 432 000 kg
// (the produced-mass rule of src/shared/series/well-series.ts, worked by hand)
let f: Fixture;
let deletedId: number;
beforeAll(() => {
  f = fixture();
  const log = (hours: number, t: number, flow: number, extra: Record<string, unknown> = {}): number =>
    f.s.logReading({ well: 'W-1', time: iso(START_MS + hours * H_MS), productionTemperature: t, flow, flowUnit: 'kg/s', ...extra }).reading.id;
  log(-1, 160, 10);
  log(1, 159, 10);
  log(2, 158, 10, { status: 'shut-in' });
  log(3, 157, 20, { flags: ['bad'] });
  log(4, 156, 30);
  deletedId = log(4.5, 150, 1000);
  f.s.deleteReading({ id: deletedId, reason: 'a typing slip' });
  const wellId = f.s.getWell({ well: 'W-1' }).well.id;
  // A production well's reading without a production temperature cannot be logged by hand; an import can store one.
  new ReadingRepository(f.fdb).insert({ wellId, timeMs: START_MS + 5 * H_MS, source: 'import', massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40, flowUnit: 'kg/s' });
  log(6, 154, 10);
});
afterAll(() => f.fdb.close());

const C = EXCLUSION_CODES;

describe('wellSeries on the time basis', () => {
  it('gives every live reading in time order with the fit\'s exclusion codes', () => {
    const r = f.s.wellSeries({ well: 'W-1' });
    expect(r.basis).toBe('time');
    expect(r.count).toBe(7);
    expect(r.timeOrigin).toBe(iso(START_MS));
    expect(r.referenceTemperatureC).toBe(70);
    expect(r.epochMs).toBe(START_MS - H_MS); // the first reading's instant
    expect(r.timeS).toEqual([0, 2, 3, 4, 5, 6, 7].map((h) => h * H_S));
    expect(r.x).toEqual([null, 1, 2, 3, 4, 5, 6].map((h) => (h === null ? null : h * H_S)));
    expect(r.exclusion).toEqual([C['before-time-zero'], C.included, C['not-producing'], C.flagged, C.included, C['no-temperature'], C.included]);
    expect(r.productionTemperatureC).toEqual([160, 159, 158, 157, 156, null, 154]);
    expect(r.massFlowKgPerS).toEqual([10, 10, 10, 20, 30, 40, 10]);
    expect(r.readingId).not.toContain(deletedId);
    expect(r.well.name).toBe('W-1');
  });

  it('agrees with the fit reading by reading (fitWell points)', () => {
    const fit = f.s.fitWell({ well: 'W-1' });
    const series = f.s.wellSeries({ well: 'W-1' });
    expect(fit.points.map((p) => p.readingId)).toEqual(series.readingId);
    expect(fit.points.map((p) => C[p.excludedBecause ?? 'included'])).toEqual(series.exclusion);
    fit.points.forEach((p, i) => {
      if (series.x[i] !== null) expect(series.x[i]).toBe(p.x);
    });
  });
});

describe('wellSeries on the mass basis', () => {
  it('counts the produced mass as the fit does (worked above)', () => {
    const r = f.s.wellSeries({ well: 'W-1', basis: 'mass' });
    expect(r.x).toEqual([null, 36_000, 36_000, 144_000, 252_000, 396_000, 432_000]);
    const fit = f.s.fitWell({ well: 'W-1', basis: 'mass' });
    expect(fit.producedMass?.totalKg).toBe(432_000);
    fit.points.forEach((p, i) => {
      if (r.x[i] !== null) expect(r.x[i]).toBe(p.x);
    });
  });

  it('shows a deleted reading only on request, coded as deleted, without letting it count', () => {
    const r = f.s.wellSeries({ well: 'W-1', basis: 'mass', includeDeleted: true });
    expect(r.count).toBe(8);
    const i = r.readingId.indexOf(deletedId);
    expect(i).toBe(5);
    expect(r.exclusion[i]).toBe(C.deleted);
    expect(r.x).toEqual([null, 36_000, 36_000, 144_000, 252_000, 324_000, 396_000, 432_000]);
  });

  it('refuses the mass basis for an injection well, and gives an empty series for a well without readings', () => {
    f.s.createWell({ field: 'Test field', name: 'I-1', kind: 'injection' });
    expect(inputError(() => f.s.wellSeries({ well: 'I-1', basis: 'mass' })).where.field).toBe('basis');
    const empty = f.s.wellSeries({ well: 'I-1' });
    expect(empty).toMatchObject({ count: 0, timeOrigin: null, timeS: [], x: [], exclusion: [], readingId: [] });
    expect(inputError(() => f.s.wellSeries({ well: 'W-1', basis: 'volume' } as never)).where.field).toBe('basis');
  });
});

describe('points: false', () => {
  it('leaves the fit\'s points empty and changes nothing else', () => {
    const withPoints = f.s.fitWell({ well: 'W-1', basis: 'mass' });
    const without = f.s.fitWell({ well: 'W-1', basis: 'mass', points: false });
    expect(without.points).toEqual([]);
    expect(withPoints.points).toHaveLength(7);
    const { points: _a, stored: _b, ...rest } = without;
    const { points: _c, stored: _d, ...restWith } = withPoints;
    expect(rest).toEqual(restWith);
  });

  it('gives the same forecast on the mass basis (now is the last fitted reading either way)', () => {
    const request = { well: 'W-1', basis: 'mass', limit: { kind: 'theta', thetaK: 50 }, samples: 200, plannedFlowKgPerS: 10, specificHeatJPerKgK: 4300 } as const;
    const a = f.s.forecastWell(request);
    const b = f.s.forecastWell({ ...request, points: false });
    expect(b.fit.points).toEqual([]);
    expect(b.forecast).toEqual(a.forecast);
    expect(b.forecast.nowTimeS).toBe(6 * H_S); // +6 h, the last included reading
  });
});

// chartSeries: the same columns packed as little-endian binary in base64 (contract/overview.ts),
// decoded by the renderer's own decoder after the transports' JSON round trip.
describe('chartSeries', () => {
  const wire = (r: unknown) => JSON.parse(JSON.stringify(toWire(r))) as Wire<ChartSeriesResponse>;
  const same = (request: WellSeriesRequest) => {
    const plain = f.s.wellSeries(request);
    const packed = wire(f.s.chartSeries(request));
    const d = decodeChartSeries(packed);
    expect(d.count).toBe(plain.count);
    expect(d.basis).toBe(plain.basis);
    expect(d.epochMs).toBe(plain.epochMs);
    expect(d.timeOrigin).toBe(plain.timeOrigin);
    expect(d.referenceTemperatureC).toBe(plain.referenceTemperatureC);
    expect(Array.from(d.timeS)).toEqual(plain.timeS);
    // The decoded columns are typed arrays with NaN where wellSeries has null.
    const nullOfNaN = (a: Float64Array) => Array.from(a, (v) => (Number.isNaN(v) ? null : v));
    expect(nullOfNaN(d.x)).toEqual(plain.x);
    expect(nullOfNaN(d.productionTemperatureC)).toEqual(plain.productionTemperatureC);
    expect(Array.from(d.exclusion)).toEqual(plain.exclusion);
    return packed;
  };

  it('decodes to wellSeries\'s columns on the time basis, value for value', () => {
    const packed = same({ well: 'W-1' });
    expect(packed.columns.x).toBeNull(); // derived from the instants on the time basis
    // 8 bytes a reading for the doubles, 1 for the code (base64: 4 characters per 3 bytes).
    expect(Buffer.from(packed.columns.timeMs, 'base64')).toHaveLength(8 * 7);
    expect(Buffer.from(packed.columns.exclusion, 'base64')).toHaveLength(7);
    expect(packed).not.toHaveProperty('readingId');
  });

  it('decodes to wellSeries\'s columns on the mass basis, with and without the deleted reading', () => {
    expect(same({ well: 'W-1', basis: 'mass' }).columns.x).not.toBeNull();
    same({ well: 'W-1', basis: 'mass', includeDeleted: true });
    same({ well: 'W-1', includeDeleted: true });
  });

  it('keeps a reading whose flag does not exclude it (the fit\'s own rule), and an empty well', () => {
    f.s.createWell({ field: 'Test field', name: 'W-flags', kind: 'production', referenceTemperatureC: 60, productionStart: iso(START_MS) });
    f.s.logReading({ well: 'W-flags', time: iso(START_MS + H_MS), productionTemperature: 150, flow: 10, flowUnit: 'kg/s', flags: ['estimated'] });
    f.s.logReading({ well: 'W-flags', time: iso(START_MS + 2 * H_MS), productionTemperature: 149, flow: 10, flowUnit: 'kg/s', flags: ['spike'] });
    const d = decodeChartSeries(wire(f.s.chartSeries({ well: 'W-flags' })));
    expect(Array.from(d.exclusion)).toEqual([C.included, C.flagged]);
    same({ well: 'W-flags', basis: 'mass' });
    f.s.createWell({ field: 'Test field', name: 'W-empty', kind: 'production' });
    expect(same({ well: 'W-empty' }).count).toBe(0);
  });

  it('refuses what wellSeries refuses, naming the field', () => {
    expect(inputError(() => f.s.chartSeries({ well: 'I-1', basis: 'mass' })).where.field).toBe('basis');
    expect(inputError(() => f.s.chartSeries({ well: 'W-1', basis: 'volume' } as never)).where.field).toBe('basis');
  });
});

describe('residuals: false', () => {
  it('leaves every fit\'s x and residuals empty, the candidates\' too, and changes nothing else', () => {
    // 40 weekly readings of θ = 10 K + 60 K·e^(−t/(5 yr)) above Tref 70 °C, with a small wobble.
    f.s.createWell({ field: 'Test field', name: 'W-decline', kind: 'production', referenceTemperatureC: 70, productionStart: iso(START_MS) });
    for (let k = 1; k <= 40; k++) {
      const theta = 10 + 60 * Math.exp(-(k * 7) / (5 * 365.25)) + 0.05 * Math.sin(k);
      f.s.logReading({ well: 'W-decline', time: iso(START_MS + k * 7 * 24 * H_MS), productionTemperature: 70 + theta, flow: 30, flowUnit: 'kg/s' });
    }
    const full = f.s.fitWell({ well: 'W-decline', model: 'auto' });
    const lean = f.s.fitWell({ well: 'W-decline', model: 'auto', residuals: false });
    expect(full.fit.residuals.length).toBeGreaterThan(0);
    expect(lean.fit.x).toHaveLength(0);
    expect(lean.fit.residuals).toHaveLength(0);
    const candidates = (fit: typeof lean.fit) => ('candidates' in fit ? (fit as { candidates: (typeof lean.fit)[] }).candidates : []);
    expect(candidates(lean.fit).length).toBe(candidates(full.fit).length);
    for (const c of candidates(lean.fit)) expect([c.x.length, c.residuals.length]).toEqual([0, 0]);
    const strip = (r: typeof full) => {
      const { stored: _s, fit, ...rest } = r;
      const { x: _x, residuals: _r, ...fitRest } = fit as typeof fit & { candidates?: unknown };
      return { rest, fitRest: { ...fitRest, candidates: candidates(fit).map(({ x: _cx, residuals: _cr, ...c }) => c) } };
    };
    expect(strip(lean)).toEqual(strip(full));
  });
});
