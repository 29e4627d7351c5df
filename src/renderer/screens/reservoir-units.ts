/**
 * The units the reservoir and recharge screens show, per display system, for the quantities the
 * shared Display does not cover: lengths, areas, the geothermal gradient, heat capacity, and power
 * over the wide range from a footprint's background heat flow (kW) to a well's output (MW).
 * Factors come from src/shared/units.ts (NIST SP 811), never typed here. DOM-free.
 */
import type { DisplayUnits } from '../../shared/contract/settings.js';
import { fromSI, toSI } from '../../shared/units.js';

export interface LinearUnit {
  /** Label on screen, e.g. 'ft'. */
  label: string;
  /** SI value per shown unit. */
  factor: number;
}

const FOOT_M = toSI(1, 'ft', 'length');
const DEG_F_K = toSI(1, 'degF', 'temperatureDifference');

/** z in m or ft. */
export function lengthUnit(units: DisplayUnits): LinearUnit {
  return units === 'si' ? { label: 'm', factor: 1 } : { label: 'ft', factor: FOOT_M };
}

/** Plan area in m² or ft², so that it stays consistent with the length unit. */
export function areaUnit(units: DisplayUnits): LinearUnit {
  return units === 'si' ? { label: 'm²', factor: 1 } : { label: 'ft²', factor: toSI(1, 'ft2', 'area') };
}

/**
 * Geothermal gradient: K/km in SI (the usual way to quote it, ≈ 25–30 K/km on average, common
 * practice), °F per 100 ft in US customary units (the usual US oilfield way, common practice).
 */
export function gradientUnit(units: DisplayUnits): LinearUnit {
  return units === 'si'
    ? { label: 'K/km', factor: 1 / toSI(1, 'km', 'length') }
    : { label: '°F/100 ft', factor: DEG_F_K / (100 * FOOT_M) };
}

/** Heat capacity of the reservoir, C: TJ/K or MMBtu/°F. */
export function heatCapacityUnit(units: DisplayUnits): LinearUnit {
  return units === 'si'
    ? { label: 'TJ/K', factor: toSI(1, 'TJ', 'energy') }
    : { label: 'MMBtu/°F', factor: toSI(1, 'MMBtu', 'energy') / DEG_F_K };
}

/** `v` with `digits` significant digits, grouped in thousands, a real minus sign; '—' if not finite. */
export function significant(v: number | null | undefined, digits = 3): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const text = new Intl.NumberFormat('en-US', { maximumSignificantDigits: digits, useGrouping: true }).format(v);
  return text.replace('-', '−');
}

/** An SI value shown in a linear unit: '1706 m'. */
export function formatLinear(si: number | null | undefined, unit: LinearUnit, digits = 4): string {
  if (si === null || si === undefined || !Number.isFinite(si)) return '—';
  return `${significant(si / unit.factor, digits)} ${unit.label}`;
}

/**
 * Power with a prefix that keeps 1–3 digits before the point (W, kW, MW, GW), or in US customary
 * units Btu/h below 0.1 MMBtu/h and MMBtu/h above: the recharge heat flow of a well (MW) and the
 * background heat flow of its footprint (kW) must both read plainly.
 */
export function formatPower(w: number | null | undefined, units: DisplayUnits, digits = 3): string {
  if (w === null || w === undefined || !Number.isFinite(w)) return '—';
  const a = Math.abs(w);
  if (units === 'us') {
    const mmbtuPerH = fromSI(w, 'MMBtu/h', 'power');
    return Math.abs(mmbtuPerH) >= 0.1 ? `${significant(mmbtuPerH, digits)} MMBtu/h` : `${significant(mmbtuPerH * 1e6, digits)} Btu/h`;
  }
  const [unit, symbol] = a >= 1e9 ? ['GW', 'GW'] : a >= 1e6 ? ['MW', 'MWth'] : a >= 1e3 ? ['kW', 'kWth'] : ['W', 'W'];
  return `${significant(fromSI(w, unit, 'power'), digits)} ${symbol}`;
}
