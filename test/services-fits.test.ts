// Fits of a stored well: θ = T − Tref, exclusions, the produced-mass basis, stored fits and their
// staleness, and the forecast with its stated defaults.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRng } from '../src/shared/stats/random.js';
import { producedMassAt, type SeriesReading } from '../src/shared/series/well-series.js';
import { liquidWater, saturationPressurePa } from '../src/shared/water/iapws97.js';
import { START_MS, WEEK_MS, fixture, inputError, iso, type Fixture } from './services-helpers.js';

const WEEK_S = 604_800; // 7 × 86 400 s

describe('produced mass by the documented rule (src/shared/series/well-series.ts)', () => {
  it('holds each producing reading\'s flow over the interval before it, counts shut-ins as zero, bridges flagged readings', () => {
    const h = 3_600_000;
    const r = (id: number, hours: number, flow: number, status: SeriesReading['status'] = 'producing', flags: string[] = []): SeriesReading =>
      ({ id, timeMs: hours * h, productionTemperatureC: 150, normalisedMassFlowKgPerS: flow, status, flags });
    const history = [r(1, 0, 10), r(2, 1, 10), r(3, 2, 0, 'shut-in'), r(4, 3, 20), r(5, 4, 99, 'producing', ['bad']), r(6, 5, 20)];
    const m = producedMassAt(history, 0, history.map((x) => x.timeMs));
    // Worked by hand: t=1 h: 10 kg/s × 3600 s = 36 000 kg; t=2 h: shut-in, +0; t=3 h: +20 × 3600 = 108 000 kg;
    // t=4 h is flagged, so t=5 h stands for (3 h, 5 h]: M(4 h) = 108 000 + 20 × 3600 = 180 000, M(5 h) = 108 000 + 20 × 7200 = 252 000 kg.
    expect(Array.from(m.massKg)).toEqual([0, 36000, 36000, 108000, 180000, 252000]);
    expect(m.totalKg).toBe(252000);
    expect(m.counted).toBe(3);
  });
});

// Worked example (our own, derived from DOMAIN.md §4): a well whose flow doubles halfway.
//   Weekly readings k = 0..520, Δt = 604 800 s; ṁ = 40 kg/s up to k = 260, 80 kg/s after.
//   M_k = Σ_{j=1..k} ṁ_j·Δt (the service's rule, so it is exact here); θ_k = θ0·exp(−M_k/Mc) + N(0, 0.05 K),
//   θ0 = 100 K, Mc = 2e10 kg. Total M = 260·40·Δt + 260·80·Δt = 31 200·604 800 = 1.886976e10 kg.
//   In time, the log-slope of θ is ṁ/Mc: 2e-9 /s (τ = 5e8 s ≈ 15.8 yr) before the change and 4e-9 /s
//   (τ ≈ 7.9 yr) after, so no single exponential in time fits both halves: its residuals come in long runs.
const THETA0_K = 100;
const MC_KG = 2e10;
const NOISE_K = 0.05;
const LAST = 520;
const flowOf = (k: number): number => (k <= 260 ? 40 : 80);

let f: Fixture;
beforeAll(() => {
  f = fixture();
  const rng = createRng(7);
  let m = 0;
  for (let k = 0; k <= LAST; k++) {
    if (k > 0) m += flowOf(k) * WEEK_S;
    const theta = THETA0_K * Math.exp(-m / MC_KG) + NOISE_K * rng.normal();
    f.s.logReading({ well: 'W-1', time: iso(START_MS + k * WEEK_MS), productionTemperature: 70 + theta, flow: flowOf(k), flowUnit: 'kg/s' });
  }
});
afterAll(() => f.fdb.close());

/** Sign changes of the residuals: about n/2 for white noise, far fewer when the model misses a trend. */
function signChanges(residuals: ArrayLike<number>): number {
  let n = 0;
  for (let i = 1; i < residuals.length; i++) if (Math.sign(residuals[i]) !== Math.sign(residuals[i - 1])) n++;
  return n;
}

describe('fitWell, mass basis against time basis (worked example above)', () => {
  it('the mass-basis fit recovers Mc and θ0', () => {
    const r = f.s.fitWell({ well: 'W-1', basis: 'mass' });
    expect(r.fit.status).toBe('converged');
    expect(r.timeOrigin).toBe(iso(START_MS));
    expect(r.timeOriginSource).toBe('production-start');
    expect(r.producedMass?.totalKg).toBe(31200 * WEEK_S);
    expect(r.points.at(-1)?.x).toBe(31200 * WEEK_S);
    const mc = r.fit.parameters.tau!;
    expect(mc.unit).toBe('kg');
    expect(Math.abs(mc.value / MC_KG - 1)).toBeLessThan(0.005);
    expect(Math.abs(mc.value - MC_KG)).toBeLessThan(4 * mc.stderr);
    expect(Math.abs(r.fit.parameters.theta0!.value - THETA0_K)).toBeLessThan(0.05);
    expect(r.fit.rmseK).toBeGreaterThan(0.8 * NOISE_K);
    expect(r.fit.rmseK).toBeLessThan(1.2 * NOISE_K);
    expect(signChanges(r.fit.residuals)).toBeGreaterThan(200); // ≈ 520/2 for noise alone
  });

  it('the time-basis fit shows the kink in its residuals', () => {
    const r = f.s.fitWell({ well: 'W-1', basis: 'time' });
    expect(r.fit.status).toBe('converged');
    expect(r.fit.rmseK).toBeGreaterThan(20 * NOISE_K);
    expect(signChanges(r.fit.residuals)).toBeLessThan(20);
    // Its τ lies between the two regimes' 5e8 s and 2.5e8 s (worked above).
    const tau = r.fit.parameters.tau!.value;
    expect(tau).toBeLessThan(5e8);
    expect(tau).toBeGreaterThan(2.5e8);
  });
});

describe('stored fits and staleness', () => {
  it('a fit is stored with its fingerprint; a new reading makes it stale, an injection-temperature edit does not', () => {
    const g = fixture();
    try {
      const ids = [0, 1, 2, 3, 4, 5].map((k) => g.s.logReading({ well: 'W-1', time: iso(START_MS + k * WEEK_MS), productionTemperature: 170 - k, injectionTemperature: 70 }).reading.id);
      expect(g.s.fitStatus({ well: 'W-1' }).stale).toBeNull();
      const fit = g.s.fitWell({ well: 'W-1' });
      expect(fit.stored.fingerprint).toMatch(/^[0-9a-f]{64}$/); // SHA-256, hex
      expect(fit.stored.engineVersion).toMatch(/^tauwell \d+\.\d+\.\d+/);
      const row = g.fdb.db.prepare('SELECT data_fingerprint, model, basis FROM fits WHERE id = ?').get(fit.stored.fitId) as Record<string, string>;
      expect(row).toEqual({ data_fingerprint: fit.stored.fingerprint, model: 'exponential', basis: 'time' });

      expect(g.s.fitStatus({ well: 'W-1' })).toMatchObject({ stale: false, currentFingerprint: fit.stored.fingerprint });
      g.s.editReading({ id: ids[2], injectionTemperature: 71, reason: 'not part of a fit' });
      expect(g.s.fitStatus({ well: 'W-1' }).stale).toBe(false);
      g.s.logReading({ well: 'W-1', time: iso(START_MS + 6 * WEEK_MS), productionTemperature: 164 });
      const status = g.s.fitStatus({ well: 'W-1' });
      expect(status.stale).toBe(true);
      expect(status.message).toMatch(/^stale: the readings/);
      const refit = g.s.fitWell({ well: 'W-1' });
      expect(refit.stored.fitId).toBeGreaterThan(fit.stored.fitId);
      expect(g.s.fitStatus({ well: 'W-1' }).stale).toBe(false);
      g.s.updateWell({ well: 'W-1', referenceTemperatureC: 65 });
      expect(g.s.fitStatus({ well: 'W-1' }).stale).toBe(true);
    } finally {
      g.fdb.close();
    }
  });
});

describe('exclusions and time zero', () => {
  it('not producing, bad and spike readings stay in the log, are left out and counted', () => {
    const g = fixture({ productionStart: false });
    try {
      const statuses = ['producing', 'shut-in', 'producing', 'test', 'producing', 'producing', 'producing', 'producing'] as const;
      statuses.forEach((status, k) => g.s.logReading({
        well: 'W-1', time: iso(START_MS + (k + 1) * WEEK_MS), productionTemperature: 170 - k, status,
        ...(k === 4 ? { flags: ['bad'] } : k === 5 ? { flags: ['spike'] } : {}),
      }));
      const r = g.s.fitWell({ well: 'W-1' });
      expect(r.counts).toEqual({ readings: 8, included: 4, excludedNotProducing: 2, excludedFlagged: 2, excludedNoTemperature: 0, excludedBeforeTimeZero: 0 });
      expect(r.fit.n).toBe(4);
      expect(r.fit.nExcluded).toBe(4);
      expect(r.points.map((p) => p.excludedBecause)).toEqual([null, 'not-producing', null, 'not-producing', 'flagged', 'flagged', null, null]);
      // No production start: time zero is the first reading, and θ = T − 70 °C.
      expect(r.timeOriginSource).toBe('first-reading');
      expect(r.timeOrigin).toBe(iso(START_MS + WEEK_MS));
      expect(r.points[0]).toMatchObject({ x: 0, thetaK: 100 });
      expect(r.points[2].x).toBe(2 * WEEK_S);
      expect(g.s.listReadings({ well: 'W-1' }).readings).toHaveLength(8);
      // A window keeps time zero where it was.
      const w = g.s.fitWell({ well: 'W-1', from: iso(START_MS + 3 * WEEK_MS) });
      expect(w.timeOrigin).toBe(iso(START_MS + WEEK_MS));
      expect(w.points[0].x).toBe(2 * WEEK_S);
    } finally {
      g.fdb.close();
    }
  });

  it('refuses what cannot be fitted, naming why', () => {
    const g = fixture();
    try {
      g.s.createWell({ field: 'Test field', name: 'W-2', kind: 'production' });
      g.s.logReading({ well: 'W-2', time: iso(START_MS), productionTemperature: 150 });
      expect(inputError(() => g.s.fitWell({ well: 'W-2' })).where.field).toBe('referenceTemperatureC');
      g.s.createWell({ field: 'Test field', name: 'W-3I', kind: 'injection' });
      expect(inputError(() => g.s.fitWell({ well: 'W-3I' })).reason).toMatch(/injection well/);
      expect(inputError(() => g.s.fitWell({ well: 'W-1' })).reason).toBe('W-1 has no readings');
    } finally {
      g.fdb.close();
    }
  });
});

describe('forecastWell', () => {
  it('states its defaults: planned flow of the last year, IAPWS-IF97 cp at the mean production temperature', () => {
    const r = f.s.forecastWell({ well: 'W-1', basis: 'mass', limit: { kind: 'production-temperature', temperatureC: 100 }, samples: 200 });
    // The last year of readings all log 80 kg/s (worked example above).
    expect(r.plannedFlow).toMatchObject({ valueKgPerS: 80, source: 'mean-last-year' });
    const meanC = r.fit.meanProductionTemperatureC as number;
    const t = meanC + 273.15;
    expect(r.specificHeat.valueJPerKgK).toBe(liquidWater(t, saturationPressurePa(t) + 1e6).specificHeatJPerKgK); // IAPWS-IF97 engine, saturation + 1 MPa
    expect(r.specificHeat.source).toBe('IAPWS-IF97 region 1');
    expect(r.limit.thetaEconK).toBe(30); // 100 °C − Tref 70 °C
    expect(r.forecast.status).toBe('ok');
    expect(r.forecast.nowTimeS).toBe(LAST * WEEK_S); // now = the last fitted reading
    expect(r.recharge).toBeNull();
    expect(r.assumptions.join('\n')).toMatch(/belongs to no reservoir: no recharge estimate/);
    expect(r.assumptions.join('\n')).toMatch(/planned flow 80 kg\/s/);
  });

  it('estimates recharge against the latest parameter version of the well\'s reservoir', () => {
    const g = fixture();
    try {
      g.s.createReservoir({ field: 'Test field', name: 'Slab' });
      const params = {
        kind: 'hot-dry-rock', surfaceTemperature: 10, gradient: 0.03, minUsefulTemperature: 70, maxDepth: 5000,
        area: 1e4, rockDensity: 2700, rockSpecificHeat: 800, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 },
      };
      g.s.addReservoirVersion({ reservoir: 'Slab', params });
      g.s.addReservoirVersion({ reservoir: 'Slab', params: { ...params, area: 2e4 }, note: 'bigger' });
      g.s.updateWell({ well: 'W-1', reservoir: 'Slab' });
      for (let k = 0; k <= 100; k++) {
        g.s.logReading({ well: 'W-1', time: iso(START_MS + k * WEEK_MS), productionTemperature: 70 + 90 * Math.exp(-(k * WEEK_S) / 6e8), flow: 45, flowUnit: 'kg/s' });
      }
      const r = g.s.forecastWell({ well: 'W-1', limit: { kind: 'theta', thetaK: 40 }, samples: 200 });
      expect(r.recharge?.status).toBe('ok');
      expect(r.reservoir?.version.version).toBe(2);
      expect(r.reservoir?.areaM2).toBe(2e4);
      expect(r.reservoir?.meanMassFlowKgPerS).toBe(45);
      // τtheory = C/(ṁ·cw) = 2700·800·2e4·3000/(45·4186) = 6.88177e11 s (hand arithmetic, DOMAIN.md §2)
      expect(Math.abs((r.recharge?.tauTheoryS as number) / ((2700 * 800 * 2e4 * 3000) / (45 * 4186)) - 1)).toBeLessThan(1e-12);
    } finally {
      g.fdb.close();
    }
  });
});
