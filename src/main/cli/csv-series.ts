/**
 * Reads a decline series from a CSV export: elapsed time or ISO 8601 instants, θ (or a production
 * temperature and a reference), optional group, weight and exclusion columns. Every row is
 * accounted for: it enters a fit, or is excluded by its flag, or is an error reported at its
 * physical line (1-based, header = line 1) and column — data are never dropped silently.
 */
import Papa from 'papaparse';
import { InputError } from '../../shared/errors.js';
import { findUnit } from '../../shared/units.js';
import { parseDecimal } from './args.js';
import { looksLikeIsoDate, parseIsoInstant } from './iso-time.js';

export interface SeriesCsvOptions {
  timeColumn: string;
  valueColumn: string;
  /** Unit of elapsed-time numbers (any time unit of units.ts: s, min, h, d, yr). */
  timeUnit: string;
  /** Tref in °C: when given, the value column is a production temperature in °C and θ = T − Tref. */
  referenceC?: number;
  groupColumn?: string;
  weightColumn?: string;
  excludeColumn?: string;
}

export interface SeriesGroup {
  /** Group name, or null when no group column was given. */
  group: string | null;
  /** Elapsed time in s: as logged, or since the group's earliest instant. NaN on excluded rows without a time. */
  x: Float64Array;
  /** Available temperature θ in K; NaN on excluded rows without a value. */
  theta: Float64Array;
  weights?: Float64Array;
  /** 1 = enters the fit, 0 = excluded by the --exclude column. */
  include: Uint8Array;
  /** Physical line of each row in the file. */
  lines: Uint32Array;
  /** Instant of x = 0 in ms since 1970 (UTC) for instant columns; null for elapsed times. */
  originMs: number | null;
  /** Mean production temperature of the included rows, K; null without a reference. */
  meanProductionTemperatureK: number | null;
}

export interface SeriesCsv {
  file: string;
  header: string[];
  timeKind: 'elapsed' | 'instant';
  /** Instants without Z or offset, read as UTC. */
  naiveInstants: number;
  dataRows: number;
  groups: SeriesGroup[];
}

/** Values of the --exclude column that leave a row out of the fit (case and surrounding blanks ignored). */
export const EXCLUDING_FLAGS: readonly string[] = ['1', 'true', 'yes', 'y', 'x', 'shut-in', 'shut in', 'shutin', 'shut_in', 'test', 'bad', 'exclude', 'excluded'];

const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (SI Brochure)

interface Row {
  cells: string[];
  line: number;
}

/** Splits the text into rows, each with its physical line; quoting errors are reported at their line. */
function readRows(text: string, file: string): Row[] {
  const rows: Row[] = [];
  let problem: InputError | null = null;
  let start = 0, line = 1, counted = 0;
  let newline = 10;
  Papa.parse<string[]>(text, {
    skipEmptyLines: false,
    step: (result, parser) => {
      if (result.meta.linebreak === '\r') newline = 13;
      for (; counted < start; counted++) if (text.charCodeAt(counted) === newline) line++;
      const bad = result.errors.find((e) => e.type !== 'Delimiter');
      if (bad !== undefined && problem === null) {
        problem = new InputError(`malformed CSV: ${bad.message}`, { file, line });
        parser.abort();
        return;
      }
      rows.push({ cells: result.data, line });
      start = result.meta.cursor;
    },
  });
  if (problem !== null) throw problem;
  return rows;
}

function isBlank(row: Row): boolean {
  return row.cells.every((c) => c.trim() === '');
}

export function parseSeriesCsv(text: string, file: string, options: SeriesCsvOptions): SeriesCsv {
  const timeUnit = findUnit(options.timeUnit, 'time', '--time-unit');
  const rows = readRows(text, file).filter((r) => !isBlank(r));
  if (rows.length === 0) throw new InputError('the file is empty; expected a header row naming the columns', { file });
  const headerRow = rows[0];
  const header = headerRow.cells.map((c) => c.trim());
  const column = (name: string | undefined): number => (name === undefined ? -1 : findColumn(header, name, file, headerRow.line));
  const cols = {
    time: column(options.timeColumn),
    value: column(options.valueColumn),
    group: column(options.groupColumn),
    weight: column(options.weightColumn),
    exclude: column(options.excludeColumn),
  };
  if (rows.length === 1) throw new InputError('no data rows after the header', { file, line: headerRow.line + 1 });

  let timeKind: 'elapsed' | 'instant' | null = null;
  let kindLine = 0;
  let naiveInstants = 0;
  const builders = new Map<string | null, Builder>();

  for (const row of rows.slice(1)) {
    const at = (col: number): Where => ({ file, line: row.line, field: header[col] });
    const cell = (col: number): string => {
      if (col >= row.cells.length) {
        throw new InputError(`missing: the row has ${row.cells.length} fields, the header ${header.length}`, at(col));
      }
      return row.cells[col].trim();
    };
    const excluded = cols.exclude >= 0 && EXCLUDING_FLAGS.includes(cell(cols.exclude).toLowerCase());
    /** The cell's text, or null when it is empty on an excluded row; empty on a fitted row is an error. */
    const required = (col: number): string | null => {
      const t = cell(col);
      if (t !== '') return t;
      if (excluded) return null;
      throw new InputError(
        cols.exclude >= 0
          ? `empty cell on a row that is not excluded (flag the row in "${header[cols.exclude]}" to leave it out of the fit)`
          : 'empty cell (to leave a row out of the fit, flag it in a column named by --exclude)',
        at(col),
      );
    };

    let group: string | null = null;
    if (cols.group >= 0) {
      group = cell(cols.group);
      if (group === '') throw new InputError('empty group name', at(cols.group));
    }

    // Time: the first non-empty cell decides whether the column holds elapsed numbers or instants.
    let timeValue = NaN;
    let instantMs = NaN;
    const timeText = required(cols.time);
    if (timeText !== null) {
      if (timeKind === null) {
        if (parseDecimal(timeText) !== undefined) timeKind = 'elapsed';
        else if (parseIsoInstant(timeText).ok || looksLikeIsoDate(timeText)) timeKind = 'instant';
        else throw new InputError(`${JSON.stringify(timeText)} is neither a number (elapsed time in ${timeUnit.symbol}) nor an ISO 8601 instant`, at(cols.time));
        kindLine = row.line;
      }
      if (timeKind === 'elapsed') {
        const v = parseDecimal(timeText);
        if (v === undefined) {
          throw new InputError(`${JSON.stringify(timeText)} is not a number (the column holds elapsed time in ${timeUnit.symbol}, as on line ${kindLine})`, at(cols.time));
        }
        timeValue = timeUnit.toSI(v);
      } else {
        const instant = parseIsoInstant(timeText);
        if (!instant.ok) {
          const reason = parseDecimal(timeText) !== undefined ? `is not an ISO 8601 instant (the column holds instants, as on line ${kindLine})` : instant.reason;
          throw new InputError(`${JSON.stringify(timeText)} ${reason}`, at(cols.time));
        }
        if (!instant.hasOffset) naiveInstants++;
        instantMs = instant.ms;
      }
    }

    const valueText = required(cols.value);
    let theta = NaN;
    let temperatureK = NaN;
    if (valueText !== null) {
      const v = numberCell(valueText, at(cols.value));
      if (options.referenceC !== undefined) {
        if (v < -ZERO_CELSIUS_K) throw new InputError(`${valueText} °C is below absolute zero`, at(cols.value));
        theta = v - options.referenceC;
        temperatureK = v + ZERO_CELSIUS_K;
      } else theta = v;
    }

    let weight = NaN;
    if (cols.weight >= 0) {
      const weightText = required(cols.weight);
      if (weightText !== null) {
        weight = numberCell(weightText, at(cols.weight));
        if (!(weight >= 0)) throw new InputError(`weight ${weightText} is negative; weights must be ≥ 0`, at(cols.weight));
      }
    }

    let b = builders.get(group);
    if (b === undefined) {
      b = newBuilder();
      builders.set(group, b);
    }
    b.time.push(timeValue);
    b.instantMs.push(instantMs);
    b.theta.push(theta);
    b.weight.push(weight);
    b.include.push(excluded ? 0 : 1);
    b.line.push(row.line);
    b.temperatureK.push(temperatureK);
  }

  const kind = timeKind ?? 'elapsed';
  const groups = [...builders].map(([group, b]) => finish(group, b, kind, cols.weight >= 0, options.referenceC !== undefined));
  return { file, header, timeKind: kind, naiveInstants, dataRows: rows.length - 1, groups };
}

type Where = { file: string; line: number; field: string };

function numberCell(text: string, where: Where): number {
  const v = parseDecimal(text);
  if (v === undefined) throw new InputError(`${JSON.stringify(text)} is not a number`, where);
  return v;
}

/** Exact header match first, then a unique case-insensitive one; otherwise list the columns there are. */
function findColumn(header: readonly string[], name: string, file: string, line: number): number {
  const wanted = name.trim();
  const exact = header.flatMap((h, i) => (h === wanted ? [i] : []));
  const folded = header.flatMap((h, i) => (h.toLowerCase() === wanted.toLowerCase() ? [i] : []));
  const hits = exact.length > 0 ? exact : folded;
  if (hits.length === 1) return hits[0];
  const list = header.map((h) => JSON.stringify(h)).join(', ');
  if (hits.length > 1) throw new InputError(`the header names this column ${hits.length} times; rename one (columns: ${list})`, { file, line, field: name });
  throw new InputError(`no such column; the columns are: ${list}`, { file, line, field: name });
}

interface Builder {
  time: number[];
  instantMs: number[];
  theta: number[];
  weight: number[];
  include: number[];
  line: number[];
  temperatureK: number[];
}

function newBuilder(): Builder {
  return { time: [], instantMs: [], theta: [], weight: [], include: [], line: [], temperatureK: [] };
}

function finish(group: string | null, b: Builder, kind: 'elapsed' | 'instant', weighted: boolean, referenced: boolean): SeriesGroup {
  let originMs: number | null = null;
  let x: Float64Array;
  if (kind === 'instant') {
    // The earliest reading of the group is time zero, so unsorted exports still start at 0.
    let earliest = Infinity;
    for (const ms of b.instantMs) if (ms < earliest) earliest = ms;
    originMs = Number.isFinite(earliest) ? earliest : null;
    x = Float64Array.from(b.instantMs, (ms) => (originMs === null ? NaN : (ms - originMs) / 1000));
  } else x = Float64Array.from(b.time);

  let sum = 0, count = 0;
  for (let i = 0; i < b.include.length; i++) {
    if (b.include[i] === 1 && Number.isFinite(b.temperatureK[i])) { sum += b.temperatureK[i]; count++; }
  }
  return {
    group,
    x,
    theta: Float64Array.from(b.theta),
    ...(weighted ? { weights: Float64Array.from(b.weight) } : {}),
    include: Uint8Array.from(b.include),
    lines: Uint32Array.from(b.line),
    originMs,
    meanProductionTemperatureK: referenced && count > 0 ? sum / count : null,
  };
}
