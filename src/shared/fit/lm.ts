/**
 * Levenberg–Marquardt on the fused normal equations of kernels.ts: each iteration is one pass over the
 * data. Damping on the diagonal of JᵀWJ (Marquardt, 1963) with Nielsen's update of the damping factor
 * (Nielsen, 1999); stopping tests on the step, the relative reduction and the gradient cosine as in MINPACK.
 */
import type { DeclineModel } from './types.js';
import { accumulate, newNormalEquations, type FitData, type NormalEquations } from './kernels.js';
import { solveSmall } from './linalg.js';

export interface LmOptions {
  maxIterations: number;
  xtol: number;
  ftol: number;
  gtol: number;
}

export const DEFAULT_LM_OPTIONS: LmOptions = { maxIterations: 200, xtol: 1e-10, ftol: 1e-15, gtol: 1e-10 };

export interface LmOutcome {
  q: Float64Array;
  /** Normal equations at q. */
  ne: NormalEquations;
  iterations: number;
  evaluations: number;
  status: 'converged' | 'max-iterations' | 'at-bound';
}

/** Relative size of SSE changes that double-precision sums over many residuals cannot resolve. */
const ROUNDING_LEVEL = 1e-14;

/** b of the hyperbolic model is kept above this; reaching it means the data are exponential. */
export const B_LOWER_BOUND = 1e-7;

function feasible(model: DeclineModel, q: Float64Array): boolean {
  if (!(q[1] > 0) || !Number.isFinite(q[1])) return false;
  if (model === 'hyperbolic' && !(q[2] > B_LOWER_BOUND)) return false;
  for (let i = 0; i < q.length; i++) if (!Number.isFinite(q[i])) return false;
  return true;
}

export function levenbergMarquardt(model: DeclineModel, data: FitData, q0: Float64Array, options: LmOptions = DEFAULT_LM_OPTIONS): LmOutcome {
  const p = q0.length;
  let q = Float64Array.from(q0);
  let ne = newNormalEquations(p);
  let trial = newNormalEquations(p);
  accumulate(model, q, data, ne);
  let evaluations = 1;
  let maxDiag = 0;
  for (let i = 0; i < p; i++) maxDiag = Math.max(maxDiag, ne.jtj[i * p + i]);
  let lambda = 1e-3;
  let nu = 2;
  const damped = new Float64Array(p * p);
  let boundHits = 0;

  for (let iteration = 1; iteration <= options.maxIterations; iteration++) {
    if (gradientSmall(ne, p, options.gtol)) return { q, ne, iterations: iteration - 1, evaluations, status: 'converged' };
    damped.set(ne.jtj);
    for (let i = 0; i < p; i++) damped[i * p + i] += lambda * Math.max(ne.jtj[i * p + i], 1e-12 * maxDiag);
    const step = solveSmall(damped, ne.jtr, p);
    if (step === null) {
      lambda *= nu; nu *= 2;
      continue;
    }
    const next = new Float64Array(p);
    let smallStep = true;
    for (let i = 0; i < p; i++) {
      next[i] = q[i] + step[i];
      if (Math.abs(step[i]) > options.xtol * (Math.abs(q[i]) + options.xtol)) smallStep = false;
    }
    if (!feasible(model, next)) {
      if (model === 'hyperbolic' && next[2] <= B_LOWER_BOUND && (boundHits += 1) > 30) {
        return { q, ne, iterations: iteration, evaluations, status: 'at-bound' };
      }
      lambda *= nu; nu *= 2;
      continue;
    }
    accumulate(model, next, data, trial);
    evaluations++;
    // Gain ratio: actual over predicted reduction, predicted = δᵀ(λ·D·δ + JᵀWr).
    let predicted = 0;
    for (let i = 0; i < p; i++) {
      predicted += step[i] * (lambda * Math.max(ne.jtj[i * p + i], 1e-12 * maxDiag) * step[i] + ne.jtr[i]);
    }
    const actual = ne.sse - trial.sse;
    if (Number.isFinite(trial.sse) && predicted >= 0 && predicted <= ROUNDING_LEVEL * ne.sse) {
      // The gain the quadratic model promises is below what a sum over n residuals can resolve, so the
      // SSE comparison is rounding noise: take this last Gauss–Newton step on the model's word and stop.
      return { q: next, ne: trial, iterations: iteration, evaluations, status: 'converged' };
    }
    if (actual > 0 && Number.isFinite(trial.sse)) {
      const relative = actual / ne.sse;
      q = next;
      [ne, trial] = [trial, ne];
      const rho = predicted > 0 ? actual / predicted : 1;
      lambda *= Math.max(1 / 3, 1 - Math.pow(2 * rho - 1, 3));
      nu = 2;
      if (smallStep || (relative <= options.ftol && predicted / ne.sse <= options.ftol)) {
        return { q, ne, iterations: iteration, evaluations, status: 'converged' };
      }
    } else {
      // No reduction: at the optimum to rounding, a step within xtol is convergence.
      if (smallStep) return { q, ne, iterations: iteration, evaluations, status: 'converged' };
      lambda *= nu; nu *= 2;
      // Damping this large means no descent direction is left to rounding: converged if the gradient
      // is nearly orthogonal to the residuals, otherwise the search has stalled.
      if (lambda > 1e30) {
        return { q, ne, iterations: iteration, evaluations, status: gradientSmall(ne, p, 1e-6) ? 'converged' : 'max-iterations' };
      }
    }
  }
  return { q, ne, iterations: options.maxIterations, evaluations, status: 'max-iterations' };
}

/** MINPACK's gtol test: the largest cosine between the residual vector and a Jacobian column. */
function gradientSmall(ne: NormalEquations, p: number, gtol: number): boolean {
  if (ne.sse === 0) return true;
  let worst = 0;
  for (let i = 0; i < p; i++) {
    const d = ne.jtj[i * p + i];
    if (d > 0) worst = Math.max(worst, Math.abs(ne.jtr[i]) / Math.sqrt(d * ne.sse));
  }
  return worst <= gtol;
}
