// The reader threads of long series (src/main/services/column-reader.ts): with it, chartSeries
// and wellSeries give exactly what one thread gives; it falls back to one thread when another
// connection commits meanwhile, when its file is missing, and for an in-memory log.
// The thread runs the compiled worker (dist/, built by `npm test` before vitest: `npm run build:cli`).
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type FieldDb } from '../src/main/db/database.js';
import { createServices } from '../src/main/services/index.js';
import { PARALLEL_MIN_READINGS, ColumnReader } from '../src/main/services/column-reader.js';
import { wellSeriesServices } from '../src/main/services/well-series.js';
import { createContext } from '../src/main/services/context.js';
import { START_MS } from './services-helpers.js';

const WORKER = new URL('../dist/main/services/series-worker.js', import.meta.url);
const N = PARALLEL_MIN_READINGS + 1234;
const FIELD = 'Parallel field';

let dir: string;
let fdb: FieldDb;
let reader: ColumnReader;

/** Resolves once the reader's thread has opened the log (its 'ready' arrives as an event). */
async function ready(r: ColumnReader): Promise<void> {
  for (let i = 0; i < 200 && !r.isReady(); i++) await new Promise((res) => setTimeout(res, 10));
}

beforeAll(async () => {
  if (!existsSync(WORKER)) throw new Error('dist/ is not built: run `npm run build:cli` (npm test does) first');
  dir = mkdtempSync(join(tmpdir(), 'tauwell-parallel-'));
  fdb = openDatabase(join(dir, 'log.sqlite'));
  const s = createServices(fdb, { who: 'tester' });
  s.createField({ name: FIELD, timeZone: 'UTC' });
  const well = s.createWell({ field: FIELD, name: 'P-1', kind: 'production', referenceTemperatureC: 70, productionStart: new Date(START_MS).toISOString() });
  // An hourly record with every kind of reading the columns treat apart: shut-ins, flags that do and
  // do not exclude, readings without a temperature, one before time zero, and deleted ones.
  const insert = fdb.db.prepare(`INSERT INTO readings (well_id, time_ms, production_temperature_c, normalised_mass_flow_kg_s, status, flags, source, created_ms, deleted_ms)
    VALUES (?, ?, ?, ?, ?, ?, 'manual', 0, ?)`);
  fdb.db.transaction(() => {
    for (let i = 0; i < N; i++) {
      const status = i % 97 === 0 ? 'shut-in' : 'producing';
      const flags = i % 131 === 0 ? 'bad' : i % 151 === 0 ? 'estimated' : '';
      const temperature = i % 173 === 0 ? null : 150 - i * 1e-4 + (i % 7) * 0.01;
      insert.run(well.id, START_MS + (i - 1) * 3_600_000, temperature, 30 + (i % 5), status, flags, i % 211 === 0 ? START_MS : null);
    }
  })();
  reader = new ColumnReader(fdb, undefined, WORKER);
  await ready(reader);
});

afterAll(async () => {
  await reader?.close();
  fdb?.close();
  rmSync(dir, { recursive: true, force: true });
});

const ref = { well: 'P-1', field: FIELD };

describe('reading the instants and temperatures on two threads', () => {
  it('gives chartSeries and wellSeries exactly as one thread does, on both bases and with the deleted readings', () => {
    expect(reader.isReady()).toBe(true);
    const ctx = createContext(fdb, { who: 'tester' });
    const one = wellSeriesServices(ctx, null);
    const two = wellSeriesServices(ctx, reader);
    const before = reader.readsDone;
    for (const request of [ref, { ...ref, basis: 'mass' as const }, { ...ref, includeDeleted: true }]) {
      expect(two.chartSeries(request)).toEqual(one.chartSeries(request));
      expect(two.wellSeries(request)).toEqual(one.wellSeries(request));
    }
    expect(reader.readsDone - before).toBe(12); // every call took the instants and the temperatures from the threads
  });

  it('reads again on one thread when another connection committed meanwhile', () => {
    const ctx = createContext(fdb, { who: 'tester' });
    const one = wellSeriesServices(ctx, null);
    // As if an import job had committed between the two looks at PRAGMA data_version.
    let version = 0;
    const changing = Object.create(reader, { dataVersion: { value: () => version++ } }) as ColumnReader;
    const two = wellSeriesServices(ctx, changing);
    expect(two.chartSeries(ref)).toEqual(one.chartSeries(ref));
    expect(version).toBe(2);
  });

  it('reads on one thread when the worker file is missing, and for an in-memory log', async () => {
    const lost = new ColumnReader(fdb, undefined, new URL('./no-such-worker.js', WORKER));
    await ready(lost);
    expect(lost.isReady()).toBe(false);
    expect(lost.start('time', 1, false, N)).toBeNull();
    const ctx = createContext(fdb, { who: 'tester' });
    expect(wellSeriesServices(ctx, lost).chartSeries(ref)).toEqual(wellSeriesServices(ctx, null).chartSeries(ref));
    await lost.close();
    const memory = openDatabase(':memory:');
    const none = new ColumnReader(memory, undefined, WORKER);
    expect(none.start('temperature', 1, false, N)).toBeNull();
    await none.close();
    memory.close();
  });

  it('leaves short series to one thread', () => {
    expect(reader.start('time', 1, false, PARALLEL_MIN_READINGS - 1)).toBeNull();
  });
});
