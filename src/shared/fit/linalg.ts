/** Dense linear algebra for the tiny (p ≤ 3) systems of the decline fits. Row-major Float64Array. */

/** Solves A·x = b by Gaussian elimination with partial pivoting; null when A is singular. */
export function solveSmall(a: Float64Array, b: Float64Array, p: number): Float64Array | null {
  const m = Float64Array.from(a);
  const x = Float64Array.from(b);
  let scale = 0;
  for (let i = 0; i < p * p; i++) scale = Math.max(scale, Math.abs(m[i]));
  if (!(scale > 0) || !Number.isFinite(scale)) return null;
  for (let col = 0; col < p; col++) {
    let pivot = col;
    for (let row = col + 1; row < p; row++) {
      if (Math.abs(m[row * p + col]) > Math.abs(m[pivot * p + col])) pivot = row;
    }
    if (Math.abs(m[pivot * p + col]) <= scale * 1e-15) return null;
    if (pivot !== col) {
      for (let k = 0; k < p; k++) {
        const t = m[col * p + k]; m[col * p + k] = m[pivot * p + k]; m[pivot * p + k] = t;
      }
      const t = x[col]; x[col] = x[pivot]; x[pivot] = t;
    }
    for (let row = col + 1; row < p; row++) {
      const f = m[row * p + col] / m[col * p + col];
      if (f === 0) continue;
      for (let k = col; k < p; k++) m[row * p + k] -= f * m[col * p + k];
      x[row] -= f * x[col];
    }
  }
  for (let row = p - 1; row >= 0; row--) {
    let s = x[row];
    for (let k = row + 1; k < p; k++) s -= m[row * p + k] * x[k];
    x[row] = s / m[row * p + row];
  }
  return x;
}

/**
 * Inverse of a symmetric positive-definite matrix, computed on the matrix equilibrated by its diagonal
 * (so that badly scaled parameters do not lose digits); null when it is singular.
 */
export function invertSymmetric(a: Float64Array, p: number): Float64Array | null {
  const d = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    if (!(a[i * p + i] > 0)) return null;
    d[i] = 1 / Math.sqrt(a[i * p + i]);
  }
  const scaled = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) scaled[i * p + j] = a[i * p + j] * d[i] * d[j];
  const inv = new Float64Array(p * p);
  const unit = new Float64Array(p);
  for (let col = 0; col < p; col++) {
    unit.fill(0);
    unit[col] = 1;
    const x = solveSmall(scaled, unit, p);
    if (x === null) return null;
    for (let row = 0; row < p; row++) inv[row * p + col] = x[row] * d[row] * d[col];
  }
  // Condition guard: an equilibrated matrix this close to singular gives meaningless variances.
  let maxAbs = 0;
  for (let i = 0; i < p * p; i++) maxAbs = Math.max(maxAbs, Math.abs(inv[i] / (d[Math.floor(i / p)] * d[i % p])));
  if (!Number.isFinite(maxAbs) || maxAbs > 1e14) return null;
  return inv;
}
