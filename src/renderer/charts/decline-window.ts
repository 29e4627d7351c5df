/**
 * The fit window three ways: instants (what fitWell takes), calendar dates in the display zone (the
 * keyboard path: two date inputs) and chart x (a drag on the chart, in epoch ms or produced mass).
 * On the mass basis a chart x becomes the instant of the reading at that produced mass, by binary
 * search over the series (produced mass never decreases with time). Pure (Intl only, no DOM).
 */
import { chartXOfReading, type SeriesColumns, type XAxis } from './decline-data.js';
import type { WindowMs } from './decline-model.js';

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const dateFormats = new Map<string, Intl.DateTimeFormat>();
const partFormats = new Map<string, Intl.DateTimeFormat>();

function cached(map: Map<string, Intl.DateTimeFormat>, zone: string, make: () => Intl.DateTimeFormat): Intl.DateTimeFormat {
  let f = map.get(zone);
  if (f === undefined) {
    f = make();
    map.set(zone, f);
  }
  return f;
}

/** 'YYYY-MM-DD' of an instant in `zone` (the value a date input takes). */
export function dateInZone(ms: number, zone: string): string {
  // en-CA writes dates as YYYY-MM-DD.
  return cached(dateFormats, zone, () => new Intl.DateTimeFormat('en-CA', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit' })).format(ms);
}

/** The zone's offset from UTC at an instant, ms (wall clock − UTC). */
function offsetMs(ms: number, zone: string): number {
  const f = cached(partFormats, zone, () => new Intl.DateTimeFormat('en-US', {
    timeZone: zone, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', second: 'numeric',
  }));
  const p: Record<string, number> = {};
  for (const part of f.formatToParts(ms)) if (part.type !== 'literal') p[part.type] = Number(part.value);
  const wallAsUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour % 24, p.minute, p.second);
  // The parts have whole seconds: compare with the instant floored to its second.
  return wallAsUtc - Math.floor(ms / 1000) * 1000;
}

/** The instant a calendar date starts in `zone` (its local midnight); null for text that is not a date. */
export function dayStartMs(date: string, zone: string): number | null {
  const m = DATE_RE.exec(date.trim());
  if (m === null) return null;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const guess = Date.UTC(y, mo - 1, d);
  const check = new Date(guess);
  if (check.getUTCFullYear() !== y || check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d) return null;
  // Two passes: the offset at the guess, then at the corrected instant (they differ only across a DST change).
  const first = guess - offsetMs(guess, zone);
  const second = guess - offsetMs(first, zone);
  return second;
}

/** The last millisecond of a calendar date in `zone`. */
export function dayEndMs(date: string, zone: string): number | null {
  const m = DATE_RE.exec(date.trim());
  if (m === null || dayStartMs(date, zone) === null) return null;
  const next = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]) + 1));
  const nextText = `${next.getUTCFullYear()}-${String(next.getUTCMonth() + 1).padStart(2, '0')}-${String(next.getUTCDate()).padStart(2, '0')}`;
  const start = dayStartMs(nextText, zone);
  return start === null ? null : start - 1;
}

/** The window as the two date inputs show it ('' for an open end). */
export function windowDates(window: WindowMs, zone: string): { from: string; to: string } {
  return {
    from: window.fromMs === null ? '' : dateInZone(window.fromMs, zone),
    to: window.toMs === null ? '' : dateInZone(window.toMs, zone),
  };
}

/** The window from the two date inputs: from the start of the first day to the end of the last. */
export function windowOfDates(from: string, to: string, zone: string): { window: WindowMs } | { error: string; field: 'from' | 'to' } {
  const fromMs = from.trim() === '' ? null : dayStartMs(from, zone);
  if (fromMs === null && from.trim() !== '') return { error: 'not a date (YYYY-MM-DD)', field: 'from' };
  const toMs = to.trim() === '' ? null : dayEndMs(to, zone);
  if (toMs === null && to.trim() !== '') return { error: 'not a date (YYYY-MM-DD)', field: 'to' };
  if (fromMs !== null && toMs !== null && toMs < fromMs) return { error: 'the window ends before it starts', field: 'to' };
  return { window: { fromMs, toMs } };
}

/** Instant of reading i, ms. */
export function readingMs(series: SeriesColumns, i: number): number {
  return series.epochMs + 1000 * series.timeS[i];
}

/**
 * First index whose key is ≥ value, or > value when `after` (keys non-decreasing; null keys sort
 * first); n when none.
 */
function firstIndex(n: number, key: (i: number) => number | null, value: number, after: boolean): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    const k = key(mid);
    if (k === null || k < value || (after && k === value)) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

const lowerBound = (n: number, key: (i: number) => number | null, value: number): number => firstIndex(n, key, value, false);
/** Last index whose key is ≤ value; -1 when none. */
const upperIndex = (n: number, key: (i: number) => number | null, value: number): number => firstIndex(n, key, value, true) - 1;

/**
 * The window a drag from chart x `a` to `b` chooses (either order). Time axis: those instants,
 * whole milliseconds outward. Mass axis: from the first reading at or past the smaller mass to the
 * last reading at or before the larger one; null when no reading lies between.
 */
export function windowOfChartRange(series: SeriesColumns, axis: XAxis, a: number, b: number): WindowMs | null {
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return null;
  if (axis.basis === 'time') return { fromMs: Math.floor(lo), toMs: Math.ceil(hi) };
  const n = series.timeS.length;
  const key = (i: number): number | null => chartXOfReading(series, axis, i);
  const first = lowerBound(n, key, lo);
  const last = upperIndex(n, key, hi);
  if (first >= n || last < 0 || last < first) return null;
  return { fromMs: readingMs(series, first), toMs: readingMs(series, last) };
}

/**
 * Where the window lies on the chart's x axis, for the shading: an open end is the first or last
 * reading. Mass axis: the produced mass at the first reading in the window and at the last one.
 * Null when the window holds no placeable reading or the series is empty.
 */
export function chartRangeOfWindow(series: SeriesColumns, axis: XAxis, window: WindowMs): [number, number] | null {
  const n = series.timeS.length;
  if (n === 0) return null;
  const time = (i: number): number => readingMs(series, i);
  if (axis.basis === 'time') {
    const from = window.fromMs ?? time(0);
    const to = window.toMs ?? time(n - 1);
    return to >= from ? [from, to] : null;
  }
  let first = window.fromMs === null ? 0 : lowerBound(n, time, window.fromMs);
  let last = window.toMs === null ? n - 1 : upperIndex(n, time, window.toMs);
  // Readings before time zero have no produced mass: step over them.
  while (first <= last && chartXOfReading(series, axis, first) === null) first++;
  while (last >= first && chartXOfReading(series, axis, last) === null) last--;
  if (first > last) return null;
  return [chartXOfReading(series, axis, first) as number, chartXOfReading(series, axis, last) as number];
}

/** ISO 8601 UTC text of an instant, for the request (the contract's `instant()`). */
export function isoOfMs(ms: number): string {
  return new Date(ms).toISOString();
}
