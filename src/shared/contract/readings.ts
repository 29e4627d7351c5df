/**
 * Contract of readings: log one by hand in the units of the user's choice, edit or soft-delete it
 * with a reason (both land in the audit log), list a well's readings and the audit log.
 *
 * Requests carry numbers in the unit named beside them (`flow` in `flowUnit`); responses carry the
 * stored values with the unit in the name (°C, kg/s, m3/s, MPa). Instants are ISO 8601 UTC ('…Z').
 */
import { READING_STATUSES, type ReadingStatus } from './reading-rules.js';
import { array, boolean, instant, nullable, number, object, oneOf, optional, string, unitName, type Schema } from './schema.js';
import type { WellInfo, WellRef } from './wells.js';

export type { ReadingStatus } from './reading-rules.js';
export type ReadingSource = 'manual' | 'import';

/** A stored reading as every caller sees it. Absent values are null. */
export interface ReadingJson {
  id: number;
  well: string;
  time: string;
  productionTemperatureC: number | null;
  injectionTemperatureC: number | null;
  /** The normalised mass flow: as logged for a mass flow, converted with `flowDensityKgPerM3` for a volume flow. */
  massFlowKgPerS: number | null;
  /** As logged, when the flow was logged as a volume. */
  volumeFlowM3PerS: number | null;
  /** Water density used to convert a volume flow (the recorded assumption), else null. */
  flowDensityKgPerM3: number | null;
  pressureMPa: number | null;
  status: ReadingStatus;
  flags: string[];
  note: string;
  source: ReadingSource;
  importId: number | null;
  sourceLine: number | null;
  /** The units the values were entered in. */
  entered: { temperatureUnit: string | null; flowUnit: string | null; pressureUnit: string | null };
  updatedAt: string | null;
  /** Set on a soft-deleted reading (listed only on request). */
  deletedAt: string | null;
}

export interface LogReadingRequest extends WellRef {
  time: string;
  /** Required for a production well. */
  productionTemperature?: number;
  injectionTemperature?: number;
  /** Unit of both temperatures: degC (default), degF or K. */
  temperatureUnit?: string;
  flow?: number;
  /** kg/s, t/h, kg/h, m3/s, m3/h, m3/d, L/s, gpm, bbl/d; required with `flow`. */
  flowUnit?: string;
  /** Absolute wellhead pressure. */
  pressure?: number;
  /** MPa (default), kPa, bar, psi, Pa, atm. */
  pressureUnit?: string;
  status?: ReadingStatus;
  note?: string;
  flags?: string[];
}

export interface LogReadingResponse {
  reading: ReadingJson;
  /** Assumptions applied, e.g. the density that turned a volume flow into a mass flow. */
  assumptions: string[];
}

/** Only the keys given change; null clears a value. A changed temperature or pressure re-converts a volume flow. */
export interface EditReadingRequest {
  id: number;
  reason: string;
  time?: string;
  productionTemperature?: number | null;
  injectionTemperature?: number | null;
  temperatureUnit?: string;
  flow?: number | null;
  flowUnit?: string;
  pressure?: number | null;
  pressureUnit?: string;
  status?: ReadingStatus;
  note?: string;
  flags?: string[];
}

export interface EditReadingResponse {
  reading: ReadingJson;
  /** False when the edit changed nothing (then no audit row is written). */
  changed: boolean;
  assumptions: string[];
}

export interface GetReadingRequest {
  id: number;
}

export interface GetReadingResponse {
  reading: ReadingJson;
  well: WellInfo;
}

export interface DeleteReadingRequest {
  id: number;
  reason: string;
}

export interface DeleteReadingResponse {
  reading: ReadingJson;
}

export interface ListReadingsRequest extends WellRef {
  /** Inclusive bounds. */
  from?: string;
  to?: string;
  includeDeleted?: boolean;
  /**
   * Only the newest this many readings of the range (still in time order): a log book shows the
   * recent ones, and a well of a million readings need not send them all. Default: every one.
   */
  latest?: number;
}

export interface ListReadingsResponse {
  well: WellInfo;
  readings: ReadingJson[];
  /** Readings in the range, those left out by `latest` included. */
  total: number;
}

export interface AuditRequest {
  entity?: string;
  entityId?: number;
  who?: string;
  action?: string;
  from?: string;
  to?: string;
  limit?: number;
}

export interface AuditEntryJson {
  id: number;
  at: string;
  who: string;
  action: string;
  entity: string;
  entityId: number;
  /** The row before and after the change, as stored (null for none). */
  old: unknown;
  new: unknown;
  reason: string;
}

export interface AuditResponse {
  /** Newest first. */
  entries: AuditEntryJson[];
}

const text = (maxLength: number): Schema<string> => string({ allowEmpty: true, maxLength });
const reason = (): Schema<string> => string({ maxLength: 2000 });
const value = (): Schema<number> => number();
const flags = (): Schema<string[]> => array(string({ pattern: /^[a-z0-9][a-z0-9-]*$/, patternText: 'lower-case letters, digits and dashes' }), { maxLength: 20 });
const status = (): Schema<ReadingStatus> => oneOf(READING_STATUSES);
const id = (): Schema<number> => number({ integer: true, min: 1 });

export const LOG_READING_REQUEST: Schema<LogReadingRequest> = object({
  well: string({ maxLength: 200 }),
  field: optional(string({ maxLength: 200 })),
  time: instant(),
  productionTemperature: optional(value()),
  injectionTemperature: optional(value()),
  temperatureUnit: optional(unitName('temperature')),
  flow: optional(value()),
  flowUnit: optional(unitName(['massFlow', 'volumeFlow'])),
  pressure: optional(value()),
  pressureUnit: optional(unitName('pressure')),
  status: optional(status()),
  note: optional(text(2000)),
  flags: optional(flags()),
});

export const EDIT_READING_REQUEST: Schema<EditReadingRequest> = object({
  id: id(),
  reason: reason(),
  time: optional(instant()),
  productionTemperature: optional(nullable(value())),
  injectionTemperature: optional(nullable(value())),
  temperatureUnit: optional(unitName('temperature')),
  flow: optional(nullable(value())),
  flowUnit: optional(unitName(['massFlow', 'volumeFlow'])),
  pressure: optional(nullable(value())),
  pressureUnit: optional(unitName('pressure')),
  status: optional(status()),
  note: optional(text(2000)),
  flags: optional(flags()),
});

export const GET_READING_REQUEST: Schema<GetReadingRequest> = object({ id: id() });

export const DELETE_READING_REQUEST: Schema<DeleteReadingRequest> = object({ id: id(), reason: reason() });

export const LIST_READINGS_REQUEST: Schema<ListReadingsRequest> = object({
  well: string({ maxLength: 200 }),
  field: optional(string({ maxLength: 200 })),
  from: optional(instant()),
  to: optional(instant()),
  includeDeleted: optional(boolean()),
  latest: optional(number({ integer: true, min: 1, max: 100_000 })),
});

export const AUDIT_REQUEST: Schema<AuditRequest> = object({
  entity: optional(string({ maxLength: 100 })),
  entityId: optional(id()),
  who: optional(string({ maxLength: 200 })),
  action: optional(string({ maxLength: 100 })),
  from: optional(instant()),
  to: optional(instant()),
  limit: optional(number({ integer: true, min: 1, max: 100_000 })),
});
