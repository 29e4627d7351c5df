/**
 * How the theoretical time constant τ responds to each input: τ with the input at −10 % and +10 %
 * of its stored value, all else held, and the elasticity d ln τ / d ln x estimated from the two by
 *   e ≈ [ln τ(x·1.1) − ln τ(x·0.9)] / [ln 1.1 − ln 0.9],
 * a central difference in ln x. Where τ is a power of x (τ ∝ ρr, τ ∝ 1/ṁ) this is exact.
 *
 * Inputs are varied as stored (the keys of `tauwell theory --params`), so temperatures move by
 * ±10 % of their value in °C and pressures of theirs in MPa. Computed with the shared theory, in
 * the renderer, on every keystroke. DOM-free.
 */
import { InputError } from '../../shared/errors.js';
import { parseReservoirParams } from '../../shared/reservoir/params.js';
import { reservoirTheory } from '../../shared/reservoir/theory.js';

export interface SensitivitySide {
  /** The varied input, in its stored unit. */
  value: number;
  /** τ in s, or null when the varied parameters are refused. */
  tauS: number | null;
  /** Why they were refused (e.g. the wells no longer reach T1). */
  error: string | null;
}

export interface SensitivityRow {
  /** Stored key, dotted for the fluid: 'rockDensity', 'fluid.iapws.temperature'. */
  key: string;
  base: number;
  minus: SensitivitySide;
  plus: SensitivitySide;
  /** d ln τ / d ln x; one-sided when one side is refused; null when both are, or x = 0. */
  elasticity: number | null;
}

export interface Sensitivity {
  tauS: number;
  step: number;
  /** Largest |elasticity| first; rows without one last. */
  rows: SensitivityRow[];
}

/** Keys that are not numbers to vary: the model's kind and the free-text note. */
const NOT_VARIED = new Set(['kind', 'note']);

/** Numeric leaves of the stored parameters as dotted keys, in the order they appear. */
export function numericKeys(json: Record<string, unknown>, prefix = ''): string[] {
  const keys: string[] = [];
  for (const [key, value] of Object.entries(json)) {
    const dotted = prefix + key;
    if (NOT_VARIED.has(dotted)) continue;
    if (typeof value === 'number') keys.push(dotted);
    else if (typeof value === 'object' && value !== null && !Array.isArray(value)) keys.push(...numericKeys(value as Record<string, unknown>, `${dotted}.`));
  }
  return keys;
}

function withValue(json: Record<string, unknown>, dotted: string, value: number): Record<string, unknown> {
  const [head, ...rest] = dotted.split('.');
  const copy = { ...json };
  copy[head] = rest.length === 0 ? value : withValue(copy[head] as Record<string, unknown>, rest.join('.'), value);
  return copy;
}

function readValue(json: Record<string, unknown>, dotted: string): number {
  return dotted.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], json) as number;
}

/** τ in s of stored parameters; throws InputError when they are refused. */
export function tauOf(json: unknown): number {
  return reservoirTheory(parseReservoirParams(json)).tauS;
}

function side(json: Record<string, unknown>, key: string, value: number): SensitivitySide {
  try {
    return { value, tauS: tauOf(withValue(json, key, value)), error: null };
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    return { value, tauS: null, error: e.reason };
  }
}

/**
 * τ at (1 ± step)·x for every numeric input of `json` (valid stored parameters; throws the
 * InputError of parseReservoirParams otherwise).
 */
export function tauSensitivity(json: Record<string, unknown>, step = 0.1): Sensitivity {
  if (!(step > 0 && step < 1)) throw new InputError(`the step must be between 0 and 1 (got ${step})`, { field: 'step' });
  const tau0 = tauOf(json);
  const rows: SensitivityRow[] = numericKeys(json).map((key) => {
    const base = readValue(json, key);
    const minus = side(json, key, base * (1 - step));
    const plus = side(json, key, base * (1 + step));
    return { key, base, minus, plus, elasticity: elasticityOf(base, tau0, minus, plus, step) };
  });
  rows.sort((a, b) => {
    if (a.elasticity === null || b.elasticity === null) return a.elasticity === null ? (b.elasticity === null ? 0 : 1) : -1;
    return Math.abs(b.elasticity) - Math.abs(a.elasticity);
  });
  return { tauS: tau0, step, rows };
}

function elasticityOf(base: number, tau0: number, minus: SensitivitySide, plus: SensitivitySide, step: number): number | null {
  // At x = 0 a relative change is no change: there is no elasticity to estimate.
  if (base === 0) return null;
  if (minus.tauS !== null && plus.tauS !== null) return (Math.log(plus.tauS) - Math.log(minus.tauS)) / (Math.log1p(step) - Math.log1p(-step));
  if (plus.tauS !== null) return (Math.log(plus.tauS) - Math.log(tau0)) / Math.log1p(step);
  if (minus.tauS !== null) return (Math.log(minus.tauS) - Math.log(tau0)) / Math.log1p(-step);
  return null;
}

/** Relative change of τ on one side, (τ± − τ0)/τ0, or null when refused. */
export function relativeChange(sideOf: SensitivitySide, tau0S: number): number | null {
  return sideOf.tauS === null ? null : sideOf.tauS / tau0S - 1;
}
