// What the fit result record says about itself in the awkward cases, and the coverage of its intervals.
import { describe, expect, it } from 'vitest';
import { fitAuto, fitDecline } from '../src/shared/fit/fit.js';
import { declineValue } from '../src/shared/fit/models.js';
import { createRng } from '../src/shared/stats/random.js';

const YEAR = 365.25 * 86400;
const WEEK = 7 * 86400;

function series(n: number, f: (t: number) => number, noise: number, seed: number) {
  const rng = createRng(seed);
  const x = Array.from({ length: n }, (_, i) => i * WEEK);
  const theta = x.map((t) => f(t) + noise * rng.normal());
  return { x, theta };
}

describe('fit result record', () => {
  it('excluded points never enter the fit and are counted', () => {
    const { x, theta } = series(300, (t) => 50 * Math.exp(-t / (10 * YEAR)), 0.2, 1);
    const include = x.map((_, i) => i % 10 !== 0);
    const spoiled = theta.map((v, i) => (include[i] ? v : -999)); // a shut-in reading far off the trend
    const fit = fitDecline({ basis: 'time', x, theta: spoiled, include }, 'exponential');
    expect(fit.status).toBe('converged');
    expect(fit.n).toBe(270);
    expect(fit.nExcluded).toBe(30);
    expect(Math.abs(fit.estimates.tau / (10 * YEAR) - 1)).toBeLessThan(0.1);
  });

  it('too few points is a status, not an exception', () => {
    const fit = fitDecline({ basis: 'time', x: [0, 1e6, 2e6], theta: [50, 49, 48] }, 'floor');
    expect(fit.status).toBe('too-few-points');
    expect(fit.converged).toBe(false);
    expect(fit.message).toMatch(/needs at least 5/);
  });

  it('rising θ is reported as no decline', () => {
    const fit = fitDecline({ basis: 'time', x: [0, 1, 2, 3, 4, 5].map((v) => v * YEAR), theta: [40, 41, 42, 42.5, 43, 44] }, 'exponential');
    expect(fit.status).toBe('no-decline');
  });

  it('hyperbolic on purely exponential data reports b at its bound or a b near zero', () => {
    const { x, theta } = series(520, (t) => 60 * Math.exp(-t / (8 * YEAR)), 0.05, 2);
    const fit = fitDecline({ basis: 'time', x, theta }, 'hyperbolic');
    // b is not identifiable away from 0 here: either the fit says so, or its interval for b includes 0.
    if (fit.status === 'converged') expect(fit.parameters.b!.ci95[0]).toBeLessThan(0.05);
    else expect(fit.status).toBe('at-bound');
  });

  it('auto picks the generating model by AICc and reports every candidate', () => {
    const truth = { theta0: 70, tau: 5 * YEAR, thetaInf: 25 };
    const { x, theta } = series(624, (t) => declineValue('floor', truth, t), 0.3, 3);
    const fit = fitAuto({ basis: 'time', x, theta });
    expect(fit.model).toBe('floor');
    expect(fit.candidates.map((c) => c.model).sort()).toEqual(['exponential', 'floor', 'hyperbolic']);
    expect(fit.candidates[0].aicc).toBeLessThanOrEqual(fit.candidates[1].aicc);
  });

  it('non-finite data are an input error naming the field', () => {
    expect(() => fitDecline({ basis: 'time', x: [0, 1, 2, 3, 4], theta: [5, 4, NaN, 3, 2] }, 'exponential')).toThrow(/θ at index 2/);
  });
});

describe('interval coverage (statistical check on synthetic series with known truth)', () => {
  // Truth invented for the check; 1000 seeded series, so the outcome is deterministic. With correct
  // intervals the count is Binomial(1000, 0.95): 95 % ± 0.7 % (one standard deviation).
  const truths = {
    exponential: { theta0: 55, tau: 12 * YEAR },
    floor: { theta0: 65, tau: 4 * YEAR, thetaInf: 30 },
    hyperbolic: { theta0: 60, tau: 5 * YEAR, b: 0.7 },
  };
  it.each(['exponential', 'floor', 'hyperbolic'] as const)('%s: the 95 per cent interval for τ covers the truth in 92–98 per cent of series', (model) => {
    const truth = truths[model];
    const trials = 1000;
    let covered = 0;
    for (let k = 0; k < trials; k++) {
      const { x, theta } = series(120, (t) => declineValue(model, truth, t * 4), 0.5, 1000 + k);
      const fit = fitDecline({ basis: 'time', x: x.map((t) => t * 4), theta }, model);
      const [lo, hi] = fit.parameters.tau!.ci95;
      if (lo <= truth.tau && truth.tau <= hi) covered++;
    }
    expect(covered / trials).toBeGreaterThanOrEqual(0.92);
    expect(covered / trials).toBeLessThanOrEqual(0.98);
  });
});
