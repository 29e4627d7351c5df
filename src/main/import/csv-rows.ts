/**
 * Splits decoded CSV text, fed chunk by chunk, into rows with their physical line numbers and
 * their raw text, using papaparse's core parser (Papa.Parser, the one Papa.parse drives per
 * chunk). Driving it here rather than through Papa.parse(stream) keeps three things in our hands:
 * the text is decoded strictly before papaparse sees it (its stream reader would decode with
 * Buffer#toString and turn a Windows-1252 byte into U+FFFD silently); each row's end offset
 * (meta.cursor of the step result) indexes the very string we passed, so the raw text is a
 * substring of it; and the caller pulls, so memory holds one chunk and one partial row.
 *
 * Line numbers are physical: the header is line 1, and a quoted field with line breaks makes its
 * row span several lines, numbered by its first. A row papaparse reports with a quoting error is
 * rejected; when it spans several lines (a stray quote swallowing what follows), only its first
 * line is rejected and parsing restarts on the next line, so one bad quote costs one line. An
 * open quote that runs on for more than MAX_ROW_LINES lines or MAX_ROW_CHARS characters is
 * treated the same way without waiting for the end of the file.
 */
import Papa from 'papaparse';
import { InputError } from '../../shared/errors.js';
import type { Linebreak } from '../../shared/import/types.js';

export interface CsvRowSink {
  /** A data or header row: its cells, its first physical line, its text without the line break. */
  row(cells: string[], line: number, raw: string): void;
  /** A row that cannot be split into fields as written (quoting); `raw` is its first line. */
  malformed(line: number, raw: string, reason: string): void;
  /** A row with nothing but blanks in every cell (an empty line, or a spreadsheet's ",,,,"). */
  blank(line: number): void;
}

/** A quoted field may hold line breaks, but not this many: beyond it, the quote is taken to be stray. */
export const MAX_ROW_LINES = 100;
export const MAX_ROW_CHARS = 1 << 20;

const QUOTE_REASON: Readonly<Record<string, string>> = {
  MissingQuotes: 'malformed quoting: a quoted field opens on this line and never closes (a stray quote?)',
  InvalidQuotes: 'malformed quoting: a closing quote must be followed by the delimiter or the end of the line',
};

function isBlankRow(cells: readonly string[]): boolean {
  for (let i = 0; i < cells.length; i++) {
    const cell = cells[i];
    for (let k = 0; k < cell.length; k++) {
      const c = cell.charCodeAt(k);
      if (c !== 32 && c !== 9) return false;
    }
  }
  return true;
}

export class CsvRowSplitter {
  /** Text not yet split: at most a partial row between pushes. */
  private pending = '';
  /** The string the current parse() call is splitting; step offsets index it. */
  private text = '';
  /** Offset in `text` where the next row starts. */
  private rowStart = 0;
  /** Where to restart in `text` after a quoting error, or −1. */
  private restartAt = -1;
  private textHasQuote = false;
  private line: number;
  private parser: Papa.Parser | null = null;
  private readonly config: Papa.ParseConfig;
  private readonly breakChar: string;
  private readonly breakCode: number;
  private readonly crlf: boolean;

  constructor(
    delimiter: string,
    linebreak: Linebreak,
    private readonly sink: CsvRowSink,
    private readonly file: string,
    firstLine = 1,
  ) {
    this.line = firstLine;
    this.crlf = linebreak === '\r\n';
    this.breakChar = linebreak === '\r' ? '\r' : '\n';
    this.breakCode = this.breakChar.charCodeAt(0);
    this.config = { delimiter, newline: linebreak, quoteChar: '"', step: this.onStep };
  }

  /** Splits the complete rows of what has arrived so far. */
  push(text: string): void {
    this.pending = this.pending.length === 0 ? text : this.pending + text;
    this.run(false);
  }

  /** The end of the text: the last row needs no line break. */
  end(): void {
    this.run(true);
  }

  /** Physical line breaks consumed so far, those inside the pending partial row included. */
  lineBreaksSeen(): number {
    return this.line - 1 + this.countBreaks(this.pending, 0, this.pending.length);
  }

  private run(final: boolean): void {
    for (;;) {
      const text = this.pending;
      if (text.length === 0) return;
      this.text = text;
      this.rowStart = 0;
      this.restartAt = -1;
      this.textHasQuote = text.indexOf('"') !== -1;
      // A parser once aborted stays aborted, so each pass gets its own (as Papa.parse does per chunk).
      this.parser = new Papa.Parser(this.config);
      this.parser.parse(text, 0, !final);
      if (this.restartAt >= 0) {
        this.pending = text.substring(this.restartAt);
        continue;
      }
      this.pending = final ? '' : text.substring(this.rowStart);
      if (!final && this.dropRunawayLine()) continue;
      this.text = '';
      return;
    }
  }

  private countBreaks(text: string, from: number, to: number): number {
    let count = 0;
    for (let i = text.indexOf(this.breakChar, from); i !== -1 && i < to; i = text.indexOf(this.breakChar, i + 1)) count++;
    return count;
  }

  private readonly onStep = (results: Papa.ParseStepResult<string[][]>): void => {
    const text = this.text;
    const start = this.rowStart;
    // After the last line break papaparse reports the empty rest of the text as a row; it is none.
    if (start >= text.length) return;
    const end = results.meta.cursor;
    this.rowStart = end;
    let rawEnd = end;
    if (this.crlf) {
      if (end - start >= 2 && text.charCodeAt(end - 1) === 10 && text.charCodeAt(end - 2) === 13) rawEnd = end - 2;
    } else if (end > start && text.charCodeAt(end - 1) === this.breakCode) rawEnd = end - 1;
    const raw = text.substring(start, rawEnd);
    const line = this.line;
    const spans = this.textHasQuote ? this.countBreaks(raw, 0, raw.length) : 0;
    this.line = line + 1 + spans;
    const cells = results.data[0];

    if (results.errors.length > 0) {
      const reason = QUOTE_REASON[results.errors[0].code] ?? `malformed quoting: ${results.errors[0].message}`;
      if (spans === 0) {
        this.sink.malformed(line, raw, reason);
        return;
      }
      const firstBreak = raw.indexOf(this.breakChar);
      const firstEnd = this.crlf && raw.charCodeAt(firstBreak - 1) === 13 ? firstBreak - 1 : firstBreak;
      this.line = line + 1;
      this.restartAt = start + firstBreak + 1;
      (this.parser as Papa.Parser).abort();
      this.sink.malformed(line, raw.substring(0, firstEnd), reason);
      return;
    }
    if (isBlankRow(cells)) this.sink.blank(line);
    else this.sink.row(cells, line, raw);
  };

  /**
   * A partial row longer than a quoted field can reasonably be is an open stray quote: reject its
   * first line and go on from the next, instead of holding the rest of the file in memory.
   */
  private dropRunawayLine(): boolean {
    const pending = this.pending;
    const firstBreak = pending.indexOf(this.breakChar);
    if (firstBreak === -1) {
      if (pending.length > MAX_ROW_CHARS) {
        throw new InputError(`line ${this.line} runs on for more than ${MAX_ROW_CHARS} characters without a line break: this is not a CSV export`, { file: this.file, line: this.line });
      }
      return false;
    }
    if (pending.length <= MAX_ROW_CHARS && this.countBreaks(pending, firstBreak, pending.length) < MAX_ROW_LINES) return false;
    const firstEnd = this.crlf && pending.charCodeAt(firstBreak - 1) === 13 ? firstBreak - 1 : firstBreak;
    const line = this.line;
    this.line = line + 1;
    this.pending = pending.substring(firstBreak + 1);
    this.sink.malformed(line, pending.substring(0, firstEnd), `malformed quoting: a quoted field opens on this line and does not close within ${MAX_ROW_LINES} lines (a stray quote?)`);
    return true;
  }
}
