/**
 * A well's stored readings turned into the series a decline fit needs (DOMAIN.md §4):
 * θ = Tprod − Tref against elapsed time or cumulative produced mass, with every reading of the
 * window kept and marked included or excluded (not producing, flagged 'bad'/'spike', no production
 * temperature, before time zero), so a fit can say what it left out and why.
 *
 * Produced mass, the rule (a choice, stated so it can be checked): the flow is taken as piecewise
 * constant, each reading standing for the interval since the reading before it (or since time zero
 * for the first one), because an operator's weekly entry reports the week that led to it — a
 * shut-in reading says the well was shut in that week. So
 *   M(t_k) = Σ_{j ≤ k} ṁ_j · (t_j − t_{j−1})  over readings j that are producing with a flow,
 * an interval ending in a shut-in or test reading counts zero, and an interval ending in a
 * producing reading without a flow counts zero too (reported as skipped). Readings flagged
 * 'bad' or 'spike' are not trusted for their flow either: they are left out of the flow history,
 * so the next trusted reading stands for the whole interval since the last trusted one.
 * A reading's mass between two trusted readings is M of the first plus ṁ of the second times the
 * time since the first.
 *
 * Exported API:
 *   PRODUCED_MASS_RULE: string
 *   interface SeriesReading { id; timeMs; productionTemperatureC; normalisedMassFlowKgPerS; status; flags }
 *   isFlaggedOut(flags): boolean
 *   buildWellSeries(history, options): WellSeries     history: live readings in time order
 *   producedMassAt(history, originMs, timesMs): { massKg: Float64Array; counted; skipped }
 *   meanFlowOverYear(history, endMs): { meanKgPerS: number | null; readings: number }
 */
import type { ExclusionReason, FitCounts } from '../contract/fits.js';
import { FIT_EXCLUDING_FLAGS, type ReadingStatus } from '../contract/reading-rules.js';
import type { Basis } from '../fit/types.js';
import { JULIAN_YEAR_S } from '../units.js';

/** The produced-mass rule above in one line, for the assumptions a fit states. */
export const PRODUCED_MASS_RULE =
  'produced mass M = Σ ṁ·Δt: each producing reading\'s normalised mass flow held over the interval since the reading before it ' +
  '(or since time zero); intervals ending in a shut-in or test reading count zero; readings flagged bad or spike are bridged ' +
  'by the next trusted reading';

export interface SeriesReading {
  id: number;
  timeMs: number;
  productionTemperatureC: number | null;
  normalisedMassFlowKgPerS: number | null;
  status: ReadingStatus;
  flags: readonly string[];
}

export interface WellSeriesOptions {
  basis: Basis;
  referenceTemperatureC: number;
  /** Time zero, epoch ms. */
  originMs: number;
  /** Inclusive window of the fit; the history may reach further back (the mass basis needs it). */
  fromMs?: number;
  toMs?: number;
}

export interface WellSeries {
  basis: Basis;
  originMs: number;
  /** The window's readings, in time order; the arrays below are parallel to it. */
  readings: SeriesReading[];
  /** s after time zero, or kg produced since time zero. */
  x: Float64Array;
  /** θ in K; NaN without a production temperature. */
  theta: Float64Array;
  include: Uint8Array;
  excludedBecause: (ExclusionReason | null)[];
  counts: FitCounts;
  /** Mass basis only. */
  producedMass: { totalKg: number; intervalsCounted: number; intervalsSkipped: number } | null;
  meanMassFlowKgPerS: number | null;
  meanProductionTemperatureC: number | null;
}

export function isFlaggedOut(flags: readonly string[]): boolean {
  return flags.some((f) => FIT_EXCLUDING_FLAGS.includes(f));
}

export function buildWellSeries(history: readonly SeriesReading[], options: WellSeriesOptions): WellSeries {
  const from = options.fromMs ?? -Infinity;
  const to = options.toMs ?? Infinity;
  const readings = history.filter((r) => r.timeMs >= from && r.timeMs <= to);
  const n = readings.length;
  const x = new Float64Array(n);
  const theta = new Float64Array(n);
  const include = new Uint8Array(n);
  const excludedBecause: (ExclusionReason | null)[] = [];
  const counts: FitCounts = { readings: n, included: 0, excludedNotProducing: 0, excludedFlagged: 0, excludedNoTemperature: 0, excludedBeforeTimeZero: 0 };

  let mass: ReturnType<typeof producedMassAt> | null = null;
  if (options.basis === 'mass') mass = producedMassAt(history, options.originMs, readings.map((r) => r.timeMs));

  let flowSum = 0, flowCount = 0, tempSum = 0, tempCount = 0;
  for (let i = 0; i < n; i++) {
    const r = readings[i];
    x[i] = mass === null ? (r.timeMs - options.originMs) / 1000 : mass.massKg[i];
    theta[i] = r.productionTemperatureC === null ? NaN : r.productionTemperatureC - options.referenceTemperatureC;
    let why: ExclusionReason | null = null;
    if (r.timeMs < options.originMs) { why = 'before-time-zero'; counts.excludedBeforeTimeZero++; }
    else if (r.status !== 'producing') { why = 'not-producing'; counts.excludedNotProducing++; }
    else if (isFlaggedOut(r.flags)) { why = 'flagged'; counts.excludedFlagged++; }
    else if (r.productionTemperatureC === null) { why = 'no-temperature'; counts.excludedNoTemperature++; }
    excludedBecause.push(why);
    if (why !== null) continue;
    include[i] = 1;
    counts.included++;
    tempSum += r.productionTemperatureC as number;
    tempCount++;
    if (r.normalisedMassFlowKgPerS !== null) { flowSum += r.normalisedMassFlowKgPerS; flowCount++; }
  }
  return {
    basis: options.basis,
    originMs: options.originMs,
    readings,
    x,
    theta,
    include,
    excludedBecause,
    counts,
    producedMass: mass === null ? null : { totalKg: mass.totalKg, intervalsCounted: mass.counted, intervalsSkipped: mass.skipped },
    meanMassFlowKgPerS: flowCount === 0 ? null : flowSum / flowCount,
    meanProductionTemperatureC: tempCount === 0 ? null : tempSum / tempCount,
  };
}

/**
 * Cumulative produced mass since `originMs` at each of `timesMs` (any order), by the rule in the
 * module comment; `totalKg` is the mass at the last trusted reading.
 */
export function producedMassAt(
  history: readonly SeriesReading[], originMs: number, timesMs: readonly number[],
): { massKg: Float64Array; totalKg: number; counted: number; skipped: number } {
  // The trusted flow history from time zero on: times, the flow each stands for (0 = none), and M there.
  const times: number[] = [];
  const flows: number[] = [];
  const cumulative: number[] = [];
  let m = 0, previous = originMs, counted = 0, skipped = 0;
  for (const r of history) {
    if (r.timeMs < originMs || isFlaggedOut(r.flags)) continue;
    const dtS = (r.timeMs - previous) / 1000;
    let flow = 0;
    if (r.status === 'producing') {
      if (r.normalisedMassFlowKgPerS === null) { if (dtS > 0) skipped++; }
      else { flow = r.normalisedMassFlowKgPerS; if (dtS > 0) counted++; }
    }
    m += flow * dtS;
    times.push(r.timeMs);
    flows.push(flow);
    cumulative.push(m);
    previous = r.timeMs;
  }
  const massKg = Float64Array.from(timesMs, (t) => massAt(t, originMs, times, flows, cumulative));
  return { massKg, totalKg: m, counted, skipped };
}

function massAt(t: number, originMs: number, times: number[], flows: number[], cumulative: number[]): number {
  if (t <= originMs || times.length === 0) return 0;
  // First trusted reading at or after t (binary search).
  let lo = 0, hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid] < t) lo = mid + 1;
    else hi = mid;
  }
  if (lo === times.length) return cumulative[times.length - 1];
  if (times[lo] === t) return cumulative[lo];
  const startMs = lo === 0 ? originMs : times[lo - 1];
  const before = lo === 0 ? 0 : cumulative[lo - 1];
  return before + (flows[lo] * (t - startMs)) / 1000;
}

/**
 * Mean normalised mass flow of the producing, trusted readings with a flow in the year
 * (365.25 d) up to and including `endMs`: the default planned flow of a forecast.
 */
export function meanFlowOverYear(history: readonly SeriesReading[], endMs: number): { meanKgPerS: number | null; readings: number } {
  const startMs = endMs - JULIAN_YEAR_S * 1000;
  let sum = 0, count = 0;
  for (const r of history) {
    if (r.timeMs <= startMs || r.timeMs > endMs) continue;
    if (r.status !== 'producing' || isFlaggedOut(r.flags) || r.normalisedMassFlowKgPerS === null) continue;
    sum += r.normalisedMassFlowKgPerS;
    count++;
  }
  return { meanKgPerS: count === 0 ? null : sum / count, readings: count };
}
