/**
 * Which column of an export plays which role, and in which unit, from its header row.
 *
 * A header names a role by one of the synonyms below (case, blanks and the punctuation _ - . /
 * ignored) and may carry its unit as an annotation: in brackets, `Temp (°F)`, `flow [gpm]`, or as
 * a last word after '_' or a blank, `temp_degC`, `pressure_psi`. Units are those of units.ts. The
 * `columns` and `units` options override everything found here; a column no role claims is kept
 * in each row's raw text and is never an error. A role claimed by two headers, an unknown unit in
 * an annotation, a unit of the wrong quantity and a missing required column are InputErrors that
 * list what the header holds, since any of them would otherwise misread every row.
 */
import { InputError } from '../errors.js';
import { findUnit, type Quantity, type UnitDef } from '../units.js';
import { COLUMN_ROLES, ROLE_LABEL, UNIT_ROLES, type ChosenUnit, type ColumnRole, type ReadingsCsvOptions, type UnitRole } from './types.js';

/** Header synonyms of each role, in normalised form (see normaliseHeader). */
export const ROLE_SYNONYMS: Readonly<Record<ColumnRole, readonly string[]>> = {
  time: ['time', 'date', 'datetime', 'date time', 'date and time', 'timestamp', 'time stamp', 'reading time', 'sample time', 'logged at'],
  well: ['well', 'well name', 'wellname', 'well id', 'wellid', 'well no', 'well number', 'well tag', 'well code', 'borehole'],
  'production-temperature': [
    'production temperature', 'production temp', 'prod temperature', 'prod temp', 'wellhead temperature', 'wellhead temp',
    'well head temperature', 'well head temp', 'wht', 't prod', 'tprod', 't production', 'outlet temperature', 'outlet temp',
    'temp prod', 'temperature prod', 'temp production', 'temperature production', 'temperature', 'temp',
  ],
  flow: [
    'flow', 'flow rate', 'flowrate', 'mass flow', 'mass flow rate', 'massflow', 'volume flow', 'volume flow rate', 'volumetric flow',
    'production rate', 'prod rate', 'production flow', 'prod flow', 'rate',
  ],
  'injection-temperature': [
    'injection temperature', 'injection temp', 'inj temperature', 'inj temp', 'reinjection temperature', 'reinjection temp',
    'reinjection', 're injection temperature', 're injection temp', 'reinj temp', 'return temperature', 'return temp', 't inj', 'tinj',
    't reinj', 't return', 'inlet temperature', 'inlet temp', 'temp inj', 'temperature inj', 'temp injection',
    'temperature injection', 'temp reinj',
  ],
  pressure: ['whp', 'wellhead pressure', 'well head pressure', 'pressure', 'p wh', 'pwh', 'wellhead p'],
  status: ['status', 'state', 'mode', 'well status', 'well state', 'operating status', 'operating mode'],
  note: ['note', 'notes', 'comment', 'comments', 'remark', 'remarks', 'memo'],
};

const ROLE_OF = new Map<string, ColumnRole>();
for (const role of COLUMN_ROLES) {
  for (const synonym of ROLE_SYNONYMS[role]) {
    // A programming error in the table above, not bad input.
    if (ROLE_OF.has(synonym)) throw new Error(`columns: synonym "${synonym}" is listed for two roles`);
    ROLE_OF.set(synonym, role);
  }
}

/** Quantity of each unit-bearing role, for findUnit. */
const ROLE_QUANTITY: Readonly<Record<UnitRole, Quantity | readonly Quantity[]>> = {
  'production-temperature': 'temperature',
  'injection-temperature': 'temperature',
  flow: ['massFlow', 'volumeFlow'],
  pressure: 'pressure',
};

/** Units when neither the header nor an option says (the trade's working units for a wellhead log). */
export const DEFAULT_UNITS: Readonly<Record<UnitRole, string>> = {
  'production-temperature': 'degC',
  'injection-temperature': 'degC',
  flow: 'kg/s',
  pressure: 'MPa',
};

/** Time annotations that say the column's naive timestamps are UTC whatever the field's zone. */
const UTC_ANNOTATIONS = new Set(['utc', 'gmt', 'z']);

function isUnitRole(role: ColumnRole): role is UnitRole {
  return (UNIT_ROLES as readonly string[]).includes(role);
}

/** Lower case; every run of blanks and _ - . / becomes one space; trimmed. */
export function normaliseHeader(text: string): string {
  return text.toLowerCase().replace(/[\s_\-./]+/g, ' ').trim();
}

/** The role a (normalised or raw) header name is a synonym of, or null. */
export function roleOfName(name: string): ColumnRole | null {
  return ROLE_OF.get(normaliseHeader(name)) ?? null;
}

export interface HeaderReading {
  role: ColumnRole | null;
  /** Unit annotation as written ("°F", "gpm"), or null. */
  annotation: string | null;
}

/** Bracketed annotation at the end of a header: `Temp (°F)` → ["Temp", "°F"]. */
function bracketAnnotation(text: string): [string, string] | null {
  const t = text.trim();
  const close = t.charAt(t.length - 1);
  const open = close === ')' ? '(' : close === ']' ? '[' : null;
  if (open === null) return null;
  const at = t.lastIndexOf(open);
  if (at <= 0) return null;
  return [t.slice(0, at).trim(), t.slice(at + 1, -1).trim()];
}

function isUnitOf(text: string, quantity: Quantity | readonly Quantity[]): boolean {
  try {
    findUnit(text, quantity);
    return true;
  } catch {
    return false;
  }
}

/**
 * The role and unit annotation a header announces. A bracket annotation is taken as written
 * (checked later); a trailing word counts as a unit only when it is one of the role's quantity,
 * so that `T_prod` stays a name.
 */
export function readHeader(text: string): HeaderReading {
  const bracket = bracketAnnotation(text);
  if (bracket !== null) {
    const role = roleOfName(bracket[0]);
    if (role !== null) return { role, annotation: bracket[1] === '' ? null : bracket[1] };
  }
  const whole = roleOfName(text);
  if (whole !== null) return { role: whole, annotation: null };
  // Trailing words, last first: `temp_degC`; a unit spelled with '_' for '/' counts too (`flow_kg_s`).
  const t = text.trim();
  for (let cut = t.length - 1; cut > 0; cut--) {
    if (t[cut] !== '_' && t[cut] !== ' ') continue;
    const role = roleOfName(t.slice(0, cut));
    if (role === null || !isUnitRole(role)) continue;
    const suffix = t.slice(cut + 1);
    for (const unit of [suffix, suffix.replace(/_/g, '/')]) {
      if (isUnitOf(unit, ROLE_QUANTITY[role])) return { role, annotation: unit };
    }
  }
  return { role: null, annotation: null };
}

export interface ResolvedColumns {
  /** Column index of each role, −1 when absent. */
  index: Record<ColumnRole, number>;
  /** Header of each role's column, or null. */
  header: Record<ColumnRole, string | null>;
  unmappedHeaders: string[];
  units: Record<UnitRole, ChosenUnit>;
  unitDefs: Record<UnitRole, UnitDef>;
  /** The time header says its naive timestamps are UTC, e.g. "Time (UTC)". */
  timeIsUtc: boolean;
  /** Bracketed annotation of the time header ("UTC", "local", "CET"), or null. */
  timeAnnotation: string | null;
  /** Plain-words notes, e.g. an option overriding a header annotation. */
  notes: string[];
}

function listHeaders(headers: readonly string[]): string {
  return headers.map((h) => JSON.stringify(h)).join(', ');
}

/** Exact match first, then a unique case-insensitive one. */
function findHeader(headers: readonly string[], wanted: string, file: string, line: number, field: string): number {
  const w = wanted.trim();
  const exact = headers.flatMap((h, i) => (h.trim() === w ? [i] : []));
  const folded = headers.flatMap((h, i) => (h.trim().toLowerCase() === w.toLowerCase() ? [i] : []));
  const hits = exact.length > 0 ? exact : folded;
  if (hits.length === 1) return hits[0];
  if (hits.length > 1) throw new InputError(`the header has ${hits.length} columns named "${w}"; rename one (headers found: ${listHeaders(headers)})`, { file, line, field });
  throw new InputError(`no column "${w}"; headers found: ${listHeaders(headers)}`, { file, line, field });
}

/**
 * Roles and units of the header row `headers` (at physical `line` of `file`), with the options'
 * overrides. Throws an InputError for a required role without a column (time, production
 * temperature, and well unless the `well` option names the one well), two columns claiming a role,
 * an unknown override header, or a unit that is unknown or of the wrong quantity.
 */
export function resolveColumns(headers: readonly string[], file: string, line: number, options: ReadingsCsvOptions): ResolvedColumns {
  const index = Object.fromEntries(COLUMN_ROLES.map((r) => [r, -1])) as Record<ColumnRole, number>;
  const annotation = Object.fromEntries(COLUMN_ROLES.map((r) => [r, null])) as Record<ColumnRole, string | null>;
  const overridden = new Set<ColumnRole>();
  const claimed = new Set<number>();

  for (const role of COLUMN_ROLES) {
    const wanted = options.columns?.[role];
    if (wanted === undefined) continue;
    overridden.add(role);
    if (wanted === null) continue;
    const at = findHeader(headers, wanted, file, line, `columns.${role}`);
    if (claimed.has(at)) throw new InputError(`column "${headers[at]}" is given for two roles`, { file, line, field: `columns.${role}` });
    claimed.add(at);
    index[role] = at;
    annotation[role] = readHeader(headers[at]).annotation ?? bracketAnnotation(headers[at])?.[1] ?? null;
  }

  headers.forEach((h, at) => {
    if (claimed.has(at)) return;
    const { role, annotation: unitText } = readHeader(h);
    if (role === null || overridden.has(role)) return;
    if (index[role] >= 0) {
      throw new InputError(
        `columns "${headers[index[role]]}" and "${h}" both read as ${ROLE_LABEL[role]}; name the one to use with --column ${role}=<header>`,
        { file, line, field: h },
      );
    }
    index[role] = at;
    annotation[role] = unitText;
  });

  const missing = COLUMN_ROLES.filter((r) => index[r] < 0 && (r === 'time' || r === 'production-temperature' || (r === 'well' && options.well === undefined)));
  if (missing.length > 0) {
    const names = missing.map((r) => ROLE_LABEL[r]).join(', ');
    const how = missing.map((r) => `--column ${r}=<header>`).join(' ');
    const wellHint = missing.includes('well') ? ' (or --well <name> for a file of one well)' : '';
    throw new InputError(`no column for ${names}; headers found: ${listHeaders(headers)}; name them with ${how}${wellHint}`, { file, line });
  }

  const notes: string[] = [];
  const units = {} as Record<UnitRole, ChosenUnit>;
  const unitDefs = {} as Record<UnitRole, UnitDef>;
  for (const role of UNIT_ROLES) {
    const fromOption = options.units?.[role];
    const fromHeader = index[role] >= 0 ? annotation[role] : null;
    let def: UnitDef;
    let source: ChosenUnit['source'];
    if (fromOption !== undefined) {
      def = findUnit(fromOption, ROLE_QUANTITY[role], `units.${role}`);
      source = 'option';
      if (fromHeader !== null && isUnitOf(fromHeader, ROLE_QUANTITY[role]) && findUnit(fromHeader, ROLE_QUANTITY[role]) !== def) {
        notes.push(`column "${headers[index[role]]}" says ${fromHeader} but the units option says ${def.symbol}; ${def.symbol} is used`);
      }
    } else if (fromHeader !== null) {
      def = headerUnit(fromHeader, role, headers[index[role]], file, line);
      source = 'header';
    } else {
      def = findUnit(DEFAULT_UNITS[role], ROLE_QUANTITY[role]);
      source = 'default';
    }
    units[role] = { unit: def.symbol, source };
    unitDefs[role] = def;
  }

  const header = Object.fromEntries(COLUMN_ROLES.map((r) => [r, index[r] >= 0 ? headers[index[r]] : null])) as Record<ColumnRole, string | null>;
  const used = new Set(COLUMN_ROLES.map((r) => index[r]));
  const timeAnnotation = index.time >= 0 ? bracketAnnotation(headers[index.time])?.[1] ?? null : null;
  return {
    index,
    header,
    unmappedHeaders: headers.filter((_, at) => !used.has(at)),
    units,
    unitDefs,
    timeIsUtc: timeAnnotation !== null && UTC_ANNOTATIONS.has(timeAnnotation.toLowerCase()),
    timeAnnotation,
    notes,
  };
}

/** The unit a header annotation names, or an InputError that says how to override it. */
function headerUnit(text: string, role: UnitRole, header: string, file: string, line: number): UnitDef {
  try {
    return findUnit(text, ROLE_QUANTITY[role]);
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    throw new InputError(`${err.reason}; or give the unit with --unit ${role}=<unit>`, { file, line, field: header });
  }
}
