/**
 * A preview of an import: the first data rows of a file as the import's own reader (read-csv.ts)
 * reads them with the same options — each row's cells as split, and the reading it gives or the
 * reason it would be rejected — and what the reader decided about the file. Nothing is written.
 *
 *   previewCsv(file, options, rows): Promise<CsvPreview>
 *
 * A refusal of the whole file (an unstated day/month order, an encoding that is not text, a
 * missing column) comes back as `problem` with its line and field, because it is what the screen
 * must show beside the option that fixes it; only a bug rejects.
 */
import type { PreviewRow } from '../../shared/contract/imports.js';
import { isoOf } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { CsvFileInfo, Reading, Rejection } from '../../shared/import/types.js';
import { CsvRowSplitter } from './csv-rows.js';
import { importedValues } from './pipeline.js';
import { openReadingsCsv, type ReadCsvOptions, type ReadingsCsv } from './read-csv.js';

export interface CsvPreview {
  info: CsvFileInfo | null;
  rows: PreviewRow[];
  /** Well names of the rows read as readings, in order of first appearance. */
  wells: string[];
  problem: { message: string; line: number | null; field: string | null } | null;
}

export async function previewCsv(file: string, options: Omit<ReadCsvOptions, 'batchRows' | 'signal' | 'onProgress'>, rows: number): Promise<CsvPreview> {
  let csv: ReadingsCsv;
  try {
    // One batch of `rows` rows: the reader hands over a batch as soon as it holds that many.
    csv = await openReadingsCsv(file, { ...options, batchRows: rows });
  } catch (err) {
    return { info: null, rows: [], wells: [], problem: problemOf(err) };
  }
  const info = csv.info;
  const readings: Reading[] = [];
  const rejections: Rejection[] = [];
  let problem: CsvPreview['problem'] = null;
  try {
    for await (const batch of csv) {
      readings.push(...batch.readings);
      rejections.push(...batch.rejections);
      if (readings.length + rejections.length >= rows) break;
    }
  } catch (err) {
    problem = problemOf(err);
  } finally {
    await csv.close();
  }

  const out: PreviewRow[] = [
    ...readings.map((r): PreviewRow => ({
      line: r.line, cells: cellsOf(r.raw, info), reading: { well: r.wellName, time: isoOf(r.timeMs), values: importedValues(r) }, rejected: null,
    })),
    ...rejections.map((j): PreviewRow => ({ line: j.line, cells: cellsOf(j.raw, info), reading: null, rejected: j.reason })),
  ].sort((a, b) => a.line - b.line).slice(0, rows);
  const wells = [...new Set(out.flatMap((r) => (r.reading === null ? [] : [r.reading.well])))];
  return { info, rows: out, wells, problem };
}

function problemOf(err: unknown): CsvPreview['problem'] {
  if (!(err instanceof InputError)) throw err;
  return { message: err.reason, line: err.where.line ?? null, field: err.where.field ?? null };
}

/** A row's cells as the import's splitter splits its raw text; a row it cannot split is one cell. */
function cellsOf(raw: string, info: CsvFileInfo): string[] {
  let cells = null as string[] | null;
  const sink = {
    row: (c: string[]) => {
      cells = c;
    },
    malformed: () => undefined,
    blank: () => undefined,
  };
  const splitter = new CsvRowSplitter(info.delimiter, info.linebreak, sink, info.file);
  splitter.push(raw);
  splitter.end();
  return cells ?? [raw];
}
