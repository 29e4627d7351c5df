/**
 * Numbers for people: significant digits, and the everyday units the trade reads next to SI —
 * years beside seconds, °C for absolute temperatures, GWh and TJ for heat, MW for power.
 * Conversions come from src/shared/units.ts; nothing here is used by the JSON output.
 */
import { JULIAN_YEAR_S, fromSI } from '../../shared/units.js';

export const MISSING = '—';

/** `value` to `digits` significant digits; exponent form outside 1e-3 … 1e7; '—' when not finite. */
export function num(value: number | null | undefined, digits = 5): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  if (value === 0) return '0';
  const a = Math.abs(value);
  if (a >= 1e7 || a < 1e-3) {
    const [m, e] = value.toExponential(digits - 1).split('e');
    return `${trimZeros(m)}e${e.replace('+', '')}`;
  }
  // toPrecision switches to exponent form when the integer part has more digits than asked for.
  const text = value.toPrecision(digits);
  return text.includes('e') ? String(Number(text)) : trimZeros(text);
}

function trimZeros(text: string): string {
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text;
}

/** A number with a unit, or '—' alone. */
export function withUnit(value: number | null | undefined, unit: string, digits = 5): string {
  const text = num(value, digits);
  return text === MISSING ? MISSING : `${text} ${unit}`;
}

export function years(seconds: number | null | undefined, digits = 4): string {
  return withUnit(seconds === null || seconds === undefined ? seconds : seconds / JULIAN_YEAR_S, 'yr', digits);
}

/** An absolute temperature in K shown in °C with two decimals (the resolution field gauges log). */
export function celsius(kelvin: number | null | undefined): string {
  if (kelvin === null || kelvin === undefined || !Number.isFinite(kelvin)) return MISSING;
  return `${fromSI(kelvin, 'degC', 'temperature').toFixed(2)} °C`;
}

/** Heat in GWh and TJ. */
export function heat(joules: number | null | undefined): string {
  if (joules === null || joules === undefined || !Number.isFinite(joules)) return MISSING;
  return `${num(fromSI(joules, 'GWh', 'energy'), 4)} GWh = ${num(fromSI(joules, 'TJ', 'energy'), 4)} TJ`;
}

export function megawatts(watts: number | null | undefined, digits = 4): string {
  return withUnit(watts === null || watts === undefined ? watts : fromSI(watts, 'MW', 'power'), 'MW', digits);
}

/** An instant `seconds` after `originMs` (ms since 1970, UTC) as an ISO 8601 date, to the day. */
export function dateAfter(originMs: number, seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return MISSING;
  const d = new Date(originMs + seconds * 1000);
  return Number.isNaN(d.getTime()) ? MISSING : d.toISOString().slice(0, 10);
}
