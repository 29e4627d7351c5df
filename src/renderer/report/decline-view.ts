/**
 * The decline chart (with its residuals panel) of a well's report page: the decline screen's own chart
 * (src/renderer/charts/decline-chart.ts, DeclineCharts) fed with the report's data through the
 * screen's own curve builders (decline-data.ts, decline-model.ts), so a report and the screen draw
 * the same curves in the same colours.
 *
 * TO BE REPLACED: readingsView() and overlayView() below repeat what the decline screen assembles in
 * its private methods DeclineView.drawReadings / overlay / theory / limitLabel
 * (src/renderer/screens/decline.ts). When that assembly is exported as pure functions (e.g.
 * `declineReadingsView(series, axis, map, display, quantity)` and `declineOverlay({ series, fit,
 * forecast, axis, map, display, limit })` in src/renderer/charts/), call them here instead.
 * Pure (no DOM), so it is testable without a browser.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ForecastWellResponse } from '../../shared/contract/fits.js';
import type { ReportSeries, ResidualChartData } from '../../shared/report/well-section.js';
import { fixed, type Display } from '../app/display.js';
import { EMPTY_OVERLAY, type OverlayView, type ReadingsView } from '../charts/decline-chart.js';
import {
  basisOfChartX, chartXOfBasis, massUnit, readingDatasets, readingsExtent, shownOfTheta, yMap,
  type Point, type SeriesColumns, type XAxis, type YMap,
} from '../charts/decline-data.js';
import { bandLine, basisAtForecastTime, fittedCurve, parametersOf, theoryCurve, type BandPlace } from '../charts/decline-model.js';
import { chartRangeOfWindow } from '../charts/decline-window.js';
import { MODEL_LABELS } from '../screens/decline-rows.js';

export interface DeclineViews {
  readings: ReadingsView;
  overlay: OverlayView;
  /** The fit window in chart x, shaded as on the screen; null when the fit used every reading. */
  window: [number, number] | null;
  /** Readings not drawn because they have no production temperature (or no place on the mass axis). */
  notDrawn: number;
}

export function axisOf(series: ReportSeries, display: Display): XAxis {
  if (series.basis === 'mass') return { basis: 'mass', ...massUnit(display.units) };
  return { basis: 'time', originMs: series.timeOrigin === null ? series.epochMs : Date.parse(series.timeOrigin) };
}

/** The report draws production temperature, as the decline screen does by default. */
export function mapOf(series: ReportSeries, display: Display): YMap {
  return yMap(display, 'temperature', series.referenceTemperatureC);
}

export function declineViews(
  series: ReportSeries, forecast: Wire<ForecastWellResponse> | null, residuals: ResidualChartData | null, display: Display,
): DeclineViews {
  const axis = axisOf(series, display);
  const map = mapOf(series, display);
  const d = readingDatasets(series as SeriesColumns, axis, map);
  const tUnit = display.unit('temperature');
  const dUnit = display.unit('temperatureDifference');
  const readings: ReadingsView = {
    axis,
    xTitle: axis.basis === 'mass' ? `produced mass since time zero (${axis.label})` : 'date',
    yTitle: `production temperature (${tUnit})`,
    residualTitle: `residual (${dUnit})`,
    included: d.included,
    excluded: d.excluded,
    formatX: (x) => (axis.basis === 'time' ? display.dateTime(x) : `${fixed(x, 4)} ${axis.label}`),
    formatY: (y) => `${fixed(y, 2)} ${tUnit}`,
    formatResidual: (y) => `${fixed(y, 2)} ${dUnit}`,
  };
  const w = forecast?.fit.window;
  const window = w === undefined || (w.from === null && w.to === null) ? null
    : chartRangeOfWindow(series as SeriesColumns, axis, { fromMs: w.from === null ? null : Date.parse(w.from), toMs: w.to === null ? null : Date.parse(w.to) });
  return { readings, overlay: overlayView(series, forecast, residuals, axis, map, display), window, notDrawn: d.notDrawn };
}

function overlayView(
  series: ReportSeries, forecast: Wire<ForecastWellResponse> | null, residuals: ResidualChartData | null,
  axis: XAxis, map: YMap, display: Display,
): OverlayView {
  if (forecast === null || forecast.fit.basis !== series.basis) return EMPTY_OVERLAY;
  const result = forecast.fit.fit;
  const params = result.status === 'converged' ? parametersOf(result.model, result.estimates) : null;
  const out: OverlayView = { ...EMPTY_OVERLAY, fitLabel: `fitted: ${MODEL_LABELS[result.model].toLowerCase()}` };
  if (params !== null) {
    const xr = result.xRange;
    if (xr.length === 2 && Number.isFinite(xr[0]) && Number.isFinite(xr[1])) out.fit = fittedCurve(result.model, params, [xr[0] as number, xr[1] as number], axis, map);
    // The residuals come thinned from the report model (the fit's own, min–max per bucket).
    if (residuals !== null && residuals.basis === axis.basis) {
      out.residuals = residuals.x.map((x, i): Point => ({ x: chartXOfBasis(axis, x), y: map.a * residuals.y[i] }));
    }
  }
  const fc = forecast.forecast;
  if (fc.status === 'ok') {
    const place: BandPlace = {
      timeS: fc.band.timeS as number[], nowX: result.xRange[1] ?? undefined, nowTimeS: fc.nowTimeS, plannedFlowKgPerS: forecast.plannedFlow.valueKgPerS,
    };
    out.bandLow = bandLine({ ...place, values: fc.band.p90 }, axis, map);
    out.bandHigh = bandLine({ ...place, values: fc.band.p10 }, axis, map);
    out.p50 = bandLine({ ...place, values: fc.band.p50 }, axis, map);
    if (Number.isFinite(fc.thetaEconK)) out.limit = { y: shownOfTheta(map, fc.thetaEconK), label: limitLabel(forecast, fc.thetaEconK, map, display) };
    const theory = theoryView(series, forecast, axis, map, place, params?.theta0 ?? null, display);
    if (theory !== null) {
      out.theory = theory.points;
      out.theoryLabel = theory.label;
    }
  }
  return out;
}

function limitLabel(forecast: Wire<ForecastWellResponse>, thetaEconK: number, map: YMap, display: Display): string {
  const shown = display.formatCelsius(map.trefC + thetaEconK);
  const limit = forecast.limit;
  return limit.kind === 'power' ? `economic limit ${display.format('power', limit.powerW)} (${shown})` : `economic limit ${shown}`;
}

/** The reservoir's theoretical exponential from the fitted θ0, with τ (time basis) or Mc (mass basis) of the parameters. */
function theoryView(
  series: ReportSeries, forecast: Wire<ForecastWellResponse>, axis: XAxis, map: YMap, place: BandPlace, theta0K: number | null, display: Display,
): { points: Point[]; label: string } | null {
  const r = forecast.reservoir;
  if (r === null || theta0K === null) return null;
  const mc = r.theory.characteristicMass.value;
  const decay = axis.basis === 'mass' ? mc : (forecast.recharge?.tauTheoryS ?? (r.meanMassFlowKgPerS > 0 ? mc / r.meanMassFlowKgPerS : NaN));
  if (!(typeof decay === 'number' && decay > 0)) return null;
  const extent = readingsExtent(series as SeriesColumns, axis);
  const lastBasis = extent === null ? 0 : basisOfChartX(axis, extent[1]);
  const tEnd = place.timeS.at(-1);
  const endBasis = tEnd === undefined ? null : basisAtForecastTime(axis.basis, place, tEnd);
  const label = axis.basis === 'time'
    ? `theoretical (reservoir parameters): τ ${display.years(decay)}`
    : `theoretical (reservoir parameters): Mc ${fixed(decay * axis.perKg, 2)} ${axis.label}`;
  return { points: theoryCurve(theta0K, decay, 0, Math.max(lastBasis, endBasis ?? 0), axis, map), label };
}
