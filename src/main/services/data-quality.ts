/**
 * The data-quality mark of a well's log, for the field overview (contract: DataQuality in
 * src/shared/contract/overview.ts). A rule of our own, stated so it can be checked:
 *
 *   good  ≥ 26 usable readings (half a year of weekly readings), no gap longer than 35 days
 *         between readings in the year (365.25 d) up to the latest one, the latest reading at
 *         most 14 days older than the field's latest reading, and at most 5 % of the readings
 *         flagged bad or spike;
 *   fair  ≥ 8 usable readings, no gap longer than 90 days in that year, the latest reading at
 *         most 90 days behind the field's, and at most 20 % flagged;
 *   poor  anything else with at least one reading;  no-data  no live reading.
 *
 * "Usable" is what a fit would use: for a production well the readings the fit's exclusion rule
 * lets in (exclusionOf, src/shared/series/well-series.ts: producing, not flagged, with a production
 * temperature, from time zero on), counted over the whole log rather than one fit window; an
 * injection well is not fitted, so its usable readings are the ones not flagged. A gap is the time
 * between two consecutive live readings of any status (a shut-in reading is still a reading).
 *
 * A well falls behind when it stops being logged while the field's other wells are: the mark
 * compares with the field's latest reading, not with the clock, so that a log reviewed months
 * after its last entry (an archive, a report read offline) is judged on its own data.
 * `daysSinceLatest` still says how old the latest reading is today.
 *
 * Exported API:
 *   QUALITY_RULE, QUALITY_RULE_TEXT
 *   dataQuality(well, history, fieldLatestMs, nowMs): DataQuality    history: the well's live readings in time order
 */
import type { DataQuality, QualityMark } from '../../shared/contract/overview.js';
import { exclusionOf, isFlaggedOut, type SeriesReading } from '../../shared/series/well-series.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import type { Well } from '../db/wells.js';
import { timeOriginOf } from './fits.js';

const DAY_MS = 86_400_000;
const YEAR_MS = JULIAN_YEAR_S * 1000;

export const QUALITY_RULE = {
  good: { minUsable: 26, maxGapDays: 35, maxAgeDays: 14, maxFlaggedShare: 0.05 },
  fair: { minUsable: 8, maxGapDays: 90, maxAgeDays: 90, maxFlaggedShare: 0.2 },
} as const;

export const QUALITY_RULE_TEXT =
  'rule: good = ≥ 26 usable readings, no gap > 35 d in the last year of the log, latest reading ≤ 14 d behind the field’s latest, ≤ 5 % flagged; ' +
  'fair = ≥ 8 usable, no gap > 90 d in that year, latest ≤ 90 d behind the field’s, ≤ 20 % flagged; poor = anything else with readings';

export function dataQuality(well: Well, history: readonly SeriesReading[], fieldLatestMs: number, nowMs: number): DataQuality {
  const n = history.length;
  if (n === 0) {
    return { mark: 'no-data', readings: 0, included: 0, excluded: 0, flagged: 0, longestGapDays: null, daysSinceLatest: null, notes: [`no live reading of ${well.name}`, QUALITY_RULE_TEXT] };
  }
  const { originMs } = timeOriginOf(well, history[0].timeMs);
  const production = well.kind === 'production';
  let included = 0, flagged = 0, unflagged = 0;
  let longestGapMs = 0, longestRecentGapMs = 0;
  const latestMs = history[n - 1].timeMs;
  for (let i = 0; i < n; i++) {
    const r = history[i];
    const out = isFlaggedOut(r.flags);
    if (out) flagged++;
    else unflagged++;
    if (exclusionOf(r.timeMs, originMs, r.status, out, r.productionTemperatureC !== null) === null) included++;
    if (i > 0) {
      const gap = r.timeMs - history[i - 1].timeMs;
      if (gap > longestGapMs) longestGapMs = gap;
      if (r.timeMs > latestMs - YEAR_MS && gap > longestRecentGapMs) longestRecentGapMs = gap;
    }
  }
  const usable = production ? included : unflagged;
  const recentGapDays = longestRecentGapMs / DAY_MS;
  const behindDays = Math.max(0, fieldLatestMs - latestMs) / DAY_MS;
  const ageDays = (nowMs - latestMs) / DAY_MS;
  const flaggedShare = flagged / n;

  const shortfalls = (c: (typeof QUALITY_RULE)[keyof typeof QUALITY_RULE]): string[] => {
    const out: string[] = [];
    if (usable < c.minUsable) out.push(`${usable} usable readings (fewer than ${c.minUsable})`);
    if (recentGapDays > c.maxGapDays) out.push(`a gap of ${round1(recentGapDays)} d between readings in the last year of the log (more than ${c.maxGapDays} d)`);
    if (behindDays > c.maxAgeDays) out.push(`the latest reading is ${round1(behindDays)} d older than the field’s latest (more than ${c.maxAgeDays} d)`);
    if (flaggedShare > c.maxFlaggedShare) out.push(`${flagged} of ${n} readings flagged bad or spike (more than ${c.maxFlaggedShare * 100} %)`);
    return out;
  };
  const notGood = shortfalls(QUALITY_RULE.good);
  const notFair = shortfalls(QUALITY_RULE.fair);
  const mark: QualityMark = notGood.length === 0 ? 'good' : notFair.length === 0 ? 'fair' : 'poor';
  const notes: string[] = [];
  if (mark === 'good') notes.push('meets every condition of good');
  else notes.push(`not good: ${notGood.join('; ')}`);
  if (mark === 'poor') notes.push(`not fair: ${notFair.join('; ')}`);
  notes.push(production
    ? `usable = readings the fit would use, over the whole log: ${included} of ${n}`
    : `${well.name} is an injection well, not fitted: usable = readings not flagged, ${unflagged} of ${n}`);
  notes.push(QUALITY_RULE_TEXT);
  return {
    mark,
    readings: n,
    included: production ? included : 0,
    excluded: production ? n - included : n,
    flagged,
    longestGapDays: n < 2 ? null : longestGapMs / DAY_MS,
    daysSinceLatest: ageDays,
    notes,
  };
}

function round1(v: number): number {
  return Math.round(v * 10) / 10;
}
