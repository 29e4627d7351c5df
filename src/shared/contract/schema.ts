/**
 * A tiny validator for untrusted payloads (from IPC or HTTP, or built by the command line): each
 * schema checks a value and returns it typed, or throws one InputError whose field is the dotted
 * path of the value at fault (`flowUnit`, `limit.temperatureC`, `flags[2]`). Unknown keys are
 * errors too, so a misspelt option is never silently ignored.
 *
 * Exported API:
 *   interface Schema<T> { check(value, path): T; expected }      type Infer<S>
 *   string({ allowEmpty?, maxLength?, pattern?, patternText? })   trimmed; empty refused unless allowEmpty
 *   number({ unit?, min?, max?, exclusiveMin?, integer? })        finite; unit named in every message
 *   boolean(), oneOf(values), optional(s), nullable(s), array(item, { maxLength? }), object(shape)
 *   instant()                    ISO 8601 UTC instant with 'Z', e.g. 2025-03-01T12:00:00Z
 *   unitName(quantity)           a unit units.ts knows for the quantity; returned as its canonical symbol
 *   validate(schema, payload)    check at the root; the entry point for services
 *   instantMs(iso), isoOf(ms)    between the contract's instants and epoch milliseconds
 */
import { InputError } from '../errors.js';
import { findUnit, type Quantity } from '../units.js';

export interface Schema<T> {
  /** Checks `value` found at `path` (dotted; '' at the root) and returns it typed. */
  check(value: unknown, path: string): T;
  /** What a valid value is, in words, for messages. */
  readonly expected: string;
}

export type Infer<S> = S extends Schema<infer T> ? T : never;

function fail(path: string, reason: string): never {
  throw new InputError(reason, path === '' ? {} : { field: path });
}

function shown(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  const text = JSON.stringify(value);
  if (text === undefined) return typeof value;
  return text.length > 60 ? `${text.slice(0, 57)}…` : text;
}

function missingOr(value: unknown, path: string, expected: string): never {
  if (value === undefined) return fail(path, `missing: ${expected}`);
  return fail(path, `must be ${expected} (got ${shown(value)})`);
}

export interface StringOptions {
  allowEmpty?: boolean;
  maxLength?: number;
  pattern?: RegExp;
  /** Words for the pattern in messages, e.g. 'lower-case letters, digits and dashes'. */
  patternText?: string;
}

/** Text; surrounding blanks are trimmed, an empty text is refused unless `allowEmpty`. */
export function string(options: StringOptions = {}): Schema<string> {
  const expected = options.allowEmpty === true ? 'a text' : 'a non-empty text';
  return {
    expected,
    check(value, path) {
      if (typeof value !== 'string') return missingOr(value, path, expected);
      const text = value.trim();
      if (text === '' && options.allowEmpty !== true) return fail(path, `must be ${expected} (got ${shown(value)})`);
      if (options.maxLength !== undefined && text.length > options.maxLength) {
        return fail(path, `must be at most ${options.maxLength} characters (got ${text.length})`);
      }
      if (options.pattern !== undefined && !options.pattern.test(text)) {
        return fail(path, `must be ${options.patternText ?? `text matching ${options.pattern}`} (got ${shown(value)})`);
      }
      return text;
    },
  };
}

export interface NumberOptions {
  /** Unit of the number, named in messages (`must be ≥ 0 kg/s`). */
  unit?: string;
  min?: number;
  max?: number;
  /** Refuse values equal to `min` as well. */
  exclusiveMin?: boolean;
  integer?: boolean;
}

/** A finite number (JSON has no NaN or Infinity; a string of digits is not a number). */
export function number(options: NumberOptions = {}): Schema<number> {
  const u = options.unit === undefined || options.unit === '1' ? '' : ` ${options.unit}`;
  const kind = options.integer === true ? 'a whole number' : 'a finite number';
  const expected = `${kind}${u === '' ? '' : ` in${u}`}`;
  return {
    expected,
    check(value, path) {
      if (typeof value !== 'number' || !Number.isFinite(value)) return missingOr(value, path, expected);
      if (options.integer === true && !Number.isSafeInteger(value)) return fail(path, `must be ${expected} (got ${value})`);
      if (options.min !== undefined) {
        if (options.exclusiveMin === true ? !(value > options.min) : !(value >= options.min)) {
          return fail(path, `must be ${options.exclusiveMin === true ? '>' : '≥'} ${options.min}${u} (got ${value}${u})`);
        }
      }
      if (options.max !== undefined && !(value <= options.max)) return fail(path, `must be ≤ ${options.max}${u} (got ${value}${u})`);
      return value;
    },
  };
}

export function boolean(): Schema<boolean> {
  return {
    expected: 'true or false',
    check(value, path) {
      if (typeof value !== 'boolean') return missingOr(value, path, 'true or false');
      return value;
    },
  };
}

export function oneOf<T extends string>(values: readonly T[]): Schema<T> {
  const expected = `one of ${values.map((v) => JSON.stringify(v)).join(', ')}`;
  return {
    expected,
    check(value, path) {
      if (typeof value !== 'string' || !(values as readonly string[]).includes(value)) return missingOr(value, path, expected);
      return value as T;
    },
  };
}

/** The key may be absent (or undefined). */
export function optional<T>(schema: Schema<T>): Schema<T | undefined> {
  return {
    expected: `${schema.expected}, or absent`,
    check: (value, path) => (value === undefined ? undefined : schema.check(value, path)),
  };
}

/** The value may be null: in an edit, null clears a stored value. */
export function nullable<T>(schema: Schema<T>): Schema<T | null> {
  return {
    expected: `${schema.expected}, or null`,
    check: (value, path) => (value === null ? null : schema.check(value, path)),
  };
}

export function array<T>(item: Schema<T>, options: { maxLength?: number } = {}): Schema<T[]> {
  const expected = `a list of ${item.expected}`;
  return {
    expected,
    check(value, path) {
      if (!Array.isArray(value)) return missingOr(value, path, expected);
      if (options.maxLength !== undefined && value.length > options.maxLength) {
        return fail(path, `must have at most ${options.maxLength} entries (got ${value.length})`);
      }
      return value.map((v, i) => item.check(v, `${path}[${i}]`));
    },
  };
}

type Shape = Record<string, Schema<unknown>>;
type OptionalKeys<S extends Shape> = { [K in keyof S]: undefined extends Infer<S[K]> ? K : never }[keyof S];
type Simplify<T> = { [K in keyof T]: T[K] };
export type ObjectOf<S extends Shape> = Simplify<
  { [K in Exclude<keyof S, OptionalKeys<S>>]: Infer<S[K]> } & { [K in OptionalKeys<S>]?: Exclude<Infer<S[K]>, undefined> }
>;

/** A plain object with exactly these keys (optional ones may be left out); unknown keys are refused. */
export function object<S extends Shape>(shape: S): Schema<ObjectOf<S>> {
  const keys = Object.keys(shape);
  return {
    expected: 'an object',
    check(value, path) {
      if (typeof value !== 'object' || value === null || Array.isArray(value)) {
        const got = value === null ? 'null' : Array.isArray(value) ? 'a list' : value === undefined ? 'nothing' : typeof value;
        return fail(path, `must be an object (got ${got})`);
      }
      const at = (key: string): string => (path === '' ? key : `${path}.${key}`);
      for (const key of Object.keys(value)) {
        if (!keys.includes(key)) fail(at(key), `unknown key; expected one of ${keys.join(', ')}`);
      }
      const out: Record<string, unknown> = {};
      for (const key of keys) {
        const checked = shape[key].check((value as Record<string, unknown>)[key], at(key));
        if (checked !== undefined) out[key] = checked;
      }
      return out as ObjectOf<S>;
    },
  };
}

/** ISO 8601 extended format in UTC: date, time to the minute, second or millisecond, and 'Z'. */
const UTC_INSTANT = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?Z$/;

/** The epoch milliseconds of a contract instant, or NaN when the text is not one (calendar checked). */
export function instantMs(iso: string): number {
  const m = UTC_INSTANT.exec(iso);
  if (m === null) return NaN;
  const [year, month, day, hour, minute] = [1, 2, 3, 4, 5].map((i) => Number(m[i]));
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const ms = m[7] === undefined ? 0 : Number(m[7].padEnd(3, '0'));
  const d = new Date(0);
  d.setUTCFullYear(year, month - 1, day);
  d.setUTCHours(hour, minute, second, ms);
  // Date rolls 2025-02-30 over to March; a round trip of the parts catches that (and hour 24, minute 60).
  if (d.getUTCFullYear() !== year || d.getUTCMonth() !== month - 1 || d.getUTCDate() !== day || d.getUTCHours() !== hour || d.getUTCMinutes() !== minute || d.getUTCSeconds() !== second) {
    return NaN;
  }
  return d.getTime();
}

/** The contract's spelling of an instant: ISO 8601 UTC with milliseconds, e.g. 2025-03-01T12:00:00.000Z. */
export function isoOf(ms: number): string {
  return new Date(ms).toISOString();
}

export function instant(): Schema<string> {
  const expected = 'an ISO 8601 UTC instant such as "2025-03-01T12:00:00Z"';
  return {
    expected,
    check(value, path) {
      if (typeof value !== 'string') return missingOr(value, path, expected);
      const text = value.trim();
      if (!Number.isFinite(instantMs(text))) {
        const hint = /[+-]\d{2}(:?\d{2})?$/.test(text) || /T\d{2}:\d{2}(:\d{2}(\.\d+)?)?$/.test(text) ? ' (times cross the contract in UTC, ending in Z)' : '';
        return fail(path, `must be ${expected}${hint} (got ${shown(value)})`);
      }
      return text;
    },
  };
}

/** A unit of `quantity` (or of any of the listed quantities); returns its canonical symbol ('°F' → 'degF'). */
export function unitName(quantity: Quantity | readonly Quantity[]): Schema<string> {
  const list = typeof quantity === 'string' ? [quantity] : quantity;
  const expected = `a ${list.join(' or ')} unit`;
  return {
    expected,
    check(value, path) {
      if (typeof value !== 'string') return missingOr(value, path, expected);
      return findUnit(value, list, path === '' ? undefined : path).symbol;
    },
  };
}

/** Checks a whole payload; the entry point of every service call. */
export function validate<T>(schema: Schema<T>, payload: unknown): T {
  return schema.check(payload, '');
}
