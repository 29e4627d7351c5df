/**
 * The field log's settings table (migration 0003): one row per key, its value as JSON text, when and
 * by whom it was last set. What the keys mean, their defaults and their checks live in the service
 * (src/main/services/settings.ts); this layer only stores and reads rows. Writes join the caller's
 * transaction, so a change and its audit row commit together.
 *
 * Exported API:
 *   interface StoredSetting { key; valueJson; updatedMs; updatedBy }
 *   class SettingsRepository(fdb: FieldDb)
 *     list(): StoredSetting[]                      by key
 *     put(key, value: unknown, who): void          insert or replace; the value is stored as JSON.stringify(value)
 *     remove(key): boolean                         true when a row was there
 */
import type Database from 'better-sqlite3';
import { requireText } from './checks.js';
import type { FieldDb } from './database.js';

export interface StoredSetting {
  key: string;
  valueJson: string;
  updatedMs: number;
  updatedBy: string;
}

interface SettingRow {
  key: string;
  value_json: string;
  updated_ms: number;
  updated_by: string;
}

export class SettingsRepository {
  private readonly now: () => number;
  private readonly all: Database.Statement<[], SettingRow>;
  private readonly upsert: Database.Statement<[string, string, number, string]>;
  private readonly deleteRow: Database.Statement<[string]>;

  constructor(fdb: FieldDb) {
    this.now = fdb.now;
    this.all = fdb.db.prepare('SELECT key, value_json, updated_ms, updated_by FROM settings ORDER BY key');
    this.upsert = fdb.db.prepare(
      `INSERT INTO settings (key, value_json, updated_ms, updated_by) VALUES (?, ?, ?, ?)
       ON CONFLICT (key) DO UPDATE SET value_json = excluded.value_json, updated_ms = excluded.updated_ms, updated_by = excluded.updated_by`,
    );
    this.deleteRow = fdb.db.prepare('DELETE FROM settings WHERE key = ?');
  }

  list(): StoredSetting[] {
    return this.all.all().map((r) => ({ key: r.key, valueJson: r.value_json, updatedMs: r.updated_ms, updatedBy: r.updated_by }));
  }

  put(key: string, value: unknown, who: string): void {
    this.upsert.run(requireText(key, 'key'), JSON.stringify(value), this.now(), requireText(who, 'who'));
  }

  remove(key: string): boolean {
    return this.deleteRow.run(key).changes > 0;
  }
}
