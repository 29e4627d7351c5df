// Conflicts an import held back, resolved one by one or in bulk with the audit log, and import
// profiles saved from one import and used by the next.
import { describe, expect, it } from 'vitest';
import { ReadingRepository } from '../src/main/db/readings.js';
import { InputError } from '../src/shared/errors.js';
import { count, csvFile, importFixture, utc, week } from './import-pipeline-helpers.js';

async function withConflicts() {
  const fx = importFixture();
  const repo = new ReadingRepository(fx.fdb);
  const stored = [0, 1, 2].map((k) => repo.insert({ wellId: fx.wellId('W-1'), timeMs: utc(week(k)), source: 'manual', productionTemperatureC: 150, massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40 }));
  // Each row differs from the stored reading of its week: three conflicts, lines 2–4.
  const text = ['time,well,temp,flow', `${week(0)},W-1,151,40`, `${week(1)},W-1,152,40`, `${week(2)},W-1,150,44`].join('\n');
  const r = await fx.service.importCsv({ file: csvFile(text) });
  return { ...fx, repo, stored, importId: r.import!.id };
}

describe('conflicts', () => {
  it('lists each with the imported values and the existing reading', async () => {
    const { service, stored, importId } = await withConflicts();
    const { conflicts } = service.listConflicts({ importId });
    expect(conflicts.map((c) => [c.line, c.well, c.resolution, c.existing?.id])).toEqual([
      [2, 'W-1', 'open', stored[0]], [3, 'W-1', 'open', stored[1]], [4, 'W-1', 'open', stored[2]],
    ]);
    expect(conflicts[0].values).toMatchObject({ productionTemperatureC: 151, massFlowKgPerS: 40 });
    expect(conflicts[0].existing).toMatchObject({ productionTemperatureC: 150, source: 'manual' });
    expect(conflicts[0].time).toBe(new Date(utc(week(0))).toISOString());
  });

  it('keep existing: the stored reading stays, the conflict is closed, the audit log says who and why', async () => {
    const { fdb, service, repo, stored, importId } = await withConflicts();
    const id = service.listConflicts({ importId }).conflicts[0].id;
    const [c] = service.resolveConflicts({ id, keep: 'existing', reason: 'gauge recalibrated after the export' }).resolved;
    expect(c.resolution).toBe('kept-existing');
    expect(c.resolvedAt).not.toBeNull();
    expect(repo.get(stored[0])).toMatchObject({ productionTemperatureC: 150, deletedMs: null });
    const audit = fdb.db.prepare("SELECT who, action, reason FROM audit_log WHERE entity = 'conflict' AND entity_id = ?").all(id);
    expect(audit).toEqual([{ who: 'tester', action: 'resolve', reason: 'gauge recalibrated after the export' }]);
    expect(() => service.resolveConflicts({ id, keep: 'new' })).toThrow(/already resolved \(kept-existing/);
  });

  it('keep new: the old reading is soft-deleted and the imported values stored with their provenance', async () => {
    const { fdb, service, repo, stored, importId, wellId } = await withConflicts();
    const id = service.listConflicts({ importId }).conflicts[1].id;
    service.resolveConflicts({ id, keep: 'new' });
    expect(repo.get(stored[1])?.deletedMs).not.toBeNull();
    const now = repo.findLive(wellId('W-1'), utc(week(1)));
    expect(now).toMatchObject({ productionTemperatureC: 152, source: 'import', importId, sourceLine: 3, flags: [] });
    const actions = fdb.db.prepare('SELECT action, entity FROM audit_log WHERE id > 0 ORDER BY id').all() as { action: string; entity: string }[];
    expect(actions.slice(-3)).toEqual([{ action: 'delete', entity: 'reading' }, { action: 'create', entity: 'reading' }, { action: 'resolve', entity: 'conflict' }]);
  });

  it('resolves every open conflict of an import at once, in one transaction', async () => {
    const { fdb, service, importId } = await withConflicts();
    const first = service.listConflicts({ importId }).conflicts[0].id;
    service.resolveConflicts({ id: first, keep: 'existing' });
    const { resolved } = service.resolveConflicts({ importId, all: true, keep: 'new' });
    expect(resolved.map((c) => [c.line, c.resolution])).toEqual([[3, 'replaced'], [4, 'replaced']]);
    expect(service.listConflicts({ importId, open: true }).conflicts).toEqual([]);
    expect(count(fdb, 'SELECT count(*) AS n FROM readings WHERE deleted_ms IS NULL')).toBe(3);
    expect(count(fdb, 'SELECT count(*) AS n FROM readings WHERE deleted_ms IS NOT NULL')).toBe(2);
  });

  it('asks for all: true, a known import, a known conflict', async () => {
    const { service, importId } = await withConflicts();
    expect(() => service.resolveConflicts({ importId, keep: 'new' })).toThrow(/all: true/);
    expect(() => service.resolveConflicts({ importId: 99, all: true, keep: 'new' })).toThrow(/no import with id 99/);
    expect(() => service.resolveConflicts({ id: 99, keep: 'new' })).toThrow(InputError);
  });
});

describe('import profiles', () => {
  it('saves what an import used and applies it to the next export of the same plant', async () => {
    const { fdb, service } = importFixture();
    const header = 'Zeit;Bohrung;T Förder (degF);Menge [t/h]';
    const r1 = await service.importCsv({
      file: csvFile(`${header}\n01.01.2024 08:00;W-1;302;144\n`),
      columns: { time: 'Zeit', well: 'Bohrung', 'production-temperature': 'T Förder (degF)', flow: 'Menge [t/h]' },
      dateOrder: 'dmy', saveProfile: 'plant A',
    });
    expect(r1.profileSaved).toBe('plant A');
    const p = service.loadImportProfile({ name: 'plant A' });
    expect(p).toMatchObject({
      name: 'plant A', delimiter: ';', decimal: '.', dateOrder: 'dmy',
      columns: { time: 'Zeit', well: 'Bohrung', 'production-temperature': 'T Förder (degF)', flow: 'Menge [t/h]' },
      units: { 'production-temperature': 'degF', flow: 't/h' },
    });
    const r2 = await service.importCsv({ file: csvFile(`${header}\n08.01.2024 08:00;W-1;300;144\n`), profile: 'plant A' });
    expect(r2.import).toMatchObject({ imported: 1, rejected: 0 });
    expect(r2.import!.options).toMatchObject({ profile: 'plant A' });
    // 144 t/h = 144 000 kg / 3600 s = 40 kg/s; (300 − 32)·5/9 = 148.888… °C (NIST SP 811 B.8).
    const row = fdb.db.prepare('SELECT production_temperature_c AS t, normalised_mass_flow_kg_s AS m FROM readings WHERE import_id = ?').get(r2.import!.id) as { t: number; m: number };
    expect(row.t).toBeCloseTo(148.888888889, 8);
    expect(row.m).toBeCloseTo(40, 10);
    expect(service.listImportProfiles().profiles.map((x) => x.name)).toEqual(['plant A']);
    expect(() => service.loadImportProfile({ name: 'plant B' })).toThrow(/saved profiles: "plant A"/);
  });

  it('lists the imports, newest first', async () => {
    const { service } = importFixture();
    await service.importCsv({ file: csvFile(`time,well,temp\n${week(0)},W-1,150\n`) });
    await service.importCsv({ file: csvFile(`time,well,temp\n${week(1)},W-1,150\n`) });
    const { imports } = service.listImports();
    expect(imports.map((i) => i.status)).toEqual(['complete', 'complete']);
    expect(imports[0].id).toBeGreaterThan(imports[1].id);
    expect(service.getImport({ id: imports[1].id }).imported).toBe(1);
  });
});
