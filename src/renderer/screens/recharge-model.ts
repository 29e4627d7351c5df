/**
 * The recharge comparison of one well as the screens show it: the forecast request a well's stored
 * fit implies, and the view model of the answer — τfit against τtheory with their intervals, the
 * ratio R = τfit/τtheory, the recharge fraction f = 1 − τtheory/τfit, the recharge heat flow Qr
 * against the background heat flow through the footprint qb·A, and the verdict in plain words
 * (DOMAIN.md §7; src/shared/forecast/recharge.ts). DOM-free.
 */
import type { Wire } from '../../shared/contract/channels.js';
import { MODEL_CHOICES, type FitStatusResponse, type ForecastLimit, type ForecastWellRequest, type ForecastWellResponse, type ModelChoice } from '../../shared/contract/fits.js';
import type { DisplayUnits, SettingsJson } from '../../shared/contract/settings.js';
import type { WellInfo } from '../../shared/contract/wells.js';
import { DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2, type RechargeVerdict } from '../../shared/forecast/recharge.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { formatPower, significant } from './reservoir-units.js';

type Settings = Pick<Wire<SettingsJson>, 'economicLimit' | 'wellEconomicLimits' | 'backgroundHeatFlowWPerM2' | 'horizonYears'> & {
  source?: Partial<Wire<SettingsJson>['source']>;
};

/** The well's own economic limit if it has one, else the field log's. */
export function economicLimitOf(settings: Settings, wellId: number): ForecastLimit {
  return settings.wellEconomicLimits?.[String(wellId)] ?? settings.economicLimit;
}

/**
 * The forecast that gives a well's recharge: model, basis and window of its stored fit (so the
 * numbers match the decline screen), else the automatic model on the time basis; the settings'
 * limit, horizon and background heat flow. No points: only the summary is needed.
 */
export function forecastRequestOf(well: Pick<WellInfo, 'id' | 'name' | 'field'>, status: Pick<Wire<FitStatusResponse>, 'latest'> | null, settings: Settings): ForecastWellRequest {
  const latest = status?.latest ?? null;
  const model: ModelChoice = latest !== null && (MODEL_CHOICES as readonly string[]).includes(latest.model) ? (latest.model as ModelChoice) : 'auto';
  const request: ForecastWellRequest = {
    well: well.name,
    field: well.field,
    model,
    basis: latest?.basis ?? 'time',
    points: false,
    residuals: false,
    limit: economicLimitOf(settings, well.id),
    horizonYears: settings.horizonYears,
    backgroundHeatFlowWPerM2: settings.backgroundHeatFlowWPerM2,
  };
  if (latest?.window.from != null) request.from = latest.window.from;
  if (latest?.window.to != null) request.to = latest.window.to;
  return request;
}

/** Why a well has no recharge comparison, in plain words, or null when it can have one. */
export function whyNoRecharge(well: Pick<WellInfo, 'name' | 'kind' | 'reservoir'>): string | null {
  if (well.kind !== 'production') return `${well.name} is an injection well: recharge is estimated from the decline of a production well.`;
  if (well.reservoir === null) return `${well.name} has no reservoir assigned, so there is no theoretical time constant to compare its decline with.`;
  return null;
}

export type VerdictKey = RechargeVerdict | 'no-fit';

/** The verdict as a headline: what each outcome means for the reservoir. */
export const VERDICT_HEADLINES: Readonly<Record<VerdictKey, string>> = {
  recharge: 'Recharge: the reservoir cools more slowly than its parameters predict',
  'consistent-with-none': 'No recharge detectable: the decline agrees with the theory',
  'faster-than-theory': 'Cooling faster than theory: the swept volume is probably smaller than assumed',
  'no-fit': 'No recharge estimate: the decline fit did not converge',
};

/** A value and its 95 % interval as text. */
export interface IntervalText {
  value: string;
  interval: string;
}

export interface RechargeView {
  verdict: VerdictKey;
  headline: string;
  interpretation: string;
  /** Extra message of the estimate (e.g. no intervals), or ''. */
  message: string;
  tauFit: IntervalText;
  tauTheory: string;
  /** In years, for the chart; null where the wire has no number. */
  tauFitYears: { value: number | null; low: number | null; high: number | null };
  tauTheoryYears: number | null;
  ratio: IntervalText;
  fraction: IntervalText;
  /** What a negative or large f means, or ''. */
  fractionNote: string;
  rechargeHeatFlow: IntervalText;
  backgroundHeatFlow: string;
  /** Qr against qb·A in words. */
  comparedWithBackground: string;
  reservoir: {
    name: string;
    field: string;
    version: number;
    recordedAt: string;
    recordedBy: string;
    note: string;
    /** τ of the version at its own flow, and that flow. */
    tauAtOwnFlow: string;
    ownMassFlowKgPerS: number | null;
    meanMassFlowKgPerS: number | null;
    areaM2: number | null;
  };
  /** qb in use: in words, and short ('qb = 60 mW/m² (default)'). */
  background: { wPerM2: number; text: string; short: string; isDefault: boolean };
}

const years = (s: number | null | undefined, digits = 1): string =>
  s === null || s === undefined || !Number.isFinite(s) ? '—' : `${(s / JULIAN_YEAR_S).toFixed(digits)} yr`;

const toYears = (s: number | null | undefined): number | null => (s === null || s === undefined || !Number.isFinite(s) ? null : s / JULIAN_YEAR_S);

/** '−96.6 %' with a real minus sign. */
function pct(f: number | null | undefined, digits = 1): string {
  if (f === null || f === undefined || !Number.isFinite(f)) return '—';
  const t = (100 * f).toFixed(digits);
  return `${t.startsWith('-') ? `−${t.slice(1)}` : t} %`;
}

/**
 * An interval whose end may be missing on the wire (null: NaN or unbounded, channels.ts): the
 * ends that exist, or 'no interval'.
 */
export function intervalText(low: number | null | undefined, high: number | null | undefined, show: (v: number) => string): string {
  const lo = low !== null && low !== undefined && Number.isFinite(low);
  const hi = high !== null && high !== undefined && Number.isFinite(high);
  if (lo && hi) return `95 % interval ${show(low)} to ${show(high)}`;
  if (lo) return `95 % interval from ${show(low)}, no upper bound`;
  if (hi) return `95 % interval up to ${show(high)}, no lower bound`;
  return 'no interval';
}

/** The background heat flow in use, in words; the default is named as the common-practice value it is. */
export function backgroundText(wPerM2: number, isDefault: boolean): string {
  const mw = `${significant(wPerM2 * 1000, 3)} mW/m²`;
  return isDefault
    ? `${mw}: the built-in default, the continental average ≈ 60 mW/m² (common practice). Change it in Settings if the site's heat flow is known.`
    : `${mw}, as set in Settings.`;
}

/** The view of a forecast answer that carries a recharge estimate; null when it does not (no reservoir or no version). */
export function rechargeView(response: Wire<ForecastWellResponse>, settings: Settings, units: DisplayUnits): RechargeView | null {
  const r = response.recharge;
  const res = response.reservoir;
  if (r === null || res === null) return null;
  const verdict: VerdictKey = r.status === 'no-fit' ? 'no-fit' : r.verdict;
  const power = (w: number): string => formatPower(w, units);
  const f = r.rechargeFraction.value;
  const qr = r.rechargeHeatFlowW.value;
  const qbA = r.backgroundHeatFlowW;
  const qb = res.backgroundHeatFlowWPerM2 ?? settings.backgroundHeatFlowWPerM2 ?? DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2;
  const isDefault = settings.source?.backgroundHeatFlowWPerM2 !== undefined
    ? settings.source.backgroundHeatFlowWPerM2 === 'default'
    : qb === DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2;

  let fractionNote = '';
  if (verdict !== 'no-fit' && f !== null && Number.isFinite(f)) {
    if (f < 0) {
      fractionNote = `Negative: not a recharge but the measure of the missing volume — the decline behaves as if only about ${pct(r.ratio.value, 0)} of the assumed rock were swept.`;
    } else if (verdict === 'recharge') fractionNote = `About ${pct(f, 0)} of the heat being extracted is being replenished.`;
  }

  let comparedWithBackground: string;
  if (verdict === 'no-fit' || qr === null || qbA === null) comparedWithBackground = 'No comparison: there is no recharge estimate.';
  else if (qr <= 0) comparedWithBackground = `Qr is not positive (${power(qr)}): there is no recharge to set against the background heat flow of ${power(qbA)}.`;
  else {
    const times = r.ratioToBackground;
    const lowQr = r.rechargeHeatFlowW.ci95[0];
    comparedWithBackground = lowQr !== null && lowQr > qbA
      ? `Qr is ${significant(times, 3)} times qb·A (${power(qbA)}): far more than conduction from below can supply, so heat or fluid flows in laterally.`
      : `Qr is ${significant(times, 3)} times qb·A (${power(qbA)}): within reach of conduction from below.`;
  }

  const v = res.version;
  return {
    verdict,
    headline: VERDICT_HEADLINES[verdict],
    interpretation: r.interpretation,
    message: r.message,
    tauFit: { value: years(r.tauFitS.value), interval: intervalText(r.tauFitS.ci95[0], r.tauFitS.ci95[1], (s) => years(s)) },
    tauTheory: years(r.tauTheoryS),
    tauFitYears: { value: toYears(r.tauFitS.value), low: toYears(r.tauFitS.ci95[0]), high: toYears(r.tauFitS.ci95[1]) },
    tauTheoryYears: toYears(r.tauTheoryS),
    ratio: { value: significant(r.ratio.value, 3), interval: intervalText(r.ratio.ci95[0], r.ratio.ci95[1], (x) => significant(x, 3)) },
    fraction: { value: pct(f), interval: intervalText(r.rechargeFraction.ci95[0], r.rechargeFraction.ci95[1], (x) => pct(x)) },
    fractionNote,
    rechargeHeatFlow: { value: power(qr ?? NaN), interval: intervalText(r.rechargeHeatFlowW.ci95[0], r.rechargeHeatFlowW.ci95[1], power) },
    backgroundHeatFlow: power(qbA ?? NaN),
    comparedWithBackground,
    reservoir: {
      name: res.name,
      field: response.fit.well.field,
      version: v.version,
      recordedAt: v.recordedAt,
      recordedBy: v.recordedBy,
      note: v.note,
      tauAtOwnFlow: years(res.theory.tau.value),
      ownMassFlowKgPerS: res.theory.massFlow.value,
      meanMassFlowKgPerS: res.meanMassFlowKgPerS,
      areaM2: res.areaM2,
    },
    background: { wPerM2: qb, text: backgroundText(qb, isDefault), short: `qb = ${significant(qb * 1000, 3)} mW/m²${isDefault ? ' (default)' : ''}`, isDefault },
  };
}

/** One line of a recharge table (reservoir screen): the well's ratio, fraction and verdict, short. */
export interface RechargeLine {
  ratio: string;
  fraction: string;
  tauFit: string;
  tauTheory: string;
  verdict: VerdictKey;
  headline: string;
}

export function rechargeLine(view: RechargeView): RechargeLine {
  return {
    ratio: view.ratio.value,
    fraction: view.fraction.value,
    tauFit: view.tauFit.value,
    tauTheory: view.tauTheory,
    verdict: view.verdict,
    headline: view.headline,
  };
}
