// Helpers for the database tests: temporary field-log files and a pinned clock.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDatabase, type FieldDb } from '../src/main/db/database.js';

/** 2025-03-01T12:00:00Z = 1740830400 s since the epoch (20 148 days × 86 400 s + 12 h × 3600 s). */
export const T0_MS = 1_740_830_400_000;

/** A fresh folder under the OS temp dir. */
export function tempDir(): string {
  return mkdtempSync(join(tmpdir(), 'tauwell-db-'));
}

/** A clock that starts at T0_MS and advances one second per call, so every recorded time is distinct. */
export function steppingClock(startMs = T0_MS): () => number {
  let t = startMs - 1000;
  return () => (t += 1000);
}

/** A new field log in a temp folder, with the stepping clock. */
export function freshDb(): FieldDb {
  return openDatabase(join(tempDir(), 'field.sqlite'), { now: steppingClock() });
}
