// The invented demo field: one seeded model behind demo/invented-field.csv, the demo database and the
// faulty plant export (no drift), built deterministically, labelled as invented wherever it shows.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FieldDb } from '../src/main/db/database.js';
import { DEMO_OPERATOR } from '../src/main/services/demo.js';
import { createServices, type Services } from '../src/main/services/index.js';
import { EXPORT_FAULTS, inventedExportWithFaults } from '../src/shared/demo/invented-export.js';
import { INVENTED_RESERVOIR, INVENTED_START_MS, WEEK_MS, inventedFieldCsv } from '../src/shared/demo/invented-field.js';
import { freshDb } from './db-helpers.js';
import { inputError } from './services-helpers.js';

const root = fileURLToPath(new URL('..', import.meta.url));
const demoFile = (name: string): string => readFileSync(join(root, 'demo', name), 'utf8');

let fdb: FieldDb;
let s: Services;
beforeAll(() => {
  fdb = freshDb();
  s = createServices(fdb);
  s.buildDemo();
});
afterAll(() => fdb.close());

describe('one model, no drift', () => {
  it('demo/invented-field.csv is the model\'s CSV, byte for byte', () => {
    expect(demoFile('invented-field.csv')).toBe(inventedFieldCsv());
  });

  it('demo/invented-export-with-faults.csv is the model\'s plant export, byte for byte', () => {
    expect(demoFile('invented-export-with-faults.csv')).toBe(inventedExportWithFaults());
  });

  it('demo/invented-reservoir.json is version 1 of the demo reservoir', () => {
    expect(JSON.parse(demoFile('invented-reservoir.json'))).toEqual(INVENTED_RESERVOIR.versions[0].params);
  });

  it('demo/generate.mjs writes the same files from the compiled module', () => {
    execFileSync(process.execPath, [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', 'tsconfig.cli.json'], { cwd: root, stdio: 'pipe' });
    const out = mkdtempSync(join(tmpdir(), 'tauwell-demo-'));
    execFileSync(process.execPath, [join(root, 'demo', 'generate.mjs'), out], { cwd: root, stdio: 'pipe' });
    expect(readFileSync(join(out, 'invented-field.csv'), 'utf8')).toBe(inventedFieldCsv());
    expect(readFileSync(join(out, 'invented-export-with-faults.csv'), 'utf8')).toBe(inventedExportWithFaults());
  }, 120_000);

  it('the production wells of the demo database carry the CSV\'s readings', () => {
    const lines = inventedFieldCsv().trim().split('\n').slice(1).map((l) => l.split(','));
    const kr2 = lines.filter((c) => c[1] === 'KR-2');
    const stored = s.listReadings({ well: 'KR-2' }).readings;
    expect(stored).toHaveLength(kr2.length);
    // Every reading but the one flagged bad has the CSV's values (the corrected one after its correction).
    const differing = stored.filter((r, i) => r.productionTemperatureC !== Number(kr2[i][2]) || r.massFlowKgPerS !== Number(kr2[i][3]) || r.status !== kr2[i][5]);
    expect(differing.map((r) => r.flags)).toEqual([['bad']]);
    expect(stored.every((r, i) => r.time.replace('.000Z', 'Z') === kr2[i][0])).toBe(true);
  });
});

describe('the demo database', () => {
  it('is built the same way twice', () => {
    const other = freshDb();
    try {
      const a = createServices(other).buildDemo();
      const b = JSON.parse(JSON.stringify(createServices(fdb).listWells()));
      const c = createServices(other).listWells();
      expect({ ...a, field: null }).toEqual({
        invented: true, field: null, wells: ['KR-1', 'KR-2', 'KR-3', 'KR-4I'], reservoir: 'Kettle Ridge slab (invented)', reservoirVersions: 2,
        liveReadings: 2496, deletedReadings: 1, flaggedReadings: 2, corrections: 4, auditEntries: 13, // 4 wells × 624 weeks; 13 = 12 + the demo's settings; demo/README.md
      });
      const strip = (x: unknown): string => JSON.stringify(x, (k, v: unknown) => (k === 'createdAt' || k === 'updatedAt' ? null : v));
      expect(strip(c)).toBe(strip(b));
      for (const well of ['KR-1', 'KR-4I']) {
        expect(strip(createServices(other).listReadings({ well, includeDeleted: true }).readings.map((r) => ({ ...r, deletedAt: r.deletedAt !== null }))))
          .toBe(strip(s.listReadings({ well, includeDeleted: true }).readings.map((r) => ({ ...r, deletedAt: r.deletedAt !== null }))));
      }
    } finally {
      other.close();
    }
  });

  it('says it is invented wherever it shows', () => {
    const field = s.listWells().fields[0];
    expect(field.name).toBe('Kettle Ridge (invented)');
    expect(field.notes).toMatch(/^INVENTED demo field: not a real site/);
    expect(field.timeZone).toBe('Pacific/Auckland');
    expect(field.wells.every((w) => w.reservoir === 'Kettle Ridge slab (invented)')).toBe(true);
    const versions = s.listReservoirVersions({ reservoir: 'Kettle Ridge slab (invented)' }).versions;
    expect(versions.every((v) => JSON.stringify(v.params).includes('INVENTED') && v.recordedBy === DEMO_OPERATOR)).toBe(true);
    expect(DEMO_OPERATOR).toMatch(/\(invented\)$/);
  });

  it('has two reservoir versions, the second with a revised area', () => {
    const versions = s.listReservoirVersions({ reservoir: 'Kettle Ridge slab (invented)' }).versions;
    expect(versions.map((v) => (v.params as { area: number }).area)).toEqual([30000, 24000]);
    const v1 = s.reservoirTheory({ reservoir: 'Kettle Ridge slab (invented)', version: 1 }).theory.heatCapacity.value;
    const v2 = s.reservoirTheory({ reservoir: 'Kettle Ridge slab (invented)' }).theory.heatCapacity.value;
    expect(v2 / v1).toBeCloseTo(24000 / 30000, 12); // C ∝ A (DOMAIN.md §2)
  });

  it('holds the flagged readings, the injection well\'s volume flows and the corrections of demo/README.md', () => {
    const weekOf = (time: string): number => (Date.parse(time) - INVENTED_START_MS) / WEEK_MS;
    const flagged = ['KR-1', 'KR-2', 'KR-3'].flatMap((w) => s.listReadings({ well: w }).readings.filter((r) => r.flags.length > 0).map((r) => [w, weekOf(r.time), r.flags]));
    expect(flagged).toEqual([['KR-1', 302, ['bad']], ['KR-2', 455, ['bad']]]);
    const inj = s.listReadings({ well: 'KR-4I' }).readings;
    expect(inj.every((r) => r.volumeFlowM3PerS !== null && r.flowDensityKgPerM3 !== null && r.pressureMPa !== null && r.productionTemperatureC === null)).toBe(true);
    const audit = s.auditLog({ entity: 'reading' }).entries;
    expect(audit.map((e) => e.action).sort()).toEqual(['delete', 'edit', 'edit', 'edit']);
    expect(audit.every((e) => e.who === DEMO_OPERATOR && e.reason !== '')).toBe(true);
    const slip = audit.find((e) => /decimal point/.test(e.reason));
    expect((slip?.old as { production_temperature_c: number }).production_temperature_c * 10).toBeCloseTo((slip?.new as { production_temperature_c: number }).production_temperature_c, 1);
  });

  it('is built only into an empty field log', () => {
    expect(inputError(() => s.buildDemo()).reason).toMatch(/already holds fields/);
  });
});

describe('the planted faults of demo/invented-export-with-faults.csv (demo/README.md)', () => {
  const lines = inventedExportWithFaults().split('\r\n');
  const cells = (line: number): string[] => lines[line - 1].split(';');
  const number = (text: string): number => Number(text.replace(',', '.'));
  /** dd.mm.yyyy HH:MM in Pacific/Auckland; December is NZDT, UTC+13 (the zone's daylight time, common practice). */
  const instant = (text: string): number => {
    const [d, m, y, hh, mm] = text.split(/[. :]/).map(Number);
    return Date.UTC(y, m - 1, d, hh, mm) - 13 * 3_600_000;
  };
  const stored = (line: number) => s.listReadings({ well: cells(line)[1] }).readings.find((r) => Date.parse(r.time) === instant(cells(line)[0]));

  it('has the header with units, semicolons and decimal commas', () => {
    expect(lines[0]).toBe('Date/Time;Well;Temp. Prod. (°C);Temp. Inj. (°C);Flow [kg/s];WHP [bar];Status');
    expect(lines).toHaveLength(19); // 18 lines and the final line break
    expect(lines[18]).toBe('');
  });

  it('duplicates repeat stored readings exactly', () => {
    for (const line of EXPORT_FAULTS.duplicates) {
      const r = stored(line);
      const c = cells(line);
      expect(r, `line ${line}`).toBeDefined();
      expect([r?.productionTemperatureC, r?.injectionTemperatureC, r?.massFlowKgPerS, r?.status]).toEqual([number(c[2]), number(c[3]), number(c[4]), c[6]]);
      expect(r?.pressureMPa ?? null).toEqual(c[5] === '' ? null : number(c[5]) / 10); // 1 bar = 0.1 MPa
    }
  });

  it('the conflict has a stored reading\'s instant and other values; the others are as described', () => {
    const r = stored(EXPORT_FAULTS.conflict);
    expect(number(cells(EXPORT_FAULTS.conflict)[2]) - (r?.productionTemperatureC as number)).toBeCloseTo(0.8, 9);
    expect(EXPORT_FAULTS.unparseable.map((l) => cells(l).slice(2, 5).find((c) => Number.isNaN(number(c))))).toEqual(['#VALUE!', 'l9,8']);
    expect(lines[EXPORT_FAULTS.blank - 1]).toBe('');
    expect(number(cells(EXPORT_FAULTS.impossibleTemperature)[2])).toBeGreaterThan(400);
    expect(number(cells(EXPORT_FAULTS.negativeFlow)[4])).toBeLessThan(0);
    expect(cells(EXPORT_FAULTS.unknownWell)[1]).toBe('KR-7');
    expect(s.listWells().fields[0].wells.map((w) => w.name)).not.toContain('KR-7');
    const lastStored = Date.parse(s.listReadings({ well: 'KR-1' }).readings.at(-1)?.time as string);
    for (const line of [EXPORT_FAULTS.spike, ...EXPORT_FAULTS.newReadings]) {
      expect(instant(cells(line)[0])).toBeGreaterThan(lastStored);
      expect(stored(line)).toBeUndefined();
    }
    const spike = number(cells(EXPORT_FAULTS.spike)[2]);
    const neighbours = [EXPORT_FAULTS.spike - 3, EXPORT_FAULTS.spike + 1].map((l) => number(cells(l)[2])); // KR-1 before and after
    expect(spike - Math.max(...neighbours)).toBeGreaterThan(10);
  });
});
