/**
 * Thinning a long series for print: a page is about 650 px wide, so a chart of a million readings
 * shows no more than a chart of two thousand — provided the extremes survive. Min–max decimation
 * keeps, in each of n/2 equal buckets of consecutive points, the lowest and the highest value (in
 * time order), so every spike and every dip of the log is still drawn.
 */

export interface XYSeries {
  /** Abscissa of each point (epoch ms, or a basis value), ascending. */
  x: number[];
  y: number[];
}

/**
 * At most `maxPoints` points of (x, y): all of them when there are few enough, else the min and
 * max of each bucket. Points whose y is null or not finite are dropped first.
 */
export function minMaxDecimate(x: ArrayLike<number>, y: ArrayLike<number | null>, maxPoints: number): XYSeries {
  const candidates: number[] = [];
  for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i])) candidates.push(i);
  const keep = minMaxIndices(y, candidates, maxPoints);
  return { x: keep.map((i) => x[i]), y: keep.map((i) => y[i] as number) };
}

/**
 * The same choice as indices: of `candidates` (ascending indices into `y`), those whose y is finite,
 * all of them when at most `maxPoints`, else the min and max of each of maxPoints/2 buckets. Ascending.
 */
export function minMaxIndices(y: ArrayLike<number | null>, candidates: readonly number[], maxPoints: number): number[] {
  const usable = candidates.filter((i) => {
    const v = y[i];
    return v !== null && Number.isFinite(v);
  });
  const n = usable.length;
  const limit = Math.max(2, Math.floor(maxPoints));
  if (n <= limit) return usable;
  const buckets = Math.floor(limit / 2);
  const value = (k: number): number => y[usable[k]] as number;
  const out: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    let lo = start;
    let hi = start;
    for (let k = start + 1; k < end; k++) {
      if (value(k) < value(lo)) lo = k;
      if (value(k) > value(hi)) hi = k;
    }
    out.push(usable[Math.min(lo, hi)]);
    if (hi !== lo) out.push(usable[Math.max(lo, hi)]);
  }
  return out;
}
