/**
 * The decline chart (with its residuals panel) of a well's report page, built by the decline
 * screen's own builders (charts/decline-overlay.ts readingsView and buildOverlay, decline-window.ts
 * for the fit window's shading) and drawn by its own chart (DeclineCharts), so a report and the
 * screen draw the same curves, titles and labels. This module only adapts the report's data
 * (decimated readings, thinned residuals) to the builders' inputs. Pure (no DOM), so it is testable
 * without a browser.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ForecastWellResponse } from '../../shared/contract/fits.js';
import type { ReportSeries, ResidualChartData } from '../../shared/report/well-section.js';
import type { Display } from '../app/display.js';
import { chartXOfBasis, massUnit, yMap, type Point, type SeriesColumns, type XAxis, type YMap } from '../charts/decline-data.js';
import { buildOverlay, EMPTY_OVERLAY, readingsView, type OverlayView, type ReadingsView } from '../charts/decline-overlay.js';
import { chartRangeOfWindow } from '../charts/decline-window.js';

export interface DeclineViews {
  readings: ReadingsView;
  overlay: OverlayView;
  /** The fit window in chart x, shaded as on the screen; null when the fit used every reading. */
  window: [number, number] | null;
  /** Readings not drawn because they have no production temperature (or no place on the mass axis). */
  notDrawn: number;
}

/** The x axis as the decline screen sets it (DeclineView.axis). */
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
  const columns: SeriesColumns = series;
  const axis = axisOf(series, display);
  const map = mapOf(series, display);
  const { view, datasets } = readingsView(columns, axis, map, display);
  const fit = forecast?.fit;
  // As the screen: no curves over readings on another basis than the fit's.
  const overlay = forecast === null || fit === undefined || fit.basis !== series.basis ? EMPTY_OVERLAY : buildOverlay({
    series: columns, axis, map, display, fit, forecast, limit: forecast.limit,
    // The fit's own residuals, thinned by the report model; the readings here are thinned too, so
    // residuals recomputed from them would not be the fit's.
    residuals: residualsOf(residuals, axis, map),
  });
  const w = fit?.window;
  const window = w === undefined || (w.from === null && w.to === null) ? null
    : chartRangeOfWindow(columns, axis, { fromMs: w.from === null ? null : Date.parse(w.from), toMs: w.to === null ? null : Date.parse(w.to) });
  return { readings: view, overlay, window, notDrawn: datasets.notDrawn };
}

/** The report's residuals (basis value, K) in chart coordinates; none when they are on another basis. */
function residualsOf(residuals: ResidualChartData | null, axis: XAxis, map: YMap): Point[] {
  if (residuals === null || residuals.basis !== axis.basis) return [];
  return residuals.x.map((x, i): Point => ({ x: chartXOfBasis(axis, x), y: map.a * residuals.y[i] }));
}
