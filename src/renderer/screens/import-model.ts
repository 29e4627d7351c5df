/**
 * The import screen's logic without the DOM: base64 of an upload chunk, the user's choices and the
 * requests built from them, the preview table as a model, the accounting of a finished import, a
 * conflict's stored and imported values side by side. Tested in test/renderer-import.test.ts.
 *
 * Exported API:
 *   base64OfBytes(bytes): string
 *   interface ImportChoices, emptyChoices(field?), profileOptionsOf(c), previewRequestOf(c, staged, rows?),
 *   startRequestOf(c, staged, force?), choicesWithProfile(c, profile), withRole(c, infoColumns, header, role)
 *   previewTableModel(preview, display): PreviewTableModel
 *   isDateOrderProblem(problem), plainOptionWords(message)
 *   progressText(job), accountingFacts(record, blankRows), blankRowsOf(record), assumptionsOf(record)
 *   interface ReportData, reportOfResponse(response, error?), reportOfRecord(record, rejected, limit)
 *   conflictComparison(conflict, display)
 *   unitLabel(symbol), unitChoices(role), DATE_ORDER_CHOICES, DELIMITER_CHOICES, SERIAL_DATE_CHOICES
 */
import type { Wire } from '../../shared/contract/channels.js';
import type {
  ConflictJson, ImportCsvResponse, ImportJobJson, ImportProfileOptions, ImportRecordJson, PreviewImportRequest, PreviewImportResponse,
  RejectedRowJson, StartImportRequest,
} from '../../shared/contract/imports.js';
import {
  COLUMN_ROLES, ROLE_LABEL, UNIT_ROLES,
  type ChosenUnit, type ColumnRole, type DateOrder, type DecimalSeparator, type Delimiter, type SerialDates, type UnitRole,
} from '../../shared/import/types.js';
import { unitsOf } from '../../shared/units.js';
import type { Display } from '../app/display.js';

// ---- base64 (RFC 4648 §4, the standard alphabet with '=' padding) ----

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
/** Bytes encoded per piece: a multiple of 3, so that only the last piece carries padding. */
const PIECE_BYTES = 3 * 4096;

/**
 * Base64 of `bytes`, built piece by piece: no binary string of the whole chunk (as btoa needs) and
 * no spread of a large array into one call, either of which can exhaust the stack or memory.
 */
export function base64OfBytes(bytes: Uint8Array): string {
  const pieces: string[] = [];
  const codes = new Array<number>(PIECE_BYTES / 3 * 4);
  for (let start = 0; start < bytes.length; start += PIECE_BYTES) {
    const end = Math.min(start + PIECE_BYTES, bytes.length);
    let n = 0;
    let i = start;
    for (; i + 2 < end; i += 3) {
      const v = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
      codes[n++] = ALPHABET.charCodeAt(v >>> 18);
      codes[n++] = ALPHABET.charCodeAt((v >>> 12) & 63);
      codes[n++] = ALPHABET.charCodeAt((v >>> 6) & 63);
      codes[n++] = ALPHABET.charCodeAt(v & 63);
    }
    const left = end - i;
    if (left > 0) {
      const v = (bytes[i] << 16) | (left === 2 ? bytes[i + 1] << 8 : 0);
      codes[n++] = ALPHABET.charCodeAt(v >>> 18);
      codes[n++] = ALPHABET.charCodeAt((v >>> 12) & 63);
      codes[n++] = left === 2 ? ALPHABET.charCodeAt((v >>> 6) & 63) : 61; // 61: '='
      codes[n++] = 61;
    }
    pieces.push(String.fromCharCode.apply(null, n === codes.length ? codes : codes.slice(0, n)));
  }
  return pieces.join('');
}

// ---- the user's choices and the requests made of them ----

/** What the user chose on the form; '' (or 'auto') means "as the file says / detected". */
export interface ImportChoices {
  field: string;
  /** Role → header, only the roles the user changed; null: "the file has no such column". */
  columns: Partial<Record<ColumnRole, string | null>>;
  units: Partial<Record<UnitRole, string>>;
  delimiter: '' | Delimiter;
  decimal: '' | DecimalSeparator;
  dateOrder: '' | DateOrder;
  /** IANA zone of naive timestamps; '' is the field's own. */
  timeZone: string;
  serialDates: SerialDates;
  /** Well of every row, for a file without a well column. */
  well: string;
  createWells: boolean;
}

export function emptyChoices(field = ''): ImportChoices {
  return { field, columns: {}, units: {}, delimiter: '', decimal: '', dateOrder: '', timeZone: '', serialDates: 'auto', well: '', createWells: false };
}

/** The options a profile holds, leaving out what was left to detection. */
export function profileOptionsOf(c: ImportChoices): ImportProfileOptions {
  const out: ImportProfileOptions = {};
  if (Object.keys(c.columns).length > 0) out.columns = { ...c.columns };
  const units = Object.fromEntries(Object.entries(c.units).filter(([, u]) => u !== undefined && u !== '')) as Partial<Record<UnitRole, string>>;
  if (Object.keys(units).length > 0) out.units = units;
  if (c.delimiter !== '') out.delimiter = c.delimiter;
  if (c.decimal !== '') out.decimal = c.decimal;
  if (c.dateOrder !== '') out.dateOrder = c.dateOrder;
  if (c.timeZone.trim() !== '') out.timeZone = c.timeZone.trim();
  if (c.serialDates !== 'auto') out.serialDates = c.serialDates;
  if (c.well.trim() !== '') out.well = c.well.trim();
  return out;
}

export function previewRequestOf(c: ImportChoices, staged: string, rows?: number): PreviewImportRequest {
  return { staged, ...fieldOf(c), ...profileOptionsOf(c), ...(rows !== undefined ? { rows } : {}) };
}

export function startRequestOf(c: ImportChoices, staged: string, force = false): StartImportRequest {
  return {
    staged, ...fieldOf(c), ...profileOptionsOf(c),
    ...(c.createWells ? { createWells: true } : {}),
    ...(force ? { force: true } : {}),
  };
}

function fieldOf(c: ImportChoices): { field?: string } {
  return c.field !== '' ? { field: c.field } : {};
}

/** The choices with a loaded profile's options in place of the current ones; field and "create wells" stay. */
export function choicesWithProfile(c: ImportChoices, p: ImportProfileOptions): ImportChoices {
  const base = emptyChoices(c.field);
  const delimiter = p.delimiter === undefined ? '' : delimiterOf(p.delimiter);
  return {
    ...base,
    createWells: c.createWells,
    columns: { ...(p.columns ?? {}) },
    units: { ...(p.units ?? {}) },
    delimiter,
    decimal: p.decimal ?? '',
    dateOrder: p.dateOrder ?? '',
    timeZone: p.timeZone ?? '',
    serialDates: p.serialDates ?? 'auto',
    well: p.well ?? '',
  };
}

const DELIMITER_NAMES: Readonly<Record<string, Delimiter>> = { comma: ',', semicolon: ';', tab: '\t', pipe: '|', '\\t': '\t', ',': ',', ';': ';', '\t': '\t', '|': '|' };

function delimiterOf(text: string): '' | Delimiter {
  return DELIMITER_NAMES[text] ?? '';
}

/**
 * The choices after the user gave column `header` the role `role` (null: "not used"). The column
 * that held `role` takes the header's old role in exchange (or none), so that stepping through a
 * role select with the arrow keys, each step a change, can always be stepped back. Only the roles
 * that moved are written, explicitly (null: "the file has no such column", so no synonym stands in).
 */
export function withRole(c: ImportChoices, infoColumns: Readonly<Record<ColumnRole, string | null>> | null, header: string, role: ColumnRole | null): ImportChoices {
  const effective = (r: ColumnRole): string | null => (c.columns[r] !== undefined ? c.columns[r] ?? null : infoColumns?.[r] ?? null);
  const before = COLUMN_ROLES.find((r) => effective(r) === header) ?? null;
  if (before === role) return c;
  const columns = { ...c.columns };
  const displaced = role !== null ? effective(role) : null;
  if (role !== null) columns[role] = header;
  if (before !== null) columns[before] = displaced !== header ? displaced : null;
  // Any other role still naming this header (a choice not yet previewed) lets go of it.
  for (const r of COLUMN_ROLES) if (r !== role && r !== before && effective(r) === header) columns[r] = null;
  return { ...c, columns };
}

// ---- the preview as a table ----

export interface PreviewColumnModel {
  header: string;
  role: ColumnRole | null;
  /** Set for a column whose role carries a unit. */
  unitRole: UnitRole | null;
  unit: ChosenUnit | null;
}

export interface PreviewRowModel {
  line: number;
  /** As many cells as headers (missing ones ''), then any surplus. */
  cells: string[];
  rejected: string | null;
  /** How the row would be read, in display units, or null when rejected. */
  readAs: string | null;
  /** The row names a well the field lacks: rejected at import unless the wells are created. */
  unknownWell: boolean;
}

export interface PreviewTableModel {
  columns: PreviewColumnModel[];
  rows: PreviewRowModel[];
  rejectedCount: number;
  /** Widest row: more cells than headers means the surplus is shown under "(extra)". */
  extraCells: number;
}

const UNIT_ROLE_SET: ReadonlySet<string> = new Set(UNIT_ROLES);

export function previewTableModel(preview: Wire<PreviewImportResponse>, display: Display): PreviewTableModel {
  const info = preview.info;
  const headers = info?.headers ?? [];
  const columns = headers.map((header): PreviewColumnModel => {
    const role = info === null ? null : COLUMN_ROLES.find((r) => info.columns[r] === header) ?? null;
    const unitRole = role !== null && UNIT_ROLE_SET.has(role) ? role as UnitRole : null;
    return { header, role, unitRole, unit: unitRole !== null && info !== null ? info.units[unitRole] : null };
  });
  let extraCells = 0;
  const unknown = new Set(preview.unknownWells);
  const rows = preview.rows.map((r): PreviewRowModel => {
    const cells = [...r.cells];
    while (cells.length < headers.length) cells.push('');
    extraCells = Math.max(extraCells, cells.length - headers.length);
    return {
      line: r.line, cells, rejected: r.rejected, readAs: r.reading === null ? null : readingText(r.reading, display),
      unknownWell: r.reading !== null && unknown.has(r.reading.well),
    };
  });
  return { columns, rows, rejectedCount: rows.filter((r) => r.rejected !== null).length, extraCells };
}

type PreviewReading = NonNullable<Wire<PreviewImportResponse>['rows'][number]['reading']>;

/** 'KR-1 · 2025-12-01 22:00 · 148.5 °C · inj. 70.2 °C · 58.2 kg/s · 2.38 MPa · producing'. */
function readingText(r: PreviewReading, display: Display): string {
  const v = r.values;
  const parts = [r.well, display.dateTime(r.time), display.formatCelsius(v.productionTemperatureC)];
  if (v.injectionTemperatureC !== null) parts.push(`inj. ${display.formatCelsius(v.injectionTemperatureC)}`);
  if (v.volumeFlowM3PerS !== null) parts.push(`${display.format('volumeFlow', v.volumeFlowM3PerS)} = ${display.format('massFlow', v.normalisedMassFlowKgPerS)}`);
  else if (v.normalisedMassFlowKgPerS !== null) parts.push(display.format('massFlow', v.normalisedMassFlowKgPerS));
  if (v.pressurePa !== null) parts.push(display.format('pressure', v.pressurePa));
  parts.push(v.status);
  if (v.note !== '') parts.push(`“${v.note}”`);
  return parts.join(' · ');
}

/** Whether a preview's problem is that the dates need a stated order (so the date-order control must be set). */
export function isDateOrderProblem(problem: { message: string; field: string | null } | null): boolean {
  if (problem === null) return false;
  return problem.field === 'dateOrder' || /--date-order|order of its parts|never guessed/i.test(problem.message);
}

const ORDER_WORDS: Readonly<Record<DateOrder, string>> = { dmy: 'day-month-year', mdy: 'month-day-year', ymd: 'year-month-day' };

/**
 * The reader's messages name command-line options (they serve `tauwell import` too); on this screen
 * the same choice is a control, so the option is named by its control's label.
 */
export function plainOptionWords(message: string): string {
  return message
    .replace(/--date-order (dmy|mdy|ymd)(?!,| or)/g, (_, o: DateOrder) => `Date order “${ORDER_WORDS[o]}”`)
    .replace(/--date-order dmy, mdy or ymd/g, 'the Date order control')
    .replace(/--serial-dates 1900 or 1904/g, 'Serial dates “1900 system” or “1904 system”')
    .replace(/--column ([a-z-]+)=<header>/g, (_, role: string) => `the Role select of a column (${ROLE_LABEL[role as ColumnRole] ?? role})`)
    .replace(/--unit ([a-z-]+)=<unit>/g, (_, role: string) => `the Unit select of the ${ROLE_LABEL[role as ColumnRole] ?? role} column`)
    .replace(/--well <name>/g, 'Well of every row')
    .replace(/--create-wells( \(createWells\))?/g, '“Create the wells the file names”')
    .replace(/--force/g, '“Import again anyway”')
    .replace(/import it again with force/g, 'use “Import again anyway”');
}

// ---- progress, accounting, conflicts ----

const INTEGER = new Intl.NumberFormat('en');

export function progressText(job: Wire<ImportJobJson>): string {
  const p = job.progress;
  if (p === null) return job.state === 'running' ? 'starting…' : job.state;
  const share = p.totalBytes > 0 ? ` · ${Math.floor((100 * p.bytesDone) / p.totalBytes)} % of the file` : '';
  return `${p.phase} · ${INTEGER.format(p.rowsRead)} ${p.rowsRead === 1 ? 'row' : 'rows'} read${share}`;
}

export interface AccountingFact {
  label: string;
  value: string;
  note?: string;
}

/** The counts of an import, every data row accounted for: rows read = imported + duplicates + conflicts + rejected. */
export function accountingFacts(r: Wire<ImportRecordJson>, blankRows: number): { facts: AccountingFact[]; balanced: boolean } {
  const n = (x: number): string => INTEGER.format(x);
  const facts: AccountingFact[] = [
    { label: 'Rows read', value: n(r.rowsRead), note: 'data rows after the header' },
    { label: 'Imported', value: n(r.imported), note: 'new readings stored' },
    { label: 'Duplicates', value: n(r.duplicates), note: 'same as a stored reading' },
    { label: 'Conflicts', value: n(r.conflicts), note: 'held back for a decision' },
    { label: 'Rejected', value: n(r.rejected), note: 'not readable; listed below' },
    { label: 'Flagged spikes', value: n(r.flagged), note: 'imported, left out of fits' },
    { label: 'Blank rows', value: n(blankRows), note: 'skipped, not data rows' },
  ];
  return { facts, balanced: r.rowsRead === r.imported + r.duplicates + r.conflicts + r.rejected };
}

/** Blank rows of a recorded import, from the reader's counts kept in its options. */
export function blankRowsOf(r: Wire<ImportRecordJson>): number {
  const read = r.options.read;
  if (typeof read === 'object' && read !== null && typeof (read as { blankRows?: unknown }).blankRows === 'number') {
    return (read as { blankRows: number }).blankRows;
  }
  return 0;
}

/** The assumptions the reader applied to a recorded import, from the file facts kept in its options. */
export function assumptionsOf(r: Wire<ImportRecordJson>): string[] {
  const file = r.options.file;
  const list = typeof file === 'object' && file !== null ? (file as { assumptions?: unknown }).assumptions : undefined;
  return Array.isArray(list) ? list.filter((a): a is string => typeof a === 'string') : [];
}

/** Everything the report shows, from a finished job's response or from a recorded import re-opened. */
export interface ReportData {
  record: Wire<ImportRecordJson> | null;
  alreadyImported: Wire<ImportRecordJson> | null;
  message: string;
  rejected: Wire<RejectedRowJson>[];
  rejectedTruncated: boolean;
  unknownWells: { name: string; rows: number }[];
  createdWells: string[];
  blankRows: number;
  assumptions: string[];
  profileSaved: string | null;
  /** The job's refusal or failure, when it had one. */
  error: string | null;
}

export function reportOfResponse(r: Wire<ImportCsvResponse>, error: string | null = null): ReportData {
  return {
    record: r.import, alreadyImported: r.alreadyImported, message: r.message, rejected: r.rejected, rejectedTruncated: r.rejectedTruncated,
    unknownWells: r.unknownWells, createdWells: r.createdWells, blankRows: r.blankRows, assumptions: r.info?.assumptions ?? [],
    profileSaved: r.profileSaved, error,
  };
}

/** A recorded import as a report: its first `limit` rejected rows (from the rejected-rows export) stand in for the response's. */
export function reportOfRecord(record: Wire<ImportRecordJson>, rejected: Wire<RejectedRowJson>[], limit: number): ReportData {
  return {
    record, alreadyImported: null, message: record.message, rejected: rejected.slice(0, limit), rejectedTruncated: rejected.length > limit,
    unknownWells: [], createdWells: [], blankRows: blankRowsOf(record), assumptions: assumptionsOf(record), profileSaved: null, error: null,
  };
}

export interface ComparisonRow {
  label: string;
  stored: string;
  imported: string;
  differs: boolean;
}

/** A conflict's stored reading and imported values, quantity by quantity, in display units. */
export function conflictComparison(c: Wire<ConflictJson>, display: Display): ComparisonRow[] {
  const e = c.existing;
  const v = c.values;
  const pair = (label: string, stored: string, imported: string): ComparisonRow => ({ label, stored, imported, differs: stored !== imported });
  const none = e === null ? 'no stored reading' : null;
  return [
    pair('Production temperature', none ?? display.formatCelsius(e?.productionTemperatureC), display.formatCelsius(v.productionTemperatureC)),
    pair('Injection temperature', none ?? display.formatCelsius(e?.injectionTemperatureC), display.formatCelsius(v.injectionTemperatureC)),
    pair('Mass flow', none ?? display.format('massFlow', e?.massFlowKgPerS), display.format('massFlow', v.normalisedMassFlowKgPerS)),
    pair('Wellhead pressure', none ?? display.format('pressure', e?.pressureMPa === null || e?.pressureMPa === undefined ? null : e.pressureMPa * 1e6), display.format('pressure', v.pressurePa)),
    pair('Status', none ?? e?.status ?? '—', v.status),
    pair('Note', none ?? (e?.note === '' ? '—' : e?.note ?? '—'), v.note === '' ? '—' : v.note),
  ];
}

// ---- choices offered by the form ----

const UNIT_LABELS: Readonly<Record<string, string>> = {
  degC: '°C', degF: '°F', K: 'K', m3: 'm³', 'm3/s': 'm³/s', 'm3/h': 'm³/h', 'm3/d': 'm³/d', gpm: 'US gal/min', psi: 'psia', bar: 'bar (absolute)',
};

export function unitLabel(symbol: string): string {
  return UNIT_LABELS[symbol] ?? symbol;
}

/** Units a role's values may be given in, grouped by kind (flow: mass or volume). */
export function unitChoices(role: UnitRole): { group: string; units: string[] }[] {
  switch (role) {
    case 'production-temperature':
    case 'injection-temperature':
      return [{ group: 'Temperature', units: unitsOf('temperature') }];
    case 'flow':
      return [{ group: 'Mass flow', units: unitsOf('massFlow') }, { group: 'Volume flow', units: unitsOf('volumeFlow') }];
    case 'pressure':
      return [{ group: 'Absolute pressure', units: unitsOf('pressure') }];
  }
}

export const DATE_ORDER_CHOICES: readonly (readonly [value: '' | DateOrder, label: string])[] = [
  ['', 'not stated'],
  ['dmy', 'day-month-year (31.12.2025)'],
  ['mdy', 'month-day-year (12/31/2025)'],
  ['ymd', 'year-month-day (2025/12/31)'],
];

export const DELIMITER_CHOICES: readonly (readonly [value: '' | Delimiter, label: string])[] = [
  ['', 'detect'], [',', 'comma ,'], [';', 'semicolon ;'], ['\t', 'tab'], ['|', 'pipe |'],
];

export const DECIMAL_CHOICES: readonly (readonly [value: '' | DecimalSeparator, label: string])[] = [
  ['', 'detect'], ['.', 'point 1.5'], [',', 'comma 1,5'],
];

export const SERIAL_DATE_CHOICES: readonly (readonly [value: SerialDates, label: string])[] = [
  ['auto', 'read 1970–2099 as 1900 system'], ['1900', '1900 system'], ['1904', '1904 system'], ['off', 'off (plain numbers are not times)'],
];

export function delimiterName(d: Delimiter): string {
  return d === '\t' ? 'tab' : d === ',' ? 'comma' : d === ';' ? 'semicolon' : 'pipe';
}
