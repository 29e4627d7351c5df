// Helpers for the CSV import tests: write a temporary export and read all of it back.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openReadingsCsv, type ReadCsvOptions } from '../src/main/import/read-csv.js';
import { InputError } from '../src/shared/errors.js';
import type { CsvFileInfo, ReadCounts, Reading, Rejection } from '../src/shared/import/types.js';

let dir: string | null = null;
let serial = 0;

/** Writes `content` to a fresh file under the OS temp dir and returns its path. */
export function writeCsv(content: string | Uint8Array, name = 'export.csv'): string {
  dir ??= mkdtempSync(join(tmpdir(), 'tauwell-import-'));
  const path = join(dir, `${serial++}-${name}`);
  writeFileSync(path, content);
  return path;
}

export interface ReadAll {
  info: CsvFileInfo;
  readings: Reading[];
  rejections: Rejection[];
  counts: ReadCounts;
  batches: number;
}

/** Opens `path` and collects every batch. */
export async function readAll(path: string, options: ReadCsvOptions = {}): Promise<ReadAll> {
  const csv = await openReadingsCsv(path, options);
  const readings: Reading[] = [];
  const rejections: Rejection[] = [];
  let batches = 0;
  for await (const batch of csv) {
    batches++;
    readings.push(...batch.readings);
    rejections.push(...batch.rejections);
  }
  return { info: csv.info, readings, rejections, counts: { ...csv.counts }, batches };
}

/** Writes `content` and reads it. */
export async function readCsvText(content: string | Uint8Array, options: ReadCsvOptions = {}): Promise<ReadAll> {
  return readAll(writeCsv(content), options);
}

/** The InputError a read throws (fails the test when it does not throw one). */
export async function inputErrorOf(content: string | Uint8Array, options: ReadCsvOptions = {}): Promise<InputError> {
  try {
    await readCsvText(content, options);
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err;
  }
  throw new Error('expected an InputError, the read succeeded');
}

/** UTC epoch ms of an ISO instant with Z, for expected values. */
export function utc(iso: string): number {
  return Date.parse(iso);
}
