// Property-based tests (fast-check 4.11) over malformed CSV: whatever follows a valid header, the
// reader never throws for a bad row, every row read is a reading or a rejection with a one-line
// reason, the counts balance, each row's raw text is the file's own text at its line, and the result
// does not depend on where the file is cut into read chunks. A second property checks the converse:
// rows that are valid by construction are all readings, with the values written.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readAll, writeCsv } from './import-helpers.js';

const HEADER = 'time,well,temp,flow,WHP (bar),status,note\n';

/** Pieces of CSV text, valid and not, joined at random. */
const token = fc.oneof(
  fc.constantFrom(',', ',', ',', '"', '""', '\n', '\n', '\r\n', '\r', ' ', ';', '\t'),
  fc.constantFrom('2024-03-31T02:30:00', '2024-10-27T02:30:00', '2024-01-01T00:00:00Z', '2024-02-30', '03/04/2024', '45292.375', '25/13/2024'),
  fc.constantFrom('GT-1', 'Süd', 'on', 'off', 'test', 'broken', 'n/a', '°F', 'é', '-', '.', 'e5', '1e309'),
  fc.integer({ min: -1000, max: 1000 }).map(String),
  fc.tuple(fc.integer({ min: -100, max: 500 }), fc.integer({ min: 0, max: 99 })).map(([a, b]) => `${a}.${b}`),
);

const body = fc.array(token, { maxLength: 120 }).map((parts) => parts.join(''));

/** Delimiter and decimal separator pairs plant exports use. */
const dialect = fc.constantFrom([',', '.'], [';', ','], ['\t', '.']) as fc.Arbitrary<[',' | ';' | '\t', '.' | ',']>;

async function readBoth(text: string, chunkBytes: number, [delimiter, decimal]: [',' | ';' | '\t', '.' | ',']) {
  const path = writeCsv(text);
  const options = { delimiter, decimal, dateOrder: 'dmy' as const, timeZone: 'Europe/Berlin' };
  return [await readAll(path, options), await readAll(path, { ...options, chunkBytes })] as const;
}

describe('malformed CSV after a valid header', () => {
  it('never throws; readings + rejections = rows read; reasons are one line; raw text sits at its line; chunking does not matter', async () => {
    await fc.assert(
      fc.asyncProperty(body, fc.integer({ min: 1, max: 64 }), dialect, async (text, chunkBytes, d) => {
        const file = HEADER.replaceAll(',', d[0]) + text;
        const [r, chunked] = await readBoth(file, chunkBytes, d);
        expect(r.counts.rowsRead).toBe(r.readings.length + r.rejections.length);
        expect(r.counts.rowsRead).toBe(r.counts.readings + r.counts.rejections);
        for (const x of r.rejections) {
          expect(x.reason.length).toBeGreaterThan(0);
          expect(x.reason).not.toMatch(/[\r\n]/);
        }
        const physical = file.split('\n');
        const rows = [...r.readings, ...r.rejections].sort((a, b) => a.line - b.line);
        for (let i = 0; i < rows.length; i++) {
          const { line, raw } = rows[i];
          if (i > 0) expect(line).toBeGreaterThan(rows[i - 1].line);
          expect(line).toBeGreaterThanOrEqual(2);
          const span = raw.split('\n').length;
          expect(raw).toBe(physical.slice(line - 1, line - 1 + span).join('\n'));
        }
        for (const x of r.readings) {
          expect(Number.isFinite(x.timeMs)).toBe(true);
          expect(x.productionTemperatureC).toBeGreaterThanOrEqual(-50);
          expect(x.productionTemperatureC).toBeLessThanOrEqual(400);
          expect(['producing', 'shut-in', 'test']).toContain(x.status);
          if (x.massFlowKgPerS !== null) expect(x.massFlowKgPerS).toBeGreaterThanOrEqual(0);
        }
        expect(chunked.readings).toEqual(r.readings);
        expect(chunked.rejections).toEqual(r.rejections);
        expect(chunked.counts).toEqual(r.counts);
      }),
      { numRuns: 300 },
    );
  });
});

describe('valid rows', () => {
  const row = fc.record({
    day: fc.integer({ min: 1, max: 28 }),
    hour: fc.integer({ min: 0, max: 23 }),
    well: fc.constantFrom('GT-1', 'GT-2', 'Süd 3', 'W,4'),
    tenthsC: fc.integer({ min: -500, max: 4000 }),
    flowCentis: fc.option(fc.integer({ min: 0, max: 100_000 }), { nil: null }),
    pressureCentibar: fc.option(fc.integer({ min: 1, max: 50_000 }), { nil: null }),
    status: fc.constantFrom('', 'on', 'Shut in', 'SI', 'testing', 'P'),
    note: fc.constantFrom('', 'ok', 'two\nlines', 'said "hi"'),
  });

  it('are all readings, with the values written', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(row, { minLength: 1, maxLength: 30 }), async (rows) => {
        const quote = (s: string) => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
        const lines = rows.map((x) => [
          `2024-05-${String(x.day).padStart(2, '0')}T${String(x.hour).padStart(2, '0')}:00:00Z`,
          quote(x.well),
          (x.tenthsC / 10).toFixed(1),
          x.flowCentis === null ? '' : (x.flowCentis / 100).toFixed(2),
          x.pressureCentibar === null ? '' : (x.pressureCentibar / 100).toFixed(2),
          x.status,
          quote(x.note),
        ].join(','));
        const r = await readAll(writeCsv(HEADER + lines.join('\r\n')));
        expect(r.rejections).toEqual([]);
        expect(r.readings).toHaveLength(rows.length);
        r.readings.forEach((reading, i) => {
          const x = rows[i];
          expect(reading.wellName).toBe(x.well);
          expect(reading.productionTemperatureC).toBe(Number((x.tenthsC / 10).toFixed(1)));
          expect(reading.massFlowKgPerS).toBe(x.flowCentis === null ? null : Number((x.flowCentis / 100).toFixed(2)));
          if (x.pressureCentibar === null) expect(reading.pressurePa).toBe(null);
          else expect(reading.pressurePa).toBeCloseTo((x.pressureCentibar / 100) * 1e5, 6); // 1 bar = 1e5 Pa
          expect(reading.note).toBe(x.note);
          expect(reading.timeMs).toBe(Date.UTC(2024, 4, x.day, x.hour));
        });
      }),
      { numRuns: 100 },
    );
  });
});
