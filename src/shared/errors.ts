/**
 * Errors the user can act on. Anything thrown as an InputError is printed as one line
 * (file, line, field, reason) and exits with status 2; anything else is a bug.
 */
export interface InputErrorWhere {
  /** File the bad value came from, if any. */
  file?: string;
  /** 1-based line number in that file, if known. */
  line?: number;
  /** Column, option or parameter name at fault. */
  field?: string;
}

export class InputError extends Error {
  readonly where: InputErrorWhere;
  readonly reason: string;

  constructor(reason: string, where: InputErrorWhere = {}) {
    super(formatWhere(where) + reason);
    this.name = 'InputError';
    this.reason = reason;
    this.where = where;
  }
}

function formatWhere(where: InputErrorWhere): string {
  const parts: string[] = [];
  if (where.file !== undefined) parts.push(where.line !== undefined ? `${where.file}:${where.line}` : where.file);
  else if (where.line !== undefined) parts.push(`line ${where.line}`);
  if (where.field !== undefined) parts.push(`field "${where.field}"`);
  return parts.length > 0 ? parts.join(', ') + ': ' : '';
}

/** Throws an InputError naming `field` unless `value` is a finite number. */
export function requireFinite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(`must be a finite number (got ${JSON.stringify(value)})`, { field });
  }
  return value;
}

/** Throws an InputError naming `field` unless `value` is a finite number > 0. */
export function requirePositive(value: unknown, field: string): number {
  const v = requireFinite(value, field);
  if (!(v > 0)) throw new InputError(`must be greater than zero (got ${v})`, { field });
  return v;
}
