// Helpers for the import pipeline tests: a fresh field log with one field and its wells, a CSV file
// written to a temp folder, and plain queries of what the import stored.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FieldDb } from '../src/main/db/database.js';
import { FieldRepository, type Field } from '../src/main/db/fields.js';
import { WellRepository, type WellKind } from '../src/main/db/wells.js';
import { createImportService, type ImportService } from '../src/main/services/imports.js';
import { freshDb } from './db-helpers.js';

export interface ImportFixture {
  fdb: FieldDb;
  field: Field;
  service: ImportService;
  wellId(name: string): number;
}

/** A field log with the field "Test field" in `timeZone` and the given wells (production unless said). */
export function importFixture(options: { timeZone?: string; wells?: (string | [string, WellKind])[] } = {}): ImportFixture {
  const fdb = freshDb();
  const field = new FieldRepository(fdb).create({ name: 'Test field', timeZone: options.timeZone ?? 'UTC' });
  const wells = new WellRepository(fdb);
  for (const w of options.wells ?? ['W-1', 'W-2']) {
    const [name, kind] = typeof w === 'string' ? [w, 'production' as const] : w;
    wells.create({ fieldId: field.id, name, kind });
  }
  return {
    fdb,
    field,
    service: createImportService(fdb, { who: 'tester' }),
    wellId: (name) => (wells.findByName(field.id, name) as { id: number }).id,
  };
}

let dir: string | null = null;
let serial = 0;

/** Writes `content` to a new file in a temp folder; returns its path. */
export function csvFile(content: string, name = 'export.csv'): string {
  dir ??= mkdtempSync(join(tmpdir(), 'tauwell-pipeline-'));
  const path = join(dir, `${serial++}-${name}`);
  writeFileSync(path, content);
  return path;
}

export function count(fdb: FieldDb, sql: string, ...params: unknown[]): number {
  return (fdb.db.prepare(sql).get(...params) as { n: number }).n;
}

export interface StoredReading {
  id: number;
  well_id: number;
  time_ms: number;
  production_temperature_c: number;
  injection_temperature_c: number | null;
  mass_flow_kg_s: number | null;
  normalised_mass_flow_kg_s: number | null;
  pressure_pa: number | null;
  status: string;
  note: string;
  source: string;
  import_id: number | null;
  source_line: number | null;
  flags: string;
  temperature_unit: string | null;
  flow_unit: string | null;
  pressure_unit: string | null;
  deleted_ms: number | null;
}

export function readingsOf(fdb: FieldDb, importId?: number): StoredReading[] {
  return (importId === undefined
    ? fdb.db.prepare('SELECT * FROM readings ORDER BY well_id, time_ms, id').all()
    : fdb.db.prepare('SELECT * FROM readings WHERE import_id = ? ORDER BY well_id, time_ms, id').all(importId)) as StoredReading[];
}

/** UTC epoch ms of an ISO instant with Z. */
export function utc(iso: string): number {
  return Date.parse(iso);
}

/** Weekly ISO instants from 2024-01-01T00:00:00Z (a Monday). */
export function week(k: number): string {
  return new Date(Date.UTC(2024, 0, 1) + k * 7 * 86_400_000).toISOString().replace('.000Z', 'Z');
}
