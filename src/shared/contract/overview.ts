/**
 * Contract of the field overview and of a well's plotted series.
 *
 * fieldOverview: one row per well with what a reviewer scans first — latest reading, θ, fitted τ
 * with its interval, theoretical τ, recharge fraction, years to the economic limit — computed with
 * the latest stored fit's model, basis and window of each well (auto on the time basis for a well
 * never fitted), the economic limit and background heat flow of the settings (settings.ts). It does
 * not store fits: only fitWell does. Plus the field's total thermal output, week by week.
 *
 * wellSeries: every live reading of a well in columns, compact enough for a million readings (the
 * chart's data; the fit itself always runs in the back end on the stored values).
 *
 * chartSeries: the same readings in the form a chart reads, packed: each column one little-endian
 * binary array in base64 (8 bytes a reading for the instant and the temperature, 1 for the
 * exclusion code) instead of JSON numbers — about a third of the size and no number parsing, so a
 * long log reaches the screen in a fraction of the time. Same values, bit for bit: the columns are
 * IEEE 754 doubles as stored. Without the reading ids and flows, which a chart does not draw.
 */
import type { Basis } from '../fit/types.js';
import type { RechargeVerdict } from '../forecast/recharge.js';
import { boolean, object, oneOf, optional, string, type Schema } from './schema.js';
import { BASES, type ForecastLimit } from './fits.js';
import type { SettingsJson } from './settings.js';
import type { FieldInfo, WellInfo, WellRef, WellSummary } from './wells.js';

export type QualityMark = 'good' | 'fair' | 'poor' | 'no-data';

export interface DataQuality {
  mark: QualityMark;
  /** Live readings of the well. */
  readings: number;
  /** Readings the fit used, and those it left out (not producing, flagged, no temperature, before time zero). */
  included: number;
  excluded: number;
  /** Readings flagged bad or spike. */
  flagged: number;
  /** Longest stretch without a reading between two readings, days; null with fewer than two. */
  longestGapDays: number | null;
  /** Days from the latest reading to now. */
  daysSinceLatest: number | null;
  /** Why the mark is what it is, in plain words. */
  notes: string[];
}

export interface Interval95 {
  value: number;
  ci95: [number, number];
}

export interface WellOverview {
  well: WellSummary;
  /** θ of the latest producing reading with a production temperature, K; null without Tref or such a reading. */
  thetaK: number | null;
  fit: {
    model: string;
    basis: Basis;
    window: { from: string | null; to: string | null };
    status: string;
    /** Fitted time constant, s (on the mass basis: converted at the mean mass flow); null without a converged fit. */
    tau: Interval95 | null;
    /** The stored fit this row follows is stale (data changed since); null when the well has none. */
    stale: boolean | null;
    message: string;
  } | null;
  theoryTauS: number | null;
  rechargeFraction: Interval95 | null;
  rechargeVerdict: RechargeVerdict | null;
  rechargeInterpretation: string | null;
  /** Years from the latest reading to the economic limit; null where not reached within the horizon. */
  yearsToLimit: { p90: number | null; p50: number | null; p10: number | null; alreadyReached: boolean } | null;
  /** The same as ISO 8601 UTC instants. */
  endOfLife: { p90: string | null; p50: string | null; p10: string | null } | null;
  currentPowerW: number | null;
  limit: ForecastLimit & { text: string };
  quality: DataQuality;
  /** Why there is no fit or forecast for this well (too few readings, no Tref, an injection well, …); null when there is. */
  problem: string | null;
}

export interface FieldOutput {
  /** Start of each week (ISO 8601 UTC) with at least one producing reading. */
  weekStart: string[];
  /** Sum over the production wells of each well's mean thermal power that week, W. */
  powerW: number[];
  /** How the power was computed (relative to which temperature, with which cp). */
  note: string;
}

export interface FieldOverview {
  field: FieldInfo;
  wells: WellOverview[];
  output: FieldOutput;
}

export interface FieldOverviewRequest {
  field?: string;
}

export interface FieldOverviewResponse {
  fields: FieldOverview[];
  settings: SettingsJson;
  generatedAt: string;
}

export interface WellSeriesRequest extends WellRef {
  /** Default 'time'. On 'mass', `x` holds the produced mass since time zero. */
  basis?: Basis;
  /** Default false: soft-deleted readings are left out. */
  includeDeleted?: boolean;
}

/**
 * Codes of `exclusion`: why the fit would leave a reading out (fits.ts ExclusionReason); `deleted`
 * marks a soft-deleted reading (only with includeDeleted), which the fit never sees.
 */
export const EXCLUSION_CODES = { included: 0, 'not-producing': 1, flagged: 2, 'no-temperature': 3, 'before-time-zero': 4, deleted: 5 } as const;

/** What wellSeries and chartSeries both give besides the columns. */
export interface SeriesHead {
  well: WellInfo;
  basis: Basis;
  /** Time zero (production start, else the first live reading); null for a well without readings. */
  timeOrigin: string | null;
  referenceTemperatureC: number | null;
  count: number;
  /** The first reading's instant, ms since 1970-01-01 UTC: the epoch of wellSeries's `timeS`. */
  epochMs: number;
}

export interface WellSeriesResponse extends SeriesHead {
  /** Seconds after epochMs of each reading, ascending. */
  timeS: number[];
  /** Basis value of each reading: s after time zero, or kg produced since time zero; null before time zero. */
  x: (number | null)[];
  productionTemperatureC: (number | null)[];
  massFlowKgPerS: (number | null)[];
  /** EXCLUSION_CODES of each reading. */
  exclusion: number[];
  readingId: number[];
}

/**
 * chartSeries's columns. Each is the base64 of a little-endian typed array of `count` entries
 * (every platform Electron and Chromium run on is little-endian); NaN stands for a missing value.
 */
export interface PackedSeriesColumns {
  /** Float64: the instant of each reading, ms since 1970-01-01 UTC, ascending. */
  timeMs: string;
  /** Float64: production temperature, °C; NaN where the reading has none. */
  productionTemperatureC: string;
  /** Uint8: EXCLUSION_CODES of each reading. */
  exclusion: string;
  /**
   * Float64: kg produced since time zero, NaN before time zero (mass basis). Null on the time basis,
   * where the basis value is (timeMs − timeOrigin) / 1000 s from time zero on, and none before it.
   */
  x: string | null;
}

export interface ChartSeriesResponse extends SeriesHead {
  columns: PackedSeriesColumns;
}

const NAME = string({ maxLength: 200 });

export const FIELD_OVERVIEW_REQUEST = object({ field: optional(NAME) }) as Schema<FieldOverviewRequest>;

export const WELL_SERIES_REQUEST = object({
  well: NAME,
  field: optional(NAME),
  basis: optional(oneOf(BASES)),
  includeDeleted: optional(boolean()),
}) as Schema<WellSeriesRequest>;

/** chartSeries takes what wellSeries takes. */
export const CHART_SERIES_REQUEST = WELL_SERIES_REQUEST;

/** `WellInfo` is re-exported for screens that only import this module. */
export type { WellInfo };
