import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { openDatabase } from '../src/main/db/database.js';
import { applyMigrations, inspectSchema, loadMigrations, newestVersion } from '../src/main/db/migrations.js';
import { InputError } from '../src/shared/errors.js';
import { T0_MS, steppingClock, tempDir } from './db-helpers.js';

const MIGRATIONS = loadMigrations();
const NEWEST = newestVersion(MIGRATIONS);
const MIGRATIONS_DIR = new URL('../migrations/', import.meta.url);

/** The schema as SQLite stores it, for comparing an upgraded file with a fresh one. */
function schemaOf(db: Database.Database): string[] {
  return db
    .prepare<[], { sql: string }>("SELECT sql FROM sqlite_master WHERE sql IS NOT NULL AND name <> 'schema_migrations' ORDER BY name")
    .all()
    .map((r) => r.sql);
}

/** A file at schema `k`, built the way an older Tauwell would have left it, with a few rows of the 0001 tables. */
function databaseAtVersion(k: number): string {
  const file = join(tempDir(), 'field.sqlite');
  const db = new Database(file);
  db.pragma('journal_mode = WAL');
  applyMigrations(db, MIGRATIONS.slice(0, k), T0_MS);
  if (k >= 1) {
    db.exec(`
      INSERT INTO fields (id, name, time_zone, created_ms) VALUES (1, 'North', 'UTC', ${T0_MS});
      INSERT INTO wells (id, field_id, name, kind, created_ms) VALUES (1, 1, 'P-1', 'production', ${T0_MS});
      INSERT INTO readings (well_id, time_ms, production_temperature_c, source, created_ms)
        VALUES (1, ${T0_MS}, 151.5, 'manual', ${T0_MS}), (1, ${T0_MS + 604_800_000}, 150.25, 'manual', ${T0_MS});`);
  }
  db.close();
  return file;
}

function expectOneLineInputError(run: () => unknown, pattern: RegExp): InputError {
  let caught: unknown;
  try {
    run();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(InputError);
  const error = caught as InputError;
  expect(error.message).not.toContain('\n');
  expect(error.message).toMatch(pattern);
  return error;
}

describe('migration files', () => {
  it('are numbered 1..n and checksummed with SHA-256 of their text', () => {
    expect(MIGRATIONS.map((m) => m.version)).toEqual(MIGRATIONS.map((_, i) => i + 1));
    for (const m of MIGRATIONS) {
      // Independent check: SHA-256 (FIPS 180-4) of the file's bytes via node:crypto; the files use LF endings.
      const bytes = readFileSync(new URL(m.fileName, MIGRATIONS_DIR));
      expect(m.checksum).toBe(createHash('sha256').update(bytes).digest('hex'));
    }
  });
});

describe('openDatabase: a fresh field log', () => {
  it('reaches the newest schema with every migration recorded with its checksum and time', () => {
    const fdb = openDatabase(join(tempDir(), 'new.sqlite'), { now: () => T0_MS });
    try {
      expect(fdb.schemaVersion).toBe(NEWEST);
      expect(fdb.backupPath).toBeNull(); // nothing existed to copy
      expect(fdb.db.pragma('user_version', { simple: true })).toBe(NEWEST);
      const rows = fdb.db.prepare('SELECT version, name, checksum, applied_ms FROM schema_migrations ORDER BY version').all();
      expect(rows).toEqual(MIGRATIONS.map((m) => ({ version: m.version, name: m.name, checksum: m.checksum, applied_ms: T0_MS })));
      expect(fdb.integrityCheck()).toEqual(['ok']); // SQLite docs: integrity_check returns the single row 'ok' for a sound file
    } finally {
      fdb.close();
    }
  });

  it('runs in WAL mode with foreign keys on and a busy timeout', () => {
    const fdb = openDatabase(join(tempDir(), 'new.sqlite'));
    try {
      expect(fdb.db.pragma('journal_mode', { simple: true })).toBe('wal');
      expect(fdb.db.pragma('foreign_keys', { simple: true })).toBe(1);
      expect(fdb.db.pragma('busy_timeout', { simple: true })).toBeGreaterThan(0);
    } finally {
      fdb.close();
    }
  });

  it('opens again without migrating or copying', () => {
    const file = join(tempDir(), 'again.sqlite');
    openDatabase(file).close();
    const fdb = openDatabase(file);
    try {
      expect(fdb.schemaVersion).toBe(NEWEST);
      expect(fdb.backupPath).toBeNull();
    } finally {
      fdb.close();
    }
  });
});

describe('openDatabase: upgrading an existing field log', () => {
  for (let k = 1; k < NEWEST; k++) {
    it(`from schema ${k} keeps the rows, copies the file first, and ends at schema ${NEWEST}`, () => {
      const file = databaseAtVersion(k);
      const fdb = openDatabase(file, { now: () => T0_MS });
      try {
        // The stamp is the pinned clock in UTC: 2025-03-01T12:00:00Z.
        expect(fdb.backupPath).toBe(`${file}.schema-${k}-backup-20250301T120000Z.sqlite`);
        expect(fdb.schemaVersion).toBe(NEWEST);
        expect(fdb.db.prepare('SELECT version FROM schema_migrations ORDER BY version').pluck().all()).toEqual(MIGRATIONS.map((m) => m.version));
        expect(fdb.db.prepare('SELECT production_temperature_c FROM readings ORDER BY time_ms').pluck().all()).toEqual([151.5, 150.25]);

        const fresh = openDatabase(join(tempDir(), 'fresh.sqlite'));
        expect(schemaOf(fdb.db)).toEqual(schemaOf(fresh.db)); // the upgrade path builds the same schema as a new file
        fresh.close();
      } finally {
        fdb.close();
      }
      const backupPath = `${file}.schema-${k}-backup-20250301T120000Z.sqlite`;
      const copy = new Database(backupPath, { readonly: true });
      try {
        expect(copy.pragma('user_version', { simple: true })).toBe(k);
        expect(copy.prepare('SELECT count(*) FROM schema_migrations').pluck().get()).toBe(k);
        expect(copy.prepare('SELECT count(*) FROM readings').pluck().get()).toBe(2);
        expect(copy.pragma('integrity_check', { simple: true })).toBe('ok');
      } finally {
        copy.close();
      }
    });
  }

  it('refuses a read-only open of an older schema', () => {
    if (NEWEST < 2) return;
    const file = databaseAtVersion(NEWEST - 1);
    expectOneLineInputError(() => openDatabase(file, { readonly: true }), /needs upgrading/);
  });
});

describe('openDatabase: refusals', () => {
  it('refuses a field log written by a newer version, in one line naming the file', () => {
    const file = join(tempDir(), 'future.sqlite');
    openDatabase(file).close();
    const raw = new Database(file);
    raw.pragma('user_version = 5');
    raw.close();
    const error = expectOneLineInputError(() => openDatabase(file), /newer/);
    expect(error.message).toBe(
      `${file}, field "database": this field log was written by a newer version of Tauwell (schema 5); this version knows schemas up to ${NEWEST}`,
    );
    expect(error.where).toEqual({ field: 'database', file });
    expect(existsSync(`${file}.schema-5-backup-20250301T120000Z.sqlite`)).toBe(false);
  });

  it('refuses a database whose recorded migration checksum differs', () => {
    const file = join(tempDir(), 'tampered.sqlite');
    openDatabase(file).close();
    const raw = new Database(file);
    raw.prepare("UPDATE schema_migrations SET checksum = 'deadbeef' || substr(checksum, 9) WHERE version = 1").run();
    raw.close();
    expectOneLineInputError(() => openDatabase(file), /migration 0001_field_log\.sql differs from the one that built this field log/);
  });

  it('refuses when a migration file changed after it built the database', () => {
    const db = new Database(':memory:');
    applyMigrations(db, MIGRATIONS, T0_MS);
    const edited = MIGRATIONS.map((m, i) => (i === 0 ? { ...m, checksum: createHash('sha256').update(m.sql + '\n-- edited').digest('hex') } : m));
    expectOneLineInputError(() => inspectSchema(db, edited, 'x.sqlite'), /differs/);
    expect(inspectSchema(db, MIGRATIONS, 'x.sqlite')).toEqual({ current: NEWEST, pending: [] });
    db.close();
  });

  it('refuses a file that is not a database, in one line naming the file, and leaves it untouched', () => {
    const file = join(tempDir(), 'garbage.sqlite');
    const text = 'time,temperature\n2025-03-01,151.5\n'.repeat(200);
    writeFileSync(file, text);
    const error = expectOneLineInputError(() => openDatabase(file), /not an SQLite database/);
    expect(error.message.startsWith(file)).toBe(true);
    expect(readFileSync(file, 'utf8')).toBe(text);
  });

  it('refuses an SQLite database of another program', () => {
    const file = join(tempDir(), 'other.sqlite');
    const raw = new Database(file);
    raw.exec('CREATE TABLE photos (id INTEGER PRIMARY KEY, path TEXT)');
    raw.close();
    expectOneLineInputError(() => openDatabase(file), /another program/);
  });

  it('refuses a missing folder and a missing file opened read-only', () => {
    const dir = tempDir();
    expectOneLineInputError(() => openDatabase(join(dir, 'no-such-folder', 'f.sqlite')), /folder .* does not exist/);
    expectOneLineInputError(() => openDatabase(join(dir, 'missing.sqlite'), { readonly: true }), /no such file/);
    expectOneLineInputError(() => openDatabase(dir), /folder, not a file/);
  });
});

describe('openDatabase: imports left running', () => {
  it("marks a 'running' import 'interrupted', visibly, and leaves finished ones alone", () => {
    const file = join(tempDir(), 'imports.sqlite');
    const first = openDatabase(file, { now: () => T0_MS });
    const add = first.db.prepare(
      "INSERT INTO imports (file_name, file_size, sha256, mapping_json, units_json, started_ms, status) VALUES (?, 10, 'x', '{}', '{}', ?, ?)",
    );
    const running = Number(add.run('weekly.csv', T0_MS, 'running').lastInsertRowid);
    const complete = Number(add.run('earlier.csv', T0_MS, 'complete').lastInsertRowid);
    first.close(); // as if the process had died mid-import

    const clock = steppingClock(T0_MS + 3_600_000);
    const fdb = openDatabase(file, { now: clock });
    try {
      expect(fdb.interruptedImports).toEqual([running]);
      const rows = fdb.db.prepare('SELECT id, status, finished_ms, message FROM imports ORDER BY id').all() as Record<string, unknown>[];
      expect(rows[0]).toMatchObject({ id: running, status: 'interrupted', finished_ms: T0_MS + 3_600_000 });
      expect(rows[0].message).toMatch(/none of its readings were stored/);
      expect(rows[1]).toMatchObject({ id: complete, status: 'complete', finished_ms: null });
      const audit = fdb.db.prepare("SELECT who, action, entity_id FROM audit_log WHERE entity = 'import'").all();
      expect(audit).toEqual([{ who: 'tauwell', action: 'interrupt', entity_id: running }]);
    } finally {
      fdb.close();
    }
    const again = openDatabase(file);
    expect(again.interruptedImports).toEqual([]); // marked once only
    again.close();
  });
});
