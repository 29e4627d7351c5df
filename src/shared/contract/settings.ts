/**
 * Contract of the field log's analysis and display settings: the display units, the zone instants
 * are shown in, the economic limit forecasts run to (one for the log, optionally one per well), the
 * background heat flow recharge is compared with, and the forecast horizon. Stored in the field log
 * (migration 0003) so that every front end and every report uses the same ones.
 */
import type { ForecastLimit } from './fits.js';
import { nullable, number, object, oneOf, optional, string, type Schema } from './schema.js';

export type DisplayUnits = 'si' | 'us';
export const DISPLAY_UNITS: readonly DisplayUnits[] = ['si', 'us'];

export interface SettingsJson {
  /** si: °C, kg/s, MPa, MW; us: °F, lb/s (and US gal/min for volume), psi, MMBtu/h. */
  units: DisplayUnits;
  /** IANA zone instants are shown in; null: each field's own zone. */
  timeZone: string | null;
  /** The limit every well's forecast runs to unless the well has its own. */
  economicLimit: ForecastLimit;
  /** Well id (as a decimal string) → that well's own limit. */
  wellEconomicLimits: Record<string, ForecastLimit>;
  /** Background conductive heat flow the recharge heat flow is compared with, W/m². */
  backgroundHeatFlowWPerM2: number;
  /** Years of 365.25 d past the last reading that forecasts look ahead. */
  horizonYears: number;
  /** Which of the above were set by someone ('set') and which are the built-in defaults ('default'). */
  source: Record<'units' | 'timeZone' | 'economicLimit' | 'backgroundHeatFlowWPerM2' | 'horizonYears', 'set' | 'default'>;
  updatedAt: string | null;
}

/** Any subset; null for wellEconomicLimits[id] removes that well's own limit, null timeZone means "each field's own". */
export interface UpdateSettingsRequest {
  units?: DisplayUnits;
  timeZone?: string | null;
  economicLimit?: ForecastLimit;
  wellEconomicLimits?: Record<string, ForecastLimit | null>;
  backgroundHeatFlowWPerM2?: number;
  horizonYears?: number;
  reason?: string;
}

export const GET_SETTINGS_REQUEST = object({}) as Schema<Record<string, never>>;

/**
 * The economic limit's schema lives with the forecast request (fits.ts); it is passed in so the two
 * can never disagree.
 */
export function updateSettingsRequest(limit: Schema<ForecastLimit>): Schema<UpdateSettingsRequest> {
  const wellLimits: Schema<Record<string, ForecastLimit | null>> = {
    expected: 'an object of well id: economic limit or null',
    check(value, path) {
      if (typeof value !== 'object' || value === null || Array.isArray(value)) return object({}).check(value, path) as never;
      const out: Record<string, ForecastLimit | null> = {};
      for (const [key, v] of Object.entries(value as Record<string, unknown>)) {
        const at = path === '' ? key : `${path}.${key}`;
        if (!/^[1-9][0-9]{0,15}$/.test(key)) number({ integer: true, min: 1 }).check(key, at);
        out[key] = nullable(limit).check(v, at);
      }
      return out;
    },
  };
  return object({
    units: optional(oneOf(DISPLAY_UNITS)),
    timeZone: optional(nullable(string({ maxLength: 100 }))),
    economicLimit: optional(limit),
    wellEconomicLimits: optional(wellLimits),
    backgroundHeatFlowWPerM2: optional(number({ unit: 'W/m2', min: 0, exclusiveMin: true, max: 10 })),
    horizonYears: optional(number({ unit: 'yr', min: 0, exclusiveMin: true, max: 1000 })),
    reason: optional(string({ allowEmpty: true, maxLength: 2000 })),
  }) as Schema<UpdateSettingsRequest>;
}

/** Which field log the back end has open, for the frame of every screen and for reports. */
export interface AboutFieldLogJson {
  /** Absolute path of the SQLite file; null for an in-memory log. */
  path: string | null;
  sizeBytes: number | null;
  schemaVersion: number;
  appVersion: string;
  engineVersion: string;
  fields: number;
  wells: number;
  liveReadings: number;
}

export const ABOUT_FIELD_LOG_REQUEST = object({}) as Schema<Record<string, never>>;
