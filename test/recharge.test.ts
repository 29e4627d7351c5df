// Recharge: fitted decline against the lumped theory (DOMAIN.md §7), on data generated from the
// balance C·dθ/dt = −ṁ·cw·θ + Qr with a known recharge.
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import { fitDecline } from '../src/shared/fit/fit.js';
import { parameterNamesOf, type DeclineModel, type DeclineParameters, type FitResult } from '../src/shared/fit/types.js';
import { estimateRecharge, type RechargeOptions } from '../src/shared/forecast/recharge.js';
import { reservoirTheory, type HotDryRockParams } from '../src/shared/reservoir/theory.js';
import { createRng } from '../src/shared/stats/random.js';

const YEAR = 365.25 * 86400; // Julian year, DOMAIN.md §9
const WEEK = 7 * 86400;
const C_TO_K = 273.15; // exact Celsius offset (SI Brochure)

/**
 * Granite slab: z1 = (70 − 10)/0.03 = 2000 m, z2 = 2500 m, A = 0.2 km².
 * C = ρr·cr·A·(z2 − z1) = 2700 × 850 × 2e5 × 500 = 2.295e14 J/K; at 50 kg/s and cw = 4186 J/(kg·K)
 * τtheory = 2.295e14/(50 × 4186) = 1.0965121834687052e9 s = 34.75 yr; Mc = C/cw = 5.4825609e10 kg (worked).
 */
const slab: HotDryRockParams = {
  kind: 'hot-dry-rock',
  surfaceTemperatureK: 10 + C_TO_K,
  gradientKPerM: 0.03,
  minUsefulTemperatureK: 70 + C_TO_K,
  maxDepthM: 2500,
  areaM2: 2e5,
  rockDensityKgPerM3: 2700, // granite, common practice
  rockSpecificHeatJPerKgK: 850, // granite, common practice
  flow: { massFlowKgPerS: 50 },
  fluid: { kind: 'fixed', densityKgPerM3: 1000, specificHeatJPerKgK: 4186 }, // near room temperature, common practice
};
const theory = reservoirTheory(slab);
const TAU_TH = 1.0965121834687052e9;
const FLOW = 50;
const options: RechargeOptions = { theory, areaM2: slab.areaM2, meanMassFlowKgPerS: FLOW };

/** 10 years of weekly θ from C·dθ/dt = −ṁ·cw·θ + f·ṁ·cw·θ: θ = θ0·exp(−(1 − f)·t/τth), with noise. */
function rechargedSeries(fraction: number, tauTheoryS: number, seed: number) {
  const rng = createRng(seed);
  const x = Array.from({ length: 520 }, (_, i) => i * WEEK);
  return { basis: 'time' as const, x, theta: x.map((t) => 40 * Math.exp((-(1 - fraction) * t) / tauTheoryS) + 0.1 * rng.normal()) };
}

function syntheticFit(model: DeclineModel, estimates: DeclineParameters, relSd: number, xRange: [number, number]): FitResult {
  const names = parameterNamesOf(model);
  const sd = names.map((n) => Math.abs(estimates[n] as number) * relSd);
  return {
    model, basis: 'time', status: 'converged', converged: true, message: '',
    n: 100, nExcluded: 0, dof: 100 - names.length, parameterNames: names, estimates, parameters: {},
    covariance: names.map((_, i) => names.map((__, j) => (i === j ? sd[i] ** 2 : 0))),
    correlation: names.map((_, i) => names.map((__, j) => (i === j ? 1 : 0))),
    x: new Float64Array(0), residuals: new Float64Array(0), sse: 1, rmseK: 0.1, r2: 0.99, aicc: 0,
    iterations: 5, evaluations: 6, xRange,
  };
}

describe('exponential decline against the theory', () => {
  it('the theory of the test slab is the worked one', () => {
    expect(theory.heatCapacityJPerK).toBeCloseTo(2.295e14, -3);
    expect(theory.tauS / TAU_TH).toBeCloseTo(1, 12);
  });

  it('a known recharge fraction is recovered within its interval', () => {
    const truth = 0.3;
    const fit = fitDecline(rechargedSeries(truth, TAU_TH, 1), 'exponential');
    const r = estimateRecharge(fit, options);
    expect(r.status).toBe('ok');
    expect(r.tauTheoryS / TAU_TH).toBeCloseTo(1, 12);
    const [lo, hi] = r.rechargeFraction.ci95;
    expect(lo).toBeLessThan(truth);
    expect(hi).toBeGreaterThan(truth);
    expect(Math.abs(r.rechargeFraction.value - truth)).toBeLessThan(0.05);
    expect(r.verdict).toBe('recharge');
    // R = 1/(1 − f) = 1/0.7 = 1.4286 within its interval; R = τfit/τtheory by definition.
    expect(r.ratio.ci95[0]).toBeLessThan(1 / 0.7);
    expect(r.ratio.ci95[1]).toBeGreaterThan(1 / 0.7);
    expect(r.ratio.value).toBeCloseTo(fit.estimates.tau / TAU_TH, 10);
    expect(r.tauFitS.value / fit.estimates.tau).toBeCloseTo(1, 10);
    // τ's Student-t interval carried through the monotone map: R interval = τ interval / τtheory.
    expect(r.ratio.ci95[0]).toBeCloseTo(fit.parameters.tau!.ci95[0] / TAU_TH, 10);
    // Qr = f·ṁ·cw·θnow for the exponential (DOMAIN.md §7).
    const thetaNow = fit.estimates.theta0 * Math.exp(-fit.xRange[1] / fit.estimates.tau);
    expect(r.rechargeHeatFlowW.value / (r.rechargeFraction.value * FLOW * 4186 * thetaNow)).toBeCloseTo(1, 10);
    // Qr ≈ 0.3 × 2.093e5 W/K × ~31 K ≈ 2 MW ≫ qb·A = 0.06 × 2e5 = 12 kW: lateral inflow.
    expect(r.backgroundHeatFlowW).toBeCloseTo(12_000, 6);
    expect(r.ratioToBackground).toBeGreaterThan(100);
    expect(r.interpretation).toMatch(/replenished/);
    expect(r.interpretation).toMatch(/flows in laterally/);
  });

  it('a swept volume half the assumed one: faster than theory, R ≈ 0.5, said in plain words', () => {
    // C_true = C/2 with no recharge: θ = θ0·exp(−t/(τth/2)), i.e. f = −1 in the formula above.
    const fit = fitDecline(rechargedSeries(-1, TAU_TH, 2), 'exponential');
    const r = estimateRecharge(fit, options);
    expect(r.verdict).toBe('faster-than-theory');
    expect(Math.abs(r.ratio.value - 0.5)).toBeLessThan(0.02);
    expect(r.ratio.ci95[1]).toBeLessThan(1);
    expect(r.rechargeFraction.value).toBeLessThan(0);
    expect(r.interpretation).toMatch(/cools faster than its parameters allow/);
    expect(r.interpretation).toMatch(/smaller than assumed/);
    expect(r.interpretation).toMatch(/about 5\d % of the assumed volume/);
    expect(r.interpretation).toMatch(/short-circuits along fractures/);
    expect(r.interpretation).toMatch(/not a recharge/);
  });

  it('no recharge: consistent with none', () => {
    const fit = fitDecline(rechargedSeries(0, TAU_TH, 3), 'exponential');
    const r = estimateRecharge(fit, options);
    expect(r.verdict).toBe('consistent-with-none');
    expect(r.ratio.ci95[0]).toBeLessThan(1);
    expect(r.ratio.ci95[1]).toBeGreaterThan(1);
    expect(r.interpretation).toMatch(/spans 1/);
  });

  it('background conductive heat flow: 1 km² at 60 mW/m² is 60 kW', () => {
    // qb·A = 0.060 W/m² × 1e6 m² = 6e4 W (DOMAIN.md §7; continental average, common practice).
    const fit = fitDecline(rechargedSeries(0.3, TAU_TH, 4), 'exponential');
    const r = estimateRecharge(fit, { ...options, areaM2: 1e6 });
    expect(r.backgroundHeatFlowW).toBeCloseTo(60_000, 6);
    expect(r.ratioToBackground).toBeCloseTo(r.rechargeHeatFlowW.value / 60_000, 10);
    const r2 = estimateRecharge(fit, { ...options, areaM2: 1e6, backgroundHeatFlowWPerM2: 0.09 });
    expect(r2.backgroundHeatFlowW).toBeCloseTo(90_000, 6);
  });
});

describe('mass basis', () => {
  /**
   * θ against produced mass for a flow history: with Qr = f·ṁ·cw·θ the balance gives
   * dθ/dM = −(1 − f)·θ/Mc, θ = θ0·exp(−(1 − f)·M/Mc) whatever ṁ(t) was.
   */
  function massSeries(fraction: number, flowAt: (week: number) => number, seed: number) {
    const rng = createRng(seed);
    const mc = theory.characteristicMassKg;
    const x: number[] = [], theta: number[] = [];
    let m = 0;
    for (let w = 0; w < 520; w++) {
      x.push(m);
      theta.push(40 * Math.exp((-(1 - fraction) * m) / mc) + 0.1 * rng.normal());
      m += flowAt(w) * WEEK;
    }
    return { basis: 'mass' as const, x, theta };
  }

  it('the ratio is Mc,fit/Mc,theory and does not depend on the flow history', () => {
    const truthR = 1 / (1 - 0.3);
    const steady = fitDecline(massSeries(0.3, () => 50, 5), 'exponential');
    const swinging = fitDecline(massSeries(0.3, (w) => (Math.floor(w / 26) % 2 === 0 ? 20 : 80), 5), 'exponential');
    for (const fit of [steady, swinging]) {
      const r = estimateRecharge(fit, { theory, areaM2: slab.areaM2, meanMassFlowKgPerS: 50 });
      expect(r.ratio.value).toBeCloseTo(fit.estimates.tau / theory.characteristicMassKg, 10);
      expect(r.ratio.ci95[0]).toBeLessThan(truthR);
      expect(r.ratio.ci95[1]).toBeGreaterThan(truthR);
      expect(r.verdict).toBe('recharge');
    }
  });

  it('R and f do not change with the stated mean flow; τfit = Mc/ṁ and Qr scale with it', () => {
    const fit = fitDecline(massSeries(0.3, () => 50, 6), 'exponential');
    const a = estimateRecharge(fit, { theory, areaM2: slab.areaM2, meanMassFlowKgPerS: 30 });
    const b = estimateRecharge(fit, { theory, areaM2: slab.areaM2, meanMassFlowKgPerS: 70 });
    expect(b.ratio.value).toBeCloseTo(a.ratio.value, 12);
    expect(b.ratio.ci95[0]).toBeCloseTo(a.ratio.ci95[0], 12);
    expect(b.rechargeFraction.value).toBeCloseTo(a.rechargeFraction.value, 12);
    expect(a.tauFitS.value / (fit.estimates.tau / 30)).toBeCloseTo(1, 10);
    expect(b.rechargeHeatFlowW.value / a.rechargeHeatFlowW.value).toBeCloseTo(70 / 30, 10);
    // Without a mean flow, the theory's own flow is used and the message says so.
    const c = estimateRecharge(fit, { theory, areaM2: slab.areaM2 });
    expect(c.ratio.value).toBeCloseTo(a.ratio.value, 12);
    expect(c.message).toMatch(/theory's flow of 50 kg\/s/);
  });
});

describe('other models: Qr = ṁ·cw·θ + C·dθ/dt now, intervals by seeded sampling', () => {
  it('floor: worked example', () => {
    // θ0 = 40 K, θ∞ = 25 K, τ = 20 yr, now = 10 yr: θ = 25 + 15·e^(−0.5) = 34.0979598956895 K,
    // dθ/dt = −15·e^(−0.5)/(20 yr) = −1.4414847605156128e-8 K/s;
    // Qr = 2.093e5 × 34.09796 + 2.295e14 × (−1.44148e-8) = 7.13670e6 − 3.30821e6 = 3.828495480784481e6 W;
    // f = Qr/(ṁ·cw·θ) = 0.5364515627840682, R = 1/(1 − f) = 2.157271861395957 (worked).
    const fit = syntheticFit('floor', { theta0: 40, tau: 20 * YEAR, thetaInf: 25 }, 0.01, [0, 10 * YEAR]);
    const r = estimateRecharge(fit, options);
    expect(r.rechargeHeatFlowW.value / 3.828495480784481e6).toBeCloseTo(1, 8);
    expect(r.rechargeFraction.value).toBeCloseTo(0.5364515627840682, 8);
    expect(r.ratio.value).toBeCloseTo(2.157271861395957, 8);
    expect(r.tauFitS.value / YEAR).toBeCloseTo(74.95737569000427, 6); // −θ/(dθ/dt)
    expect(r.rechargeFraction.ci95[0]).toBeLessThan(r.rechargeFraction.value);
    expect(r.rechargeFraction.ci95[1]).toBeGreaterThan(r.rechargeFraction.value);
    expect(r.verdict).toBe('recharge');
    // Seeded: the same seed gives the same interval, another seed another one.
    expect(estimateRecharge(fit, options)).toEqual(r);
    expect(estimateRecharge(fit, { ...options, seed: 2 }).rechargeFraction.ci95).not.toEqual(r.rechargeFraction.ci95);
  });

  it('hyperbolic: worked example, faster than theory', () => {
    // θ0 = 40 K, τ = 20 yr, b = 0.5, now = 10 yr: u = 1 + 0.5 × 10/20 = 1.25, θ = 40·u^(−2) = 25.6 K,
    // dθ/dt = −(θ0/τ)·u^(−3) = −(2 K/yr) × 0.512 = −1.024 K/yr, so τeff = θ/|dθ/dt| = 25 yr;
    // R = 25 yr / 34.74637435890895 yr = 0.7194995294117646, f = 1 − 1/R = −0.38985497435635813 (worked).
    const fit = syntheticFit('hyperbolic', { theta0: 40, tau: 20 * YEAR, b: 0.5 }, 0.005, [0, 10 * YEAR]);
    const r = estimateRecharge(fit, options);
    expect(r.tauFitS.value / YEAR).toBeCloseTo(25, 8);
    expect(r.ratio.value).toBeCloseTo(0.7194995294117646, 8);
    expect(r.rechargeFraction.value).toBeCloseTo(-0.38985497435635813, 8);
    expect(r.verdict).toBe('faster-than-theory');
    expect(r.interpretation).toMatch(/smaller than assumed — about 72 % of the assumed volume/);
  });
});

describe('status and input errors', () => {
  it('a fit that did not converge gives status no-fit with a message, no exception', () => {
    const tooFew = fitDecline({ basis: 'time', x: [0, 1e6, 2e6], theta: [50, 49, 48] }, 'exponential');
    const r = estimateRecharge(tooFew, options);
    expect(r.status).toBe('no-fit');
    expect(r.message).toMatch(/did not converge \(status too-few-points\)/);
    expect(Number.isNaN(r.ratio.value)).toBe(true);
    const fit = fitDecline(rechargedSeries(0.3, TAU_TH, 1), 'exponential');
    expect(estimateRecharge({ ...fit, status: 'max-iterations', converged: false }, options).status).toBe('no-fit');
  });

  it('a time-basis estimate without the mean flow is an input error naming it', () => {
    const fit = fitDecline(rechargedSeries(0.3, TAU_TH, 1), 'exponential');
    expect(() => estimateRecharge(fit, { theory, areaM2: 2e5 })).toThrow(InputError);
    expect(() => estimateRecharge(fit, { theory, areaM2: 2e5 })).toThrow(/meanMassFlowKgPerS/);
    expect(() => estimateRecharge(fit, { ...options, areaM2: 0 })).toThrow(/areaM2/);
  });
});
