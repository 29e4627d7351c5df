/**
 * Input checks shared by the repositories: each failure is an InputError naming the field, so a
 * service can pass it straight to the user. Also turns SQLite constraint failures into the same.
 *
 * Exported API:
 *   requireText(value, field): string                  trimmed, non-empty
 *   requireId(value, field): number                     positive safe integer
 *   requireInstantMs(value, field): number              safe integer (Unix epoch ms)
 *   optionalNumber(value, field, min?): number | null   null/undefined → null; else finite (≥ min)
 *   optionalText(value, field): string | null           null/undefined → null; else non-empty
 *   isConstraintError(e, kind): boolean                 kind 'UNIQUE' | 'FOREIGNKEY' | 'CHECK' | 'NOTNULL'
 *   isoTime(ms): string                                 for messages
 */
import Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';

export function requireText(value: unknown, field: string): string {
  if (typeof value !== 'string' || value.trim() === '') {
    throw new InputError(`must be a non-empty text (got ${JSON.stringify(value)})`, { field });
  }
  return value.trim();
}

export function requireId(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value <= 0) {
    throw new InputError(`must be a positive whole number id (got ${JSON.stringify(value)})`, { field });
  }
  return value;
}

export function requireInstantMs(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value)) {
    throw new InputError(`must be a whole number of milliseconds since 1970-01-01T00:00:00Z (got ${JSON.stringify(value)})`, { field });
  }
  return value;
}

export function optionalNumber(value: unknown, field: string, min?: number): number | null {
  if (value === null || value === undefined) return null;
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(`must be a finite number or empty (got ${JSON.stringify(value)})`, { field });
  }
  if (min !== undefined && value < min) throw new InputError(`must be at least ${min} (got ${value})`, { field });
  return value;
}

export function optionalText(value: unknown, field: string): string | null {
  if (value === null || value === undefined) return null;
  return requireText(value, field);
}

export type ConstraintKind = 'UNIQUE' | 'FOREIGNKEY' | 'CHECK' | 'NOTNULL';

export function isConstraintError(e: unknown, kind: ConstraintKind): boolean {
  return e instanceof Database.SqliteError && (e as unknown as { code: string }).code === `SQLITE_CONSTRAINT_${kind}`;
}

export function isoTime(ms: number): string {
  return new Date(ms).toISOString();
}
