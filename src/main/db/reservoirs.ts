/**
 * Reservoirs of a field and their dated heat-model assumptions. An assumption change adds version
 * n + 1; an earlier version is never rewritten, so a fit or report can name the assumptions it used.
 *
 * Exported API:
 *   interface Reservoir { id; fieldId; name }
 *   interface ReservoirVersion { id; reservoirId; version; paramsJson; recordedMs; recordedBy; note }
 *   interface NewReservoirVersion { params; recordedBy; note? }
 *   class ReservoirRepository(fdb: FieldDb)
 *     create({ fieldId, name }): Reservoir
 *     get(id): Reservoir | undefined
 *     findByName(fieldId, name): Reservoir | undefined
 *     listByField(fieldId): Reservoir[]                                by name
 *     addVersion(reservoirId, input: NewReservoirVersion): ReservoirVersion
 *     latestVersion(reservoirId): ReservoirVersion | undefined
 *     getVersion(reservoirId, version): ReservoirVersion | undefined
 *     listVersions(reservoirId): ReservoirVersion[]                    oldest first
 */
import type Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';
import { parseReservoirParams } from '../../shared/reservoir/params.js';
import { isConstraintError, requireId, requireText } from './checks.js';
import type { FieldDb } from './database.js';

export interface Reservoir {
  id: number;
  fieldId: number;
  name: string;
}

export interface ReservoirVersion {
  id: number;
  reservoirId: number;
  /** 1, 2, … per reservoir. */
  version: number;
  /** The parameters exactly as stored: the keys of `tauwell theory --params` (°C, MPa, SI otherwise). */
  paramsJson: string;
  recordedMs: number;
  recordedBy: string;
  note: string;
}

export interface NewReservoirVersion {
  /** Checked with parseReservoirParams; stored as given (JSON.stringify). */
  params: unknown;
  recordedBy: string;
  note?: string;
}

interface ReservoirRow {
  id: number;
  field_id: number;
  name: string;
}

interface VersionRow {
  id: number;
  reservoir_id: number;
  version: number;
  params_json: string;
  recorded_ms: number;
  recorded_by: string;
  note: string;
}

export class ReservoirRepository {
  private readonly now: () => number;
  private readonly fieldExists: Database.Statement<[number]>;
  private readonly insert: Database.Statement<[number, string]>;
  private readonly byId: Database.Statement<[number], ReservoirRow>;
  private readonly byName: Database.Statement<[number, string], ReservoirRow>;
  private readonly byField: Database.Statement<[number], ReservoirRow>;
  private readonly insertVersion: Database.Statement<[number, number, string, number, string, string]>;
  private readonly nextVersion: Database.Statement<[number], { next: number }>;
  private readonly latest: Database.Statement<[number], VersionRow>;
  private readonly oneVersion: Database.Statement<[number, number], VersionRow>;
  private readonly versions: Database.Statement<[number], VersionRow>;
  private readonly addVersionTx: (reservoirId: number, paramsJson: string, recordedBy: string, note: string) => number;

  constructor(fdb: FieldDb) {
    const db = fdb.db;
    this.now = fdb.now;
    this.fieldExists = db.prepare('SELECT 1 FROM fields WHERE id = ?');
    this.insert = db.prepare('INSERT INTO reservoirs (field_id, name) VALUES (?, ?)');
    this.byId = db.prepare('SELECT * FROM reservoirs WHERE id = ?');
    this.byName = db.prepare('SELECT * FROM reservoirs WHERE field_id = ? AND name = ?');
    this.byField = db.prepare('SELECT * FROM reservoirs WHERE field_id = ? ORDER BY name');
    this.insertVersion = db.prepare(
      `INSERT INTO reservoir_versions (reservoir_id, version, params_json, recorded_ms, recorded_by, note)
       VALUES (?, ?, ?, ?, ?, ?)`,
    );
    this.nextVersion = db.prepare('SELECT coalesce(max(version), 0) + 1 AS next FROM reservoir_versions WHERE reservoir_id = ?');
    this.latest = db.prepare('SELECT * FROM reservoir_versions WHERE reservoir_id = ? ORDER BY version DESC LIMIT 1');
    this.oneVersion = db.prepare('SELECT * FROM reservoir_versions WHERE reservoir_id = ? AND version = ?');
    this.versions = db.prepare('SELECT * FROM reservoir_versions WHERE reservoir_id = ? ORDER BY version');
    // Read-then-write: IMMEDIATE takes the write lock first, so two writers cannot both pick n + 1.
    const tx = db.transaction((reservoirId: number, paramsJson: string, recordedBy: string, note: string): number => {
      const { next } = this.nextVersion.get(reservoirId) as { next: number };
      this.insertVersion.run(reservoirId, next, paramsJson, this.now(), recordedBy, note);
      return next;
    });
    this.addVersionTx = (...args) => tx.immediate(...args);
  }

  create(input: { fieldId: number; name: string }): Reservoir {
    const fieldId = requireId(input.fieldId, 'fieldId');
    const name = requireText(input.name, 'name');
    if (this.fieldExists.get(fieldId) === undefined) throw new InputError(`no field with id ${fieldId}`, { field: 'fieldId' });
    let id: number;
    try {
      id = Number(this.insert.run(fieldId, name).lastInsertRowid);
    } catch (e) {
      if (isConstraintError(e, 'UNIQUE')) throw new InputError(`this field already has a reservoir named ${JSON.stringify(name)}`, { field: 'name' });
      throw e;
    }
    return this.get(id) as Reservoir;
  }

  get(id: number): Reservoir | undefined {
    const row = this.byId.get(id);
    return row === undefined ? undefined : toReservoir(row);
  }

  findByName(fieldId: number, name: string): Reservoir | undefined {
    const row = this.byName.get(fieldId, name.trim());
    return row === undefined ? undefined : toReservoir(row);
  }

  listByField(fieldId: number): Reservoir[] {
    return this.byField.all(fieldId).map(toReservoir);
  }

  addVersion(reservoirId: number, input: NewReservoirVersion): ReservoirVersion {
    requireId(reservoirId, 'reservoirId');
    if (this.get(reservoirId) === undefined) throw new InputError(`no reservoir with id ${reservoirId}`, { field: 'reservoirId' });
    parseReservoirParams(input.params); // throws an InputError naming the key at fault
    const recordedBy = requireText(input.recordedBy, 'recordedBy');
    const version = this.addVersionTx(reservoirId, JSON.stringify(input.params), recordedBy, input.note ?? '');
    return this.getVersion(reservoirId, version) as ReservoirVersion;
  }

  latestVersion(reservoirId: number): ReservoirVersion | undefined {
    const row = this.latest.get(reservoirId);
    return row === undefined ? undefined : toVersion(row);
  }

  getVersion(reservoirId: number, version: number): ReservoirVersion | undefined {
    const row = this.oneVersion.get(reservoirId, version);
    return row === undefined ? undefined : toVersion(row);
  }

  listVersions(reservoirId: number): ReservoirVersion[] {
    return this.versions.all(reservoirId).map(toVersion);
  }
}

function toReservoir(r: ReservoirRow): Reservoir {
  return { id: r.id, fieldId: r.field_id, name: r.name };
}

function toVersion(r: VersionRow): ReservoirVersion {
  return {
    id: r.id,
    reservoirId: r.reservoir_id,
    version: r.version,
    paramsJson: r.params_json,
    recordedMs: r.recorded_ms,
    recordedBy: r.recorded_by,
    note: r.note,
  };
}
