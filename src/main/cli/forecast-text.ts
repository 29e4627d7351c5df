/** The human-readable form of a forecast and a recharge estimate, with the cautions the product shows. */
import type { ForecastResult } from '../../shared/forecast/forecast.js';
import type { RechargeResult } from '../../shared/forecast/recharge.js';
import type { DeclineModel } from '../../shared/fit/types.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import type { SeriesGroup } from './csv-series.js';
import { MISSING, celsius, dateAfter, heat, megawatts, num, withUnit, years } from './display.js';
import type { ReservoirInput } from './forecast-json.js';
import type { SpecificHeat } from './specific-heat.js';
import { renderTable } from './table.js';

/** DOMAIN.md §10, printed as one paragraph under every human-readable forecast. */
export const CAUTION_TEXT =
  "Forecasts are estimates from a simplified model and field data; they do not replace a licensed reservoir engineer's assessment. " +
  'Drilling, stimulation, reinjection and plant operation are governed by local codes and permits; fluid injection can induce seismicity. ' +
  "Wellhead fluids are hot and under pressure: readings are taken under the site's safety procedures.";

export const CAUTIONS: readonly string[] = ['Cautions:', CAUTION_TEXT];

/** Trade convention of petroleum reserves (DOMAIN.md §8). */
export const PERCENTILE_NOTE =
  'P90/P50/P10: P90 = the low case, exceeded with 90 % probability; P50 = the median; P10 = the high case, exceeded with only 10 % probability.';

const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (SI Brochure)

interface ForecastView {
  group: SeriesGroup;
  cp: SpecificHeat;
  forecast: ForecastResult;
}

export function forecastLines(view: ForecastView, referenceC: number | undefined, plannedFlowKgPerS: number | undefined): string[] {
  const { group, cp, forecast: f } = view;
  const abs = (thetaK: number | null): string => (referenceC === undefined || thetaK === null ? '' : ` (T = ${celsius(thetaK + referenceC + ZERO_CELSIUS_K)})`);
  if (f.status !== 'ok') return [`  no forecast: ${f.message}`];
  const lines = [
    `  economic limit θecon: ${withUnit(f.thetaEconK, 'K')}${abs(f.thetaEconK)}`,
    `  now (last reading): ${withUnit(f.nowTimeS, 's')} = ${years(f.nowTimeS, 5)} after time zero${group.originMs === null ? '' : `, ${dateAfter(group.originMs, f.nowTimeS)}`}; θ now ${withUnit(f.currentThetaK, 'K')}${abs(f.currentThetaK)}`,
    `  specific heat cw: ${withUnit(cp.valueJPerKgK, 'J/(kg K)')} — ${cp.note}`,
    plannedFlowKgPerS === undefined
      ? '  current power: — (give --planned-flow for power and remaining heat)'
      : `  current power: ${megawatts(f.currentPowerW)} (${withUnit(f.currentPowerW, 'W')}) at ${plannedFlowKgPerS} kg/s`,
    '',
  ];
  const e = f.endOfLife;
  const sinceNow = (t: number | null): string => (t === null ? 'not within the horizon' : years(t - f.nowTimeS, 4));
  const rows = [
    ['end of life, s after time zero', ...[e.p90, e.p50, e.p10].map((t) => withUnit(t, 's'))],
    ['end of life, years after time zero', ...[e.p90, e.p50, e.p10].map((t) => (t === null ? 'not reached' : years(t, 4)))],
    ['remaining life from now', ...[e.p90, e.p50, e.p10].map(sinceNow)],
  ];
  if (group.originMs !== null) rows.push(['end-of-life date (UTC)', ...[e.p90, e.p50, e.p10].map((t) => dateAfter(group.originMs as number, t))]);
  const h = f.remainingHeatJ;
  rows.push([f.remainingHeatToHorizon ? 'remaining heat to the horizon' : 'remaining heat to the limit', ...(h === null ? [MISSING, MISSING, MISSING] : [h.p90, h.p50, h.p10].map(heat))]);
  lines.push(...renderTable(['', 'P90 (low case)', 'P50', 'P10 (high case)'], rows, ['left', 'right', 'right', 'right']));
  const reached = e.alreadyReached
    ? 'the limit is already reached at the last reading'
    : `P50 ${e.reached ? 'reaches' : 'does not reach'} the limit within the horizon (${years(f.horizonEndS, 4)} after time zero); ${num(100 * e.fractionReachedWithinHorizon, 3)} % of samples do`;
  lines.push(`  ${reached}`);
  lines.push('', ...bandLines(f, referenceC));
  for (const note of f.notes) lines.push(`  note: ${note}`);
  lines.push(`  samples: ${f.samplesUsed} used, ${f.samplesRejected} rejected, seed ${f.seed}`);
  return lines;
}

/** θ band at a handful of times: enough to read the shape without a chart. */
function bandLines(f: ForecastResult, referenceC: number | undefined): string[] {
  const n = f.band.timeS.length;
  if (n === 0) return [];
  const picks = [...new Set(Array.from({ length: 7 }, (_, i) => Math.round((i * (n - 1)) / 6)))];
  const t = (k: number): string => (referenceC === undefined ? withUnit(k, 'K', 4) : `${num(k, 4)} K / ${celsius(k + referenceC + ZERO_CELSIUS_K)}`);
  const rows = picks.map((i) => [
    years(f.band.timeS[i], 4), t(f.band.p90[i]), t(f.band.p50[i]), t(f.band.p10[i]),
  ]);
  return ['  θ forecast band:', ...renderTable(['time after zero', 'P90 (low)', 'P50', 'P10 (high)'], rows, ['right', 'right', 'right', 'right'], '    ')];
}

export function rechargeLines(r: RechargeResult, reservoir: ReservoirInput, model: DeclineModel): string[] {
  if (r.status !== 'ok') return [`  recharge: not estimated — ${r.message}`];
  const ci = (c: readonly [number, number], f: (v: number) => string): string => `${f(c[0])} … ${f(c[1])}`;
  const yr = (s: number): string => num(s / JULIAN_YEAR_S, 4);
  const rows = [
    // Only the exponential has one time constant; the others are compared through their effective τ = −θ/(dθ/dt) now.
    [model === 'exponential' ? 'fitted τ' : `effective τ now (${model} model)`, `${years(r.tauFitS.value, 5)}`, `${ci(r.tauFitS.ci95, yr)} yr`],
    [`theoretical τ at ${num(reservoir.meanFlowKgPerS)} kg/s`, years(r.tauTheoryS, 5), ''],
    ['ratio R = τfit/τtheory', num(r.ratio.value, 4), ci(r.ratio.ci95, (v) => num(v, 4))],
    ['recharge fraction f', num(r.rechargeFraction.value, 4), ci(r.rechargeFraction.ci95, (v) => num(v, 4))],
    ['recharge heat flow Qr now', megawatts(r.rechargeHeatFlowW.value), `${ci(r.rechargeHeatFlowW.ci95, (v) => num(v / 1e6, 4))} MW`],
    [`background qb·A (${num(reservoir.backgroundWPerM2, 3)} W/m2)`, megawatts(r.backgroundHeatFlowW), ''],
    ['Qr / (qb·A)', num(r.ratioToBackground, 4), ''],
  ];
  return [
    `  recharge against the reservoir theory (${reservoir.file}, ${reservoir.theory.kind}):`,
    ...renderTable(['quantity', 'value', '95 % interval'], rows, ['left', 'right', 'left'], '    '),
    `  verdict: ${r.verdict} — ${r.interpretation}`,
  ];
}
