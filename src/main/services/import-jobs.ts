/**
 * Import jobs: an import started now and read about later. A job holds the import's progress (from
 * the pipeline's onProgress), its AbortController, and once it has ended its report, or the one
 * line that says why it failed. One job runs at a time — they share one connection, and two imports
 * interleaving inside one write transaction would be one import — and the last KEPT_FINISHED_JOBS
 * finished jobs are kept for reading.
 *
 *   new ImportJobs({ now, describe, log, onRunning? })
 *     start(file, run): ImportJobJson        get(jobId)    cancel(jobId)    running(): boolean
 *     close(): Promise<void>                 cancels the running job and waits for it to end
 *
 * How a job ends: a complete import is 'complete'; a cancelled one 'cancelled' (the pipeline rolled
 * it back); an import that failed on the file, or was refused as already imported, is 'failed' with
 * its report and the report's message as `error`; a refusal before the import began (an unreadable
 * file, a missing column) is 'failed' with the InputError's one line; anything else is a bug: a
 * generic line, and the stack to the log.
 */
import { randomUUID } from 'node:crypto';
import { INTERNAL_ERROR_MESSAGE } from '../../shared/contract/dispatch.js';
import type { ImportCsvResponse, ImportJobJson, ImportJobState, StagedFileJson } from '../../shared/contract/imports.js';
import { isoOf } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { ImportProgress } from '../import/pipeline.js';

export const KEPT_FINISHED_JOBS = 20;

export type JobRun = (control: { signal: AbortSignal; onProgress: (progress: ImportProgress) => void }) => Promise<ImportCsvResponse>;

export interface ImportJobsOptions {
  now: () => number;
  /** One line for an InputError that refused the import (naming the file as the user knows it). */
  describe: (err: InputError) => string;
  /** Where the stack of an internal failure goes. */
  log: (text: string) => void;
  /** Told when a job starts (true) and when it has ended (false). */
  onRunning?: (running: boolean) => void;
}

interface Job {
  json: ImportJobJson;
  controller: AbortController;
  ended: Promise<void>;
}

export class ImportJobs {
  private readonly jobs = new Map<string, Job>();
  private current: Job | null = null;

  constructor(private readonly options: ImportJobsOptions) {}

  running(): boolean {
    return this.current !== null;
  }

  start(file: StagedFileJson, run: JobRun): ImportJobJson {
    if (this.current !== null) {
      throw new InputError(`an import is running (${this.current.json.file.name}); start this one when it has finished`, { field: 'staged' });
    }
    const controller = new AbortController();
    const json: ImportJobJson = {
      jobId: randomUUID(), state: 'running', file, progress: null, result: null, error: null, started: isoOf(this.options.now()), finished: null,
    };
    const onProgress = (p: ImportProgress): void => {
      json.progress = { phase: p.phase, bytesDone: p.bytesDone, totalBytes: p.totalBytes, rowsRead: p.counts.rowsRead };
    };
    const job: Job = { json, controller, ended: Promise.resolve() };
    this.jobs.set(json.jobId, job);
    this.current = job;
    this.options.onRunning?.(true);
    // run() may throw before its first await; Promise.resolve().then keeps that a rejection too.
    job.ended = Promise.resolve()
      .then(() => run({ signal: controller.signal, onProgress }))
      .then(
        (result) => this.end(job, ...endOf(result)),
        (err: unknown) => this.end(job, ...this.failureOf(err, controller.signal)),
      );
    return copy(json);
  }

  get(jobId: string): ImportJobJson {
    return copy(this.job(jobId).json);
  }

  /** Asks the running import to stop; it ends 'cancelled' once rolled back (read it with get). A finished job is left as it is. */
  cancel(jobId: string): ImportJobJson {
    const job = this.job(jobId);
    if (job.json.state === 'running') job.controller.abort();
    return copy(job.json);
  }

  async close(): Promise<void> {
    const job = this.current;
    if (job === null) return;
    job.controller.abort();
    await job.ended;
  }

  private job(jobId: string): Job {
    const job = this.jobs.get(jobId);
    if (job === undefined) throw new InputError(`no import job with this id (the last ${KEPT_FINISHED_JOBS} finished jobs are kept)`, { field: 'jobId' });
    return job;
  }

  private failureOf(err: unknown, signal: AbortSignal): [ImportJobState, ImportCsvResponse | null, string | null] {
    if (signal.aborted) return ['cancelled', null, null];
    if (err instanceof InputError) return ['failed', null, this.options.describe(err)];
    this.options.log(`tauwell: internal error in an import job: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    return ['failed', null, INTERNAL_ERROR_MESSAGE];
  }

  private end(job: Job, state: ImportJobState, result: ImportCsvResponse | null, error: string | null): void {
    Object.assign(job.json, { state, result, error, finished: isoOf(this.options.now()) });
    if (this.current === job) this.current = null;
    this.options.onRunning?.(false);
    const finished = [...this.jobs.values()].filter((j) => j.json.state !== 'running');
    for (const old of finished.slice(0, Math.max(0, finished.length - KEPT_FINISHED_JOBS))) this.jobs.delete(old.json.jobId);
  }
}

/** The job's end from the import's report. */
function endOf(result: ImportCsvResponse): [ImportJobState, ImportCsvResponse, string | null] {
  const status = result.import?.status;
  if (status === 'complete') return ['complete', result, null];
  if (status === 'cancelled') return ['cancelled', result, null];
  return ['failed', result, oneLine(result.message)]; // failed on the file, or refused as already imported
}

function oneLine(text: string): string {
  return text.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}

function copy(json: ImportJobJson): ImportJobJson {
  return { ...json, progress: json.progress === null ? null : { ...json.progress } };
}
