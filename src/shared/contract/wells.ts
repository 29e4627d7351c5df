/**
 * Contract of fields and wells: list them with each well's latest live reading, create them, change
 * a well's reference temperature or production start. A well is named by `well` and, when the name
 * is not unique across fields, `field`.
 */
import type { ReadingJson } from './readings.js';
import { instant, nullable, number, object, oneOf, optional, string, type Schema } from './schema.js';

export type WellKind = 'production' | 'injection';
export const WELL_KINDS: readonly WellKind[] = ['production', 'injection'];

/** Names a well; `field` may be left out while the well's name is unique in the field log. */
export interface WellRef {
  well: string;
  field?: string;
}

export interface FieldInfo {
  id: number;
  name: string;
  /** IANA zone that naive timestamps of this field are local to. */
  timeZone: string;
  notes: string;
  createdAt: string;
}

export interface WellInfo {
  id: number;
  name: string;
  field: string;
  fieldId: number;
  kind: WellKind;
  reservoir: string | null;
  /** Tref, °C: θ = Tprod − Tref; null while not set. */
  referenceTemperatureC: number | null;
  /** Instant production started (time zero of fits), or null. */
  productionStart: string | null;
  createdAt: string;
}

export interface WellSummary extends WellInfo {
  liveReadings: number;
  latestReading: ReadingJson | null;
}

export interface ListWellsRequest {
  field?: string;
}

export interface ListWellsResponse {
  fields: (FieldInfo & { wells: WellSummary[] })[];
}

export interface GetWellResponse {
  well: WellInfo;
  field: FieldInfo;
}

export interface CreateFieldRequest {
  name: string;
  /** IANA zone, default UTC. */
  timeZone?: string;
  notes?: string;
}

export interface CreateWellRequest {
  field: string;
  name: string;
  kind: WellKind;
  reservoir?: string;
  referenceTemperatureC?: number;
  productionStart?: string;
}

export interface UpdateWellRequest extends WellRef {
  /** null clears the value. */
  referenceTemperatureC?: number | null;
  productionStart?: string | null;
  reservoir?: string | null;
  reason?: string;
}

const name = (): Schema<string> => string({ maxLength: 200 });
/** Absolute zero on the Celsius scale (SI Brochure): the lowest Tref there can be. */
const tref = (): Schema<number> => number({ unit: '°C', min: -273.15 });

export const WELL_REF: Schema<WellRef> = object({ well: name(), field: optional(name()) });

export const LIST_WELLS_REQUEST: Schema<ListWellsRequest> = object({ field: optional(name()) });

export const CREATE_FIELD_REQUEST: Schema<CreateFieldRequest> = object({
  name: name(),
  timeZone: optional(string({ maxLength: 100 })),
  notes: optional(string({ allowEmpty: true, maxLength: 10_000 })),
});

export const CREATE_WELL_REQUEST: Schema<CreateWellRequest> = object({
  field: name(),
  name: name(),
  kind: oneOf(WELL_KINDS),
  reservoir: optional(name()),
  referenceTemperatureC: optional(tref()),
  productionStart: optional(instant()),
});

export const UPDATE_WELL_REQUEST: Schema<UpdateWellRequest> = object({
  well: name(),
  field: optional(name()),
  referenceTemperatureC: optional(nullable(tref())),
  productionStart: optional(nullable(instant())),
  reservoir: optional(nullable(name())),
  reason: optional(string({ allowEmpty: true, maxLength: 2000 })),
});
