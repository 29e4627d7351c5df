/**
 * Fused per-model loops over the data: one pass gives the weighted residual sum of squares and the
 * normal equations JᵀWJ, JᵀWr with analytic derivatives, without ever forming the n × p Jacobian.
 * This is what lets a million-point log fit in well under a second.
 *
 * Everything here works on a scaled basis x̃ = x/X and a scaled time constant τ̃ = τ/X (X the largest
 * |x|), so the parameters are all of order one whatever the basis unit. Parameter vector q:
 *   exponential [θ0, τ̃]    floor [θ0, τ̃, θ∞]    hyperbolic [θ0, τ̃, b]
 */
import type { DeclineModel } from './types.js';

export interface FitData {
  /** Scaled basis values x̃. */
  xs: Float64Array;
  /** Observed θ, K. */
  ys: Float64Array;
  /** Weights, or null for unit weights. */
  ws: Float64Array | null;
}

export interface NormalEquations {
  /** p × p, row-major. */
  jtj: Float64Array;
  jtr: Float64Array;
  sse: number;
}

export function newNormalEquations(p: number): NormalEquations {
  return { jtj: new Float64Array(p * p), jtr: new Float64Array(p), sse: 0 };
}

/** Residual sum of squares and normal equations at q, written into `out`. */
export function accumulate(model: DeclineModel, q: Float64Array, data: FitData, out: NormalEquations): void {
  switch (model) {
    case 'exponential':
      return accumulateExponential(q, data, out);
    case 'floor':
      return accumulateFloor(q, data, out);
    case 'hyperbolic':
      return accumulateHyperbolic(q, data, out);
  }
}

function accumulateExponential(q: Float64Array, { xs, ys, ws }: FitData, out: NormalEquations): void {
  const theta0 = q[0];
  const rate = 1 / q[1];
  const dTauFactor = theta0 * rate * rate;
  let a00 = 0, a01 = 0, a11 = 0, g0 = 0, g1 = 0, sse = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    const e = Math.exp(-x * rate);
    const r = ys[i] - theta0 * e;
    const w = ws === null ? 1 : ws[i];
    const j0 = e;
    const j1 = dTauFactor * x * e;
    a00 += w * j0 * j0; a01 += w * j0 * j1; a11 += w * j1 * j1;
    g0 += w * j0 * r; g1 += w * j1 * r;
    sse += w * r * r;
  }
  const m = out.jtj;
  m[0] = a00; m[1] = a01; m[2] = a01; m[3] = a11;
  out.jtr[0] = g0; out.jtr[1] = g1;
  out.sse = sse;
}

function accumulateFloor(q: Float64Array, { xs, ys, ws }: FitData, out: NormalEquations): void {
  const theta0 = q[0];
  const rate = 1 / q[1];
  const floor = q[2];
  const dTauFactor = (theta0 - floor) * rate * rate;
  let a00 = 0, a01 = 0, a02 = 0, a11 = 0, a12 = 0, a22 = 0, g0 = 0, g1 = 0, g2 = 0, sse = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    const e = Math.exp(-x * rate);
    const r = ys[i] - (floor + (theta0 - floor) * e);
    const w = ws === null ? 1 : ws[i];
    const j0 = e;
    const j1 = dTauFactor * x * e;
    const j2 = 1 - e;
    a00 += w * j0 * j0; a01 += w * j0 * j1; a02 += w * j0 * j2;
    a11 += w * j1 * j1; a12 += w * j1 * j2; a22 += w * j2 * j2;
    g0 += w * j0 * r; g1 += w * j1 * r; g2 += w * j2 * r;
    sse += w * r * r;
  }
  store3(out, a00, a01, a02, a11, a12, a22, g0, g1, g2, sse);
}

/** Writes the symmetric 3 × 3 normal equations accumulated by a loop (kept out of the loops themselves). */
function store3(
  out: NormalEquations, a00: number, a01: number, a02: number, a11: number, a12: number, a22: number,
  g0: number, g1: number, g2: number, sse: number,
): void {
  const m = out.jtj;
  m[0] = a00; m[1] = a01; m[2] = a02;
  m[3] = a01; m[4] = a11; m[5] = a12;
  m[6] = a02; m[7] = a12; m[8] = a22;
  out.jtr[0] = g0; out.jtr[1] = g1; out.jtr[2] = g2;
  out.sse = sse;
}

/**
 * ∂/∂b of −ln(1 + b·s)/b, i.e. ln(1 + b·s)/b² − s/(b·(1 + b·s)). The two terms cancel for small b·s,
 * so there the series Σ_{k≥2} (−1)^k (k−1)/k · b^(k−2) · s^k is used instead.
 */
export function hyperbolicExponentDb(b: number, s: number): number {
  const bs = b * s;
  if (Math.abs(bs) < 1e-3) {
    const s2 = s * s;
    return s2 * (0.5 - (2 / 3) * bs + 0.75 * bs * bs - 0.8 * bs * bs * bs);
  }
  return Math.log1p(bs) / (b * b) - s / (b * (1 + bs));
}

function accumulateHyperbolic(q: Float64Array, { xs, ys, ws }: FitData, out: NormalEquations): void {
  const theta0 = q[0];
  const tau = q[1];
  const b = q[2];
  const rate = 1 / tau;
  const invB = 1 / b;
  let a00 = 0, a01 = 0, a02 = 0, a11 = 0, a12 = 0, a22 = 0, g0 = 0, g1 = 0, g2 = 0, sse = 0;
  for (let i = 0; i < xs.length; i++) {
    const s = xs[i] * rate;
    const u = 1 + b * s;
    const g = Math.exp(-Math.log1p(b * s) * invB);
    const f = theta0 * g;
    const r = ys[i] - f;
    const w = ws === null ? 1 : ws[i];
    const j0 = g;
    const j1 = (f * s * rate) / u;
    const j2 = f * hyperbolicExponentDb(b, s);
    a00 += w * j0 * j0; a01 += w * j0 * j1; a02 += w * j0 * j2;
    a11 += w * j1 * j1; a12 += w * j1 * j2; a22 += w * j2 * j2;
    g0 += w * j0 * r; g1 += w * j1 * r; g2 += w * j2 * r;
    sse += w * r * r;
  }
  store3(out, a00, a01, a02, a11, a12, a22, g0, g1, g2, sse);
}
