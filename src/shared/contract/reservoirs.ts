/**
 * Contract of reservoirs and their versioned heat-model parameters: a change of assumptions adds
 * version n + 1 and never rewrites an earlier one. Parameters use the keys of `tauwell theory
 * --params` (°C, MPa, SI otherwise) and are checked by parseReservoirParams.
 */
import type { ReservoirTheoryJson } from '../reservoir/params.js';
import { number, object, optional, string, type Schema } from './schema.js';

export interface ReservoirRef {
  reservoir: string;
  /** May be left out while the reservoir's name is unique in the field log. */
  field?: string;
}

export interface ReservoirInfo {
  id: number;
  name: string;
  field: string;
  versions: number;
}

export interface ReservoirVersionJson {
  reservoir: string;
  version: number;
  /** As stored: the keys of `tauwell theory --params`. */
  params: unknown;
  recordedAt: string;
  recordedBy: string;
  note: string;
}

export interface CreateReservoirRequest {
  field: string;
  name: string;
}

/** Any value JSON can carry. */
export type JsonValue = string | number | boolean | null | object;

export interface AddReservoirVersionRequest extends ReservoirRef {
  params: JsonValue;
  note?: string;
}

export interface ListReservoirVersionsResponse {
  reservoir: ReservoirInfo;
  /** Oldest first. */
  versions: ReservoirVersionJson[];
}

export interface ReservoirTheoryRequest extends ReservoirRef {
  /** Default: the latest version. */
  version?: number;
}

export interface ReservoirTheoryResponse {
  reservoir: ReservoirInfo;
  version: ReservoirVersionJson;
  theory: ReservoirTheoryJson;
}

const name = (): Schema<string> => string({ maxLength: 200 });

/** Any JSON value; its content is checked by parseReservoirParams, which names the key at fault. */
const anything: Schema<JsonValue> = {
  expected: 'reservoir parameters',
  check(value, path) {
    if (value === undefined) return object({}).check(value, path);
    return value as JsonValue;
  },
};

export const RESERVOIR_REF: Schema<ReservoirRef> = object({ reservoir: name(), field: optional(name()) });

export const CREATE_RESERVOIR_REQUEST: Schema<CreateReservoirRequest> = object({ field: name(), name: name() });

export const ADD_RESERVOIR_VERSION_REQUEST: Schema<AddReservoirVersionRequest> = object({
  reservoir: name(),
  field: optional(name()),
  params: anything,
  note: optional(string({ allowEmpty: true, maxLength: 2000 })),
});

export const RESERVOIR_THEORY_REQUEST: Schema<ReservoirTheoryRequest> = object({
  reservoir: name(),
  field: optional(name()),
  version: optional(number({ integer: true, min: 1 })),
});
