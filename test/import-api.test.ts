// The import as the window uses it: a staged upload in chunks, its preview, the import as a job on a
// second connection, cancel and close — driven through the contract's dispatcher, so every request
// passes its schema first. The demo export's expected accounting is the one demo/README.md lists by
// line (invented data whose faults are known by construction), as test/import-pipeline-demo.test.ts asserts.
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase, type FieldDb } from '../src/main/db/database.js';
import { createContext } from '../src/main/services/context.js';
import { buildDemo } from '../src/main/services/demo.js';
import { createImportApi, guardBusyWrites, IMPORT_RUNNING_MESSAGE, type ImportApi } from '../src/main/services/import-api.js';
import { ImportJobs, KEPT_FINISHED_JOBS } from '../src/main/services/import-jobs.js';
import { readingServices } from '../src/main/services/readings.js';
import { createDispatcher, type CallOutcome } from '../src/shared/contract/dispatch.js';
import { UPLOAD_CHUNK_BYTES, type ImportCsvResponse, type ImportJobJson, type PreviewImportResponse, type StagedFileJson } from '../src/shared/contract/imports.js';
import type { TauwellServices } from '../src/shared/contract/index.js';
import { freshDb, steppingClock, tempDir } from './db-helpers.js';

const EXPORT = fileURLToPath(new URL('../demo/invented-export-with-faults.csv', import.meta.url));

interface Harness {
  fdb: FieldDb;
  api: ImportApi;
  stagingDir: string;
  logged: string[];
  call(method: string, payload: unknown): Promise<CallOutcome>;
  ok<T>(method: string, payload: unknown): Promise<T>;
  refused(method: string, payload: unknown): Promise<{ error: string; field?: string }>;
}

const open: Harness[] = [];
afterEach(async () => {
  for (const h of open.splice(0)) {
    await h.api.close();
    h.fdb.close();
  }
});

/** The demo field log behind a dispatcher over the import api and, guarded, the reading services (for a write during an import). */
function harness(fdb: FieldDb = freshDb()): Harness {
  buildDemo(fdb);
  const stagingDir = tempDir();
  const logged: string[] = [];
  const api = createImportApi(fdb, { who: 'tester', stagingDir, log: (t) => logged.push(t) });
  const services = guardBusyWrites({ ...readingServices(createContext(fdb, { who: 'tester' })), ...api }, api.importing);
  const dispatch = createDispatcher(services as unknown as TauwellServices);
  const h: Harness = {
    fdb, api, stagingDir, logged,
    call: (method, payload) => dispatch(method, payload),
    async ok<T>(method: string, payload: unknown): Promise<T> {
      const out = await dispatch(method, payload);
      if (!out.ok) throw new Error(`${method} refused: ${out.error}`);
      return out.value as T;
    },
    async refused(method, payload) {
      const out = await dispatch(method, payload);
      if (out.ok || out.kind !== 'input') throw new Error(`${method}: expected an input error, got ${JSON.stringify(out)}`);
      return { error: out.error, ...(out.field !== undefined ? { field: out.field } : {}) };
    },
  };
  open.push(h);
  return h;
}

async function upload(h: Harness, name: string, bytes: Buffer, chunkBytes = UPLOAD_CHUNK_BYTES): Promise<StagedFileJson> {
  const { staged } = await h.ok<{ staged: string }>('beginUpload', { name, sizeBytes: bytes.length });
  for (let offset = 0; offset < bytes.length; offset += chunkBytes) {
    await h.ok('uploadChunk', { staged, offset, base64: bytes.subarray(offset, offset + chunkBytes).toString('base64') });
  }
  return h.ok<StagedFileJson>('finishUpload', { staged });
}

async function ended(h: Harness, jobId: string, timeoutMs = 20_000): Promise<ImportJobJson> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const job = await h.ok<ImportJobJson>('importJob', { jobId });
    if (job.state !== 'running') return job;
    if (Date.now() > until) throw new Error(`job still running after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 5));
  }
}

async function reading(h: Harness, jobId: string): Promise<ImportJobJson> {
  for (;;) {
    const job = await h.ok<ImportJobJson>('importJob', { jobId });
    if (job.state !== 'running' || (job.progress?.phase === 'reading' && job.progress.rowsRead > 0)) return job;
    await new Promise((r) => setTimeout(r, 2));
  }
}

const count = (fdb: FieldDb, sql: string, ...params: unknown[]): number => (fdb.db.prepare(sql).get(...params) as { n: number }).n;

/** A well-formed export of `rows` hourly readings of KR-1..KR-3 from 2031 on (after the demo's history), ISO times with Z. */
function bigExport(rows: number): string {
  const path = join(tempDir(), 'big.csv');
  const lines = ['Date/Time,Well,Temp. Prod. (°C),Temp. Inj. (°C),Flow [kg/s],WHP [bar],Status'];
  const t0 = Date.UTC(2031, 0, 1);
  const temperatures = Array.from({ length: 97 }, (_, k) => (140 + k / 10).toFixed(2));
  for (let hour = 0; hour * 3 < rows; hour++) {
    const t = new Date(t0 + hour * 3_600_000).toISOString();
    for (let w = 0; w < 3 && hour * 3 + w < rows; w++) lines.push(`${t},KR-${1 + w},${temperatures[(hour * 3 + w) % 97]},70.1,45.0,24.0,producing`);
  }
  writeFileSync(path, lines.join('\n') + '\n');
  return path;
}

describe('staged uploads', () => {
  it('takes a file in ordered chunks and gives its SHA-256; refuses a wrong offset, bad base64 and more bytes than declared', async () => {
    const h = harness();
    const bytes = readFileSync(EXPORT);
    // Check value: the SHA-256 of the whole file in one pass (node:crypto, FIPS 180-4), against the chunked one.
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const staged = await upload(h, 'C:\\fakepath\\plant export.csv', bytes, 100);
    expect(staged).toMatchObject({ name: 'plant export.csv', sizeBytes: bytes.length, sha256 });
    expect(staged.staged).toMatch(/^[A-Za-z0-9_-]{24}$/); // 18 random bytes, base64url

    // The staging folder: private (0700, common practice for per-user temp folders), holding the bytes as sent.
    const [folder] = readdirSync(h.stagingDir);
    const dir = join(h.stagingDir, folder);
    expect(statSync(dir).mode & 0o777).toBe(0o700);
    expect(readFileSync(join(dir, readdirSync(dir)[0]))).toEqual(bytes);

    const { staged: id } = await h.ok<{ staged: string }>('beginUpload', { name: 'x.csv', sizeBytes: 8 });
    await h.ok('uploadChunk', { staged: id, offset: 0, base64: Buffer.from('abcd').toString('base64') });
    expect(await h.refused('uploadChunk', { staged: id, offset: 0, base64: 'YWJjZA==' })).toMatchObject({ field: 'offset' });
    expect(await h.refused('uploadChunk', { staged: id, offset: 4, base64: 'YWJj*A==' })).toMatchObject({ field: 'base64' });
    expect(await h.refused('uploadChunk', { staged: id, offset: 4, base64: 'YWJjZ' })).toMatchObject({ field: 'base64' });
    // 4 + 5 bytes ("abcde" = YWJjZGU=, RFC 4648 §10 alphabet) exceed the 8 declared.
    expect(await h.refused('uploadChunk', { staged: id, offset: 4, base64: 'YWJjZGU=' })).toMatchObject({ field: 'base64', error: expect.stringMatching(/more than the 8 declared/) });
    expect(await h.refused('finishUpload', { staged: id })).toMatchObject({ field: 'staged', error: expect.stringMatching(/received 4 of the 8 bytes/) });
    expect(await h.refused('uploadChunk', { staged: 'nope', offset: 0, base64: '' })).toMatchObject({ field: 'staged' });
    expect(await h.refused('previewImport', { staged: id })).toMatchObject({ field: 'staged', error: expect.stringMatching(/not finished/) });
    expect(await h.refused('beginUpload', { name: 'a/..', sizeBytes: 1 })).toMatchObject({ field: 'name' });
  });
});

describe('previewImport of demo/invented-export-with-faults.csv into the demo field', () => {
  it('shows the problem of the unstated day/month order as a problem, not a thrown error', async () => {
    const h = harness();
    const staged = await upload(h, 'plant.csv', readFileSync(EXPORT));
    const p = await h.ok<PreviewImportResponse>('previewImport', { staged: staged.staged });
    expect(p.rows).toEqual([]);
    expect(p.info).toBeNull();
    // README: the import must be told the order of 01.12.2025 (day first); line 2 is the first data row, column "Date/Time".
    expect(p.problem).toMatchObject({ line: 2, field: 'Date/Time', message: expect.stringMatching(/dateOrder|order/) });
  });

  it('with dateOrder dmy shows each row as split and as read, and writes nothing', async () => {
    const h = harness();
    const staged = await upload(h, 'plant.csv', readFileSync(EXPORT));
    const before = ['imports', 'audit_log', 'readings'].map((t) => count(h.fdb, `SELECT count(*) AS n FROM ${t}`));
    const p = await h.ok<PreviewImportResponse>('previewImport', { staged: staged.staged, dateOrder: 'dmy' });
    expect(p.problem).toBeNull();
    expect(p.info).toMatchObject({ file: 'plant.csv', delimiter: ';', decimal: ',', timeZone: 'Pacific/Auckland', dateOrder: 'dmy' });
    // README: 16 data rows on lines 2–18, line 8 empty.
    expect(p.rows.map((r) => r.line)).toEqual([2, 3, 4, 5, 6, 7, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18]);
    expect(p.rows[0].cells).toEqual(['01.12.2025 22:00', 'KR-1', '148,49', '70,2', '58,2', '', 'producing']); // line 2 of the file, split at ';'
    // 01.12.2025 22:00 NZDT (UTC+13) = 2025-12-01T09:00Z; 148,49 °C with a decimal comma.
    expect(p.rows[0].reading).toMatchObject({ well: 'KR-1', time: '2025-12-01T09:00:00.000Z', values: { productionTemperatureC: 148.49, massFlowKgPerS: 58.2 } });
    expect(p.rows[0].rejected).toBeNull();
    // Rejected by the reader: line 7 #VALUE!, 10 "l9,8", 16 1763,4 °C, 17 a negative flow. Line 18 (KR-7) reads, and its well is unknown.
    expect(p.rows.filter((r) => r.rejected !== null).map((r) => r.line)).toEqual([7, 10, 16, 17]);
    expect(p.rows.find((r) => r.line === 7)?.rejected).toMatch(/#VALUE!/);
    expect(p.unknownWells).toEqual(['KR-7']);
    expect(['imports', 'audit_log', 'readings'].map((t) => count(h.fdb, `SELECT count(*) AS n FROM ${t}`))).toEqual(before);

    const three = await h.ok<PreviewImportResponse>('previewImport', { staged: staged.staged, dateOrder: 'dmy', rows: 3 });
    expect(three.rows.map((r) => r.line)).toEqual([2, 3, 4]);
    expect(await h.refused('previewImport', { staged: staged.staged, profile: 'none such' })).toMatchObject({ field: 'profile' });
  });
});

describe('import jobs', () => {
  it('imports the demo export as a job with the CLI test accounting, recorded under the uploaded name', async () => {
    const h = harness();
    const staged = await upload(h, 'plant export Dec 2025.csv', readFileSync(EXPORT));
    const started = await h.ok<ImportJobJson>('startImport', { staged: staged.staged, dateOrder: 'dmy' });
    expect(started).toMatchObject({ state: 'running', file: staged, result: null, error: null, finished: null });
    const job = await ended(h, started.jobId);
    expect(job.state).toBe('complete');
    expect(job.error).toBeNull();
    // As test/import-pipeline-demo.test.ts (README): 16 read = 4 imported + 6 duplicates + 1 conflict + 5 rejected; 1 spike.
    const r = job.result as ImportCsvResponse;
    expect(r.import).toMatchObject({ status: 'complete', rowsRead: 16, imported: 4, duplicates: 6, conflicts: 1, rejected: 5, flagged: 1, file: 'plant export Dec 2025.csv' });
    expect(r.info?.file).toBe('plant export Dec 2025.csv');
    expect(r.rejected.map((x) => x.line)).toEqual([7, 10, 16, 17, 18]);
    expect(job.progress).toMatchObject({ rowsRead: 16, bytesDone: staged.sizeBytes, totalBytes: staged.sizeBytes });
    // The main connection sees what the job's connection committed.
    expect(await h.ok('getImport', { id: r.import!.id })).toMatchObject({ file: 'plant export Dec 2025.csv', sha256: staged.sha256, status: 'complete' });
    expect(count(h.fdb, 'SELECT count(*) AS n FROM readings WHERE import_id = ?', r.import!.id)).toBe(4);
    expect(count(h.fdb, "SELECT count(*) AS n FROM audit_log WHERE action = 'import' AND new_json LIKE '%tauwell-staging%'")).toBe(0);

    // The same bytes again: refused as already imported, a failed job that carries the report.
    const again = await ended(h, (await h.ok<ImportJobJson>('startImport', { staged: staged.staged, dateOrder: 'dmy' })).jobId);
    expect(again).toMatchObject({ state: 'failed', error: expect.stringMatching(/already imported completely as import/) });
    expect(again.result).toMatchObject({ import: null, alreadyImported: { id: r.import!.id } });
  });

  it('refuses at once what the import would refuse first, and reports a refusal of the file naming it as uploaded', async () => {
    const h = harness();
    const staged = await upload(h, 'plant.csv', readFileSync(EXPORT));
    expect(await h.refused('startImport', { staged: staged.staged, field: 'Elsewhere' })).toMatchObject({ field: 'field' });
    expect(await h.refused('startImport', { staged: 'x' })).toMatchObject({ field: 'staged' });
    expect(await h.refused('importJob', { jobId: 'x' })).toMatchObject({ field: 'jobId' });
    const job = await ended(h, (await h.ok<ImportJobJson>('startImport', { staged: staged.staged })).jobId);
    // No dateOrder: the reader refuses the file before the import begins; the line names the upload, not the staged copy.
    expect(job).toMatchObject({ state: 'failed', result: null });
    expect(job.error).toMatch(/^plant\.csv:2, field "Date\/Time": /);
    expect(count(h.fdb, 'SELECT count(*) AS n FROM imports')).toBe(0);
  });

  it('cancels a large import: nothing stored; a write meanwhile is refused in plain words, and works once it has ended', { timeout: 30_000 }, async () => {
    const h = harness();
    const readingsBefore = count(h.fdb, 'SELECT count(*) AS n FROM readings');
    const staged = await upload(h, 'big.csv', readFileSync(bigExport(200_000)));
    const started = await h.ok<ImportJobJson>('startImport', { staged: staged.staged });
    const midway = await reading(h, started.jobId);
    expect(midway.state).toBe('running');
    // Reads on the main connection go on (WAL: readers do not wait for the writer) and see the job's committed 'running' record.
    expect((await h.ok<{ imports: { status: string; file: string }[] }>('listImports', {})).imports[0]).toMatchObject({ status: 'running', file: 'big.csv' });

    const write = { well: 'KR-1', time: '2040-01-01T00:00:00Z', productionTemperature: 150 };
    const t0 = Date.now();
    expect(await h.refused('logReading', write)).toEqual({ error: `field "database": ${IMPORT_RUNNING_MESSAGE}`, field: 'database' });
    expect(Date.now() - t0).toBeLessThan(2000); // refused at once, not after the 5 s busy timeout
    expect(await h.refused('startImport', { staged: staged.staged })).toMatchObject({ field: 'staged', error: expect.stringMatching(/an import is running/) });

    await h.ok('cancelImport', { jobId: started.jobId });
    const job = await ended(h, started.jobId);
    expect(job.state).toBe('cancelled');
    expect(job.error).toBeNull();
    expect(job.result?.import).toMatchObject({ status: 'cancelled', imported: 0, file: 'big.csv' });
    expect(count(h.fdb, 'SELECT count(*) AS n FROM readings')).toBe(readingsBefore);
    expect(count(h.fdb, 'SELECT count(*) AS n FROM readings WHERE import_id IS NOT NULL')).toBe(0);

    expect(h.fdb.db.pragma('busy_timeout', { simple: true })).toBe(5000); // database.ts BUSY_TIMEOUT_MS, restored
    expect(await h.ok('logReading', write)).toMatchObject({ reading: { well: 'KR-1' } });
    expect(await h.ok<ImportJobJson>('cancelImport', { jobId: started.jobId })).toMatchObject({ state: 'cancelled' });
  });

  it('close() cancels the running job, waits for it and removes the staging folder', { timeout: 30_000 }, async () => {
    const h = harness();
    const staged = await upload(h, 'big.csv', readFileSync(bigExport(120_000)));
    expect(readdirSync(h.stagingDir)).toHaveLength(1);
    const started = await h.ok<ImportJobJson>('startImport', { staged: staged.staged });
    await reading(h, started.jobId);
    await h.api.close();
    expect(h.api.importJob({ jobId: started.jobId }).state).toBe('cancelled');
    expect(readdirSync(h.stagingDir)).toEqual([]);
    expect(count(h.fdb, 'SELECT count(*) AS n FROM readings WHERE import_id IS NOT NULL')).toBe(0);
    expect(() => h.api.beginUpload({ name: 'x.csv', sizeBytes: 1 })).toThrow(/after close/);
  });

  it('runs on the main connection for an in-memory field log', async () => {
    const h = harness(openDatabase(':memory:', { now: steppingClock() }));
    const staged = await upload(h, 'plant.csv', readFileSync(EXPORT));
    const job = await ended(h, (await h.ok<ImportJobJson>('startImport', { staged: staged.staged, dateOrder: 'dmy' })).jobId);
    // Same accounting as above (README): 4 of the 16 rows imported.
    expect(job.result?.import).toMatchObject({ status: 'complete', rowsRead: 16, imported: 4 });
    expect(count(h.fdb, 'SELECT count(*) AS n FROM readings WHERE import_id = ?', job.result!.import!.id)).toBe(4);
  });
});

describe('ImportJobs', () => {
  it(`keeps the last ${KEPT_FINISHED_JOBS} finished jobs, and logs an internal failure with a generic line`, async () => {
    const logged: string[] = [];
    const jobs = new ImportJobs({ now: steppingClock(), describe: (e) => e.message, log: (t) => logged.push(t) });
    const file = { staged: 's', name: 'f.csv', sizeBytes: 0, sha256: '' };
    const result = { import: { status: 'complete' } } as unknown as ImportCsvResponse;
    const ids: string[] = [];
    for (let i = 0; i <= KEPT_FINISHED_JOBS; i++) {
      ids.push(jobs.start(file, async () => result).jobId);
      while (jobs.running()) await new Promise((r) => setTimeout(r, 0));
    }
    expect(() => jobs.get(ids[0])).toThrow(/no import job/);
    expect(jobs.get(ids[1]).state).toBe('complete');

    const failing = jobs.start(file, async () => {
      throw new Error('a bug');
    });
    while (jobs.running()) await new Promise((r) => setTimeout(r, 0));
    expect(jobs.get(failing.jobId)).toMatchObject({ state: 'failed', error: expect.stringMatching(/^internal error/) });
    expect(logged.join('')).toMatch(/a bug/);
  });
});
