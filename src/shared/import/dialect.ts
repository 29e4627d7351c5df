/**
 * The CSV dialect of an export, found from a sample of its first rows: the line break, the field
 * delimiter (comma, semicolon, tab or pipe) and the decimal separator ('175,3' in the semicolon
 * files of locales that write a decimal comma). Options override each guess; what was detected
 * and what was given is reported either way.
 *
 * Quoting is RFC 4180's: a field that starts with '"' runs to the next '"' not doubled, and may
 * hold delimiters and line breaks. This module splits only the sample (a few dozen rows), so it
 * can afford to be simple; the file itself is split by papaparse.
 */
import { DELIMITERS, type DecimalSeparator, type Delimiter, type Linebreak } from './types.js';

const QUOTE = 34;
const LF = 10;
const CR = 13;

/** Rows of the sample used to decide; enough to see a consistent field count. */
const SAMPLE_ROWS = 50;

export interface SampleRow {
  cells: string[];
  /** Physical line of the row's first character. */
  line: number;
}

export interface Dialect {
  delimiter: Delimiter;
  decimal: DecimalSeparator;
  linebreak: Linebreak;
  delimiterDetected: boolean;
  decimalDetected: boolean;
}

/** The first line break outside quotes: CRLF, LF or a lone CR; LF when the sample has none. */
export function detectLinebreak(text: string): Linebreak {
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === QUOTE) quoted = !quoted;
    else if (!quoted && c === LF) return '\n';
    else if (!quoted && c === CR) {
      if (i + 1 < text.length) return text.charCodeAt(i + 1) === LF ? '\r\n' : '\r';
      return '\r\n'; // the sample ends between CR and what follows it: CRLF is by far the likelier
    }
  }
  return '\n';
}

/**
 * Up to `maxRows` rows of `text` split with `delimiter`, with their physical lines. The last row
 * is left out when `complete` is false and the text does not end with a line break (it may be cut).
 */
export function splitSampleRows(text: string, delimiter: string, linebreak: Linebreak, complete: boolean, maxRows = SAMPLE_ROWS): SampleRow[] {
  const rows: SampleRow[] = [];
  const breakCode = linebreak === '\r' ? CR : LF;
  const d = delimiter.charCodeAt(0);
  let line = 1;
  let i = 0;
  const n = text.length;
  while (i < n && rows.length < maxRows) {
    const rowLine = line;
    const cells: string[] = [];
    let field = '';
    let quoted = false;
    let atFieldStart = true;
    let ended = false;
    for (; i < n; i++) {
      const c = text.charCodeAt(i);
      if (c === breakCode) line++;
      if (quoted) {
        if (c === QUOTE) {
          if (text.charCodeAt(i + 1) === QUOTE) {
            field += '"';
            i++;
          } else quoted = false;
        } else field += text[i];
        continue;
      }
      if (atFieldStart && c === QUOTE) {
        quoted = true;
        atFieldStart = false;
        continue;
      }
      atFieldStart = false;
      if (c === d) {
        cells.push(field);
        field = '';
        atFieldStart = true;
      } else if (c === breakCode) {
        i++;
        ended = true;
        break;
      } else if (!(c === CR && linebreak === '\r\n' && text.charCodeAt(i + 1) === LF)) {
        field += text[i];
      }
    }
    if (!ended && !complete) break;
    cells.push(field);
    rows.push({ cells, line: rowLine });
  }
  return rows;
}

function isBlankRow(cells: readonly string[]): boolean {
  return cells.every((c) => c.trim() === '');
}

/**
 * The delimiter that splits the header into the most fields while splitting the data rows into as
 * many as the header; ties go to the earlier of comma, semicolon, tab, pipe. Null when none splits
 * the header at all (a one-column file).
 */
export function detectDelimiter(text: string, linebreak: Linebreak, complete: boolean): Delimiter | null {
  let best: Delimiter | null = null;
  let bestScore = -1;
  let bestFields = 0;
  for (const delimiter of DELIMITERS) {
    const rows = splitSampleRows(text, delimiter, linebreak, complete).filter((r) => !isBlankRow(r.cells));
    if (rows.length === 0) continue;
    const fields = rows[0].cells.length;
    if (fields < 2) continue;
    const score = rows.slice(1).filter((r) => r.cells.length === fields).length;
    if (score > bestScore || (score === bestScore && fields > bestFields)) {
      best = delimiter;
      bestScore = score;
      bestFields = fields;
    }
  }
  return best;
}

const COMMA_DECIMAL = /^[+-]?\d+,\d+$/;
const POINT_DECIMAL = /^[+-]?\d*\.\d+$/;

/**
 * ',' when the data cells of a non-comma file hold more numbers with a decimal comma than with a
 * decimal point (a stray point is then a typing error the row check reports); '.' otherwise. A
 * comma file cannot hold a decimal comma unquoted, so its decimal is '.' unless the user says otherwise.
 */
export function detectDecimal(rows: readonly SampleRow[], delimiter: Delimiter): DecimalSeparator {
  if (delimiter === ',') return '.';
  let comma = 0;
  let point = 0;
  for (const row of rows.slice(1)) {
    for (const cell of row.cells) {
      const t = cell.trim();
      if (COMMA_DECIMAL.test(t)) comma++;
      else if (POINT_DECIMAL.test(t)) point++;
    }
  }
  return comma > point ? ',' : '.';
}

/** The dialect of a file from its first characters; `complete` says the sample is the whole file. */
export function detectDialect(
  sample: string,
  complete: boolean,
  options: { delimiter?: Delimiter; decimal?: DecimalSeparator },
): Dialect {
  const linebreak = detectLinebreak(sample);
  const delimiter = options.delimiter ?? detectDelimiter(sample, linebreak, complete) ?? ',';
  const decimal = options.decimal ?? detectDecimal(splitSampleRows(sample, delimiter, linebreak, complete).filter((r) => !isBlankRow(r.cells)), delimiter);
  return {
    delimiter,
    decimal,
    linebreak,
    delimiterDetected: options.delimiter === undefined,
    decimalDetected: options.decimal === undefined,
  };
}
