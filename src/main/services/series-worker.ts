/**
 * A reader thread of ColumnReader (column-reader.ts): one read-only connection to the field log that
 * reads one column of a well's readings into a SharedArrayBuffer while the calling thread does the
 * rest, so a long log's series costs about half the time on two cores and leaves next to nothing
 * for the calling thread's garbage collector.
 *
 * Protocol: workerData { file, nativeBinding? }; it posts 'ready' once the log is open (or 'failed: …').
 * Each message { column, wellId, includeDeleted, buffer, state } is answered in `state` (Int32Array over
 * a SharedArrayBuffer): [1 done | 2 failed, readings read], then Atomics.notify. The columns, in the
 * order and with the values of services/well-series.ts:
 *   'time'         Float64 instants, ms
 *   'temperature'  Float64 production temperature (NaN without one), then one byte a reading:
 *                  1 where the reading is not plain production (its values come from its own query)
 */
import Database from 'better-sqlite3';
import { parentPort, workerData } from 'node:worker_threads';
import { columnSql, fillTemperatures, type ColumnJob } from '../db/series-columns.js';

const DONE = 1;
const FAILED = 2;
const { file, nativeBinding } = workerData as { file: string; nativeBinding?: string };
const port = parentPort;

if (port !== null) {
  try {
    const db = new Database(file, { readonly: true, fileMustExist: true, ...(nativeBinding !== undefined ? { nativeBinding } : {}) });
    const statements = new Map<string, Database.Statement<[number], number | string | null>>();
    const statement = (job: ColumnJob) => {
      const key = `${job.column} ${job.includeDeleted}`;
      let s = statements.get(key);
      if (s === undefined) {
        s = db.prepare<[number], number | string | null>(columnSql(job.column, job.includeDeleted)).pluck(true);
        statements.set(key, s);
      }
      return s;
    };
    port.on('message', (job: ColumnJob & { buffer: SharedArrayBuffer; state: SharedArrayBuffer }) => {
      const state = new Int32Array(job.state);
      try {
        const values = statement(job).all(job.wellId);
        const n = values.length;
        if (job.column === 'time') {
          const out = new Float64Array(job.buffer, 0, Math.min(n, job.buffer.byteLength / 8));
          for (let i = 0; i < out.length; i++) out[i] = values[i] as number;
        } else {
          const count = job.buffer.byteLength / 9;
          const out = new Float64Array(job.buffer, 0, Math.min(n, count));
          fillTemperatures(values, out, new Uint8Array(job.buffer, 8 * count, out.length));
        }
        state[1] = n;
        Atomics.store(state, 0, DONE);
      } catch {
        Atomics.store(state, 0, FAILED);
      }
      Atomics.notify(state, 0);
    });
    port.postMessage('ready');
  } catch (e) {
    port.postMessage(`failed: ${e instanceof Error ? e.message : String(e)}`);
  }
}
