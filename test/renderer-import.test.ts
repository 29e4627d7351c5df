import { describe, expect, it } from 'vitest';
import { Display } from '../src/renderer/app/display.js';
import {
  accountingFacts, base64OfBytes, blankRowsOf, choicesWithProfile, conflictComparison, emptyChoices, isDateOrderProblem,
  plainOptionWords, previewRequestOf, previewTableModel, profileOptionsOf, progressText, reportOfRecord, startRequestOf, withRole,
} from '../src/renderer/screens/import-model.js';
import type { Wire } from '../src/shared/contract/channels.js';
import type { ConflictJson, ImportJobJson, ImportRecordJson, PreviewImportResponse } from '../src/shared/contract/imports.js';
import type { ColumnRole, CsvFileInfo } from '../src/shared/import/types.js';

const ascii = (s: string): Uint8Array => new TextEncoder().encode(s);

describe('base64OfBytes', () => {
  it('matches the test vectors of RFC 4648 §10', () => {
    // RFC 4648 (2006) §10 "Test Vectors", BASE64.
    expect(base64OfBytes(ascii(''))).toBe('');
    expect(base64OfBytes(ascii('f'))).toBe('Zg==');
    expect(base64OfBytes(ascii('fo'))).toBe('Zm8=');
    expect(base64OfBytes(ascii('foo'))).toBe('Zm9v');
    expect(base64OfBytes(ascii('foob'))).toBe('Zm9vYg==');
    expect(base64OfBytes(ascii('fooba'))).toBe('Zm9vYmE=');
    expect(base64OfBytes(ascii('foobar'))).toBe('Zm9vYmFy');
  });

  it('agrees with Node.js Buffer base64 across piece boundaries and every byte value', () => {
    // Reference: Node.js v20.20.2 Buffer.prototype.toString('base64') (RFC 4648 §4 alphabet with padding).
    let seed = 12345;
    const next = (): number => { seed = (seed * 1103515245 + 12345) >>> 0; return seed >>> 24; };
    for (const n of [1, 2, 3, 255, 256, 3 * 4096 - 1, 3 * 4096, 3 * 4096 + 1, 3 * 4096 + 2, 512 * 1024]) {
      const bytes = new Uint8Array(n);
      for (let i = 0; i < n; i++) bytes[i] = i < 256 ? i : next();
      expect(base64OfBytes(bytes), `length ${n}`).toBe(Buffer.from(bytes).toString('base64'));
    }
  });
});

describe('requests from the choices', () => {
  it('sends only what the user stated', () => {
    // Worked example: empty choices leave everything to detection and the field's zone.
    expect(previewRequestOf(emptyChoices(), 'st-1')).toEqual({ staged: 'st-1' });
    expect(startRequestOf(emptyChoices('Kettle Ridge (invented)'), 'st-1')).toEqual({ staged: 'st-1', field: 'Kettle Ridge (invented)' });
  });

  it('carries every stated choice, trimmed, and force / create wells on request', () => {
    const c = {
      ...emptyChoices('F'), delimiter: ';' as const, decimal: ',' as const, dateOrder: 'dmy' as const, timeZone: ' Pacific/Auckland ',
      serialDates: 'off' as const, well: ' KR-1 ', createWells: true, columns: { flow: 'Flow [kg/s]', note: null }, units: { pressure: 'bar' },
    };
    expect(previewRequestOf(c, 'st-2', 50)).toEqual({
      staged: 'st-2', field: 'F', rows: 50, delimiter: ';', decimal: ',', dateOrder: 'dmy', timeZone: 'Pacific/Auckland', serialDates: 'off',
      well: 'KR-1', columns: { flow: 'Flow [kg/s]', note: null }, units: { pressure: 'bar' },
    });
    const start = startRequestOf(c, 'st-2', true);
    expect(start.createWells).toBe(true);
    expect(start.force).toBe(true);
    expect('rows' in start).toBe(false);
  });

  it('loads a profile in place of the current options, keeping the field and "create wells"', () => {
    const before = { ...emptyChoices('F'), dateOrder: 'mdy' as const, createWells: true };
    const after = choicesWithProfile(before, { delimiter: 'semicolon', decimal: ',', units: { flow: 't/h' } });
    expect(after).toEqual({ ...emptyChoices('F'), createWells: true, delimiter: ';', decimal: ',', units: { flow: 't/h' } });
    expect(profileOptionsOf(after)).toEqual({ delimiter: ';', decimal: ',', units: { flow: 't/h' } });
  });
});

const DEMO_HEADERS = ['Date/Time', 'Well', 'Temp. Prod. (°C)', 'Temp. Inj. (°C)', 'Flow [kg/s]', 'WHP [bar]', 'Status'];
const DEMO_COLUMNS: Record<ColumnRole, string | null> = {
  time: 'Date/Time', well: 'Well', 'production-temperature': 'Temp. Prod. (°C)', flow: 'Flow [kg/s]',
  'injection-temperature': 'Temp. Inj. (°C)', pressure: 'WHP [bar]', status: 'Status', note: null,
};

describe('withRole', () => {
  it('moves a role to a column and states the old role absent', () => {
    // The flow column made the note: flow has no column now (null), note is that header.
    const c = withRole(emptyChoices(), DEMO_COLUMNS, 'Flow [kg/s]', 'note');
    expect(c.columns).toEqual({ flow: null, note: 'Flow [kg/s]' });
    // "not used": only the old role is stated absent.
    expect(withRole(emptyChoices(), DEMO_COLUMNS, 'WHP [bar]', null).columns).toEqual({ pressure: null });
    // The role it already has: nothing changes.
    const same = emptyChoices();
    expect(withRole(same, DEMO_COLUMNS, 'Well', 'well')).toBe(same);
  });

  it('swaps with the column that held the role, so a step through the roles can be stepped back', () => {
    // Arrow key on the pressure column's select: pressure → status (the next role); the Status column takes pressure.
    const step = withRole(emptyChoices(), DEMO_COLUMNS, 'WHP [bar]', 'status');
    expect(step.columns).toEqual({ status: 'WHP [bar]', pressure: 'Status' });
    // Back, against the preview that read the step: both columns as detected again.
    const info = { ...DEMO_COLUMNS, status: 'WHP [bar]', pressure: 'Status' };
    expect(withRole(step, info, 'WHP [bar]', 'pressure').columns).toEqual({ status: 'Status', pressure: 'WHP [bar]' });
  });

  it('follows the user\'s own earlier choice before the reader\'s', () => {
    // The first choice is not previewed yet: the reader's info still has flow at the flow column.
    const first = withRole(emptyChoices(), DEMO_COLUMNS, 'Flow [kg/s]', 'note');
    expect(withRole(first, DEMO_COLUMNS, 'Flow [kg/s]', 'flow').columns).toEqual({ flow: 'Flow [kg/s]', note: null });
  });
});

function demoInfo(): CsvFileInfo {
  return {
    file: 'invented-export-with-faults.csv', sizeBytes: 1000, encoding: 'utf-8', byteOrderMark: false, delimiter: ';', decimal: ',',
    delimiterDetected: true, decimalDetected: true, linebreak: '\r\n', headerLine: 1, headers: DEMO_HEADERS, columns: DEMO_COLUMNS,
    unmappedHeaders: [],
    units: {
      'production-temperature': { unit: 'degC', source: 'header' }, 'injection-temperature': { unit: 'degC', source: 'header' },
      flow: { unit: 'kg/s', source: 'header' }, pressure: { unit: 'bar', source: 'header' },
    },
    well: null, timeZone: 'Pacific/Auckland', timeZoneSource: 'option', dateOrder: 'dmy', serialDates: 'auto', assumptions: [],
  };
}

describe('previewTableModel', () => {
  // Rows 2 and 7 of demo/invented-export-with-faults.csv (see demo/README.md).
  const preview: Wire<PreviewImportResponse> = {
    file: { staged: 's', name: 'invented-export-with-faults.csv', sizeBytes: 1000, sha256: '0'.repeat(64) },
    info: demoInfo(),
    rows: [
      {
        line: 2, cells: ['01.12.2025 22:00', 'KR-1', '148,49', '70,2', '58,2', '23,8', 'producing'],
        reading: {
          well: 'KR-1', time: '2025-12-01T09:00:00.000Z',
          values: {
            productionTemperatureC: 148.49, injectionTemperatureC: 70.2, temperatureUnit: 'degC', massFlowKgPerS: 58.2, volumeFlowM3PerS: null,
            flowUnit: 'kg/s', normalisedMassFlowKgPerS: 58.2, flowDensityKgPerM3: null, pressurePa: 2.38e6, pressureUnit: 'bar', status: 'producing', note: '',
          },
        },
        rejected: null,
      },
      { line: 7, cells: ['08.12.2025 22:00', 'KR-3', '#VALUE!', '69,8', '42,7'], reading: null, rejected: 'production temperature "#VALUE!" is not a number' },
    ],
    unknownWells: [],
    problem: null,
  };

  it('gives each column its role and unit and each row its outcome', () => {
    const model = previewTableModel(preview, new Display('si', 'Pacific/Auckland'));
    expect(model.columns.map((c) => c.role)).toEqual(['time', 'well', 'production-temperature', 'injection-temperature', 'flow', 'pressure', 'status']);
    expect(model.columns[5]).toEqual({ header: 'WHP [bar]', role: 'pressure', unitRole: 'pressure', unit: { unit: 'bar', source: 'header' } });
    expect(model.columns[0].unitRole).toBeNull();
    expect(model.rejectedCount).toBe(1);
    expect(model.extraCells).toBe(0);
    // Short row padded to the seven headers.
    expect(model.rows[1].cells).toEqual(['08.12.2025 22:00', 'KR-3', '#VALUE!', '69,8', '42,7', '', '']);
    expect(model.rows[1].readAs).toBeNull();
    // Worked example: 09:00Z + 13 h (NZDT, UTC+13 in December) = 22:00 local; 148.49 °C to one decimal = 148.5 °C;
    // 2.38e6 Pa = 2.38 MPa (display digits: 1 for °C and kg/s, 2 for MPa, app/display.ts).
    expect(model.rows[0].readAs).toBe('KR-1 · 2025-12-01 22:00 · 148.5 °C · inj. 70.2 °C · 58.2 kg/s · 2.38 MPa · producing');
  });

  it('shows a volume flow with the mass it becomes', () => {
    const row = structuredClone(preview.rows[0]);
    if (row.reading === null) throw new Error('fixture');
    // 100 m³/h = 100/3600 m³/s; at 917 kg/m³: 0.027778 · 917 = 25.47 kg/s → 25.5 kg/s.
    row.reading.values = { ...row.reading.values, volumeFlowM3PerS: 100 / 3600, massFlowKgPerS: null, normalisedMassFlowKgPerS: (100 / 3600) * 917, flowDensityKgPerM3: 917 };
    const model = previewTableModel({ ...preview, rows: [row] }, new Display('si', 'UTC'));
    expect(model.rows[0].readAs).toContain('100.0 m³/h = 25.5 kg/s');
  });
});

describe('messages', () => {
  // The reader's message for an ambiguous numeric date (src/shared/import/timestamps.ts, orderNeeded).
  const message = '"01.12.2025 22:00" is a numeric date, read only when the order of its parts is stated: state the order with --date-order dmy; the file appears to use day-month-year (line 5: "13.12.2025 22:00")';

  it('recognises the problem that the date order must be stated', () => {
    expect(isDateOrderProblem({ message, field: 'Date/Time' })).toBe(true);
    expect(isDateOrderProblem({ message: 'no column for time; headers found: a, b', field: null })).toBe(false);
    expect(isDateOrderProblem(null)).toBe(false);
  });

  it('names the control instead of the command-line option', () => {
    expect(plainOptionWords(message)).toContain('state the order with Date order “day-month-year”');
    expect(plainOptionWords('state the order with --date-order dmy, mdy or ymd')).toBe('state the order with the Date order control');
    expect(plainOptionWords('name them with --column time=<header>')).toBe('name them with the Role select of a column (time)');
  });

  it('words the progress of a job', () => {
    const job = { jobId: 'j', state: 'running', file: { staged: 's', name: 'x.csv', sizeBytes: 2000, sha256: '' }, progress: { phase: 'reading', bytesDone: 500, totalBytes: 2000, rowsRead: 12345 }, result: null, error: null, started: '', finished: null } as Wire<ImportJobJson>;
    // 500 / 2000 = 25 %.
    expect(progressText(job)).toBe('reading · 12,345 rows read · 25 % of the file');
  });
});

function record(over: Partial<ImportRecordJson> = {}): Wire<ImportRecordJson> {
  return {
    id: 3, file: 'invented-export-with-faults.csv', sizeBytes: 1000, sha256: '', field: 'F', status: 'complete', message: '',
    rowsRead: 16, imported: 4, duplicates: 6, conflicts: 1, rejected: 5, flagged: 1, started: '2026-01-01T00:00:00Z', finished: null,
    mapping: {}, units: {}, options: { read: { blankRows: 1 }, file: { assumptions: ['naive timestamps read in Pacific/Auckland'] } }, ...over,
  };
}

describe('accounting', () => {
  it('balances the demo export: 16 rows read = 4 imported + 6 duplicates + 1 conflict + 5 rejected', () => {
    // Counts from demo/README.md ("So an import into the demo database reads 16 data rows …").
    const r = record();
    const { facts, balanced } = accountingFacts(r, blankRowsOf(r));
    expect(balanced).toBe(true);
    expect(facts.map((f) => [f.label, f.value])).toEqual([
      ['Rows read', '16'], ['Imported', '4'], ['Duplicates', '6'], ['Conflicts', '1'], ['Rejected', '5'], ['Flagged spikes', '1'], ['Blank rows', '1'],
    ]);
    expect(accountingFacts(record({ imported: 3 }), 0).balanced).toBe(false);
  });

  it('re-opens a record with its blank rows, assumptions and the first rejected rows', () => {
    const rows = Array.from({ length: 5 }, (_, i) => ({ line: i + 2, reason: 'bad', raw: `row ${i}` }));
    const data = reportOfRecord(record(), rows, 3);
    expect(data.blankRows).toBe(1);
    expect(data.assumptions).toEqual(['naive timestamps read in Pacific/Auckland']);
    expect(data.rejected).toHaveLength(3);
    expect(data.rejectedTruncated).toBe(true);
  });
});

describe('conflictComparison', () => {
  it('puts the stored reading and the imported values side by side and marks what differs', () => {
    // demo/README.md line 6: KR-2 08.12.2025 22:00, production temperature 141,32 against the stored 140.52 °C.
    const c: Wire<ConflictJson> = {
      id: 1, importId: 3, line: 6, raw: '08.12.2025 22:00;KR-2;141,32;70,4;39,7;;producing', well: 'KR-2', field: 'F', time: '2025-12-08T09:00:00.000Z',
      values: {
        productionTemperatureC: 141.32, injectionTemperatureC: 70.4, temperatureUnit: 'degC', massFlowKgPerS: 39.7, volumeFlowM3PerS: null, flowUnit: 'kg/s',
        normalisedMassFlowKgPerS: 39.7, flowDensityKgPerM3: null, pressurePa: null, pressureUnit: null, status: 'producing', note: '',
      },
      existing: {
        id: 9, well: 'KR-2', time: '2025-12-08T09:00:00.000Z', productionTemperatureC: 140.52, injectionTemperatureC: 70.4, massFlowKgPerS: 39.7,
        volumeFlowM3PerS: null, flowDensityKgPerM3: null, pressureMPa: null, status: 'producing', flags: [], note: '', source: 'manual', importId: null,
        sourceLine: null, entered: { temperatureUnit: 'degC', flowUnit: 'kg/s', pressureUnit: null }, updatedAt: null, deletedAt: null,
      },
      resolution: 'open', resolvedAt: null,
    };
    const rows = conflictComparison(c, new Display('si', 'UTC'));
    expect(rows[0]).toEqual({ label: 'Production temperature', stored: '140.5 °C', imported: '141.3 °C', differs: true });
    expect(rows.filter((r) => r.differs).map((r) => r.label)).toEqual(['Production temperature']);
    // US customary: (140.52 · 9/5) + 32 = 284.936 °F → 284.9 °F.
    expect(conflictComparison(c, new Display('us', 'UTC'))[0].stored).toBe('284.9 °F');
  });
});
