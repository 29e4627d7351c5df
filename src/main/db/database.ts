/**
 * Opening a field log: an SQLite file in WAL mode with foreign keys on, checked (`quick_check`),
 * copied aside before a schema upgrade, migrated to the newest schema, and with imports that a dead
 * process left 'running' marked 'interrupted'. Anything the user can fix is a one-line InputError
 * naming the file.
 *
 * Exported API:
 *   interface OpenOptions { readonly?; nativeBinding?; now? }
 *   interface FieldDb { db; file; schemaVersion; backupPath; interruptedImports; readonly; now(); integrityCheck(); close() }
 *   openDatabase(file: string, options?: OpenOptions): FieldDb
 */
import { accessSync, constants, existsSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';
import { applyMigrations, inspectSchema, loadMigrations, newestVersion, type Migration } from './migrations.js';

export interface OpenOptions {
  /** Open without writing: no migration (an older schema is refused), no bookkeeping. */
  readonly?: boolean;
  /** Path of the better-sqlite3 addon to load (the desktop shell passes an Electron build). */
  nativeBinding?: string;
  /** Clock in Unix epoch ms; tests pin it. Used for every time this layer records. */
  now?: () => number;
}

export interface FieldDb {
  /** The better-sqlite3 connection, for the repositories and for queries of their own. */
  readonly db: Database.Database;
  /** The file as it was given (`:memory:` for an in-memory log). */
  readonly file: string;
  /** Schema version after opening: always the newest known one. */
  readonly schemaVersion: number;
  /** Copy taken before an upgrade of an existing log, or null when none was needed. */
  readonly backupPath: string | null;
  /** Imports found 'running' from a process that had stopped, now marked 'interrupted'. */
  readonly interruptedImports: readonly number[];
  readonly readonly: boolean;
  now(): number;
  /** Full `PRAGMA integrity_check`: `['ok']` for a sound file, otherwise one line per problem. */
  integrityCheck(): string[];
  close(): void;
}

const BUSY_TIMEOUT_MS = 5000;
const MEMORY = ':memory:';

let knownMigrations: readonly Migration[] | undefined;
function migrations(): readonly Migration[] {
  knownMigrations ??= loadMigrations();
  return knownMigrations;
}

export function openDatabase(file: string, options: OpenOptions = {}): FieldDb {
  const readonly = options.readonly === true;
  const now = options.now ?? Date.now;
  const fail = (reason: string): never => {
    throw new InputError(reason, { field: 'database', file });
  };
  if (file !== MEMORY) checkPath(file, readonly, fail);

  let db: Database.Database;
  try {
    db = new Database(file, {
      readonly,
      fileMustExist: readonly,
      timeout: BUSY_TIMEOUT_MS,
      ...(options.nativeBinding !== undefined ? { nativeBinding: options.nativeBinding } : {}),
    });
  } catch (e) {
    if (isSqliteError(e)) return fail(describeSqliteError(e));
    throw e; // e.g. an addon that does not load: a packaging bug, not the user's file
  }

  try {
    db.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
    // quick_check before anything writes: it is also the first read, so a file that is not a
    // database fails here rather than half-way through a migration.
    const problems = (db.pragma('quick_check') as { quick_check: string }[]).map((r) => r.quick_check);
    if (problems.length !== 1 || problems[0] !== 'ok') {
      fail(`the file is damaged (quick_check: ${problems[0]}${problems.length > 1 ? ` and ${problems.length - 1} more problems` : ''})`);
    }
    if (!readonly) db.pragma('journal_mode = WAL');

    const known = migrations();
    const state = inspectSchema(db, known, file);
    let backupPath: string | null = null;
    if (state.pending.length > 0) {
      if (readonly) {
        fail(`this field log has schema ${state.current} and needs upgrading to ${newestVersion(known)}; open it once without read-only`);
      }
      if (state.current > 0 && file !== MEMORY) backupPath = backupBeforeUpgrade(db, file, state.current, now());
      applyMigrations(db, state.pending, now());
    }
    db.pragma('foreign_keys = ON');
    const interruptedImports = readonly ? [] : markInterruptedImports(db, now());
    return fieldDb(db, file, newestVersion(known), backupPath, interruptedImports, readonly, now);
  } catch (e) {
    db.close();
    if (e instanceof InputError) throw e;
    if (isSqliteError(e)) return fail(describeSqliteError(e));
    throw e;
  }
}

function fieldDb(
  db: Database.Database,
  file: string,
  schemaVersion: number,
  backupPath: string | null,
  interruptedImports: readonly number[],
  readonly: boolean,
  now: () => number,
): FieldDb {
  return {
    db,
    file,
    schemaVersion,
    backupPath,
    interruptedImports,
    readonly,
    now,
    integrityCheck: () => (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check),
    close: () => {
      if (db.open) db.close();
    },
  };
}

/** Failures SQLite would report vaguely ("unable to open database file") are named here first. */
function checkPath(file: string, readonly: boolean, fail: (reason: string) => never): void {
  const path = resolve(file);
  const folder = dirname(path);
  if (!existsSync(folder) || !statSync(folder).isDirectory()) fail(`the folder ${folder} does not exist`);
  if (!existsSync(path)) {
    if (readonly) fail('no such file');
    return;
  }
  if (statSync(path).isDirectory()) fail('it is a folder, not a file');
  try {
    accessSync(path, readonly ? constants.R_OK : constants.R_OK | constants.W_OK);
  } catch {
    fail(readonly ? 'permission denied (cannot read the file)' : 'permission denied (cannot read and write the file)');
  }
}

/**
 * `VACUUM INTO` writes a transactionally consistent copy through SQLite itself, synchronously, and
 * includes whatever is still in the WAL; a plain file copy could catch another process mid-write.
 * The copy keeps the old schema version, so an older Tauwell can open it.
 */
function backupBeforeUpgrade(db: Database.Database, file: string, fromVersion: number, nowMs: number): string {
  const stamp = new Date(nowMs).toISOString().replace(/[-:]/g, '').replace(/\.\d{3}/, ''); // 20250301T120000Z
  const base = `${file}.schema-${fromVersion}-backup-${stamp}`;
  let path = `${base}.sqlite`;
  for (let n = 2; existsSync(path); n++) path = `${base}-${n}.sqlite`;
  db.prepare('VACUUM INTO ?').run(path);
  return path;
}

/**
 * An import commits its 'running' row first and its readings in one later transaction together with
 * the final status, so a 'running' row seen at open is from a process that stopped (or, rarely,
 * from another process importing into the same file right now: its own final update will then
 * overwrite this mark with the true outcome). The mark is written to the audit log as well, and
 * the ids are returned, so the change is visible rather than silent.
 */
function markInterruptedImports(db: Database.Database, nowMs: number): number[] {
  const running = db.prepare<[], { id: number; n: number }>(
    `SELECT i.id, (SELECT count(*) FROM readings r WHERE r.import_id = i.id) AS n
       FROM imports i WHERE i.status = 'running' ORDER BY i.id`,
  );
  const mark = db.prepare(
    `UPDATE imports SET status = 'interrupted', finished_ms = ?, message = ? WHERE id = ? AND status = 'running'`,
  );
  const audit = db.prepare(
    `INSERT INTO audit_log (at_ms, who, action, entity, entity_id, old_json, new_json, reason)
     VALUES (?, 'tauwell', 'interrupt', 'import', ?, '{"status":"running"}', '{"status":"interrupted"}', ?)`,
  );
  return db.transaction(() => {
    const ids: number[] = [];
    for (const { id, n } of running.all()) {
      const stored = n === 0 ? 'none of its readings were stored' : `${n} of its readings are stored`;
      const message = `interrupted: the program stopped before this import finished; ${stored}`;
      if (mark.run(nowMs, message, id).changes === 1) {
        audit.run(nowMs, id, 'found still running when the field log was opened');
        ids.push(id);
      }
    }
    return ids;
  }).immediate();
}

function isSqliteError(e: unknown): e is Error & { code: string } {
  return e instanceof Database.SqliteError;
}

function describeSqliteError(e: Error & { code: string }): string {
  const { code, message } = e;
  if (code.startsWith('SQLITE_NOTADB')) return 'not a Tauwell field log (not an SQLite database, or it is encrypted)';
  if (code.startsWith('SQLITE_CORRUPT')) return `the file is damaged (${message})`;
  if (code.startsWith('SQLITE_CANTOPEN')) return 'cannot open the file';
  if (code.startsWith('SQLITE_READONLY') || code.startsWith('SQLITE_PERM')) return 'cannot write to the file';
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) {
    return `the field log is locked by another program (waited ${BUSY_TIMEOUT_MS / 1000} s)`;
  }
  return message.replace(/\s+/g, ' ');
}
