/** Numbers as the notes and interpretations print them: plain, rounded, with their unit. */

/** Julian year, 365.25 d (DOMAIN.md §9). */
export const YEAR_S = 365.25 * 86400;

export function kelvin(k: number): string {
  return `${k.toFixed(1)} K`;
}

export function years(s: number): string {
  return `${(s / YEAR_S).toFixed(2)} yr`;
}

export function kilograms(kg: number): string {
  return `${kg.toPrecision(3)} kg`;
}

/** Whole percent, or one decimal below 10 % so that small shares do not print as 0 %. */
export function percent(fraction: number): string {
  const p = fraction * 100;
  return `${Math.abs(p) < 10 ? p.toFixed(1) : Math.round(p)} %`;
}

/** Four significant digits: a ratio and its interval ends are often close to each other and to 1. */
export function ratio(r: number): string {
  return Number.isFinite(r) ? r.toPrecision(4) : r > 0 ? '∞' : '−∞';
}

/** W with a prefix that keeps one to three digits before the point. */
export function watts(w: number): string {
  const a = Math.abs(w);
  if (!Number.isFinite(w)) return w > 0 ? '∞ W' : w < 0 ? '−∞ W' : 'NaN W';
  if (a >= 1e9) return `${(w / 1e9).toPrecision(3)} GW`;
  if (a >= 1e6) return `${(w / 1e6).toPrecision(3)} MW`;
  if (a >= 1e3) return `${(w / 1e3).toPrecision(3)} kW`;
  return `${w.toPrecision(3)} W`;
}
