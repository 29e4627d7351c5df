/** Stored rows as the contract shows them: ISO 8601 UTC instants, pressure in MPa, absent values null. */
import type { AuditEntryJson, ReadingJson } from '../../shared/contract/readings.js';
import { isoOf } from '../../shared/contract/schema.js';
import type { FieldInfo, WellInfo } from '../../shared/contract/wells.js';
import type { AuditEntry } from '../db/audit.js';
import type { Field } from '../db/fields.js';
import type { Reading } from '../db/readings.js';
import type { Well } from '../db/wells.js';
import type { ServiceContext } from './context.js';

const PA_PER_MPA = 1e6;

export function fieldInfo(f: Field): FieldInfo {
  return { id: f.id, name: f.name, timeZone: f.timeZone, notes: f.notes, createdAt: isoOf(f.createdMs) };
}

export function wellInfo(ctx: ServiceContext, w: Well): WellInfo {
  return {
    id: w.id,
    name: w.name,
    field: ctx.fieldOf(w.fieldId).name,
    fieldId: w.fieldId,
    kind: w.kind,
    reservoir: ctx.reservoirName(w.reservoirId),
    referenceTemperatureC: w.referenceTemperatureC,
    productionStart: w.productionStartMs === null ? null : isoOf(w.productionStartMs),
    createdAt: isoOf(w.createdMs),
  };
}

export function readingJson(r: Reading, wellName: string): ReadingJson {
  return {
    id: r.id,
    well: wellName,
    time: isoOf(r.timeMs),
    productionTemperatureC: r.productionTemperatureC,
    injectionTemperatureC: r.injectionTemperatureC,
    massFlowKgPerS: r.normalisedMassFlowKgPerS,
    volumeFlowM3PerS: r.volumeFlowM3PerS,
    flowDensityKgPerM3: r.flowDensityKgPerM3,
    pressureMPa: r.pressurePa === null ? null : r.pressurePa / PA_PER_MPA,
    status: r.status,
    flags: r.flags,
    note: r.note,
    source: r.source,
    importId: r.importId,
    sourceLine: r.sourceLine,
    entered: { temperatureUnit: r.temperatureUnit, flowUnit: r.flowUnit, pressureUnit: r.pressureUnit },
    updatedAt: r.updatedMs === null ? null : isoOf(r.updatedMs),
    deletedAt: r.deletedMs === null ? null : isoOf(r.deletedMs),
  };
}

export function auditJson(e: AuditEntry): AuditEntryJson {
  return {
    id: e.id,
    at: isoOf(e.atMs),
    who: e.who,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId,
    old: e.oldJson === null ? null : JSON.parse(e.oldJson),
    new: e.newJson === null ? null : JSON.parse(e.newJson),
    reason: e.reason,
  };
}
