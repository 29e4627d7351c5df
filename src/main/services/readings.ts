/**
 * Readings by hand: log one in the units of the user's choice, edit or soft-delete it with a reason,
 * list a well's readings and the audit log. The values are judged by the same rules as an import
 * (src/shared/contract/reading-rules.ts); every change writes the audit log in its own transaction.
 */
import {
  checkFlags, flowDensity, flowValues, massOfVolumeFlow, normaliseReading, pressurePa, temperatureC,
} from '../../shared/contract/reading-rules.js';
import {
  AUDIT_REQUEST, DELETE_READING_REQUEST, EDIT_READING_REQUEST, GET_READING_REQUEST, LIST_READINGS_REQUEST, LOG_READING_REQUEST,
  type AuditRequest, type AuditResponse, type DeleteReadingRequest, type DeleteReadingResponse, type EditReadingRequest,
  type GetReadingRequest, type GetReadingResponse,
  type EditReadingResponse, type ListReadingsRequest, type ListReadingsResponse, type LogReadingRequest, type LogReadingResponse,
} from '../../shared/contract/readings.js';
import { instantMs, isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { Reading, ReadingChanges } from '../db/readings.js';
import type { Well } from '../db/wells.js';
import type { ServiceContext } from './context.js';
import { auditJson, readingJson, wellInfo } from './views.js';

export function readingServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  const anyInRange = db.prepare<[number, number, number], { id: number }>(
    'SELECT id FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ? ORDER BY time_ms, id',
  );
  // The newest `latest` of the range, newest first (reversed below), and the count of the range.
  const newestAny = db.prepare<[number, number, number, number], { id: number }>(
    'SELECT id FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ? ORDER BY time_ms DESC, id DESC LIMIT ?',
  );
  const newestLive = db.prepare<[number, number, number, number], { id: number }>(
    'SELECT id FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ? AND deleted_ms IS NULL ORDER BY time_ms DESC LIMIT ?',
  );
  const countAny = db.prepare<[number, number, number], number>('SELECT count(*) FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ?').pluck(true);
  const countLive = db.prepare<[number, number, number], number>(
    'SELECT count(*) FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ? AND deleted_ms IS NULL',
  ).pluck(true);
  const listRange = db.transaction((well: Well, fromMs: number, toMs: number, includeDeleted: boolean, latest: number | undefined) => {
    const byId = (r: { id: number }): Reading => ctx.readings.get(r.id) as Reading;
    const total = (includeDeleted ? countAny : countLive).get(well.id, fromMs, toMs) as number;
    if (latest !== undefined) {
      const rows = (includeDeleted ? newestAny : newestLive).all(well.id, fromMs, toMs, latest).reverse().map(byId);
      return { rows, total };
    }
    const rows = includeDeleted ? anyInRange.all(well.id, fromMs, toMs).map(byId) : ctx.readings.listLive(well.id, { fromMs, toMs });
    return { rows, total };
  });

  const wellOf = (r: Reading): Well => ctx.wells.get(r.wellId) as Well;

  /** A duplicate instant named the way the user knows the well, before the unique index has to say it. */
  function refuseDuplicate(well: Well, timeMs: number, exceptId?: number): void {
    const existing = ctx.readings.findLive(well.id, timeMs);
    if (existing !== undefined && existing.id !== exceptId) {
      throw new InputError(
        `${well.name} already has a reading at ${isoOf(timeMs)} (reading ${existing.id}); edit that reading instead, or correct the time`,
        { field: 'time' },
      );
    }
  }

  function requireLive(id: number): Reading {
    const r = ctx.readings.get(id);
    if (r === undefined) throw new InputError(`no reading with id ${id}`, { field: 'id' });
    if (r.deletedMs !== null) throw new InputError(`reading ${id} was deleted at ${isoOf(r.deletedMs)}`, { field: 'id' });
    return r;
  }

  return {
    logReading(request: LogReadingRequest): LogReadingResponse {
      const req = validate(LOG_READING_REQUEST, request);
      const { well } = ctx.well(req);
      if (well.kind === 'production' && req.productionTemperature === undefined) {
        throw new InputError(`missing: a reading of the production well ${well.name} needs its production temperature`, { field: 'productionTemperature' });
      }
      if ([req.productionTemperature, req.injectionTemperature, req.flow, req.pressure].every((v) => v === undefined)) {
        throw new InputError('missing: a reading needs at least one value (temperature, flow or pressure)', { field: 'injectionTemperature' });
      }
      for (const [unit, value, name] of [['flowUnit', 'flow', 'a flow'], ['pressureUnit', 'pressure', 'a pressure']] as const) {
        if (req[unit] !== undefined && req[value] === undefined) throw new InputError(`given without ${name}`, { field: unit });
      }
      const values = normaliseReading(req);
      const flags = checkFlags(req.flags ?? []);
      const timeMs = instantMs(req.time);
      refuseDuplicate(well, timeMs);
      const { assumptions, ...stored } = values;
      const id = ctx.readings.insert(
        { wellId: well.id, timeMs, source: 'manual', ...stored, note: req.note ?? '', flags },
        { who: ctx.who, reason: 'logged by hand' },
      );
      return { reading: readingJson(ctx.readings.get(id) as Reading, well.name), assumptions };
    },

    editReading(request: EditReadingRequest): EditReadingResponse {
      const req = validate(EDIT_READING_REQUEST, request);
      const old = requireLive(req.id);
      const well = wellOf(old);
      const { changes, assumptions } = editedValues(old, well, req);
      if (changes.timeMs !== undefined) refuseDuplicate(well, changes.timeMs, old.id);
      const updated = ctx.readings.edit(old.id, changes, { who: ctx.who, reason: req.reason });
      const changed = JSON.stringify({ ...updated, updatedMs: null }) !== JSON.stringify({ ...old, updatedMs: null });
      return { reading: readingJson(updated, well.name), changed, assumptions };
    },

    deleteReading(request: DeleteReadingRequest): DeleteReadingResponse {
      const req = validate(DELETE_READING_REQUEST, request);
      const old = requireLive(req.id);
      return { reading: readingJson(ctx.readings.softDelete(old.id, { who: ctx.who, reason: req.reason }), wellOf(old).name) };
    },

    getReading(request: GetReadingRequest): GetReadingResponse {
      const { id } = validate(GET_READING_REQUEST, request);
      const r = ctx.readings.get(id);
      if (r === undefined) throw new InputError(`no reading with id ${id}`, { field: 'id' });
      const well = wellOf(r);
      return { reading: readingJson(r, well.name), well: wellInfo(ctx, well) };
    },

    listReadings(request: ListReadingsRequest): ListReadingsResponse {
      const req = validate(LIST_READINGS_REQUEST, request);
      const { well } = ctx.well(req);
      const fromMs = req.from === undefined ? Number.MIN_SAFE_INTEGER : instantMs(req.from);
      const toMs = req.to === undefined ? Number.MAX_SAFE_INTEGER : instantMs(req.to);
      if (fromMs > toMs) throw new InputError(`the window ends (${req.to}) before it starts (${req.from})`, { field: 'to' });
      const { rows, total } = listRange(well, fromMs, toMs, req.includeDeleted === true, req.latest);
      return { well: wellInfo(ctx, well), readings: rows.map((r) => readingJson(r, well.name)), total };
    },

    auditLog(request: AuditRequest = {}): AuditResponse {
      const req = validate(AUDIT_REQUEST, request);
      const entries = ctx.audit.list({
        ...(req.entity !== undefined ? { entity: req.entity } : {}),
        ...(req.entityId !== undefined ? { entityId: req.entityId } : {}),
        ...(req.who !== undefined ? { who: req.who } : {}),
        ...(req.action !== undefined ? { action: req.action } : {}),
        ...(req.from !== undefined ? { fromMs: instantMs(req.from) } : {}),
        ...(req.to !== undefined ? { toMs: instantMs(req.to) } : {}),
        ...(req.limit !== undefined ? { limit: req.limit } : {}),
      });
      return { entries: entries.map(auditJson) };
    },
  };
}

/**
 * The stored changes an edit makes. Temperatures and pressure are converted like a new reading;
 * a volume flow is converted again when the temperature or pressure its density depends on changed.
 */
function editedValues(old: Reading, well: Well, req: EditReadingRequest): { changes: ReadingChanges; assumptions: string[] } {
  const changes: ReadingChanges = {};
  const assumptions: string[] = [];
  for (const [unit, values] of [['temperatureUnit', ['productionTemperature', 'injectionTemperature']], ['flowUnit', ['flow']], ['pressureUnit', ['pressure']]] as const) {
    if (req[unit] !== undefined && values.every((v) => req[v] === undefined || req[v] === null)) {
      throw new InputError(`given without ${values.join(' or ')}; a unit applies to the value given with it`, { field: unit });
    }
  }
  const temperatureUnit = req.temperatureUnit ?? 'degC';
  if (req.productionTemperature !== undefined) {
    if (req.productionTemperature === null && well.kind === 'production') {
      throw new InputError(`a reading of the production well ${well.name} keeps its production temperature; delete the reading instead`, { field: 'productionTemperature' });
    }
    changes.productionTemperatureC = req.productionTemperature === null ? null : temperatureC(req.productionTemperature, temperatureUnit, 'productionTemperature', 'temperatureUnit').valueC;
  }
  if (req.injectionTemperature !== undefined) {
    changes.injectionTemperatureC = req.injectionTemperature === null ? null : temperatureC(req.injectionTemperature, temperatureUnit, 'injectionTemperature', 'temperatureUnit').valueC;
  }
  if (typeof req.productionTemperature === 'number' || typeof req.injectionTemperature === 'number') changes.temperatureUnit = temperatureUnit;
  if (req.pressure !== undefined) {
    const p = req.pressure === null ? null : pressurePa(req.pressure, req.pressureUnit ?? 'MPa', 'pressure', 'pressureUnit');
    changes.pressurePa = p?.valuePa ?? null;
    changes.pressureUnit = p?.unit ?? null;
  }

  const productionC = changes.productionTemperatureC !== undefined ? changes.productionTemperatureC : old.productionTemperatureC;
  const injectionC = changes.injectionTemperatureC !== undefined ? changes.injectionTemperatureC : old.injectionTemperatureC;
  const pressure = changes.pressurePa !== undefined ? changes.pressurePa : old.pressurePa;
  if (req.flow !== undefined) {
    if (req.flow === null) {
      Object.assign(changes, { massFlowKgPerS: null, volumeFlowM3PerS: null, flowUnit: null, normalisedMassFlowKgPerS: null, flowDensityKgPerM3: null });
    } else {
      if (req.flowUnit === undefined) throw new InputError('a flow needs its unit: kg/s, t/h, m3/s, m3/h, L/s, gpm or bbl/d', { field: 'flowUnit' });
      const v = flowValues(req.flow, req.flowUnit, () => {
        const t = productionC ?? injectionC;
        if (t === null) throw new InputError('a volume flow needs a production (or injection) temperature for the water density', { field: 'flow' });
        return flowDensity(t, pressure, 'flow');
      }, 'flow', 'flowUnit');
      Object.assign(changes, {
        massFlowKgPerS: v.massFlowKgPerS, volumeFlowM3PerS: v.volumeFlowM3PerS, flowUnit: v.flowUnit,
        normalisedMassFlowKgPerS: v.normalisedMassFlowKgPerS, flowDensityKgPerM3: v.flowDensityKgPerM3,
      });
      if (v.densityNote !== null) assumptions.push(v.densityNote);
    }
  } else if (old.volumeFlowM3PerS !== null && (changes.productionTemperatureC !== undefined || changes.injectionTemperatureC !== undefined || changes.pressurePa !== undefined)) {
    const t = productionC ?? injectionC;
    if (t === null) throw new InputError('the volume flow of this reading needs a temperature for its density; give one, or clear the flow', { field: 'productionTemperature' });
    const d = flowDensity(t, pressure, 'flow');
    changes.flowDensityKgPerM3 = d.densityKgPerM3;
    changes.normalisedMassFlowKgPerS = massOfVolumeFlow(old.volumeFlowM3PerS, d.densityKgPerM3);
    assumptions.push(`${d.note} (converted again: the temperature or pressure changed)`);
  }

  if (req.time !== undefined) changes.timeMs = instantMs(req.time);
  if (req.status !== undefined) changes.status = req.status;
  if (req.note !== undefined) changes.note = req.note;
  if (req.flags !== undefined) changes.flags = checkFlags(req.flags);
  return { changes, assumptions };
}

