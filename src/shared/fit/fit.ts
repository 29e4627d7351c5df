/**
 * Decline fitting (DOMAIN.md §6): least squares for θ against time or produced mass, one honest result
 * record per fit. Standard errors from s²·(JᵀWJ)⁻¹ with s² = SSEw/(n − p) — the same convention as
 * SciPy's curve_fit with absolute_sigma=False — and 95 % intervals from Student's t with n − p dof.
 */
import { InputError } from '../errors.js';
import { studentTQuantile } from '../stats/distributions.js';
import { accumulate, newNormalEquations, type FitData } from './kernels.js';
import { invertSymmetric } from './linalg.js';
import { B_LOWER_BOUND, DEFAULT_LM_OPTIONS, levenbergMarquardt, type LmOptions } from './lm.js';
import { declineValue } from './models.js';
import { startingValues, subsample } from './start.js';
import {
  DECLINE_MODELS, basisUnit, parameterNamesOf,
  type AutoFitResult, type Basis, type DeclineModel, type DeclineParameters, type FitResult, type FitStatus, type ParameterEstimate, type ParameterName,
} from './types.js';

export interface DeclineSeries {
  basis: Basis;
  /** Basis values: elapsed time in s, or cumulative produced mass in kg. */
  x: ArrayLike<number>;
  /** Observed available temperature θ = Tprod − Tref, K. */
  theta: ArrayLike<number>;
  /** Optional non-negative weights (1/σ²); a zero weight excludes the point. */
  weights?: ArrayLike<number>;
  /** Optional mask: false (or 0) excludes the point (shut-in, test, flagged) — it never enters the fit. */
  include?: ArrayLike<boolean | number>;
}

export interface FitOptions {
  lm?: Partial<LmOptions>;
}

/** Above this many points a subsample pre-fit precedes the full-data polish. */
const PRE_FIT_THRESHOLD = 50_000;
const PRE_FIT_POINTS = 20_000;

export interface PreparedSeries {
  data: FitData;
  scale: number;
  xSI: Float64Array;
  nExcluded: number;
}

/** The points that enter a fit, validated, with the basis scaled to x/max|x| (shared with the reference engine). */
export function prepareSeries(series: DeclineSeries): PreparedSeries {
  const { x, theta, weights, include } = series;
  if (x.length !== theta.length) throw new InputError(`basis has ${x.length} values but θ has ${theta.length}`, { field: 'theta' });
  if (weights !== undefined && weights.length !== x.length) throw new InputError('weights and data differ in length', { field: 'weights' });
  if (include !== undefined && include.length !== x.length) throw new InputError('include mask and data differ in length', { field: 'include' });
  let n = 0;
  for (let i = 0; i < x.length; i++) {
    if (include !== undefined && !include[i]) continue;
    const w = weights === undefined ? 1 : weights[i];
    if (!(w >= 0) || !Number.isFinite(w)) throw new InputError(`weight at index ${i} must be a finite number ≥ 0 (got ${w})`, { field: 'weights' });
    if (w === 0) continue;
    if (!Number.isFinite(x[i])) throw new InputError(`basis value at index ${i} is not a finite number`, { field: 'x' });
    if (!Number.isFinite(theta[i])) throw new InputError(`θ at index ${i} is not a finite number`, { field: 'theta' });
    n++;
  }
  const xSI = new Float64Array(n), ys = new Float64Array(n);
  const ws = weights === undefined ? null : new Float64Array(n);
  let k = 0, scale = 0;
  for (let i = 0; i < x.length; i++) {
    if (include !== undefined && !include[i]) continue;
    const w = weights === undefined ? 1 : weights[i];
    if (w === 0) continue;
    xSI[k] = x[i]; ys[k] = theta[i];
    if (ws !== null) ws[k] = w;
    scale = Math.max(scale, Math.abs(x[i]));
    k++;
  }
  if (!(scale > 0)) scale = 1;
  const xs = new Float64Array(n);
  for (let i = 0; i < n; i++) xs[i] = xSI[i] / scale;
  return { data: { xs, ys, ws }, scale, xSI, nExcluded: x.length - n };
}

export function fitDecline(series: DeclineSeries, model: DeclineModel, options: FitOptions = {}): FitResult {
  return fitPrepared(prepareSeries(series), series.basis, model, options);
}

/** Fits every model and picks the lowest AICc among those that converged; every candidate is reported. */
export function fitAuto(series: DeclineSeries, options: FitOptions = {}): AutoFitResult {
  const prepared = prepareSeries(series);
  const candidates = DECLINE_MODELS.map((m) => fitPrepared(prepared, series.basis, m, options));
  const ranked = [...candidates].sort((a, b) => rank(a) - rank(b) || a.aicc - b.aicc);
  return { ...ranked[0], candidates: ranked };
}

function rank(f: FitResult): number {
  return f.converged && Number.isFinite(f.aicc) ? 0 : 1;
}

function fitPrepared(prep: PreparedSeries, basis: Basis, model: DeclineModel, options: FitOptions): FitResult {
  const names = parameterNamesOf(model);
  const p = names.length;
  const n = prep.data.xs.length;
  if (n < p + 2) {
    return failure(prep, basis, model, 'too-few-points', `${n} usable point${n === 1 ? '' : 's'}; the ${model} model needs at least ${p + 2}`);
  }
  const start = startingValues(model, prep.data);
  if (start.problem === 'no-decline') {
    return failure(prep, basis, model, 'no-decline', 'θ does not decline over the fit window (its least-squares slope is not negative); nothing to fit');
  }
  const lmOptions = { ...DEFAULT_LM_OPTIONS, ...options.lm };
  // On a long log, most iterations are spent getting near the optimum: do that on a stride subsample,
  // then polish on every point (the result is the full-data optimum; only the route is cheaper).
  let q0 = start.q;
  let preIterations = 0;
  if (n > PRE_FIT_THRESHOLD) {
    const pre = levenbergMarquardt(model, subsample(prep.data, PRE_FIT_POINTS), start.q, lmOptions);
    if (pre.status === 'converged') {
      q0 = pre.q;
      preIterations = pre.iterations;
    }
  }
  const lm = levenbergMarquardt(model, prep.data, q0, lmOptions);
  const q = lm.q;
  const estimates = unscale(model, q, prep.scale);

  let status: FitStatus = lm.status;
  let message = '';
  if (lm.status === 'max-iterations') message = `did not converge in ${lm.iterations} iterations; the estimates are the last iterate, not an optimum`;
  if (lm.status === 'at-bound' || (model === 'hyperbolic' && q[2] < 1e-4)) {
    status = 'at-bound';
    message = `b fell to its lower bound (${B_LOWER_BOUND}): the decline is exponential; use the exponential model`;
  }

  // Covariance on the final normal equations (recomputed at q so it matches the reported estimates).
  const ne = newNormalEquations(p);
  accumulate(model, q, prep.data, ne);
  const dof = n - p;
  const s2 = ne.sse / dof;
  const inv = invertSymmetric(ne.jtj, p);
  if (inv === null && status === 'converged') {
    status = 'singular';
    message = 'the parameters cannot be separated by these data (JᵀJ is singular); try a simpler model or a longer window';
  }
  const d = names.map((name) => (name === 'tau' ? prep.scale : 1));
  const covariance = names.map((_, i) => names.map((__, j) => (inv === null ? NaN : inv[i * p + j] * s2 * d[i] * d[j])));
  const correlation = covariance.map((row, i) => row.map((c, j) => c / Math.sqrt(covariance[i][i] * covariance[j][j])));
  const t = studentTQuantile(0.975, dof);
  const parameters: Partial<Record<ParameterName, ParameterEstimate>> = {};
  names.forEach((name, i) => {
    const value = estimates[name] as number;
    const stderr = Math.sqrt(covariance[i][i]);
    parameters[name] = { value, stderr, ci95: [value - t * stderr, value + t * stderr], unit: unitOf(name, basis) };
  });

  const residuals = new Float64Array(n);
  let sw = 0, swy = 0;
  const { ys, ws } = prep.data;
  for (let i = 0; i < n; i++) {
    residuals[i] = ys[i] - declineValue(model, estimates, prep.xSI[i]);
    const w = ws === null ? 1 : ws[i];
    sw += w; swy += w * ys[i];
  }
  const mean = swy / sw;
  let sst = 0;
  for (let i = 0; i < n; i++) sst += (ws === null ? 1 : ws[i]) * (ys[i] - mean) ** 2;
  const k = p + 1;
  const aicc = n - k - 1 > 0 ? n * Math.log(ne.sse / n) + 2 * k + (2 * k * (k + 1)) / (n - k - 1) : Infinity;

  return {
    model, basis, status, converged: status === 'converged', message,
    n, nExcluded: prep.nExcluded, dof,
    parameterNames: names, estimates, parameters, covariance, correlation,
    x: prep.xSI, residuals,
    sse: ne.sse, rmseK: Math.sqrt(ne.sse / sw), r2: 1 - ne.sse / sst, aicc,
    iterations: preIterations + lm.iterations, evaluations: lm.evaluations + 1,
    xRange: range(prep.xSI),
  };
}

function unscale(model: DeclineModel, q: Float64Array, scale: number): DeclineParameters {
  const out: DeclineParameters = { theta0: q[0], tau: q[1] * scale };
  if (model === 'floor') out.thetaInf = q[2];
  if (model === 'hyperbolic') out.b = q[2];
  return out;
}

function unitOf(name: ParameterName, basis: Basis): string {
  if (name === 'tau') return basisUnit(basis);
  return name === 'b' ? '1' : 'K';
}

function range(x: Float64Array): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < x.length; i++) { lo = Math.min(lo, x[i]); hi = Math.max(hi, x[i]); }
  return [lo, hi];
}

function failure(prep: PreparedSeries, basis: Basis, model: DeclineModel, status: FitStatus, message: string): FitResult {
  const names = parameterNamesOf(model);
  const nan = names.map(() => names.map(() => NaN));
  const n = prep.data.xs.length;
  return {
    model, basis, status, converged: false, message,
    n, nExcluded: prep.nExcluded, dof: Math.max(0, n - names.length),
    parameterNames: names, estimates: { theta0: NaN, tau: NaN }, parameters: {},
    covariance: nan, correlation: nan,
    x: prep.xSI, residuals: new Float64Array(0),
    sse: NaN, rmseK: NaN, r2: NaN, aicc: Infinity,
    iterations: 0, evaluations: 0, xRange: n > 0 ? range(prep.xSI) : [NaN, NaN],
  };
}
