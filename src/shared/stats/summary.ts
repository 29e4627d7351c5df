/**
 * Summaries of samples: quantiles (for forecast bands), mean and variance.
 */
import { InputError } from '../errors.js';

/**
 * The p-quantile of already-sorted values by linear interpolation between order statistics
 * (Hyndman & Fan 1996 definition 7), computed exactly as NumPy's default
 * `numpy.quantile(..., method='linear')`: virtual index h = (n − 1)·p, and the interpolation
 * a + (b − a)·γ for γ < ½ but b − (b − a)·(1 − γ) for γ ≥ ½, so results agree bit for bit.
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) throw new InputError('needs at least one value', { field: 'values' });
  requireProbability(p);
  const h = (n - 1) * p;
  if (h >= n - 1) return sorted[n - 1];
  const lowIndex = Math.floor(h);
  const gamma = h - lowIndex;
  const a = sorted[lowIndex];
  const b = sorted[lowIndex + 1];
  const diff = b - a;
  return gamma >= 0.5 ? b - diff * (1 - gamma) : a + diff * gamma;
}

/** Quantiles of unsorted values at each probability in `ps` (the input is not modified). */
export function quantiles(values: ArrayLike<number>, ps: readonly number[]): number[] {
  const sorted = Float64Array.from(values);
  for (let i = 0; i < sorted.length; i++) {
    if (Number.isNaN(sorted[i])) throw new InputError(`value ${i} is NaN`, { field: 'values' });
  }
  sorted.sort(); // typed arrays sort numerically
  return ps.map((p) => quantileSorted(sorted, p));
}

/** Arithmetic mean, summed with Neumaier's compensation so long samples keep full precision. */
export function mean(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) throw new InputError('needs at least one value', { field: 'values' });
  return compensatedSum(values) / n;
}

/**
 * Unbiased sample variance Σ(x − x̄)²/(n − 1), by the corrected two-pass algorithm
 * (Chan, Golub & LeVeque, "Algorithms for computing the sample variance", Amer. Stat. 37,
 * 1983): the second term removes the rounding left in x̄.
 */
export function sampleVariance(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) throw new InputError(`needs at least two values (got ${n})`, { field: 'values' });
  const m = mean(values);
  let sumSquares = 0;
  let sumDeviations = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i] - m;
    sumSquares += d * d;
    sumDeviations += d;
  }
  return (sumSquares - (sumDeviations * sumDeviations) / n) / (n - 1);
}

/** Σ values[i] with Neumaier's improved Kahan summation. */
function compensatedSum(values: ArrayLike<number>): number {
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const t = sum + v;
    compensation += Math.abs(sum) >= Math.abs(v) ? (sum - t) + v : (v - t) + sum;
    sum = t;
  }
  return sum + compensation;
}

function requireProbability(p: number): void {
  if (typeof p !== 'number' || !Number.isFinite(p) || p < 0 || p > 1) {
    throw new InputError(`must be a probability in [0, 1] (got ${String(p)})`, { field: 'p' });
  }
}
