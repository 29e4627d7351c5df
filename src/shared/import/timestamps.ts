/**
 * Timestamps of a plant export, read into UTC epoch milliseconds:
 * - ISO 8601 extended format (the hot path, read by hand, no regular expression): a date
 *   YYYY-MM-DD, optionally 'T' or a space and hh:mm, hh:mm:ss or hh:mm:ss.fff (up to 9 digits),
 *   optionally Z or an offset ±hh, ±hhmm, ±hh:mm. Without an offset the time is naive and is read
 *   in the field's time zone; a date alone is local midnight.
 * - Numeric dates with '/', '.' or '-' (d/m/yyyy, m/d/yyyy, yyyy/m/d), optionally a space and
 *   h:mm or h:mm:ss with an optional AM/PM. Read only in the order the user states (dmy, mdy,
 *   ymd); without one, the import stops with an InputError, even when the values would prove the
 *   order, which the message then names: a date is never guessed.
 * - Spreadsheet serial day numbers (see SerialDates in types.ts): days since 1899-12-30 in the
 *   1900 date system, whose day 60 is the fictitious 1900-02-29 kept for compatibility with early
 *   spreadsheets, so serials 1–59 count from 1899-12-31 instead; days since 1904-01-01 in the
 *   1904 date system (common practice, as spreadsheet programs document their two date systems).
 *   A serial's time of day is rounded to the nearest second, since exports print the binary
 *   fraction of a day with few digits (0.33333 is 07:59:59.712).
 * Seconds run 00–59: a leap second (:60) has no place on the uniform time axis the fit uses.
 * Years outside 1900–2199 are rejected as typing errors, not plant records.
 */
import { InputError } from '../errors.js';
import type { DateOrder, SerialDates } from './types.js';
import { parseDecimal } from './numbers.js';
import { daysFromCivil, daysInMonth, type LocalTimeKind, type ZoneResolver } from './time-zone.js';

const DAY_MS = 86_400_000;
const MIN_YEAR = 1900;
const MAX_YEAR = 2199;
/** Serial day of 1970-01-01 in the 1900 date system (25 567 days from 1900-01-01, plus the fictitious 1900-02-29, plus day 1). */
const SERIAL_1900_UNIX_EPOCH = 25569;
/** Serial day of 1970-01-01 in the 1904 date system: 1904-01-01 is day 0, 24 107 days earlier. */
const SERIAL_1904_UNIX_EPOCH = 24107;
/** 'auto' reads plain numbers as serials only from 1970-01-01 (25569) to before 2100-01-01 (73051). */
export const AUTO_SERIAL_RANGE = { min: 25569, max: 73051 } as const;

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
const ORDER_TEXT: Readonly<Record<DateOrder, string>> = {
  dmy: 'dmy (day/month/year)',
  mdy: 'mdy (month/day/year)',
  ymd: 'ymd (year/month/day)',
};

const ZERO = 48;
const NINE = 57;
const SPACE = 32;
const TAB = 9;

function isDigit(c: number): boolean {
  return c >= ZERO && c <= NINE;
}

/** Two digits at text[i], or −1. */
function twoDigits(text: string, i: number): number {
  const a = text.charCodeAt(i) - ZERO;
  const b = text.charCodeAt(i + 1) - ZERO;
  return a >= 0 && a <= 9 && b >= 0 && b <= 9 ? a * 10 + b : -1;
}

/** Example values proving each order, from rows read so far or a sample of the file; used in messages. */
export type DateOrderEvidence = Partial<Record<DateOrder, { line: number; text: string }>>;

/** The parts of a numeric date d/m/y in any order, as written. */
interface NumericDate {
  a: number; aDigits: number;
  b: number; bDigits: number;
  c: number; cDigits: number;
  /** Index just after the date. */
  end: number;
}

/** Reads A sep B sep C (same separator, '/', '.' or '-', 1–4 digits each) from text[i]; null if it is not one. */
function numericDate(text: string, i: number, end: number): NumericDate | null {
  const parts = [0, 0, 0];
  const counts = [0, 0, 0];
  let separator = -1;
  let k = 0;
  for (; i < end; i++) {
    const ch = text.charCodeAt(i);
    if (isDigit(ch)) {
      if (++counts[k] > 4) return null;
      parts[k] = parts[k] * 10 + (ch - ZERO);
    } else if (k < 2 && counts[k] > 0 && (ch === 47 || ch === 46 || ch === 45) && (separator === -1 || separator === ch)) {
      separator = ch;
      k++;
    } else break;
  }
  if (k !== 2 || counts[2] === 0) return null;
  return { a: parts[0], aDigits: counts[0], b: parts[1], bDigits: counts[1], c: parts[2], cDigits: counts[2], end: i };
}

/** Which order a numeric date proves: 'ambiguous' when day and month could swap, null when it proves nothing. */
export function dateOrderOf(text: string): DateOrder | 'ambiguous' | null {
  const t = text.trim();
  if (isIsoShaped(t, 0, t.length)) return null;
  const d = numericDate(t, 0, t.length);
  if (d === null) return null;
  if (d.aDigits === 4 && d.cDigits <= 2) return 'ymd';
  if (d.cDigits !== 4 || d.aDigits > 2 || d.bDigits > 2) return null;
  if (d.a > 12 && d.b >= 1 && d.b <= 12) return 'dmy';
  if (d.b > 12 && d.a >= 1 && d.a <= 12) return 'mdy';
  if (d.a >= 1 && d.a <= 12 && d.b >= 1 && d.b <= 12) return 'ambiguous';
  return null;
}

/** Adds the first proof of each order found in `values` to `evidence`. */
export function collectDateOrderEvidence(values: Iterable<{ line: number; text: string }>, evidence: DateOrderEvidence = {}): DateOrderEvidence {
  for (const v of values) {
    const order = dateOrderOf(v.text);
    if (order !== null && order !== 'ambiguous' && evidence[order] === undefined) evidence[order] = { line: v.line, text: v.text.trim() };
  }
  return evidence;
}

export interface TimestampReaderOptions {
  zone: ZoneResolver;
  dateOrder: DateOrder | null;
  serialDates: SerialDates;
  decimalComma: boolean;
  /** For the InputError that asks for the date order. */
  file: string;
  field: string;
  /** Proofs of the order seen in a sample of the file, named in that error. */
  evidence?: DateOrderEvidence;
}

/**
 * Reads one time cell at a time without allocating on success: read() returns the UTC epoch
 * milliseconds, or NaN with the reason in `reason`. `naive` and `localKind` describe the last
 * successful read.
 */
export class TimestampReader {
  reason = '';
  naive = false;
  localKind: LocalTimeKind = 'unique';
  private readonly evidence: DateOrderEvidence;
  /** The last text read successfully and its instant; naive and localKind still describe it. */
  private lastText: string | null = null;
  private lastMs = NaN;

  constructor(private readonly options: TimestampReaderOptions) {
    this.evidence = { ...(options.evidence ?? {}) };
  }

  read(text: string, line: number): number {
    // Exports log every well at each instant in turn, so the same text often comes several times running.
    if (text === this.lastText) return this.lastMs;
    const ms = this.parse(text, line);
    if (ms === ms) {
      this.lastText = text;
      this.lastMs = ms;
    }
    return ms;
  }

  private parse(text: string, line: number): number {
    let i = 0;
    let end = text.length;
    while (i < end && isBlank(text.charCodeAt(i))) i++;
    while (end > i && isBlank(text.charCodeAt(end - 1))) end--;
    if (i === end) return this.fail('is empty');
    if (isIsoShaped(text, i, end)) return this.iso(text, i, end);
    const d = numericDate(text, i, end);
    if (d !== null) return this.numeric(text, d, end, line);
    return this.serial(text);
  }

  private fail(reason: string): number {
    this.reason = reason;
    return NaN;
  }

  private iso(text: string, i: number, end: number): number {
    const year = fourDigits(text, i);
    const month = twoDigits(text, i + 5);
    const day = twoDigits(text, i + 8);
    if (year < 0 || month < 0 || day < 0) return this.fail(ISO_REASON);
    let p = i + 10;
    let hour = 0, minute = 0, second = 0, ms = 0;
    let offsetMinutes = 0;
    let hasOffset = false;
    if (p < end) {
      const sep = text.charCodeAt(p);
      if (sep !== 84 && sep !== 116 && sep !== SPACE) return this.fail(ISO_REASON); // T, t, space
      p++;
      hour = twoDigits(text, p);
      minute = twoDigits(text, p + 3);
      if (hour < 0 || minute < 0 || text.charCodeAt(p + 2) !== 58 || p + 5 > end) return this.fail(ISO_REASON);
      p += 5;
      if (p < end && text.charCodeAt(p) === 58) {
        second = twoDigits(text, p + 1);
        if (second < 0 || p + 3 > end) return this.fail(ISO_REASON);
        p += 3;
        const c = text.charCodeAt(p);
        if (p < end && (c === 46 || c === 44)) {
          p++;
          const start = p;
          let fraction = 0;
          let scale = 1;
          for (; p < end && isDigit(text.charCodeAt(p)); p++) {
            if (p - start < 4) {
              fraction = fraction * 10 + (text.charCodeAt(p) - ZERO);
              scale *= 10;
            }
          }
          if (p === start || p - start > 9) return this.fail(ISO_REASON);
          ms = Math.round((fraction * 1000) / scale);
        }
      }
      while (p < end && text.charCodeAt(p) === SPACE) p++;
      if (p < end) {
        const z = text.charCodeAt(p);
        if (z === 90 || z === 122) {
          hasOffset = true;
          p++;
        } else if (z === 43 || z === 45) {
          const oh = twoDigits(text, p + 1);
          if (oh < 0 || p + 3 > end) return this.fail(ISO_REASON);
          p += 3;
          let om = 0;
          if (p < end) {
            if (text.charCodeAt(p) === 58) p++;
            om = twoDigits(text, p);
            if (om < 0 || p + 2 > end) return this.fail(ISO_REASON);
            p += 2;
          }
          if (oh > 23 || om > 59) return this.fail(`has UTC offset ${z === 45 ? '-' : '+'}${oh}:${String(om).padStart(2, '0')}, which does not exist`);
          offsetMinutes = (z === 45 ? -1 : 1) * (oh * 60 + om);
          hasOffset = true;
        }
        if (p !== end) return this.fail(ISO_REASON);
      }
    }
    const problem = checkFields(year, month, day, hour, minute, second);
    if (problem !== null) return this.fail(problem);
    const wallMs = daysFromCivil(year, month, day) * DAY_MS + ((hour * 60 + minute) * 60 + second) * 1000 + ms;
    if (hasOffset) {
      this.naive = false;
      this.localKind = 'unique';
      return wallMs - offsetMinutes * 60_000;
    }
    return this.local(wallMs);
  }

  private local(wallMs: number): number {
    this.naive = true;
    const utc = this.options.zone.toUtcMs(wallMs);
    this.localKind = this.options.zone.lastKind;
    return utc;
  }

  private numeric(text: string, d: NumericDate, end: number, line: number): number {
    const order = this.options.dateOrder;
    if (order === null) throw this.orderNeeded(text.slice(0, end).trim(), line);
    let year: number, month: number, day: number;
    if (order === 'ymd') {
      if (d.aDigits !== 4 || d.bDigits > 2 || d.cDigits > 2) return this.fail(`does not match the stated date order ${ORDER_TEXT[order]}`);
      [year, month, day] = [d.a, d.b, d.c];
    } else {
      if (d.cDigits === 2 && d.aDigits <= 2 && d.bDigits <= 2) return this.fail('has a two-digit year; write the year in full');
      if (d.cDigits !== 4 || d.aDigits > 2 || d.bDigits > 2) return this.fail(`does not match the stated date order ${ORDER_TEXT[order]}`);
      year = d.c;
      [day, month] = order === 'dmy' ? [d.a, d.b] : [d.b, d.a];
    }
    let p = d.end;
    let hour = 0, minute = 0, second = 0;
    if (p < end) {
      const sep = text.charCodeAt(p);
      if (sep !== SPACE && sep !== 84) return this.fail(NUMERIC_REASON);
      while (p < end && text.charCodeAt(p) === SPACE) p++;
      if (sep === 84) p++;
      // h:mm or hh:mm, optional :ss, optional AM/PM
      let h = 0, hDigits = 0;
      for (; p < end && isDigit(text.charCodeAt(p)) && hDigits < 3; p++, hDigits++) h = h * 10 + text.charCodeAt(p) - ZERO;
      if (hDigits === 0 || hDigits > 2 || text.charCodeAt(p) !== 58) return this.fail(NUMERIC_REASON);
      minute = twoDigits(text, p + 1);
      if (minute < 0 || p + 3 > end) return this.fail(NUMERIC_REASON);
      p += 3;
      if (p < end && text.charCodeAt(p) === 58) {
        second = twoDigits(text, p + 1);
        if (second < 0 || p + 3 > end) return this.fail(NUMERIC_REASON);
        p += 3;
      }
      while (p < end && text.charCodeAt(p) === SPACE) p++;
      hour = h;
      if (p < end) {
        const marker = text.slice(p, end).toUpperCase();
        if (marker !== 'AM' && marker !== 'PM') return this.fail(NUMERIC_REASON);
        if (h < 1 || h > 12) return this.fail(`has hour ${h} with ${marker}; a 12-hour clock runs 1–12`);
        hour = (h % 12) + (marker === 'PM' ? 12 : 0);
      }
    }
    const problem = checkFields(year, month, day, hour, minute, second);
    if (problem !== null) return this.fail(problem);
    return this.local(daysFromCivil(year, month, day) * DAY_MS + ((hour * 60 + minute) * 60 + second) * 1000);
  }

  private serial(text: string): number {
    const value = parseDecimal(text, this.options.decimalComma);
    if (value !== value) return this.fail(NOT_A_TIMESTAMP);
    const mode = this.options.serialDates;
    if (mode === 'off') return this.fail('is a plain number, not a timestamp (reading spreadsheet serial dates is off)');
    if (mode === 'auto' && !(value >= AUTO_SERIAL_RANGE.min && value < AUTO_SERIAL_RANGE.max)) {
      return this.fail(
        `is a plain number outside ${AUTO_SERIAL_RANGE.min}–${AUTO_SERIAL_RANGE.max}, the spreadsheet serial days of 1970–2099, so it is not read as a timestamp (state the date system with --serial-dates 1900 or 1904 to read it as a serial date)`,
      );
    }
    let days: number;
    if (mode === '1904') {
      if (!(value >= 0)) return this.fail('is a negative spreadsheet serial date');
      days = value - SERIAL_1904_UNIX_EPOCH;
    } else {
      if (!(value >= 1)) return this.fail('is not a 1900-system serial date: day 1 is 1900-01-01 (a value below 1 is a time of day without a date)');
      if (value >= 60 && value < 61) return this.fail('is serial day 60 of the 1900 date system, the fictitious 1900-02-29 (1900 was not a leap year)');
      days = value < 60 ? value - (SERIAL_1900_UNIX_EPOCH - 1) : value - SERIAL_1900_UNIX_EPOCH;
    }
    const wallMs = Math.round(days * 86_400) * 1000;
    const year = yearOfWallMs(wallMs);
    if (year < MIN_YEAR || year > MAX_YEAR) return this.fail(`is a serial date in ${year}; years run ${MIN_YEAR}–${MAX_YEAR}`);
    return this.local(wallMs);
  }

  private orderNeeded(text: string, line: number): InputError {
    const order = dateOrderOf(text);
    if (order !== null && order !== 'ambiguous' && this.evidence[order] === undefined) this.evidence[order] = { line, text };
    const proven = (Object.keys(this.evidence) as DateOrder[]).filter((o) => this.evidence[o] !== undefined);
    const example = (o: DateOrder): string => `line ${this.evidence[o]?.line}: "${this.evidence[o]?.text}"`;
    let what: string;
    if (order === 'ambiguous') {
      const d = numericDate(text, 0, text.length) as NumericDate;
      what = `"${text}" could be ${d.a} ${MONTHS[d.b - 1]} ${d.c} (day first) or ${MONTHS[d.a - 1]} ${d.b}, ${d.c} (month first); a date is never guessed`;
    } else {
      what = `"${text}" is a numeric date, read only when the order of its parts is stated`;
    }
    let hint = '';
    if (proven.length === 1) hint = `; the file appears to use ${ORDER_TEXT[proven[0]]} (${example(proven[0])})`;
    else if (proven.length > 1) hint = `; the file mixes ${proven.map((o) => `${o} (${example(o)})`).join(' and ')}`;
    const ask = proven.length === 1 ? `--date-order ${proven[0]}` : '--date-order dmy, mdy or ymd';
    return new InputError(`${what}: state the order with ${ask}${hint}`, { file: this.options.file, line, field: this.options.field });
  }
}

const ISO_REASON = 'is not an ISO 8601 timestamp such as 2024-03-01T08:00:00Z or 2024-03-01 08:00';
const NUMERIC_REASON = 'is not a date such as 01/03/2024 or 01/03/2024 08:00[:00] [AM|PM]';
const NOT_A_TIMESTAMP = 'is not a timestamp (ISO 8601 such as 2024-03-01T08:00:00Z, a numeric date such as 01/03/2024 with --date-order, or a spreadsheet serial date)';

/** Starts like an ISO date, YYYY-MM-DD: read as one (and never as a numeric date needing an order). */
function isIsoShaped(text: string, i: number, end: number): boolean {
  return end - i >= 10 && text.charCodeAt(i + 4) === 45 && text.charCodeAt(i + 7) === 45 && isDigit(text.charCodeAt(i));
}

function isBlank(c: number): boolean {
  return c === SPACE || c === TAB;
}

function fourDigits(text: string, i: number): number {
  const hi = twoDigits(text, i);
  const lo = twoDigits(text, i + 2);
  return hi < 0 || lo < 0 ? -1 : hi * 100 + lo;
}

function checkFields(year: number, month: number, day: number, hour: number, minute: number, second: number): string | null {
  if (year < MIN_YEAR || year > MAX_YEAR) return `has year ${year}; years run ${MIN_YEAR}–${MAX_YEAR}`;
  if (month < 1 || month > 12) return `has month ${month}; months run 1–12`;
  const days = daysInMonth(year, month);
  if (day < 1 || day > days) return `has day ${day}; ${MONTHS[month - 1]} ${year} has ${days} days`;
  if (hour > 23) return `has hour ${hour}; hours run 00–23`;
  if (minute > 59) return `has minute ${minute}; minutes run 00–59`;
  if (second > 59) return `has second ${second}; seconds run 00–59`;
  return null;
}

/** Proleptic Gregorian year of a wall-clock millisecond count (civil_from_days, H. Hinnant). */
function yearOfWallMs(wallMs: number): number {
  const z = Math.floor(wallMs / DAY_MS) + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const month = mp < 10 ? mp + 3 : mp - 9;
  return era * 400 + yoe + (month <= 2 ? 1 : 0);
}
