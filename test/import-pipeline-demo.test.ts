// The invented demo's faulty plant export imported into the invented demo field log: the report
// must match the faults planted in demo/invented-export-with-faults.csv, as demo/README.md lists them
// by line (invented data, used here because its faults are known by construction).
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { buildDemo } from '../src/main/services/demo.js';
import { createImportService } from '../src/main/services/imports.js';
import { freshDb } from './db-helpers.js';

const EXPORT = fileURLToPath(new URL('../demo/invented-export-with-faults.csv', import.meta.url));

describe('demo/invented-export-with-faults.csv into the demo field log', () => {
  it('reports the planted faults line by line', async () => {
    const fdb = freshDb();
    buildDemo(fdb);
    const service = createImportService(fdb, { who: 'tester' });
    // Day-first dates: the one thing the README says the import must be told.
    const r = await service.importCsv({ file: EXPORT, dateOrder: 'dmy' });

    // README: 16 data rows (the empty line 8 skipped) = 4 new + 6 duplicates + 1 conflict + 5 rejected; line 12 a spike.
    expect(r.import).toMatchObject({ status: 'complete', rowsRead: 16, imported: 4, duplicates: 6, conflicts: 1, rejected: 5, flagged: 1 });
    expect(r.blankRows).toBe(1);
    expect(r.info).toMatchObject({ delimiter: ';', decimal: ',', linebreak: '\r\n', timeZone: 'Pacific/Auckland', dateOrder: 'dmy' });
    expect(r.info?.columns).toMatchObject({ 'production-temperature': 'Temp. Prod. (°C)', 'injection-temperature': 'Temp. Inj. (°C)', flow: 'Flow [kg/s]', pressure: 'WHP [bar]' });

    // Rejected: line 7 #VALUE!, 10 "l9,8", 16 1763,4 °C, 17 negative flow, 18 unknown well KR-7.
    expect(r.rejected.map((x) => x.line)).toEqual([7, 10, 16, 17, 18]);
    expect(r.rejected[4].reason).toMatch(/unknown well "KR-7"/);
    expect(r.unknownWells).toEqual([{ name: 'KR-7', rows: 1 }]);
    expect(r.rejected[0].raw).toBe('08.12.2025 22:00;KR-3;#VALUE!;69,8;42,7;;producing');

    // Conflict: line 6, KR-2 at 08.12.2025 22:00 NZDT = 09:00Z, 141.32 °C against the stored 140.52 °C.
    const { conflicts } = service.listConflicts({ importId: r.import!.id });
    expect(conflicts).toHaveLength(1);
    expect(conflicts[0]).toMatchObject({ line: 6, well: 'KR-2', time: '2025-12-08T09:00:00.000Z', resolution: 'open' });
    expect(conflicts[0].values.productionTemperatureC).toBeCloseTo(141.32, 10);
    expect(conflicts[0].existing?.productionTemperatureC).toBeCloseTo(140.52, 10);

    // Imported: lines 12–15; line 12 (KR-1, 18.12.2025 22:00 NZDT = 09:00Z, 159.60 °C) flagged as a spike.
    const stored = fdb.db.prepare('SELECT source_line, flags, time_ms FROM readings WHERE import_id = ? ORDER BY source_line').all(r.import!.id);
    expect(stored).toEqual([
      { source_line: 12, flags: 'spike', time_ms: Date.parse('2025-12-18T09:00:00Z') },
      { source_line: 13, flags: '', time_ms: Date.parse('2025-12-22T09:00:00Z') },
      { source_line: 14, flags: '', time_ms: Date.parse('2025-12-22T09:00:00Z') },
      { source_line: 15, flags: '', time_ms: Date.parse('2025-12-22T09:00:00Z') },
    ]);
    expect(fdb.integrityCheck()).toEqual(['ok']);
  });
});
