/**
 * The data quality of a well's pages: its readings and what the fit left out by reason, the excluded
 * periods (runs of shut-in, test or flagged readings), and the field overview's mark with its notes.
 */
import type { Wire } from '../contract/channels.js';
import type { ForecastWellResponse } from '../contract/fits.js';
import type { FieldOverview, QualityMark, WellSeriesResponse } from '../contract/overview.js';
import { fin, iso } from './numbers.js';

/** Excluded periods listed one by one; the rest are counted. */
const PERIOD_ROWS = 15;

/** EXCLUSION_CODES (contract/overview.ts) by code. */
const EXCLUSION_BY_CODE = ['included', 'not-producing', 'flagged', 'no-temperature', 'before-time-zero', 'deleted'] as const;

export interface ExcludedPeriod {
  from: string;
  to: string;
  reason: 'not-producing' | 'flagged' | 'no-temperature' | 'before-time-zero';
  readings: number;
}

export interface QualitySummary {
  readings: number;
  included: number;
  excluded: { notProducing: number; flagged: number; noTemperature: number; beforeTimeZero: number };
  firstReading: string | null;
  lastReading: string | null;
  mark: QualityMark | null;
  longestGapDays: number | null;
  daysSinceLatest: number | null;
  notes: string[];
  periods: ExcludedPeriod[];
  /** Periods beyond those listed. */
  morePeriods: number;
}

export function dataQuality(s: Wire<WellSeriesResponse> | null, f: Wire<ForecastWellResponse> | null, row: Wire<FieldOverview>['wells'][number] | null): QualitySummary {
  const c = f?.fit.counts;
  const byCode = [0, 0, 0, 0, 0];
  if (s !== null) for (const code of s.exclusion) byCode[code] = (byCode[code] ?? 0) + 1;
  const times = s === null ? [] : s.timeS.map((t) => s.epochMs + 1000 * t);
  const { periods, more } = s === null ? { periods: [], more: 0 } : excludedPeriods(s, times);
  const q = row?.quality ?? null;
  return {
    readings: c?.readings ?? s?.count ?? q?.readings ?? 0,
    included: c?.included ?? byCode[0],
    excluded: {
      notProducing: c?.excludedNotProducing ?? byCode[1],
      flagged: c?.excludedFlagged ?? byCode[2],
      noTemperature: c?.excludedNoTemperature ?? byCode[3],
      beforeTimeZero: c?.excludedBeforeTimeZero ?? byCode[4],
    },
    firstReading: times.length === 0 ? null : iso(times[0]),
    lastReading: times.length === 0 ? null : iso(times[times.length - 1]),
    mark: q?.mark ?? null,
    longestGapDays: fin(q?.longestGapDays),
    daysSinceLatest: fin(q?.daysSinceLatest),
    notes: q?.notes ?? [],
    periods,
    morePeriods: more,
  };
}

/** Runs of consecutive readings left out for the same reason: the shut-ins, tests and flagged stretches of the log. */
function excludedPeriods(s: Wire<WellSeriesResponse>, times: number[]): { periods: ExcludedPeriod[]; more: number } {
  const all: ExcludedPeriod[] = [];
  let i = 0;
  while (i < s.count) {
    const code = s.exclusion[i];
    if (code === 0) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < s.count && s.exclusion[j + 1] === code) j++;
    const reason = EXCLUSION_BY_CODE[code];
    if (reason !== undefined && reason !== 'included' && reason !== 'deleted') all.push({ from: iso(times[i]), to: iso(times[j]), reason, readings: j - i + 1 });
    i = j + 1;
  }
  return { periods: all.slice(0, PERIOD_ROWS), more: Math.max(0, all.length - PERIOD_ROWS) };
}
