/**
 * Contract of fits and forecasts of one well from its stored readings.
 *
 * θ = Tprod − Tref with the well's reference temperature. Readings whose status is not 'producing'
 * or whose flags contain 'bad' or 'spike' stay in the log and are counted as excluded. Time zero is
 * the well's production start if set, else its first live reading; on the mass basis the produced
 * mass is counted from the same instant. Responses carry the engine's own result records
 * (FitResult, ForecastResult, RechargeResult): SI, NaN where a value does not exist, typed arrays
 * for residuals — a transport that is not structured-clone (HTTP) must map them (NaN → null).
 */
import type { AutoFitResult, Basis, DeclineModel, FitResult } from '../fit/types.js';
import type { ForecastResult } from '../forecast/forecast.js';
import type { RechargeResult } from '../forecast/recharge.js';
import type { ReservoirTheoryJson } from '../reservoir/params.js';
import { boolean, instant, number, object, oneOf, optional, string, type Schema } from './schema.js';
import type { ReservoirVersionJson } from './reservoirs.js';
import type { WellInfo, WellRef } from './wells.js';

export type ModelChoice = DeclineModel | 'auto';
export const MODEL_CHOICES: readonly ModelChoice[] = ['exponential', 'floor', 'hyperbolic', 'auto'];
export const BASES: readonly Basis[] = ['time', 'mass'];

export interface FitWellRequest extends WellRef {
  /** Window of readings to fit, inclusive; default all. */
  from?: string;
  to?: string;
  /** Default 'exponential'. */
  model?: ModelChoice;
  /** Default 'time'. */
  basis?: Basis;
  /**
   * Default true. False leaves `points` empty: a screen that draws the readings from chartSeries
   * (overview.ts) need not receive a million point records with the fit.
   */
  points?: boolean;
  /**
   * Default true. False leaves each fit's `x` and `residuals` (its own and every candidate's) empty:
   * a screen that computes the residuals from the readings it draws and the fitted parameters need
   * not receive them (on a million readings, a hundred megabytes of numbers).
   */
  residuals?: boolean;
}

export type ExclusionReason = 'not-producing' | 'flagged' | 'no-temperature' | 'before-time-zero';

/** One reading of the window as the fit saw it. */
export interface FitPoint {
  readingId: number;
  time: string;
  /** Basis value: s after time zero, or kg produced since time zero. */
  x: number;
  /** θ = Tprod − Tref in K; null without a production temperature. */
  thetaK: number | null;
  included: boolean;
  excludedBecause: ExclusionReason | null;
}

export interface FitCounts {
  readings: number;
  included: number;
  excludedNotProducing: number;
  excludedFlagged: number;
  excludedNoTemperature: number;
  excludedBeforeTimeZero: number;
}

export interface StoredFitInfo {
  fitId: number;
  /** SHA-256 (hex) over the readings that entered the fit and the well's Tref and time zero. */
  fingerprint: string;
  engineVersion: string;
  createdAt: string;
}

export interface FitWellResponse {
  well: WellInfo;
  model: ModelChoice;
  basis: Basis;
  window: { from: string | null; to: string | null };
  timeOrigin: string;
  timeOriginSource: 'production-start' | 'first-reading';
  referenceTemperatureC: number;
  fit: FitResult | AutoFitResult;
  points: FitPoint[];
  counts: FitCounts;
  /** Means over the included readings; null when none carries the value. */
  meanMassFlowKgPerS: number | null;
  meanProductionTemperatureC: number | null;
  /** Mass basis only: how the produced mass was counted. */
  producedMass: { totalKg: number; intervalsCounted: number; intervalsSkipped: number; rule: string } | null;
  stored: StoredFitInfo;
  assumptions: string[];
}

export interface FitStatusResponse {
  well: WellInfo;
  /** The latest stored fit of the well, or null when none was made. */
  latest: (StoredFitInfo & { model: string; basis: Basis; window: { from: string | null; to: string | null } }) | null;
  /** Fingerprint of the readings the latest fit would use now. */
  currentFingerprint: string | null;
  /** True when the readings (or Tref, time zero) changed since the fit; null without a fit. */
  stale: boolean | null;
  /** The engine that made the fit is not this one (the numbers may differ slightly on a refit). */
  engineChanged: boolean | null;
  message: string;
}

export type ForecastLimit =
  | { kind: 'production-temperature'; temperatureC: number }
  | { kind: 'theta'; thetaK: number }
  | { kind: 'power'; powerW: number };

export interface ForecastWellRequest extends FitWellRequest {
  limit: ForecastLimit;
  /** Years of 365.25 d past the last reading; default 30. */
  horizonYears?: number;
  /** Default: the mean normalised mass flow of the last year of producing readings. */
  plannedFlowKgPerS?: number;
  /** Default: IAPWS-IF97 cp at the mean production temperature and saturation + 1 MPa. */
  specificHeatJPerKgK?: number;
  seed?: number;
  samples?: number;
  /** Default 0.06 W/m² (continental average, common practice). */
  backgroundHeatFlowWPerM2?: number;
}

export interface SpecificHeatInfo {
  valueJPerKgK: number;
  source: 'given' | 'IAPWS-IF97 region 1';
  note: string;
  temperatureK?: number;
  pressurePa?: number;
}

export interface ForecastWellResponse {
  fit: FitWellResponse;
  forecast: ForecastResult;
  /** Null when the well has no reservoir, or its reservoir has no parameter version. */
  recharge: RechargeResult | null;
  reservoir: {
    name: string;
    version: ReservoirVersionJson;
    theory: ReservoirTheoryJson;
    areaM2: number;
    meanMassFlowKgPerS: number;
    backgroundHeatFlowWPerM2: number;
  } | null;
  specificHeat: SpecificHeatInfo;
  plannedFlow: { valueKgPerS: number; source: 'given' | 'mean-last-year'; note: string };
  limit: ForecastLimit & { thetaEconK: number; text: string };
  horizonYears: number;
  /** Every assumption the forecast rests on, in words. */
  assumptions: string[];
}

const optionalWindow = {
  well: string({ maxLength: 200 }),
  field: optional(string({ maxLength: 200 })),
  from: optional(instant()),
  to: optional(instant()),
  model: optional(oneOf(MODEL_CHOICES)),
  basis: optional(oneOf(BASES)),
  points: optional(boolean()),
  residuals: optional(boolean()),
};

export const FIT_WELL_REQUEST: Schema<FitWellRequest> = object(optionalWindow);

const LIMIT_KINDS = ['production-temperature', 'theta', 'power'] as const;
const LIMIT_SCHEMAS = {
  'production-temperature': object({ kind: oneOf(['production-temperature'] as const), temperatureC: number({ unit: '°C', min: -273.15 }) }),
  theta: object({ kind: oneOf(['theta'] as const), thetaK: number({ unit: 'K', min: 0, exclusiveMin: true }) }),
  power: object({ kind: oneOf(['power'] as const), powerW: number({ unit: 'W', min: 0, exclusiveMin: true }) }),
};

/** One of three shapes, told apart by `kind`. */
export const ECONOMIC_LIMIT: Schema<ForecastLimit> = {
  expected: 'an economic limit',
  check(value, path) {
    const kind = typeof value === 'object' && value !== null ? (value as { kind?: unknown }).kind : undefined;
    if (typeof kind === 'string' && (LIMIT_KINDS as readonly string[]).includes(kind)) {
      return LIMIT_SCHEMAS[kind as (typeof LIMIT_KINDS)[number]].check(value, path);
    }
    if (typeof value !== 'object' || value === null || Array.isArray(value)) return object({}).check(value, path) as never;
    return oneOf(LIMIT_KINDS).check(kind, path === '' ? 'kind' : `${path}.kind`) as never;
  },
};

export const FIT_STATUS_REQUEST: Schema<WellRef> = object({ well: string({ maxLength: 200 }), field: optional(string({ maxLength: 200 })) });

export const FORECAST_WELL_REQUEST: Schema<ForecastWellRequest> = object({
  ...optionalWindow,
  limit: ECONOMIC_LIMIT,
  horizonYears: optional(number({ unit: 'yr', min: 0, exclusiveMin: true, max: 1000 })),
  plannedFlowKgPerS: optional(number({ unit: 'kg/s', min: 0, exclusiveMin: true })),
  specificHeatJPerKgK: optional(number({ unit: 'J/(kg K)', min: 0, exclusiveMin: true })),
  seed: optional(number({ integer: true, min: 0 })),
  samples: optional(number({ integer: true, min: 100, max: 100_000 })),
  backgroundHeatFlowWPerM2: optional(number({ unit: 'W/m2', min: 0, exclusiveMin: true })),
});
