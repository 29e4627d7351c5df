/** The human-readable form of a fit: a parameter table in SI with everyday units beside it. */
import { parameterNamesOf, type AutoFitResult, type FitResult, type ParameterName } from '../../shared/fit/types.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { MISSING, celsius, num, withUnit } from './display.js';
import { renderTable } from './table.js';

const LABEL: Record<ParameterName, string> = {
  theta0: 'θ0   initial available temperature',
  tau: 'τ    time constant',
  thetaInf: 'θ∞   floor',
  b: 'b    Arps exponent',
};

/** On the produced-mass basis the decline constant is the characteristic mass Mc = C/cw (DOMAIN §4). */
function labelOf(name: ParameterName, fit: FitResult): string {
  return name === 'tau' && fit.basis === 'mass' ? 'Mc   characteristic mass' : LABEL[name];
}

const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (SI Brochure)

/** Heading line of one group's result. */
export function groupHeading(group: string | null, what: string): string {
  return group === null ? what : `${what} — group ${JSON.stringify(group)}`;
}

/** Lines describing a fit; `referenceC` (Tref) adds the production temperatures that θ0 and θ∞ stand for. */
export function fitLines(fit: FitResult | AutoFitResult, referenceC: number | undefined): string[] {
  const lines: string[] = [];
  const state = fit.converged ? 'converged' : `NOT CONVERGED (${fit.status})`;
  lines.push(`  model: ${fit.model} — ${state}${'candidates' in fit ? ', chosen by lowest AICc' : ''}`);
  if (fit.message !== '') lines.push(`  note: ${fit.message}`);
  lines.push(`  points: ${fit.n} fitted, ${fit.nExcluded} left out (excluded rows or zero weight)`);
  if (Object.keys(fit.parameters).length > 0) {
    const rows = parameterNamesOf(fit.model).map((name) => parameterRow(fit, name, referenceC));
    lines.push('', ...renderTable(['parameter', 'value', 'std. error', '95 % interval', 'everyday units'], rows, ['left', 'right', 'right', 'left', 'left']));
    lines.push('');
  }
  lines.push(`  RMSE ${withUnit(fit.rmseK, 'K', 4)}   R² ${num(fit.r2, 6)}   AICc ${num(fit.aicc, 6)}   iterations ${fit.iterations}`);
  if ('candidates' in fit && fit.candidates.length > 0) {
    const rows = fit.candidates.map((c) => [
      c.model, c.converged ? 'converged' : c.status, num(c.aicc, 6), withUnit(c.rmseK, 'K', 4),
      c.parameters.tau === undefined ? MISSING
        : c.basis === 'mass' ? withUnit(c.parameters.tau.value, 'kg', 4) // the characteristic mass, not a time
          : withUnit(c.parameters.tau.value / JULIAN_YEAR_S, 'yr', 4),
    ]);
    lines.push('', '  candidates (best first):', ...renderTable(['model', 'status', 'AICc', 'RMSE', 'τ'], rows, ['left', 'left', 'right', 'right', 'right'], '    '));
  }
  return lines;
}

function parameterRow(fit: FitResult, name: ParameterName, referenceC: number | undefined): string[] {
  const p = fit.parameters[name];
  if (p === undefined) return [labelOf(name, fit), MISSING, MISSING, MISSING, ''];
  const u = p.unit === '1' ? '' : ` ${p.unit}`;
  const interval = Number.isFinite(p.ci95[0]) ? `${num(p.ci95[0])} … ${num(p.ci95[1])}${u}` : MISSING;
  let everyday = '';
  if (name === 'tau' && p.unit === 's') {
    everyday = `${num(p.value / JULIAN_YEAR_S, 5)} yr ± ${num(p.stderr / JULIAN_YEAR_S, 2)} yr`;
  } else if ((name === 'theta0' || name === 'thetaInf') && referenceC !== undefined) {
    everyday = `T = ${celsius(p.value + referenceC + ZERO_CELSIUS_K)}`;
  }
  return [labelOf(name, fit), `${num(p.value)}${u}`, `${num(p.stderr, 3)}${u}`, interval, everyday];
}
