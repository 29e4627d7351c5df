// fieldOverview: each well's row equals forecastWell asked with the same choices, follows the latest
// stored fit, never stores one, says in words why a well has no forecast; the field's weekly output
// P = ṁ·cp·θ; and the data-quality rule on constructed logs.
import { beforeAll, afterAll, describe, expect, it } from 'vitest';
import type { FieldDb } from '../src/main/db/database.js';
import type { Well } from '../src/main/db/wells.js';
import { dataQuality } from '../src/main/services/data-quality.js';
import { createContext } from '../src/main/services/context.js';
import { fitServices } from '../src/main/services/fits.js';
import { forecastServices } from '../src/main/services/forecasts.js';
import { createServices, type Services } from '../src/main/services/index.js';
import { overviewServices } from '../src/main/services/overview.js';
import type { ForecastLimit } from '../src/shared/contract/fits.js';
import type { WellOverview } from '../src/shared/contract/overview.js';
import type { SeriesReading } from '../src/shared/series/well-series.js';
import { liquidWater, saturationPressurePa } from '../src/shared/water/iapws97.js';
import { freshDb } from './db-helpers.js';
import { START_MS, fixture, iso } from './services-helpers.js';

const DAY_MS = 86_400_000;
const YEAR_MS = 365.25 * DAY_MS; // Julian year, the trade's year for rates (common practice; IAU definition)
/** 2026-01-01T00:00:00Z: the overview's "now", a fortnight after the demo's last weekly reading. */
const NOW_MS = Date.UTC(2026, 0, 1);

let fdb: FieldDb;
let s: Services;
const countFits = (): number => (fdb.db.prepare('SELECT count(*) AS n FROM fits').get() as { n: number }).n;
const rowOf = (name: string): WellOverview => s.fieldOverview().fields[0].wells.find((w) => w.well.name === name) as WellOverview;
const lastReadingMs = (name: string): number => Date.parse(s.listReadings({ well: name }).readings.at(-1)?.time as string);

/** The row's numbers recomputed from a forecastWell response, as the overview documents them. */
function expectRowToMatch(row: WellOverview, direct: ReturnType<Services['forecastWell']>, latestMs: number): void {
  const tau = direct.fit.fit.parameters.tau!;
  const perS = direct.fit.basis === 'time' ? 1 : (direct.fit.meanMassFlowKgPerS as number); // τ = Mc/ṁ on the mass basis
  expect(row.fit?.tau).toEqual({ value: tau.value / perS, ci95: [tau.ci95[0] / perS, tau.ci95[1] / perS] });
  expect(row.fit?.status).toBe(direct.fit.fit.status);
  expect(row.theoryTauS).toBe(direct.recharge?.tauTheoryS);
  expect(row.rechargeFraction).toEqual({ value: direct.recharge?.rechargeFraction.value, ci95: direct.recharge?.rechargeFraction.ci95 });
  expect(row.rechargeVerdict).toBe(direct.recharge?.verdict);
  expect(row.currentPowerW).toBe(direct.forecast.currentPowerW);
  const originMs = Date.parse(direct.fit.timeOrigin);
  const eol = direct.forecast.endOfLife;
  for (const p of ['p90', 'p50', 'p10'] as const) {
    const t = eol[p];
    expect(row.endOfLife?.[p]).toBe(t === null ? null : iso(originMs + t * 1000));
    expect(row.yearsToLimit?.[p]).toBe(t === null ? null : Math.max(0, (originMs + t * 1000 - latestMs) / YEAR_MS));
  }
  expect(row.limit.text).toBe(direct.limit.text);
  expect(row.problem).toBeNull();
}

describe('the invented demo field', () => {
  beforeAll(() => {
    fdb = freshDb();
    s = createServices(fdb, { now: () => NOW_MS });
    s.buildDemo();
  });
  afterAll(() => fdb.close());

  it('wells never fitted: auto on the time basis, the demo\'s 115 °C limit, and the same numbers as forecastWell; nothing stored', () => {
    const o = s.fieldOverview();
    expect(countFits()).toBe(0);
    expect(o.generatedAt).toBe(iso(NOW_MS));
    expect(o.settings.economicLimit).toEqual({ kind: 'production-temperature', temperatureC: 115 });
    const field = o.fields[0];
    expect(field.field.name).toBe('Kettle Ridge (invented)');
    expect(field.wells.map((w) => w.well.name)).toEqual(['KR-1', 'KR-2', 'KR-3', 'KR-4I']);
    for (const name of ['KR-1', 'KR-2', 'KR-3']) {
      const row = field.wells.find((w) => w.well.name === name) as WellOverview;
      expect(row.fit).toMatchObject({ model: 'auto', basis: 'time', window: { from: null, to: null }, stale: null });
      expect(row.limit).toMatchObject({ kind: 'production-temperature', temperatureC: 115 });
      // forecastWell with the overview's documented choices: the settings' limit, horizon and background heat flow.
      const direct = s.forecastWell({ well: name, model: 'auto', basis: 'time', limit: { kind: 'production-temperature', temperatureC: 115 }, horizonYears: 30, backgroundHeatFlowWPerM2: 0.06 });
      expectRowToMatch(row, direct, lastReadingMs(name));
      // θ of the latest reading the fit used.
      const lastIncluded = direct.fit.points.filter((p) => p.included).at(-1);
      expect(row.thetaK).toBe(lastIncluded?.thetaK);
    }
    const injection = field.wells[3];
    expect(injection.problem).toMatch(/KR-4I is an injection well/);
    expect(injection.fit).toBeNull();
    expect(injection.quality.readings).toBe(624); // 12 × 52 weekly readings (demo/README.md)
  });

  it('KR-3 cools faster than its parameters allow (the demo\'s planted short-circuit)', () => {
    const row = rowOf('KR-3');
    expect(row.rechargeVerdict).toBe('faster-than-theory');
    expect(row.rechargeInterpretation).toMatch(/faster than its parameters allow/);
  });

  it('the field output sums the production wells\' weekly power; the injection well adds nothing', () => {
    const out = s.fieldOverview().fields[0].output;
    expect(out.weekStart).toHaveLength(out.powerW.length);
    // 624 weekly readings from 2014-01-06 (a Monday), each week with at least one producing well.
    expect(out.weekStart[0]).toBe('2014-01-06T00:00:00.000Z');
    expect(out.weekStart.length).toBeLessThanOrEqual(624);
    expect(out.powerW.every((p) => Number.isFinite(p) && p >= 0)).toBe(true);
    expect(out.note).toMatch(/IAPWS-IF97 cp/);
  });

  it('a well\'s own limit from the settings comes first', () => {
    const kr1 = s.getWell({ well: 'KR-1' }).well.id;
    const own: ForecastLimit = { kind: 'theta', thetaK: 40 };
    s.updateSettings({ wellEconomicLimits: { [String(kr1)]: own } });
    const fits = countFits();
    const row = rowOf('KR-1');
    expect(countFits()).toBe(fits);
    expect(row.limit).toMatchObject(own);
    expect(rowOf('KR-2').limit).toMatchObject({ kind: 'production-temperature', temperatureC: 115 });
    // KR-1 was fitted by forecastWell above (auto, time): the overview follows that stored fit.
    const direct = s.forecastWell({ well: 'KR-1', model: 'auto', basis: 'time', limit: own });
    expectRowToMatch(row, direct, lastReadingMs('KR-1'));
    s.updateSettings({ wellEconomicLimits: { [String(kr1)]: null } });
  });

  it('follows the latest stored fit\'s model and basis, and says when it is stale', () => {
    const fit = s.fitWell({ well: 'KR-3', basis: 'mass', model: 'exponential' });
    const row = rowOf('KR-3');
    expect(row.fit).toMatchObject({ model: 'exponential', basis: 'mass', stale: false });
    expect(row.fit?.message).toMatch(/follows the stored fit of/);
    const direct = s.forecastWell({ well: 'KR-3', model: 'exponential', basis: 'mass', limit: { kind: 'production-temperature', temperatureC: 115 } });
    expect(direct.fit.fit.parameters.tau?.value).toBe(fit.fit.parameters.tau?.value);
    expectRowToMatch(row, direct, lastReadingMs('KR-3'));

    s.logReading({ well: 'KR-3', time: iso(lastReadingMs('KR-3') + 7 * DAY_MS), productionTemperature: 117, flow: 40, flowUnit: 'kg/s' });
    s.fitWell({ well: 'KR-3', basis: 'mass', model: 'exponential', to: iso(lastReadingMs('KR-3') - 1) }); // a window that ends before the new reading
    expect(rowOf('KR-3').fit?.stale).toBe(false); // the window's readings did not change
    s.logReading({ well: 'KR-3', time: iso(lastReadingMs('KR-3') - 3 * DAY_MS), productionTemperature: 117.5, flow: 40, flowUnit: 'kg/s' });
    const stale = rowOf('KR-3').fit;
    expect(stale?.stale).toBe(true);
    expect(stale?.message).toMatch(/stale/);
  });
});

describe('wells without a forecast get a row saying why, never an exception', () => {
  it('no Tref, too few readings, a limit not above Tref', () => {
    const f = fixture();
    try {
      f.s.createWell({ field: 'Test field', name: 'NO-TREF', kind: 'production' });
      f.s.logReading({ well: 'NO-TREF', time: iso(START_MS), productionTemperature: 150 });
      f.s.createWell({ field: 'Test field', name: 'EMPTY', kind: 'production', referenceTemperatureC: 70 });
      for (const k of [0, 1]) f.s.logReading({ well: 'W-1', time: iso(START_MS + k * 7 * DAY_MS), productionTemperature: 150 - k, flow: 40, flowUnit: 'kg/s' });
      const rows = f.s.fieldOverview().fields[0].wells;
      const by = (name: string): WellOverview => rows.find((w) => w.well.name === name) as WellOverview;
      expect(by('NO-TREF').problem).toMatch(/no reference temperature Tref/);
      expect(by('NO-TREF').thetaK).toBeNull();
      expect(by('EMPTY').problem).toBe('EMPTY has no readings');
      expect(by('EMPTY').quality.mark).toBe('no-data');
      expect(by('W-1').fit?.status).toBe('too-few-points'); // 2 readings for a 2-parameter model and its variance
      expect(by('W-1').problem).toMatch(/no forecast/);

      for (let k = 2; k < 30; k++) f.s.logReading({ well: 'W-1', time: iso(START_MS + k * 7 * DAY_MS), productionTemperature: 70 + 80 * Math.exp(-k / 100), flow: 40, flowUnit: 'kg/s' });
      f.s.updateSettings({ economicLimit: { kind: 'production-temperature', temperatureC: 60 } });
      const w1 = f.s.fieldOverview().fields[0].wells.find((w) => w.well.name === 'W-1') as WellOverview;
      expect(w1.problem).toMatch(/not above the well's Tref 70 °C/);
      expect(w1.fit?.status).toBe('converged'); // the fit alone still shows
      expect(w1.thetaK).toBeCloseTo(80 * Math.exp(-29 / 100), 9); // θ = T − Tref of the last reading
    } finally {
      f.fdb.close();
    }
  });
});

describe('the field output, worked by hand', () => {
  it('sums each well\'s mean P = ṁ·cp·θ per week; shut-in counts 0; flagged and test readings are left out', () => {
    // START_MS = 2024-01-01T00:00Z, a Monday (Gregorian calendar), so weeks start at START_MS + 7k days.
    const f = fixture();
    try {
      f.s.createWell({ field: 'Test field', name: 'W-2', kind: 'production', referenceTemperatureC: 60 });
      const log = (well: string, day: number, t: number, flow: number, extra: Record<string, unknown> = {}): void => {
        f.s.logReading({ well, time: iso(START_MS + day * DAY_MS + 9 * 3_600_000), productionTemperature: t, flow, flowUnit: 'kg/s', ...extra });
      };
      log('W-1', 1, 150, 40); log('W-1', 3, 148, 40); // week 0
      log('W-1', 8, 150, 0, { status: 'shut-in' }); log('W-1', 10, 146, 38); // week 1
      log('W-1', 15, 145, 38, { flags: ['bad'] }); log('W-1', 16, 144, 20, { status: 'test' }); // week 2: nothing counts
      log('W-2', 2, 130, 20); // week 0
      log('W-2', 17, 128, 22); // week 2
      const out = f.s.fieldOverview().fields[0].output;

      // cp as the forecast takes it: IAPWS-IF97 at the mean production temperature of the readings a fit uses,
      // saturation + 1 MPa (engine src/shared/water/iapws97.ts, checked against IAPWS-IF97 (2007) Table 5 in test/iapws97.test.ts).
      const cpAt = (c: number): number => liquidWater(c + 273.15, saturationPressurePa(c + 273.15) + 1e6).specificHeatJPerKgK;
      const cp1 = cpAt((150 + 148 + 146) / 3); // W-1 fits use 150, 148, 146 °C (shut-in, flagged and test readings left out)
      const cp2 = cpAt((130 + 128) / 2);
      // Liquid water near 150 °C: cp ≈ 4.31 kJ/(kg·K) (steam tables, recalled from memory).
      expect(Math.abs(cp1 / 4310 - 1)).toBeLessThan(0.01);

      expect(out.weekStart).toEqual([iso(START_MS), iso(START_MS + 7 * DAY_MS), iso(START_MS + 14 * DAY_MS)]);
      const expected = [
        (40 * cp1 * 80 + 40 * cp1 * 78) / 2 + 20 * cp2 * 70, // week 0: W-1 mean of two readings + W-2
        (0 + 38 * cp1 * 76) / 2, // week 1: W-1 shut-in (0) and producing; W-2 none
        22 * cp2 * 68, // week 2: W-1 only flagged and test readings; W-2 one reading
      ];
      out.powerW.forEach((p, i) => expect(Math.abs(p / expected[i] - 1)).toBeLessThan(1e-12));
    } finally {
      f.fdb.close();
    }
  });
});

describe('the data-quality rule (src/main/services/data-quality.ts)', () => {
  const well = (kind: Well['kind'] = 'production'): Well =>
    ({ id: 1, fieldId: 1, reservoirId: null, name: 'W', kind, referenceTemperatureC: 70, productionStartMs: null, createdMs: 0 });
  /** Readings every `stepDays` days, the last one `ageDays` before NOW_MS. */
  const weekly = (count: number, stepDays: number, ageDays: number, each: (i: number) => Partial<SeriesReading> = () => ({})): SeriesReading[] =>
    Array.from({ length: count }, (_, i) => ({
      id: i + 1, timeMs: NOW_MS - ageDays * DAY_MS - (count - 1 - i) * stepDays * DAY_MS,
      productionTemperatureC: 150, normalisedMassFlowKgPerS: 40, status: 'producing', flags: [], ...each(i),
    }));

  it('good: ≥ 26 usable readings, no gap over 35 d in the last year, latest ≤ 14 d behind the field’s, ≤ 5 % flagged', () => {
    const q = dataQuality(well(), weekly(30, 7, 3), NOW_MS, NOW_MS);
    expect(q).toMatchObject({ mark: 'good', readings: 30, included: 30, excluded: 0, flagged: 0, longestGapDays: 7, daysSinceLatest: 3 });
    expect(q.notes[0]).toBe('meets every condition of good');
    expect(q.notes.at(-1)).toMatch(/^rule: good = ≥ 26 usable readings/);
  });

  it('fair, each condition of good failing alone', () => {
    const cases: [SeriesReading[], RegExp][] = [
      [weekly(20, 7, 3), /20 usable readings \(fewer than 26\)/],
      [weekly(30, 7, 30), /latest reading is 30 d older than the field’s latest/],
      [weekly(30, 7, 3, (i) => (i % 10 === 0 ? { flags: ['spike'] } : {})), /3 of 30 readings flagged/], // 10 % > 5 %, ≤ 20 %
    ];
    for (const [history, why] of cases) {
      const q = dataQuality(well(), history, NOW_MS, NOW_MS);
      expect(q.mark).toBe('fair');
      expect(q.notes[0]).toMatch(why);
    }
    // At the edge: 4 of 30 shut in leaves exactly 26 usable readings, still good.
    expect(dataQuality(well(), weekly(30, 7, 3, (i) => (i < 4 ? { status: 'shut-in' } : {})), NOW_MS, NOW_MS)).toMatchObject({ mark: 'good', included: 26 });
    // A 50-day gap inside the last year: fair. 30 readings a week apart, with the middle ones 50 days apart.
    const gap = weekly(30, 7, 3).map((r, i) => (i < 15 ? { ...r, timeMs: r.timeMs - 43 * DAY_MS } : r));
    const q = dataQuality(well(), gap, NOW_MS, NOW_MS);
    expect(q.longestGapDays).toBe(50);
    expect(q.mark).toBe('fair');
    expect(q.notes[0]).toMatch(/a gap of 50 d/);
  });

  it('a long gap more than a year before the latest reading does not count against the mark, though it is reported', () => {
    const old = weekly(60, 7, 3).map((r, i) => (i < 5 ? { ...r, timeMs: r.timeMs - 400 * DAY_MS } : r));
    const q = dataQuality(well(), old, NOW_MS, NOW_MS);
    expect(q.longestGapDays).toBe(407); // 400 d moved back + the 7-day step
    expect(q.mark).toBe('good');
  });

  it('judges a well against the field\'s latest reading, not the clock: an archived log keeps its mark', () => {
    // The whole field stopped 400 d before NOW_MS (the log is reviewed long after): still good.
    const archived = weekly(30, 7, 400);
    const lastMs = archived.at(-1)!.timeMs;
    expect(dataQuality(well(), archived, lastMs, NOW_MS)).toMatchObject({ mark: 'good', daysSinceLatest: 400 });
    // The same well when the field's other wells carried on to NOW_MS: 400 d behind, poor.
    expect(dataQuality(well(), archived, NOW_MS, NOW_MS).mark).toBe('poor');
  });

  it('poor, no-data, and an injection well judged on its unflagged readings', () => {
    expect(dataQuality(well(), weekly(5, 7, 3), NOW_MS, NOW_MS).mark).toBe('poor');
    expect(dataQuality(well(), weekly(30, 7, 200), NOW_MS, NOW_MS).mark).toBe('poor');
    expect(dataQuality(well(), [], NOW_MS, NOW_MS)).toMatchObject({ mark: 'no-data', readings: 0, longestGapDays: null, daysSinceLatest: null });
    const injection = dataQuality(well('injection'), weekly(30, 7, 3, () => ({ productionTemperatureC: null })), NOW_MS, NOW_MS);
    expect(injection).toMatchObject({ mark: 'good', included: 0, excluded: 30 });
    expect(injection.notes.join(' ')).toMatch(/injection well, not fitted/);
  });
});

describe('the overview without forecasts (what a report takes from it)', () => {
  it('has the same quality, θ, limit and field output as the full overview, and makes no fit', () => {
    const db = freshDb();
    try {
      createServices(db).buildDemo();
      const countDbFits = (): number => (db.db.prepare('SELECT count(*) AS n FROM fits').get() as { n: number }).n;
      const fitsBefore = countDbFits();
      const ctx = createContext(db, { now: () => NOW_MS });
      const fits = fitServices(ctx);
      const overview = overviewServices(ctx, fits, forecastServices(ctx, fits));
      const full = overview.fieldOverview({}).fields[0];
      const lean = overview.fieldOverview({}, { forecasts: false }).fields[0];
      expect(lean.output).toEqual(full.output);
      expect(lean.wells.map((w) => [w.well.name, w.quality, w.thetaK, w.limit.kind])).toEqual(full.wells.map((w) => [w.well.name, w.quality, w.thetaK, w.limit.kind]));
      for (const w of lean.wells) expect([w.fit, w.yearsToLimit, w.endOfLife]).toEqual([null, null, null]);
      expect(countDbFits()).toBe(fitsBefore);
    } finally {
      db.close();
    }
  });
});
