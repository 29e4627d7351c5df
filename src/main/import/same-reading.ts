/**
 * Is an imported row the very reading already stored at its well and instant (a duplicate, skipped
 * and counted), or does it say something else (a conflict, held for the user)?
 *
 * Only what the file states is compared: a value whose column the file does not have says nothing,
 * so a plant export without an injection-temperature column still duplicates a hand-logged reading
 * that has one. A column the file has but a row leaves empty does state "no value", and differs from a
 * stored value. Numbers are compared in the stored units (°C, kg/s, m³/s, Pa) to a relative 1e-9:
 * far below any gauge's resolution, far above the last-bit differences of two unit conversions of the
 * same entry. Units as entered are not compared: 302 °F and 150 °C are the same reading.
 *
 *   comparedRoles(info): ComparedRoles
 *   sameReading(stored: StoredValues, row: Reading, roles: ComparedRoles): boolean
 */
import type { CsvFileInfo, Reading } from '../../shared/import/types.js';

/** The stored columns a comparison needs, as the readings table names them. */
export interface StoredValues {
  production_temperature_c: number | null;
  injection_temperature_c: number | null;
  volume_flow_m3_s: number | null;
  normalised_mass_flow_kg_s: number | null;
  pressure_pa: number | null;
  status: string;
  note: string;
}

export interface ComparedRoles {
  injection: boolean;
  flow: boolean;
  pressure: boolean;
  status: boolean;
  note: boolean;
}

const RELATIVE_TOLERANCE = 1e-9;

export function comparedRoles(info: CsvFileInfo): ComparedRoles {
  const has = (role: keyof CsvFileInfo['columns']): boolean => info.columns[role] !== null;
  return { injection: has('injection-temperature'), flow: has('flow'), pressure: has('pressure'), status: has('status'), note: has('note') };
}

function same(a: number | null, b: number | null): boolean {
  if (a === null || b === null) return a === b;
  return Math.abs(a - b) <= RELATIVE_TOLERANCE * Math.max(Math.abs(a), Math.abs(b));
}

export function sameReading(stored: StoredValues, row: Reading, roles: ComparedRoles): boolean {
  return same(stored.production_temperature_c, row.productionTemperatureC)
    && (!roles.injection || same(stored.injection_temperature_c, row.injectionTemperatureC))
    && (!roles.flow || (same(stored.normalised_mass_flow_kg_s, row.normalisedMassFlowKgPerS) && same(stored.volume_flow_m3_s, row.volumeFlowM3PerS)))
    && (!roles.pressure || same(stored.pressure_pa, row.pressurePa))
    && (!roles.status || stored.status === row.status)
    && (!roles.note || stored.note.trim() === row.note.trim());
}
