/**
 * Schema migrations: the numbered files `migrations/NNNN_name.sql`, applied in order, each in its own
 * transaction, and recorded in `schema_migrations` (version, name, SHA-256 checksum, applied time).
 * `PRAGMA user_version` always equals the newest applied version.
 *
 * Exported API:
 *   interface Migration { version; name; fileName; sql; checksum }
 *   loadMigrations(folder?: URL): Migration[]          the files, checked to be numbered 1..n
 *   newestVersion(migrations): number
 *   inspectSchema(db, migrations, file): SchemaState   refuses newer, tampered or foreign databases
 *   applyMigrations(db, migrations, nowMs): number[]   applies the pending ones; returns their versions
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';

export interface Migration {
  /** 1-based, from the file's NNNN prefix. */
  readonly version: number;
  /** The part after the prefix, e.g. `field_log`. */
  readonly name: string;
  readonly fileName: string;
  readonly sql: string;
  /** SHA-256 (hex) of the file's text with line endings normalised to LF. */
  readonly checksum: string;
}

export interface SchemaState {
  /** Version the database is at now (0 for a new, empty database). */
  readonly current: number;
  /** Migrations not yet applied, in order. */
  readonly pending: readonly Migration[];
}

const FILE_PATTERN = /^(\d{4})_([A-Za-z0-9_-]+)\.sql$/;

/** The project root's migrations/ folder, both from src/main/db (tests) and dist/main/db (compiled CLI). */
const DEFAULT_FOLDER = new URL('../../../migrations/', import.meta.url);

const HISTORY_TABLE = `
  CREATE TABLE IF NOT EXISTS schema_migrations (
    version     INTEGER PRIMARY KEY,
    name        TEXT    NOT NULL,
    checksum    TEXT    NOT NULL,
    applied_ms  INTEGER NOT NULL
  )`;

/**
 * Reads the migration files. A gap or duplicate in the numbering is a packaging bug, not user input,
 * so it is a plain Error.
 */
export function loadMigrations(folder: URL = DEFAULT_FOLDER): Migration[] {
  const dir = fileURLToPath(folder);
  const migrations = readdirSync(dir)
    .map((fileName) => ({ fileName, match: FILE_PATTERN.exec(fileName) }))
    .filter((f): f is { fileName: string; match: RegExpExecArray } => f.match !== null)
    .map(({ fileName, match }) => {
      const sql = readFileSync(new URL(fileName, folder), 'utf8');
      return { version: Number(match[1]), name: match[2], fileName, sql, checksum: checksumOf(sql) };
    })
    .sort((a, b) => a.version - b.version);
  migrations.forEach((m, i) => {
    if (m.version !== i + 1) {
      throw new Error(`migrations in ${dir} must be numbered 0001, 0002, … without gaps; found ${m.fileName} at position ${i + 1}`);
    }
  });
  return migrations;
}

/**
 * Line endings are normalised before hashing so that a checkout with CRLF endings (git on Windows)
 * does not look like a tampered migration; a leading byte-order mark is ignored for the same reason.
 */
export function checksumOf(sql: string): string {
  const text = (sql.charCodeAt(0) === 0xfeff ? sql.slice(1) : sql).replace(/\r\n?/g, '\n');
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

export function newestVersion(migrations: readonly Migration[]): number {
  return migrations.length === 0 ? 0 : migrations[migrations.length - 1].version;
}

interface RecordedMigration {
  version: number;
  name: string;
  checksum: string;
}

/**
 * Where the database stands against the known migrations. Throws a one-line InputError (field
 * 'database', naming `file`) when the database is newer than this program, when a migration that
 * built it differs from the file of the same number, or when it is an SQLite file of something else.
 */
export function inspectSchema(db: Database.Database, migrations: readonly Migration[], file: string): SchemaState {
  const refuse = (reason: string): never => {
    throw new InputError(reason, { field: 'database', file });
  };
  const current = Number(db.pragma('user_version', { simple: true }));
  const newest = newestVersion(migrations);
  const recorded = hasHistoryTable(db)
    ? db.prepare<[], RecordedMigration>('SELECT version, name, checksum FROM schema_migrations ORDER BY version').all()
    : [];
  const recordedNewest = recorded.length === 0 ? 0 : recorded[recorded.length - 1].version;

  const written = Math.max(current, recordedNewest);
  if (written > newest) {
    refuse(`this field log was written by a newer version of Tauwell (schema ${written}); this version knows schemas up to ${newest}`);
  }
  if (current === 0 && recorded.length === 0) {
    // schema_migrations alone is what a failed first migration leaves behind; that file is still ours.
    const tables = db
      .prepare<[], { n: number }>(
        "SELECT count(*) AS n FROM sqlite_master WHERE type = 'table' AND name <> 'schema_migrations' AND name NOT LIKE 'sqlite\\_%' ESCAPE '\\'",
      )
      .get();
    if (tables !== undefined && tables.n > 0) refuse('this is an SQLite database of another program, not a Tauwell field log');
  }
  if (recorded.length !== current || recorded.some((r, i) => r.version !== i + 1)) {
    refuse(`the schema history is inconsistent (user_version ${current}, recorded migrations ${recorded.map((r) => r.version).join(', ') || 'none'})`);
  }
  for (const r of recorded) {
    const known = migrations[r.version - 1];
    if (known.checksum !== r.checksum) {
      refuse(
        `migration ${known.fileName} differs from the one that built this field log ` +
          `(recorded checksum ${r.checksum.slice(0, 12)}…, file now ${known.checksum.slice(0, 12)}…); ` +
          'refusing to open it with a modified schema file',
      );
    }
  }
  return { current, pending: migrations.slice(current) };
}

/**
 * Applies every migration above the database's version, each in its own IMMEDIATE transaction
 * together with its history row and `user_version`, so a failure leaves the database at the last
 * complete version. The version is re-read inside each transaction: another process that opened
 * the same file at the same moment may have applied it already.
 */
export function applyMigrations(db: Database.Database, migrations: readonly Migration[], nowMs: number): number[] {
  db.exec(HISTORY_TABLE);
  const record = db.prepare('INSERT INTO schema_migrations (version, name, checksum, applied_ms) VALUES (?, ?, ?, ?)');
  const applied: number[] = [];
  // Foreign keys are off while migrating (the pragma cannot change inside a transaction) so that a
  // later migration may rebuild a table the SQLite way; foreign_key_check before each commit keeps
  // the references honest. https://sqlite.org/lang_altertable.html#otheralter
  const foreignKeys = Number(db.pragma('foreign_keys', { simple: true }));
  db.pragma('foreign_keys = OFF');
  try {
    for (const m of migrations) {
      const applyOne = db.transaction(() => {
        if (Number(db.pragma('user_version', { simple: true })) >= m.version) return;
        try {
          db.exec(m.sql);
        } catch (e) {
          throw new Error(`migration ${m.fileName} failed: ${e instanceof Error ? e.message : String(e)}`, { cause: e });
        }
        const broken = db.pragma('foreign_key_check') as unknown[];
        if (broken.length > 0) throw new Error(`migration ${m.fileName} left ${broken.length} broken foreign keys`);
        record.run(m.version, m.name, m.checksum, nowMs);
        // PRAGMA takes no bound parameters; the version is an integer we parsed ourselves.
        db.pragma(`user_version = ${m.version}`);
        applied.push(m.version);
      });
      applyOne.immediate();
    }
  } finally {
    db.pragma(`foreign_keys = ${foreignKeys === 1 ? 'ON' : 'OFF'}`);
  }
  return applied;
}

function hasHistoryTable(db: Database.Database): boolean {
  return db.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'schema_migrations'").get() !== undefined;
}
