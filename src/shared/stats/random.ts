/**
 * Seeded random numbers for the forecast's Monte Carlo: a reproducible uniform generator,
 * standard normals, and multivariate normal draws from a fitted parameter covariance.
 *
 * Only 32-bit integer operations (Math.imul, shifts, xor) touch the state, so a seed gives
 * the same sequence on every JavaScript engine.
 */
import { InputError, requireFinite } from '../errors.js';

/** A seeded source of random numbers. */
export interface Rng {
  /** Uniform on [0, 1) with 53-bit resolution. */
  next(): number;
  /** Uniform 32-bit unsigned integer. */
  nextUint32(): number;
  /** Standard normal (mean 0, variance 1). */
  normal(): number;
}

const TWO_POW_26 = 67108864;
const TWO_POW_32 = 4294967296;
const TWO_POW_MINUS_53 = 1 / 9007199254740992;
const GOLDEN_GAMMA = 0x9e3779b9; // 2³²/φ, the Weyl increment of SplitMix (Steele, Lea & Flood 2014)

/**
 * xoshiro128** 1.1 (D. Blackman & S. Vigna, "Scrambled linear pseudorandom number
 * generators", ACM TOMS 47 (2021); reference C code, public domain): 128-bit state,
 * period 2¹²⁸ − 1, passes BigCrush.
 */
export class Xoshiro128StarStar implements Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal = 0;
  private hasSpareNormal = false;

  /** Starts from the four state words as given (not all zero); `createRng` seeds from one number. */
  constructor(s0: number, s1: number, s2: number, s3: number) {
    if (((s0 | s1 | s2 | s3) >>> 0) === 0) {
      throw new InputError('xoshiro128** state must not be all zero', { field: 'state' });
    }
    this.s0 = s0 | 0;
    this.s1 = s1 | 0;
    this.s2 = s2 | 0;
    this.s3 = s3 | 0;
  }

  nextUint32(): number {
    const s1 = this.s1;
    const r = Math.imul(s1, 5);
    const result = Math.imul((r << 7) | (r >>> 25), 9);
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = (this.s3 << 11) | (this.s3 >>> 21);
    return result >>> 0;
  }

  next(): number {
    // 27 high bits of one output and 26 of the next make a 53-bit fraction (the genrand_res53
    // construction of Matsumoto & Nishimura's MT19937 reference code).
    const high = this.nextUint32() >>> 5;
    const low = this.nextUint32() >>> 6;
    return (high * TWO_POW_26 + low) * TWO_POW_MINUS_53;
  }

  normal(): number {
    if (this.hasSpareNormal) {
      this.hasSpareNormal = false;
      return this.spareNormal;
    }
    // Marsaglia & Bray (1964) polar method: two normals per accepted point in the unit disc.
    let u: number;
    let v: number;
    let s: number;
    do {
      u = 2 * this.next() - 1;
      v = 2 * this.next() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const factor = Math.sqrt(-2 * Math.log(s) / s);
    this.spareNormal = v * factor;
    this.hasSpareNormal = true;
    return u * factor;
  }
}

/** C. Wellons' "lowbias32" integer hash (hash-prospector, 2018): a bijective 32-bit mixer. */
function lowbias32(x: number): number {
  x ^= x >>> 16;
  x = Math.imul(x, 0x7feb352d);
  x ^= x >>> 15;
  x = Math.imul(x, 0x846ca68b);
  x ^= x >>> 16;
  return x | 0;
}

/**
 * A generator seeded from any safe integer. The state words are steps of a golden-ratio Weyl
 * sequence passed through lowbias32 (the SplitMix recipe on 32-bit words): two started at
 * the seed's low 32-bit word and two at its high word. lowbias32 is a bijection, so distinct
 * seeds give distinct states, nearby seeds unrelated ones, and the state is never all zero
 * (words 0 and 1 would both need a zero input, which one Weyl step apart they cannot be).
 */
export function createRng(seed: number): Rng {
  requireFinite(seed, 'seed');
  if (!Number.isSafeInteger(seed)) throw new InputError(`must be an integer (got ${seed})`, { field: 'seed' });
  // The seed's two's-complement low and high 32-bit words.
  const low = ((seed % TWO_POW_32) + TWO_POW_32) % TWO_POW_32;
  const high = Math.floor(seed / TWO_POW_32);
  return new Xoshiro128StarStar(
    lowbias32((low + GOLDEN_GAMMA) | 0),
    lowbias32((low + 2 * GOLDEN_GAMMA) | 0),
    lowbias32((high + 3 * GOLDEN_GAMMA) | 0),
    lowbias32((high + 4 * GOLDEN_GAMMA) | 0),
  );
}

/**
 * Lower-triangular L with L·Lᵀ = matrix for a symmetric positive semi-definite matrix.
 *
 * A fitted covariance is often singular or nearly so (a parameter held fixed, two parameters
 * perfectly correlated), and rounding can then leave a pivot at −1e-17 instead of 0. A pivot
 * within 1e-12 of its diagonal entry, either sign, is taken as zero and its column left zero;
 * such a column's remaining Schur-complement entries must vanish too, to within 1e-6 of
 * √(aᵢᵢ·aⱼⱼ) (the Cauchy–Schwarz bound for a pivot of 1e-12 relative). Anything more negative
 * is not a covariance and is refused.
 */
export function choleskyLower(matrix: number[][]): number[][] {
  const n = matrix.length;
  for (let i = 0; i < n; i++) {
    const row = matrix[i];
    if (!Array.isArray(row) || row.length !== n) {
      throw covarianceError(`must be a square matrix (row ${i} has ${row?.length} entries, expected ${n})`);
    }
    for (let j = 0; j < n; j++) {
      if (!Number.isFinite(row[j])) throw covarianceError(`entry [${i}][${j}] is not a finite number`);
    }
  }
  for (let i = 0; i < n; i++) {
    if (matrix[i][i] < 0) throw notSemiDefinite(`diagonal entry [${i}][${i}] = ${matrix[i][i]} is negative`);
    for (let j = 0; j < i; j++) {
      const scale = Math.sqrt(matrix[i][i] * matrix[j][j]);
      if (Math.abs(matrix[i][j] - matrix[j][i]) > 1e-12 * scale) {
        throw covarianceError(`must be symmetric (entries [${i}][${j}] and [${j}][${i}] differ)`);
      }
    }
  }

  const lower: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    const lj = lower[j];
    let pivot = matrix[j][j];
    for (let k = 0; k < j; k++) pivot -= lj[k] * lj[k];
    const tolerance = 1e-12 * matrix[j][j];
    if (pivot > tolerance) {
      const diag = Math.sqrt(pivot);
      lj[j] = diag;
      for (let i = j + 1; i < n; i++) {
        const li = lower[i];
        let sum = matrix[i][j];
        for (let k = 0; k < j; k++) sum -= li[k] * lj[k];
        li[j] = sum / diag;
      }
    } else if (pivot >= -tolerance) {
      for (let i = j + 1; i < n; i++) {
        const li = lower[i];
        let residual = matrix[i][j];
        for (let k = 0; k < j; k++) residual -= li[k] * lj[k];
        if (Math.abs(residual) > 1e-6 * Math.sqrt(matrix[i][i] * matrix[j][j])) {
          throw notSemiDefinite(`zero pivot ${j} with non-zero coupling to ${i}`);
        }
      }
    } else {
      throw notSemiDefinite(`pivot ${j} = ${pivot} against diagonal ${matrix[j][j]}`);
    }
  }
  return lower;
}

/** `count` draws from N(mean, covariance), each an array of mean.length numbers. */
export function sampleMultivariateNormal(rng: Rng, mean: number[], covariance: number[][], count: number): number[][] {
  const n = mean.length;
  for (let i = 0; i < n; i++) requireFinite(mean[i], 'mean');
  if (covariance.length !== n) throw covarianceError(`must be ${n}×${n} to match the mean (got ${covariance.length} rows)`);
  if (!Number.isSafeInteger(count) || count < 0) {
    throw new InputError(`must be a non-negative integer (got ${count})`, { field: 'count' });
  }
  const lower = choleskyLower(covariance);
  const z = new Float64Array(n);
  const samples: number[][] = new Array<number[]>(count);
  for (let s = 0; s < count; s++) {
    for (let i = 0; i < n; i++) z[i] = rng.normal();
    const draw = new Array<number>(n);
    for (let i = 0; i < n; i++) {
      const li = lower[i];
      let value = mean[i];
      for (let k = 0; k <= i; k++) value += li[k] * z[k];
      draw[i] = value;
    }
    samples[s] = draw;
  }
  return samples;
}

function covarianceError(reason: string): InputError {
  return new InputError(reason, { field: 'covariance' });
}

function notSemiDefinite(detail: string): InputError {
  return covarianceError(`covariance is not positive semi-definite (${detail})`);
}
