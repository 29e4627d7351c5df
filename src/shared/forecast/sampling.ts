/**
 * Parameter draws for the Monte Carlo of the forecast and the recharge intervals (DOMAIN.md §8): the fit's
 * estimates and covariance taken as a multivariate normal, seeded so a result can be reproduced.
 *
 * A normal puts some mass where the model means nothing — a time constant τ ≤ 0, or a hyperbolic
 * exponent b ≤ 0 — so such draws are rejected, counted, and replaced by further draws; the result is the
 * normal truncated to the meaningful region. The draws are written into one flat array, so the hot loops
 * that use them allocate nothing per sample.
 */
import type { DeclineModel, DeclineParameters, FitResult, ParameterName } from '../fit/types.js';
import { choleskyLower, createRng } from '../stats/random.js';

export const DEFAULT_SAMPLES = 4000;
export const DEFAULT_SEED = 1;

/** Stop after this many draws per wanted sample: a fit that loses more is too uncertain to sample. */
const MAX_DRAWS_PER_SAMPLE = 20;

export interface ParameterSamples {
  model: DeclineModel;
  names: ParameterName[];
  /** Accepted draws, one after another: parameter names[i] of sample s is values[s·names.length + i]. */
  values: Float64Array;
  /** Accepted draws (normally the number asked for). */
  count: number;
  rejected: number;
  /** Draws that failed the caller's own test (part of `rejected`). */
  rejectedByCaller: number;
}

/**
 * `count` draws from N(estimates, covariance) of a fit, τ > 0 and (hyperbolic) b > 0, and `accept` when
 * given (it sees the draw as parameters, for instance to refuse one whose θ now is not a number).
 * The arithmetic is that of `sampleMultivariateNormal` in stats/random.ts, so with no rejections the draws
 * are the same numbers that function returns for the same seed.
 */
export function sampleParameters(
  fit: FitResult,
  count: number,
  seed: number,
  accept?: (p: DeclineParameters) => boolean,
): ParameterSamples {
  const names = fit.parameterNames;
  const p = names.length;
  const mean = names.map((name) => fit.estimates[name] as number);
  const lower = choleskyLower(fit.covariance);
  const rng = createRng(seed);
  const values = new Float64Array(count * p);
  const z = new Float64Array(p);
  const draw = new Float64Array(p);
  const params: DeclineParameters = { ...fit.estimates };
  const tauIndex = names.indexOf('tau');
  const bIndex = names.indexOf('b');
  let accepted = 0, rejected = 0, rejectedByCaller = 0, draws = 0;
  const maxDraws = count * MAX_DRAWS_PER_SAMPLE;
  while (accepted < count && draws < maxDraws) {
    draws++;
    for (let i = 0; i < p; i++) z[i] = rng.normal();
    for (let i = 0; i < p; i++) {
      const li = lower[i];
      let v = mean[i];
      for (let k = 0; k <= i; k++) v += li[k] * z[k];
      draw[i] = v;
    }
    if (!(draw[tauIndex] > 0) || (bIndex >= 0 && !(draw[bIndex] > 0))) {
      rejected++;
      continue;
    }
    if (accept !== undefined) {
      writeParameters(names, draw, 0, params);
      if (!accept(params)) {
        rejected++;
        rejectedByCaller++;
        continue;
      }
    }
    values.set(draw, accepted * p);
    accepted++;
  }
  return { model: fit.model, names, values, count: accepted, rejected, rejectedByCaller };
}

/** Copies draw `offset / names.length` into a reusable parameter record (no allocation). */
export function writeParameters(names: readonly ParameterName[], values: Float64Array, offset: number, target: DeclineParameters): void {
  for (let i = 0; i < names.length; i++) target[names[i]] = values[offset + i];
}
