/**
 * The fitted decline evaluated in the renderer: the curve on a grid of a few hundred points over the
 * fit window, the forecast band in chart coordinates, the theoretical decline of the reservoir, and
 * the residuals θobs − θfit of the readings the fit used. Closed forms from src/shared/fit/models.ts
 * (DOMAIN.md §6), so the chart draws exactly the curve the engine fitted. Pure (no DOM).
 */
import { declineValue } from '../../shared/fit/models.js';
import type { DeclineModel, DeclineParameters } from '../../shared/fit/types.js';
import { chartXOfBasis, present, type Point, type SeriesColumns, type XAxis, type YMap } from './decline-data.js';

/** Enough for a smooth curve on any screen width; the band comes on the forecast's own grid. */
export const CURVE_GRID_POINTS = 300;

/** Parameters as they cross the wire (a non-finite value arrives as null). */
export interface WireEstimates {
  theta0: number | null;
  tau: number | null;
  thetaInf?: number | null;
  b?: number | null;
}

/** The estimates as model parameters, or null when one the model needs is missing or not finite. */
export function parametersOf(model: DeclineModel, est: WireEstimates | null | undefined): DeclineParameters | null {
  if (est === null || est === undefined) return null;
  const ok = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);
  if (!ok(est.theta0) || !ok(est.tau) || !(est.tau > 0)) return null;
  const p: DeclineParameters = { theta0: est.theta0, tau: est.tau };
  if (model === 'floor') {
    if (!ok(est.thetaInf)) return null;
    p.thetaInf = est.thetaInf;
  }
  if (model === 'hyperbolic') {
    if (!ok(est.b) || !(est.b > 0)) return null;
    p.b = est.b;
  }
  return p;
}

/** θ(x) at `points` evenly spaced basis values from x0 to x1 (both included). */
export function thetaOnGrid(model: DeclineModel, p: DeclineParameters, x0: number, x1: number, points = CURVE_GRID_POINTS): { x: Float64Array; theta: Float64Array } {
  const n = Math.max(2, Math.floor(points));
  const x = new Float64Array(n);
  const theta = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // The last point is x1 itself, not x0 + (n−1)·step, so the curve ends exactly at the window's end.
    const xi = i === n - 1 ? x1 : x0 + ((x1 - x0) * i) / (n - 1);
    x[i] = xi;
    theta[i] = declineValue(model, p, xi);
  }
  return { x, theta };
}

/** The fitted curve over the fit window, as chart points. */
export function fittedCurve(model: DeclineModel, p: DeclineParameters, xRange: readonly [number, number], axis: XAxis, map: YMap, points = CURVE_GRID_POINTS): Point[] {
  const { x, theta } = thetaOnGrid(model, p, xRange[0], xRange[1], points);
  const out: Point[] = new Array(x.length);
  for (let i = 0; i < x.length; i++) out[i] = { x: chartXOfBasis(axis, x[i]), y: map.a * theta[i] + map.b };
  return out;
}

/** Where the forecast's grid lies (ForecastResult and the forecast response). */
export interface BandPlace {
  /** s after time zero. */
  timeS: readonly number[];
  /** Mass basis: the fit's largest x (kg, "now"), the time of now (s after time zero) and the planned flow (kg/s). */
  nowX?: number;
  nowTimeS?: number;
  plannedFlowKgPerS?: number;
}

export interface BandInput extends BandPlace {
  values: readonly (number | null)[];
}

/**
 * The basis value at a forecast time t (s after time zero): t itself on the time basis; on the mass
 * basis the produced mass at the planned flow, M = Mnow + ṁplan·(t − tnow), as forecast.ts counts it.
 */
export function basisAtForecastTime(basis: 'time' | 'mass', place: BandPlace, t: number): number | null {
  if (basis === 'time') return t;
  if (place.nowX === undefined || place.nowTimeS === undefined || place.plannedFlowKgPerS === undefined) return null;
  return place.nowX + place.plannedFlowKgPerS * (t - place.nowTimeS);
}

/** One line of the forecast band as chart points (on the mass basis placed by basisAtForecastTime). */
export function bandLine(band: BandInput, axis: XAxis, map: YMap): Point[] {
  const out: Point[] = [];
  for (let i = 0; i < band.timeS.length; i++) {
    const v = band.values[i];
    if (v === null || !Number.isFinite(v)) continue;
    const basisValue = basisAtForecastTime(axis.basis, band, band.timeS[i]);
    if (basisValue === null) return [];
    out.push({ x: chartXOfBasis(axis, basisValue), y: map.a * v + map.b });
  }
  return out;
}

/**
 * The theoretical exponential θ0·e^(−x/k) with k the theoretical τ (time basis, s) or the
 * characteristic mass Mc = C/cw (mass basis, kg), DOMAIN.md §2 and §4, from x0 to x1.
 */
export function theoryCurve(theta0K: number, decayConstant: number, x0: number, x1: number, axis: XAxis, map: YMap, points = CURVE_GRID_POINTS): Point[] {
  if (!(decayConstant > 0) || !Number.isFinite(theta0K) || !(x1 > x0)) return [];
  return fittedCurve('exponential', { theta0: theta0K, tau: decayConstant }, [x0, x1], axis, map, points);
}

/** The fit window as instants; null for an open end. */
export interface WindowMs { fromMs: number | null; toMs: number | null }

export interface Residuals {
  points: Point[];
  /** Root-mean-square of the residuals, K. */
  rmsK: number;
  count: number;
}

/**
 * θobs − θfit, in the display's temperature-difference unit (map.a, no offset), of the readings
 * the fit would use (exclusion code 0) inside the window; `series` must be on the fit's basis.
 */
export function residualPoints(series: SeriesColumns, model: DeclineModel, p: DeclineParameters, window: WindowMs, axis: XAxis, map: YMap): Residuals {
  const points: Point[] = [];
  const from = window.fromMs ?? -Infinity;
  const to = window.toMs ?? Infinity;
  let sum = 0;
  const n = series.timeS.length;
  for (let i = 0; i < n; i++) {
    if (series.exclusion[i] !== 0) continue;
    const c = series.productionTemperatureC[i];
    const xb = series.x[i];
    if (!present(c) || !present(xb)) continue;
    const tMs = series.epochMs + 1000 * series.timeS[i];
    if (tMs < from || tMs > to) continue;
    const r = c - map.trefC - declineValue(model, p, xb);
    sum += r * r;
    points.push({ x: axis.basis === 'time' ? tMs : xb * axis.perKg, y: map.a * r });
  }
  return { points, rmsK: points.length > 0 ? Math.sqrt(sum / points.length) : NaN, count: points.length };
}
