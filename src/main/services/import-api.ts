/**
 * The CSV import as the desktop window and the loopback page use it: the user's file staged in
 * chunks (staging.ts), previewed with the import's own reader and options (import/preview.ts),
 * imported as a job (import-jobs.ts) on a second connection to the same field log, so the window
 * stays usable, and the import records, conflicts and profiles of the import service (imports.ts).
 *
 *   createImportApi(fdb, { who?, now?, stagingDir?, nativeBinding?, log? }): ImportApi
 *     beginUpload, uploadChunk, finishUpload, previewImport, startImport, importJob, cancelImport,
 *     listImports, getImport, listConflicts, resolveConflicts, saveImportProfile, loadImportProfile,
 *     listImportProfiles                       as TauwellServices has them
 *     importing(): boolean                     whether an import job holds the field log's write lock
 *     close(): Promise<void>                   cancels a running job and waits for it, closes the
 *                                              second connection, removes the staging folder
 *   guardBusyWrites(services, importing): services whose "database is locked" is an InputError
 *
 * The second connection is opened with openDatabase on the first startImport. An in-memory field
 * log cannot have one: its jobs run on the main connection, so a write made through the main
 * connection while such a job runs joins the import's transaction (and is rolled back with it if
 * the job is cancelled). In-memory logs are for tests; do not write to one while it imports.
 *
 * While a job holds its write transaction, a write through the main connection cannot wait for it:
 * both connections live on this one thread, so SQLite's busy wait would stall the import it waits
 * for. The main connection's busy timeout is therefore 0 while a job runs — such a write fails at
 * once with SQLITE_BUSY — and guardBusyWrites turns that into "an import is running; try again
 * when it has finished" (an InputError naming `database`) rather than an internal error.
 */
import { resolve } from 'node:path';
import type { TauwellServices } from '../../shared/contract/index.js';
import {
  BEGIN_UPLOAD_REQUEST, IMPORT_CSV_REQUEST, IMPORT_JOB_REF, PREVIEW_IMPORT_REQUEST, STAGED_FILE_REF, START_IMPORT_REQUEST, UPLOAD_CHUNK_REQUEST,
  type ImportCsvResponse, type PreviewImportResponse,
} from '../../shared/contract/imports.js';
import { validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { openDatabase, type FieldDb } from '../db/database.js';
import { previewCsv } from '../import/preview.js';
import { createContext, type ServiceOptions } from './context.js';
import { ImportJobs } from './import-jobs.js';
import { createImportService, importSetup, type ImportService } from './imports.js';
import { StagingArea } from './staging.js';

export interface ImportApiOptions extends ServiceOptions {
  /** Folder to make the staging folder in; default the OS temp folder. */
  stagingDir?: string;
  /** The better-sqlite3 addon the field log was opened with (the desktop shell's Electron build), for the second connection. */
  nativeBinding?: string;
  /** Where the stack of an import job's internal failure goes; default stderr. */
  log?: (text: string) => void;
}

export type ImportApiMethod =
  | 'beginUpload' | 'uploadChunk' | 'finishUpload' | 'previewImport' | 'startImport' | 'importJob' | 'cancelImport'
  | 'listImports' | 'getImport' | 'listConflicts' | 'resolveConflicts' | 'saveImportProfile' | 'loadImportProfile' | 'listImportProfiles';

export type ImportApi = Pick<TauwellServices, ImportApiMethod> & {
  importing(): boolean;
  close(): Promise<void>;
};

export const DEFAULT_PREVIEW_ROWS = 20;
export const IMPORT_RUNNING_MESSAGE = 'an import is running; try again when it has finished';

export function createImportApi(fdb: FieldDb, options: ImportApiOptions = {}): ImportApi {
  const ctx = createContext(fdb, options);
  const main = createImportService(fdb, options);
  const staging = new StagingArea(options.stagingDir);
  const log = options.log ?? ((text: string) => void process.stderr.write(text));
  const inMemory = fdb.file === ':memory:';
  const file = inMemory ? fdb.file : resolve(fdb.file);
  let jobDb: FieldDb | null = null;
  let jobService: ImportService | null = null;
  let mainBusyTimeoutMs: number | null = null;
  let closed = false;

  const jobs = new ImportJobs({
    now: ctx.now,
    describe: (err) => oneLine(err.message),
    log,
    onRunning: (running) => {
      if (jobDb === null || !fdb.db.open) return;
      if (running) {
        mainBusyTimeoutMs = fdb.db.pragma('busy_timeout', { simple: true }) as number;
        fdb.db.pragma('busy_timeout = 0');
      } else if (mainBusyTimeoutMs !== null) {
        fdb.db.pragma(`busy_timeout = ${mainBusyTimeoutMs}`);
        mainBusyTimeoutMs = null;
      }
    },
  });

  /** The import service on the jobs' connection, opened on first use. */
  function jobConnection(): ImportService {
    if (jobService === null) {
      if (inMemory) jobService = main;
      else {
        jobDb = openDatabase(file, { now: fdb.now, ...(options.nativeBinding !== undefined ? { nativeBinding: options.nativeBinding } : {}) });
        jobService = createImportService(jobDb, options);
      }
    }
    return jobService;
  }

  const open = (): void => {
    if (closed) throw new Error('import api: used after close()');
  };

  return {
    beginUpload(request) {
      open();
      return staging.begin(validate(BEGIN_UPLOAD_REQUEST, request));
    },

    uploadChunk(request) {
      return staging.chunk(validate(UPLOAD_CHUNK_REQUEST, request));
    },

    finishUpload(request) {
      return staging.finish(validate(STAGED_FILE_REF, request));
    },

    async previewImport(request): Promise<PreviewImportResponse> {
      const { staged, rows, ...given } = validate(PREVIEW_IMPORT_REQUEST, request);
      const { path, json } = staging.file(staged);
      const { field, csv } = importSetup(ctx, main.loadImportProfile, given);
      // Naive times in the field's zone unless told otherwise, as the pipeline reads them.
      const preview = await previewCsv(path, { ...csv, timeZone: csv.timeZone ?? field.timeZone }, rows ?? DEFAULT_PREVIEW_ROWS);
      const known = new Set(ctx.wells.listByField(field.id).map((w) => w.name));
      return {
        file: json,
        info: preview.info === null ? null : { ...preview.info, file: json.name },
        rows: preview.rows,
        unknownWells: preview.wells.filter((w) => !known.has(w)),
        problem: preview.problem,
      };
    },

    startImport(request) {
      open();
      const { staged, ...given } = validate(START_IMPORT_REQUEST, request);
      if (fdb.readonly) throw new InputError('the field log is open read-only; nothing can be imported into it', { field: 'database' });
      const { path, json } = staging.file(staged);
      // Refuse now what importCsv would refuse first (an unknown field or profile), not in the job's report.
      const importRequest = validate(IMPORT_CSV_REQUEST, { ...given, file: path });
      importSetup(ctx, main.loadImportProfile, importRequest);
      const service = jobConnection();
      const describeName = (r: ImportCsvResponse): ImportCsvResponse => ({ ...r, info: r.info === null ? null : { ...r.info, file: json.name } });
      return jobs.start(json, async ({ signal, onProgress }) => {
        try {
          return describeName(await service.importCsv(importRequest, { signal, onProgress, fileName: json.name }));
        } catch (err) {
          // The reader's errors name the staged copy's path; the user knows the file by its name.
          throw err instanceof InputError && err.where.file === path ? new InputError(err.reason, { ...err.where, file: json.name }) : err;
        }
      });
    },

    importJob(request) {
      return jobs.get(validate(IMPORT_JOB_REF, request).jobId);
    },

    cancelImport(request) {
      return jobs.cancel(validate(IMPORT_JOB_REF, request).jobId);
    },

    listImports: main.listImports,
    getImport: main.getImport,
    listConflicts: main.listConflicts,
    resolveConflicts: main.resolveConflicts,
    saveImportProfile: main.saveImportProfile,
    loadImportProfile: main.loadImportProfile,
    listImportProfiles: main.listImportProfiles,

    importing: () => jobs.running(),

    async close() {
      closed = true;
      await jobs.close();
      (jobDb as FieldDb | null)?.close();
      staging.close();
    },
  };
}

/**
 * `services` with every method's SQLITE_BUSY / SQLITE_LOCKED (a write that found the field log's
 * write lock taken) turned into an InputError naming `database`: "an import is running; …" while
 * `importing()` says so, otherwise another program is writing. Other errors pass unchanged.
 */
export function guardBusyWrites<T extends object>(services: T, importing: () => boolean): T {
  const refusal = (): InputError => new InputError(
    importing() ? IMPORT_RUNNING_MESSAGE : 'the field log is locked by another program writing to it; try again when it has finished',
    { field: 'database' },
  );
  const guarded: Record<string, unknown> = {};
  for (const [name, value] of Object.entries(services)) {
    if (typeof value !== 'function') {
      guarded[name] = value;
      continue;
    }
    const method = value as (...args: unknown[]) => unknown;
    guarded[name] = function (this: unknown, ...args: unknown[]): unknown {
      let out: unknown;
      try {
        out = method.apply(this, args);
      } catch (e) {
        throw isBusy(e) ? refusal() : e;
      }
      if (out instanceof Promise) return out.catch((e: unknown) => Promise.reject(isBusy(e) ? refusal() : e));
      return out;
    };
  }
  return guarded as T;
}

function isBusy(e: unknown): boolean {
  const code = (e as { code?: unknown } | null)?.code;
  return typeof code === 'string' && (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED'));
}

function oneLine(text: string): string {
  return text.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}
