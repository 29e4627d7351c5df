/**
 * Fields: a named geothermal field with the IANA time zone its naive timestamps are local to.
 *
 * Exported API:
 *   interface Field { id; name; timeZone; notes; createdMs }
 *   interface NewField { name; timeZone?; notes? }      timeZone defaults to 'UTC'
 *   class FieldRepository(fdb: FieldDb)
 *     create(input: NewField): Field                    the zone is stored in its canonical spelling
 *     get(id): Field | undefined
 *     findByName(name): Field | undefined
 *     list(): Field[]                                   by name
 *   canonicalTimeZone(zone: unknown, field?): string    InputError unless the runtime knows the zone
 */
import type Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';
import { isConstraintError, requireText } from './checks.js';
import type { FieldDb } from './database.js';

export interface Field {
  id: number;
  name: string;
  /** IANA zone, e.g. Europe/Berlin. */
  timeZone: string;
  notes: string;
  createdMs: number;
}

export interface NewField {
  name: string;
  timeZone?: string;
  notes?: string;
}

interface FieldRow {
  id: number;
  name: string;
  time_zone: string;
  notes: string;
  created_ms: number;
}

export class FieldRepository {
  private readonly now: () => number;
  private readonly insert: Database.Statement<[string, string, string, number]>;
  private readonly byId: Database.Statement<[number], FieldRow>;
  private readonly byName: Database.Statement<[string], FieldRow>;
  private readonly all: Database.Statement<[], FieldRow>;

  constructor(fdb: FieldDb) {
    this.now = fdb.now;
    this.insert = fdb.db.prepare('INSERT INTO fields (name, time_zone, notes, created_ms) VALUES (?, ?, ?, ?)');
    this.byId = fdb.db.prepare('SELECT * FROM fields WHERE id = ?');
    this.byName = fdb.db.prepare('SELECT * FROM fields WHERE name = ?');
    this.all = fdb.db.prepare('SELECT * FROM fields ORDER BY name');
  }

  create(input: NewField): Field {
    const name = requireText(input.name, 'name');
    const timeZone = canonicalTimeZone(input.timeZone ?? 'UTC');
    const notes = input.notes ?? '';
    let id: number;
    try {
      id = Number(this.insert.run(name, timeZone, notes, this.now()).lastInsertRowid);
    } catch (e) {
      if (isConstraintError(e, 'UNIQUE')) throw new InputError(`a field named ${JSON.stringify(name)} already exists`, { field: 'name' });
      throw e;
    }
    return this.get(id) as Field;
  }

  get(id: number): Field | undefined {
    const row = this.byId.get(id);
    return row === undefined ? undefined : toField(row);
  }

  findByName(name: string): Field | undefined {
    const row = this.byName.get(name.trim());
    return row === undefined ? undefined : toField(row);
  }

  list(): Field[] {
    return this.all.all().map(toField);
  }
}

/**
 * Asks the runtime's time-zone database (ICU) whether it knows the zone; returns its canonical
 * spelling (`europe/berlin` → `Europe/Berlin`) so one zone is stored one way.
 */
export function canonicalTimeZone(zone: unknown, field = 'timeZone'): string {
  const text = requireText(zone, field);
  try {
    return new Intl.DateTimeFormat(undefined, { timeZone: text }).resolvedOptions().timeZone;
  } catch {
    throw new InputError(`unknown time zone ${JSON.stringify(text)}; use an IANA name such as "Europe/Berlin" or "UTC"`, { field });
  }
}

function toField(r: FieldRow): Field {
  return { id: r.id, name: r.name, timeZone: r.time_zone, notes: r.notes, createdMs: r.created_ms };
}
