/**
 * What the field screen shows, as plain data: one row of text per well, the facts strip, the points of
 * the weekly output chart and the economic limit in words. No DOM here, so it is tested without a
 * browser (test/renderer-field.test.ts); field.ts only turns these into elements.
 *
 *   wellRow(w, display, horizonYears): WellRow
 *   fieldFacts(overview, display): Fact[]
 *   outputPoints(output, display): { x: number; y: number }[]
 *   limitText(limit, display): string
 *   qualityLabel(mark): string
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ForecastLimit } from '../../shared/contract/fits.js';
import type { FieldOutput, FieldOverview, QualityMark, WellOverview } from '../../shared/contract/overview.js';
import { fixed, percent, type Display } from '../app/display.js';

type WireWell = Wire<WellOverview>;

export interface WellRow {
  well: string;
  field: string;
  kind: 'production' | 'injection';
  /** Date of the latest reading and its temperature ('—' without one). */
  latestDate: string;
  latestTemperature: string;
  latestMs: number | null;
  theta: string;
  thetaK: number | null;
  tau: string;
  /** '95 %: 11.2–13.9 yr', or '' without an interval. */
  tauRange: string;
  tauS: number | null;
  theoryTau: string;
  theoryTauS: number | null;
  recharge: string;
  rechargeRange: string;
  /** The verdict in plain words ('cools faster than theory: …'), '' without one; `rechargeInterpretation` says more. */
  rechargeWords: string;
  rechargeInterpretation: string;
  rechargeFraction: number | null;
  yearsP50: string;
  /** 'P90–P10 8.1–12.3 yr'. */
  yearsRange: string;
  /** Sort key: years to the limit at P50 (0 when already reached, +∞ beyond the horizon, null without a forecast). */
  yearsP50Value: number | null;
  /** True when the stored fit is stale, false when current, null when the well has no stored fit. */
  stale: boolean | null;
  staleText: string;
  quality: { mark: QualityMark; label: string; notes: string };
  problem: string | null;
}

export interface Fact {
  label: string;
  value: string;
  note?: string;
}

/** A negative recharge fraction is a missing swept volume, not a recharge (DOMAIN.md §7): say so. */
const RECHARGE_WORDS: Record<string, string> = {
  recharge: 'recharged from outside',
  'consistent-with-none': 'no recharge shown',
  'faster-than-theory': 'cools faster than theory: smaller swept volume',
};

const QUALITY_LABELS: Record<QualityMark, string> = { good: 'good', fair: 'fair', poor: 'poor', 'no-data': 'no data' };

export function qualityLabel(mark: QualityMark): string {
  return QUALITY_LABELS[mark] ?? mark;
}

function finite(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/** Years as shown in the table: '12.4 yr'. */
function yearsText(y: number): string {
  return `${fixed(y, 1)} yr`;
}

function yearsToLimit(w: WireWell, horizonYears: number): Pick<WellRow, 'yearsP50' | 'yearsRange' | 'yearsP50Value'> {
  const y = w.yearsToLimit;
  if (y === null) return { yearsP50: '—', yearsRange: '', yearsP50Value: null };
  if (y.alreadyReached) return { yearsP50: 'reached', yearsRange: 'the limit is already reached', yearsP50Value: 0 };
  // null on the wire: not reached within the forecast horizon (overview.ts).
  const horizon = fixed(horizonYears, 0);
  const p50 = finite(y.p50) ? yearsText(y.p50) : `> ${horizon} yr`;
  let range: string;
  if (finite(y.p90) && finite(y.p10)) range = `P90–P10 ${fixed(y.p90, 1)}–${fixed(y.p10, 1)} yr`;
  else if (finite(y.p90)) range = `P90 ${yearsText(y.p90)}, P10 beyond ${horizon} yr`;
  else range = `P90 and P10 beyond ${horizon} yr`;
  return { yearsP50: p50, yearsRange: range, yearsP50Value: finite(y.p50) ? y.p50 : Number.POSITIVE_INFINITY };
}

export function wellRow(w: WireWell, display: Display, horizonYears: number): WellRow {
  const latest = w.well.latestReading;
  const latestMs = latest === null ? null : Date.parse(latest.time);
  let latestTemperature = '—';
  if (latest !== null) {
    if (finite(latest.productionTemperatureC)) latestTemperature = display.formatCelsius(latest.productionTemperatureC);
    else if (finite(latest.injectionTemperatureC)) latestTemperature = `injection ${display.formatCelsius(latest.injectionTemperatureC)}`;
  }
  const tau = w.fit?.tau ?? null;
  const tauS = tau !== null && finite(tau.value) ? tau.value : null;
  const rf = w.rechargeFraction;
  const rechargeFraction = rf !== null && finite(rf.value) ? rf.value : null;
  const stale = w.fit?.stale ?? null;
  return {
    well: w.well.name,
    field: w.well.field,
    kind: w.well.kind,
    latestDate: latest === null ? '—' : display.date(latest.time),
    latestTemperature,
    latestMs: latestMs !== null && Number.isFinite(latestMs) ? latestMs : null,
    // θ is a difference by definition (the column says so); '°F (difference)' would not fit a table cell.
    theta: display.format('temperatureDifference', w.thetaK).replace(/ \(difference\)$/, ''),
    thetaK: finite(w.thetaK) ? w.thetaK : null,
    tau: display.years(tauS),
    tauRange: tau === null || tauS === null ? '' : `95 %: ${display.yearsRange(tau.ci95[0], tau.ci95[1])}`,
    tauS,
    theoryTau: display.years(w.theoryTauS),
    theoryTauS: finite(w.theoryTauS) ? w.theoryTauS : null,
    recharge: percent(rechargeFraction),
    rechargeRange: rf === null || rechargeFraction === null || !finite(rf.ci95[0]) || !finite(rf.ci95[1])
      ? '' : `95 %: ${percent(rf.ci95[0])} to ${percent(rf.ci95[1])}`,
    rechargeFraction,
    rechargeWords: w.rechargeVerdict === null ? '' : (RECHARGE_WORDS[w.rechargeVerdict] ?? w.rechargeVerdict),
    rechargeInterpretation: w.rechargeInterpretation ?? '',
    ...yearsToLimit(w, horizonYears),
    stale,
    staleText: stale === true ? 'stale' : stale === false ? 'current' : 'not fitted',
    quality: { mark: w.quality.mark, label: qualityLabel(w.quality.mark), notes: w.quality.notes.join('; ') },
    problem: w.problem,
  };
}

/** Wells, producing wells, total thermal power now, earliest P50 end of life. */
export function fieldFacts(overview: Wire<FieldOverview>, display: Display): Fact[] {
  const wells = overview.wells;
  const production = wells.filter((w) => w.well.kind === 'production');
  const producing = production.filter((w) => w.well.latestReading?.status === 'producing');
  const powers = wells.map((w) => w.currentPowerW).filter(finite);
  const total = powers.reduce((a, b) => a + b, 0);
  let earliest: { ms: number; well: string } | null = null;
  for (const w of wells) {
    const iso = w.endOfLife?.p50 ?? null;
    const ms = iso === null ? NaN : Date.parse(iso);
    if (Number.isFinite(ms) && (earliest === null || ms < earliest.ms)) earliest = { ms, well: w.well.name };
  }
  return [
    { label: 'Wells', value: String(wells.length), note: `${production.length} production, ${wells.length - production.length} injection` },
    { label: 'Producing wells', value: String(producing.length), note: 'latest reading producing' },
    {
      label: 'Thermal power now',
      value: powers.length === 0 ? '—' : display.format('power', total),
      note: powers.length === 0 ? 'no well has a current power' : `sum over ${powers.length} well${powers.length === 1 ? '' : 's'}`,
    },
    {
      label: 'Earliest end of life (P50)',
      value: earliest === null ? '—' : display.date(earliest.ms),
      note: earliest === null ? 'no well reaches the limit within the horizon' : earliest.well,
    },
  ];
}

/** Chart points: x in epoch ms, y in the display's power unit; weeks with a missing value are left out. */
export function outputPoints(output: Wire<FieldOutput>, display: Display): { x: number; y: number }[] {
  const points: { x: number; y: number }[] = [];
  const n = Math.min(output.weekStart.length, output.powerW.length);
  for (let i = 0; i < n; i += 1) {
    const x = Date.parse(output.weekStart[i]);
    const p = output.powerW[i];
    if (Number.isFinite(x) && finite(p)) points.push({ x, y: display.value('power', p) });
  }
  return points;
}

/** The economic limit in words and in the display units. */
export function limitText(limit: ForecastLimit, display: Display): string {
  switch (limit.kind) {
    case 'production-temperature':
      return `production temperature down to ${display.formatCelsius(limit.temperatureC)}`;
    case 'theta':
      return `θ (production temperature above Tref) down to ${display.format('temperatureDifference', limit.thetaK)}`;
    case 'power':
      return `thermal power down to ${display.format('power', limit.powerW)}`;
  }
}
