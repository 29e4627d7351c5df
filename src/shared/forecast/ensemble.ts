/**
 * The Monte Carlo ensemble of a forecast: for every parameter draw, θ on the forecast grid, where it reaches
 * the economic limit, and ∫θ dx up to there — all on the fit's basis x (time in s, or produced mass in kg).
 *
 * This is the hot loop (thousands of draws × ~121 grid points), so it is written against flat typed arrays
 * and allocates nothing per draw. On the uniform grid the exponential factor obeys
 * e^(−(x+Δx)/τ) = e^(−x/τ)·e^(−Δx/τ), one multiplication per point instead of an exp; the rounding this
 * accumulates over 121 steps is ~1e-14 relative.
 */
import { basisWhereThetaFalls, declineIntegral, declineValue } from '../fit/models.js';
import type { DeclineParameters } from '../fit/types.js';
import { writeParameters, type ParameterSamples } from './sampling.js';

export interface EnsembleGrid {
  /** Basis value of now (the first grid point). */
  x0: number;
  /** Basis value of the end of the horizon (the last grid point). */
  xEnd: number;
  points: number;
}

export interface Ensemble {
  /** Basis value where each draw reaches the limit: x0 when θ is already at or below it now, +∞ when not by xEnd. */
  endX: Float64Array;
  /** ∫θ dx from x0 to min(endX, xEnd), K·(basis unit). */
  integral: Float64Array;
  count: number;
}

export function gridValues(grid: EnsembleGrid): Float64Array {
  const x = new Float64Array(grid.points);
  const dx = (grid.xEnd - grid.x0) / (grid.points - 1);
  for (let g = 0; g < grid.points; g++) x[g] = grid.x0 + g * dx;
  x[grid.points - 1] = grid.xEnd;
  return x;
}

/**
 * Runs every draw; θ of all draws at grid point g is handed to `onColumn(θ, g)`, grid point after grid
 * point, in one reused array (copy what must outlive the call), so the samples × times matrix never exists.
 */
export function runEnsemble(
  samples: ParameterSamples, grid: EnsembleGrid, thetaEconK: number,
  onColumn: (theta: Float64Array, g: number) => void,
): Ensemble {
  const { model, names, values, count } = samples;
  const p = names.length;
  const G = grid.points;
  const dx = (grid.xEnd - grid.x0) / (G - 1);
  const column = new Float64Array(count);
  const endX = new Float64Array(count);
  const integral = new Float64Array(count);
  // Per-draw coefficients, so the grid loop runs grid point by grid point with contiguous writes.
  const a = new Float64Array(count);
  const c = new Float64Array(count);
  const e = new Float64Array(count);
  const r = new Float64Array(count);
  const params: DeclineParameters = { theta0: NaN, tau: NaN };

  for (let s = 0; s < count; s++) {
    writeParameters(names, values, s * p, params);
    const thetaNow = declineValue(model, params, grid.x0);
    let end: number;
    if (thetaNow <= thetaEconK) {
      end = grid.x0;
    } else {
      const crossing = basisWhereThetaFalls(model, params, thetaEconK);
      end = crossing === null || crossing > grid.xEnd ? Infinity : crossing;
    }
    endX[s] = end;
    integral[s] = declineIntegral(model, params, grid.x0, Math.min(end, grid.xEnd));
    if (model === 'hyperbolic') {
      const b = params.b as number;
      a[s] = params.theta0;
      c[s] = b / params.tau;
      e[s] = -1 / b;
    } else {
      const floor = model === 'floor' ? (params.thetaInf as number) : 0;
      a[s] = floor;
      c[s] = params.theta0 - floor;
      e[s] = Math.exp(-grid.x0 / params.tau);
      r[s] = Math.exp(-dx / params.tau);
    }
  }

  if (model === 'hyperbolic') {
    // θ = θ0·(1 + b·x/τ)^(−1/b)
    for (let g = 0; g < G; g++) {
      const x = g === G - 1 ? grid.xEnd : grid.x0 + g * dx;
      for (let s = 0; s < count; s++) column[s] = a[s] * Math.exp(e[s] * Math.log1p(c[s] * x));
      onColumn(column, g);
    }
  } else {
    // θ = θ∞ + (θ0 − θ∞)·e^(−x/τ), θ∞ = 0 for the exponential
    for (let g = 0; g < G; g++) {
      for (let s = 0; s < count; s++) {
        column[s] = a[s] + c[s] * e[s];
        e[s] *= r[s];
      }
      onColumn(column, g);
    }
  }
  return { endX, integral, count };
}
