/**
 * The import service: run an import of a plant's CSV export into a field of the log, list the
 * imports, list and resolve the conflicts they held back, save and load import profiles.
 *
 *   createImportService(fdb, { who?, now? }): ImportService
 *     importCsv(request, { signal?, onProgress?, fileName? }): Promise<ImportCsvResponse>
 *     listImports(request?), getImport({ id }), listConflicts(request?), resolveConflicts(request),
 *     saveImportProfile(request), loadImportProfile({ name }), listImportProfiles()
 *
 * importCsv holds the connection's write transaction while it awaits the file (pipeline.ts): a
 * front end that keeps working on the log meanwhile gives it a connection of its own.
 */
import {
  GET_IMPORT_REQUEST, IMPORT_CSV_REQUEST, LIST_IMPORTS_REQUEST, REPORT_REJECTED_LIMIT,
  type GetImportRequest, type ImportCsvRequest, type ImportCsvResponse, type ImportProfileOptions, type ImportRecordJson, type ListImportsRequest,
  type ListImportsResponse, type RejectedRowJson,
} from '../../shared/contract/imports.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { UNIT_ROLES, type CsvFileInfo, type ReadingsCsvOptions } from '../../shared/import/types.js';
import type { FieldDb } from '../db/database.js';
import type { Field } from '../db/fields.js';
import { importReadingsCsv, type ImportOutcome, type ImportProgress } from '../import/pipeline.js';
import { ImportStore, type ImportRow } from '../import/store.js';
import { createContext, type ServiceContext, type ServiceOptions } from './context.js';
import { conflictServices } from './import-conflicts.js';
import { importProfileServices } from './import-profiles.js';

export type { ImportProgress } from '../import/pipeline.js';

export interface ImportControl {
  /** Cancels the import: everything is rolled back and the record says 'cancelled'. */
  signal?: AbortSignal;
  onProgress?: (progress: ImportProgress) => void;
  /** The name the record keeps when `request.file` is a copy of the user's file (a staged upload). */
  fileName?: string;
}

const DEFAULT_LIST_LIMIT = 100;

export function createImportService(fdb: FieldDb, options: ServiceOptions = {}) {
  const ctx = createContext(fdb, options);
  const store = new ImportStore(fdb);
  const profiles = importProfileServices(ctx);
  const rejectedRows = fdb.db.prepare<[number, number], RejectedRowJson>(
    'SELECT line, reason, raw FROM rejected_rows WHERE import_id = ? ORDER BY line, id LIMIT ?',
  );

  const recordJson = (row: ImportRow): ImportRecordJson => importRecordJson(ctx, row);

  function requireImport(id: number): ImportRow {
    const row = store.get(id);
    if (row === undefined) throw new InputError(`no import with id ${id}`, { field: 'id' });
    return row;
  }

  return {
    async importCsv(request: ImportCsvRequest, control: ImportControl = {}): Promise<ImportCsvResponse> {
      const req = validate(IMPORT_CSV_REQUEST, request);
      const { field, merged, csv } = importSetup(ctx, profiles.loadImportProfile, req);
      const outcome = await importReadingsCsv(fdb, req.file, {
        field,
        csv,
        createWells: req.createWells === true,
        force: req.force === true,
        who: ctx.who,
        ...(control.signal !== undefined ? { signal: control.signal } : {}),
        ...(control.onProgress !== undefined ? { onProgress: control.onProgress } : {}),
        ...(control.fileName !== undefined ? { fileName: control.fileName } : {}),
        recordExtra: req.profile === undefined ? {} : { profile: req.profile },
      });
      let profileSaved: string | null = null;
      if (req.saveProfile !== undefined && outcome.status === 'complete' && outcome.info !== null) {
        profileSaved = profiles.saveImportProfile({ name: req.saveProfile, ...profileFrom(merged, outcome.info) }).name;
      }
      return response(outcome, profileSaved);
    },

    listImports(request: ListImportsRequest = {}): ListImportsResponse {
      const req = validate(LIST_IMPORTS_REQUEST, request);
      return { imports: store.list(req.limit ?? DEFAULT_LIST_LIMIT).map(recordJson) };
    },

    getImport(request: GetImportRequest): ImportRecordJson {
      return recordJson(requireImport(validate(GET_IMPORT_REQUEST, request).id));
    },

    ...conflictServices(ctx),
    ...profiles,
  };

  function response(outcome: ImportOutcome, profileSaved: string | null): ImportCsvResponse {
    const record = outcome.importId === null ? null : recordJson(requireImport(outcome.importId));
    const earlier = outcome.alreadyImportedId === null ? null : recordJson(requireImport(outcome.alreadyImportedId));
    const rejected = outcome.importId === null ? [] : rejectedRows.all(outcome.importId, REPORT_REJECTED_LIMIT + 1);
    return {
      import: record,
      alreadyImported: earlier,
      rejected: rejected.slice(0, REPORT_REJECTED_LIMIT),
      rejectedTruncated: rejected.length > REPORT_REJECTED_LIMIT,
      unknownWells: outcome.unknownWells,
      createdWells: outcome.createdWells,
      blankRows: outcome.readCounts?.blankRows ?? 0,
      info: outcome.info,
      readCounts: outcome.readCounts,
      profileSaved,
      message: outcome.message,
    };
  }
}

export type ImportService = ReturnType<typeof createImportService>;

export interface ImportSetup {
  field: Field;
  /** The options given: a saved profile's under the request's own. */
  merged: ImportProfileOptions;
  /** The reader's options from them (naive times default to the field's zone in the pipeline). */
  csv: ReadingsCsvOptions;
}

/** The field and the options an import of `req` reads its file with (also what a preview shows). */
export function importSetup(
  ctx: ServiceContext, loadProfile: (ref: { name: string }) => ImportProfileOptions & { name: string; created: string },
  req: ImportProfileOptions & { field?: string; profile?: string },
): ImportSetup {
  const fromProfile = req.profile === undefined ? {} : stripName(loadProfile({ name: req.profile }));
  const merged = mergeOptions(fromProfile, req);
  return { field: fieldFor(ctx, req.field), merged, csv: readerOptions(merged) };
}

/** The field named, or the log's only one. */
function fieldFor(ctx: ServiceContext, name: string | undefined): Field {
  if (name !== undefined) return ctx.field(name);
  const fields = ctx.fields.list();
  if (fields.length === 1) return fields[0];
  if (fields.length === 0) throw new InputError('the field log has no field yet; create one first (tauwell init)', { field: 'field' });
  throw new InputError(`the field log has ${fields.length} fields; name the one to import into: ${fields.map((f) => JSON.stringify(f.name)).join(', ')}`, { field: 'field' });
}

function stripName(p: ImportProfileOptions & { name: string; created: string }): ImportProfileOptions {
  const { name: _name, created: _created, ...options } = p;
  return options;
}

/** A profile's options under the request's: the request wins, role by role for columns and units. */
function mergeOptions(profile: ImportProfileOptions, req: ImportProfileOptions): ImportProfileOptions {
  const pick = (o: ImportProfileOptions): ImportProfileOptions => {
    const { columns, units, timeZone, dateOrder, decimal, delimiter, serialDates, well } = o;
    return Object.fromEntries(Object.entries({ columns, units, timeZone, dateOrder, decimal, delimiter, serialDates, well }).filter(([, v]) => v !== undefined));
  };
  const out: ImportProfileOptions = { ...pick(profile), ...pick(req) };
  if (profile.columns !== undefined || req.columns !== undefined) out.columns = { ...profile.columns, ...req.columns };
  if (profile.units !== undefined || req.units !== undefined) out.units = { ...profile.units, ...req.units };
  return out;
}

function readerOptions(o: ImportProfileOptions): ReadingsCsvOptions {
  // The reader checks the delimiter's spelling (a character or its name) and names the option.
  const { delimiter, ...rest } = o;
  return { ...rest, ...(delimiter !== undefined ? { delimiter: delimiter as ReadingsCsvOptions['delimiter'] } : {}) };
}

/**
 * What a saved profile keeps of an import: the columns the file was read with (the role of each
 * header found or given), the units named by a header or an option, the dialect found or given, and
 * the options given. Not the field's time zone: a profile used in another field takes that field's.
 */
function profileFrom(given: ImportProfileOptions, info: CsvFileInfo): ImportProfileOptions {
  const columns: Record<string, string | null> = {};
  for (const [role, header] of Object.entries(info.columns)) if (header !== null) columns[role] = header;
  for (const [role, header] of Object.entries(given.columns ?? {})) if (header === null) columns[role] = null;
  const units: Record<string, string> = {};
  for (const role of UNIT_ROLES) {
    const chosen = info.units[role];
    if (info.columns[role] !== null && chosen.source !== 'default') units[role] = chosen.unit;
  }
  return {
    columns,
    units,
    delimiter: info.delimiter,
    decimal: info.decimal,
    ...(info.dateOrder !== null ? { dateOrder: info.dateOrder } : {}),
    ...(given.timeZone !== undefined ? { timeZone: given.timeZone } : {}),
    ...(given.serialDates !== undefined ? { serialDates: given.serialDates } : {}),
    ...(given.well !== undefined ? { well: given.well } : {}),
  };
}

export function importRecordJson(ctx: ServiceContext, r: ImportRow): ImportRecordJson {
  return {
    id: r.id,
    file: r.file_name,
    sizeBytes: r.file_size,
    sha256: r.sha256,
    field: r.field_id === null ? null : ctx.fields.get(r.field_id)?.name ?? null,
    status: r.status,
    message: r.message,
    rowsRead: r.rows_read,
    imported: r.imported,
    duplicates: r.duplicates,
    conflicts: r.conflicts,
    rejected: r.rejected,
    flagged: r.flagged,
    started: isoOf(r.started_ms),
    finished: r.finished_ms === null ? null : isoOf(r.finished_ms),
    mapping: JSON.parse(r.mapping_json) as Record<string, string | null>,
    units: JSON.parse(r.units_json) as Record<string, unknown>,
    options: JSON.parse(r.options_json) as Record<string, unknown>,
  };
}
