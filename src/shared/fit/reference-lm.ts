/**
 * The same decline models fitted by ml-levenberg-marquardt 5.1.0, an independent Levenberg–Marquardt
 * implementation (forward-difference Jacobian, dense p × n matrices). It is the cross-check engine of the
 * tests and the baseline of the benchmark, so it is used plainly: the package's own defaults (damping,
 * gradientDifference 0.1, errorTolerance 1e-7 — the value in its code; its README says 10e-3), except
 *   - the basis is scaled to x/max|x| as fit.ts does, and the iteration starts from the same computed
 *     starting values as fitDecline (start.ts). Unscaled, its damping λ·I dwarfs JᵀJ for τ in seconds:
 *     started at the truth × 1.1 on a 300-point weekly series, τ moved by 0.005 % in 200 iterations and the
 *     SSE stayed 18 times the optimum;
 *   - maxIterations 200 (its default is 100), as in the measurement the benchmark repeats.
 * Its only stopping test is an absolute SSE ≤ errorTolerance, which noisy field data never reach, so it runs
 * all maxIterations; it keeps the best point seen, counting only improvements larger than errorTolerance, so
 * its SSE is within about 1e-7 K² of the lowest it reached. Its forward-difference step of 0.1 on τ̃ ≈ 0.5 is
 * harmless while the residuals are noise, but biases the end point when the model does not fit the data: an
 * exponential or hyperbolic fit to exponential-to-a-floor data ends 8e-4 to 2e-3 (relative) away from the
 * least-squares parameters, with an SSE 4e-5 to 1.2e-4 above the minimum (gradientDifference 1e-3 with
 * centralDifference would close that to ~1e-7). Cross-checks on such fits can compare SSEs, not parameters.
 * Weights are applied by scaling the residuals (√w·y against √w·θ(x)), never through the package's
 * `weights` option: 5.1.0 multiplies the squared residuals by weights² but forms JᵀWJ with 1/weights²
 * (check_options.js, error_calculation.js, step.js), so no choice of that option means 1/σ² consistently.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { InputError } from '../errors.js';
import { startingValues } from './start.js';
import type { DeclineModel, DeclineParameters } from './types.js';
import { prepareSeries, type DeclineSeries } from './fit.js';

export interface ReferenceFitOptions {
  /** Default 200. */
  maxIterations?: number;
  /** Start here (SI) instead of at the computed starting values, e.g. the truth × 1.1. */
  initialValues?: DeclineParameters;
  /**
   * Called as the package works through its iterations. It has no callback of its own, so the count is
   * inferred from how often it asks for the model at new parameters: once at the start, then p + 2 times
   * per iteration (the step, p finite differences, the error of the new point).
   */
  onIteration?: (iteration: number) => void;
}

export interface ReferenceFit {
  estimates: DeclineParameters;
  /** The starting values used, SI. */
  start: DeclineParameters;
  iterations: number;
  /** Σ w·(θobs − θfit)² at the estimates, K²; for unit weights the package's own parameterError. */
  sse: number;
  /** Points that entered the fit. */
  n: number;
}

type Model = (q: number[]) => (x: number) => number;

const MODELS: Record<DeclineModel, Model> = {
  exponential: ([theta0, tau]) => (x) => theta0 * Math.exp(-x / tau),
  floor: ([theta0, tau, floor]) => (x) => floor + (theta0 - floor) * Math.exp(-x / tau),
  hyperbolic: ([theta0, tau, b]) => (x) => theta0 * Math.exp(-Math.log1p((b * x) / tau) / b),
};

export function fitWithMlLevenbergMarquardt(series: DeclineSeries, model: DeclineModel, options: ReferenceFitOptions = {}): ReferenceFit {
  // The same points, weights and scaling as fitDecline: excluded and zero-weight points never enter.
  const { data, scale } = prepareSeries(series);
  const n = data.xs.length;
  const p = model === 'exponential' ? 2 : 3;
  if (n < p + 2) throw new InputError(`${n} usable points; the ${model} model needs at least ${p + 2}`, { field: 'x' });

  let q0: number[];
  if (options.initialValues !== undefined) {
    q0 = toScaled(model, options.initialValues, scale);
  } else {
    const start = startingValues(model, data);
    if (start.problem === 'no-decline') throw new InputError('θ does not decline over the fit window', { field: 'theta' });
    q0 = Array.from(start.q);
  }

  const f = MODELS[model];
  let modelBuilds = 0;
  const counted: Model = (q) => {
    modelBuilds++;
    if (options.onIteration !== undefined && modelBuilds > 1 && (modelBuilds - 1) % (p + 2) === 0) {
      options.onIteration((modelBuilds - 1) / (p + 2));
    }
    return f(q);
  };

  const { ws } = data;
  let fitted: { parameterValues: number[]; iterations: number };
  if (ws === null) {
    fitted = levenbergMarquardt({ x: data.xs, y: data.ys }, counted, lmOptions(q0, options));
  } else {
    // The point index is the independent variable, so each residual can carry its own √w.
    const root = ws.map(Math.sqrt);
    const index = Float64Array.from({ length: n }, (_, i) => i);
    const y = data.ys.map((v, i) => root[i] * v);
    const weighted: Model = (q) => {
      const g = counted(q);
      return (i) => root[i] * g(data.xs[i]);
    };
    fitted = levenbergMarquardt({ x: index, y }, weighted, lmOptions(q0, options));
  }

  const q = fitted.parameterValues;
  const g = f(q);
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (ws === null ? 1 : ws[i]) * (data.ys[i] - g(data.xs[i])) ** 2;
  return { estimates: toSI(model, q, scale), start: toSI(model, q0, scale), iterations: fitted.iterations, sse, n };
}

function lmOptions(q0: number[], options: ReferenceFitOptions) {
  return { initialValues: q0, maxIterations: options.maxIterations ?? 200 };
}

function toScaled(model: DeclineModel, p: DeclineParameters, scale: number): number[] {
  const q = [p.theta0, p.tau / scale];
  if (model === 'floor') q.push(p.thetaInf ?? 0);
  if (model === 'hyperbolic') q.push(p.b ?? 0);
  return q;
}

function toSI(model: DeclineModel, q: ArrayLike<number>, scale: number): DeclineParameters {
  const out: DeclineParameters = { theta0: q[0], tau: q[1] * scale };
  if (model === 'floor') out.thetaInf = q[2];
  if (model === 'hyperbolic') out.b = q[2];
  return out;
}
