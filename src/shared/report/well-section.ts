/**
 * One well's part of a report: the headline a manager reads first, the decline chart's data (the
 * readings thinned for print; the fitted curve, P10–P90 band and limit from the forecast record),
 * the residuals, the model comparison (the forecast's candidates), the reservoir parameters, the
 * data quality, and the plain statement that replaces what cannot be shown.
 * Built from the wire form of forecastWell (points: false), wellSeries and listReservoirVersions.
 */
import type { Wire } from '../contract/channels.js';
import type { ForecastWellResponse, ModelChoice } from '../contract/fits.js';
import type { FieldOverview, WellSeriesResponse } from '../contract/overview.js';
import type { ListReservoirVersionsResponse } from '../contract/reservoirs.js';
import type { WellInfo, WellKind } from '../contract/wells.js';
import type { Basis, DeclineModel, FitResult } from '../fit/types.js';
import type { RechargeVerdict } from '../forecast/recharge.js';
import { JULIAN_YEAR_S } from '../units.js';
import { dataQuality, type QualitySummary } from './data-quality.js';
import { minMaxDecimate, minMaxIndices } from './decimate.js';
import { fin, iso } from './numbers.js';
import { reservoirSummary, type ReservoirSummary } from './reservoir-section.js';

export type { ExcludedPeriod, QualitySummary } from './data-quality.js';
export type { ReservoirSummary } from './reservoir-section.js';

/** Exact offset of the Celsius scale (SI Brochure). */
const ZERO_CELSIUS_K = 273.15;
/** Print budgets: a chart about 650 px wide shows no more (see decimate.ts). */
export const PRINT_POINTS = { included: 1600, excluded: 400, residuals: 2000, output: 2000 } as const;

export interface WellSources {
  well: Wire<WellInfo>;
  /** forecastWell with points: false; null when it refused (see `refused`). */
  forecast: Wire<ForecastWellResponse> | null;
  /** The reason forecastWell gave for refusing (an InputError's), or null. */
  refused: string | null;
  series: Wire<WellSeriesResponse> | null;
  reservoirVersions: Wire<ListReservoirVersionsResponse> | null;
  /** Why this model, basis and window were used (the latest stored fit's, or auto on the time basis). */
  choice: { model: ModelChoice; basis: Basis; why: string };
}

export type Interval = { value: number | null; ci95: [number | null, number | null] };

export type WellStatus = 'ok' | 'no-readings' | 'too-few-points' | 'not-converged' | 'refused';

/** The latest reading the fit could use (inside its window), with θ = T − Tref. */
export interface LatestReading {
  time: string;
  productionTemperatureC: number;
  thetaK: number | null;
}

export interface Headline {
  /** Fitted τ in s; on the mass basis Mc/ṁ at the mean flow of the fit window, with Mc beside it. */
  tau: { basis: Basis; valueS: number | null; ci95S: [number | null, number | null]; massKg: Interval | null; atFlowKgPerS: number | null } | null;
  theoryTauS: number | null;
  recharge: {
    fraction: Interval; ratio: Interval; verdict: RechargeVerdict; interpretation: string;
    heatFlowW: Interval; backgroundW: number | null;
  } | null;
  /** Why there is no recharge estimate, when there is none. */
  rechargeMissing: string | null;
  endOfLife: {
    p90: string | null; p50: string | null; p10: string | null;
    /** Where the best-fit curve itself reaches the limit. */
    central: string | null;
    /** Years from the latest reading (as the field overview counts them): 0 once reached, null beyond the horizon. */
    yearsFromLatest: { p90: number | null; p50: number | null; p10: number | null };
    alreadyReached: boolean;
    fractionReachedWithinHorizon: number | null;
    now: string;
    horizonEnd: string;
  };
  remainingHeatJ: { p90: number | null; p50: number | null; p10: number | null; toHorizon: boolean } | null;
  currentPowerW: number | null;
  plannedFlow: { valueKgPerS: number | null; note: string };
  specificHeat: { valueJPerKgK: number | null; note: string };
  limit: { text: string; thetaEconK: number | null; productionTemperatureK: number | null };
}

/**
 * The readings the decline chart draws, in the columns of wellSeries (so the screen's chart builders
 * in src/renderer/charts take them as they are): at most PRINT_POINTS.included readings the fit would
 * use and PRINT_POINTS.excluded it would leave out, min–max per bucket of production temperature.
 */
export interface ReportSeries {
  basis: Basis;
  epochMs: number;
  timeS: number[];
  x: (number | null)[];
  productionTemperatureC: (number | null)[];
  exclusion: number[];
  timeOrigin: string | null;
  referenceTemperatureC: number | null;
  /** Live readings of the well, and how many of them are drawn. */
  readings: number;
  drawn: number;
}

export interface ResidualChartData {
  /** The fit's basis: x in s after time zero, or in kg produced since time zero (as the chart's x axis). */
  basis: Basis;
  x: number[];
  /** θobs − θfit, K. */
  y: number[];
  /** Residuals of the fit, of which x and y hold at most PRINT_POINTS.residuals (min–max per bucket). */
  points: number;
}

/** Which stored fit the well's pages come from, and why that model, basis and window. */
export interface FitSummary {
  fitId: number;
  fingerprint: string;
  createdAt: string;
  engineVersion: string;
  modelChoice: ModelChoice;
  model: DeclineModel;
  basis: Basis;
  why: string;
  window: { from: string | null; to: string | null };
}

export interface WellReport {
  well: { id: number; name: string; field: string; kind: WellKind; reservoir: string | null; referenceTemperatureC: number | null; productionStart: string | null };
  /** Running header of the well's pages. */
  header: string;
  status: WellStatus;
  /** What cannot be shown and why, in plain words; null when everything is there. */
  statement: string | null;
  latest: LatestReading | null;
  headline: Headline | null;
  fit: FitSummary | null;
  /**
   * forecastWell's response as the screens receive it, less the per-reading arrays (fit points, the
   * fit's x and residuals, also of each candidate): those are in `series` and `residuals`, thinned.
   * The chart's curve, band and limit and the model comparison table are drawn from it.
   */
  forecast: Wire<ForecastWellResponse> | null;
  series: ReportSeries | null;
  residuals: ResidualChartData | null;
  reservoir: ReservoirSummary | null;
  reservoirStatement: string | null;
  quality: QualitySummary;
  assumptions: string[];
  notes: string[];
}

export function buildWellReport(src: WellSources, overview: Wire<FieldOverview> | null): WellReport {
  const w = src.well;
  const f = src.forecast;
  const s = src.series;
  const row = overview?.wells.find((o) => o.well.id === w.id) ?? null;
  const status = statusOf(src);
  const report: WellReport = {
    well: { id: w.id, name: w.name, field: w.field, kind: w.kind, reservoir: w.reservoir, referenceTemperatureC: w.referenceTemperatureC, productionStart: w.productionStart },
    header: `well ${w.name} · ${w.field}`,
    status: status.status,
    statement: status.statement,
    latest: s === null ? null : latestReading(s, f),
    headline: null,
    fit: null,
    forecast: f === null ? null : trimmed(f),
    series: s === null || s.count === 0 ? null : printSeries(s),
    residuals: null,
    reservoir: null,
    reservoirStatement: null,
    quality: dataQuality(s, f, row),
    assumptions: f?.assumptions ?? [],
    notes: f?.forecast.notes ?? [],
  };
  if (f === null) return report;
  report.fit = {
    fitId: f.fit.stored.fitId, fingerprint: f.fit.stored.fingerprint, createdAt: f.fit.stored.createdAt, engineVersion: f.fit.stored.engineVersion,
    modelChoice: f.fit.model, model: f.fit.fit.model, basis: f.fit.basis, why: src.choice.why, window: f.fit.window,
  };
  report.reservoir = reservoirSummary(f, src.reservoirVersions);
  report.reservoirStatement = report.reservoir !== null ? null
    : w.reservoir === null ? `${w.name} belongs to no reservoir: there are no parameters to compare the decline with.`
      : `The reservoir ${w.reservoir} has no parameter version yet: no theoretical τ and no recharge estimate.`;
  if (status.status !== 'ok') return report;
  report.headline = headline(f, s);
  report.residuals = residualChart(f);
  return report;
}

function statusOf(src: WellSources): { status: WellStatus; statement: string | null } {
  const name = src.well.name;
  if (src.series !== null && src.series.count === 0) {
    return { status: 'no-readings', statement: `No readings of ${name} have been logged yet: there is nothing to fit or forecast.` };
  }
  const f = src.forecast;
  if (f === null) {
    const why = (src.refused ?? 'the forecast could not be made').replace(/\.$/, '');
    if (/has no readings/.test(why)) return { status: 'no-readings', statement: `No readings of ${name} to fit: ${why}.` };
    return { status: 'refused', statement: `No forecast for ${name}: ${why}.` };
  }
  const fit = f.fit.fit;
  if (fit.status === 'too-few-points') {
    return { status: 'too-few-points', statement: `Too few readings to fit a decline to ${name}: ${fit.message}. The readings are shown; no forecast is made.` };
  }
  if (!fit.converged || fit.status !== 'converged') {
    return { status: 'not-converged', statement: `The fit did not converge: ${fit.message !== '' ? fit.message : `status ${fit.status}`}. No forecast is made from it.` };
  }
  if (f.forecast.status !== 'ok') return { status: 'not-converged', statement: `No forecast: ${f.forecast.message}.` };
  return { status: 'ok', statement: null };
}

function latestReading(s: Wire<WellSeriesResponse>, f: Wire<ForecastWellResponse> | null): LatestReading | null {
  const last = fittedIndices(s, f).filter((i) => s.productionTemperatureC[i] !== null).at(-1);
  if (last === undefined) return null;
  const c = s.productionTemperatureC[last] as number;
  const tref = f?.fit.referenceTemperatureC ?? s.referenceTemperatureC;
  return { time: iso(s.epochMs + 1000 * s.timeS[last]), productionTemperatureC: c, thetaK: tref === null ? null : c - tref };
}

/** The response less its per-reading arrays (see WellReport.forecast). */
function trimmed(f: Wire<ForecastWellResponse>): Wire<ForecastWellResponse> {
  type WireFit = Wire<FitResult> & { candidates?: Wire<FitResult>[] };
  const fit = f.fit.fit as WireFit;
  const bare = (c: Wire<FitResult>): Wire<FitResult> => ({ ...c, x: [], residuals: [] });
  const lean: WireFit = { ...bare(fit), ...(fit.candidates !== undefined ? { candidates: fit.candidates.map(bare) } : {}) };
  return { ...f, fit: { ...f.fit, points: [], fit: lean as Wire<ForecastWellResponse>['fit']['fit'] } };
}

/** Instants of the series, epoch ms. */
function timesOf(s: Wire<WellSeriesResponse>): number[] {
  return s.timeS.map((t) => s.epochMs + 1000 * t);
}

function inWindow(ms: number, window: { from: string | null; to: string | null } | undefined): boolean {
  if (window === undefined) return true;
  return (window.from === null || ms >= Date.parse(window.from)) && (window.to === null || ms <= Date.parse(window.to));
}

/** Indices of the readings the fit used: included by the rule, inside its window, in time order. */
function fittedIndices(s: Wire<WellSeriesResponse>, f: Wire<ForecastWellResponse> | null): number[] {
  const times = timesOf(s);
  const out: number[] = [];
  for (let i = 0; i < s.count; i++) if (s.exclusion[i] === 0 && inWindow(times[i], f?.fit.window)) out.push(i);
  return out;
}

function printSeries(s: Wire<WellSeriesResponse>): ReportSeries {
  const included: number[] = [];
  const excluded: number[] = [];
  for (let i = 0; i < s.count; i++) (s.exclusion[i] === 0 ? included : excluded).push(i);
  const keep = [
    ...minMaxIndices(s.productionTemperatureC, included, PRINT_POINTS.included),
    ...minMaxIndices(s.productionTemperatureC, excluded, PRINT_POINTS.excluded),
  ].sort((a, b) => a - b);
  return {
    basis: s.basis,
    epochMs: s.epochMs,
    timeS: keep.map((i) => s.timeS[i]),
    x: keep.map((i) => s.x[i]),
    productionTemperatureC: keep.map((i) => s.productionTemperatureC[i]),
    exclusion: keep.map((i) => s.exclusion[i]),
    timeOrigin: s.timeOrigin,
    referenceTemperatureC: s.referenceTemperatureC,
    readings: s.count,
    drawn: keep.length,
  };
}

function residualChart(f: Wire<ForecastWellResponse>): ResidualChartData | null {
  const fit = f.fit.fit;
  if (fit.residuals.length === 0) return null;
  const d = minMaxDecimate(fit.x.map((v) => v ?? NaN), fit.residuals, PRINT_POINTS.residuals);
  return { basis: fit.basis, x: d.x, y: d.y, points: fit.residuals.length };
}

function headline(f: Wire<ForecastWellResponse>, s: Wire<WellSeriesResponse> | null): Headline {
  const r = f.fit;
  const fc = f.forecast;
  const originMs = Date.parse(r.timeOrigin);
  const tref = r.referenceTemperatureC;
  const at = (sec: number | null): string | null => (fin(sec) === null ? null : iso(originMs + 1000 * (sec as number)));
  const now = fin(fc.nowTimeS) ?? 0;
  const latestMs = s === null || s.count === 0 ? originMs + 1000 * now : s.epochMs + 1000 * s.timeS[s.count - 1];
  const fromLatest = (sec: number | null): number | null => {
    if (fc.endOfLife.alreadyReached) return 0;
    return fin(sec) === null ? null : Math.max(0, (originMs + 1000 * (sec as number) - latestMs) / 1000 / JULIAN_YEAR_S);
  };

  const tauP = r.fit.parameters.tau;
  let tau: Headline['tau'] = null;
  if (tauP !== undefined) {
    const v = fin(tauP.value);
    const ci: [number | null, number | null] = [fin(tauP.ci95[0]), fin(tauP.ci95[1])];
    if (r.basis === 'time') tau = { basis: 'time', valueS: v, ci95S: ci, massKg: null, atFlowKgPerS: null };
    else {
      const flow = fin(r.meanMassFlowKgPerS);
      const per = (kg: number | null): number | null => (kg === null || flow === null ? null : kg / flow);
      tau = { basis: 'mass', valueS: per(v), ci95S: [per(ci[0]), per(ci[1])], massKg: { value: v, ci95: ci }, atFlowKgPerS: flow };
    }
  }

  const rc = f.recharge;
  const recharge: Headline['recharge'] = rc === null || rc.status !== 'ok' ? null : {
    fraction: interval(rc.rechargeFraction), ratio: interval(rc.ratio), verdict: rc.verdict, interpretation: rc.interpretation,
    heatFlowW: interval(rc.rechargeHeatFlowW), backgroundW: fin(rc.backgroundHeatFlowW),
  };
  const rechargeMissing = recharge !== null ? null
    : rc !== null ? rc.message : (f.assumptions.find((a) => a.includes('no recharge estimate')) ?? 'no recharge estimate');

  const heat = fc.remainingHeatJ;
  const econ = fin(f.limit.thetaEconK) ?? fin(fc.thetaEconK);
  return {
    tau,
    theoryTauS: fin(rc?.tauTheoryS) ?? fin(f.reservoir?.theory.tau.value),
    recharge,
    rechargeMissing,
    endOfLife: {
      p90: at(fc.endOfLife.p90), p50: at(fc.endOfLife.p50), p10: at(fc.endOfLife.p10), central: at(fc.endOfLife.centralS),
      yearsFromLatest: { p90: fromLatest(fc.endOfLife.p90), p50: fromLatest(fc.endOfLife.p50), p10: fromLatest(fc.endOfLife.p10) },
      alreadyReached: fc.endOfLife.alreadyReached,
      fractionReachedWithinHorizon: fin(fc.endOfLife.fractionReachedWithinHorizon),
      now: iso(originMs + 1000 * now),
      horizonEnd: at(fc.horizonEndS) ?? iso(originMs + 1000 * now),
    },
    remainingHeatJ: heat === null ? null : { p90: fin(heat.p90), p50: fin(heat.p50), p10: fin(heat.p10), toHorizon: fc.remainingHeatToHorizon },
    currentPowerW: fin(fc.currentPowerW),
    plannedFlow: { valueKgPerS: fin(f.plannedFlow.valueKgPerS), note: f.plannedFlow.note },
    specificHeat: { valueJPerKgK: fin(f.specificHeat.valueJPerKgK), note: f.specificHeat.note },
    limit: { text: f.limit.text, thetaEconK: econ, productionTemperatureK: econ === null ? null : econ + tref + ZERO_CELSIUS_K },
  };
}

function interval(i: { value: number | null; ci95: (number | null)[] }): Interval {
  return { value: fin(i.value), ci95: [fin(i.ci95[0]), fin(i.ci95[1])] };
}
