/**
 * What the decline chart draws, as plain data: the readings with their axis titles and tooltip
 * texts (readingsView), and over them, from a fit and its forecast (wire records), the fitted
 * curve over the window, the residuals, the P10–P90 band and P50 line, the economic limit and the
 * reservoir's theoretical decline (buildOverlay), all in chart coordinates. Pure (no DOM), shared
 * by the decline screen and the report.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { FitWellResponse, ForecastLimit, ForecastWellResponse } from '../../shared/contract/fits.js';
import { fixed, type Display } from '../app/display.js';
import {
  basisOfChartX, readingDatasets, readingsExtent, shownOfTheta, type Point, type ReadingDatasets, type SeriesColumns, type XAxis, type YMap,
} from './decline-data.js';
import { bandLine, basisAtForecastTime, fittedCurve, parametersOf, residualPoints, theoryCurve, type BandPlace } from './decline-model.js';

export interface ReadingsView {
  axis: XAxis;
  xTitle: string;
  yTitle: string;
  residualTitle: string;
  included: Point[];
  excluded: Point[];
  /** Tooltip texts. */
  formatX(x: number): string;
  formatY(y: number): string;
  formatResidual(y: number): string;
}

/** The readings of a series as the chart takes them, with the counts of what was drawn. */
export function readingsView(series: SeriesColumns, axis: XAxis, map: YMap, display: Display): { view: ReadingsView; datasets: ReadingDatasets } {
  const d = readingDatasets(series, axis, map);
  const yUnit = map.quantity === 'theta' ? display.unit('temperatureDifference') : display.unit('temperature');
  const dUnit = display.unit('temperatureDifference');
  const view: ReadingsView = {
    axis,
    // "name, unit": the US difference unit carries brackets of its own.
    xTitle: axis.basis === 'mass' ? `produced mass since time zero, ${axis.label}` : 'date',
    yTitle: map.quantity === 'theta' ? `θ = T − Tref, ${yUnit}` : `production temperature, ${yUnit}`,
    residualTitle: `residual, ${dUnit}`,
    included: d.included,
    excluded: d.excluded,
    formatX: (x) => (axis.basis === 'time' ? display.dateTime(x) : `${fixed(x, 4)} ${axis.label}`),
    formatY: (y) => `${fixed(y, 2)} ${yUnit}`,
    formatResidual: (y) => `${fixed(y, 2)} ${dUnit}`,
  };
  return { view, datasets: d };
}

export interface OverlayView {
  fit: Point[];
  fitLabel: string;
  bandLow: Point[];
  bandHigh: Point[];
  p50: Point[];
  limit: { y: number; label: string } | null;
  theory: Point[];
  theoryLabel: string;
  residuals: Point[];
}

export const EMPTY_OVERLAY: OverlayView = {
  fit: [], fitLabel: 'fitted decline', bandLow: [], bandHigh: [], p50: [], limit: null, theory: [], theoryLabel: 'theoretical decline', residuals: [],
};

/** The fitted models in the middle of a sentence. */
export const MODEL_WORDS = { exponential: 'exponential', floor: 'exponential to a floor', hyperbolic: 'hyperbolic (Arps)' } as const;

export interface OverlayInput {
  /** The series on the fit's basis. */
  series: SeriesColumns;
  axis: XAxis;
  map: YMap;
  display: Display;
  fit: Wire<FitWellResponse>;
  forecast: Wire<ForecastWellResponse> | null;
  /** The limit asked for (its kind decides the label). */
  limit: ForecastLimit;
  /** Residuals already in chart coordinates (e.g. thinned ones); by default computed from `series`. */
  residuals?: Point[];
}

export function buildOverlay(input: OverlayInput): OverlayView {
  const { series, axis, map, fit, forecast } = input;
  const result = fit.fit;
  const params = result.status === 'converged' ? parametersOf(result.model, result.estimates) : null;
  const out: OverlayView = { ...EMPTY_OVERLAY, fitLabel: `fitted: ${MODEL_WORDS[result.model]}` };
  if (params !== null) {
    const [x0, x1] = result.xRange;
    if (Number.isFinite(x0) && Number.isFinite(x1)) out.fit = fittedCurve(result.model, params, [x0, x1], axis, map);
    const window = { fromMs: fit.window.from === null ? null : Date.parse(fit.window.from), toMs: fit.window.to === null ? null : Date.parse(fit.window.to) };
    out.residuals = input.residuals ?? residualPoints(series, result.model, params, window, axis, map).points;
  }
  const fc = forecast?.forecast;
  if (forecast === null || fc === undefined || fc.status !== 'ok') return out;
  // The forecast starts at the fit's last basis value ("now"), as forecast.ts counts it.
  const place: BandPlace = { timeS: fc.band.timeS, nowX: result.xRange[1], nowTimeS: fc.nowTimeS, plannedFlowKgPerS: forecast.plannedFlow.valueKgPerS };
  out.bandLow = bandLine({ ...place, values: fc.band.p90 }, axis, map);
  out.bandHigh = bandLine({ ...place, values: fc.band.p10 }, axis, map);
  out.p50 = bandLine({ ...place, values: fc.band.p50 }, axis, map);
  if (Number.isFinite(fc.thetaEconK)) out.limit = { y: shownOfTheta(map, fc.thetaEconK), label: limitLabel(input.display, input.limit, fc.thetaEconK, map) };
  const theory = theoryLine(input, place, params?.theta0 ?? null);
  if (theory !== null) {
    out.theory = theory.points;
    out.theoryLabel = theory.label;
  }
  return out;
}

/** 'economic limit 115.0 °C', or for a power limit '… 5.00 MWth (θ 12.0 K)'. */
export function limitLabel(display: Display, limit: ForecastLimit, thetaEconK: number, map: YMap): string {
  const shown = map.quantity === 'theta' ? display.format('temperatureDifference', thetaEconK) : display.formatCelsius(map.trefC + thetaEconK);
  return limit.kind === 'power' ? `economic limit ${display.format('power', limit.powerW)} (${shown})` : `economic limit ${shown}`;
}

/**
 * The reservoir's theoretical exponential from the fitted θ0 at time zero, with τ at the window's
 * mean flow (time basis) or the characteristic mass Mc (mass basis), to the end of the forecast:
 * the decline the parameters predict, beside the one the readings show (their ratio is the
 * recharge story, DOMAIN.md §7). Null without reservoir parameters or a fitted θ0.
 */
function theoryLine(input: OverlayInput, place: BandPlace, theta0K: number | null): { points: Point[]; label: string } | null {
  const { axis, map, display, forecast } = input;
  const r = forecast?.reservoir;
  if (r === null || r === undefined || theta0K === null) return null;
  const mc = r.theory.characteristicMass.value;
  const tauTheory = forecast?.recharge?.tauTheoryS;
  const decay = axis.basis === 'mass' ? mc : (typeof tauTheory === 'number' && Number.isFinite(tauTheory) ? tauTheory : mc / r.meanMassFlowKgPerS);
  if (!(decay > 0) || !Number.isFinite(decay)) return null;
  const extent = readingsExtent(input.series, axis);
  const lastBasis = extent === null ? 0 : basisOfChartX(axis, extent[1]);
  const tEnd = place.timeS.at(-1);
  const endBasis = tEnd === undefined ? null : basisAtForecastTime(axis.basis, place, tEnd);
  const label = axis.basis === 'time'
    ? `theoretical: τ ${display.years(decay)} from the reservoir parameters`
    : `theoretical: Mc ${fixed(decay * axis.perKg, 2)} ${axis.label} from the reservoir parameters`;
  return { points: theoryCurve(theta0K, decay, 0, Math.max(lastBasis, endBasis ?? 0), axis, map), label };
}
