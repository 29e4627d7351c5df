/**
 * Fits of one well from its stored readings, each stored with the fingerprint of the data it used,
 * and whether the latest stored fit is still current. Computing a fit and storing it are two steps
 * (computeFit, storeFit) so that a view (fieldOverview) can run the same fit without leaving a record.
 */
import { FIT_STATUS_REQUEST, FIT_WELL_REQUEST, type FitPoint, type FitStatusResponse, type FitWellRequest, type FitWellResponse, type ModelChoice } from '../../shared/contract/fits.js';
import { instantMs, isoOf, validate } from '../../shared/contract/schema.js';
import type { WellRef } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import { fitAuto, fitDecline, type DeclineSeries } from '../../shared/fit/fit.js';
import type { AutoFitResult, Basis, FitResult } from '../../shared/fit/types.js';
import { PRODUCED_MASS_RULE, buildWellSeries, type SeriesReading, type WellSeries } from '../../shared/series/well-series.js';
import type { Well } from '../db/wells.js';
import type { ServiceContext } from './context.js';
import { FitStore, dataFingerprint, engineVersion, resultJsonText, type StoredFit } from './fit-store.js';
import { wellInfo } from './views.js';

/** What a fit of a well starts from: its readings as a series, and the fingerprint of that data. */
export interface PreparedSeries {
  well: Well;
  referenceTemperatureC: number;
  originMs: number;
  originSource: 'production-start' | 'first-reading';
  /** Live readings from the start of the log to the window's end, in time order. */
  history: readonly SeriesReading[];
  series: WellSeries;
  fingerprint: string;
  windowFromMs: number | null;
  windowToMs: number | null;
}

/** Time zero of a well's fits and series: its production start if set, else its first live reading. */
export function timeOriginOf(well: Well, firstLiveMs: number): { originMs: number; originSource: 'production-start' | 'first-reading' } {
  return well.productionStartMs === null
    ? { originMs: firstLiveMs, originSource: 'first-reading' }
    : { originMs: well.productionStartMs, originSource: 'production-start' };
}

/** The readings a fit of a well would use and the fingerprint of that data, before any series is built. */
interface SelectedReadings {
  referenceTemperatureC: number;
  originMs: number;
  originSource: 'production-start' | 'first-reading';
  history: readonly SeriesReading[];
  fingerprint: string;
}

/**
 * The checks of a fit and the data it reads (prepareSeries without the series): fitStatus needs
 * only the fingerprint, and on a million readings building the series would double its cost.
 * `liveReadings` as for prepareSeries.
 */
function selectReadings(
  ctx: ServiceContext, well: Well, basis: Basis, windowFromMs: number | null, windowToMs: number | null, liveReadings?: readonly SeriesReading[],
): SelectedReadings {
  if (well.kind !== 'production') {
    throw new InputError(`${well.name} is an injection well; decline fits are made of production wells`, { field: 'well' });
  }
  const tref = well.referenceTemperatureC;
  if (tref === null) {
    throw new InputError(`${well.name} has no reference temperature Tref for θ = T − Tref; set the well's referenceTemperatureC first`, { field: 'referenceTemperatureC' });
  }
  if (windowFromMs !== null && windowToMs !== null && windowFromMs > windowToMs) {
    throw new InputError(`the window ends (${isoOf(windowToMs)}) before it starts (${isoOf(windowFromMs)})`, { field: 'to' });
  }
  const history = liveReadings === undefined
    ? ctx.readings.listSeriesLive(well.id, windowToMs ?? undefined)
    : liveReadings.filter((r) => windowToMs === null || r.timeMs <= windowToMs);
  if (history.length === 0) throw new InputError(`${well.name} has no readings${windowToMs === null ? '' : ` up to ${isoOf(windowToMs)}`}`, { field: 'well' });
  const { originMs, originSource } = timeOriginOf(well, history[0].timeMs);
  // The window's readings (the series's own, buildWellSeries in src/shared/series/well-series.ts).
  const inWindow = windowFromMs === null ? history : history.filter((r) => r.timeMs >= windowFromMs);
  if (inWindow.length === 0) {
    throw new InputError(`${well.name} has no readings from ${windowFromMs === null ? 'the start' : isoOf(windowFromMs)} to ${windowToMs === null ? 'the end' : isoOf(windowToMs)}`, { field: 'from' });
  }
  // The mass basis reads the flow history from time zero on; the time basis only the window.
  const used = basis === 'mass' ? history : inWindow;
  const fingerprint = dataFingerprint({ wellId: well.id, referenceTemperatureC: tref, originMs, basis, windowFromMs, windowToMs, readings: used });
  return { referenceTemperatureC: tref, originMs, originSource, history, fingerprint };
}

/** `liveReadings`: all the well's live readings in time order, when the caller has read them already (the overview). */
export function prepareSeries(
  ctx: ServiceContext, well: Well, basis: Basis, windowFromMs: number | null, windowToMs: number | null, liveReadings?: readonly SeriesReading[],
): PreparedSeries {
  const { referenceTemperatureC, originMs, originSource, history, fingerprint } = selectReadings(ctx, well, basis, windowFromMs, windowToMs, liveReadings);
  const series = buildWellSeries(history, {
    basis, referenceTemperatureC, originMs,
    ...(windowFromMs !== null ? { fromMs: windowFromMs } : {}),
    ...(windowToMs !== null ? { toMs: windowToMs } : {}),
  });
  return { well, referenceTemperatureC, originMs, originSource, history, series, fingerprint, windowFromMs, windowToMs };
}

/** A fit as computed, before it is stored: all that fitWell answers but the stored record. */
export type ComputedFit = Omit<FitWellResponse, 'stored'>;

export interface FitRun {
  response: ComputedFit;
  prepared: PreparedSeries;
}

export function fitServices(ctx: ServiceContext) {
  const store = new FitStore(ctx.fdb);

  /**
   * The one fit of a well: fitWell and forecastWell store its result with storeFit; fieldOverview
   * does not store it (only an explicit fit leaves a record). `req` is already checked;
   * `liveReadings` as for prepareSeries.
   */
  function computeFit(req: FitWellRequest, liveReadings?: readonly SeriesReading[]): FitRun {
    const { well } = ctx.well(req);
    const basis = req.basis ?? 'time';
    const model: ModelChoice = req.model ?? 'exponential';
    const fromMs = req.from === undefined ? null : instantMs(req.from);
    const toMs = req.to === undefined ? null : instantMs(req.to);
    const prepared = prepareSeries(ctx, well, basis, fromMs, toMs, liveReadings);
    const s = prepared.series;
    const decline: DeclineSeries = { basis, x: s.x, theta: s.theta, include: s.include };
    const fitted = model === 'auto' ? fitAuto(decline) : fitDecline(decline, model);
    const fit = req.residuals === false ? withoutResiduals(fitted) : fitted;
    const points: FitPoint[] = req.points === false ? [] : s.readings.map((r, i) => ({
      readingId: r.id,
      time: isoOf(r.timeMs),
      x: s.x[i],
      thetaK: Number.isFinite(s.theta[i]) ? s.theta[i] : null,
      included: s.include[i] === 1,
      excludedBecause: s.excludedBecause[i],
    }));
    const response: ComputedFit = {
      well: wellInfo(ctx, well),
      model,
      basis,
      window: { from: prepared.windowFromMs === null ? null : isoOf(prepared.windowFromMs), to: prepared.windowToMs === null ? null : isoOf(prepared.windowToMs) },
      timeOrigin: isoOf(prepared.originMs),
      timeOriginSource: prepared.originSource,
      referenceTemperatureC: prepared.referenceTemperatureC,
      fit,
      points,
      counts: s.counts,
      meanMassFlowKgPerS: s.meanMassFlowKgPerS,
      meanProductionTemperatureC: s.meanProductionTemperatureC,
      producedMass: s.producedMass === null ? null : { ...s.producedMass, rule: PRODUCED_MASS_RULE },
      assumptions: fitAssumptions(prepared),
    };
    return { response, prepared };
  }

  /** Stores a computed fit with the fingerprint of its data; the response gains the stored record. */
  function storeFit(run: FitRun): FitWellResponse {
    const { response, prepared } = run;
    const stored = store.insert({
      wellId: prepared.well.id, model: response.model, basis: response.basis, windowFromMs: prepared.windowFromMs, windowToMs: prepared.windowToMs,
      resultJson: resultJsonText(withoutResiduals(response.fit)), fingerprint: prepared.fingerprint, engineVersion: engineVersion(), createdMs: ctx.now(),
    });
    const { assumptions, ...rest } = response;
    return {
      ...rest,
      stored: { fitId: stored.id, fingerprint: stored.fingerprint, engineVersion: stored.engineVersion, createdAt: isoOf(stored.createdMs) },
      assumptions,
    };
  }

  return {
    computeFit,
    storeFit,
    /** The latest stored fit of a well, or undefined. */
    latestStored: (wellId: number): StoredFit | undefined => store.latest(wellId),

    fitWell(request: FitWellRequest): FitWellResponse {
      return storeFit(computeFit(validate(FIT_WELL_REQUEST, request)));
    },

    fitStatus(request: WellRef): FitStatusResponse {
      const { well } = ctx.well(validate(FIT_STATUS_REQUEST, request));
      const latest = store.latest(well.id);
      if (latest === undefined) {
        return { well: wellInfo(ctx, well), latest: null, currentFingerprint: null, stale: null, engineChanged: null, message: `no fit of ${well.name} is stored yet` };
      }
      let current: string | null = null;
      let problem = '';
      try {
        current = selectReadings(ctx, well, latest.basis, latest.windowFromMs, latest.windowToMs).fingerprint;
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        problem = e.reason;
      }
      const stale = current !== latest.fingerprint;
      const engineChanged = latest.engineVersion !== engineVersion();
      const when = isoOf(latest.createdMs);
      const message = current === null
        ? `the fit of ${when} cannot be repeated now: ${problem}`
        : stale
          ? `stale: the readings (or Tref, time zero) of ${well.name} changed since the fit of ${when}; fit again`
          : `current: the fit of ${when} used the readings as they are now${engineChanged ? ` (made by ${latest.engineVersion}, this is ${engineVersion()})` : ''}`;
      return {
        well: wellInfo(ctx, well),
        latest: {
          fitId: latest.id, fingerprint: latest.fingerprint, engineVersion: latest.engineVersion, createdAt: when,
          model: latest.model, basis: latest.basis,
          window: { from: latest.windowFromMs === null ? null : isoOf(latest.windowFromMs), to: latest.windowToMs === null ? null : isoOf(latest.windowToMs) },
        },
        currentFingerprint: current,
        stale,
        engineChanged,
        message,
      };
    },
  };
}

const NONE = new Float64Array(0);

/**
 * A fit without its per-point x and residuals (nor its candidates'): what a stored record keeps,
 * and what a response gives on `residuals: false`. They follow from the readings the fingerprint
 * names and the fitted parameters, and on a million readings they are a hundred megabytes.
 */
export function withoutResiduals<T extends FitResult>(fit: T): T {
  const out = { ...fit, x: NONE, residuals: NONE };
  if ('candidates' in fit) (out as unknown as AutoFitResult).candidates = (fit as unknown as AutoFitResult).candidates.map((c) => withoutResiduals(c));
  return out;
}

function fitAssumptions(p: PreparedSeries): string[] {
  const s = p.series;
  const c = s.counts;
  const out = [
    `θ = Tprod − Tref with Tref = ${p.referenceTemperatureC} °C, the well's reference temperature`,
    `time zero ${isoOf(p.originMs)}: ${p.originSource === 'production-start' ? "the well's production start" : 'its first reading (no production start is set)'}`,
    `${c.included} of ${c.readings} readings fitted; left out (kept in the log): ${c.excludedNotProducing} not producing, ${c.excludedFlagged} flagged bad or spike, ` +
      `${c.excludedNoTemperature} without a production temperature, ${c.excludedBeforeTimeZero} before time zero`,
  ];
  if (s.producedMass !== null) {
    out.push(PRODUCED_MASS_RULE);
    if (s.producedMass.intervalsSkipped > 0) out.push(`${s.producedMass.intervalsSkipped} producing intervals had no flow logged and count zero produced mass`);
    const first = p.history.find((r) => r.timeMs >= p.originMs);
    if (first !== undefined && first.timeMs > p.originMs) {
      out.push(`the mass produced between the production start and the first reading (${isoOf(first.timeMs)}) is counted at that reading's flow`);
    }
  }
  return out;
}
