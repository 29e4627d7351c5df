// Forecast and end of economic life (DOMAIN.md §8): worked examples, closed form against numerical
// integration, and the behaviour of the Monte Carlo percentiles.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import { fitDecline } from '../src/shared/fit/fit.js';
import { declineValue } from '../src/shared/fit/models.js';
import { parameterNamesOf, type Basis, type DeclineModel, type DeclineParameters, type FitResult } from '../src/shared/fit/types.js';
import { forecastDecline, type ForecastOptions, type ForecastResult } from '../src/shared/forecast/forecast.js';
import { columnQuantiles, StreamingQuantiles } from '../src/shared/forecast/quantiles.js';
import { sampleParameters } from '../src/shared/forecast/sampling.js';
import { createRng, sampleMultivariateNormal } from '../src/shared/stats/random.js';
import { quantileSorted } from '../src/shared/stats/summary.js';

const YEAR = 365.25 * 86400; // Julian year, DOMAIN.md §9
const WEEK = 7 * 86400;

/**
 * A fit record with chosen estimates and a diagonal covariance of the given relative standard deviation:
 * with a tiny one every percentile collapses onto the central estimate, so worked examples check both.
 */
function syntheticFit(model: DeclineModel, basis: Basis, estimates: DeclineParameters, relSd = 1e-9, xRange: [number, number] = [0, 1]): FitResult {
  const names = parameterNamesOf(model);
  const sd = names.map((n) => Math.abs(estimates[n] as number) * relSd);
  const covariance = names.map((_, i) => names.map((__, j) => (i === j ? sd[i] ** 2 : 0)));
  const parameters = Object.fromEntries(names.map((n, i) => {
    const v = estimates[n] as number;
    return [n, { value: v, stderr: sd[i], ci95: [v - 2 * sd[i], v + 2 * sd[i]] as [number, number], unit: n === 'tau' ? (basis === 'time' ? 's' : 'kg') : n === 'b' ? '1' : 'K' }];
  }));
  return {
    model, basis, status: 'converged', converged: true, message: '',
    n: 100, nExcluded: 0, dof: 100 - names.length, parameterNames: names, estimates, parameters,
    covariance, correlation: names.map((_, i) => names.map((__, j) => (i === j ? 1 : 0))),
    x: new Float64Array(0), residuals: new Float64Array(0), sse: 1, rmseK: 0.1, r2: 0.99, aicc: 0,
    iterations: 5, evaluations: 6, xRange,
  };
}

function weeklySeries(n: number, f: (t: number) => number, noiseK: number, seed: number) {
  const rng = createRng(seed);
  const x = Array.from({ length: n }, (_, i) => i * WEEK);
  return { basis: 'time' as const, x, theta: x.map((t) => f(t) + noiseK * rng.normal()) };
}

/** Composite Simpson's rule with `intervals` (even) panels — an integration independent of the closed forms. */
function simpson(f: (t: number) => number, a: number, b: number, intervals = 2000): number {
  const h = (b - a) / intervals;
  let s = f(a) + f(b);
  for (let i = 1; i < intervals; i++) s += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

const temperatureLimit = (thetaEconK: number) => ({ kind: 'temperature' as const, thetaEconK });

function expectCollapsed(r: ForecastResult, expectedS: number): void {
  expect(r.status).toBe('ok');
  expect(r.endOfLife.centralS! / expectedS).toBeCloseTo(1, 9);
  for (const p of [r.endOfLife.p90, r.endOfLife.p50, r.endOfLife.p10]) expect(p! / expectedS).toBeCloseTo(1, 6);
  expect(r.endOfLife.reached).toBe(true);
  expect(r.endOfLife.alreadyReached).toBe(false);
}

describe('end of life: worked examples', () => {
  it('exponential, time basis', () => {
    // θ0 = 60 K, τ = 10 yr, θecon = 20 K: t = τ·ln(θ0/θecon) = 10 yr × ln 3 = 10 × 1.0986122886681098 = 10.986122886681098 yr.
    // Same from now (DOMAIN.md §8): tnow + τ·ln(θ(tnow)/θecon) = 2 + 10·(ln 3 − 0.2) = 10.986 yr.
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 1e-9, [0, 2 * YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(20), horizonS: 30 * YEAR });
    expect(r.nowTimeS).toBe(2 * YEAR);
    expectCollapsed(r, 10.986122886681098 * YEAR);
    // θ now = 60·e^(−0.2) = 49.123845184678906 K (worked: e^(−0.2) = 0.8187307530779818).
    expect(r.currentThetaK).toBeCloseTo(49.123845184678906, 10);
  });

  it('exponential, mass basis: produced mass turned into time at the planned flow', () => {
    // θ0 = 60 K, Mc = 5e10 kg, θecon = 20 K: M = Mc·ln 3 = 5.493061443340549e10 kg.
    // Now: M = 1e10 kg at t = 3 yr, ṁplan = 50 kg/s: t = 3 yr + (5.493061443340549e10 − 1e10)/50 s = 3 yr + 8.986122886681098e8 s.
    const fit = syntheticFit('exponential', 'mass', { theta0: 60, tau: 5e10 }, 1e-9, [0, 1e10]);
    const r = forecastDecline(fit, { limit: temperatureLimit(20), horizonS: 40 * YEAR, nowTimeS: 3 * YEAR, plannedMassFlowKgPerS: 50 });
    expectCollapsed(r, 3 * YEAR + 8.986122886681098e8);
  });

  it('exponential to a floor, time basis', () => {
    // θ0 = 70 K, θ∞ = 25 K, τ = 5 yr, θecon = 30 K: t = τ·ln((θ0 − θ∞)/(θecon − θ∞)) = 5 yr × ln(45/5) = 5 × 2.1972245773362196 = 10.986122886681098 yr.
    const fit = syntheticFit('floor', 'time', { theta0: 70, tau: 5 * YEAR, thetaInf: 25 }, 1e-9, [0, YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(30), horizonS: 30 * YEAR });
    expectCollapsed(r, 10.986122886681098 * YEAR);
  });

  it('exponential to a floor, mass basis', () => {
    // Mc = 4e10 kg: M = 4e10 × ln 9 = 8.788898309344878e10 kg; now M = 5e9 kg at t = 1 yr, ṁplan = 40 kg/s:
    // t = 1 yr + (8.788898309344878e10 − 5e9)/40 s = 1 yr + 2.0722245773362195e9 s.
    const fit = syntheticFit('floor', 'mass', { theta0: 70, tau: 4e10, thetaInf: 25 }, 1e-9, [0, 5e9]);
    const r = forecastDecline(fit, { limit: temperatureLimit(30), horizonS: 80 * YEAR, nowTimeS: YEAR, plannedMassFlowKgPerS: 40 });
    expectCollapsed(r, YEAR + 2.0722245773362195e9);
  });

  it('hyperbolic, time basis', () => {
    // θ0 = 60 K, τ = 8 yr, b = 0.5, θecon = 15 K: t = (τ/b)·((θ0/θecon)^b − 1) = 16 yr × (√4 − 1) = 16 yr.
    const fit = syntheticFit('hyperbolic', 'time', { theta0: 60, tau: 8 * YEAR, b: 0.5 }, 1e-9, [0, 3 * YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(15), horizonS: 30 * YEAR });
    expectCollapsed(r, 16 * YEAR);
  });

  it('hyperbolic, mass basis', () => {
    // Mc = 2e10 kg, b = 0.5, θ0/θecon = 4: M = (2e10/0.5) × (2 − 1) = 4e10 kg; now M = 1e10 kg at t = 2 yr,
    // ṁplan = 25 kg/s: t = 2 yr + 3e10/25 s = 2 yr + 1.2e9 s.
    const fit = syntheticFit('hyperbolic', 'mass', { theta0: 60, tau: 2e10, b: 0.5 }, 1e-9, [0, 1e10]);
    const r = forecastDecline(fit, { limit: temperatureLimit(15), horizonS: 60 * YEAR, nowTimeS: 2 * YEAR, plannedMassFlowKgPerS: 25 });
    expectCollapsed(r, 2 * YEAR + 1.2e9);
  });

  it('a floor above the limit is never reached, and the note says so plainly', () => {
    const fit = syntheticFit('floor', 'time', { theta0: 70, tau: 5 * YEAR, thetaInf: 32 }, 1e-9, [0, YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(30), horizonS: 100 * YEAR });
    expect(r.endOfLife.centralS).toBeNull();
    expect(r.endOfLife.p50).toBeNull();
    expect(r.endOfLife.reached).toBe(false);
    expect(r.endOfLife.fractionReachedWithinHorizon).toBe(0);
    expect(r.notes.join('\n')).toMatch(/a floor of 32\.0 K lies at or above the limit of 30\.0 K.*not reached at any horizon/);
  });

  it('a limit beyond the horizon is null, with the central crossing in a note', () => {
    // Crossing at 10.99 yr (first example), horizon ends at 2 + 5 = 7 yr.
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 1e-9, [0, 2 * YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(20), horizonS: 5 * YEAR, plannedMassFlowKgPerS: 50, specificHeatJPerKgK: 4000 });
    expect(r.endOfLife.centralS).toBeNull();
    expect(r.endOfLife.reached).toBe(false);
    expect(r.notes.join('\n')).toMatch(/reaches the limit at t = 10\.99 yr, beyond the horizon/);
    expect(r.remainingHeatToHorizon).toBe(true);
  });

  it('θ already below the limit: alreadyReached, end of life now, crossing time in a note', () => {
    // θ now = 49.12 K < θecon = 55 K; the curve crossed at τ·ln(60/55) = 10 × 0.0870113769896297 = 0.870 yr.
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 1e-9, [0, 2 * YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(55), horizonS: 10 * YEAR, plannedMassFlowKgPerS: 50, specificHeatJPerKgK: 4000 });
    expect(r.endOfLife.alreadyReached).toBe(true);
    expect(r.endOfLife.centralS).toBe(2 * YEAR);
    expect(r.endOfLife.p50).toBe(2 * YEAR);
    expect(r.remainingHeatJ!.central).toBe(0);
    expect(r.notes.join('\n')).toMatch(/already at or below the limit.*crossed it at t = 0\.87 yr.*reported as now/);
  });
});

describe('economic limit by power, current power', () => {
  it('θecon = Pmin/(ṁplan·cw)', () => {
    // Pmin = 2 MW, ṁ = 50 kg/s, cw = 4000 J/(kg·K): θecon = 2e6/(50 × 4000) = 10 K (worked).
    // End of life: τ·ln(60/10) = 10 yr × 1.791759469228055 = 17.91759469228055 yr.
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 1e-9, [0, 2 * YEAR]);
    const r = forecastDecline(fit, { limit: { kind: 'power', minPowerW: 2e6 }, horizonS: 30 * YEAR, plannedMassFlowKgPerS: 50, specificHeatJPerKgK: 4000 });
    expect(r.thetaEconK).toBeCloseTo(10, 12);
    expect(r.endOfLife.centralS! / YEAR).toBeCloseTo(17.91759469228055, 9);
    // P now = ṁ·cw·θnow = 2e5 W/K × 49.123845184678906 K = 9.824769036935782e6 W (worked).
    expect(r.currentPowerW!).toBeCloseTo(9.824769036935782e6, 3);
    expect(r.notes.join('\n')).toMatch(/θecon = Pmin\/\(ṁplan·cw\) = 2\.00 MW \/ \(50 kg\/s × 4000 J\/\(kg·K\)\) = 10\.0 K/);
  });

  it('a power limit without flow or specific heat is an input error naming the missing option', () => {
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR });
    const limit = { kind: 'power' as const, minPowerW: 2e6 };
    expect(() => forecastDecline(fit, { limit, horizonS: YEAR, plannedMassFlowKgPerS: 50 })).toThrow(InputError);
    expect(() => forecastDecline(fit, { limit, horizonS: YEAR, plannedMassFlowKgPerS: 50 })).toThrow(/specificHeatJPerKgK/);
    expect(() => forecastDecline(fit, { limit, horizonS: YEAR, specificHeatJPerKgK: 4000 })).toThrow(/plannedMassFlowKgPerS/);
  });
});

describe('remaining heat: closed form against composite Simpson integration of ṁ·cw·θ(t)', () => {
  const flow = 50, cw = 4000;
  const cases: { model: DeclineModel; est: DeclineParameters; econ: number }[] = [
    { model: 'exponential', est: { theta0: 60, tau: 10 * YEAR }, econ: 20 },
    { model: 'floor', est: { theta0: 70, tau: 5 * YEAR, thetaInf: 25 }, econ: 30 },
    { model: 'hyperbolic', est: { theta0: 60, tau: 8 * YEAR, b: 0.5 }, econ: 15 },
  ];
  for (const { model, est, econ } of cases) {
    it(`${model}, time basis`, () => {
      const fit = syntheticFit(model, 'time', est, 1e-9, [0, 2 * YEAR]);
      const r = forecastDecline(fit, { limit: temperatureLimit(econ), horizonS: 40 * YEAR, plannedMassFlowKgPerS: flow, specificHeatJPerKgK: cw });
      const q = simpson((t) => flow * cw * declineValue(model, est, t), 2 * YEAR, r.endOfLife.centralS!);
      expect(r.remainingHeatJ!.central! / q).toBeCloseTo(1, 9);
      expect(r.remainingHeatJ!.p50! / q).toBeCloseTo(1, 6);
      expect(r.remainingHeatToHorizon).toBe(false);
    });

    it(`${model}, mass basis: cw·∫θ dM equals ∫ṁ·cw·θ(M(t)) dt with M(t) = Mnow + ṁ·(t − tnow)`, () => {
      const massEst = { ...est, tau: est.tau / YEAR * 1e10 }; // τ of N yr becomes Mc of N × 1e10 kg
      const fit = syntheticFit(model, 'mass', massEst, 1e-9, [0, 1e10]);
      const nowTimeS = 3 * YEAR;
      const r = forecastDecline(fit, { limit: temperatureLimit(econ), horizonS: 400 * YEAR, nowTimeS, plannedMassFlowKgPerS: flow, specificHeatJPerKgK: cw });
      const q = simpson((t) => flow * cw * declineValue(model, massEst, 1e10 + flow * (t - nowTimeS)), nowTimeS, r.endOfLife.centralS!);
      expect(r.remainingHeatJ!.central! / q).toBeCloseTo(1, 9);
      // The mass-basis heat needs no flow: another planned flow gives the same heat, sooner or later.
      const r2 = forecastDecline(fit, { limit: temperatureLimit(econ), horizonS: 400 * YEAR, nowTimeS, plannedMassFlowKgPerS: 2 * flow, specificHeatJPerKgK: cw });
      expect(r2.remainingHeatJ!.central! / r.remainingHeatJ!.central!).toBeCloseTo(1, 12);
      expect(r2.endOfLife.centralS! - nowTimeS).toBeCloseTo((r.endOfLife.centralS! - nowTimeS) / 2, 0);
    });
  }

  it('exponential by hand: Q = ṁ·cw·τ·(θnow − θecon)', () => {
    // 2e5 W/K × 3.15576e8 s × (49.123845184678906 − 20) K = 1.838100426e15 J (worked).
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 1e-9, [0, 2 * YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(20), horizonS: 30 * YEAR, plannedMassFlowKgPerS: flow, specificHeatJPerKgK: cw });
    expect(r.remainingHeatJ!.central! / (2e5 * 3.15576e8 * 29.123845184678906)).toBeCloseTo(1, 10);
  });

  it('no specific heat: power and heat are null with a reason', () => {
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 1e-9, [0, 2 * YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(20), horizonS: 30 * YEAR, plannedMassFlowKgPerS: flow });
    expect(r.currentPowerW).toBeNull();
    expect(r.remainingHeatJ).toBeNull();
    expect(r.notes.join('\n')).toMatch(/no specific heat given/);
  });
});

describe('Monte Carlo percentiles', () => {
  it('a huge number of points (tiny covariance) collapses every percentile onto the central estimate', () => {
    // 200 000 points over 20 yr with 0.05 K noise pin τ to ~1e-5 relative.
    const n = 200_000;
    const rng = createRng(11);
    const x = Array.from({ length: n }, (_, i) => (i * 20 * YEAR) / (n - 1));
    const fit = fitDecline({ basis: 'time', x, theta: x.map((t) => 50 * Math.exp(-t / (20 * YEAR)) + 0.05 * rng.normal()) }, 'exponential');
    expect(fit.status).toBe('converged');
    expect(fit.parameters.tau!.stderr / fit.estimates.tau).toBeLessThan(1e-4);
    const nowS = fit.xRange[1];
    const r = forecastDecline(fit, { limit: temperatureLimit(10), horizonS: 30 * YEAR, plannedMassFlowKgPerS: 50, specificHeatJPerKgK: 4000 });
    const c = r.endOfLife.centralS! - nowS;
    for (const p of [r.endOfLife.p90, r.endOfLife.p50, r.endOfLife.p10]) expect(Math.abs((p! - nowS) / c - 1)).toBeLessThan(1e-3);
    for (let g = 0; g < r.band.timeS.length; g += 20) {
      for (const band of [r.band.p90, r.band.p50, r.band.p10]) expect(Math.abs(band[g] / r.band.central[g] - 1)).toBeLessThan(1e-4);
    }
    for (const p of [r.remainingHeatJ!.p90, r.remainingHeatJ!.p50, r.remainingHeatJ!.p10]) expect(Math.abs(p! / r.remainingHeatJ!.central! - 1)).toBeLessThan(1e-3);
  });

  it('P90 ≤ P50 ≤ P10 always (band, end of life, heat) — property over random fits', () => {
    const asRank = (v: number | null): number => (v === null ? Infinity : v);
    fc.assert(
      fc.property(
        fc.constantFrom<DeclineModel>('exponential', 'floor', 'hyperbolic'),
        fc.double({ min: 30, max: 80, noNaN: true }),
        fc.double({ min: 2, max: 20, noNaN: true }),
        fc.double({ min: 0.005, max: 0.4, noNaN: true }),
        fc.integer({ min: 1, max: 1000 }),
        (model, theta0, tauYears, relSd, seed) => {
          const est: DeclineParameters = { theta0, tau: tauYears * YEAR };
          if (model === 'floor') est.thetaInf = 0.3 * theta0;
          if (model === 'hyperbolic') est.b = 0.6;
          const fit = syntheticFit(model, 'time', est, relSd, [0, YEAR]);
          const r = forecastDecline(fit, { limit: temperatureLimit(0.4 * theta0), horizonS: 25 * YEAR, plannedMassFlowKgPerS: 40, specificHeatJPerKgK: 4100, samples: 300, seed });
          for (let g = 0; g < r.band.timeS.length; g++) {
            if (!(r.band.p90[g] <= r.band.p50[g] && r.band.p50[g] <= r.band.p10[g])) return false;
          }
          const e = r.endOfLife, h = r.remainingHeatJ!;
          return asRank(e.p90) <= asRank(e.p50) && asRank(e.p50) <= asRank(e.p10) && h.p90! <= h.p50! && h.p50! <= h.p10!;
        },
      ),
      { numRuns: 40, seed: 20240601 },
    );
  });

  it('same seed → identical result, different seed → different result', () => {
    const series = weeklySeries(520, (t) => 25 + 35 * Math.exp(-t / (6 * YEAR)), 0.3, 5);
    const fit = fitDecline(series, 'floor');
    const o: ForecastOptions = { limit: temperatureLimit(27), horizonS: 30 * YEAR, plannedMassFlowKgPerS: 50, specificHeatJPerKgK: 4186, seed: 42 };
    const a = forecastDecline(fit, o);
    const b = forecastDecline(fit, o);
    const c = forecastDecline(fit, { ...o, seed: 43 });
    expect(b).toEqual(a);
    expect(c.endOfLife.p50).not.toBe(a.endOfLife.p50);
    expect(c.band.p10).not.toEqual(a.band.p10);
    expect(c.seed).toBe(43);
  });

  it('the parameter draws are those of sampleMultivariateNormal for the same seed', () => {
    const fit = syntheticFit('floor', 'time', { theta0: 70, tau: 5 * YEAR, thetaInf: 25 }, 0.01);
    const mine = sampleParameters(fit, 50, 9);
    const reference = sampleMultivariateNormal(createRng(9), [70, 5 * YEAR, 25], fit.covariance, 50).flat();
    expect(mine.rejected).toBe(0);
    expect(Array.from(mine.values)).toEqual(reference);
  });

  it('exponential: end-of-life P50 near the central value, P10 − P90 near the delta-method spread', () => {
    // Delta method on t = τ·ln(θ0/θecon): ∂t/∂θ0 = τ/θ0, ∂t/∂τ = ln(θ0/θecon), Var t = gᵀ·Σ·g.
    // For a normal, P10 − P90 = 2·z0.9·σ with z0.9 = 1.2815515655446004 (SciPy 1.17.1 scipy.stats.norm.ppf(0.9)).
    const series = weeklySeries(156, (t) => 50 * Math.exp(-t / (8 * YEAR)), 1.0, 17);
    const fit = fitDecline(series, 'exponential');
    const { theta0, tau } = fit.estimates;
    const econ = 15;
    const g = [tau / theta0, Math.log(theta0 / econ)];
    const S = fit.covariance;
    const sd = Math.sqrt(g[0] * g[0] * S[0][0] + 2 * g[0] * g[1] * S[0][1] + g[1] * g[1] * S[1][1]);
    const r = forecastDecline(fit, { limit: temperatureLimit(econ), horizonS: 60 * YEAR, samples: 40_000, gridPoints: 11 });
    expect(sd / r.endOfLife.centralS!).toBeGreaterThan(0.005); // the check means something
    expect(sd / r.endOfLife.centralS!).toBeLessThan(0.05); // and the linearisation holds
    // Median's Monte Carlo standard error ≈ 1.2533·σ/√40000 = 0.006·σ; allow 0.05·σ (the map is nearly linear).
    expect(Math.abs(r.endOfLife.p50! - r.endOfLife.centralS!)).toBeLessThan(0.05 * sd);
    const spread = r.endOfLife.p10! - r.endOfLife.p90!;
    // Standard error of each 10 %/90 % quantile ≈ √(0.09)/(φ(z0.9)·√40000)·σ = 0.3/(0.1755 × 200)·σ = 0.009·σ,
    // so the spread of 2.563·σ is known to ~0.5 %; allow 3 % for that and the curvature of the map.
    expect(Math.abs(spread / (2 * 1.2815515655446004 * sd) - 1)).toBeLessThan(0.03);
  });

  it('draws with τ ≤ 0 are rejected and counted', () => {
    // τ with a 60 % relative standard deviation: about 5 % of normal draws fall at τ ≤ 0 (Φ(−1/0.6) = 0.048).
    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR }, 0.6, [0, YEAR]);
    const r = forecastDecline(fit, { limit: temperatureLimit(20), horizonS: 30 * YEAR, samples: 2000 });
    expect(r.samplesUsed).toBe(2000);
    expect(r.samplesRejected).toBeGreaterThan(40);
    expect(r.samplesRejected).toBeLessThan(200);
    expect(r.notes.join('\n')).toMatch(/parameter draws were rejected \(τ ≤ 0\)/);
    // Some draws have a τ so long that they do not reach 20 K within the horizon: the high case is null.
    expect(r.endOfLife.fractionReachedWithinHorizon).toBeLessThan(1);
  });

  it('4000 samples × 121 grid points take a few ms', () => {
    const series = weeklySeries(520, (t) => 25 + 35 * Math.exp(-t / (6 * YEAR)), 0.3, 5);
    const fit = fitDecline(series, 'exponential');
    const o: ForecastOptions = { limit: temperatureLimit(27), horizonS: 30 * YEAR, plannedMassFlowKgPerS: 50, specificHeatJPerKgK: 4186 };
    let best = Infinity;
    for (let i = 0; i < 8; i++) {
      const t0 = performance.now();
      const r = forecastDecline(fit, o);
      best = Math.min(best, performance.now() - t0);
      expect(r.samplesUsed).toBe(4000);
      expect(r.band.timeS).toHaveLength(121);
    }
    // Generous bound for a loaded test machine; a full sort per grid point would take tens of ms.
    expect(best).toBeLessThan(40);
  });
});

describe('exact column quantiles', () => {
  it('worked example: 1..10 at p = 0.1 is 1.9', () => {
    // h = (10 − 1)·0.1 = 0.9: x(0) + 0.9·(x(1) − x(0)) = 1 + 0.9 × 1 = 1.9 (Hyndman & Fan 1996, definition 7).
    const v = Float64Array.from([7, 3, 10, 1, 9, 2, 8, 4, 6, 5]);
    expect(columnQuantiles(v, 1, 10, [0.1])[0][0]).toBeCloseTo(1.9, 14);
  });

  it('agrees bit for bit with sort + quantileSorted (NumPy method="linear") on smooth, noisy and tied columns', () => {
    const rng = createRng(3);
    const n = 1001, columns = 60;
    const a = Array.from({ length: n }, () => 50 + rng.normal());
    const tau = Array.from({ length: n }, () => 20 * (1 + 0.1 * rng.normal()));
    const kinds = [
      (s: number, c: number) => a[s] * Math.exp(-c / tau[s]), // smooth, crossing curves
      () => rng.normal(), // unrelated columns: every bracket misses
      (s: number, c: number) => Math.round(a[s] + c * 0.1), // heavy ties
    ];
    const ps = [0, 0.025, 0.1, 0.5, 0.9, 0.975, 1];
    for (const kind of kinds) {
      const values = new Float64Array(n * columns);
      for (let c = 0; c < columns; c++) for (let s = 0; s < n; s++) values[c * n + s] = kind(s, c);
      const got = columnQuantiles(values, columns, n, ps);
      for (let c = 0; c < columns; c++) {
        const sorted = values.slice(c * n, (c + 1) * n).sort();
        ps.forEach((p, j) => expect(got[j][c]).toBe(quantileSorted(sorted, p)));
      }
    }
  });

  it('+∞ ranks last and makes a quantile that touches it +∞', () => {
    const q = new StreamingQuantiles(5, [0.5, 0.7, 0.8], 1);
    q.add(Float64Array.from([Infinity, 1, Infinity, 2, 3]));
    // Sorted 1, 2, 3, ∞, ∞: p = 0.5 → 3; p = 0.7 → h = 2.8 between 3 and ∞ → ∞; p = 0.8 → h = 3.2 → ∞.
    expect(Array.from(q.out, (o) => o[0])).toEqual([3, Infinity, Infinity]);
  });
});

describe('status and input errors', () => {
  it('a fit that did not converge gives status no-fit with a message, no exception', () => {
    const tooFew = fitDecline({ basis: 'time', x: [0, 1e6, 2e6], theta: [50, 49, 48] }, 'floor');
    const r = forecastDecline(tooFew, { limit: temperatureLimit(20), horizonS: 10 * YEAR });
    expect(r.status).toBe('no-fit');
    expect(r.message).toMatch(/did not converge \(status too-few-points\)/);
    expect(r.band.timeS).toEqual([]);
    expect(r.endOfLife.p50).toBeNull();

    const fit = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR });
    for (const status of ['max-iterations', 'at-bound', 'singular', 'no-decline'] as const) {
      const r2 = forecastDecline({ ...fit, status, converged: false }, { limit: temperatureLimit(20), horizonS: 10 * YEAR });
      expect(r2.status).toBe('no-fit');
      expect(r2.message).toContain(status);
    }
  });

  it('bad options are input errors naming the option', () => {
    const mass = syntheticFit('exponential', 'mass', { theta0: 60, tau: 5e10 });
    expect(() => forecastDecline(mass, { limit: temperatureLimit(20), horizonS: YEAR, plannedMassFlowKgPerS: 50 })).toThrow(/nowTimeS/);
    expect(() => forecastDecline(mass, { limit: temperatureLimit(20), horizonS: YEAR, nowTimeS: 0 })).toThrow(/plannedMassFlowKgPerS/);
    const time = syntheticFit('exponential', 'time', { theta0: 60, tau: 10 * YEAR });
    expect(() => forecastDecline(time, { limit: temperatureLimit(20), horizonS: 0 })).toThrow(/horizonS/);
    expect(() => forecastDecline(time, { limit: temperatureLimit(-1), horizonS: YEAR })).toThrow(/limit\.thetaEconK/);
    expect(() => forecastDecline(time, { limit: temperatureLimit(20), horizonS: YEAR, samples: 0 })).toThrow(/samples/);
    expect(() => forecastDecline(time, { limit: temperatureLimit(20), horizonS: YEAR, gridPoints: 1 })).toThrow(/gridPoints/);
    expect(() => forecastDecline(time, { limit: temperatureLimit(20), horizonS: YEAR, nowX: 1, nowTimeS: 2 })).toThrow(InputError);
  });
});
