import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { AuditLog } from '../src/main/db/audit.js';
import type { FieldDb } from '../src/main/db/database.js';
import { FieldRepository } from '../src/main/db/fields.js';
import { ReadingRepository } from '../src/main/db/readings.js';
import { ReservoirRepository } from '../src/main/db/reservoirs.js';
import { WellRepository } from '../src/main/db/wells.js';
import { InputError } from '../src/shared/errors.js';
import { T0_MS, freshDb } from './db-helpers.js';

const WEEK_MS = 7 * 86_400_000; // 7 d × 86 400 s × 1000 ms

/** Hot-dry-rock assumptions in the `tauwell theory --params` keys; plausible magnitudes, invented for the test. */
const PARAMS_V1 = {
  kind: 'hot-dry-rock',
  surfaceTemperature: 12,
  gradient: 0.034,
  minUsefulTemperature: 70,
  maxDepth: 5200,
  area: 30000,
  rockDensity: 2650,
  rockSpecificHeat: 820,
  massFlow: 50,
  fluid: { density: 1000, specificHeat: 4180 },
};

let fdb: FieldDb;
let fields: FieldRepository;
let reservoirs: ReservoirRepository;
let wells: WellRepository;
let readings: ReadingRepository;
let audit: AuditLog;

beforeEach(() => {
  fdb = freshDb();
  fields = new FieldRepository(fdb);
  reservoirs = new ReservoirRepository(fdb);
  wells = new WellRepository(fdb);
  readings = new ReadingRepository(fdb);
  audit = new AuditLog(fdb);
});
afterEach(() => fdb.close());

function expectInputError(run: () => unknown, field: string, pattern: RegExp): void {
  let caught: unknown;
  try {
    run();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(InputError);
  expect((caught as InputError).where.field).toBe(field);
  expect((caught as InputError).message).toMatch(pattern);
}

function setup(): { fieldId: number; wellId: number } {
  const field = fields.create({ name: 'Kettle Ridge', timeZone: 'Europe/Berlin' });
  const well = wells.create({ fieldId: field.id, name: 'P-1', kind: 'production', referenceTemperatureC: 70 });
  return { fieldId: field.id, wellId: well.id };
}

describe('fields', () => {
  it('creates, finds and lists fields, storing the canonical IANA zone', () => {
    const f = fields.create({ name: '  Kettle Ridge ', timeZone: 'europe/berlin', notes: 'two producers' });
    // IANA tz database canonical spelling, as the runtime's ICU resolves it (common practice).
    expect(f).toEqual({ id: f.id, name: 'Kettle Ridge', timeZone: 'Europe/Berlin', notes: 'two producers', createdMs: f.createdMs });
    expect(f.createdMs).toBeGreaterThan(T0_MS); // the pinned clock, after the ticks that opening the log took
    expect(fields.create({ name: 'Alder Flats' }).timeZone).toBe('UTC');
    expect(fields.findByName('Kettle Ridge')).toEqual(f);
    expect(fields.get(f.id)).toEqual(f);
    expect(fields.list().map((x) => x.name)).toEqual(['Alder Flats', 'Kettle Ridge']);
    expect(fields.findByName('Nowhere')).toBeUndefined();
  });

  it('refuses an unknown time zone, an empty name and a duplicate name', () => {
    expectInputError(() => fields.create({ name: 'A', timeZone: 'Mars/Olympus_Mons' }), 'timeZone', /unknown time zone/);
    expectInputError(() => fields.create({ name: '  ' }), 'name', /non-empty/);
    fields.create({ name: 'A' });
    expectInputError(() => fields.create({ name: 'A' }), 'name', /already exists/);
  });
});

describe('reservoirs and their assumption versions', () => {
  it('an assumption change adds version n + 1 and leaves the old one byte-identical', () => {
    const { fieldId } = setup();
    const r = reservoirs.create({ fieldId, name: 'Main slab' });
    const v1 = reservoirs.addVersion(r.id, { params: PARAMS_V1, recordedBy: 'engineer', note: 'from the 2024 study' });
    expect(v1.version).toBe(1);
    const rawRow = fdb.db.prepare('SELECT *, hex(params_json) AS bytes FROM reservoir_versions WHERE id = ?');
    const before = rawRow.get(v1.id);

    const v2 = reservoirs.addVersion(r.id, { params: { ...PARAMS_V1, area: 45000 }, recordedBy: 'engineer', note: 'tracer test' });
    expect(v2.version).toBe(2);
    expect(rawRow.get(v1.id)).toEqual(before);
    expect(reservoirs.getVersion(r.id, 1)).toEqual(v1);
    expect(reservoirs.latestVersion(r.id)).toEqual(v2);
    expect(JSON.parse(v2.paramsJson).area).toBe(45000);
    expect(reservoirs.listVersions(r.id).map((v) => v.version)).toEqual([1, 2]);
    expect(reservoirs.findByName(fieldId, 'Main slab')).toEqual(r);
    expect(reservoirs.listByField(fieldId)).toEqual([r]);
  });

  it('refuses parameters the theory command would refuse, naming the key', () => {
    const { fieldId } = setup();
    const r = reservoirs.create({ fieldId, name: 'Main slab' });
    expectInputError(() => reservoirs.addVersion(r.id, { params: { ...PARAMS_V1, gradient: 'steep' }, recordedBy: 'x' }), 'gradient', /number/);
    expect(reservoirs.latestVersion(r.id)).toBeUndefined();
    expectInputError(() => reservoirs.addVersion(999, { params: PARAMS_V1, recordedBy: 'x' }), 'reservoirId', /no reservoir/);
  });
});

describe('wells', () => {
  it('creates wells in a reservoir of their own field and refuses one of another field', () => {
    const { fieldId } = setup();
    const r = reservoirs.create({ fieldId, name: 'Main slab' });
    const w = wells.create({ fieldId, name: 'I-1', kind: 'injection', reservoirId: r.id, productionStartMs: T0_MS });
    expect(w).toMatchObject({ fieldId, reservoirId: r.id, kind: 'injection', referenceTemperatureC: null, productionStartMs: T0_MS });
    expect(wells.listByField(fieldId).map((x) => x.name)).toEqual(['I-1', 'P-1']);

    const other = fields.create({ name: 'Other' });
    expectInputError(() => wells.create({ fieldId: other.id, name: 'X', kind: 'production', reservoirId: r.id }), 'reservoirId', /another field/);
    expectInputError(() => wells.create({ fieldId, name: 'P-1', kind: 'production' }), 'name', /already has a well/);
    expectInputError(() => wells.create({ fieldId, name: 'P-2', kind: 'observation' as never }), 'kind', /production/);
    // −273.15 °C is absolute zero (SI Brochure): no reference temperature lies below it.
    expectInputError(() => wells.create({ fieldId, name: 'P-3', kind: 'production', referenceTemperatureC: -300 }), 'referenceTemperatureC', /at least/);
  });

  it('an update writes an audit row with the old and new values', () => {
    const { wellId } = setup();
    const updated = wells.update(wellId, { referenceTemperatureC: 65 }, { who: 'engineer', reason: 'new reinjection plant' });
    expect(updated.referenceTemperatureC).toBe(65);
    const [entry] = audit.forEntity('well', wellId);
    expect(entry).toMatchObject({ who: 'engineer', action: 'edit', reason: 'new reinjection plant' });
    expect(JSON.parse(entry.oldJson as string).reference_temperature_c).toBe(70);
    expect(JSON.parse(entry.newJson as string).reference_temperature_c).toBe(65);
  });
});

describe('readings', () => {
  it('inserts and lists live readings in time order, with inclusive bounds', () => {
    const { wellId } = setup();
    for (const [k, temperature] of [[2, 149], [0, 151], [1, 150]] as const) {
      readings.insert({ wellId, timeMs: T0_MS + k * WEEK_MS, productionTemperatureC: temperature, temperatureUnit: '°C', source: 'manual' });
    }
    expect(readings.listLive(wellId).map((r) => r.productionTemperatureC)).toEqual([151, 150, 149]);
    expect(readings.listLive(wellId, { fromMs: T0_MS + WEEK_MS }).map((r) => r.productionTemperatureC)).toEqual([150, 149]);
    expect(readings.listLive(wellId, { fromMs: T0_MS, toMs: T0_MS + WEEK_MS }).map((r) => r.productionTemperatureC)).toEqual([151, 150]);
    const found = readings.findLive(wellId, T0_MS);
    expect(found).toMatchObject({ wellId, status: 'producing', flags: [], note: '', source: 'manual', deletedMs: null, updatedMs: null });
  });

  it('keeps one live reading per well and instant', () => {
    const { wellId } = setup();
    const id = readings.insert({ wellId, timeMs: T0_MS, productionTemperatureC: 151, source: 'manual' });
    expectInputError(() => readings.insert({ wellId, timeMs: T0_MS, productionTemperatureC: 152, source: 'manual' }), 'timeMs', new RegExp(`already has a reading at 2025-03-01T12:00:00.000Z \\(reading ${id}\\)`));
    // The index is in the schema itself, not only in the repository.
    expect(() =>
      fdb.db.prepare("INSERT INTO readings (well_id, time_ms, source, created_ms) VALUES (?, ?, 'manual', 0)").run(wellId, T0_MS),
    ).toThrow(/UNIQUE constraint failed/);
  });

  it('a soft delete hides the reading, keeps the row, frees the instant and writes the audit log', () => {
    const { wellId } = setup();
    const id = readings.insert({ wellId, timeMs: T0_MS, productionTemperatureC: 151, flags: ['spike'], source: 'manual' });
    const deleted = readings.softDelete(id, { who: 'operator', reason: 'sensor swapped' });
    expect(deleted.deletedMs).not.toBeNull();
    expect(readings.listLive(wellId)).toEqual([]);
    expect(readings.get(id)).toEqual(deleted);

    const [entry] = audit.forEntity('reading', id);
    expect(entry).toMatchObject({ who: 'operator', action: 'delete', reason: 'sensor swapped' });
    const old = JSON.parse(entry.oldJson as string);
    const now = JSON.parse(entry.newJson as string);
    expect(old).toMatchObject({ production_temperature_c: 151, flags: 'spike', deleted_ms: null });
    expect(now).toMatchObject({ production_temperature_c: 151, deleted_ms: deleted.deletedMs });

    expectInputError(() => readings.softDelete(id, { who: 'operator' }), 'id', /was deleted/);
    const replacement = readings.insert({ wellId, timeMs: T0_MS, productionTemperatureC: 150.5, source: 'manual' });
    expect(readings.findLive(wellId, T0_MS)?.id).toBe(replacement);
  });

  it('an edit changes the row in place and records who, the old and the new values', () => {
    const { wellId } = setup();
    const id = readings.insert({ wellId, timeMs: T0_MS, productionTemperatureC: 15.1, massFlowKgPerS: 50, source: 'manual' }, { who: 'operator' });
    const edited = readings.edit(id, { productionTemperatureC: 151, status: 'test', note: 'decimal point' }, { who: 'engineer', reason: 'typo' });
    expect(edited).toMatchObject({ id, productionTemperatureC: 151, massFlowKgPerS: 50, status: 'test', note: 'decimal point' });
    expect(edited.updatedMs).not.toBeNull();

    const entries = audit.forEntity('reading', id);
    expect(entries.map((e) => e.action)).toEqual(['create', 'edit']);
    const edit = entries[1];
    expect(edit).toMatchObject({ who: 'engineer', reason: 'typo' });
    expect(JSON.parse(edit.oldJson as string)).toMatchObject({ production_temperature_c: 15.1, status: 'producing', note: '' });
    expect(JSON.parse(edit.newJson as string)).toMatchObject({ production_temperature_c: 151, status: 'test', note: 'decimal point' });
    expect(audit.list({ who: 'engineer' }).map((e) => e.id)).toEqual([edit.id]);

    // Nothing changed: no write and no audit row.
    readings.edit(id, { productionTemperatureC: 151 }, { who: 'engineer' });
    expect(audit.forEntity('reading', id)).toHaveLength(2);
  });

  it('an edit cannot move a reading onto another live instant, nor touch a deleted one', () => {
    const { wellId } = setup();
    const a = readings.insert({ wellId, timeMs: T0_MS, source: 'manual' });
    const b = readings.insert({ wellId, timeMs: T0_MS + WEEK_MS, source: 'manual' });
    expectInputError(() => readings.edit(b, { timeMs: T0_MS }, { who: 'x' }), 'timeMs', new RegExp(`\\(reading ${a}\\)`));
    expect(audit.forEntity('reading', b)).toEqual([]); // the failed edit left no audit row
    readings.softDelete(a, { who: 'x' });
    expectInputError(() => readings.edit(a, { note: 'late' }, { who: 'x' }), 'id', /was deleted/);
    expectInputError(() => readings.edit(b, { note: 'late' }, { who: ' ' }), 'who', /non-empty/);
  });

  it('refuses bad values, naming the field', () => {
    const { wellId } = setup();
    expectInputError(() => readings.insert({ wellId, timeMs: 1.5, source: 'manual' }), 'timeMs', /whole number/);
    expectInputError(() => readings.insert({ wellId, timeMs: T0_MS, productionTemperatureC: Number.NaN, source: 'manual' }), 'productionTemperatureC', /finite/);
    expectInputError(() => readings.insert({ wellId, timeMs: T0_MS, status: 'off' as never, source: 'manual' }), 'status', /shut-in/);
    expectInputError(() => readings.insert({ wellId, timeMs: T0_MS, flags: ['bad,spike'], source: 'manual' }), 'flags', /flag/);
    expect(readings.listLive(wellId)).toEqual([]);
  });
});

describe('foreign keys', () => {
  it('are enforced by the database and reported by the repositories', () => {
    setup();
    // SQLite reports a broken reference as SQLITE_CONSTRAINT_FOREIGNKEY when PRAGMA foreign_keys is on (sqlite.org/foreignkeys.html).
    expect(() =>
      fdb.db.prepare("INSERT INTO readings (well_id, time_ms, source, created_ms) VALUES (999, 0, 'manual', 0)").run(),
    ).toThrow(/FOREIGN KEY constraint failed/);
    expect(() => fdb.db.prepare("INSERT INTO wells (field_id, name, kind, created_ms) VALUES (999, 'W', 'production', 0)").run()).toThrow(
      /FOREIGN KEY constraint failed/,
    );
    expectInputError(() => readings.insert({ wellId: 999, timeMs: T0_MS, source: 'manual' }), 'wellId', /no well with id 999/);
    expectInputError(() => readings.insert({ wellId: 1, timeMs: T0_MS, source: 'import', importId: 42 }), 'importId', /no import/);
    expectInputError(() => wells.create({ fieldId: 999, name: 'W', kind: 'production' }), 'fieldId', /no field/);
  });
});
