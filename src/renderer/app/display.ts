/**
 * Numbers and instants as the user asked to see them: SI or US customary units (settings.ts), the
 * chosen time zone. Conversions go through src/shared/units.ts (NIST SP 811 factors); the values
 * themselves stay SI everywhere else in the renderer.
 */
import type { DisplayUnits } from '../../shared/contract/settings.js';
import { JULIAN_YEAR_S, fromSI, toSI } from '../../shared/units.js';

export type ShownQuantity = 'temperature' | 'temperatureDifference' | 'massFlow' | 'volumeFlow' | 'pressure' | 'power' | 'energy';

/** Unit symbol (units.ts) and its label on screen, per quantity and system. */
const UNITS: Record<DisplayUnits, Record<ShownQuantity, { unit: string; label: string; digits: number }>> = {
  si: {
    temperature: { unit: 'degC', label: '°C', digits: 1 },
    temperatureDifference: { unit: 'K', label: 'K', digits: 1 },
    massFlow: { unit: 'kg/s', label: 'kg/s', digits: 1 },
    volumeFlow: { unit: 'm3/h', label: 'm³/h', digits: 1 },
    pressure: { unit: 'MPa', label: 'MPa', digits: 2 },
    power: { unit: 'MW', label: 'MWth', digits: 2 },
    energy: { unit: 'PJ', label: 'PJ', digits: 2 },
  },
  us: {
    temperature: { unit: 'degF', label: '°F', digits: 1 },
    temperatureDifference: { unit: 'degF', label: '°F (difference)', digits: 1 },
    massFlow: { unit: 'klb/h', label: 'klb/h', digits: 1 },
    volumeFlow: { unit: 'gpm', label: 'US gal/min', digits: 0 },
    pressure: { unit: 'psi', label: 'psia', digits: 0 },
    power: { unit: 'MMBtu/h', label: 'MMBtu/h', digits: 1 },
    energy: { unit: 'MMBtu', label: 'MMBtu', digits: 0 },
  },
};

/** Values go in and out in the engine's SI units: K for temperature and its differences, kg/s, m³/s, Pa, W, J. */
export class Display {
  readonly units: DisplayUnits;
  readonly timeZone: string;
  private readonly dateFmt: Intl.DateTimeFormat;
  private readonly dateTimeFmt: Intl.DateTimeFormat;

  constructor(units: DisplayUnits, timeZone: string) {
    this.units = units;
    this.timeZone = timeZone;
    this.dateFmt = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    this.dateTimeFmt = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
  }

  /** The label of the unit a quantity is shown in, e.g. '°F'. */
  unit(q: ShownQuantity): string {
    return UNITS[this.units][q].label;
  }

  /** The units.ts symbol a quantity is shown in, e.g. 'degF' (for forms that take values back). */
  unitSymbol(q: ShownQuantity): string {
    return UNITS[this.units][q].unit;
  }

  /** SI value → shown value (a number, for charts). Temperatures: kelvin in. */
  value(q: ShownQuantity, si: number): number {
    return fromSI(si, UNITS[this.units][q].unit, q);
  }

  /** Shown value → SI value. */
  toSI(q: ShownQuantity, shown: number): number {
    return toSI(shown, UNITS[this.units][q].unit, q);
  }

  /** Celsius → shown temperature value. */
  celsius(c: number): number {
    return this.value('temperature', c + 273.15);
  }

  /** '152.3 °C' from an SI value; '—' for null or NaN. */
  format(q: ShownQuantity, si: number | null | undefined, digits?: number): string {
    if (si === null || si === undefined || !Number.isFinite(si)) return '—';
    const u = UNITS[this.units][q];
    return `${fixed(this.value(q, si), digits ?? u.digits)} ${u.label}`;
  }

  formatCelsius(c: number | null | undefined, digits?: number): string {
    return c === null || c === undefined ? '—' : this.format('temperature', c + 273.15, digits);
  }

  /** Seconds → '12.4 yr'. */
  years(s: number | null | undefined, digits = 1): string {
    return s === null || s === undefined || !Number.isFinite(s) ? '—' : `${fixed(s / JULIAN_YEAR_S, digits)} yr`;
  }

  /** An interval in years: '11.2–13.9 yr'. */
  yearsRange(lowS: number | null | undefined, highS: number | null | undefined, digits = 1): string {
    if (lowS === null || lowS === undefined || highS === null || highS === undefined || !Number.isFinite(lowS) || !Number.isFinite(highS)) return '—';
    return `${fixed(lowS / JULIAN_YEAR_S, digits)}–${fixed(highS / JULIAN_YEAR_S, digits)} yr`;
  }

  /** ISO instant or epoch ms → 'YYYY-MM-DD' in the display zone. */
  date(t: string | number | null | undefined): string {
    if (t === null || t === undefined) return '—';
    const ms = typeof t === 'number' ? t : Date.parse(t);
    return Number.isFinite(ms) ? this.dateFmt.format(ms) : '—';
  }

  dateTime(t: string | number | null | undefined): string {
    if (t === null || t === undefined) return '—';
    const ms = typeof t === 'number' ? t : Date.parse(t);
    return Number.isFinite(ms) ? this.dateTimeFmt.format(ms).replace(',', '') : '—';
  }
}

/** Fixed decimals with a real minus sign and thin-space-free digits; '—' for non-finite. */
export function fixed(v: number, digits: number): string {
  if (!Number.isFinite(v)) return '—';
  const text = v.toFixed(digits);
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

/** A fraction as a percentage: 0.123 → '12 %'. */
export function percent(f: number | null | undefined, digits = 0): string {
  return f === null || f === undefined || !Number.isFinite(f) ? '—' : `${fixed(100 * f, digits)} %`;
}
