/**
 * A field's total thermal output, week by week (contract: FieldOutput in src/shared/contract/overview.ts).
 *
 * Each production well with a reference temperature contributes, for each week, the mean over its
 * readings that week of the thermal power P = ṁ·cp·(Tprod − Tref) (DOMAIN.md §2: P = ṁ·cw·θ):
 *   - a producing reading, not flagged bad or spike, with a mass flow and a production temperature
 *     counts its P; a shut-in reading counts P = 0 (the well delivered nothing);
 *   - test readings, flagged readings and readings without flow or temperature are left out.
 * cp is the forecast's choice (specificHeat, services/forecasts.ts): IAPWS-IF97 cp at the well's
 * mean production temperature over the readings its fits use, and saturation pressure + 1 MPa.
 * Weeks start on Monday 00:00 UTC; a week appears when at least one producing reading counted.
 *
 * Exported API:
 *   WEEK_ORIGIN_MS
 *   fieldOutput(wells: { well; history }[]): FieldOutput
 */
import type { FieldOutput } from '../../shared/contract/overview.js';
import { isoOf } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { exclusionOf, isFlaggedOut, type SeriesReading } from '../../shared/series/well-series.js';
import type { Well } from '../db/wells.js';
import { timeOriginOf } from './fits.js';
import { specificHeat } from './forecasts.js';

const WEEK_MS = 7 * 86_400_000;
/** 1970-01-05T00:00:00Z, the first Monday after the epoch (1970-01-01 was a Thursday). */
export const WEEK_ORIGIN_MS = Date.UTC(1970, 0, 5);

export function fieldOutput(wells: readonly { well: Well; history: readonly SeriesReading[] }[]): FieldOutput {
  const total = new Map<number, number>();
  const producingWeeks = new Set<number>();
  const left: string[] = [];
  const used: string[] = [];
  for (const { well, history } of wells) {
    if (well.kind !== 'production' || history.length === 0) continue;
    const tref = well.referenceTemperatureC;
    if (tref === null) { left.push(`${well.name} (no Tref)`); continue; }
    const cp = wellSpecificHeat(well, history);
    if (cp === null) { left.push(`${well.name} (no cp: no usable production temperature, or outside IAPWS-IF97 region 1)`); continue; }
    used.push(`${well.name} cp ${Number(cp.toPrecision(5))} J/(kg K)`);

    const sums = new Map<number, { sum: number; n: number }>();
    for (const r of history) {
      let power: number;
      if (r.status === 'shut-in') power = 0;
      else if (r.status !== 'producing' || isFlaggedOut(r.flags) || r.normalisedMassFlowKgPerS === null || r.productionTemperatureC === null) continue;
      else power = r.normalisedMassFlowKgPerS * cp * (r.productionTemperatureC - tref);
      const week = Math.floor((r.timeMs - WEEK_ORIGIN_MS) / WEEK_MS);
      const s = sums.get(week) ?? { sum: 0, n: 0 };
      s.sum += power;
      s.n++;
      sums.set(week, s);
      if (r.status === 'producing') producingWeeks.add(week);
    }
    for (const [week, s] of sums) total.set(week, (total.get(week) ?? 0) + s.sum / s.n);
  }
  const weeks = [...producingWeeks].sort((a, b) => a - b);
  const note =
    'each production well\'s mean thermal power P = ṁ·cp·(Tprod − Tref) over its readings of the week (shut-in readings count 0; ' +
    'test, flagged bad or spike, and readings without flow or temperature are left out), summed over the wells; relative to each ' +
    'well\'s Tref; cp as the forecast takes it: IAPWS-IF97 cp at the well\'s mean production temperature and saturation + 1 MPa; ' +
    `weeks start Monday 00:00 UTC${used.length > 0 ? `; ${used.join(', ')}` : ''}${left.length > 0 ? `; left out: ${left.join(', ')}` : ''}`;
  return { weekStart: weeks.map((w) => isoOf(WEEK_ORIGIN_MS + w * WEEK_MS)), powerW: weeks.map((w) => total.get(w) as number), note };
}

/** cp at the mean production temperature of the readings the well's fits use, as the forecast takes it; null when there is none. */
function wellSpecificHeat(well: Well, history: readonly SeriesReading[]): number | null {
  const { originMs } = timeOriginOf(well, history[0].timeMs);
  let sum = 0, n = 0;
  for (const r of history) {
    if (exclusionOf(r.timeMs, originMs, r.status, isFlaggedOut(r.flags), r.productionTemperatureC !== null) !== null) continue;
    sum += r.productionTemperatureC as number;
    n++;
  }
  try {
    return specificHeat(undefined, n === 0 ? null : sum / n).valueJPerKgK;
  } catch (e) {
    if (e instanceof InputError) return null;
    throw e;
  }
}
