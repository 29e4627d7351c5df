/**
 * The storing half of the field-data CSV import: validated rows from the streaming reader
 * (read-csv.ts) into the field log, atomically, losing nothing.
 *
 *   1. Hash the file: first, when a complete import of a file of the same size exists (a file whose
 *      bytes were already imported completely is then refused unless `force`), else on a worker
 *      thread while the import reads it (file-hash.ts has the measurements and the reasons).
 *   2. Open the reader: encoding, dialect, header, columns and units are settled, and a whole-file
 *      problem (missing column, unstated date order) is an InputError before anything is written.
 *   3. Commit the import's 'running' record on its own, so that a process killed mid-file leaves a
 *      visible trace (openDatabase marks it 'interrupted').
 *   4. One transaction (BEGIN IMMEDIATE … COMMIT) for everything else: each reading is stored, or
 *      counted as an exact duplicate of the reading at its well and instant, or held as a conflict
 *      (never an overwrite); each rejected row is stored verbatim with its line and reason; rows of
 *      wells the field lacks are rejected naming the well, or the wells are created (createWells);
 *      then spikes are flagged (spikes.ts) and the record is completed. Cancel (AbortSignal), an
 *      error or a crash rolls all of it back: the log holds none of the file's rows.
 *
 * Every outcome balances: rowsRead = imported + duplicates + conflicts + rejected (blank rows are
 * not data rows). A cancelled or failed import stored nothing, so its counts are all zero and its
 * message says how far it had read.
 *
 * The transaction is held across the reader's awaits: give the import a connection nothing else
 * writes through meanwhile (another connection's writes wait for it, as SQLite intends).
 *
 *   importReadingsCsv(fdb, file, options: StoreCsvOptions): Promise<ImportOutcome>
 * Rejects only for a problem before the record exists (unreadable file, bad option, missing column,
 * cancelled while hashing: the signal's reason) or for a bug; otherwise resolves to the outcome.
 */
import type { ImportedValues } from '../../shared/contract/imports.js';
import { InputError } from '../../shared/errors.js';
import type { CsvFileInfo, ReadCounts, Reading, ReadingsCsvOptions } from '../../shared/import/types.js';
import { AuditLog } from '../db/audit.js';
import type { FieldDb } from '../db/database.js';
import type { Field } from '../db/fields.js';
import { WellRepository, type WellKind } from '../db/wells.js';
import { fileSizeOf, hashBeside, sha256OfFile, type FileHash, type HashJob } from './file-hash.js';
import { openReadingsCsv } from './read-csv.js';
import { comparedRoles, sameReading } from './same-reading.js';
import { ImportSpikes, SPIKE_RULE_TEXT, takesPart, type ImportedSpan } from './spikes.js';
import { ImportStore, ReadingInserter, zeroCounts, type ImportCounts, type ImportRow } from './store.js';

export interface StoreCsvOptions {
  field: Field;
  /** Reader options; naive timestamps default to the field's time zone. */
  csv?: ReadingsCsvOptions & { batchRows?: number; chunkBytes?: number };
  /** Create wells the field lacks (production wells, with an audit entry) instead of rejecting their rows. */
  createWells?: boolean;
  /** Import again a file whose bytes were already imported completely. */
  force?: boolean;
  /** Who imports, for the audit log. */
  who: string;
  signal?: AbortSignal;
  onProgress?: (progress: ImportProgress) => void;
  /** Extra facts for the record's options (e.g. the profile the options came from). */
  recordExtra?: Record<string, unknown>;
  /**
   * The file's name for the record, the audit log and the messages, when `file` is a copy (a file
   * a front end uploaded to a staging folder); default `file` itself.
   */
  fileName?: string;
}

export type ImportPhase = 'hashing' | 'reading' | 'checking spikes' | 'committing';

export interface ImportProgress {
  phase: ImportPhase;
  importId: number | null;
  bytesDone: number;
  totalBytes: number;
  /** Running totals of the rows handled so far (nothing is stored until the commit). */
  counts: Readonly<ImportCounts>;
}

export interface UnknownWell {
  name: string;
  rows: number;
}

export interface ImportOutcome {
  /** The import's record; null when refused as already imported. */
  importId: number | null;
  status: 'complete' | 'failed' | 'cancelled' | 'refused';
  /** The newest earlier complete import of the same bytes, if any. */
  alreadyImportedId: number | null;
  sha256: string;
  sizeBytes: number;
  /** What was stored (all zero unless complete). */
  counts: ImportCounts;
  unknownWells: UnknownWell[];
  createdWells: string[];
  info: CsvFileInfo | null;
  readCounts: ReadCounts | null;
  message: string;
  /** The bad input that failed an import part-way (e.g. an invalid byte deep in the file). */
  error: InputError | null;
}

/** Starting a hashing thread costs about 20 ms, the time this thread hashes some 6 MB in. */
const HASH_BESIDE_MIN_BYTES = 8 * 1024 * 1024;
/** Distinct unknown well names remembered for the report; beyond this the rows are still rejected and counted. */
const UNKNOWN_WELLS_LISTED = 1000;

interface WellSlot {
  id: number;
  kind: WellKind;
  /** Span of the readings this import stored, for the spike pass. */
  fromMs: number;
  toMs: number;
  stored: number;
}

export async function importReadingsCsv(fdb: FieldDb, file: string, options: StoreCsvOptions): Promise<ImportOutcome> {
  const { signal, onProgress } = options;
  const counts = zeroCounts();
  const report = (phase: ImportPhase, importId: number | null, bytesDone: number, totalBytes: number): void => {
    onProgress?.({ phase, importId, bytesDone, totalBytes, counts });
  };

  // Hash first when an earlier complete import has this very size, or when the file is small enough
  // that starting a thread would cost more; otherwise on another thread, beside the import.
  const store = new ImportStore(fdb);
  const sizeBytes = await fileSizeOf(file);
  let hash: FileHash | null = null;
  let previous: ImportRow | undefined;
  if (sizeBytes < HASH_BESIDE_MIN_BYTES || store.completeOfSize(sizeBytes)) {
    hash = await sha256OfFile(file, { ...(signal !== undefined ? { signal } : {}), onProgress: (done, total) => report('hashing', null, done, total) });
    previous = store.lastComplete(hash.sha256);
    if (previous !== undefined && options.force !== true) {
      return {
        alreadyImportedId: previous.id, sha256: hash.sha256, sizeBytes: hash.bytes, importId: null, status: 'refused', counts,
        unknownWells: [], createdWells: [], info: null, readCounts: null, error: null,
        message: `already imported completely as import ${previous.id} (same SHA-256); nothing done — import it again with force to count its rows as duplicates`,
      };
    }
  }
  signal?.throwIfAborted();
  const beside = hash === null ? hashBeside(file) : null;
  try {
    return await importHashed(fdb, store, file, options, counts, report, hash ?? (beside as HashJob), previous);
  } finally {
    beside?.cancel();
  }
}

/** Steps 2–4, with the file's hash known or on its way. */
async function importHashed(
  fdb: FieldDb, store: ImportStore, file: string, options: StoreCsvOptions, counts: ImportCounts,
  report: (phase: ImportPhase, importId: number | null, bytesDone: number, totalBytes: number) => void,
  known: FileHash | HashJob, previous: ImportRow | undefined,
): Promise<ImportOutcome> {
  const { field, signal } = options;
  const fileName = options.fileName ?? file;
  let hash = 'sha256' in known ? known : null;
  const base = (): Pick<ImportOutcome, 'alreadyImportedId' | 'sha256' | 'sizeBytes'> => ({
    alreadyImportedId: previous?.id ?? null, sha256: hash?.sha256 ?? '', sizeBytes: hash?.bytes ?? info.sizeBytes,
  });
  const csvOptions = { ...options.csv, timeZone: options.csv?.timeZone ?? field.timeZone, ...(signal !== undefined ? { signal } : {}) };
  const csv = await openReadingsCsv(file, csvOptions);
  const info = csv.info;
  const startedMs = fdb.now();
  const recordOptions: Record<string, unknown> = {
    given: givenOptions(options.csv),
    timeZone: csvOptions.timeZone,
    createWells: options.createWells === true,
    force: options.force === true,
    ...(previous !== undefined ? { alreadyImportedAs: previous.id } : {}),
    file: fileFacts(info),
    spikeRule: SPIKE_RULE_TEXT,
    ...options.recordExtra,
  };
  let importId: number;
  try {
    importId = store.begin({
      fileName, fileSize: info.sizeBytes, sha256: hash?.sha256 ?? '', fieldId: field.id,
      mapping: info.columns, units: info.units, options: recordOptions, startedMs,
    });
  } catch (err) {
    await csv.close();
    throw err;
  }

  const db = fdb.db;
  let bytesDone = 0;
  try {
    begin(fdb);
    const run = new StoringRun(fdb, store, importId, field, info, options, counts, startedMs);
    for await (const batch of csv) {
      run.batch(batch.readings, batch.rejections);
      bytesDone = batch.bytesRead;
      report('reading', importId, bytesDone, batch.totalBytes);
    }
    signal?.throwIfAborted();
    hash ??= await (known as HashJob).result;
    if (info.sizeBytes !== hash.bytes) {
      throw new InputError(`the file changed while it was imported (${hash.bytes} bytes hashed, ${info.sizeBytes} read); import it again`, { file });
    }
    report('checking spikes', importId, info.sizeBytes, info.sizeBytes);
    counts.flagged = run.spikes.finish(run.spans());
    checkBalance(counts, csv.counts.rowsRead);
    const readCounts = { ...csv.counts };
    const message = accountingText(counts, readCounts.blankRows);
    run.audit.record({ who: options.who, action: 'import', entity: 'import', entityId: importId, new: { file: fileName, sha256: hash.sha256, ...counts }, reason: '' });
    store.finish(importId, counts, 'complete', message, { ...recordOptions, read: readCounts }, fdb.now(), hash.sha256);
    report('committing', importId, info.sizeBytes, info.sizeBytes);
    db.exec('COMMIT');
    return {
      ...base(), importId, status: 'complete', counts, unknownWells: run.unknownWells(), createdWells: run.createdWells,
      info, readCounts, message, error: null,
    };
  } catch (err) {
    if (db.inTransaction) db.exec('ROLLBACK');
    await csv.close();
    const cancelled = signal?.aborted === true;
    const readSoFar = `after ${plural(counts.rowsRead, 'data row')} (${percentOf(bytesDone, info.sizeBytes)} of the file)`;
    const message = cancelled
      ? `cancelled ${readSoFar}; nothing from this file was stored`
      : `failed ${readSoFar}: ${messageNaming(err, file, fileName)}; nothing from this file was stored`;
    const status = cancelled ? 'cancelled' : 'failed';
    const stored = zeroCounts();
    const finish = db.transaction(() => {
      store.finish(importId, stored, status, message, { ...recordOptions, read: { ...csv.counts } }, fdb.now(), hash?.sha256 ?? '');
      new AuditLog(fdb).record({ who: options.who, action: status === 'cancelled' ? 'cancel' : 'fail', entity: 'import', entityId: importId, new: { status, message } });
    });
    try {
      finish.immediate();
    } catch {
      // E.g. the disk is full: the record stays 'running' and the next open marks it 'interrupted'; the first error is the one to report.
      throw err;
    }
    if (!cancelled && !(err instanceof InputError)) throw err;
    return {
      ...base(), importId, status, counts: stored, unknownWells: [], createdWells: [], info, readCounts: { ...csv.counts }, message,
      error: err instanceof InputError && !cancelled ? err : null,
    };
  }
}

/** BEGIN IMMEDIATE: the write lock now, or a clear error once the busy timeout has passed. */
function begin(fdb: FieldDb): void {
  try {
    fdb.db.exec('BEGIN IMMEDIATE');
  } catch (e) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED'))) {
      throw new InputError('the field log is locked by another program writing to it; try again when it has finished', { file: fdb.file, field: 'database' });
    }
    throw e;
  }
}

/** The per-row work of one import's data transaction. */
class StoringRun {
  readonly audit: AuditLog;
  readonly spikes: ImportSpikes;
  readonly createdWells: string[] = [];
  private readonly wellsRepo: WellRepository;
  private readonly wells = new Map<string, WellSlot | null>();
  private readonly unknown = new Map<string, number>();
  private unknownUnlisted = 0;
  private readonly roles;
  private readonly inserter: ReadingInserter;

  constructor(
    fdb: FieldDb,
    private readonly store: ImportStore,
    private readonly importId: number,
    private readonly field: Field,
    private readonly info: CsvFileInfo,
    private readonly options: StoreCsvOptions,
    private readonly counts: ImportCounts,
    private readonly createdMs: number,
  ) {
    this.audit = new AuditLog(fdb);
    this.spikes = new ImportSpikes(fdb.db, importId);
    this.wellsRepo = new WellRepository(fdb);
    this.roles = comparedRoles(info);
    const units = info.units;
    this.inserter = new ReadingInserter(fdb.db, importId, createdMs, units['production-temperature'].unit, units.flow.unit, units.pressure.unit);
    for (const w of this.wellsRepo.listByField(field.id)) this.wells.set(w.name, slot(w.id, w.kind));
  }

  batch(readings: readonly Reading[], rejections: readonly { line: number; raw: string; reason: string }[]): void {
    const counts = this.counts;
    for (const r of readings) this.reading(r);
    for (const j of rejections) this.store.reject(this.importId, j.line, j.raw, j.reason);
    counts.rejected += rejections.length;
    counts.rowsRead += readings.length + rejections.length;
  }

  spans(): ImportedSpan[] {
    const out: ImportedSpan[] = [];
    for (const w of this.wells.values()) {
      if (w !== null && w.stored > 0 && w.kind === 'production') out.push({ wellId: w.id, fromMs: w.fromMs, toMs: w.toMs });
    }
    return out;
  }

  unknownWells(): UnknownWell[] {
    const listed = [...this.unknown].map(([name, rows]) => ({ name, rows }));
    if (this.unknownUnlisted > 0) listed.push({ name: `(${this.unknownUnlisted} rows of further unknown wells not listed)`, rows: this.unknownUnlisted });
    return listed;
  }

  private reading(r: Reading): void {
    const w = this.wells.get(r.wellName) ?? this.findWell(r.wellName);
    if (w === null) {
      this.rejectUnknownWell(r);
      return;
    }
    const result = this.inserter.insert(w.id, r);
    if (result.changes === 1) {
      this.counts.imported++;
      w.stored++;
      if (r.timeMs < w.fromMs) w.fromMs = r.timeMs;
      if (r.timeMs > w.toMs) w.toMs = r.timeMs;
      if (w.kind === 'production') {
        const producing = r.status === 'producing';
        this.spikes.row(w.id, r.timeMs, Number(result.lastInsertRowid), r.productionTemperatureC, producing, producing);
      }
      return;
    }
    // A live reading holds this instant: stored before, or earlier in this very file.
    const existing = this.store.live(w.id, r.timeMs);
    if (existing === undefined) throw new Error(`import: the insert at well ${w.id}, ${r.timeMs} was skipped but no live reading holds the instant`);
    if (w.kind === 'production') {
      const value = existing.production_temperature_c;
      this.spikes.row(w.id, r.timeMs, existing.id, value ?? 0, value !== null && takesPart(existing.status, existing.flags), false);
    }
    if (sameReading(existing, r, this.roles)) {
      this.counts.duplicates++;
      return;
    }
    this.store.conflict(this.importId, r.line, r.raw, w.id, r.timeMs, JSON.stringify(importedValues(r)), existing.id);
    this.counts.conflicts++;
  }

  /** A well name not seen yet in this file: the field's well, a new well (createWells), or null. */
  private findWell(name: string): WellSlot | null {
    if (this.wells.has(name)) return this.wells.get(name) as WellSlot | null;
    const found = this.wellsRepo.findByName(this.field.id, name);
    let w: WellSlot | null = found === undefined ? null : slot(found.id, found.kind);
    if (w === null && this.options.createWells === true) {
      const created = this.wellsRepo.create({ fieldId: this.field.id, name, kind: 'production' });
      this.audit.record({
        who: this.options.who, action: 'create', entity: 'well', entityId: created.id, new: created,
        reason: `named by import ${this.importId} (${this.options.fileName ?? this.info.file}), created as a production well with createWells`,
      });
      this.createdWells.push(created.name);
      w = slot(created.id, created.kind);
    }
    if (this.wells.size < 100_000 || w !== null) this.wells.set(name, w);
    return w;
  }

  private rejectUnknownWell(r: Reading): void {
    const reason = `unknown well ${JSON.stringify(r.wellName)}: field ${JSON.stringify(this.field.name)} has no such well; `
      + 'add it first (tauwell add-well) or import with --create-wells (createWells) to create it as a production well';
    this.store.reject(this.importId, r.line, r.raw, reason);
    this.counts.rejected++;
    const seen = this.unknown.get(r.wellName);
    if (seen !== undefined) this.unknown.set(r.wellName, seen + 1);
    else if (this.unknown.size < UNKNOWN_WELLS_LISTED) this.unknown.set(r.wellName, 1);
    else this.unknownUnlisted++;
  }
}

function slot(id: number, kind: WellKind): WellSlot {
  return { id, kind, fromMs: Number.POSITIVE_INFINITY, toMs: Number.NEGATIVE_INFINITY, stored: 0 };
}

export function importedValues(r: Reading): ImportedValues {
  return {
    productionTemperatureC: r.productionTemperatureC,
    injectionTemperatureC: r.injectionTemperatureC,
    temperatureUnit: r.temperatureUnit,
    massFlowKgPerS: r.massFlowKgPerS,
    volumeFlowM3PerS: r.volumeFlowM3PerS,
    flowUnit: r.flowUnit,
    normalisedMassFlowKgPerS: r.normalisedMassFlowKgPerS,
    flowDensityKgPerM3: r.flowDensityKgPerM3,
    pressurePa: r.pressurePa,
    pressureUnit: r.pressureUnit,
    status: r.status,
    note: r.note,
  };
}

/** An error's message, naming the file as `fileName` when it names the copy at `file`. */
function messageNaming(err: unknown, file: string, fileName: string): string {
  if (err instanceof InputError && err.where.file === file && fileName !== file) return new InputError(err.reason, { ...err.where, file: fileName }).message;
  return err instanceof Error ? err.message : String(err);
}

/** The options as the caller gave them (not the tuning knobs), for the record. */
function givenOptions(csv: StoreCsvOptions['csv']): Record<string, unknown> {
  if (csv === undefined) return {};
  const { batchRows: _b, chunkBytes: _c, ...given } = csv;
  return given;
}

/** What the reader decided about the file, beyond the mapping and units kept in their own columns. */
function fileFacts(info: CsvFileInfo): Record<string, unknown> {
  const { columns: _columns, units: _units, file: _file, sizeBytes: _size, ...facts } = info;
  return facts;
}

function checkBalance(c: ImportCounts, readerRows: number): void {
  const sum = c.imported + c.duplicates + c.conflicts + c.rejected;
  if (sum !== c.rowsRead || c.rowsRead !== readerRows) {
    throw new Error(`import: the accounting does not balance (${c.rowsRead} rows handled, ${readerRows} read, ${sum} accounted for)`);
  }
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** "16 rows read = 4 imported + 6 duplicates + 1 conflict + 5 rejected; 1 of the imported flagged as a spike; 1 blank row skipped (blank rows are not data rows)". */
export function accountingText(c: ImportCounts, blankRows: number): string {
  let text = `${plural(c.rowsRead, 'row')} read = ${c.imported} imported + ${plural(c.duplicates, 'duplicate')} + ${plural(c.conflicts, 'conflict')} + ${c.rejected} rejected`;
  if (c.flagged > 0) text += `; ${c.flagged} of the imported flagged as ${c.flagged === 1 ? 'a spike' : 'spikes'}`;
  if (blankRows > 0) text += `; ${plural(blankRows, 'blank row')} skipped (blank rows are not data rows)`;
  return text;
}

function percentOf(done: number, total: number): string {
  return `${total === 0 ? 100 : Math.floor((100 * done) / total)} %`;
}
