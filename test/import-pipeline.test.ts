// The storing half of the CSV import on small files: where every row went, what was stored, and
// what was never overwritten. Expected counts are worked from the files written in each test.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import { FieldRepository } from '../src/main/db/fields.js';
import { ReadingRepository } from '../src/main/db/readings.js';
import { count, csvFile, importFixture, readingsOf, utc, week } from './import-pipeline-helpers.js';

const HEADER = 'time,well,temp,flow';

describe('accounting and storage', () => {
  it('stores each valid row with its provenance and each rejected row verbatim with line and reason', async () => {
    const { fdb, service, wellId } = importFixture();
    const text = [
      HEADER,
      `${week(0)},W-1,150.5,40`, // line 2
      `${week(1)},W-1,#VALUE!,40`, // line 3: unparseable temperature
      '', // line 4: blank, not a data row
      `${week(2)},W-2,149.25,41.5`, // line 5
      `${week(3)},W-2,"150,1",oops`, // line 6: unparseable temperature and flow
    ].join('\n') + '\n';
    const r = await service.importCsv({ file: csvFile(text) });
    // 4 data rows (lines 2, 3, 5, 6) = 2 imported + 2 rejected; line 4 is blank.
    expect(r.import).toMatchObject({ status: 'complete', rowsRead: 4, imported: 2, duplicates: 0, conflicts: 0, rejected: 2, flagged: 0 });
    expect(r.blankRows).toBe(1);
    expect(r.message).toBe('4 rows read = 2 imported + 0 duplicates + 0 conflicts + 2 rejected; 1 blank row skipped (blank rows are not data rows)');
    const id = r.import!.id;

    const stored = readingsOf(fdb, id);
    expect(stored.map((s) => [s.well_id, s.time_ms, s.production_temperature_c, s.mass_flow_kg_s, s.source_line, s.source])).toEqual([
      [wellId('W-1'), utc(week(0)), 150.5, 40, 2, 'import'],
      [wellId('W-2'), utc(week(2)), 149.25, 41.5, 5, 'import'],
    ]);
    expect(stored[0]).toMatchObject({ temperature_unit: 'degC', flow_unit: 'kg/s', status: 'producing', note: '', flags: '' });

    const rejected = fdb.db.prepare('SELECT line, raw, reason FROM rejected_rows WHERE import_id = ? ORDER BY line').all(id) as { line: number; raw: string; reason: string }[];
    expect(rejected.map((x) => [x.line, x.raw])).toEqual([[3, `${week(1)},W-1,#VALUE!,40`], [6, `${week(3)},W-2,"150,1",oops`]]);
    for (const x of rejected) expect(x.reason).toMatch(/temp/);
    expect(r.rejected.map((x) => x.line)).toEqual([3, 6]);
    expect(r.rejectedTruncated).toBe(false);
  });

  it('keeps the file, its hash, the mapping and the units in the import record', async () => {
    const { service } = importFixture();
    const text = `${HEADER}\n${week(0)},W-1,150,40\n`;
    const r = await service.importCsv({ file: csvFile(text) });
    const rec = r.import!;
    expect(rec.sizeBytes).toBe(Buffer.byteLength(text));
    expect(rec.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(rec.mapping).toMatchObject({ time: 'time', well: 'well', 'production-temperature': 'temp', flow: 'flow', pressure: null });
    expect(rec.units).toMatchObject({ 'production-temperature': { unit: 'degC', source: 'default' }, flow: { unit: 'kg/s', source: 'default' } });
    expect(rec.options).toMatchObject({ timeZone: 'UTC', createWells: false, force: false, file: { delimiter: ',', decimal: '.', encoding: 'utf-8' } });
    expect(rec.started).toMatch(/Z$/);
    expect(rec.finished).not.toBeNull();
    expect(rec.field).toBe('Test field');
  });

  it('skips and counts an exact duplicate of a stored reading, leaving the stored one as it was', async () => {
    const { fdb, service, wellId } = importFixture();
    const readings = new ReadingRepository(fdb);
    const id = readings.insert({ wellId: wellId('W-1'), timeMs: utc(week(0)), source: 'manual', productionTemperatureC: 150.5, massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40, note: 'typed in' });
    const r = await service.importCsv({ file: csvFile(`${HEADER}\n${week(0)},W-1,150.5,40\n${week(1)},W-1,150.4,40\n`) });
    expect(r.import).toMatchObject({ rowsRead: 2, imported: 1, duplicates: 1, conflicts: 0, rejected: 0 });
    expect(readings.get(id)).toMatchObject({ source: 'manual', note: 'typed in', importId: null, updatedMs: null });
  });

  it('holds a row with the same well and instant but other values as a conflict, never overwriting', async () => {
    const { fdb, service, wellId } = importFixture();
    const readings = new ReadingRepository(fdb);
    const id = readings.insert({ wellId: wellId('W-1'), timeMs: utc(week(0)), source: 'manual', productionTemperatureC: 150.5, massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40 });
    const line = `${week(0)},W-1,151.3,40`;
    const r = await service.importCsv({ file: csvFile(`${HEADER}\n${line}\n`) });
    expect(r.import).toMatchObject({ rowsRead: 1, imported: 0, duplicates: 0, conflicts: 1 });
    expect(readings.get(id)).toMatchObject({ productionTemperatureC: 150.5, updatedMs: null, deletedMs: null });
    const c = fdb.db.prepare('SELECT * FROM conflicts').get() as Record<string, unknown>;
    expect(c).toMatchObject({ import_id: r.import!.id, line: 2, raw: line, well_id: wellId('W-1'), time_ms: utc(week(0)), existing_reading_id: id, resolution: 'open' });
    expect(JSON.parse(c.values_json as string)).toMatchObject({ productionTemperatureC: 151.3, massFlowKgPerS: 40, status: 'producing' });
  });

  it('treats repeats within the file alike: an exact repeat is a duplicate, other values a conflict with the first', async () => {
    const { fdb, service } = importFixture();
    const text = [HEADER, `${week(0)},W-1,150,40`, `${week(0)},W-1,150,40`, `${week(0)},W-1,152,40`, `${week(1)},W-1,150,40`].join('\n');
    const r = await service.importCsv({ file: csvFile(text) });
    // Line 2 imported; line 3 repeats it exactly; line 4 differs in temperature; line 5 is new.
    expect(r.import).toMatchObject({ rowsRead: 4, imported: 2, duplicates: 1, conflicts: 1, rejected: 0 });
    const first = readingsOf(fdb, r.import!.id).find((s) => s.source_line === 2)!;
    expect(fdb.db.prepare('SELECT line, existing_reading_id FROM conflicts').get()).toEqual({ line: 4, existing_reading_id: first.id });
  });

  it('compares only the values the file states: no injection column says nothing about a stored injection temperature', async () => {
    const { fdb, service, wellId } = importFixture();
    new ReadingRepository(fdb).insert({ wellId: wellId('W-1'), timeMs: utc(week(0)), source: 'manual', productionTemperatureC: 150, injectionTemperatureC: 70, massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40 });
    const r = await service.importCsv({ file: csvFile(`${HEADER}\n${week(0)},W-1,150,40\n`) });
    expect(r.import).toMatchObject({ duplicates: 1, conflicts: 0 });
  });

  it('reads a temperature in °F as the same reading as its °C value (302 °F = 150 °C, NIST SP 811 B.8)', async () => {
    const { fdb, service, wellId } = importFixture();
    new ReadingRepository(fdb).insert({ wellId: wellId('W-1'), timeMs: utc(week(0)), source: 'manual', productionTemperatureC: 150, massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40 });
    const r = await service.importCsv({ file: csvFile(`time,well,temp (degF),flow\n${week(0)},W-1,302,40\n`) });
    expect(r.import).toMatchObject({ duplicates: 1, conflicts: 0 }); // (302 − 32)·5/9 = 150
  });
});

describe('re-import of the same bytes', () => {
  it('is refused and reported, then done again with force, its rows counting as duplicates', async () => {
    const { fdb, service } = importFixture();
    const file = csvFile(`${HEADER}\n${week(0)},W-1,150,40\n${week(1)},W-1,149,40\n${week(2)},W-1,oops,40\n`);
    const first = await service.importCsv({ file });
    expect(first.import).toMatchObject({ status: 'complete', imported: 2, rejected: 1 });

    const again = await service.importCsv({ file });
    expect(again.import).toBeNull();
    expect(again.alreadyImported).toMatchObject({ id: first.import!.id, sha256: first.import!.sha256 });
    expect(again.message).toMatch(/already imported completely as import \d+/);
    expect(count(fdb, 'SELECT count(*) AS n FROM imports')).toBe(1);

    const forced = await service.importCsv({ file, force: true });
    expect(forced.import).toMatchObject({ status: 'complete', rowsRead: 3, imported: 0, duplicates: 2, conflicts: 0, rejected: 1 });
    expect(forced.alreadyImported?.id).toBe(first.import!.id);
    expect(forced.import!.options).toMatchObject({ force: true, alreadyImportedAs: first.import!.id });
    expect(count(fdb, 'SELECT count(*) AS n FROM readings')).toBe(2);
  });

  it('hashes a large file on another thread while importing it, with the same SHA-256, and refuses it next time', async () => {
    const { service } = importFixture();
    // 240,000 rows of 38 bytes: past the 8 MiB above which the hash is computed beside the import.
    const lines = [HEADER];
    for (let i = 0; i < 240_000; i++) lines.push(`${new Date(Date.UTC(2020, 0, 1) + i * 60_000).toISOString()},W-${1 + (i % 2)},150.5,40`);
    const text = lines.join('\n') + '\n';
    expect(Buffer.byteLength(text)).toBeGreaterThan(8 * 1024 * 1024);
    const file = csvFile(text);
    const r = await service.importCsv({ file });
    expect(r.import).toMatchObject({ status: 'complete', imported: 240_000, sha256: createHash('sha256').update(text).digest('hex') }); // node:crypto
    const again = await service.importCsv({ file });
    expect(again.import).toBeNull();
    expect(again.alreadyImported?.id).toBe(r.import!.id);
  });

  it('does not count an import that stopped short as done', async () => {
    const { fdb, service } = importFixture();
    const file = csvFile(`${HEADER}\n${week(0)},W-1,150,40\n`);
    const controller = new AbortController();
    controller.abort();
    await expect(service.importCsv({ file }, { signal: controller.signal })).rejects.toThrow();
    const r = await service.importCsv({ file });
    expect(r.import).toMatchObject({ status: 'complete', imported: 1 });
    expect(count(fdb, 'SELECT count(*) AS n FROM readings')).toBe(1);
  });
});

describe('unknown wells', () => {
  const text = [HEADER, `${week(0)},W-1,150,40`, `${week(0)},KR-7,151,40`, `${week(1)},KR-7,150.5,40`, `${week(0)},KR-8,149,40`].join('\n');

  it('rejects their rows with a reason naming the well and the flag, and lists the names', async () => {
    const { fdb, service } = importFixture();
    const r = await service.importCsv({ file: csvFile(text) });
    expect(r.import).toMatchObject({ rowsRead: 4, imported: 1, rejected: 3 });
    expect(r.unknownWells).toEqual([{ name: 'KR-7', rows: 2 }, { name: 'KR-8', rows: 1 }]);
    expect(r.rejected[0].reason).toMatch(/unknown well "KR-7".*--create-wells/);
    expect(count(fdb, "SELECT count(*) AS n FROM wells WHERE name LIKE 'KR-%'")).toBe(0);
  });

  it('with createWells creates them as production wells, with an audit entry, and imports their rows', async () => {
    const { fdb, service } = importFixture();
    const r = await service.importCsv({ file: csvFile(text), createWells: true });
    expect(r.import).toMatchObject({ rowsRead: 4, imported: 4, rejected: 0 });
    expect(r.createdWells).toEqual(['KR-7', 'KR-8']);
    expect(fdb.db.prepare("SELECT name, kind FROM wells WHERE name LIKE 'KR-%' ORDER BY name").all()).toEqual([
      { name: 'KR-7', kind: 'production' }, { name: 'KR-8', kind: 'production' },
    ]);
    const audit = fdb.db.prepare("SELECT who, action, reason FROM audit_log WHERE entity = 'well' ORDER BY id").all() as { who: string; action: string; reason: string }[];
    expect(audit.map((a) => [a.who, a.action])).toEqual([['tester', 'create'], ['tester', 'create']]);
    expect(audit[0].reason).toMatch(/import \d+/);
  });
});

describe('the field and its time zone', () => {
  it('reads naive timestamps in the field\'s zone unless a zone is given', async () => {
    // 2024-01-15 12:00 in Europe/Berlin is CET, UTC+1 (IANA tzdb: CEST only from the last Sunday of March): 11:00Z.
    const { fdb, service } = importFixture({ timeZone: 'Europe/Berlin' });
    const r1 = await service.importCsv({ file: csvFile(`${HEADER}\n2024-01-15T12:00:00,W-1,150,40\n`) });
    expect(readingsOf(fdb, r1.import!.id)[0].time_ms).toBe(utc('2024-01-15T11:00:00Z'));
    expect(r1.import!.options).toMatchObject({ timeZone: 'Europe/Berlin' });
    const r2 = await service.importCsv({ file: csvFile(`${HEADER}\n2024-01-15T12:00:00,W-2,150,40\n`), timeZone: 'UTC' });
    expect(readingsOf(fdb, r2.import!.id)[0].time_ms).toBe(utc('2024-01-15T12:00:00Z'));
  });

  it('imports into the named field, or the only one; with several it names the choices', async () => {
    const { fdb, service } = importFixture();
    new FieldRepository(fdb).create({ name: 'Other field' });
    const file = csvFile(`${HEADER}\n${week(0)},W-1,150,40\n`);
    const err = await service.importCsv({ file }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).message).toBe('field "field": the field log has 2 fields; name the one to import into: "Other field", "Test field"');
    const r = await service.importCsv({ file, field: 'Test field' });
    expect(r.import).toMatchObject({ field: 'Test field', imported: 1 });
  });
});

describe('bad input before the import starts', () => {
  it('writes no record for a missing file, an unknown column or a bad option', async () => {
    const { fdb, service } = importFixture();
    await expect(service.importCsv({ file: '/no/such/file.csv' })).rejects.toThrow('/no/such/file.csv: no such file');
    await expect(service.importCsv({ file: csvFile(`${HEADER}\n`), columns: { flow: 'Durchfluss' } })).rejects.toThrow(/no column "Durchfluss"/);
    await expect(service.importCsv({ file: csvFile(`${HEADER}\n`), timeZone: 'Mars/Olympus' })).rejects.toThrow(/unknown time zone/);
    await expect(service.importCsv({ file: csvFile(`${HEADER}\n03/04/2024 10:00,W-1,150,40\n`) })).rejects.toThrow(/date-order/);
    expect(count(fdb, 'SELECT count(*) AS n FROM imports')).toBe(0);
  });
});

describe('cancel and failure', () => {
  function longFile(rows: number): string {
    const lines = [HEADER];
    for (let i = 0; i < rows; i++) lines.push(`${new Date(Date.UTC(2024, 0, 1) + i * 3_600_000).toISOString()},W-1,150,40`);
    return csvFile(lines.join('\n') + '\n');
  }

  it('cancelled mid-file: nothing stored, the record says cancelled and how far it had read', async () => {
    const { fdb, service } = importFixture();
    const controller = new AbortController();
    let batches = 0;
    const r = await service.importCsv({ file: longFile(5000) }, {
      signal: controller.signal,
      onProgress: (p) => {
        if (p.phase === 'reading' && ++batches === 2) controller.abort();
      },
    });
    expect(r.import).toMatchObject({ status: 'cancelled', rowsRead: 0, imported: 0, duplicates: 0, conflicts: 0, rejected: 0 });
    expect(r.import!.message).toMatch(/^cancelled after \d+ data rows \(\d+ % of the file\); nothing from this file was stored$/);
    expect(count(fdb, 'SELECT count(*) AS n FROM readings')).toBe(0);
    expect(count(fdb, 'SELECT count(*) AS n FROM rejected_rows')).toBe(0);
    expect(fdb.integrityCheck()).toEqual(['ok']);
  });

  it('a whole-file problem deep in the file fails the import: rolled back, status failed, the error kept', async () => {
    const { fdb, service } = importFixture();
    // More than the reader's 64 KiB sample of ISO dates, then a numeric date whose order was never stated.
    const lines = [HEADER];
    for (let i = 0; i < 3000; i++) lines.push(`${new Date(Date.UTC(2024, 0, 1) + i * 3_600_000).toISOString()},W-1,150,40`);
    lines.push('03/04/2024 10:00,W-1,150,40');
    const r = await service.importCsv({ file: csvFile(lines.join('\n') + '\n') });
    expect(r.import).toMatchObject({ status: 'failed', rowsRead: 0, imported: 0 });
    expect(r.import!.message).toMatch(/^failed after .*date-order.*nothing from this file was stored$/);
    expect(count(fdb, 'SELECT count(*) AS n FROM readings')).toBe(0);
  });
});
