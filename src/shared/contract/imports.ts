/**
 * Contract of the field-data CSV import: import a plant export into a field, list the imports,
 * list and resolve the conflicts an import held back, save and load import profiles.
 *
 * An import's report counts every data row it read and says where each went:
 *   rowsRead = imported + duplicates + conflicts + rejected
 * (blank rows are not data rows; `blankRows` says how many were skipped). Flagged readings (spikes)
 * are imported and counted among `imported` as well. Instants are ISO 8601 UTC ('…Z').
 */
import type { CsvFileInfo, ImportedValues, ReadCounts } from '../import/types.js';
import { COLUMN_ROLES, UNIT_ROLES, type ColumnRole, type DateOrder, type DecimalSeparator, type SerialDates, type UnitRole } from '../import/types.js';
import type { ReadingJson } from './readings.js';
import { boolean, nullable, number, object, oneOf, optional, string, type Schema } from './schema.js';

export type ImportStatus = 'running' | 'complete' | 'failed' | 'cancelled' | 'interrupted';

/** The options of an import that a profile can hold. */
export interface ImportProfileOptions {
  /** Header of each role's column; null: the file has no such column. */
  columns?: Partial<Record<ColumnRole, string | null>>;
  /** Unit of a role's values, overriding the header and the default. */
  units?: Partial<Record<UnitRole, string>>;
  /** IANA zone of naive timestamps; default the field's. */
  timeZone?: string;
  dateOrder?: DateOrder;
  decimal?: DecimalSeparator;
  /** ',', ';', '\t', '|' or comma, semicolon, tab, pipe; detected when absent. */
  delimiter?: string;
  serialDates?: SerialDates;
  /** Well of every row, for a file without a well column. */
  well?: string;
}

export interface ImportCsvRequest extends ImportProfileOptions {
  /** Path of the CSV file, as the back end sees it. */
  file: string;
  /** Field to import into; may be left out while the field log has one field. */
  field?: string;
  /** Create the wells the file names and the field lacks (as production wells), rather than reject their rows. */
  createWells?: boolean;
  /** Import a file again although an import of the same bytes (SHA-256) completed. */
  force?: boolean;
  /** Start from the options of this saved profile; the request's own options win. */
  profile?: string;
  /** Save the options this import used as a profile of this name (replacing one of the same name). */
  saveProfile?: string;
}

/** An import as recorded. */
export interface ImportRecordJson {
  id: number;
  file: string;
  sizeBytes: number;
  sha256: string;
  field: string | null;
  status: ImportStatus;
  message: string;
  rowsRead: number;
  imported: number;
  duplicates: number;
  conflicts: number;
  rejected: number;
  flagged: number;
  started: string;
  finished: string | null;
  /** Column role → header used (null: no such column). */
  mapping: Record<string, string | null>;
  /** Unit role → { unit, source } used. */
  units: Record<string, unknown>;
  /** Options given, what the reader decided about the file, its read counts (see ImportCsvResponse). */
  options: Record<string, unknown>;
}

export interface RejectedRowJson {
  line: number;
  reason: string;
  /** The row's text exactly as in the file. */
  raw: string;
}

export interface ImportCsvResponse {
  /** The import's record; null only when the file was refused as already imported. */
  import: ImportRecordJson | null;
  /** The earlier complete import of the same bytes, if any (the reason for a refusal, or what `force` repeated). */
  alreadyImported: ImportRecordJson | null;
  /** Rejected rows in line order, the first REPORT_REJECTED_LIMIT; all are stored and exportable. */
  rejected: RejectedRowJson[];
  rejectedTruncated: boolean;
  /** Wells the file names that the field lacks, with how many rows name each (rejected unless created). */
  unknownWells: { name: string; rows: number }[];
  /** Wells created by `createWells`. */
  createdWells: string[];
  /** Empty rows skipped: not data rows, not counted in rowsRead. */
  blankRows: number;
  /** What the reader decided about the file (null when it was not read). */
  info: CsvFileInfo | null;
  readCounts: ReadCounts | null;
  /** The profile saved, if `saveProfile` was given and the import completed. */
  profileSaved: string | null;
  /** One plain-words line: the accounting, or why nothing was done. */
  message: string;
}

/** How many rejected rows a report lists; `tauwell export rejected` has them all. */
export const REPORT_REJECTED_LIMIT = 1000;

/** The values of an imported row, as a conflict holds them. */
export type { ImportedValues };

export type ConflictResolution = 'open' | 'kept-existing' | 'replaced';

export interface ConflictJson {
  id: number;
  importId: number;
  /** Line of the imported file, and its text exactly as in the file. */
  line: number;
  raw: string;
  well: string;
  field: string;
  time: string;
  values: ImportedValues;
  /** The reading that held the instant when the row was imported (also when since deleted or replaced). */
  existing: ReadingJson | null;
  resolution: ConflictResolution;
  resolvedAt: string | null;
}

export interface ListConflictsRequest {
  importId?: number;
  /** Only conflicts still open (default: all). */
  open?: boolean;
}

export interface ListConflictsResponse {
  conflicts: ConflictJson[];
}

export type KeepChoice = 'existing' | 'new';

/** Resolve one conflict (`id`) or every open conflict of an import (`importId` with `all: true`). */
export interface ResolveConflictsRequest {
  id?: number;
  importId?: number;
  all?: boolean;
  /** existing: keep the stored reading; new: replace it by the imported values (the old one is soft-deleted). */
  keep: KeepChoice;
  reason?: string;
}

export interface ResolveConflictsResponse {
  resolved: ConflictJson[];
}

export interface ListImportsRequest {
  limit?: number;
}

export interface ListImportsResponse {
  imports: ImportRecordJson[];
}

export interface ImportProfileJson extends ImportProfileOptions {
  name: string;
  created: string;
}

export interface SaveImportProfileRequest extends ImportProfileOptions {
  name: string;
}

export interface ImportProfileRef {
  name: string;
}

export interface ListImportProfilesResponse {
  profiles: ImportProfileJson[];
}

// ---- schemas ----

const NAME = string({ maxLength: 200 });
const DATE_ORDERS: readonly DateOrder[] = ['dmy', 'mdy', 'ymd'];
const SERIAL_DATES: readonly SerialDates[] = ['auto', 'off', '1900', '1904'];

/** Role → value maps: every key a known role. */
function roleMap<T>(roles: readonly string[], value: Schema<T>, expected: string): Schema<Partial<Record<string, T>>> {
  return {
    expected,
    check(v, path) {
      const shape = Object.fromEntries(roles.map((r) => [r, optional(value)])) as Record<string, Schema<T | undefined>>;
      return object(shape).check(v, path) as Partial<Record<string, T>>;
    },
  };
}

const PROFILE_SHAPE = {
  columns: optional(roleMap(COLUMN_ROLES, nullable(string({ maxLength: 500 })), 'an object of column role: header')),
  units: optional(roleMap(UNIT_ROLES, string({ maxLength: 50 }), 'an object of unit role: unit')),
  timeZone: optional(string({ maxLength: 100 })),
  dateOrder: optional(oneOf(DATE_ORDERS)),
  decimal: optional(oneOf<DecimalSeparator>(['.', ','])),
  delimiter: optional(string({ allowEmpty: false, maxLength: 9 })),
  serialDates: optional(oneOf(SERIAL_DATES)),
  well: optional(NAME),
};

export const IMPORT_CSV_REQUEST = object({
  ...PROFILE_SHAPE,
  file: string({ maxLength: 4096 }),
  field: optional(NAME),
  createWells: optional(boolean()),
  force: optional(boolean()),
  profile: optional(NAME),
  saveProfile: optional(NAME),
}) as Schema<ImportCsvRequest>;

export const LIST_IMPORTS_REQUEST = object({ limit: optional(number({ integer: true, min: 1 })) }) as Schema<ListImportsRequest>;

export interface GetImportRequest {
  id: number;
}

export const GET_IMPORT_REQUEST = object({ id: number({ integer: true, min: 1 }) }) as Schema<GetImportRequest>;

export const LIST_CONFLICTS_REQUEST = object({
  importId: optional(number({ integer: true, min: 1 })),
  open: optional(boolean()),
}) as Schema<ListConflictsRequest>;

export const RESOLVE_CONFLICTS_REQUEST = object({
  id: optional(number({ integer: true, min: 1 })),
  importId: optional(number({ integer: true, min: 1 })),
  all: optional(boolean()),
  keep: oneOf<KeepChoice>(['existing', 'new']),
  reason: optional(string({ allowEmpty: true, maxLength: 1000 })),
}) as Schema<ResolveConflictsRequest>;

export const SAVE_IMPORT_PROFILE_REQUEST = object({ ...PROFILE_SHAPE, name: NAME }) as Schema<SaveImportProfileRequest>;
export const IMPORT_PROFILE_REF = object({ name: NAME }) as Schema<ImportProfileRef>;
export const LIST_IMPORT_PROFILES_REQUEST = object({}) as Schema<Record<string, never>>;

// ---- staged files and import jobs (the desktop window and the loopback page) ----
//
// A front end does not name a path on the back end's disk: it sends the file's bytes in chunks
// (beginUpload, uploadChunk, finishUpload), which the back end keeps in a private staging folder
// until it exits, and then previews or imports the staged file by its id. An import runs as a job
// on a connection of its own, so the window stays usable; importJob reports its progress and, at
// the end, the same report as importCsv; cancelImport rolls it back.

/** Largest chunk uploadChunk takes, bytes (before base64; the request stays under the 1 MiB body limit). */
export const UPLOAD_CHUNK_BYTES = 512 * 1024;

export interface BeginUploadRequest {
  /** The file's name as the user chose it (no folders); shown in the report and kept in the record. */
  name: string;
  sizeBytes: number;
}

export interface BeginUploadResponse {
  staged: string;
  chunkBytes: number;
}

export interface UploadChunkRequest {
  staged: string;
  /** Byte offset of this chunk: chunks arrive in order, each at the end of the previous. */
  offset: number;
  /** The chunk's bytes, base64. */
  base64: string;
}

export interface UploadChunkResponse {
  receivedBytes: number;
}

export interface StagedFileRef {
  staged: string;
}

export interface StagedFileJson {
  staged: string;
  name: string;
  sizeBytes: number;
  /** SHA-256 of the bytes, hex. */
  sha256: string;
}

export interface PreviewImportRequest extends ImportProfileOptions {
  staged: string;
  field?: string;
  profile?: string;
  /** Data rows to show, default 20, at most 200. */
  rows?: number;
}

export interface PreviewRow {
  line: number;
  /** The row's cells as split, before any interpretation. */
  cells: string[];
  /** How the import would read the row: a reading, or why it would be rejected. */
  reading: { well: string; time: string; values: ImportedValues } | null;
  rejected: string | null;
}

export interface PreviewImportResponse {
  file: StagedFileJson;
  /** What the reader decided (roles, units, dialect, encoding, zone); null when it could not read the file. */
  info: CsvFileInfo | null;
  rows: PreviewRow[];
  /** Wells the previewed rows name that the field lacks. */
  unknownWells: string[];
  /** Why the file cannot be read as it stands (e.g. dates that need a stated order), naming line and field. */
  problem: { message: string; line: number | null; field: string | null } | null;
}

export interface StartImportRequest extends Omit<ImportCsvRequest, 'file'> {
  staged: string;
}

export interface ImportJobRef {
  jobId: string;
}

export type ImportJobState = 'running' | 'complete' | 'failed' | 'cancelled';

export interface ImportJobJson {
  jobId: string;
  state: ImportJobState;
  file: StagedFileJson;
  progress: {
    phase: string;
    bytesDone: number;
    totalBytes: number;
    rowsRead: number;
  } | null;
  /** The import's report once it has ended (also for a refused or cancelled one, where there is one). */
  result: ImportCsvResponse | null;
  /** A refusal of the file or its options as one line naming line and field, or an internal failure. */
  error: string | null;
  started: string;
  finished: string | null;
}

const STAGED = string({ maxLength: 100 });

export const BEGIN_UPLOAD_REQUEST = object({
  name: string({ maxLength: 255 }),
  sizeBytes: number({ integer: true, min: 0, max: 64 * 1024 ** 3 }),
}) as Schema<BeginUploadRequest>;

export const UPLOAD_CHUNK_REQUEST = object({
  staged: STAGED,
  offset: number({ integer: true, min: 0 }),
  base64: string({ allowEmpty: true, maxLength: Math.ceil(UPLOAD_CHUNK_BYTES / 3) * 4 }),
}) as Schema<UploadChunkRequest>;

export const STAGED_FILE_REF = object({ staged: STAGED }) as Schema<StagedFileRef>;

export const PREVIEW_IMPORT_REQUEST = object({
  ...PROFILE_SHAPE,
  staged: STAGED,
  field: optional(NAME),
  profile: optional(NAME),
  rows: optional(number({ integer: true, min: 1, max: 200 })),
}) as Schema<PreviewImportRequest>;

export const START_IMPORT_REQUEST = object({
  ...PROFILE_SHAPE,
  staged: STAGED,
  field: optional(NAME),
  createWells: optional(boolean()),
  force: optional(boolean()),
  profile: optional(NAME),
  saveProfile: optional(NAME),
}) as Schema<StartImportRequest>;

export const IMPORT_JOB_REF = object({ jobId: string({ maxLength: 100 }) }) as Schema<ImportJobRef>;
