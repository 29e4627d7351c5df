/**
 * Reads a plant's CSV export from disk as a stream of validated readings and rejections, in
 * batches, with flat memory however long the file: one file chunk, one partial row and one batch
 * are held at a time, and the next chunk is read only when the consumer asks for the next batch.
 *
 *   const csv = await openReadingsCsv('export.csv', { timeZone: 'Europe/Berlin' });
 *   // csv.info: encoding, delimiter, decimal, column of each role, units chosen, assumptions
 *   for await (const batch of csv) { ...batch.readings, batch.rejections... }
 *   // csv.counts: rowsRead === readings + rejections, and how naive times were resolved
 *
 * openReadingsCsv reads far enough to know the encoding, the dialect and the header (and checks
 * the first chunk's rows), so that an unreadable file, a missing column or an unstated date order
 * fails before a single batch reaches the database. Later whole-file errors (an invalid byte deep
 * in the file, a numeric date after a page of ISO ones) are InputErrors thrown by the iteration.
 * Cancelling through `signal` throws its reason (an AbortError) from the next batch.
 */
import { createReadStream, type ReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { InputError } from '../../shared/errors.js';
import { resolveColumns, type ResolvedColumns } from '../../shared/import/columns.js';
import { detectDialect, splitSampleRows, type Dialect } from '../../shared/import/dialect.js';
import { countLineBreaks, nulCharacterError, sniffEncoding } from '../../shared/import/encoding.js';
import { checkReadingsCsvOptions } from '../../shared/import/options.js';
import { RowValidator, type RowBatchTarget } from '../../shared/import/row-validator.js';
import { ZoneResolver } from '../../shared/import/time-zone.js';
import { collectDateOrderEvidence, TimestampReader, type DateOrderEvidence } from '../../shared/import/timestamps.js';
import {
  emptyCounts,
  UNIT_ROLES,
  ROLE_LABEL,
  type CheckedCsvOptions,
  type CsvFileInfo,
  type ReadCounts,
  type Reading,
  type ReadingsCsvOptions,
  type Rejection,
  type TextEncoding,
} from '../../shared/import/types.js';
import { CsvRowSplitter, type CsvRowSink } from './csv-rows.js';
import { StrictTextDecoder } from './decode-text.js';

export interface ReadCsvOptions extends ReadingsCsvOptions {
  /**
   * Rows (readings + rejections) per batch; default 1000. Small batches are cheaper, not dearer: a
   * batch lives only until the consumer has stored it, and one that outlives a few young-generation
   * collections is copied into the old generation (10 000-row batches made a 1,000,000-row read about
   * twice as slow on Node 20).
   */
  batchRows?: number;
  /**
   * Bytes per read from the file; default 64 KiB. Larger chunks decode to strings too big for the
   * young generation, whose allocation and joining to the partial row then cost more than the
   * reads saved (256 KiB chunks made a 1,000,000-row read about 1.5 times slower on Node 20).
   */
  chunkBytes?: number;
  signal?: AbortSignal;
  /** Called after each chunk with the bytes read so far and the file's size. */
  onProgress?: (bytesRead: number, totalBytes: number) => void;
}

export interface ReadingsBatch {
  readings: Reading[];
  rejections: Rejection[];
  bytesRead: number;
  totalBytes: number;
}

export interface ReadingsCsv extends AsyncIterable<ReadingsBatch> {
  readonly info: CsvFileInfo;
  /** Running totals, final once the iteration has ended. */
  readonly counts: Readonly<ReadCounts>;
  /** Stops reading and closes the file (also done when an iteration ends or breaks). */
  close(): Promise<void>;
}

const DEFAULT_BATCH_ROWS = 1000;
const DEFAULT_CHUNK_BYTES = 64 * 1024;
/** Bytes read before deciding the encoding and the dialect. */
const SAMPLE_BYTES = 64 * 1024;

/** Opens `file`, reads its header and first chunk, and returns the reader of its batches. */
export async function openReadingsCsv(file: string, options: ReadCsvOptions = {}): Promise<ReadingsCsv> {
  const reader = new CsvReadingsReader(file, options);
  try {
    await reader.open();
  } catch (err) {
    await reader.close();
    throw err;
  }
  return reader;
}

/** The callback form: `onBatch` is awaited for each batch in turn; resolves to what the reader found. */
export async function readReadingsCsv(
  file: string,
  options: ReadCsvOptions,
  onBatch: (batch: ReadingsBatch, info: CsvFileInfo) => void | Promise<void>,
): Promise<{ info: CsvFileInfo; counts: ReadCounts }> {
  const csv = await openReadingsCsv(file, options);
  for await (const batch of csv) await onBatch(batch, csv.info);
  return { info: csv.info, counts: { ...csv.counts } };
}

class CsvReadingsReader implements ReadingsCsv, CsvRowSink {
  readonly counts: ReadCounts = emptyCounts();
  private readonly options: CheckedCsvOptions;
  private readonly batchRows: number;
  private readonly chunkBytes: number;
  private readonly signal: AbortSignal | undefined;
  private readonly onProgress: ((bytesRead: number, totalBytes: number) => void) | undefined;
  private stream: ReadStream | null = null;
  private chunks: AsyncIterator<Buffer> | null = null;
  private totalBytes = 0;
  private bytesRead = 0;
  private encoding: TextEncoding = 'utf-8';
  private bomBytes = 0;
  private decoder: StrictTextDecoder | null = null;
  private dialect: Dialect | null = null;
  private sampleText = '';
  private sampleComplete = false;
  private splitter: CsvRowSplitter | null = null;
  private validator: RowValidator | null = null;
  private fileInfo: CsvFileInfo | null = null;
  private batch: RowBatchTarget = { readings: [], rejections: [] };
  private readonly ready: ReadingsBatch[] = [];
  private finished = false;
  private iterating = false;

  constructor(private readonly file: string, options: ReadCsvOptions) {
    this.options = checkReadingsCsvOptions(options);
    this.batchRows = positiveInteger(options.batchRows, DEFAULT_BATCH_ROWS, 'batchRows');
    this.chunkBytes = positiveInteger(options.chunkBytes, DEFAULT_CHUNK_BYTES, 'chunkBytes');
    this.signal = options.signal;
    this.onProgress = options.onProgress;
  }

  get info(): CsvFileInfo {
    if (this.fileInfo === null) throw new Error('read-csv: info is known once openReadingsCsv has resolved');
    return this.fileInfo;
  }

  async open(): Promise<void> {
    this.signal?.throwIfAborted();
    // Checked before any byte is read, so a mistyped zone is the first error, not the last.
    new ZoneResolver(this.options.timeZone ?? 'UTC', 'timeZone');
    try {
      const s = await stat(this.file);
      if (!s.isFile()) throw new InputError('is not a file', { file: this.file });
      this.totalBytes = s.size;
    } catch (err) {
      if (err instanceof InputError) throw err;
      const code = (err as NodeJS.ErrnoException).code;
      throw new InputError(code === 'ENOENT' ? 'no such file' : `cannot read the file (${code ?? String(err)})`, { file: this.file });
    }
    this.stream = createReadStream(this.file, { highWaterMark: this.chunkBytes });
    this.chunks = this.stream[Symbol.asyncIterator]() as AsyncIterator<Buffer>;

    // The sample: enough bytes to see the byte-order mark, the delimiter and the first rows.
    const parts: Buffer[] = [];
    let sampleBytes = 0;
    let eof = false;
    while (sampleBytes < SAMPLE_BYTES) {
      this.signal?.throwIfAborted();
      const next = await this.nextChunk();
      if (next.done === true) {
        eof = true;
        break;
      }
      parts.push(next.value);
      sampleBytes += next.value.length;
    }
    const sample = parts.length === 1 ? parts[0] : Buffer.concat(parts);
    const sniffed = sniffEncoding(sample);
    this.encoding = sniffed.encoding;
    this.bomBytes = sniffed.bomBytes;
    this.decoder = new StrictTextDecoder(
      this.file,
      this.encoding,
      this.bomBytes,
      () => (this.splitter === null ? null : this.splitter.lineBreaksSeen()),
      () => (this.dialect?.linebreak === '\r' ? 0x0d : 0x0a),
    );
    // UTF-16 without a byte-order mark is mostly valid UTF-8 (ASCII and NUL bytes): catch its NULs first.
    const nulByte = this.encoding === 'utf-8' ? sample.indexOf(0) : -1;
    if (nulByte !== -1) throw nulCharacterError(this.file, 1 + countLineBreaks(sample, 'utf-8', 0, nulByte));

    let text = this.decode(sample, false);
    if (eof) text += this.decode(new Uint8Array(0), true);
    const nul = text.indexOf('\0');
    if (nul !== -1) throw nulCharacterError(this.file, 1 + countChar(text, '\n', nul));
    this.sampleText = text;
    this.sampleComplete = eof;
    this.dialect = detectDialect(text, eof, this.options);
    this.splitter = new CsvRowSplitter(this.dialect.delimiter, this.dialect.linebreak, this, this.file);
    this.splitter.push(text);
    this.bytesRead = sample.length;
    if (eof) this.finish();
    this.onProgress?.(this.bytesRead, this.totalBytes);

    while (this.validator === null && !this.finished) await this.readNext();
    if (this.validator === null) throw new InputError('the file is empty: no header row', { file: this.file });
    this.sampleText = '';
  }

  async close(): Promise<void> {
    this.finished = true;
    const chunks = this.chunks;
    this.chunks = null;
    if (chunks?.return !== undefined) await chunks.return();
    this.stream?.destroy();
    this.stream = null;
  }

  async *[Symbol.asyncIterator](): AsyncGenerator<ReadingsBatch> {
    if (this.iterating) throw new Error('read-csv: a reader can be iterated once');
    this.iterating = true;
    try {
      for (;;) {
        while (this.ready.length > 0) {
          this.signal?.throwIfAborted();
          yield this.ready.shift() as ReadingsBatch;
        }
        if (this.finished) return;
        this.signal?.throwIfAborted();
        await this.readNext();
      }
    } finally {
      await this.close();
    }
  }

  // ---- CsvRowSink: rows from the splitter ----

  row(cells: string[], line: number, raw: string): void {
    const validator = this.validator;
    if (validator === null) {
      this.setHeader(cells, line);
      return;
    }
    validator.validate(cells, line, raw, this.batch);
    if (this.batch.readings.length + this.batch.rejections.length >= this.batchRows) this.endBatch();
  }

  malformed(line: number, raw: string, reason: string): void {
    if (this.validator === null) throw new InputError(`the header row is not valid CSV: ${reason}`, { file: this.file, line });
    this.validator.rejectRow(line, raw, reason, this.batch);
    if (this.batch.readings.length + this.batch.rejections.length >= this.batchRows) this.endBatch();
  }

  blank(_line: number): void {
    this.counts.blankRows++;
  }

  // ---- internals ----

  private endBatch(): void {
    this.ready.push({ ...this.batch, bytesRead: this.bytesRead, totalBytes: this.totalBytes });
    this.batch = { readings: [], rejections: [] };
  }

  /** The next chunk of the file; a read failure (permissions, a device error) is an InputError naming the file. */
  private async nextChunk(): Promise<IteratorResult<Buffer>> {
    try {
      return await (this.chunks as AsyncIterator<Buffer>).next();
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      throw new InputError(`cannot read the file (${code ?? String(err)})`, { file: this.file });
    }
  }

  private async readNext(): Promise<void> {
    if (this.chunks === null) {
      this.finished = true;
      return;
    }
    const next = await this.nextChunk();
    if (next.done === true) {
      this.finish();
    } else {
      const text = this.decode(next.value, false);
      this.bytesRead += next.value.length;
      (this.splitter as CsvRowSplitter).push(text);
    }
    this.onProgress?.(this.bytesRead, this.totalBytes);
  }

  private finish(): void {
    const tail = this.decode(new Uint8Array(0), true);
    const splitter = this.splitter as CsvRowSplitter;
    if (tail.length > 0) splitter.push(tail);
    splitter.end();
    if (this.batch.readings.length + this.batch.rejections.length > 0) this.endBatch();
    this.finished = true;
  }

  private decode(bytes: Uint8Array, final: boolean): string {
    return (this.decoder as StrictTextDecoder).decode(bytes, final);
  }

  private setHeader(cells: string[], line: number): void {
    const headers = cells.map((c) => c.trim());
    const options = this.options;
    const dialect = this.dialect as Dialect;
    const columns = resolveColumns(headers, this.file, line, options);
    const zoneSource: CsvFileInfo['timeZoneSource'] = columns.timeIsUtc ? 'header' : options.timeZone !== undefined ? 'option' : 'default';
    const zone = new ZoneResolver(columns.timeIsUtc ? 'UTC' : options.timeZone ?? 'UTC', 'timeZone');
    const timeHeader = columns.header.time as string;

    let evidence: DateOrderEvidence | undefined;
    if (options.dateOrder === undefined) {
      const rows = splitSampleRows(this.sampleText, dialect.delimiter, dialect.linebreak, this.sampleComplete, Number.POSITIVE_INFINITY);
      const at = columns.index.time;
      evidence = collectDateOrderEvidence(rows.filter((r) => r.line > line && at < r.cells.length).map((r) => ({ line: r.line, text: r.cells[at] })));
    }
    const timestamps = new TimestampReader({
      zone,
      dateOrder: options.dateOrder ?? null,
      serialDates: options.serialDates ?? 'auto',
      decimalComma: dialect.decimal === ',',
      file: this.file,
      field: timeHeader,
      evidence,
    });
    this.validator = new RowValidator({
      columns,
      headerCount: headers.length,
      decimal: dialect.decimal,
      well: options.well ?? null,
      timestamps,
      counts: this.counts,
    });
    this.fileInfo = {
      file: this.file,
      sizeBytes: this.totalBytes,
      encoding: this.encoding,
      byteOrderMark: this.bomBytes > 0,
      delimiter: dialect.delimiter,
      decimal: dialect.decimal,
      delimiterDetected: dialect.delimiterDetected,
      decimalDetected: dialect.decimalDetected,
      linebreak: dialect.linebreak,
      headerLine: line,
      headers,
      columns: columns.header,
      unmappedHeaders: columns.unmappedHeaders,
      units: columns.units,
      well: options.well ?? null,
      timeZone: zone.zone,
      timeZoneSource: zoneSource,
      dateOrder: options.dateOrder ?? null,
      serialDates: options.serialDates ?? 'auto',
      assumptions: assumptions(columns, zone.zone, zoneSource, timeHeader),
    };
  }
}

function positiveInteger(value: number | undefined, fallback: number, field: string): number {
  if (value === undefined) return fallback;
  if (!Number.isInteger(value) || value < 1) throw new InputError(`must be a whole number ≥ 1 (got ${value})`, { field });
  return value;
}

function countChar(text: string, char: string, to: number): number {
  let count = 0;
  for (let i = text.indexOf(char); i !== -1 && i < to; i = text.indexOf(char, i + 1)) count++;
  return count;
}

/** The assumptions the import applies, in plain words, for the import record. */
function assumptions(columns: ResolvedColumns, zone: string, zoneSource: CsvFileInfo['timeZoneSource'], timeHeader: string): string[] {
  const out: string[] = [];
  const why = zoneSource === 'header' ? `as the header "${timeHeader}" says` : zoneSource === 'option' ? 'as given' : 'by default; give the field\'s zone if they are local';
  out.push(
    `timestamps without Z or an offset are local time in ${zone} (${why}); a time repeated when clocks go back is read as its first occurrence, `
      + 'a time skipped when they go forward with the offset before the change (RFC 5545 §3.3.5)',
  );
  if (columns.timeAnnotation !== null && !columns.timeIsUtc) {
    out.push(`the time header "${timeHeader}" says "${columns.timeAnnotation}", which is not read as a time zone: naive times are read in ${zone}`);
  }
  for (const role of UNIT_ROLES) {
    if (columns.index[role] < 0) continue;
    if (columns.units[role].source === 'default') {
      out.push(`${ROLE_LABEL[role]} in ${columns.units[role].unit}: neither the header "${columns.header[role]}" nor an option names a unit`);
    }
  }
  if (columns.index.flow >= 0 && columns.unitDefs.flow.quantity === 'volumeFlow') {
    out.push(
      `volume flows (${columns.unitDefs.flow.symbol}) become mass flows with the density of liquid water (IAPWS-IF97 region 1) at the logged production temperature and `
        + (columns.index.pressure >= 0 ? 'wellhead pressure, or where a row logs none, ' : '')
        + 'at the saturation pressure + 1 MPa (no pressure logged); each reading keeps the density used',
    );
  }
  if (columns.index.status >= 0) out.push(`an empty cell in "${columns.header.status}" means producing`);
  out.push(...columns.notes);
  return out;
}
