// Helpers for the service tests: a fresh field log with a pinned clock, one field and a production well.
import type { FieldDb } from '../src/main/db/database.js';
import { createServices, type Services } from '../src/main/services/index.js';
import { InputError } from '../src/shared/errors.js';
import { freshDb } from './db-helpers.js';

export const WEEK_MS = 7 * 86_400_000; // 7 d × 86 400 s × 1000 ms
/** 2024-01-01T00:00:00Z = 19 723 days × 86 400 000 ms after the epoch. */
export const START_MS = 1_704_067_200_000;

export interface Fixture {
  fdb: FieldDb;
  s: Services;
}

/** A field "Test field" (UTC) with the production well W-1 (Tref 70 °C, production start START_MS). */
export function fixture(options: { productionStart?: boolean } = {}): Fixture {
  const fdb = freshDb();
  const s = createServices(fdb, { who: 'tester' });
  s.createField({ name: 'Test field', timeZone: 'UTC' });
  s.createWell({
    field: 'Test field', name: 'W-1', kind: 'production', referenceTemperatureC: 70,
    ...(options.productionStart === false ? {} : { productionStart: new Date(START_MS).toISOString() }),
  });
  return { fdb, s };
}

export function iso(ms: number): string {
  return new Date(ms).toISOString();
}

/** The InputError `run` throws; fails the test when it throws nothing or something else. */
export function inputError(run: () => unknown): InputError {
  try {
    run();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError, but nothing was thrown');
}
