import { readFileSync } from 'node:fs';
import { describe, it, expect } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import {
  logGamma,
  normalCdf,
  normalQuantile,
  regularizedIncompleteBeta,
  studentTCdf,
  studentTPdf,
  studentTQuantile,
} from '../src/shared/stats/distributions.js';
import { choleskyLower, createRng, sampleMultivariateNormal, Xoshiro128StarStar } from '../src/shared/stats/random.js';
import { mean, quantiles, quantileSorted, sampleVariance } from '../src/shared/stats/summary.js';

// Reference values from SciPy 1.17.1 / NumPy 2.4.6, written by test/scripts/gen_stats_fixtures.py.
interface Fixture {
  versions: { scipy: string; numpy: string };
  t_ppf: { p: number; dof: number; value: number }[];
  t_cdf: { t: number; dof: number; value: number }[];
  norm_cdf: { x: number; value: number }[];
  norm_ppf: { p: number; value: number }[];
  betainc: { a: number; b: number; x: number; value: number }[];
  gammaln: { x: number; value: number }[];
  percentile: { values: number[]; q_percent: number[]; p: number[]; result: number[] }[];
}
const fixture = JSON.parse(readFileSync(new URL('./fixtures/stats.json', import.meta.url), 'utf8')) as Fixture;

function relativeError(actual: number, expected: number): number {
  if (actual === expected) return 0;
  return expected === 0 ? Math.abs(actual) : Math.abs((actual - expected) / expected);
}

/** Rows whose relative error exceeds `tolerance`, so one failure report lists them all. */
function outliers<R extends { value: number }>(rows: R[], compute: (row: R) => number, tolerance: number) {
  return rows
    .map((row) => ({ ...row, got: compute(row), error: relativeError(compute(row), row.value) }))
    .filter((row) => !(row.error <= tolerance));
}

function sampleMoments(draws: Float64Array) {
  const n = draws.length;
  const m = mean(draws);
  let m2 = 0;
  let m3 = 0;
  let m4 = 0;
  for (const x of draws) {
    const d = x - m;
    m2 += d * d;
    m3 += d * d * d;
    m4 += d * d * d * d;
  }
  m2 /= n;
  m3 /= n;
  m4 /= n;
  return { mean: m, variance: sampleVariance(draws), skewness: m3 / m2 ** 1.5, excessKurtosis: m4 / (m2 * m2) - 3 };
}

describe('fixture', () => {
  it('was generated with the library versions the tests cite', () => {
    expect(fixture.versions.scipy).toBe('1.17.1');
    expect(fixture.versions.numpy).toBe('2.4.6');
  });
});

describe("Student's t", () => {
  // Tolerance 1e-12 relative. SciPy 1.17.1 and this code both aim at ~1e-15; the largest
  // deviation seen is 1.3e-13, at t = −50 with 1000 dof, where the tail is e^-630 and a
  // rounding of 1e-16 in ln x is multiplied by dof/2 = 500. The margin covers libm
  // differences between JavaScript engines.
  it('quantile matches SciPy 1.17.1 scipy.stats.t.ppf for dof 1 … 1e7 and p 1e-10 … 1 − 1e-10', () => {
    expect(outliers(fixture.t_ppf, (r) => studentTQuantile(r.p, r.dof), 1e-12)).toEqual([]);
  });

  // SciPy 1.17.1's t.cdf with dof = 1 is off just above and below t = 0: it gives
  // 0.4999999952568131 at t = −1e-8, where the Cauchy CDF ½ + atan(t)/π is 0.4999999968169011.
  // Those rows are checked against that closed form below instead.
  const scipyCauchyDefect = (r: { t: number; dof: number }) => r.dof === 1 && r.t !== 0 && Math.abs(r.t) < 1e-4;

  it('CDF matches SciPy 1.17.1 scipy.stats.t.cdf, tails included', () => {
    const rows = fixture.t_cdf.filter((r) => !scipyCauchyDefect(r));
    expect(rows.length).toBeGreaterThan(200);
    expect(outliers(rows, (r) => studentTCdf(r.t, r.dof), 1e-12)).toEqual([]);
  });

  it('CDF with one degree of freedom is the Cauchy CDF ½ + atan(t)/π (closed form)', () => {
    for (const t of [-1e-8, 1e-5, -1e-3, 0.5, -7, 1e6]) {
      const exact = 0.5 + Math.atan(t) / Math.PI;
      expect(relativeError(studentTCdf(t, 1), exact)).toBeLessThan(1e-14);
    }
  });

  it('matches printed t tables', () => {
    // Two-sided 95 % critical values as printed in any statistics textbook table (common practice).
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(studentTQuantile(0.975, 1)).toBeCloseTo(12.706, 3);
    expect(studentTQuantile(0.975, 30)).toBeCloseTo(2.042, 3);
    expect(studentTQuantile(0.95, 5)).toBeCloseTo(2.015, 3);
    expect(studentTQuantile(0.995, 20)).toBeCloseTo(2.845, 3);
    expect(studentTCdf(2.228, 10)).toBeCloseTo(0.975, 4);
  });

  it('quantile and CDF invert each other, and the quantile is odd about p = ½', () => {
    for (const dof of [1, 1.5, 2, 2.5, 3, 4, 7, 12.3, 60, 250, 4000, 3e5, 1e9]) {
      for (const p of [1e-10, 1e-7, 1e-4, 0.01, 0.2, 0.3, 0.45, 0.4999]) {
        const t = studentTQuantile(p, dof);
        expect(relativeError(studentTCdf(t, dof), p)).toBeLessThan(1e-13);
        // 1 − p rounds for small p, but 1 − (1 − p) is exact (Sterbenz), so compare with that.
        const upper = 1 - p;
        expect(studentTQuantile(upper, dof)).toBe(-studentTQuantile(1 - upper, dof));
      }
    }
  });

  it('approaches the normal smoothly as dof grows', () => {
    const z = normalQuantile(0.975);
    let previousGap = Infinity;
    for (const dof of [10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9]) {
      const gap = studentTQuantile(0.975, dof) - z;
      expect(gap).toBeGreaterThan(0);
      expect(gap).toBeLessThan(previousGap);
      previousGap = gap;
      // First term of the expansion t ≈ z + (z³ + z)/(4·dof) (Abramowitz & Stegun 1964, 26.7.5);
      // the next term is O(dof⁻²), so the ratio is within 1e-3 of 1 from dof = 1e4 on.
      if (dof >= 1e4) expect(gap / ((z ** 3 + z) / (4 * dof))).toBeCloseTo(1, 3);
    }
    for (const p of [1e-10, 0.025, 0.3, 0.975]) {
      expect(relativeError(studentTQuantile(p, 1e15), normalQuantile(p))).toBeLessThan(1e-13);
      expect(studentTQuantile(p, Infinity)).toBe(normalQuantile(p));
      expect(studentTCdf(normalQuantile(p), Infinity)).toBe(normalCdf(normalQuantile(p)));
    }
  });

  it('density integrates to the CDF (Simpson on [−2, 1], dof = 7)', () => {
    // Composite Simpson with 2000 panels; error ~h⁴·max|f⁗| ≈ 1e-14 here.
    const a = -2;
    const b = 1;
    const panels = 2000;
    const h = (b - a) / panels;
    let sum = studentTPdf(a, 7) + studentTPdf(b, 7);
    for (let i = 1; i < panels; i++) sum += (i % 2 === 1 ? 4 : 2) * studentTPdf(a + i * h, 7);
    expect(relativeError((sum * h) / 3, studentTCdf(b, 7) - studentTCdf(a, 7))).toBeLessThan(1e-11);
  });

  it('refuses arguments outside the domain with an InputError naming the parameter', () => {
    expect(() => studentTQuantile(1.2, 5)).toThrow(InputError);
    expect(() => studentTQuantile(0.5, 0.5)).toThrow(/dof/);
    expect(() => studentTCdf(1, 0)).toThrow(/dof/);
    expect(() => studentTCdf(Number.NaN, 3)).toThrow(InputError);
    expect(studentTQuantile(0, 4)).toBe(-Infinity);
    expect(studentTQuantile(1, 4)).toBe(Infinity);
  });
});

describe('normal distribution', () => {
  // 1e-12 relative: SciPy 1.17.1's own norm.cdf(−37) = 5.7255712225239266e-300 is 1.1e-13 from
  // the 50-digit value 5.72557122252457682e-300 (mpmath 1.3.0 ncdf), which this code matches.
  it('CDF matches SciPy 1.17.1 scipy.stats.norm.cdf from −37 to 8', () => {
    expect(outliers(fixture.norm_cdf, (r) => normalCdf(r.x), 1e-12)).toEqual([]);
  });

  // 1e-14 relative: both sides are accurate to ~1e-16 (largest difference seen 4.4e-16).
  it('quantile matches SciPy 1.17.1 scipy.stats.norm.ppf from 1e-300 to 1 − 1e-10', () => {
    expect(outliers(fixture.norm_ppf, (r) => normalQuantile(r.p), 1e-14)).toEqual([]);
  });

  it('matches printed normal tables', () => {
    // 1.960 and 2.576 for 95 % and 99 % two-sided, 0.8413 for Φ(1) (common practice).
    expect(normalQuantile(0.975)).toBeCloseTo(1.96, 3);
    expect(normalQuantile(0.995)).toBeCloseTo(2.576, 3);
    expect(normalCdf(1)).toBeCloseTo(0.8413, 4);
    expect(normalCdf(0)).toBe(0.5);
  });
});

describe('special functions', () => {
  // 1e-12 relative; the cases with both a and b large are limited by ln-term rounding (~1e-14).
  it('regularized incomplete beta matches SciPy 1.17.1 scipy.special.betainc', () => {
    expect(outliers(fixture.betainc, (r) => regularizedIncompleteBeta(r.x, r.a, r.b), 1e-12)).toEqual([]);
  });

  it('incomplete beta has the closed forms I_x(1, 1) = x and I_x(a, 1) = xᵃ (definition)', () => {
    for (const x of [0, 0.1, 0.5, 0.93, 1]) {
      expect(regularizedIncompleteBeta(x, 1, 1)).toBeCloseTo(x, 15);
      expect(relativeError(regularizedIncompleteBeta(x, 3.5, 1), x ** 3.5)).toBeLessThan(1e-14);
    }
  });

  // ln Γ has zeros at 1 and 2, where only an absolute error is meaningful: 1e-13 relative or
  // 1e-14 absolute, whichever is looser.
  it('log-gamma matches SciPy 1.17.1 scipy.special.gammaln', () => {
    const bad = fixture.gammaln.filter((r) => {
      const got = logGamma(r.x);
      return !(Math.abs(got - r.value) <= Math.max(1e-14, 1e-13 * Math.abs(r.value)));
    });
    expect(bad).toEqual([]);
    // Γ(5) = 4! = 24 (definition).
    expect(Math.exp(logGamma(5))).toBeCloseTo(24, 11);
  });
});

describe('seeded random numbers', () => {
  it('xoshiro128** reproduces the reference C implementation', () => {
    // Blackman & Vigna's reference xoshiro128starstar.c (public domain), compiled with gcc on
    // this machine and started from state {1, 2, 3, 4}, prints these eight outputs.
    const rng = new Xoshiro128StarStar(1, 2, 3, 4);
    const outputs = Array.from({ length: 8 }, () => rng.nextUint32());
    expect(outputs).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492, 1287239034, 3734860849]);
  });

  it('same seed gives the same sequence, different seeds different ones', () => {
    const take = (seed: number) => {
      const rng = createRng(seed);
      return Array.from({ length: 500 }, (_, i) => (i % 2 === 0 ? rng.next() : rng.normal()));
    };
    expect(take(42)).toEqual(take(42));
    expect(take(-7)).toEqual(take(-7));
    const seeds = [0, 1, 2, 42, 43, -1, 2 ** 32, 2 ** 32 + 1, Number.MAX_SAFE_INTEGER];
    const firsts = seeds.map((seed) => take(seed).slice(0, 4).join(','));
    expect(new Set(firsts).size).toBe(seeds.length);
    expect(() => createRng(1.5)).toThrow(InputError);
  });

  it('uniforms lie in [0, 1) with finer than 32-bit resolution', () => {
    const rng = createRng(7);
    let belowTwoPow21Grid = 0;
    for (let i = 0; i < 10_000; i++) {
      const u = rng.next();
      expect(u >= 0 && u < 1).toBe(true);
      expect(Number.isInteger(u * 2 ** 53)).toBe(true);
      if (!Number.isInteger(u * 2 ** 32)) belowTwoPow21Grid++;
    }
    expect(belowTwoPow21Grid).toBeGreaterThan(9_900);
  });

  const n = 200_000;

  it('uniform sample moments agree with U(0, 1) within 4 standard errors (200 000 draws)', () => {
    const rng = createRng(2024);
    const draws = new Float64Array(n);
    for (let i = 0; i < n; i++) draws[i] = rng.next();
    const m = sampleMoments(draws);
    // Worked example: U(0,1) has mean ½ and variance 1/12, so SE(mean) = √(1/12/n) = 6.45e-4;
    // μ₄ = 1/80, so SE(variance) ≈ √((μ₄ − σ⁴)/n) = √((1/80 − 1/144)/n) = 1.67e-4.
    expect(Math.abs(m.mean - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(m.variance - 1 / 12)).toBeLessThan(4 * Math.sqrt((1 / 80 - 1 / 144) / n));
  });

  it('normal sample moments agree with N(0, 1) within 4 standard errors (200 000 draws)', () => {
    const rng = createRng(99);
    const draws = new Float64Array(n);
    for (let i = 0; i < n; i++) draws[i] = rng.normal();
    const m = sampleMoments(draws);
    // Normal-theory standard errors (worked example): SE(mean) = 1/√n = 2.24e-3,
    // SE(variance) = √(2/n) = 3.16e-3, SE(skewness) ≈ √(6/n) = 5.48e-3,
    // SE(excess kurtosis) ≈ √(24/n) = 1.10e-2; P(|Z| > 1.96) = 0.05 with SE √(0.05·0.95/n).
    expect(Math.abs(m.mean)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(m.variance - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
    expect(Math.abs(m.skewness)).toBeLessThan(4 * Math.sqrt(6 / n));
    expect(Math.abs(m.excessKurtosis)).toBeLessThan(4 * Math.sqrt(24 / n));
    const tailShare = draws.filter((x) => Math.abs(x) > 1.959963984540054).length / n;
    expect(Math.abs(tailShare - 0.05)).toBeLessThan(4 * Math.sqrt((0.05 * 0.95) / n));
  });

  it('draws a million normals quickly', () => {
    const rng = createRng(1);
    const start = performance.now();
    let sum = 0;
    for (let i = 0; i < 1_000_000; i++) sum += rng.normal();
    // Typically ~20 ms; the bound only catches an accidental slow path.
    expect(performance.now() - start).toBeLessThan(1_500);
    expect(Number.isFinite(sum)).toBe(true);
  });
});

describe('Cholesky factor', () => {
  it('factors a positive-definite matrix (worked example)', () => {
    // [[4, 2], [2, 3]] = L·Lᵀ with L = [[2, 0], [1, √2]]: 2² = 4, 2·1 = 2, 1² + (√2)² = 3.
    const lower = choleskyLower([[4, 2], [2, 3]]);
    expect(lower[0]).toEqual([2, 0]);
    expect(lower[1][0]).toBe(1);
    expect(lower[1][1]).toBeCloseTo(Math.SQRT2, 15);
  });

  it('leaves a zero column for a zero or slightly negative pivot', () => {
    // [[1, 1], [1, 1]] has rank one: the second pivot is 1 − 1² = 0.
    expect(choleskyLower([[1, 1], [1, 1]])).toEqual([[1, 0], [1, 0]]);
    // Second pivot (1 − 1e-14) − 1 = −1e-14, within 1e-12 of the diagonal: treated as zero.
    expect(choleskyLower([[1, 1], [1, 1 - 1e-14]])).toEqual([[1, 0], [1, 0]]);
    // A parameter held fixed: zero variance and no covariance.
    expect(choleskyLower([[0, 0], [0, 9]])).toEqual([[0, 0], [0, 3]]);
  });

  it('refuses a matrix that is clearly not positive semi-definite', () => {
    // [[1, 2], [2, 1]] has eigenvalues 3 and −1; the second pivot is 1 − 2² = −3.
    expect(() => choleskyLower([[1, 2], [2, 1]])).toThrow(/not positive semi-definite/);
    // [[0, 1], [1, 1]] has determinant −1: the zero pivot still couples to the second row.
    expect(() => choleskyLower([[0, 1], [1, 1]])).toThrow(/not positive semi-definite/);
    expect(() => choleskyLower([[-1]])).toThrow(/not positive semi-definite/);
    expect(() => choleskyLower([[1, 0.5], [0.4, 1]])).toThrow(/symmetric/);
  });
});

describe('multivariate normal samples', () => {
  it('reproduce a 3×3 mean and covariance within 4 standard errors (200 000 draws)', () => {
    // Standard deviations 2, 1.5, 1 with correlations 0.4, −0.3 and 0.3.
    const covariance = [
      [4, 1.2, -0.6],
      [1.2, 2.25, 0.45],
      [-0.6, 0.45, 1],
    ];
    const meanVector = [10, -3, 0.5];
    const count = 200_000;
    const draws = sampleMultivariateNormal(createRng(31), meanVector, covariance, count);
    expect(draws.length).toBe(count);
    const sampleMean = [0, 1, 2].map((i) => mean(draws.map((d) => d[i])));
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(sampleMean[i] - meanVector[i])).toBeLessThan(4 * Math.sqrt(covariance[i][i] / count));
    }
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j <= i; j++) {
        let s = 0;
        for (const d of draws) s += (d[i] - sampleMean[i]) * (d[j] - sampleMean[j]);
        s /= count - 1;
        // Var(XᵢXⱼ) = σᵢᵢσⱼⱼ + σᵢⱼ² for jointly normal zero-mean Xᵢ, Xⱼ (Isserlis' theorem:
        // E[Xᵢ²Xⱼ²] = σᵢᵢσⱼⱼ + 2σᵢⱼ²), so SE(sᵢⱼ) ≈ √((σᵢᵢσⱼⱼ + σᵢⱼ²)/n).
        const se = Math.sqrt((covariance[i][i] * covariance[j][j] + covariance[i][j] ** 2) / count);
        expect(Math.abs(s - covariance[i][j])).toBeLessThan(4 * se);
      }
    }
  });

  it('respects an exact linear relation in a singular covariance', () => {
    // X₃ = X₁ + X₂ with X₁, X₂ independent of variances 1 and 4: Var X₃ = 5, Cov(X₁, X₃) = 1,
    // Cov(X₂, X₃) = 4. The third pivot is 5 − 1² − 2² = 0.
    const covariance = [
      [1, 0, 1],
      [0, 4, 4],
      [1, 4, 5],
    ];
    const draws = sampleMultivariateNormal(createRng(5), [1, 2, 3], covariance, 1000);
    for (const [x1, x2, x3] of draws) expect(Math.abs(x3 - 3 - (x1 - 1) - (x2 - 2))).toBeLessThan(1e-12);
  });

  it('checks its arguments', () => {
    expect(() => sampleMultivariateNormal(createRng(1), [0, 0], [[1]], 3)).toThrow(/covariance/);
    expect(() => sampleMultivariateNormal(createRng(1), [0], [[1]], -1)).toThrow(/count/);
    expect(sampleMultivariateNormal(createRng(1), [0], [[1]], 0)).toEqual([]);
  });
});

describe('sample summaries', () => {
  it('quantiles match NumPy 2.4.6 numpy.percentile(method="linear") exactly', () => {
    for (const c of fixture.percentile) {
      const sorted = [...c.values].sort((a, b) => a - b);
      expect(c.p.map((p) => quantileSorted(sorted, p))).toEqual(c.result);
      const copy = [...c.values];
      expect(quantiles(copy, c.p)).toEqual(c.result);
      expect(copy).toEqual(c.values); // sorts a copy, not the input
    }
  });

  it('mean and sample variance (worked examples)', () => {
    // [2, 4, 4, 4, 5, 5, 7, 9]: mean 40/8 = 5; Σ(x − 5)² = 9+1+1+1+0+0+4+16 = 32; s² = 32/7.
    expect(mean([2, 4, 4, 4, 5, 5, 7, 9])).toBe(5);
    expect(sampleVariance([2, 4, 4, 4, 5, 5, 7, 9])).toBeCloseTo(32 / 7, 14);
    // Offset by 1e9, where a one-pass Σx² − n·x̄² loses every digit: deviations −6, −3, 3, 6
    // give Σd² = 90 and s² = 90/3 = 30.
    expect(sampleVariance([1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16])).toBe(30);
  });

  it('refuses empty samples and probabilities outside [0, 1]', () => {
    expect(() => mean([])).toThrow(InputError);
    expect(() => sampleVariance([1])).toThrow(InputError);
    expect(() => quantileSorted([1, 2], 1.5)).toThrow(/p/);
    expect(() => quantiles([1, Number.NaN], [0.5])).toThrow(InputError);
  });
});
