/**
 * Columns of a well's readings read on two threads (series-worker.ts, one column each: the
 * instants and the temperatures) while the calling thread reads the few readings that are not plain
 * production: reading rows out of SQLite is the cost of a long log's series, and it splits cleanly
 * by column. The values land in SharedArrayBuffers, so the calling thread's heap sees none of the
 * million numbers. Optional: without a file-backed log, before a thread has opened the log, or after
 * it failed, `start` gives null and the caller reads that column itself.
 *
 * Consistency: each thread has a connection of its own, so its snapshot could differ from the
 * caller's read transaction if another connection (an import job, another program) committed in
 * between. The caller compares `PRAGMA data_version` of its own connection before and after
 * (`dataVersion`), which changes exactly when another connection has committed, and reads on its
 * own when it did; the count of readings must match too.
 *
 * Exported API:
 *   class ColumnReader(fdb, nativeBinding?, workerUrl?)   workerUrl: default series-worker.js beside this module's output
 *     start(column, wellId, includeDeleted, count): (() => ColumnValues | null) | null   the wait gives null when the thread failed
 *     dataVersion(): number;  isReady(): boolean;  readsDone: number (columns the threads delivered)
 *     close(): Promise<void>
 *   interface ColumnValues { values: Float64Array; marks: Uint8Array | null }   marks: temperature column only
 *   PARALLEL_MIN_READINGS
 */
import { Worker } from 'node:worker_threads';
import type { FieldDb } from '../db/database.js';
import type { SeriesColumn } from '../db/series-columns.js';

/** Below this a second thread costs more than it saves. */
export const PARALLEL_MIN_READINGS = 50_000;
/** A read of ten million readings takes a few seconds; past this the thread is taken for lost. */
const WAIT_MS = 60_000;
/** A string, not a literal inside new URL(), so that bundlers leave it alone: the file sits beside this module's output. */
const WORKER_FILE = './series-worker.js';
const COLUMNS: readonly SeriesColumn[] = ['time', 'temperature'];

export interface ColumnValues {
  /** NaN where the reading has no value (temperature) or is not plain production (marks). */
  values: Float64Array;
  /** Temperature column: 1 where the reading is not plain production. */
  marks: Uint8Array | null;
}

interface Thread {
  worker: Worker;
  ready: boolean;
}

export class ColumnReader {
  private readonly threads = new Map<SeriesColumn, Thread>();
  /** Columns the threads have delivered (for tests and the benchmark). */
  readsDone = 0;

  constructor(private readonly fdb: FieldDb, nativeBinding?: string, workerUrl: URL = new URL(WORKER_FILE, import.meta.url)) {
    if (fdb.file === ':memory:' || fdb.file === '') return;
    for (const column of COLUMNS) {
      try {
        const worker = new Worker(workerUrl, { workerData: { file: fdb.file, ...(nativeBinding !== undefined ? { nativeBinding } : {}) } });
        worker.unref(); // never keeps a command or a test alive
        const thread: Thread = { worker, ready: false };
        worker.on('message', (m: unknown) => {
          if (m === 'ready') thread.ready = true;
          else this.stop(column);
        });
        worker.on('error', () => this.stop(column));
        worker.on('exit', () => {
          if (this.threads.get(column) === thread) this.threads.delete(column);
        });
        this.threads.set(column, thread);
      } catch {
        // e.g. the worker file is missing: that column is read on the calling thread
      }
    }
  }

  /** PRAGMA data_version of the caller's connection: it changes when another connection commits. */
  dataVersion(): number {
    return this.fdb.db.pragma('data_version', { simple: true }) as number;
  }

  isReady(): boolean {
    return COLUMNS.every((c) => this.threads.get(c)?.ready === true);
  }

  /**
   * Starts reading `column` of the well's `count` readings (in the order of db/series-columns.ts); the
   * returned function waits for it. Null when no thread can take the job.
   */
  start(column: SeriesColumn, wellId: number, includeDeleted: boolean, count: number): (() => ColumnValues | null) | null {
    const thread = this.threads.get(column);
    if (thread === undefined || !thread.ready || count < PARALLEL_MIN_READINGS) return null;
    const withMarks = column === 'temperature';
    const buffer = new SharedArrayBuffer((withMarks ? 9 : 8) * count);
    const state = new SharedArrayBuffer(8);
    thread.worker.postMessage({ column, wellId, includeDeleted, buffer, state });
    return () => {
      const s = new Int32Array(state);
      if (Atomics.wait(s, 0, 0, WAIT_MS) === 'timed-out') {
        this.stop(column);
        return null;
      }
      if (s[0] !== 1 || s[1] !== count) return null;
      this.readsDone++;
      return { values: new Float64Array(buffer, 0, count), marks: withMarks ? new Uint8Array(buffer, 8 * count, count) : null };
    };
  }

  private stop(column: SeriesColumn): void {
    const thread = this.threads.get(column);
    this.threads.delete(column);
    void thread?.worker.terminate();
  }

  async close(): Promise<void> {
    const workers = [...this.threads.values()].map((t) => t.worker);
    this.threads.clear();
    await Promise.all(workers.map((w) => w.terminate()));
  }
}
