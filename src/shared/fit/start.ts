/**
 * Computed starting values. θ0 and θ∞ enter the models linearly, so for a trial τ (and b) they follow
 * from a small linear least-squares solve and the residual sum of squares becomes a function of the
 * nonlinear parameters alone — variable projection (Golub & Pereyra, 1973). That function is scanned on a
 * log grid and refined by golden-section search, on a stride subsample: a start need not be exact, the
 * full-data Levenberg–Marquardt polish that follows makes it so.
 */
import type { DeclineModel } from './types.js';
import type { FitData } from './kernels.js';

export interface StartingValues {
  q: Float64Array;
  /** Set when the data cannot be a decline at all. */
  problem?: 'no-decline';
}

const LOG10_TAU_GRID = Array.from({ length: 25 }, (_, i) => -2.5 + 0.25 * i);
const B_GRID = [0.02, 0.1, 0.25, 0.5, 0.8, 1.2, 1.8, 2.5];

interface Projection {
  ssr: number;
  linear: [number, number];
}

/** Projected fit for fixed τ̃ (and b): returns the SSR and the linear parameters [θ0, θ∞]. */
function project(model: DeclineModel, tau: number, b: number, { xs, ys, ws }: FitData): Projection {
  const rate = 1 / tau;
  let sw = 0, sg = 0, sgg = 0, sy = 0, sgy = 0, syy = 0;
  for (let i = 0; i < xs.length; i++) {
    const w = ws === null ? 1 : ws[i];
    const g = model === 'hyperbolic' ? Math.exp(-Math.log1p(b * xs[i] * rate) / b) : Math.exp(-xs[i] * rate);
    const y = ys[i];
    sw += w; sg += w * g; sgg += w * g * g; sy += w * y; sgy += w * g * y; syy += w * y * y;
  }
  if (model !== 'floor') {
    const theta0 = sgg > 0 ? sgy / sgg : 0;
    return { ssr: syy - theta0 * sgy, linear: [theta0, 0] };
  }
  // θ = a + c·g with a = θ∞ and c = θ0 − θ∞.
  const det = sw * sgg - sg * sg;
  if (!(Math.abs(det) > 1e-14 * sw * sgg)) return { ssr: Infinity, linear: [0, 0] };
  const a = (sgg * sy - sg * sgy) / det;
  const c = (sw * sgy - sg * sy) / det;
  return { ssr: syy - a * sy - c * sgy, linear: [a + c, a] };
}

function goldenSearch(f: (u: number) => number, lo: number, hi: number, iterations: number): number {
  const phi = (Math.sqrt(5) - 1) / 2;
  let a = lo, bb = hi;
  let c = bb - phi * (bb - a), d = a + phi * (bb - a);
  let fc = f(c), fd = f(d);
  for (let k = 0; k < iterations; k++) {
    if (fc < fd) { bb = d; d = c; fd = fc; c = bb - phi * (bb - a); fc = f(c); }
    else { a = c; c = d; fc = fd; d = a + phi * (bb - a); fd = f(d); }
  }
  return fc < fd ? c : d;
}

/** Best τ̃ (as log10) on the grid, then refined between the grid neighbours. */
function bestLogTau(ssrAt: (log10Tau: number) => number): { log10Tau: number; ssr: number } {
  let best = 0, bestSsr = Infinity;
  for (let i = 0; i < LOG10_TAU_GRID.length; i++) {
    const s = ssrAt(LOG10_TAU_GRID[i]);
    if (s < bestSsr) { bestSsr = s; best = i; }
  }
  const lo = LOG10_TAU_GRID[Math.max(0, best - 1)];
  const hi = LOG10_TAU_GRID[Math.min(LOG10_TAU_GRID.length - 1, best + 1)];
  const log10Tau = goldenSearch(ssrAt, lo, hi, 18);
  return { log10Tau, ssr: ssrAt(log10Tau) };
}

/** Weighted least-squares slope of θ against x̃: a decline must have a negative one. */
function slope({ xs, ys, ws }: FitData): number {
  let sw = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (let i = 0; i < xs.length; i++) {
    const w = ws === null ? 1 : ws[i];
    sw += w; sx += w * xs[i]; sy += w * ys[i]; sxx += w * xs[i] * xs[i]; sxy += w * xs[i] * ys[i];
  }
  return (sw * sxy - sx * sy) / (sw * sxx - sx * sx);
}

export function subsample(data: FitData, maxPoints: number): FitData {
  const n = data.xs.length;
  if (n <= maxPoints) return data;
  const stride = n / maxPoints;
  const xs = new Float64Array(maxPoints), ys = new Float64Array(maxPoints);
  const ws = data.ws === null ? null : new Float64Array(maxPoints);
  for (let k = 0; k < maxPoints; k++) {
    const i = Math.floor(k * stride);
    xs[k] = data.xs[i]; ys[k] = data.ys[i];
    if (ws !== null && data.ws !== null) ws[k] = data.ws[i];
  }
  return { xs, ys, ws };
}

export function startingValues(model: DeclineModel, data: FitData, maxPoints = 400): StartingValues {
  const sample = subsample(data, maxPoints);
  if (!(slope(sample) < 0)) {
    return { q: new Float64Array(model === 'exponential' ? 2 : 3), problem: 'no-decline' };
  }
  if (model !== 'hyperbolic') {
    const ssrAt = (lt: number) => project(model, Math.pow(10, lt), 0, sample).ssr;
    const { log10Tau } = bestLogTau(ssrAt);
    const tau = Math.pow(10, log10Tau);
    const [theta0, thetaInf] = project(model, tau, 0, sample).linear;
    return { q: model === 'exponential' ? Float64Array.of(theta0, tau) : Float64Array.of(theta0, tau, thetaInf) };
  }
  // The hyperbolic's initial time constant is shorter than the exponential's (its decline slows down),
  // so the exponential optimum bounds the τ scan from above: a narrow window per trial b suffices.
  const { log10Tau: expLog } = bestLogTau((lt) => project('exponential', Math.pow(10, lt), 0, sample).ssr);
  let bestB = B_GRID[0], bestLog = expLog, bestSsr = Infinity;
  for (const b of B_GRID) {
    for (let lt = expLog - 1.5; lt <= expLog + 0.26; lt += 0.25) {
      const s = project(model, Math.pow(10, lt), b, sample).ssr;
      if (s < bestSsr) { bestSsr = s; bestB = b; bestLog = lt; }
    }
  }
  const log10Tau = goldenSearch((lt) => project(model, Math.pow(10, lt), bestB, sample).ssr, bestLog - 0.25, bestLog + 0.25, 16);
  const tau = Math.pow(10, log10Tau);
  const theta0 = project(model, tau, bestB, sample).linear[0];
  return { q: Float64Array.of(theta0, tau, bestB) };
}
