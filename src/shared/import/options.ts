/**
 * Checks the options of a CSV import before any byte is read, so that a misspelt role or an
 * unknown date order is one clear InputError naming the option, not a surprise on row 50 000.
 */
import { InputError } from '../errors.js';
import { COLUMN_ROLES, DELIMITERS, UNIT_ROLES, type CheckedCsvOptions, type Delimiter, type DelimiterName, type ReadingsCsvOptions } from './types.js';

const DELIMITER_NAMES: Readonly<Record<DelimiterName | '\\t', Delimiter>> = { comma: ',', semicolon: ';', tab: '\t', pipe: '|', '\\t': '\t' };
const DATE_ORDERS = ['dmy', 'mdy', 'ymd'] as const;
const SERIAL_DATES = ['auto', 'off', '1900', '1904'] as const;

function oneOf<T extends string>(value: unknown, allowed: readonly T[], field: string): T {
  if (typeof value === 'string' && (allowed as readonly string[]).includes(value)) return value as T;
  throw new InputError(`must be one of ${allowed.map((a) => JSON.stringify(a)).join(', ')} (got ${JSON.stringify(value)})`, { field });
}

function keysOf(value: unknown, allowed: readonly string[], field: string): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) throw new InputError('must be an object of role: value', { field });
  for (const key of Object.keys(value)) {
    if (!allowed.includes(key)) throw new InputError(`unknown role "${key}"; roles: ${allowed.join(', ')}`, { field });
  }
  return value as Record<string, unknown>;
}

/** The options with delimiter names ('tab', 'semicolon', …) turned into characters; InputError on anything else. */
export function checkReadingsCsvOptions(options: ReadingsCsvOptions): CheckedCsvOptions {
  const out: CheckedCsvOptions = {};
  if (options.delimiter !== undefined) {
    const d = (DELIMITER_NAMES as Record<string, Delimiter>)[options.delimiter] ?? options.delimiter;
    out.delimiter = oneOf(d, DELIMITERS, 'delimiter');
  }
  if (options.decimal !== undefined) out.decimal = oneOf(options.decimal, ['.', ','] as const, 'decimal');
  if (options.columns !== undefined) {
    const columns = keysOf(options.columns, COLUMN_ROLES, 'columns');
    for (const [role, header] of Object.entries(columns)) {
      if (header !== null && (typeof header !== 'string' || header.trim() === '')) {
        throw new InputError('must be a header of the file, or null for "no such column"', { field: `columns.${role}` });
      }
    }
    out.columns = { ...options.columns };
  }
  if (options.units !== undefined) {
    const units = keysOf(options.units, UNIT_ROLES, 'units');
    for (const [role, unit] of Object.entries(units)) {
      if (typeof unit !== 'string' || unit.trim() === '') throw new InputError('must be a unit name such as degF, m3/h or bar', { field: `units.${role}` });
    }
    out.units = { ...options.units };
  }
  if (options.well !== undefined) {
    if (typeof options.well !== 'string' || options.well.trim() === '') throw new InputError('must be a well name', { field: 'well' });
    out.well = options.well.trim();
  }
  if (options.timeZone !== undefined) {
    if (typeof options.timeZone !== 'string' || options.timeZone.trim() === '') throw new InputError('must be an IANA time zone such as Europe/Berlin', { field: 'timeZone' });
    out.timeZone = options.timeZone.trim();
  }
  if (options.dateOrder !== undefined) out.dateOrder = oneOf(options.dateOrder, DATE_ORDERS, 'dateOrder');
  if (options.serialDates !== undefined) out.serialDates = oneOf(options.serialDates, SERIAL_DATES, 'serialDates');
  return out;
}
