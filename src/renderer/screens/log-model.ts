/**
 * The log book as plain data: a wall-clock time in the field's IANA zone to the contract's UTC instant
 * (and back), the reading form to a logReading / editReading request checked with the same rules the
 * back end applies (src/shared/contract/reading-rules.ts, so the messages are the back end's), a stored
 * reading as table text (the audit trail is in log-audit-model.ts). No DOM here (tested in
 * test/renderer-log.test.ts).
 *
 *   localToInstant(text, zone): LocalInstant       instantToLocalInput(ms, zone): string
 *   offsetText(offsetMs): string                    timeNote(text, zone): string
 *   TEMPERATURE_UNITS, FLOW_UNITS, PRESSURE_UNITS, defaultEntryUnits(units)
 *   emptyForm(units, now, zone): ReadingForm        formOfReading(reading, zone, units): ReadingForm
 *   buildLogRequest(form, well, zone): { request?, errors, assumptions }
 *   buildEditRequest(reading, initial, form, reason, well, zone): { request?, errors }
 *   flowPreview(form): { massFlowKgPerS, note } | null
 *   readingRow(reading, display): ReadingRow
 */
import type { Wire } from '../../shared/contract/channels.js';
import {
  checkFlags, flowDensity, flowValues, pressurePa, READING_STATUSES, temperatureC, type FlowValues, type ReadingStatus,
} from '../../shared/contract/reading-rules.js';
import type { EditReadingRequest, LogReadingRequest, ReadingJson } from '../../shared/contract/readings.js';
import { isoOf } from '../../shared/contract/schema.js';
import type { DisplayUnits } from '../../shared/contract/settings.js';
import type { WellKind } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import { wallMsOf, ZoneResolver, type LocalTimeKind } from '../../shared/import/time-zone.js';
import { findUnit, fromSI } from '../../shared/units.js';
import type { Display } from '../app/display.js';
import { parseNumber, shortNumber } from './settings-model.js';

const MINUTE_MS = 60_000;
const NOTE_MAX = 2000; // the contract's limit on a note (readings.ts)

// ---------------------------------------------------------------- time

export interface LocalInstant {
  ms: number;
  /** The contract's spelling: ISO 8601 UTC ('…Z'); instants cross the contract in UTC (schema.ts). */
  iso: string;
  kind: LocalTimeKind;
  /** Zone offset in force at that instant (local − UTC), ms. */
  offsetMs: number;
}

const LOCAL_INPUT = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?$/;

/**
 * A datetime-local value ('2024-07-01T12:00') read on the wall clock of `zone`. Clock changes are
 * resolved as the CSV import resolves them (time-zone.ts, RFC 5545 §3.3.5): a repeated hour is its
 * first occurrence, a skipped hour is read with the offset in force before the change.
 */
export function localToInstant(text: string, zone: string): LocalInstant {
  const m = LOCAL_INPUT.exec(text.trim());
  if (m === null) throw new InputError(text.trim() === '' ? 'enter the date and time of the reading' : `not a date and time: "${text}"`, { field: 'time' });
  const [year, month, day, hour, minute] = [1, 2, 3, 4, 5].map((i) => Number(m[i]));
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const check = new Date(Date.UTC(year, month - 1, day, hour, minute, second));
  if (check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day || check.getUTCHours() !== hour || check.getUTCMinutes() !== minute) {
    throw new InputError(`no such date and time: "${text}"`, { field: 'time' });
  }
  const resolver = new ZoneResolver(zone, 'time');
  const ms = resolver.toUtcMs(wallMsOf(year, month, day, hour, minute, second));
  const kind = resolver.lastKind;
  return { ms, iso: isoOf(ms), kind, offsetMs: resolver.offsetAtMs(ms) };
}

/** 'YYYY-MM-DDTHH:MM' of the instant on the wall clock of `zone`, for a datetime-local input. */
export function instantToLocalInput(ms: number, zone: string): string {
  const wall = new Date(ms + new ZoneResolver(zone, 'time').offsetAtMs(ms));
  const p = (n: number): string => String(n).padStart(2, '0');
  return `${wall.getUTCFullYear()}-${p(wall.getUTCMonth() + 1)}-${p(wall.getUTCDate())}T${p(wall.getUTCHours())}:${p(wall.getUTCMinutes())}`;
}

/** 'UTC+02:00', 'UTC−03:30', 'UTC+00:00'. */
export function offsetText(offsetMs: number): string {
  const minutes = Math.round(Math.abs(offsetMs) / MINUTE_MS);
  const sign = offsetMs < 0 ? '−' : '+';
  return `UTC${sign}${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}

/** What the typed time means, in words, beside the time field. */
export function timeNote(text: string, zone: string): string {
  let t: LocalInstant;
  try {
    t = localToInstant(text, zone);
  } catch (e) {
    return e instanceof InputError ? '' : String(e);
  }
  const utc = `${t.iso.slice(0, 10)} ${t.iso.slice(11, 16)} UTC`;
  switch (t.kind) {
    case 'ambiguous':
      return `This local time occurs twice (clocks set back); taken as the first, ${offsetText(t.offsetMs)}: ${utc}.`;
    case 'nonexistent':
      return `This local time does not exist (clocks set forward); read with the offset before the change: ${utc}, `
        + `${instantToLocalInput(t.ms, zone).replace('T', ' ')} local.`;
    default:
      return `= ${utc} (${offsetText(t.offsetMs)})`;
  }
}

// ---------------------------------------------------------------- units offered in the form

export const TEMPERATURE_UNITS: readonly (readonly [string, string])[] = [['degC', '°C'], ['degF', '°F'], ['K', 'K']];

/** Every flow unit units.ts knows, mass first; a volume flow is turned into mass with the water density. */
export const FLOW_UNITS: readonly { symbol: string; label: string; kind: 'mass' | 'volume' }[] = [
  { symbol: 'kg/s', label: 'kg/s', kind: 'mass' },
  { symbol: 't/h', label: 't/h', kind: 'mass' },
  { symbol: 'kg/h', label: 'kg/h', kind: 'mass' },
  { symbol: 'lb/s', label: 'lb/s', kind: 'mass' },
  { symbol: 'lb/h', label: 'lb/h', kind: 'mass' },
  { symbol: 'klb/h', label: 'klb/h', kind: 'mass' },
  { symbol: 'm3/h', label: 'm³/h', kind: 'volume' },
  { symbol: 'm3/s', label: 'm³/s', kind: 'volume' },
  { symbol: 'm3/d', label: 'm³/d', kind: 'volume' },
  { symbol: 'L/s', label: 'L/s', kind: 'volume' },
  { symbol: 'gpm', label: 'US gal/min', kind: 'volume' },
  { symbol: 'bbl/d', label: 'bbl/d', kind: 'volume' },
];

export const PRESSURE_UNITS: readonly (readonly [string, string])[] = [
  ['MPa', 'MPa'], ['bar', 'bar (absolute)'], ['kPa', 'kPa'], ['psi', 'psi (absolute)'], ['atm', 'atm'], ['Pa', 'Pa'],
];

export const STATUS_LABELS: Readonly<Record<ReadingStatus, string>> = { producing: 'producing', 'shut-in': 'shut in', test: 'test' };

export function defaultEntryUnits(units: DisplayUnits): { temperatureUnit: string; flowUnit: string; pressureUnit: string } {
  return units === 'us'
    ? { temperatureUnit: 'degF', flowUnit: 'gpm', pressureUnit: 'psi' }
    : { temperatureUnit: 'degC', flowUnit: 'kg/s', pressureUnit: 'MPa' };
}

// ---------------------------------------------------------------- the form

/** The reading form as typed: numbers as text, in the units beside them. */
export interface ReadingForm {
  time: string;
  productionTemperature: string;
  injectionTemperature: string;
  temperatureUnit: string;
  flow: string;
  flowUnit: string;
  pressure: string;
  pressureUnit: string;
  status: ReadingStatus;
  /** Comma- or space-separated. */
  flags: string;
  note: string;
}

export type FieldErrors = Record<string, string>;

export interface WellForForm {
  name: string;
  field: string;
  kind: WellKind;
}

export function emptyForm(units: DisplayUnits, nowMs: number, zone: string): ReadingForm {
  return {
    time: instantToLocalInput(nowMs, zone),
    productionTemperature: '', injectionTemperature: '', flow: '', pressure: '',
    ...defaultEntryUnits(units),
    status: 'producing', flags: '', note: '',
  };
}

function symbolIn(list: readonly string[], unit: string | null, fallback: string): string {
  if (unit === null) return fallback;
  try {
    const s = findUnit(unit).symbol;
    return list.includes(s) ? s : fallback;
  } catch {
    return fallback;
  }
}

/** A stored reading as the form shows it for editing: each value in the unit it was entered in. */
export function formOfReading(r: Wire<ReadingJson>, zone: string, units: DisplayUnits): ReadingForm {
  const d = defaultEntryUnits(units);
  const temperatureUnit = symbolIn(TEMPERATURE_UNITS.map((u) => u[0]), r.entered.temperatureUnit, d.temperatureUnit);
  const pressureUnit = symbolIn(PRESSURE_UNITS.map((u) => u[0]), r.entered.pressureUnit, d.pressureUnit);
  const temp = (c: number | null): string => (c === null ? '' : temperatureUnit === 'degC' ? shortNumber(c) : shortNumber(fromSI(c + 273.15, temperatureUnit, 'temperature')));
  let flow = '';
  let flowUnit = d.flowUnit === 'gpm' ? 'klb/h' : d.flowUnit;
  const entered = FLOW_UNITS.find((u) => u.symbol === symbolIn(FLOW_UNITS.map((f) => f.symbol), r.entered.flowUnit, ''));
  if (r.volumeFlowM3PerS !== null) {
    flowUnit = entered?.kind === 'volume' ? entered.symbol : 'm3/h';
    flow = shortNumber(fromSI(r.volumeFlowM3PerS, flowUnit, 'volumeFlow'));
  } else if (r.massFlowKgPerS !== null) {
    flowUnit = entered?.kind === 'mass' ? entered.symbol : flowUnit;
    flow = shortNumber(fromSI(r.massFlowKgPerS, flowUnit, 'massFlow'));
  }
  return {
    time: instantToLocalInput(Date.parse(r.time), zone),
    productionTemperature: temp(r.productionTemperatureC),
    injectionTemperature: temp(r.injectionTemperatureC),
    temperatureUnit,
    flow, flowUnit,
    pressure: r.pressureMPa === null ? '' : shortNumber(fromSI(r.pressureMPa * 1e6, pressureUnit, 'pressure')),
    pressureUnit,
    status: r.status,
    flags: r.flags.join(', '),
    note: r.note,
  };
}

function flagList(text: string): string[] {
  return text.split(/[\s,;]+/).filter((f) => f !== '');
}

/** Runs a rule; an InputError becomes a message beside the field it names (or `fallback`). */
function collect<T>(errors: FieldErrors, fallback: string, fn: () => T): T | undefined {
  try {
    return fn();
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    const key = e.where.field ?? fallback;
    errors[key] ??= e.reason;
    return undefined;
  }
}

interface Checked {
  productionTemperature?: number;
  productionC?: number;
  injectionTemperature?: number;
  injectionC?: number;
  flow?: number;
  flowValues?: FlowValues;
  pressure?: number;
  pressurePa?: number;
}

/**
 * The measured values of a form, each checked with the back end's rule for it. `temperatureForDensity`
 * (°C) stands in when the form gives none, as the stored temperature does for an edit.
 */
function checkValues(form: ReadingForm, errors: FieldErrors, temperatureForDensity: number | null = null): Checked {
  const out: Checked = {};
  const given = (text: string): boolean => text.trim() !== '';
  for (const key of ['productionTemperature', 'injectionTemperature'] as const) {
    if (!given(form[key])) continue;
    const v = collect(errors, key, () => parseNumber(form[key], key));
    if (v === undefined) continue;
    const t = collect(errors, key, () => temperatureC(v, form.temperatureUnit, key, 'temperatureUnit'));
    if (t === undefined) continue;
    out[key] = v;
    if (key === 'productionTemperature') out.productionC = t.valueC;
    else out.injectionC = t.valueC;
  }
  if (given(form.pressure)) {
    const v = collect(errors, 'pressure', () => parseNumber(form.pressure, 'pressure'));
    const p = v === undefined ? undefined : collect(errors, 'pressure', () => pressurePa(v, form.pressureUnit, 'pressure', 'pressureUnit'));
    if (v !== undefined && p !== undefined) {
      out.pressure = v;
      out.pressurePa = p.valuePa;
    }
  }
  if (given(form.flow)) {
    const v = collect(errors, 'flow', () => parseNumber(form.flow, 'flow'));
    const fv = v === undefined ? undefined : collect(errors, 'flow', () => flowValues(v, form.flowUnit, () => {
      const t = out.productionC ?? out.injectionC ?? temperatureForDensity ?? undefined;
      if (t === undefined) {
        // The words of normaliseReading (reading-rules.ts), which the back end applies.
        throw new InputError('a volume flow needs a production (or injection) temperature for the water density that turns it into a mass flow', { field: 'flow' });
      }
      return flowDensity(t, out.pressurePa ?? null, 'flow');
    }, 'flow', 'flowUnit'));
    if (v !== undefined && fv !== undefined) {
      out.flow = v;
      out.flowValues = fv;
    }
  }
  return out;
}

/** The mass flow a typed volume flow becomes, and the density assumption, for a hint beside the flow. */
export function flowPreview(form: ReadingForm): { massFlowKgPerS: number; note: string } | null {
  const unit = FLOW_UNITS.find((u) => u.symbol === form.flowUnit);
  if (unit?.kind !== 'volume' || form.flow.trim() === '') return null;
  const checked = checkValues(form, {});
  const fv = checked.flowValues;
  return fv === undefined || fv.densityNote === null ? null : { massFlowKgPerS: fv.normalisedMassFlowKgPerS, note: fv.densityNote };
}

function checkText(form: ReadingForm, errors: FieldErrors): { flags: string[] | undefined } {
  if (form.note.length > NOTE_MAX) errors.note = `at most ${NOTE_MAX} characters (this note has ${form.note.length})`;
  if (!(READING_STATUSES as readonly string[]).includes(form.status)) errors.status = `one of ${READING_STATUSES.join(', ')}`;
  return { flags: collect(errors, 'flags', () => checkFlags(flagList(form.flags), 'flags')) };
}

/** A new reading from the form, or the messages to show beside each field at fault. */
export function buildLogRequest(form: ReadingForm, well: WellForForm, zone: string): { request?: LogReadingRequest; errors: FieldErrors; assumptions: string[] } {
  const errors: FieldErrors = {};
  const time = collect(errors, 'time', () => localToInstant(form.time, zone));
  const v = checkValues(form, errors);
  const { flags } = checkText(form, errors);
  // The back end's own checks of a logged reading, in its words (src/main/services/readings.ts).
  if (well.kind === 'production' && form.productionTemperature.trim() === '') {
    errors.productionTemperature ??= `missing: a reading of the production well ${well.name} needs its production temperature`;
  }
  if ([form.productionTemperature, form.injectionTemperature, form.flow, form.pressure].every((t) => t.trim() === '')) {
    errors.injectionTemperature ??= 'missing: a reading needs at least one value (temperature, flow or pressure)';
  }
  if (Object.keys(errors).length > 0 || time === undefined) return { errors, assumptions: [] };
  const request: LogReadingRequest = { well: well.name, field: well.field, time: time.iso, status: form.status };
  if (v.productionTemperature !== undefined) request.productionTemperature = v.productionTemperature;
  if (v.injectionTemperature !== undefined) request.injectionTemperature = v.injectionTemperature;
  if (v.productionTemperature !== undefined || v.injectionTemperature !== undefined) request.temperatureUnit = form.temperatureUnit;
  if (v.flow !== undefined) {
    request.flow = v.flow;
    request.flowUnit = form.flowUnit;
  }
  if (v.pressure !== undefined) {
    request.pressure = v.pressure;
    request.pressureUnit = form.pressureUnit;
  }
  if (form.note.trim() !== '') request.note = form.note.trim();
  if (flags !== undefined && flags.length > 0) request.flags = flags;
  const note = v.flowValues?.densityNote ?? null;
  return { request, errors, assumptions: note === null ? [] : [note] };
}

/**
 * An edit of `reading`: only what differs from `initial` (the form as first shown) is sent; an emptied
 * value is cleared (null). Changing a unit re-reads the values typed beside it.
 */
export function buildEditRequest(
  reading: Wire<ReadingJson>, initial: ReadingForm, form: ReadingForm, reason: string, well: WellForForm, zone: string,
): { request?: EditReadingRequest; errors: FieldErrors } {
  const errors: FieldErrors = {};
  if (reason.trim() === '') errors.reason = 'give a reason for the change; it goes in the audit log';
  const changed = (key: keyof ReadingForm, unit?: keyof ReadingForm): boolean =>
    form[key].trim() !== initial[key].trim() || (unit !== undefined && form[unit] !== initial[unit] && form[key].trim() !== '');
  const request: EditReadingRequest = { id: reading.id, reason: reason.trim() };
  if (changed('time')) {
    const t = collect(errors, 'time', () => localToInstant(form.time, zone));
    if (t !== undefined) request.time = t.iso;
  }
  const stored = reading.productionTemperatureC ?? reading.injectionTemperatureC;
  const v = checkValues(form, errors, stored);
  const { flags } = checkText(form, errors);
  let temperatureSent = false;
  for (const key of ['productionTemperature', 'injectionTemperature'] as const) {
    if (!changed(key, 'temperatureUnit')) continue;
    if (form[key].trim() === '') {
      if (key === 'productionTemperature' && well.kind === 'production') {
        errors[key] ??= `a reading of the production well ${well.name} needs its production temperature`;
      }
      request[key] = null;
    } else if (v[key] !== undefined) {
      request[key] = v[key];
      temperatureSent = true;
    }
  }
  if (temperatureSent) request.temperatureUnit = form.temperatureUnit;
  if (changed('flow', 'flowUnit')) {
    if (form.flow.trim() === '') request.flow = null;
    else if (v.flow !== undefined) {
      request.flow = v.flow;
      request.flowUnit = form.flowUnit;
    }
  }
  if (changed('pressure', 'pressureUnit')) {
    if (form.pressure.trim() === '') request.pressure = null;
    else if (v.pressure !== undefined) {
      request.pressure = v.pressure;
      request.pressureUnit = form.pressureUnit;
    }
  }
  if (form.status !== initial.status) request.status = form.status;
  if (changed('note')) request.note = form.note.trim();
  if (changed('flags') && flags !== undefined) request.flags = flags;
  if (Object.keys(errors).length > 0) return { errors };
  if (Object.keys(request).length === 2) return { errors: { form: 'nothing was changed' } };
  return { request, errors };
}

// ---------------------------------------------------------------- the readings table

export interface ReadingRow {
  id: number;
  timeMs: number;
  time: string;
  productionTemperature: string;
  injectionTemperature: string;
  flow: string;
  /** 'logged as 205 m³/h at 920.4 kg/m³', or ''. */
  flowAsLogged: string;
  pressure: string;
  status: string;
  flags: string;
  note: string;
  source: string;
  edited: string;
}

export function readingRow(r: Wire<ReadingJson>, display: Display): ReadingRow {
  const volume = r.volumeFlowM3PerS;
  const unit = FLOW_UNITS.find((u) => u.symbol === r.entered.flowUnit);
  const asLogged = volume === null
    ? ''
    : `logged as ${shortNumber(Number(fromSI(volume, unit?.kind === 'volume' ? unit.symbol : 'm3/h', 'volumeFlow').toPrecision(4)))} ${unit?.kind === 'volume' ? unit.label : 'm³/h'}`
      + (r.flowDensityKgPerM3 === null ? '' : ` at ${r.flowDensityKgPerM3.toFixed(1)} kg/m³`);
  return {
    id: r.id,
    timeMs: Date.parse(r.time),
    time: display.dateTime(r.time),
    productionTemperature: display.formatCelsius(r.productionTemperatureC),
    injectionTemperature: display.formatCelsius(r.injectionTemperatureC),
    flow: display.format('massFlow', r.massFlowKgPerS),
    flowAsLogged: asLogged,
    pressure: r.pressureMPa === null ? '—' : display.format('pressure', r.pressureMPa * 1e6),
    status: STATUS_LABELS[r.status] ?? r.status,
    flags: r.flags.join(', '),
    note: r.note,
    source: r.source === 'import' ? `import ${r.importId ?? ''}${r.sourceLine === null ? '' : `, line ${r.sourceLine}`}` : 'by hand',
    edited: r.updatedAt === null ? '' : `edited ${display.dateTime(r.updatedAt)}`,
  };
}
