/**
 * `tauwell import FILE --db FILE …`: a plant's CSV export into a field of the log, in one
 * transaction — every data row imported, skipped as an exact duplicate, held as a conflict or
 * rejected with its reason, and the report says which. Ctrl-C cancels (nothing is stored); a progress
 * bar is drawn on stderr when it is a terminal.
 *
 * Registered with `{ spec: IMPORT_COMMAND, run: runImport, argv: importArgv }`: importArgv turns the
 * bare FILE into --file and gathers repeated --column/--unit options, which the parser otherwise refuses.
 */
import { resolve } from 'node:path';
import type { ImportCsvRequest, ImportCsvResponse } from '../../../shared/contract/imports.js';
import { InputError } from '../../../shared/errors.js';
import { COLUMN_ROLES, ROLE_LABEL, UNIT_ROLES, type ColumnRole, type DateOrder, type UnitRole } from '../../../shared/import/types.js';
import { createImportService, type ImportProgress } from '../../services/imports.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, WHO_OPTION, openFieldLog, whoOf } from '../db-access.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';

/** Separates the values of a repeated option once gathered: no command-line argument can hold a NUL. */
const REPEAT_SEPARATOR = '\u0000';
const REPEATED = new Set(['column', 'unit']);
/** Exit status of a run cut short by Ctrl-C (128 + SIGINT), as shells report it. */
const CANCELLED_EXIT = 130;
const TEXT_REJECTED_SHOWN = 50;

export const IMPORT_COMMAND: CommandSpec = {
  name: 'import',
  summary: 'Import a plant\'s CSV export into a field of the log, in one transaction: every data row imported, skipped as an exact duplicate, held as a conflict or rejected with its reason.',
  usage:
    'tauwell import FILE --db FILE [--field NAME] [--well NAME] [--create-wells] [--column ROLE=HEADER]… [--unit ROLE=UNIT]… '
    + '[--timezone IANA] [--date-order dmy|mdy|ymd] [--decimal ,|.] [--delimiter X] [--force] [--profile NAME] [--save-profile NAME] [--json]',
  options: [
    { name: 'file', kind: 'value', placeholder: 'FILE', help: 'the CSV file (may also be given as the first word after `import`)' },
    DB_OPTION,
    { name: 'field', kind: 'value', placeholder: 'NAME', help: 'field to import into; needed when the log has several' },
    { name: 'well', kind: 'value', placeholder: 'NAME', help: 'the well of every row, for a file without a well column' },
    { name: 'create-wells', kind: 'flag', help: 'create the wells the file names and the field lacks (as production wells) instead of rejecting their rows' },
    { name: 'column', kind: 'value', placeholder: 'ROLE=HEADER', help: `the header of a role's column, repeatable; roles: ${COLUMN_ROLES.join(', ')}; an empty header means the file has no such column` },
    { name: 'unit', kind: 'value', placeholder: 'ROLE=UNIT', help: `the unit of a role's values, repeatable, e.g. production-temperature=degF, flow=m3/h, pressure=bar; roles: ${UNIT_ROLES.join(', ')}` },
    { name: 'timezone', kind: 'value', placeholder: 'IANA', defaultText: 'the field\'s time zone', help: 'time zone of timestamps without Z or an offset, e.g. Europe/Berlin' },
    { name: 'date-order', kind: 'value', placeholder: 'ORDER', choices: ['dmy', 'mdy', 'ymd'], help: 'order of numeric dates such as 03/04/2024; never guessed, so required when the file has them' },
    { name: 'decimal', kind: 'value', placeholder: 'SEP', choices: [',', '.'], defaultText: 'detected', help: 'decimal separator of numbers' },
    { name: 'delimiter', kind: 'value', placeholder: 'X', defaultText: 'detected', help: 'field delimiter: , ; | or tab (or comma, semicolon, pipe)' },
    { name: 'force', kind: 'flag', help: 'import a file again although the same bytes were imported completely before (its rows then count as duplicates)' },
    { name: 'profile', kind: 'value', placeholder: 'NAME', help: 'start from the options of a saved import profile; options given here win' },
    { name: 'save-profile', kind: 'value', placeholder: 'NAME', help: 'save the columns, units and dialect this import used as a profile (replacing one of that name)' },
    WHO_OPTION,
    { name: 'json', kind: 'flag', help: 'print the report as JSON' },
  ],
  notes: [
    'Every data row read is accounted for: rows read = imported + duplicates + conflicts + rejected. Blank rows are not data rows. A row with the same well and instant as a stored reading is skipped when its values are the same, and held as a conflict (never an overwrite) when they differ: see `tauwell conflicts` and `tauwell resolve`. Rejected rows are stored with their line, text and reason (`tauwell export rejected --import ID`). A production temperature far from its neighbours is imported and flagged \'spike\'.',
    'The import is one transaction: cancelled (Ctrl-C), failed or killed, it leaves none of the file\'s rows in the log. Exit status 0 when complete (or already imported), 2 for bad input, 130 when cancelled.',
  ],
};

/** `import FILE --db X --column a=b --column c=d` → `--file FILE --db X --column a=b<NUL>c=d`. */
export function importArgv(argv: readonly string[]): string[] {
  const valueOptions = new Set(IMPORT_COMMAND.options.filter((o) => o.kind === 'value').map((o) => o.name));
  const out: string[] = [];
  const gathered = new Map<string, string[]>();
  let file: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (!arg.startsWith('--')) {
      if (file === undefined) file = arg;
      else out.push(arg); // the parser names the stray argument
      continue;
    }
    const eq = arg.indexOf('=');
    const name = arg.slice(2, eq < 0 ? undefined : eq);
    const takesValue = valueOptions.has(name) && eq < 0 && i + 1 < argv.length && !argv[i + 1].startsWith('--');
    if (REPEATED.has(name) && (eq >= 0 || takesValue)) {
      const list = gathered.get(name) ?? [];
      list.push(eq >= 0 ? arg.slice(eq + 1) : argv[++i]);
      gathered.set(name, list);
      continue;
    }
    out.push(arg);
    if (takesValue) out.push(argv[++i]);
  }
  for (const [name, values] of gathered) out.push(`--${name}`, values.join(REPEAT_SEPARATOR));
  return file === undefined ? out : ['--file', file, ...out];
}

/** `ROLE=VALUE` pairs of a gathered option. */
function pairs<R extends string>(args: ParsedArgs, name: string, roles: readonly R[]): Partial<Record<R, string>> | undefined {
  const text = args.string(name);
  if (text === undefined) return undefined;
  const out: Partial<Record<R, string>> = {};
  for (const item of text.split(REPEAT_SEPARATOR)) {
    const eq = item.indexOf('=');
    const role = (eq < 0 ? item : item.slice(0, eq)).trim();
    if (eq < 0) throw new InputError(`${JSON.stringify(item)} is not ROLE=${name === 'unit' ? 'UNIT' : 'HEADER'}`, { field: `--${name}` });
    if (!(roles as readonly string[]).includes(role)) throw new InputError(`unknown role ${JSON.stringify(role)}; roles: ${roles.join(', ')}`, { field: `--${name}` });
    if (out[role as R] !== undefined) throw new InputError(`role ${role} given twice`, { field: `--${name}` });
    out[role as R] = item.slice(eq + 1);
  }
  return out;
}

export function importRequestOf(args: ParsedArgs, cwd: string): ImportCsvRequest {
  const typed = args.string('file');
  if (typed === undefined) throw new InputError('name the CSV file: tauwell import FILE --db FILE', { field: '--file' });
  const columns = pairs<ColumnRole>(args, 'column', COLUMN_ROLES);
  const units = pairs<UnitRole>(args, 'unit', UNIT_ROLES);
  const text = (name: string) => args.string(name);
  const request: ImportCsvRequest = { file: resolve(cwd, typed) };
  if (columns !== undefined) {
    request.columns = Object.fromEntries(Object.entries(columns).map(([role, header]) => [role, (header as string).trim() === '' ? null : header]));
  }
  if (units !== undefined) request.units = units;
  const options: [string, keyof ImportCsvRequest][] = [
    ['field', 'field'], ['well', 'well'], ['timezone', 'timeZone'], ['decimal', 'decimal'], ['delimiter', 'delimiter'],
    ['profile', 'profile'], ['save-profile', 'saveProfile'],
  ];
  for (const [option, key] of options) {
    const v = text(option);
    if (v !== undefined) (request as unknown as Record<string, unknown>)[key] = v;
  }
  const order = text('date-order');
  if (order !== undefined) request.dateOrder = order as DateOrder;
  if (args.flag('create-wells')) request.createWells = true;
  if (args.flag('force')) request.force = true;
  return request;
}

/** Request and reader fields as the options that set them, so an error names what the user typed. */
const OPTION_OF: Readonly<Record<string, string>> = {
  timeZone: '--timezone', dateOrder: '--date-order', decimal: '--decimal', delimiter: '--delimiter', well: '--well',
  field: '--field', profile: '--profile', saveProfile: '--save-profile', file: '--file',
};

function asOption(e: InputError, typedFile: string | undefined, absolute: string): InputError {
  const field = e.where.field;
  let option = field === undefined ? undefined : OPTION_OF[field];
  if (field?.startsWith('columns.') === true) option = '--column';
  if (field?.startsWith('units.') === true) option = '--unit';
  const file = e.where.file === absolute && typedFile !== undefined ? typedFile : e.where.file;
  if (option === undefined && file === e.where.file) return e;
  return new InputError(e.reason, { ...e.where, ...(file !== undefined ? { file } : {}), ...(option !== undefined ? { field: option } : {}) });
}

export async function runImport(args: ParsedArgs, io: CliIo): Promise<number> {
  const request = importRequestOf(args, io.cwd);
  const typedFile = args.string('file');
  const fdb = openFieldLog(args, io);
  const controller = new AbortController();
  const onSigint = (): void => controller.abort(new Error('cancelled by Ctrl-C'));
  process.once('SIGINT', onSigint);
  const bar = progressBar(io);
  let response: ImportCsvResponse;
  try {
    const service = createImportService(fdb, { who: whoOf(args) });
    response = await service.importCsv(request, { signal: controller.signal, ...(bar !== null ? { onProgress: bar.update } : {}) });
  } catch (e) {
    if (controller.signal.aborted) {
      io.stderr.write('tauwell import: cancelled before the import started; nothing was stored\n');
      return CANCELLED_EXIT;
    }
    if (e instanceof InputError) throw asOption(e, typedFile, request.file);
    throw e;
  } finally {
    bar?.clear();
    process.off('SIGINT', onSigint);
    fdb.close();
  }

  const record = response.import;
  if (args.flag('json')) io.stdout.write(toJsonText(importJson(response)));
  else io.stdout.write(reportLines(response, args.requireString('db'), typedFile ?? request.file).join('\n') + '\n');
  if (record?.status === 'cancelled') {
    io.stderr.write(`tauwell import: ${record.message}\n`);
    return CANCELLED_EXIT;
  }
  if (record?.status === 'failed') {
    io.stderr.write(`tauwell: ${record.message.replace(/\s*[\r\n]+\s*/g, ' ')}\n`);
    return 2;
  }
  return 0;
}

/** The --json report: the record's counts first, then the rejected rows and the rest. */
export function importJson(r: ImportCsvResponse): Record<string, unknown> {
  const i = r.import;
  return {
    import: i === null ? null : {
      id: i.id, file: i.file, sha256: i.sha256, rowsRead: i.rowsRead, imported: i.imported, duplicates: i.duplicates,
      conflicts: i.conflicts, rejected: i.rejected, flagged: i.flagged, status: i.status, blankRows: r.blankRows,
      field: i.field, sizeBytes: i.sizeBytes, started: i.started, finished: i.finished, message: i.message,
    },
    rejected: r.rejected.map((x) => ({ line: x.line, reason: x.reason, raw: x.raw })),
    rejectedTruncated: r.rejectedTruncated,
    unknownWells: r.unknownWells,
    createdWells: r.createdWells,
    alreadyImported: r.alreadyImported === null ? null : { id: r.alreadyImported.id, file: r.alreadyImported.file, sha256: r.alreadyImported.sha256, finished: r.alreadyImported.finished },
    profileSaved: r.profileSaved,
    info: r.info,
  };
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** The readable report: what was done, the accounting line, what the file was taken to be, the rejected rows. */
export function reportLines(r: ImportCsvResponse, db: string, file: string): string[] {
  const i = r.import;
  if (i === null) {
    const earlier = r.alreadyImported;
    return [
      `tauwell import: ${file} was already imported completely as import ${earlier?.id} (${earlier?.finished ?? ''}; ${earlier?.rowsRead} rows read); nothing done.`,
      '  Give --force to import it again: its rows then count as duplicates.',
    ];
  }
  const lines = [`tauwell import: ${file} into ${JSON.stringify(i.field)} of ${db}: import ${i.id}, ${i.status}`];
  if (i.status !== 'complete') {
    lines.push(`  ${i.message}`);
    return lines;
  }
  lines.push(`  ${i.message}`);
  if (r.alreadyImported !== null) lines.push(`  the same bytes were imported completely before as import ${r.alreadyImported.id} (imported again with --force)`);
  if (r.info !== null) {
    const info = r.info;
    const delimiter = info.delimiter === '\t' ? 'tab' : `"${info.delimiter}"`;
    lines.push(`  file: ${i.sizeBytes} bytes, SHA-256 ${i.sha256}, ${info.encoding}, delimiter ${delimiter}, decimal "${info.decimal}", header on line ${info.headerLine}`);
    const mapped = COLUMN_ROLES.filter((role) => info.columns[role] !== null).map((role) => {
      const unit = (UNIT_ROLES as readonly string[]).includes(role) ? ` [${info.units[role as UnitRole].unit}, ${info.units[role as UnitRole].source}]` : '';
      return `${ROLE_LABEL[role]} ← "${info.columns[role]}"${unit}`;
    });
    lines.push(`  columns: ${mapped.join('; ')}`);
    if (info.unmappedHeaders.length > 0) lines.push(`  not read (kept in each row's text): ${info.unmappedHeaders.map((h) => `"${h}"`).join(', ')}`);
    for (const a of info.assumptions) lines.push(`  assumption: ${a}`);
  }
  if (r.createdWells.length > 0) lines.push(`  created production wells: ${r.createdWells.join(', ')}`);
  if (r.unknownWells.length > 0) {
    lines.push(`  unknown wells, their rows rejected: ${r.unknownWells.map((w) => `${w.name} (${plural(w.rows, 'row')})`).join(', ')}; add them with \`tauwell add-well\` or import again with --create-wells`);
  }
  if (i.conflicts > 0) {
    lines.push(`  ${plural(i.conflicts, 'conflict')} held, nothing overwritten: \`tauwell conflicts --db ${db} --import ${i.id}\`, then \`tauwell resolve --db ${db} --import ${i.id} --all --keep existing|new\``);
  }
  if (i.flagged > 0) lines.push(`  ${plural(i.flagged, 'reading')} flagged 'spike': imported, kept in the log, left out of fits`);
  if (r.profileSaved !== null) lines.push(`  saved the import profile ${JSON.stringify(r.profileSaved)}`);
  if (r.rejected.length > 0) {
    lines.push('', `Rejected rows (line: reason), all stored: \`tauwell export rejected --db ${db} --import ${i.id}\``);
    for (const x of r.rejected.slice(0, TEXT_REJECTED_SHOWN)) lines.push(`  ${x.line}: ${x.reason}`);
    if (i.rejected > TEXT_REJECTED_SHOWN) lines.push(`  … and ${i.rejected - TEXT_REJECTED_SHOWN} more`);
  }
  return lines;
}

interface ProgressBar {
  update(p: ImportProgress): void;
  clear(): void;
}

const BAR_WIDTH = 30;
const REDRAW_MS = 100;

/** A one-line bar on stderr, redrawn at most ten times a second; none when stderr is not a terminal. */
function progressBar(io: CliIo): ProgressBar | null {
  const sink = io.stderr as { isTTY?: boolean; write(text: string): unknown };
  if (sink.isTTY !== true) return null;
  let last = 0;
  let drawn = false;
  return {
    update(p) {
      const now = Date.now();
      if (now - last < REDRAW_MS && p.phase === 'reading') return;
      last = now;
      const fraction = p.totalBytes === 0 ? 1 : Math.min(1, p.bytesDone / p.totalBytes);
      const filled = Math.round(fraction * BAR_WIDTH);
      const c = p.counts;
      const tail = p.phase === 'reading' ? `${c.rowsRead.toLocaleString('en-US')} rows` : p.phase;
      sink.write(`\r[${'#'.repeat(filled)}${'.'.repeat(BAR_WIDTH - filled)}] ${String(Math.floor(fraction * 100)).padStart(3)} % ${p.phase === 'hashing' ? 'hashing' : tail}\u001b[K`);
      drawn = true;
    },
    clear() {
      if (drawn) sink.write('\r\u001b[K');
    },
  };
}
