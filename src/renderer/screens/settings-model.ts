/**
 * The settings form as plain data: what each unit system shows, which time zones exist, the economic
 * limit between the form (display units) and the contract (°C, K, W), and the update request built
 * from what the user changed. No DOM here (tested in test/renderer-settings.test.ts).
 *
 *   LIMIT_KINDS, type LimitKind, limitQuantity(kind)
 *   unitSummary(units): string
 *   knownTimeZones(): string[]       isTimeZone(name): boolean      checkTimeZone(name, field?): string
 *   limitShown(limit, units): number            limitFromShown(kind, text, units, field): ForecastLimit
 *   reexpress(kind, text, from, to): string     the same limit typed in other display units
 *   parseNumber(text, field): number            shortNumber(v): string
 *   heatFlowShown(wPerM2): number (mW/m²)       DEFAULT_HEAT_FLOW_MW_PER_M2
 *   buildSettingsUpdate(form, settings): { request, errors }
 *   errorKey(field): string                     the form field a back-end InputError names
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ForecastLimit } from '../../shared/contract/fits.js';
import type { DisplayUnits, SettingsJson, UpdateSettingsRequest } from '../../shared/contract/settings.js';
import { InputError } from '../../shared/errors.js';
import { DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2 } from '../../shared/forecast/recharge.js';
import { Display, type ShownQuantity } from '../app/display.js';

export type LimitKind = ForecastLimit['kind'];

export const LIMIT_KINDS: readonly { kind: LimitKind; label: string; quantity: ShownQuantity }[] = [
  { kind: 'production-temperature', label: 'Minimum production temperature', quantity: 'temperature' },
  { kind: 'theta', label: 'Minimum θ (production temperature above Tref)', quantity: 'temperatureDifference' },
  { kind: 'power', label: 'Minimum thermal power', quantity: 'power' },
];

export function limitQuantity(kind: LimitKind): ShownQuantity {
  return (LIMIT_KINDS.find((k) => k.kind === kind) ?? LIMIT_KINDS[0]).quantity;
}

/** 60 mW/m²: continental average conductive heat flow (common practice). */
export const DEFAULT_HEAT_FLOW_MW_PER_M2 = DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2 * 1000;

/** Conversions only; the zone plays no part. */
function displayOf(units: DisplayUnits): Display {
  return new Display(units, 'UTC');
}

/** '°C, kg/s, m³/h, MPa, MWth, PJ': the units a system shows, read from Display so the two cannot differ. */
export function unitSummary(units: DisplayUnits): string {
  const d = displayOf(units);
  const qs: ShownQuantity[] = ['temperature', 'massFlow', 'volumeFlow', 'pressure', 'power', 'energy'];
  return qs.map((q) => d.unit(q)).join(', ');
}

/** The runtime's IANA zones (Intl.supportedValuesOf where the runtime has it, else none to suggest). */
export function knownTimeZones(): string[] {
  const intl = Intl as { supportedValuesOf?: (key: 'timeZone') => string[] };
  return typeof intl.supportedValuesOf === 'function' ? intl.supportedValuesOf('timeZone') : [];
}

let zoneSet: Set<string> | null = null;

/**
 * True for a zone in the runtime's list, or one Intl.DateTimeFormat accepts (the list holds canonical
 * names only; 'UTC' and links such as 'Asia/Calcutta' are valid too, and the back end accepts them).
 */
export function isTimeZone(name: string): boolean {
  if (name.trim() === '') return false;
  zoneSet ??= new Set(knownTimeZones());
  if (zoneSet.has(name)) return true;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

export function checkTimeZone(name: string, field = 'timeZone'): string {
  const zone = name.trim();
  if (!isTimeZone(zone)) {
    throw new InputError(`unknown time zone "${zone}"; give an IANA zone name such as Europe/Berlin or America/Denver`, { field });
  }
  return zone;
}

/** A number typed into a form: a decimal point or a decimal comma; anything else is refused. */
export function parseNumber(text: string, field: string): number {
  const t = text.trim().replace(/\s/g, '').replace(',', '.').replace(/^−/, '-');
  const v = t === '' ? NaN : Number(t);
  if (!Number.isFinite(v)) throw new InputError(text.trim() === '' ? 'enter a number' : `not a number: "${text.trim()}"`, { field });
  return v;
}

/** Up to 10 significant digits, without the noise a unit round trip leaves (388.15 − 273.15). */
export function shortNumber(v: number): string {
  return String(Number(v.toPrecision(10)));
}

/** The limit's value in the display units of `units`. */
export function limitShown(limit: ForecastLimit, units: DisplayUnits): number {
  const d = displayOf(units);
  switch (limit.kind) {
    case 'production-temperature': return d.celsius(limit.temperatureC);
    case 'theta': return d.value('temperatureDifference', limit.thetaK);
    case 'power': return d.value('power', limit.powerW);
  }
}

/** The limit typed in the display units of `units`, as the contract stores it. */
export function limitFromShown(kind: LimitKind, text: string, units: DisplayUnits, field: string): ForecastLimit {
  const shown = parseNumber(text, field);
  try {
    return limitOf(kind, shown, displayOf(units), field);
  } catch (e) {
    // units.ts refuses a temperature below absolute zero without knowing the form's field: name it here.
    if (e instanceof InputError && e.where.field === undefined) throw new InputError(e.reason, { field });
    throw e;
  }
}

function limitOf(kind: LimitKind, shown: number, d: Display, field: string): ForecastLimit {
  switch (kind) {
    case 'production-temperature': {
      // Kelvin and back costs a last binary digit (115 °C → 115.00000000000003); 12 digits is far below any reading's.
      const c = Number((d.toSI('temperature', shown) - 273.15).toPrecision(12));
      if (!(c > -273.15)) throw new InputError('must be above absolute zero', { field });
      return { kind, temperatureC: c };
    }
    case 'theta': {
      const k = Number(d.toSI('temperatureDifference', shown).toPrecision(12));
      if (!(k > 0)) throw new InputError('must be greater than zero: θ is the production temperature above Tref', { field });
      return { kind, thetaK: k };
    }
    case 'power': {
      const w = Number(d.toSI('power', shown).toPrecision(12));
      if (!(w > 0)) throw new InputError('must be greater than zero', { field });
      return { kind, powerW: w };
    }
  }
}

/** The same limit value typed in `from` units, re-expressed in `to` units ('' stays ''; unreadable text is kept). */
export function reexpress(kind: LimitKind, text: string, from: DisplayUnits, to: DisplayUnits): string {
  if (text.trim() === '' || from === to) return text;
  try {
    return shortNumber(limitShown(limitFromShown(kind, text, from, 'value'), to));
  } catch {
    return text;
  }
}

export function heatFlowShown(wPerM2: number): number {
  return Number((wPerM2 * 1000).toPrecision(12));
}

export function limitsEqual(a: ForecastLimit, b: ForecastLimit): boolean {
  if (a.kind !== b.kind) return false;
  const close = (x: number, y: number): boolean => Math.abs(x - y) <= 1e-9 * Math.max(1, Math.abs(x), Math.abs(y));
  switch (a.kind) {
    case 'production-temperature': return close(a.temperatureC, (b as typeof a).temperatureC);
    case 'theta': return close(a.thetaK, (b as typeof a).thetaK);
    case 'power': return close(a.powerW, (b as typeof a).powerW);
  }
}

/** The form as typed. A value left empty where the setting is a built-in default keeps the default. */
export interface SettingsForm {
  units: DisplayUnits;
  /** null: each field's own zone. */
  timeZone: string | null;
  limitKind: LimitKind;
  limitValue: string;
  /** Per well: kind null (or an empty value) for "the field-wide limit". */
  wellLimits: { wellId: number; kind: LimitKind | null; value: string }[];
  heatFlowMilliWPerM2: string;
  horizonYears: string;
  reason: string;
}

export type FieldErrors = Record<string, string>;

/** The form key a message belongs beside: 'economicLimit.temperatureC' → 'economicLimit', 'wellEconomicLimits.3.x' → 'wellEconomicLimits.3'. */
export function errorKey(field: string | undefined): string {
  if (field === undefined || field === '') return 'form';
  const parts = field.split('.');
  if (parts[0] === 'wellEconomicLimits' && parts.length >= 2) return `wellEconomicLimits.${parts[1]}`;
  return parts[0];
}

/**
 * The update request for what differs from `settings`; only changed settings are sent, so a built-in
 * default stays marked as one (settings.source) until someone sets it. Errors are keyed by errorKey().
 */
export function buildSettingsUpdate(form: SettingsForm, settings: Wire<SettingsJson>): { request: UpdateSettingsRequest; errors: FieldErrors } {
  const request: UpdateSettingsRequest = {};
  const errors: FieldErrors = {};
  const attempt = (key: string, fn: () => void): void => {
    try {
      fn();
    } catch (e) {
      if (e instanceof InputError) errors[key] = e.reason;
      else throw e;
    }
  };
  if (form.units !== settings.units) request.units = form.units;
  attempt('timeZone', () => {
    const zone = form.timeZone === null ? null : checkTimeZone(form.timeZone);
    if (zone !== settings.timeZone) request.timeZone = zone;
  });
  attempt('economicLimit', () => {
    if (form.limitValue.trim() === '') {
      if (settings.source.economicLimit === 'set') throw new InputError('enter the economic limit', { field: 'economicLimit' });
      if (form.limitKind !== settings.economicLimit.kind) throw new InputError('enter a value for this kind of limit', { field: 'economicLimit' });
      return;
    }
    const limit = limitFromShown(form.limitKind, form.limitValue, form.units, 'economicLimit');
    if (settings.source.economicLimit === 'default' || !limitsEqual(limit, settings.economicLimit as ForecastLimit)) request.economicLimit = limit;
  });
  const wellLimits: Record<string, ForecastLimit | null> = {};
  for (const w of form.wellLimits) {
    const key = String(w.wellId);
    attempt(`wellEconomicLimits.${key}`, () => {
      const before = (settings.wellEconomicLimits as Record<string, ForecastLimit>)[key];
      if (w.kind === null || w.value.trim() === '') {
        if (before !== undefined) wellLimits[key] = null;
        return;
      }
      const limit = limitFromShown(w.kind, w.value, form.units, `wellEconomicLimits.${key}`);
      if (before === undefined || !limitsEqual(limit, before)) wellLimits[key] = limit;
    });
  }
  if (Object.keys(wellLimits).length > 0) request.wellEconomicLimits = wellLimits;
  attempt('backgroundHeatFlowWPerM2', () => {
    if (form.heatFlowMilliWPerM2.trim() === '') {
      if (settings.source.backgroundHeatFlowWPerM2 === 'set') throw new InputError('enter the background heat flow', { field: 'backgroundHeatFlowWPerM2' });
      return;
    }
    const mw = parseNumber(form.heatFlowMilliWPerM2, 'backgroundHeatFlowWPerM2');
    // The contract's bounds (settings.ts): above 0, at most 10 W/m².
    if (!(mw > 0) || mw > 10_000) throw new InputError('must be above 0 and at most 10 000 mW/m²', { field: 'backgroundHeatFlowWPerM2' });
    const w = Number((mw / 1000).toPrecision(12));
    if (settings.source.backgroundHeatFlowWPerM2 === 'default' || Math.abs(w - settings.backgroundHeatFlowWPerM2) > 1e-12) request.backgroundHeatFlowWPerM2 = w;
  });
  attempt('horizonYears', () => {
    if (form.horizonYears.trim() === '') {
      if (settings.source.horizonYears === 'set') throw new InputError('enter the forecast horizon', { field: 'horizonYears' });
      return;
    }
    const y = parseNumber(form.horizonYears, 'horizonYears');
    if (!(y > 0) || y > 1000) throw new InputError('must be above 0 and at most 1000 years', { field: 'horizonYears' });
    if (settings.source.horizonYears === 'default' || y !== settings.horizonYears) request.horizonYears = y;
  });
  if (form.reason.trim() !== '' && Object.keys(request).length > 0) request.reason = form.reason.trim();
  return { request, errors };
}
