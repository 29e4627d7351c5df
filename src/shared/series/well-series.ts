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
 *   exclusionOf(timeMs, originMs, status, flaggedOut, hasTemperature): ExclusionReason | null   the exclusion rule
 *   buildWellSeries(history, options): WellSeries     history: live readings in time order
 *   class ProducedMassCounter(originMs)                the produced-mass rule, one reading at a time (no per-reading objects)
 *     add(timeMs, status, flaggedOut, flowKgPerS | null): boolean; massAt(timeMs); totalKg; counted; skipped
 *   producedMassAt(history, originMs, timesMs): { massKg: Float64Array; totalKg; counted; skipped }
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

/** Why a fit leaves a reading out, or null when it enters: the rule of the module comment, in its order. */
export function exclusionOf(timeMs: number, originMs: number, status: string, flaggedOut: boolean, hasTemperature: boolean): ExclusionReason | null {
  if (timeMs < originMs) return 'before-time-zero';
  if (status !== 'producing') return 'not-producing';
  if (flaggedOut) return 'flagged';
  if (!hasTemperature) return 'no-temperature';
  return null;
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
    const why = exclusionOf(r.timeMs, options.originMs, r.status, isFlaggedOut(r.flags), r.productionTemperatureC !== null);
    excludedBecause.push(why);
    if (why === 'before-time-zero') counts.excludedBeforeTimeZero++;
    else if (why === 'not-producing') counts.excludedNotProducing++;
    else if (why === 'flagged') counts.excludedFlagged++;
    else if (why === 'no-temperature') counts.excludedNoTemperature++;
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
 * The produced-mass rule of the module comment, fed one reading at a time in time order (the whole
 * live history, flagged readings included: the counter leaves them out itself), then asked for M at
 * any instant. Keeps three growing Float64Arrays, so a million readings need no object each.
 */
export class ProducedMassCounter {
  /** The trusted flow history from time zero on: times, the flow each stands for (0 = none), and M there; `n` used. */
  private times: Float64Array = new Float64Array(1024);
  private flows: Float64Array = new Float64Array(1024);
  private cumulative: Float64Array = new Float64Array(1024);
  private n = 0;
  private previousMs: number;
  /** M at the last trusted reading. */
  totalKg = 0;
  counted = 0;
  skipped = 0;

  constructor(private readonly originMs: number) {
    this.previousMs = originMs;
  }

  /** True when the reading joined the flow history; then `totalKg` is M at it (what massAt gives for its instant). */
  add(timeMs: number, status: string, flaggedOut: boolean, flowKgPerS: number | null): boolean {
    if (timeMs < this.originMs || flaggedOut) return false;
    const dtS = (timeMs - this.previousMs) / 1000;
    let flow = 0;
    if (status === 'producing') {
      if (flowKgPerS === null) { if (dtS > 0) this.skipped++; }
      else { flow = flowKgPerS; if (dtS > 0) this.counted++; }
    }
    this.totalKg += flow * dtS;
    if (this.n === this.times.length) this.grow();
    this.times[this.n] = timeMs;
    this.flows[this.n] = flow;
    this.cumulative[this.n] = this.totalKg;
    this.n++;
    this.previousMs = timeMs;
    return true;
  }

  /** M at `t`: at a trusted reading its own M; between two, M of the first plus ṁ of the second times the time since. */
  massAt(t: number): number {
    const { times, flows, cumulative, originMs, n } = this;
    if (t <= originMs || n === 0) return 0;
    // First trusted reading at or after t (binary search).
    let lo = 0, hi = n;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (times[mid] < t) lo = mid + 1;
      else hi = mid;
    }
    if (lo === n) return cumulative[n - 1];
    if (times[lo] === t) return cumulative[lo];
    const startMs = lo === 0 ? originMs : times[lo - 1];
    const before = lo === 0 ? 0 : cumulative[lo - 1];
    return before + (flows[lo] * (t - startMs)) / 1000;
  }

  private grow(): void {
    const bigger = (a: Float64Array): Float64Array => {
      const b = new Float64Array(a.length * 2);
      b.set(a);
      return b;
    };
    this.times = bigger(this.times);
    this.flows = bigger(this.flows);
    this.cumulative = bigger(this.cumulative);
  }
}

/**
 * Cumulative produced mass since `originMs` at each of `timesMs` (any order), by the rule in the
 * module comment; `totalKg` is the mass at the last trusted reading.
 */
export function producedMassAt(
  history: readonly SeriesReading[], originMs: number, timesMs: readonly number[],
): { massKg: Float64Array; totalKg: number; counted: number; skipped: number } {
  const counter = new ProducedMassCounter(originMs);
  for (const r of history) counter.add(r.timeMs, r.status, isFlaggedOut(r.flags), r.normalisedMassFlowKgPerS);
  const massKg = Float64Array.from(timesMs, (t) => counter.massAt(t));
  return { massKg, totalKg: counter.totalKg, counted: counter.counted, skipped: counter.skipped };
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
