/**
 * Wellhead readings. At most one live reading per well and instant (a partial unique index); a
 * deleted reading stays in the table with `deleted_ms` set. Edits and deletions write the audit log
 * (who, why, the row before and after, as stored) in the same transaction as the change.
 *
 * Exported API:
 *   type ReadingStatus = 'producing' | 'shut-in' | 'test';  type ReadingSource = 'manual' | 'import'
 *   interface ReadingValues { productionTemperatureC; injectionTemperatureC; temperatureUnit; massFlowKgPerS;
 *     volumeFlowM3PerS; flowUnit; normalisedMassFlowKgPerS; flowDensityKgPerM3; pressurePa; pressureUnit;
 *     status; note; flags }
 *   interface NewReading extends Partial<ReadingValues> { wellId; timeMs; source; importId?; sourceLine? }
 *   interface Reading extends ReadingValues { id; wellId; timeMs; source; importId; sourceLine; createdMs; updatedMs; deletedMs }
 *   type ReadingChanges = Partial<ReadingValues> & { timeMs?: number }
 *   interface ChangedBy { who; reason? }
 *   class ReadingRepository(fdb: FieldDb)
 *     insert(input: NewReading, audit?: ChangedBy): number   the new id; with `audit`, also a 'create' audit row
 *     get(id): Reading | undefined                            live or deleted
 *     findLive(wellId, timeMs): Reading | undefined
 *     listLive(wellId, range?: { fromMs?; toMs? }): Reading[] time order; both bounds inclusive
 *     listSeriesLive(wellId, toMs?): SeriesReading[]          the same, with only what a fit reads (a fraction of listLive's cost)
 *     edit(id, changes: ReadingChanges, by: ChangedBy): Reading   no write (and no audit row) when nothing changes
 *     softDelete(id, by: ChangedBy): Reading
 * Inserting joins the caller's transaction, so an import can wrap thousands of inserts in one.
 */
import type Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';
import { AuditLog } from './audit.js';
import { isConstraintError, isoTime, optionalNumber, optionalText, requireId, requireInstantMs, requireText } from './checks.js';
import type { FieldDb } from './database.js';
import { PLAIN, SPECIAL } from './series-columns.js';
import type { ReadingStatus, ReadingValues } from '../../shared/contract/reading-rules.js';
import type { SeriesReading } from '../../shared/series/well-series.js';

export type { ReadingStatus, ReadingValues };

export type ReadingSource = 'manual' | 'import';

export interface NewReading extends Partial<ReadingValues> {
  wellId: number;
  /** Unix epoch ms, UTC. */
  timeMs: number;
  source: ReadingSource;
  importId?: number | null;
  /** 1-based line of the imported file. */
  sourceLine?: number | null;
}

export interface Reading extends ReadingValues {
  id: number;
  wellId: number;
  timeMs: number;
  source: ReadingSource;
  importId: number | null;
  sourceLine: number | null;
  createdMs: number;
  updatedMs: number | null;
  deletedMs: number | null;
}

export type ReadingChanges = Partial<ReadingValues> & { timeMs?: number };

export interface ChangedBy {
  who: string;
  reason?: string;
}

/** The row as stored; this is also what the audit log records. */
interface ReadingRow {
  id: number;
  well_id: number;
  time_ms: number;
  production_temperature_c: number | null;
  injection_temperature_c: number | null;
  temperature_unit: string | null;
  mass_flow_kg_s: number | null;
  volume_flow_m3_s: number | null;
  flow_unit: string | null;
  normalised_mass_flow_kg_s: number | null;
  flow_density_kg_m3: number | null;
  pressure_pa: number | null;
  pressure_unit: string | null;
  status: ReadingStatus;
  note: string;
  source: ReadingSource;
  import_id: number | null;
  source_line: number | null;
  flags: string;
  created_ms: number;
  updated_ms: number | null;
  deleted_ms: number | null;
}

type ValueColumns = Pick<
  ReadingRow,
  | 'time_ms' | 'production_temperature_c' | 'injection_temperature_c' | 'temperature_unit' | 'mass_flow_kg_s'
  | 'volume_flow_m3_s' | 'flow_unit' | 'normalised_mass_flow_kg_s' | 'flow_density_kg_m3' | 'pressure_pa'
  | 'pressure_unit' | 'status' | 'note' | 'flags'
>;

const STATUSES: readonly ReadingStatus[] = ['producing', 'shut-in', 'test'];
const SOURCES: readonly ReadingSource[] = ['manual', 'import'];
const FLAG_PATTERN = /^[a-z0-9][a-z0-9-]*$/;
/** Absolute zero on the Celsius scale (SI Brochure). */
const ABSOLUTE_ZERO_C = -273.15;

export class ReadingRepository {
  private readonly now: () => number;
  private readonly audit: AuditLog;
  private readonly wellExists: Database.Statement<[number]>;
  private readonly importExists: Database.Statement<[number]>;
  private readonly insertRow: Database.Statement<[Record<string, unknown>]>;
  private readonly updateRow: Database.Statement<[Record<string, unknown>]>;
  private readonly deleteRow: Database.Statement<[number, number]>;
  private readonly byId: Database.Statement<[number], ReadingRow>;
  private readonly live: Database.Statement<[number, number], ReadingRow>;
  private readonly liveRange: Database.Statement<[number, number, number], ReadingRow>;
  private readonly seriesRange: Database.Statement<[number, number], SeriesRow>;
  private readonly seriesSpecial: Database.Statement<[number, number], [ReadingStatus, string]>;
  private readonly seriesTx: (wellId: number, toMs: number) => SeriesReading[];
  private readonly insertAudited: (input: NewReading, by: ChangedBy) => number;
  private readonly editTx: (id: number, changes: ReadingChanges, by: ChangedBy) => Reading;
  private readonly deleteTx: (id: number, by: ChangedBy) => Reading;

  constructor(fdb: FieldDb) {
    const db = fdb.db;
    this.now = fdb.now;
    this.audit = new AuditLog(fdb);
    this.wellExists = db.prepare('SELECT 1 FROM wells WHERE id = ?');
    this.importExists = db.prepare('SELECT 1 FROM imports WHERE id = ?');
    this.insertRow = db.prepare(
      `INSERT INTO readings (
         well_id, time_ms, production_temperature_c, injection_temperature_c, temperature_unit,
         mass_flow_kg_s, volume_flow_m3_s, flow_unit, normalised_mass_flow_kg_s, flow_density_kg_m3,
         pressure_pa, pressure_unit, status, note, source, import_id, source_line, flags, created_ms)
       VALUES (
         @well_id, @time_ms, @production_temperature_c, @injection_temperature_c, @temperature_unit,
         @mass_flow_kg_s, @volume_flow_m3_s, @flow_unit, @normalised_mass_flow_kg_s, @flow_density_kg_m3,
         @pressure_pa, @pressure_unit, @status, @note, @source, @import_id, @source_line, @flags, @created_ms)`,
    );
    this.updateRow = db.prepare(
      `UPDATE readings SET
         time_ms = @time_ms, production_temperature_c = @production_temperature_c,
         injection_temperature_c = @injection_temperature_c, temperature_unit = @temperature_unit,
         mass_flow_kg_s = @mass_flow_kg_s, volume_flow_m3_s = @volume_flow_m3_s, flow_unit = @flow_unit,
         normalised_mass_flow_kg_s = @normalised_mass_flow_kg_s, flow_density_kg_m3 = @flow_density_kg_m3,
         pressure_pa = @pressure_pa, pressure_unit = @pressure_unit, status = @status, note = @note,
         flags = @flags, updated_ms = @updated_ms
       WHERE id = @id AND deleted_ms IS NULL`,
    );
    this.deleteRow = db.prepare('UPDATE readings SET deleted_ms = ? WHERE id = ? AND deleted_ms IS NULL');
    this.byId = db.prepare('SELECT * FROM readings WHERE id = ?');
    this.live = db.prepare('SELECT * FROM readings WHERE well_id = ? AND time_ms = ? AND deleted_ms IS NULL');
    // Concrete bounds rather than "? IS NULL OR …" so the planner uses the partial index (well_id, time_ms).
    this.liveRange = db.prepare(
      `SELECT * FROM readings
        WHERE well_id = ? AND time_ms BETWEEN ? AND ? AND deleted_ms IS NULL
        ORDER BY time_ms`,
    );
    // What a fit reads, as raw rows of numbers: a fraction of the cost of full row objects. The status
    // and flags (strings, costly by the million) come only for the readings that are not plain
    // production, through their partial index (migration 0004), in the same order.
    this.seriesRange = db.prepare<[number, number], SeriesRow>(
      `SELECT id, time_ms, production_temperature_c, normalised_mass_flow_kg_s,
              CASE WHEN ${PLAIN} THEN 0 ELSE 1 END
         FROM readings
        WHERE well_id = ? AND time_ms <= ? AND deleted_ms IS NULL
        ORDER BY time_ms`,
    ).raw(true);
    this.seriesSpecial = db.prepare<[number, number], [ReadingStatus, string]>(
      `SELECT status, flags FROM readings INDEXED BY readings_special
        WHERE well_id = ? AND time_ms <= ? AND deleted_ms IS NULL AND ${SPECIAL}
        ORDER BY time_ms, id`,
    ).raw(true);

    // One read transaction, so the two queries see the same readings.
    this.seriesTx = db.transaction((wellId: number, to: number): SeriesReading[] => {
      const rows = this.seriesRange.all(wellId, to) as SeriesRow[];
      const special = this.seriesSpecial.all(wellId, to) as [ReadingStatus, string][];
      const out = new Array<SeriesReading>(rows.length);
      let k = 0;
      for (let i = 0; i < rows.length; i++) {
        const r = rows[i];
        let status: ReadingStatus = 'producing';
        let flags = NO_FLAGS;
        if (r[4] !== 0) {
          const [st, fl] = special[k++];
          status = st;
          flags = fl === '' ? NO_FLAGS : fl.split(',');
        }
        out[i] = { id: r[0], timeMs: r[1], productionTemperatureC: r[2], normalisedMassFlowKgPerS: r[3], status, flags };
      }
      if (k !== special.length) throw new Error(`listSeriesLive: well ${wellId} has ${special.length} readings that are not plain production, the walk met ${k}`);
      return out;
    });

    const insertTx = db.transaction((input: NewReading, by: ChangedBy): number => {
      const id = this.insert(input);
      this.audit.record({ who: by.who, action: 'create', entity: 'reading', entityId: id, new: this.byId.get(id), reason: by.reason ?? '' });
      return id;
    });
    this.insertAudited = (...args) => insertTx.immediate(...args);

    const editTx = db.transaction((id: number, changes: ReadingChanges, by: ChangedBy): Reading => {
      const old = this.requireLive(id);
      const values = checkedValues(withDefined(toReading(old), changes));
      if (sameValues(old, values)) return toReading(old);
      this.unique(old.well_id, values.time_ms, () => this.updateRow.run({ ...values, updated_ms: this.now(), id }));
      const updated = this.byId.get(id) as ReadingRow;
      this.audit.record({ who: by.who, action: 'edit', entity: 'reading', entityId: id, old, new: updated, reason: by.reason ?? '' });
      return toReading(updated);
    });
    this.editTx = (...args) => editTx.immediate(...args);

    const deleteTx = db.transaction((id: number, by: ChangedBy): Reading => {
      const old = this.requireLive(id);
      this.deleteRow.run(this.now(), id);
      const deleted = this.byId.get(id) as ReadingRow;
      this.audit.record({ who: by.who, action: 'delete', entity: 'reading', entityId: id, old, new: deleted, reason: by.reason ?? '' });
      return toReading(deleted);
    });
    this.deleteTx = (...args) => deleteTx.immediate(...args);
  }

  insert(input: NewReading, audit?: ChangedBy): number {
    if (audit !== undefined) return this.insertAudited(input, checkedBy(audit));
    const wellId = requireId(input.wellId, 'wellId');
    if (this.wellExists.get(wellId) === undefined) throw new InputError(`no well with id ${wellId}`, { field: 'wellId' });
    if (!SOURCES.includes(input.source)) throw new InputError(`must be one of ${SOURCES.join(', ')} (got ${JSON.stringify(input.source)})`, { field: 'source' });
    const importId = input.importId == null ? null : requireId(input.importId, 'importId');
    if (importId !== null && this.importExists.get(importId) === undefined) throw new InputError(`no import with id ${importId}`, { field: 'importId' });
    const row = {
      ...checkedValues(withDefined({ ...DEFAULT_VALUES, timeMs: input.timeMs }, input)),
      well_id: wellId,
      source: input.source,
      import_id: importId,
      source_line: input.sourceLine == null ? null : requireId(input.sourceLine, 'sourceLine'),
      created_ms: this.now(),
    };
    return this.unique(wellId, row.time_ms, () => Number(this.insertRow.run(row).lastInsertRowid));
  }

  get(id: number): Reading | undefined {
    const row = this.byId.get(id);
    return row === undefined ? undefined : toReading(row);
  }

  findLive(wellId: number, timeMs: number): Reading | undefined {
    const row = this.live.get(wellId, timeMs);
    return row === undefined ? undefined : toReading(row);
  }

  listLive(wellId: number, range: { fromMs?: number; toMs?: number } = {}): Reading[] {
    const from = range.fromMs === undefined ? Number.MIN_SAFE_INTEGER : requireInstantMs(range.fromMs, 'fromMs');
    const to = range.toMs === undefined ? Number.MAX_SAFE_INTEGER : requireInstantMs(range.toMs, 'toMs');
    return this.liveRange.all(wellId, from, to).map(toReading);
  }

  listSeriesLive(wellId: number, toMs?: number): SeriesReading[] {
    const to = toMs === undefined ? Number.MAX_SAFE_INTEGER : requireInstantMs(toMs, 'toMs');
    return this.seriesTx(wellId, to);
  }

  edit(id: number, changes: ReadingChanges, by: ChangedBy): Reading {
    return this.editTx(requireId(id, 'id'), changes, checkedBy(by));
  }

  softDelete(id: number, by: ChangedBy): Reading {
    return this.deleteTx(requireId(id, 'id'), checkedBy(by));
  }

  private requireLive(id: number): ReadingRow {
    const row = this.byId.get(id);
    if (row === undefined) throw new InputError(`no reading with id ${id}`, { field: 'id' });
    if (row.deleted_ms !== null) throw new InputError(`reading ${id} was deleted at ${isoTime(row.deleted_ms)}`, { field: 'id' });
    return row;
  }

  /** Runs a write, turning a clash with the one-live-reading-per-instant index into a clear InputError. */
  private unique<T>(wellId: number, timeMs: number, write: () => T): T {
    try {
      return write();
    } catch (e) {
      if (!isConstraintError(e, 'UNIQUE')) throw e;
      const existing = this.live.get(wellId, timeMs);
      const which = existing === undefined ? '' : ` (reading ${existing.id})`;
      throw new InputError(`well ${wellId} already has a reading at ${isoTime(timeMs)}${which}`, { field: 'timeMs' });
    }
  }
}

const DEFAULT_VALUES: ReadingValues = {
  productionTemperatureC: null,
  injectionTemperatureC: null,
  temperatureUnit: null,
  massFlowKgPerS: null,
  volumeFlowM3PerS: null,
  flowUnit: null,
  normalisedMassFlowKgPerS: null,
  flowDensityKgPerM3: null,
  pressurePa: null,
  pressureUnit: null,
  status: 'producing',
  note: '',
  flags: [],
};

/** `base` overlaid with the keys of `patch` that are not undefined (an explicit null does clear a value). */
function withDefined<T extends object>(base: T, patch: Partial<T>): T {
  const out = { ...base };
  for (const [k, v] of Object.entries(patch)) if (v !== undefined) (out as Record<string, unknown>)[k] = v;
  return out;
}

function checkedValues(v: ReadingValues & { timeMs: number }): ValueColumns {
  if (!STATUSES.includes(v.status)) throw new InputError(`must be one of ${STATUSES.join(', ')} (got ${JSON.stringify(v.status)})`, { field: 'status' });
  if (typeof v.note !== 'string') throw new InputError('must be text', { field: 'note' });
  return {
    time_ms: requireInstantMs(v.timeMs, 'timeMs'),
    production_temperature_c: optionalNumber(v.productionTemperatureC, 'productionTemperatureC', ABSOLUTE_ZERO_C),
    injection_temperature_c: optionalNumber(v.injectionTemperatureC, 'injectionTemperatureC', ABSOLUTE_ZERO_C),
    temperature_unit: optionalText(v.temperatureUnit, 'temperatureUnit'),
    mass_flow_kg_s: optionalNumber(v.massFlowKgPerS, 'massFlowKgPerS'),
    volume_flow_m3_s: optionalNumber(v.volumeFlowM3PerS, 'volumeFlowM3PerS'),
    flow_unit: optionalText(v.flowUnit, 'flowUnit'),
    normalised_mass_flow_kg_s: optionalNumber(v.normalisedMassFlowKgPerS, 'normalisedMassFlowKgPerS'),
    flow_density_kg_m3: optionalNumber(v.flowDensityKgPerM3, 'flowDensityKgPerM3', 0),
    pressure_pa: optionalNumber(v.pressurePa, 'pressurePa'),
    pressure_unit: optionalText(v.pressureUnit, 'pressureUnit'),
    status: v.status,
    note: v.note,
    flags: joinFlags(v.flags),
  };
}

/** Stored as a comma list in first-seen order, without repeats. */
function joinFlags(flags: unknown): string {
  if (!Array.isArray(flags)) throw new InputError('must be a list of flags', { field: 'flags' });
  for (const f of flags) {
    if (typeof f !== 'string' || !FLAG_PATTERN.test(f)) {
      throw new InputError(`each flag is lower-case letters, digits and dashes (got ${JSON.stringify(f)})`, { field: 'flags' });
    }
  }
  return [...new Set(flags as string[])].join(',');
}

function sameValues(old: ReadingRow, values: ValueColumns): boolean {
  return (Object.keys(values) as (keyof ValueColumns)[]).every((k) => old[k] === values[k]);
}

function checkedBy(by: ChangedBy): ChangedBy {
  return { who: requireText(by.who, 'who'), reason: by.reason ?? '' };
}

/** id, time_ms, production_temperature_c, normalised_mass_flow_kg_s, 0 for plain production (else 1) */
type SeriesRow = [number, number, number | null, number | null, 0 | 1];

/** Shared by every reading without flags (never mutated: SeriesReading.flags is readonly). */
const NO_FLAGS: readonly string[] = Object.freeze([]);

function toReading(r: ReadingRow): Reading {
  return {
    id: r.id,
    wellId: r.well_id,
    timeMs: r.time_ms,
    productionTemperatureC: r.production_temperature_c,
    injectionTemperatureC: r.injection_temperature_c,
    temperatureUnit: r.temperature_unit,
    massFlowKgPerS: r.mass_flow_kg_s,
    volumeFlowM3PerS: r.volume_flow_m3_s,
    flowUnit: r.flow_unit,
    normalisedMassFlowKgPerS: r.normalised_mass_flow_kg_s,
    flowDensityKgPerM3: r.flow_density_kg_m3,
    pressurePa: r.pressure_pa,
    pressureUnit: r.pressure_unit,
    status: r.status,
    note: r.note,
    flags: r.flags === '' ? [] : r.flags.split(','),
    source: r.source,
    importId: r.import_id,
    sourceLine: r.source_line,
    createdMs: r.created_ms,
    updatedMs: r.updated_ms,
    deletedMs: r.deleted_ms,
  };
}
