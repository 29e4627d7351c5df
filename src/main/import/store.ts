/**
 * The SQL of an import: its record in `imports`, and the statements its one data transaction runs
 * for every row — a reading, a rejected row, a conflict. Statements are prepared once. The hot
 * insert (ReadingInserter) skips, rather than fails on, a clash with the one-live-reading-per-instant
 * index, so a duplicate costs no exception; it binds only the numbers, positionally: what is the same
 * for every row of a file (the import, the units) or takes one of a few values (status, an empty
 * note) is written into the SQL of one of a few prepared variants, because binding those strings
 * for every row cost 10–15 % of the whole insert (measured on 1,000,000 rows, Node 20, SQLite 3.5x).
 *
 * Exported API:
 *   type ImportStatus = 'running' | 'complete' | 'failed' | 'cancelled' | 'interrupted'
 *   interface ImportCounts { rowsRead; imported; duplicates; conflicts; rejected; flagged }
 *   interface ImportRow { id; file_name; file_size; sha256; field_id; mapping_json; units_json; options_json; …counts; started_ms; finished_ms; status; message }
 *   interface NewImport { fileName; fileSize; sha256; fieldId; mapping; units; options; startedMs }
 *   class ImportStore(fdb)
 *     begin(record: NewImport): number                 inserts the 'running' row in its own transaction
 *     finish(id, counts, status, message, options, finishedMs, sha256)   the final row (joins the caller's transaction)
 *     get(id), lastComplete(sha256), completeOfSize(bytes), list(limit)
 *   class ReadingInserter(db, importId, createdMs, info)
 *     insert(wellId, reading): RunResult               changes 1 = stored, 0 = a live reading holds that instant
 *     live(wellId, timeMs): LiveReading | undefined
 *     reject(importId, line, raw, reason), conflict(…)
 */
import type Database from 'better-sqlite3';
import type { FieldDb } from '../db/database.js';
import type { Reading } from '../../shared/import/types.js';
import type { StoredValues } from './same-reading.js';

export type ImportStatus = 'running' | 'complete' | 'failed' | 'cancelled' | 'interrupted';

export interface ImportCounts {
  /** Data rows read (blank rows are not data rows): imported + duplicates + conflicts + rejected. */
  rowsRead: number;
  imported: number;
  duplicates: number;
  conflicts: number;
  rejected: number;
  /** Imported readings flagged (spikes); a subset of `imported`. */
  flagged: number;
}

export function zeroCounts(): ImportCounts {
  return { rowsRead: 0, imported: 0, duplicates: 0, conflicts: 0, rejected: 0, flagged: 0 };
}

export interface ImportRow {
  id: number;
  file_name: string;
  file_size: number;
  sha256: string;
  field_id: number | null;
  mapping_json: string;
  units_json: string;
  options_json: string;
  rows_read: number;
  imported: number;
  duplicates: number;
  conflicts: number;
  rejected: number;
  flagged: number;
  started_ms: number;
  finished_ms: number | null;
  status: ImportStatus;
  message: string;
}

export interface NewImport {
  fileName: string;
  fileSize: number;
  sha256: string;
  fieldId: number;
  mapping: unknown;
  units: unknown;
  options: unknown;
  startedMs: number;
}

export interface LiveReading extends StoredValues {
  id: number;
  flags: string;
}

const READING_COLUMNS = `well_id, time_ms, production_temperature_c, injection_temperature_c, mass_flow_kg_s, volume_flow_m3_s,
    normalised_mass_flow_kg_s, flow_density_kg_m3, pressure_pa, source_line,
    temperature_unit, flow_unit, pressure_unit, status, note, import_id, created_ms, source`;
const SKIP_TAKEN_INSTANT = 'ON CONFLICT (well_id, time_ms) WHERE deleted_ms IS NULL DO NOTHING';
const STATUSES = ['producing', 'shut-in', 'test'] as const;

function sqlText(text: string): string {
  return `'${text.replace(/'/g, "''")}'`;
}

function sqlInteger(n: number): string {
  if (!Number.isSafeInteger(n)) throw new Error(`store: ${n} is not a safe integer`);
  return String(n);
}

/**
 * The insert of one imported reading. The fast variants hold the file's units, the status and an
 * empty note in their SQL; a row they do not fit (another unit, which the reader never produces
 * today) goes through the variant that binds everything.
 */
export class ReadingInserter {
  private readonly variants: (Database.Statement | undefined)[] = [];
  private readonly general: Database.Statement;
  private readonly constants: string;

  constructor(
    private readonly db: Database.Database,
    importId: number,
    createdMs: number,
    private readonly temperatureUnit: string,
    private readonly flowUnit: string,
    private readonly pressureUnit: string,
  ) {
    this.constants = `${sqlInteger(importId)}, ${sqlInteger(createdMs)}, 'import'`;
    this.general = db.prepare(
      `INSERT INTO readings (${READING_COLUMNS}) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ${this.constants}) ${SKIP_TAKEN_INSTANT}`,
    );
  }

  insert(wellId: number, r: Reading): Database.RunResult {
    const flow = r.flowUnit !== null;
    const pressure = r.pressureUnit !== null;
    const status = STATUSES.indexOf(r.status);
    if (r.temperatureUnit !== this.temperatureUnit || (flow && r.flowUnit !== this.flowUnit) || (pressure && r.pressureUnit !== this.pressureUnit) || status < 0) {
      return this.general.run(
        wellId, r.timeMs, r.productionTemperatureC, r.injectionTemperatureC, r.massFlowKgPerS, r.volumeFlowM3PerS,
        r.normalisedMassFlowKgPerS, r.flowDensityKgPerM3, r.pressurePa, r.line, r.temperatureUnit, r.flowUnit, r.pressureUnit, r.status, r.note,
      );
    }
    const noted = r.note !== '';
    const key = status * 8 + (noted ? 4 : 0) + (flow ? 2 : 0) + (pressure ? 1 : 0);
    const stmt = this.variants[key] ?? this.prepare(key, status, noted, flow, pressure);
    return noted
      ? stmt.run(wellId, r.timeMs, r.productionTemperatureC, r.injectionTemperatureC, r.massFlowKgPerS, r.volumeFlowM3PerS,
        r.normalisedMassFlowKgPerS, r.flowDensityKgPerM3, r.pressurePa, r.line, r.note)
      : stmt.run(wellId, r.timeMs, r.productionTemperatureC, r.injectionTemperatureC, r.massFlowKgPerS, r.volumeFlowM3PerS,
        r.normalisedMassFlowKgPerS, r.flowDensityKgPerM3, r.pressurePa, r.line);
  }

  private prepare(key: number, status: number, noted: boolean, flow: boolean, pressure: boolean): Database.Statement {
    const literals = [
      sqlText(this.temperatureUnit),
      flow ? sqlText(this.flowUnit) : 'NULL',
      pressure ? sqlText(this.pressureUnit) : 'NULL',
      sqlText(STATUSES[status]),
      noted ? '?' : "''",
    ].join(', ');
    const stmt = this.db.prepare(`INSERT INTO readings (${READING_COLUMNS}) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ${literals}, ${this.constants}) ${SKIP_TAKEN_INSTANT}`);
    this.variants[key] = stmt;
    return stmt;
  }
}

export class ImportStore {
  private readonly db: Database.Database;
  private readonly insertImport: Database.Statement<[Record<string, unknown>]>;
  private readonly updateImport: Database.Statement<[Record<string, unknown>]>;
  private readonly byId: Database.Statement<[number], ImportRow>;
  private readonly bySha: Database.Statement<[string], ImportRow>;
  private readonly recent: Database.Statement<[number], ImportRow>;
  private readonly bySize: Database.Statement<[number], { id: number }>;
  private readonly liveStmt: Database.Statement<[number, number], LiveReading>;
  private readonly rejectStmt: Database.Statement<[number, number, string, string]>;
  private readonly conflictStmt: Database.Statement<[number, number, string, number, number, string, number]>;

  constructor(fdb: FieldDb) {
    const db = (this.db = fdb.db);
    this.insertImport = db.prepare(
      `INSERT INTO imports (file_name, file_size, sha256, field_id, mapping_json, units_json, options_json, started_ms, status)
       VALUES (@file_name, @file_size, @sha256, @field_id, @mapping_json, @units_json, @options_json, @started_ms, 'running')`,
    );
    // No "AND status = 'running'": openDatabase in another process may have marked a live import
    // 'interrupted'; the true outcome overwrites that mark.
    this.updateImport = db.prepare(
      `UPDATE imports SET rows_read = @rows_read, imported = @imported, duplicates = @duplicates, conflicts = @conflicts,
              rejected = @rejected, flagged = @flagged, status = @status, message = @message, finished_ms = @finished_ms,
              options_json = @options_json, sha256 = @sha256
        WHERE id = @id`,
    );
    this.byId = db.prepare('SELECT * FROM imports WHERE id = ?');
    this.bySha = db.prepare(`SELECT * FROM imports WHERE sha256 = ? AND status = 'complete' ORDER BY id DESC LIMIT 1`);
    this.recent = db.prepare('SELECT * FROM imports ORDER BY id DESC LIMIT ?');
    this.bySize = db.prepare(`SELECT id FROM imports WHERE file_size = ? AND status = 'complete' LIMIT 1`);
    this.liveStmt = db.prepare(
      `SELECT id, production_temperature_c, injection_temperature_c, volume_flow_m3_s, normalised_mass_flow_kg_s, pressure_pa, status, note, flags
         FROM readings WHERE well_id = ? AND time_ms = ? AND deleted_ms IS NULL`,
    );
    this.rejectStmt = db.prepare('INSERT INTO rejected_rows (import_id, line, raw, reason) VALUES (?, ?, ?, ?)');
    this.conflictStmt = db.prepare(
      `INSERT INTO conflicts (import_id, line, raw, well_id, time_ms, values_json, existing_reading_id) VALUES (?, ?, ?, ?, ?, ?, ?)`,
    );
  }

  /** The 'running' record, committed at once so that an import that dies is visible afterwards. */
  begin(r: NewImport): number {
    const run = this.db.transaction(() => Number(this.insertImport.run({
      file_name: r.fileName,
      file_size: r.fileSize,
      sha256: r.sha256,
      field_id: r.fieldId,
      mapping_json: JSON.stringify(r.mapping),
      units_json: JSON.stringify(r.units),
      options_json: JSON.stringify(r.options),
      started_ms: r.startedMs,
    }).lastInsertRowid));
    return run.immediate();
  }

  finish(
    id: number, counts: ImportCounts, status: Exclude<ImportStatus, 'running' | 'interrupted'>, message: string, options: unknown, finishedMs: number, sha256: string,
  ): void {
    this.updateImport.run({
      id,
      sha256,
      rows_read: counts.rowsRead,
      imported: counts.imported,
      duplicates: counts.duplicates,
      conflicts: counts.conflicts,
      rejected: counts.rejected,
      flagged: counts.flagged,
      status,
      message,
      finished_ms: finishedMs,
      options_json: JSON.stringify(options),
    });
  }

  get(id: number): ImportRow | undefined {
    return this.byId.get(id);
  }

  /** Whether any complete import was of a file of exactly this size (only such a file can repeat it). */
  completeOfSize(bytes: number): boolean {
    return this.bySize.get(bytes) !== undefined;
  }

  /** The newest complete import of a file with this SHA-256, if any. */
  lastComplete(sha256: string): ImportRow | undefined {
    return this.bySha.get(sha256);
  }

  list(limit: number): ImportRow[] {
    return this.recent.all(limit);
  }

  live(wellId: number, timeMs: number): LiveReading | undefined {
    return this.liveStmt.get(wellId, timeMs);
  }

  reject(importId: number, line: number, raw: string, reason: string): void {
    this.rejectStmt.run(importId, line, raw, reason);
  }

  conflict(importId: number, line: number, raw: string, wellId: number, timeMs: number, valuesJson: string, existingId: number): void {
    this.conflictStmt.run(importId, line, raw, wellId, timeMs, valuesJson, existingId);
  }
}
