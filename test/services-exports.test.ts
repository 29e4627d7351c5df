// Exports through the service layer: CSV with a header row and units in the headers, JSON that
// round-trips to the contract's objects; readings, rejected rows, conflicts and the audit log.
import Papa from 'papaparse';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { START_MS, WEEK_MS, fixture, inputError, iso, type Fixture } from './services-helpers.js';

let f: Fixture;
beforeEach(() => {
  f = fixture();
  f.s.logReading({ well: 'W-1', time: iso(START_MS), productionTemperature: 150, flow: 180, flowUnit: 'm3/h', pressure: 24.1, pressureUnit: 'bar', note: 'first, with a comma' });
  f.s.logReading({ well: 'W-1', time: iso(START_MS + WEEK_MS), productionTemperature: 149.5, flow: 50, flowUnit: 'kg/s', status: 'test', flags: ['spike'] });
  const third = f.s.logReading({ well: 'W-1', time: iso(START_MS + 2 * WEEK_MS), productionTemperature: 149 });
  f.s.deleteReading({ id: third.reading.id, reason: 'entered "twice"' });
});
afterEach(() => f.fdb.close());

function parseCsv(text: string): string[][] {
  const parsed = Papa.parse<string[]>(text.replace(/\r\n$/, ''), { skipEmptyLines: false });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
}

describe('readings', () => {
  it('CSV: a header with units, one row per live reading, SI and °C', () => {
    const e = f.s.exportData({ kind: 'readings', well: 'W-1' });
    expect(e.format).toBe('csv');
    expect(e.mediaType).toBe('text/csv');
    expect(e.suggestedFileName).toBe('readings-W-1.csv');
    expect(e.rowCount).toBe(2);
    expect(e.text.endsWith('\r\n')).toBe(true); // RFC 4180 line ends
    const rows = parseCsv(e.text);
    expect(rows[0]).toEqual(e.columns);
    expect(rows[0].slice(0, 9)).toEqual([
      'id', 'well', 'time [UTC]', 'production_temperature [°C]', 'injection_temperature [°C]', 'mass_flow [kg/s]',
      'volume_flow [m3/s]', 'flow_density [kg/m3]', 'pressure [Pa]',
    ]);
    expect(rows).toHaveLength(3); // header + 2 live readings
    const col = (name: string): number => rows[0].indexOf(name);
    expect(rows[1][col('time [UTC]')]).toBe('2024-01-01T00:00:00.000Z');
    expect(rows[1][col('pressure [Pa]')]).toBe('2410000'); // 24.1 bar × 10^5 Pa/bar (NIST SP 811)
    expect(rows[1][col('volume_flow [m3/s]')]).toBe('0.05'); // 180 m³/h / 3600 s/h
    expect(rows[1][col('note')]).toBe('first, with a comma'); // quoted in the file, whole again after parsing
    expect(rows[2][col('status')]).toBe('test');
    expect(rows[2][col('flags')]).toBe('spike');
    expect(rows[2][col('mass_flow [kg/s]')]).toBe('50');
  });

  it('CSV with the deleted ones, and of every well', () => {
    const withDeleted = parseCsv(f.s.exportData({ kind: 'readings', well: 'W-1', includeDeleted: true }).text);
    expect(withDeleted).toHaveLength(4);
    expect(withDeleted[3][withDeleted[0].indexOf('deleted [UTC]')]).not.toBe('');
    f.s.createWell({ field: 'Test field', name: 'W-2', kind: 'production' });
    f.s.logReading({ well: 'W-2', time: iso(START_MS), productionTemperature: 160 });
    const all = f.s.exportData({ kind: 'readings' });
    expect(all.rowCount).toBe(3);
    expect(parseCsv(all.text).slice(1).map((r) => r[1])).toEqual(['W-1', 'W-1', 'W-2']);
  });

  it('JSON round-trips to the readings the service lists', () => {
    const e = f.s.exportData({ kind: 'readings', well: 'W-1', format: 'json' });
    expect(e.mediaType).toBe('application/json');
    const json = JSON.parse(e.text) as { kind: string; exportedAt: string; rows: unknown[] };
    expect(json.kind).toBe('readings');
    expect(json.rows).toEqual(f.s.listReadings({ well: 'W-1' }).readings);
  });

  it('a window limits the rows; options of other kinds are refused', () => {
    expect(f.s.exportData({ kind: 'readings', well: 'W-1', from: iso(START_MS + WEEK_MS) }).rowCount).toBe(1);
    expect(inputError(() => f.s.exportData({ kind: 'audit', importId: 1 })).where.field).toBe('importId');
    expect(inputError(() => f.s.exportData({ kind: 'rejected', well: 'W-1' })).where.field).toBe('well');
  });
});

describe('rejected rows and conflicts of imports', () => {
  /** Rows as the import writes them (the import pipeline itself is tested elsewhere). */
  function plantImport(): number {
    const db = f.fdb.db;
    const id = Number(db.prepare(
      `INSERT INTO imports (file_name, file_size, sha256, field_id, mapping_json, units_json, rows_read, imported, conflicts, rejected, started_ms, finished_ms, status)
       VALUES ('plant.csv', 100, 'ab', 1, '{}', '{}', 4, 1, 1, 2, 0, 1, 'complete')`,
    ).run().lastInsertRowid);
    db.prepare('INSERT INTO rejected_rows (import_id, line, raw, reason) VALUES (?, ?, ?, ?)').run(id, 3, '01.12.2025;KR-3;#VALUE!', 'field "Temp": "#VALUE!" is not a number');
    db.prepare('INSERT INTO rejected_rows (import_id, line, raw, reason) VALUES (?, ?, ?, ?)').run(id, 5, '01.12.2025;KR-7;151,2', 'unknown well "KR-7"');
    const existing = f.s.listReadings({ well: 'W-1' }).readings[0];
    db.prepare('INSERT INTO conflicts (import_id, line, raw, well_id, time_ms, values_json, existing_reading_id) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(id, 4, 'raw;line', 1, START_MS, '{"productionTemperatureC":150.8}', existing.id);
    return id;
  }

  it('CSV and JSON of rejected rows, of one import or all', () => {
    const id = plantImport();
    const csv = f.s.exportData({ kind: 'rejected', importId: id });
    expect(csv.rowCount).toBe(2);
    const rows = parseCsv(csv.text);
    expect(rows[0]).toEqual(['import_id', 'file', 'line', 'reason', 'raw']);
    expect(rows[1]).toEqual([String(id), 'plant.csv', '3', 'field "Temp": "#VALUE!" is not a number', '01.12.2025;KR-3;#VALUE!']);
    const json = JSON.parse(f.s.exportData({ kind: 'rejected', format: 'json' }).text) as { rows: { line: number }[] };
    expect(json.rows.map((r) => r.line)).toEqual([3, 5]);
    expect(inputError(() => f.s.exportData({ kind: 'rejected', importId: id + 1 })).reason).toBe(`no import with id ${id + 1}`);
  });

  it('conflicts name the well, the instant and the stored reading', () => {
    plantImport();
    const json = JSON.parse(f.s.exportData({ kind: 'conflicts', format: 'json' }).text) as { rows: Record<string, unknown>[] };
    expect(json.rows).toHaveLength(1);
    expect(json.rows[0]).toMatchObject({ well: 'W-1', time: iso(START_MS), resolution: 'open', values: { productionTemperatureC: 150.8 } });
    const rows = parseCsv(f.s.exportData({ kind: 'conflicts' }).text);
    expect(rows[0]).toContain('time [UTC]');
    expect(rows).toHaveLength(2);
  });
});

describe('audit log', () => {
  it('every entry, oldest first, as CSV and as JSON', () => {
    // field, well (fixture) + 3 readings logged + 1 deletion = 6 entries
    const csv = f.s.exportData({ kind: 'audit' });
    expect(csv.rowCount).toBe(6);
    const rows = parseCsv(csv.text);
    expect(rows[0]).toEqual(['id', 'at [UTC]', 'who', 'action', 'entity', 'entity_id', 'reason', 'old (JSON)', 'new (JSON)']);
    expect(rows.slice(1).map((r) => `${r[3]} ${r[4]}`)).toEqual(['create field', 'create well', 'create reading', 'create reading', 'create reading', 'delete reading']);
    expect(rows[6][6]).toBe('entered "twice"');
    expect(JSON.parse(rows[6][7]).deleted_ms).toBeNull(); // the row before the deletion
    const json = JSON.parse(f.s.exportData({ kind: 'audit', format: 'json' }).text) as { rows: unknown[] };
    expect(json.rows).toEqual([...f.s.auditLog().entries].reverse());
  });
});
