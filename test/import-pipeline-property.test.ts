// Property-based tests (fast-check 4.11) of the whole import over malformed CSV, into a temporary
// field log that keeps what earlier runs stored (so later files meet duplicates and conflicts):
// nothing but an InputError for a whole-file problem ever escapes; the record always balances,
// rowsRead = imported + duplicates + conflicts + rejected, and agrees with what the tables hold;
// every rejected row is stored with a one-line reason and its text as it stands in the file; the
// stored readings are exactly those the import counted, and the log stays sound.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import { count, csvFile, importFixture } from './import-pipeline-helpers.js';

const HEADER = 'time,well,temp,flow,WHP (bar),status,note\n';

/** Pieces of CSV text, valid and not, joined at random; whole valid rows so that many rows are readings. */
const token = fc.oneof(
  fc.constantFrom(',', ',', ',', '"', '""', '\n', '\n', '\r\n', ' ', ';'),
  fc.constantFrom(
    '2024-01-01T00:00:00Z,GT-1,150.5,40,15,on,\n', '2024-01-01T00:00:00Z,GT-1,150.5,40,15,on,\n', '2024-01-01T00:00:00Z,GT-1,151.5,40,15,on,\n',
    '2024-01-08T00:00:00Z,GT-1,150.4,40,,,\n', '2024-01-08T00:00:00Z,Süd,149,40,,off,"a ""note"""\n', '2024-01-15T00:00:00Z,KR-9,150,40,,,\n',
    '03/04/2024 10:00,GT-1,150,40,,,\n',
  ),
  fc.constantFrom('2024-03-31T02:30:00', '2024-01-01T00:00:00Z', '2024-02-30', '03/04/2024', '45292.375', 'GT-1', 'Süd', 'on', 'off', 'n/a', '-', '1e309'),
  fc.integer({ min: -1000, max: 1000 }).map(String),
  fc.tuple(fc.integer({ min: -100, max: 500 }), fc.integer({ min: 0, max: 99 })).map(([a, b]) => `${a}.${b}`),
);
/** A valid row of one of 60 weeks, of a known well or not, at one of a few temperatures (some 20 K off: spikes). */
const validRow = fc.tuple(fc.integer({ min: 0, max: 59 }), fc.constantFrom('GT-1', 'GT-1', 'Süd', 'KR-9'), fc.constantFrom('150', '150.5', '151', '171'))
  .map(([k, well, t]) => `${new Date(Date.UTC(2024, 0, 1) + k * 604_800_000).toISOString()},${well},${t},40,,,\n`);
const body = fc.array(fc.oneof(token, validRow, validRow), { maxLength: 80 }).map((parts) => parts.join(''));

describe('the whole import over malformed CSV', () => {
  it('balances, stores every rejected row with its reason and text, and never throws but an InputError', async () => {
    const { fdb, service } = importFixture({ timeZone: 'Europe/Berlin', wells: ['GT-1', 'Süd'] });
    await fc.assert(
      fc.asyncProperty(body, fc.boolean(), fc.constantFrom<'dmy' | undefined>('dmy', 'dmy', undefined), async (text, createWells, dateOrder) => {
        const content = HEADER + text;
        const before = count(fdb, 'SELECT count(*) AS n FROM readings');
        let r;
        try {
          r = await service.importCsv({ file: csvFile(content), ...(dateOrder !== undefined ? { dateOrder } : {}), delimiter: ',', decimal: '.', force: true, createWells });
        } catch (e) {
          expect(e).toBeInstanceOf(InputError);
          expect(count(fdb, 'SELECT count(*) AS n FROM readings')).toBe(before);
          return;
        }
        const i = r.import!;
        expect(i.status === 'complete' || i.status === 'failed').toBe(true);
        expect(i.rowsRead).toBe(i.imported + i.duplicates + i.conflicts + i.rejected);
        expect(i.flagged).toBeLessThanOrEqual(i.imported);
        expect(count(fdb, 'SELECT count(*) AS n FROM readings WHERE import_id = ?', i.id)).toBe(i.imported);
        expect(count(fdb, 'SELECT count(*) AS n FROM readings')).toBe(before + i.imported);
        expect(count(fdb, 'SELECT count(*) AS n FROM conflicts WHERE import_id = ?', i.id)).toBe(i.conflicts);
        expect(count(fdb, "SELECT count(*) AS n FROM readings WHERE import_id = ? AND flags = 'spike'", i.id)).toBe(i.flagged);
        const rejected = fdb.db.prepare('SELECT line, raw, reason FROM rejected_rows WHERE import_id = ?').all(i.id) as { line: number; raw: string; reason: string }[];
        expect(rejected).toHaveLength(i.rejected);
        const physical = content.split('\n');
        for (const x of rejected) {
          expect(x.reason.length).toBeGreaterThan(0);
          expect(x.reason).not.toMatch(/[\r\n]/);
          expect(x.line).toBeGreaterThanOrEqual(2);
          expect(x.raw).toBe(physical.slice(x.line - 1, x.line - 1 + x.raw.split('\n').length).join('\n'));
        }
        if (i.status === 'failed') expect(i.rowsRead).toBe(0);
      }),
      { numRuns: 150 },
    );
    expect(fdb.integrityCheck()).toEqual(['ok']);
  });
});
