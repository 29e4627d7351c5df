/**
 * The contract of the field-data CSV import: the options a user can give, what the reader found
 * out about the file, and the two outcomes of a data row — a validated reading or a rejection
 * with a one-line reason. Every data row read ends as exactly one of the two.
 */

/** Column roles, in the order the import record lists them. */
export const COLUMN_ROLES = [
  'time',
  'well',
  'production-temperature',
  'flow',
  'injection-temperature',
  'pressure',
  'status',
  'note',
] as const;
export type ColumnRole = (typeof COLUMN_ROLES)[number];

/** Roles whose values carry a unit (from the header, an option, or the default). */
export const UNIT_ROLES = ['production-temperature', 'injection-temperature', 'flow', 'pressure'] as const;
export type UnitRole = (typeof UNIT_ROLES)[number];

/** Plain-words name of each role for messages ("production temperature"). */
export const ROLE_LABEL: Readonly<Record<ColumnRole, string>> = {
  time: 'time',
  well: 'well',
  'production-temperature': 'production temperature',
  flow: 'flow',
  'injection-temperature': 'injection temperature',
  pressure: 'wellhead pressure',
  status: 'status',
  note: 'note',
};

export const DELIMITERS = [',', ';', '\t', '|'] as const;
export type Delimiter = (typeof DELIMITERS)[number];
/** Delimiters by name, for options typed on a command line. */
export type DelimiterName = 'comma' | 'semicolon' | 'tab' | 'pipe';
export type DecimalSeparator = '.' | ',';
export type Linebreak = '\n' | '\r\n' | '\r';

/** Order of the parts of a numeric date such as 03/04/2024: day-month-year, month-day-year, year-month-day. */
export type DateOrder = 'dmy' | 'mdy' | 'ymd';

/**
 * How plain numbers in the time column are read.
 * - 'auto' (default): as 1900-system spreadsheet serial days, but only between 25569 (1970-01-01)
 *   and 73051 (2100-01-01), the span a plant log can cover; other numbers are rejected.
 * - '1900' / '1904': as serial days of that date system, from its first day (1900-01-01 is
 *   day 1, 1904-01-01 day 0).
 * - 'off': plain numbers are not timestamps.
 */
export type SerialDates = 'auto' | 'off' | '1900' | '1904';

import type { ReadingStatus, ReadingValues } from '../contract/reading-rules.js';

export type { ReadingStatus };
export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be';

export interface ReadingsCsvOptions {
  /** Field delimiter, as a character or by name; detected from the first rows when not given. */
  delimiter?: Delimiter | DelimiterName;
  /** Decimal separator of numbers; detected when not given (',' only ever with a non-comma delimiter). */
  decimal?: DecimalSeparator;
  /** Header of the column for a role, overriding the synonyms; null: the file has no such column. */
  columns?: Partial<Record<ColumnRole, string | null>>;
  /** Unit of a role's values, overriding the header annotation and the default. */
  units?: Partial<Record<UnitRole, string>>;
  /** Well name for every row, for a file that has no well column. */
  well?: string;
  /** IANA time zone of naive timestamps (no Z or offset); default 'UTC'. */
  timeZone?: string;
  /** Order of numeric dates such as 03/04/2024; never guessed, so required when the file has them. */
  dateOrder?: DateOrder;
  /** How plain numbers in the time column are read; default 'auto'. */
  serialDates?: SerialDates;
}

/** The options once checked: delimiter names turned into characters. */
export type CheckedCsvOptions = Omit<ReadingsCsvOptions, 'delimiter'> & { delimiter?: Delimiter };

/** Where a unit came from: the column header, the `units` option, or the default. */
export type UnitSource = 'header' | 'option' | 'default';

export interface ChosenUnit {
  /** Canonical symbol from units.ts, e.g. 'degF', 'm3/h'. */
  unit: string;
  source: UnitSource;
}

/** What the reader decided about the file; the import record keeps all of it. */
export interface CsvFileInfo {
  file: string;
  sizeBytes: number;
  encoding: TextEncoding;
  byteOrderMark: boolean;
  delimiter: Delimiter;
  decimal: DecimalSeparator;
  /** Whether delimiter and decimal were detected (false: given as options). */
  delimiterDetected: boolean;
  decimalDetected: boolean;
  linebreak: Linebreak;
  /** Physical line of the header row (1 unless the file starts with blank lines). */
  headerLine: number;
  headers: string[];
  /** Header of each role's column, or null when the file has none. */
  columns: Record<ColumnRole, string | null>;
  /** Headers that play no role; their values stay in each row's raw text. */
  unmappedHeaders: string[];
  /** Unit of each role's values, present or not, so that the record states what was assumed. */
  units: Record<UnitRole, ChosenUnit>;
  well: string | null;
  /** Zone naive timestamps were read in, and why: the option (or its default) or the time header, e.g. "Time (UTC)". */
  timeZone: string;
  timeZoneSource: 'option' | 'default' | 'header';
  dateOrder: DateOrder | null;
  serialDates: SerialDates;
  /** Plain-words assumptions the import applies (density of volume flows, DST rule, defaults). */
  assumptions: string[];
}

/**
 * The values of an imported row in stored units (°C, kg/s, m³/s, Pa): a stored reading's values
 * (ReadingValues of the contract) with the production temperature always present and no flags yet.
 */
export interface ImportedValues extends Omit<ReadingValues, 'flags' | 'productionTemperatureC' | 'temperatureUnit'> {
  productionTemperatureC: number;
  /** Unit the production temperature was entered in (the injection temperature's is in CsvFileInfo.units). */
  temperatureUnit: string;
}

export interface Reading extends ImportedValues {
  /** Physical line of the row's first character (header = line 1). */
  line: number;
  /** The row's text exactly as in the file, without its line break. */
  raw: string;
  wellName: string;
  /** Instant of the reading, UTC epoch milliseconds. */
  timeMs: number;
}

export interface Rejection {
  line: number;
  raw: string;
  /** One line naming the field and the value at fault. */
  reason: string;
  /** Header of the column at fault, or null when the row as a whole is (quoting, too few fields). */
  field: string | null;
}

/** Running totals; rowsRead === readings + rejections at every batch boundary. */
export interface ReadCounts {
  /** Data rows after the header, blank rows not counted. */
  rowsRead: number;
  readings: number;
  rejections: number;
  /** Empty rows and rows whose every cell is blank (a spreadsheet's trailing rows): skipped. */
  blankRows: number;
  /** Timestamps without Z or offset, read in the field's time zone. */
  naiveTimestamps: number;
  /** Naive times in a repeated hour (clocks set back): read as the first occurrence. */
  ambiguousLocalTimes: number;
  /** Naive times in a skipped hour (clocks set forward): read with the offset before the change. */
  nonexistentLocalTimes: number;
  /** Volume flows converted to mass, and how many of them used the assumed pressure (none logged). */
  volumeFlowsConverted: number;
  densityAtAssumedPressure: number;
}

export function emptyCounts(): ReadCounts {
  return {
    rowsRead: 0, readings: 0, rejections: 0, blankRows: 0, naiveTimestamps: 0,
    ambiguousLocalTimes: 0, nonexistentLocalTimes: 0, volumeFlowsConverted: 0, densityAtAssumedPressure: 0,
  };
}
