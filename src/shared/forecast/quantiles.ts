/**
 * Exact sample quantiles of many columns of Monte Carlo values, fast.
 *
 * Definition: linear interpolation between order statistics, h = (n − 1)·p,
 * Q(p) = x(⌊h⌋) + (h − ⌊h⌋)·(x(⌊h⌋+1) − x(⌊h⌋)) — Hyndman & Fan (1996) definition 7, NumPy's default,
 * with the same arithmetic as `quantileSorted` in stats/summary.ts but without sorting.
 * +∞ is a legal value (a sample that never reaches a limit) and yields +∞ when it enters the interpolation.
 * Values must not be NaN.
 *
 * Why not sort: a forecast band needs three quantiles of ~4000 values at each of ~121 times; sorting every
 * column costs tens of ms. Adjacent columns differ little, so each wanted order statistic is looked for in
 * a narrow bracket predicted from the previous columns: one branch-free pass counts the values below the
 * bracket and gathers those inside it, and a selection among the few gathered finishes the job. The count
 * proves whether the bracket held the wanted ranks; when it did not, the column is redone by a full
 * selection, so the result is always exact. Columns are fed one at a time, so the caller never has to hold
 * the whole samples × times matrix.
 */

/** Half-width, in ranks, of the bracket carried to the next column; doubled after a miss, shrunk back after hits. */
const RANK_MARGIN = 24;
/** Widening of the predicted bracket, per unit of the last curvature term and of the last step (tuned, not critical). */
const SLACK_PER_BEND = 0.5;
const SLACK_PER_STEP = 0.001;

interface Target {
  k: number;
  frac: number;
  needNext: boolean;
  margin: number;
  /** Bracket for the current column; NaN before the first column. */
  lo: number;
  hi: number;
  previous: number;
  step: number;
  /** Values of the current column inside [lo, hi], and how many lie below lo. */
  buffer: Float64Array;
  count: number;
  below: number;
}

export class StreamingQuantiles {
  /** One array per probability, one entry per column added. */
  readonly out: Float64Array[];
  private readonly n: number;
  private readonly targets: Target[];
  /** Stands in for missing targets in a scan of three; its NaN bracket gathers nothing. */
  private readonly idle: Target;
  private readonly scratch: Float64Array;
  private column = 0;

  constructor(n: number, probabilities: readonly number[], columns: number) {
    if (!Number.isInteger(n) || n < 1) throw new RangeError(`StreamingQuantiles: n must be a positive integer (got ${n})`);
    this.n = n;
    this.out = probabilities.map(() => new Float64Array(columns));
    const target = (p: number): Target => {
      if (!(p >= 0 && p <= 1)) throw new RangeError(`StreamingQuantiles: probability ${p} is outside [0, 1]`);
      const h = (n - 1) * p;
      const k = Math.floor(h);
      const frac = h - k;
      // Rank k + 1 is needed only when it carries weight.
      return {
        k, frac, needNext: frac > 0 && k + 1 < n, margin: RANK_MARGIN, lo: NaN, hi: NaN, previous: NaN, step: NaN,
        buffer: new Float64Array(n), count: 0, below: 0,
      };
    };
    this.targets = probabilities.map(target);
    this.idle = target(0);
    this.scratch = new Float64Array(n);
  }

  /** Takes the next column (its first n values are read, not changed). */
  add(values: Float64Array): void {
    const c = this.column++;
    const ts = this.targets;
    for (let j = 0; j < ts.length; j += 3) scan(values, this.n, ts[j], ts[j + 1] ?? this.idle, ts[j + 2] ?? this.idle);
    for (let j = 0; j < ts.length; j++) this.out[j][c] = this.finish(ts[j], values);
  }

  private finish(t: Target, values: Float64Array): number {
    const n = this.n, k = t.k;
    const last = t.needNext ? k + 1 : k;
    let xk: number, xk1 = NaN, lowEdge: number, highEdge: number;
    const hit = !Number.isNaN(t.lo) && t.below <= k && t.below + t.count > last;
    if (hit) {
      const buffer = t.buffer, count = t.count;
      const r = k - t.below;
      select(buffer, r, 0, count - 1);
      xk = buffer[r];
      if (t.needNext) xk1 = minimum(buffer, r + 1, count - 1);
      // Values `margin` ranks either side, as far as the bracket reached. High side first, while
      // buffer[r] still holds x(k); each selection stays on its own side of r.
      const rh = Math.min(count - 1, r + 1 + t.margin);
      if (rh > r) select(buffer, rh, r, count - 1);
      highEdge = rh > r ? buffer[rh] : xk;
      const rl = Math.max(0, r - t.margin);
      if (rl < r) select(buffer, rl, 0, r);
      lowEdge = rl < r ? buffer[rl] : xk;
    } else {
      const a = this.scratch;
      a.set(values.subarray(0, n));
      select(a, k, 0, n - 1);
      xk = a[k];
      if (t.needNext) xk1 = minimum(a, k + 1, n - 1);
      lowEdge = highEdge = xk;
      if (!Number.isNaN(t.step)) {
        // A miss once the steps are known means the bracket was too tight: widen it, from exact ranks.
        // (In the first two columns the motion is not known yet and the slack below does the work.)
        t.margin = Math.min(n, t.margin * 2);
        const rh = Math.min(n - 1, k + 1 + t.margin);
        if (rh > k) select(a, rh, k, n - 1);
        highEdge = rh === n - 1 ? Infinity : rh > k ? a[rh] : xk;
        const rl = Math.max(0, k - t.margin);
        if (rl < k) select(a, rl, 0, k);
        lowEdge = rl === 0 ? -Infinity : rl < k ? a[rl] : xk;
      }
    }
    // Predict where x(k) goes next by extrapolating its last steps (quadratically once two are known: the
    // curves are smooth), and carry the bracket along, widened by the size of the curvature term itself.
    const step = Number.isFinite(t.previous) && Number.isFinite(xk) ? xk - t.previous : NaN;
    let shift = 0, slack = 0;
    if (!Number.isNaN(step)) {
      // With one step known, extrapolate linearly and allow for a bend as large as the step.
      const bend = Number.isNaN(t.step) ? 0 : step - t.step;
      shift = step + bend;
      slack = SLACK_PER_BEND * Math.abs(Number.isNaN(t.step) ? step : bend) + SLACK_PER_STEP * Math.abs(step);
    }
    if (hit) t.margin = Math.max(RANK_MARGIN, t.margin - (t.margin >> 3));
    t.previous = xk;
    t.step = step;
    t.lo = lowEdge + shift - slack;
    t.hi = highEdge + shift + slack;
    if (Number.isNaN(t.lo)) t.lo = -Infinity;
    if (Number.isNaN(t.hi)) t.hi = Infinity;
    return interpolate(xk, xk1, t.frac, t.needNext);
  }
}

/**
 * One pass over a column for three targets at once, branch-free: a value below a target's lo is counted,
 * one in [lo, hi] kept (v < lo implies v ≤ hi, so "kept" is (v ≤ hi) − (v < lo)). A NaN bracket keeps nothing.
 */
function scan(values: Float64Array, n: number, a: Target, b: Target, c: Target): void {
  const la = a.lo, ha = a.hi, lb = b.lo, hb = b.hi, lc = c.lo, hc = c.hi;
  const ba = a.buffer, bb = b.buffer, bc = c.buffer;
  let na = 0, nb = 0, nc = 0, ka = 0, kb = 0, kc = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    const ia = +(v < la), ib = +(v < lb), ic = +(v < lc);
    na += ia; nb += ib; nc += ic;
    ba[ka] = v; ka += +(v <= ha) - ia;
    bb[kb] = v; kb += +(v <= hb) - ib;
    bc[kc] = v; kc += +(v <= hc) - ic;
  }
  a.below = na; a.count = ka;
  b.below = nb; b.count = kb;
  c.below = nc; c.count = kc;
}

/**
 * Quantiles of `columns` columns of `n` values each, stored column after column in `values`
 * (value i of column c at c·n + i). `values` is left untouched. One array per probability.
 */
export function columnQuantiles(values: Float64Array, columns: number, n: number, probabilities: readonly number[]): Float64Array[] {
  if (values.length < columns * n) throw new RangeError('columnQuantiles: values shorter than columns × n');
  const q = new StreamingQuantiles(n, probabilities, columns);
  for (let c = 0; c < columns; c++) q.add(values.subarray(c * n, (c + 1) * n));
  return q.out;
}

/** NumPy's own arithmetic (as `quantileSorted`), so finite results agree bit for bit. */
function interpolate(xk: number, xk1: number, frac: number, needNext: boolean): number {
  if (!needNext || xk === xk1) return xk; // also keeps ∞ = ∞ from becoming ∞ − ∞
  if (xk1 === Infinity || xk === Infinity) return Infinity;
  const diff = xk1 - xk;
  return frac >= 0.5 ? xk1 - diff * (1 - frac) : xk + diff * frac;
}

function minimum(a: Float64Array, from: number, to: number): number {
  let m = Infinity;
  for (let i = from; i <= to; i++) if (a[i] < m) m = a[i];
  return m;
}

/**
 * Hoare-partition quickselect with a median-of-three pivot: afterwards a[k] holds the value of rank k
 * within a[left..right], everything before it is ≤ and everything after it ≥.
 */
function select(a: Float64Array, k: number, left: number, right: number): void {
  while (right > left) {
    const x = a[left], y = a[(left + right) >> 1], z = a[right];
    const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
    let i = left, j = right;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i]; a[i] = a[j]; a[j] = t;
        i++; j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return;
  }
}
