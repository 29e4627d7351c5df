/**
 * The decline chart's data, built from a well's columnar series (contract/overview.ts wellSeries):
 * the chart axes in display units, and one {x, y} array per dataset, made once from the columns.
 * Pure (no DOM), so that it can be tested and so that a million readings cost one pass each.
 *
 * x on the time basis is epoch milliseconds (chart.js time axis); on the mass basis the produced
 * mass since time zero in the display's mass unit (Mt for SI, Mlb for US customary). y is either the
 * production temperature or θ = T − Tref, in the display's temperature (difference) unit; both are
 * linear in θ, so one map `shown = a·θ + b` serves readings, fitted curves and bands alike.
 */
import type { Basis } from '../../shared/fit/types.js';
import type { Display } from '../app/display.js';

export interface Point { x: number; y: number }

/**
 * What the chart reads of a well's series: wellSeries's wire form (arrays with null where a value is
 * missing) or chartSeries decoded (packed-series.ts: typed arrays with NaN there). Either way a
 * value that is null or NaN is missing; read it through `present`.
 */
export interface SeriesColumns {
  basis: Basis;
  /** Epoch of timeS, ms. */
  epochMs: number;
  timeS: ArrayLike<number>;
  /** Basis value: s after time zero, or kg produced since time zero; missing before time zero. */
  x: ArrayLike<number | null>;
  productionTemperatureC: ArrayLike<number | null>;
  /** EXCLUSION_CODES (0 = included). */
  exclusion: ArrayLike<number>;
}

/** A column value that is there: neither null nor NaN. */
export function present(v: number | null): v is number {
  return v !== null && !Number.isNaN(v);
}

export type YQuantity = 'temperature' | 'theta';

/** 1 lb = 0.453 592 37 kg exactly (NIST SP 811, B.8). */
const POUND_KG = 0.45359237;

/** The mass unit of the mass-basis axis: megatonnes (10⁹ kg) or millions of pounds. */
export function massUnit(units: 'si' | 'us'): { label: string; perKg: number } {
  return units === 'si' ? { label: 'Mt', perKg: 1e-9 } : { label: 'Mlb', perKg: 1 / (1e6 * POUND_KG) };
}

/** How a basis value becomes a chart x, and back. */
export type XAxis =
  | { basis: 'time'; originMs: number }
  | { basis: 'mass'; perKg: number; label: string };

/** Chart x of a basis value (s after time zero, or kg). */
export function chartXOfBasis(axis: XAxis, basisValue: number): number {
  return axis.basis === 'time' ? axis.originMs + 1000 * basisValue : basisValue * axis.perKg;
}

/** Basis value (s after time zero, or kg) of a chart x. */
export function basisOfChartX(axis: XAxis, chartX: number): number {
  return axis.basis === 'time' ? (chartX - axis.originMs) / 1000 : chartX / axis.perKg;
}

/** shown = a·θ + b; a reading's θ is T − trefC (trefC = 0 when the well has no Tref and T is shown). */
export interface YMap { quantity: YQuantity; a: number; b: number; trefC: number }

/** Kelvin offset of the Celsius scale (SI Brochure). */
const ZERO_CELSIUS_K = 273.15;

/**
 * The linear map from θ to the shown value, read off the Display's own conversion (so SI/US
 * settings apply) at two points: every temperature scale in use is affine in kelvin.
 */
export function yMap(display: Pick<Display, 'value'>, quantity: YQuantity, trefC: number | null): YMap {
  if (quantity === 'theta') {
    const v0 = display.value('temperatureDifference', 0);
    const a = (display.value('temperatureDifference', 1000) - v0) / 1000;
    return { quantity, a, b: v0, trefC: trefC ?? 0 };
  }
  const t = trefC ?? 0;
  const v0 = display.value('temperature', 0);
  const a = (display.value('temperature', 1000) - v0) / 1000;
  return { quantity, a, b: v0 + a * (t + ZERO_CELSIUS_K), trefC: t };
}

export function shownOfTheta(map: YMap, thetaK: number): number {
  return map.a * thetaK + map.b;
}

export function shownOfCelsius(map: YMap, celsius: number): number {
  return map.a * (celsius - map.trefC) + map.b;
}

/** Chart x of reading i, or null when it cannot be placed (mass basis, before time zero). */
export function chartXOfReading(series: SeriesColumns, axis: XAxis, i: number): number | null {
  if (axis.basis === 'time') return series.epochMs + 1000 * series.timeS[i];
  const kg = series.x[i];
  return !present(kg) || !Number.isFinite(kg) ? null : kg * axis.perKg;
}

export interface ReadingDatasets {
  included: Point[];
  excluded: Point[];
  /** Readings the fit would use (code 0) and those it would leave out, over the whole record. */
  includedCount: number;
  excludedCount: number;
  /** Readings that cannot be drawn: no production temperature, or no place on the mass axis. */
  notDrawn: number;
}

/**
 * The readings as two point arrays. A first pass counts, so each array is allocated once at its
 * final length (growing a million-entry array by push leaves its smaller copies to the collector).
 */
export function readingDatasets(series: SeriesColumns, axis: XAxis, map: YMap): ReadingDatasets {
  const n = series.timeS.length;
  const temps = series.productionTemperatureC;
  const code = series.exclusion;
  const xs = series.x;
  const drawable = (i: number): boolean => present(temps[i]) && (axis.basis === 'time' || Number.isFinite(xs[i]));
  let includedCount = 0;
  let includedDrawn = 0;
  let excludedDrawn = 0;
  for (let i = 0; i < n; i++) {
    if (code[i] === 0) includedCount++;
    if (!drawable(i)) continue;
    if (code[i] === 0) includedDrawn++;
    else excludedDrawn++;
  }
  const included: Point[] = new Array(includedDrawn);
  const excluded: Point[] = new Array(excludedDrawn);
  let a = 0;
  let e = 0;
  const { a: scale, b: offset, trefC } = map;
  for (let i = 0; i < n; i++) {
    if (!drawable(i)) continue;
    const point = { x: chartXOfReading(series, axis, i) as number, y: scale * ((temps[i] as number) - trefC) + offset };
    if (code[i] === 0) included[a++] = point;
    else excluded[e++] = point;
  }
  return { included, excluded, includedCount, excludedCount: n - includedCount, notDrawn: n - includedDrawn - excludedDrawn };
}

/** Index of the latest reading the fit would use that has a production temperature; -1 when none. */
export function latestIncluded(series: SeriesColumns): number {
  for (let i = series.timeS.length - 1; i >= 0; i--) {
    if (series.exclusion[i] === 0 && present(series.productionTemperatureC[i])) return i;
  }
  return -1;
}

/** Chart x of the first and last placeable reading; null for an empty series. */
export function readingsExtent(series: SeriesColumns, axis: XAxis): [number, number] | null {
  const n = series.timeS.length;
  let first: number | null = null;
  let last: number | null = null;
  for (let i = 0; i < n && first === null; i++) first = chartXOfReading(series, axis, i);
  for (let i = n - 1; i >= 0 && last === null; i--) last = chartXOfReading(series, axis, i);
  return first === null || last === null ? null : [first, last];
}

/**
 * Coarser copies of a long x-sorted series for zoomed-out views: each level keeps, of every four
 * points of the level before, the lowest and the highest (in x order), so it halves while keeping
 * every extreme that min-max decimation would draw. The levels hold the same point objects (no new
 * ones); the first level is `points` itself. Stops at `smallest` points.
 */
export function minMaxLevels(points: Point[], smallest = 20_000): Point[][] {
  const levels: Point[][] = [points];
  let prev = points;
  while (prev.length > 2 * smallest) {
    const next: Point[] = [];
    for (let i = 0; i < prev.length; i += 4) {
      const end = Math.min(i + 4, prev.length);
      let lo = i;
      let hi = i;
      for (let j = i + 1; j < end; j++) {
        if (prev[j].y < prev[lo].y) lo = j;
        if (prev[j].y > prev[hi].y) hi = j;
      }
      if (lo === hi) next.push(prev[lo]);
      else if (lo < hi) next.push(prev[lo], prev[hi]);
      else next.push(prev[hi], prev[lo]);
    }
    levels.push(next);
    prev = next;
  }
  return levels;
}

/** How many of x-sorted `points` lie in [min, max] (an undefined end is open), by binary search. */
export function visibleCount(points: readonly Point[], min: number | undefined, max: number | undefined): number {
  const first = (v: number, strict: boolean): number => {
    let lo = 0;
    let hi = points.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (strict ? points[mid].x <= v : points[mid].x < v) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const start = min === undefined ? 0 : first(min, false);
  const end = max === undefined ? points.length : first(max, true);
  return Math.max(0, end - start);
}

/**
 * The coarsest level that still gives at least `perPixel` points to each pixel column of the
 * visible span (level L has about a 2^L-th of the points), so min-max decimation of it draws what
 * decimating every point would, while scanning far fewer.
 */
export function levelFor(levelCount: number, visibleAtFullDetail: number, widthPx: number, perPixel = 16): number {
  if (levelCount <= 1 || !(widthPx > 0)) return 0;
  const spare = visibleAtFullDetail / (perPixel * widthPx);
  return spare < 2 ? 0 : Math.min(levelCount - 1, Math.floor(Math.log2(spare)));
}
