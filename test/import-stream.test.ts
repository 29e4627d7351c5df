// The streaming reader: batches of a bounded size, progress in bytes, cancellation, and errors that
// stop the whole import. Counts are worked from the generated files themselves.
import { describe, expect, it } from 'vitest';
import { openReadingsCsv, readReadingsCsv } from '../src/main/import/read-csv.js';
import { InputError } from '../src/shared/errors.js';
import { readAll, writeCsv } from './import-helpers.js';

function rows(n: number, bad = (_i: number) => false): string {
  const lines = ['timestamp,well,T_prod (degC),flow [kg/s],WHP [bar]'];
  for (let i = 0; i < n; i++) lines.push(`2024-01-01T00:00:${String(i % 60).padStart(2, '0')}Z,GT-${i % 7},${bad(i) ? 'n/a' : '150.5'},40,15`);
  return `${lines.join('\n')}\n`;
}

describe('batches', () => {
  it('hold at most batchRows rows each, in file order, and the counts balance at every batch', async () => {
    const path = writeCsv(rows(2500, (i) => i % 100 === 0));
    const csv = await openReadingsCsv(path, { batchRows: 300, chunkBytes: 1024 });
    let lastLine = 1;
    let seen = 0;
    for await (const batch of csv) {
      const size = batch.readings.length + batch.rejections.length;
      expect(size).toBeLessThanOrEqual(300);
      seen += size;
      expect(csv.counts.rowsRead).toBeGreaterThanOrEqual(seen);
      expect(csv.counts.rowsRead).toBe(csv.counts.readings + csv.counts.rejections);
      const lines = [...batch.readings, ...batch.rejections].map((x) => x.line).sort((a, b) => a - b);
      expect(lines[0]).toBeGreaterThan(lastLine);
      lastLine = lines.at(-1)!;
    }
    expect(seen).toBe(2500);
    expect(csv.counts).toMatchObject({ rowsRead: 2500, readings: 2475, rejections: 25 }); // every 100th row has "n/a"
    expect(lastLine).toBe(2501);
  });

  it('the callback form sees the same rows', async () => {
    const path = writeCsv(rows(1234));
    let n = 0;
    const { counts, info } = await readReadingsCsv(path, { batchRows: 100 }, (batch, inf) => {
      n += batch.readings.length;
      expect(inf.columns.time).toBe('timestamp');
    });
    expect(n).toBe(1234);
    expect(counts.readings).toBe(1234);
    expect(info.units.pressure).toEqual({ unit: 'bar', source: 'header' });
  });

  it('a header without data rows reads as zero rows', async () => {
    const r = await readAll(writeCsv('time,well,temp\n'));
    expect(r.counts.rowsRead).toBe(0);
    expect(r.batches).toBe(0);
  });
});

describe('progress and cancellation', () => {
  it('reports bytes read of the file size, rising to the whole file', async () => {
    const text = rows(3000);
    const path = writeCsv(text);
    const seen: Array<[number, number]> = [];
    await readAll(path, { chunkBytes: 4096, onProgress: (read, total) => seen.push([read, total]) });
    expect(seen.length).toBeGreaterThan(10);
    expect(seen.every(([, total]) => total === Buffer.byteLength(text))).toBe(true);
    expect(seen.map(([read]) => read)).toEqual([...seen.map(([read]) => read)].sort((a, b) => a - b));
    expect(seen.at(-1)![0]).toBe(Buffer.byteLength(text));
  });

  it('an abort stops the iteration with the signal reason and closes the file', async () => {
    const path = writeCsv(rows(5000));
    const controller = new AbortController();
    const csv = await openReadingsCsv(path, { batchRows: 100, chunkBytes: 2048, signal: controller.signal });
    let batches = 0;
    await expect((async () => {
      for await (const _batch of csv) {
        if (++batches === 3) controller.abort();
      }
    })()).rejects.toMatchObject({ name: 'AbortError' });
    expect(batches).toBe(3);
    expect(csv.counts.rowsRead).toBeLessThan(5000);
  });

  it('an already aborted signal stops the open', async () => {
    const controller = new AbortController();
    controller.abort();
    await expect(openReadingsCsv(writeCsv(rows(10)), { signal: controller.signal })).rejects.toMatchObject({ name: 'AbortError' });
  });

  it('breaking out of the loop closes the reader', async () => {
    const csv = await openReadingsCsv(writeCsv(rows(5000)), { batchRows: 100, chunkBytes: 2048 });
    for await (const _batch of csv) break;
    expect(csv.counts.rowsRead).toBeLessThan(5000);
  });
});

describe('whole-import errors', () => {
  it('a missing file', async () => {
    const err = await openReadingsCsv('/nonexistent/export.csv').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).message).toBe('/nonexistent/export.csv: no such file');
  });

  it('a folder is not a file', async () => {
    const { tmpdir } = await import('node:os');
    const err = await openReadingsCsv(tmpdir()).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).reason).toBe('is not a file');
  });

  it('a numeric date after the first chunk stops the iteration with an InputError naming its line', async () => {
    const text = `${rows(3000).trimEnd()}\n03/04/2024,GT-1,150,40,15\n`;
    const csv = await openReadingsCsv(writeCsv(text), { chunkBytes: 65536 });
    const err = await (async () => {
      for await (const _batch of csv) { /* read on */ }
    })().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).where).toMatchObject({ line: 3002, field: 'timestamp' });
  });
});
