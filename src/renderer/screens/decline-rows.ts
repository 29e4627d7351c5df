/**
 * What the decline screen writes in words: the table of candidate models (AICc, ΔAICc, parameters
 * with 95 % intervals and units, status) and the facts strip (now, τ fitted and theoretical, end of
 * life, remaining heat, power, readings used). Pure: strings from the wire records and a Display.
 *
 * τ is shown in years of 365.25 d. On the mass basis the fitted decline constant is the
 * characteristic mass Mc = C/cw (DOMAIN.md §4); τ is then Mc/ṁ at the mean mass flow of the window.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { FitWellResponse, ForecastWellResponse } from '../../shared/contract/fits.js';
import type { AutoFitResult, Basis, DeclineModel, FitResult, ParameterName } from '../../shared/fit/types.js';
import { fixed, type Display } from '../app/display.js';
import { massUnit } from '../charts/decline-data.js';
import { MODEL_WORDS } from '../charts/decline-overlay.js';

export const MODEL_LABELS: Record<DeclineModel | 'auto', string> = {
  exponential: 'Exponential',
  floor: 'Exponential to a floor',
  hyperbolic: 'Hyperbolic (Arps)',
  auto: 'Best by AICc (auto)',
};

type WireFit = Wire<FitResult> | Wire<AutoFitResult>;

export interface CandidateRow {
  model: DeclineModel;
  label: string;
  /** The model the screen draws and forecasts with. */
  chosen: boolean;
  status: string;
  converged: boolean;
  aicc: string;
  deltaAicc: string;
  /** Parameter cells: value with its 95 % interval and unit; '—' where the model has no such parameter. */
  theta0: string;
  tau: string;
  thetaInf: string;
  b: string;
  rmse: string;
  message: string;
}

const finite = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** Three significant figures without exponent for the sizes met here. */
function sig3(v: number): string {
  if (!Number.isFinite(v)) return '—';
  const a = Math.abs(v);
  const digits = a >= 100 ? 0 : a >= 10 ? 1 : a >= 1 ? 2 : 3;
  return fixed(v, digits);
}

/** The cell of one parameter: '52.3 K (51.9–52.7)'. */
/**
 * A parameter with its 95 % interval. `withInterval: false` for a fit that stopped without an
 * optimum (max-iterations, singular): its values are the last iterate, so an interval around them
 * would mean nothing. A fit at a bound did reach the constrained optimum and keeps its intervals.
 */
export function parameterCell(name: ParameterName, basis: Basis, est: Wire<FitResult>['parameters'][ParameterName] | undefined, display: Display, withInterval = true): string {
  if (est === undefined || !finite(est.value)) return '—';
  const [lo, hi] = withInterval ? est.ci95 ?? [] : [];
  const range = (f: (v: number) => string): string => (finite(lo) && finite(hi) ? ` (${f(lo)}–${f(hi)})` : '');
  switch (name) {
    case 'theta0':
    case 'thetaInf': {
      const unit = display.unit('temperatureDifference');
      const f = (v: number): string => fixed(display.value('temperatureDifference', v), 1);
      return `${f(est.value)} ${unit}${range(f)}`;
    }
    case 'tau': {
      if (basis === 'time') return `${display.years(est.value)}${finite(lo) && finite(hi) ? ` (${display.yearsRange(lo, hi).replace(' yr', '')})` : ''}`;
      const m = massUnit(display.units);
      const f = (v: number): string => sig3(v * m.perKg);
      return `Mc ${f(est.value)} ${m.label}${range(f)}`;
    }
    case 'b':
      return `${fixed(est.value, 3)}${range((v) => fixed(v, 3))}`;
  }
}

/** Every candidate model of the fit (one row for a single-model fit); the chosen one marked. */
export function candidateRows(fit: WireFit, display: Display): CandidateRow[] {
  const candidates: Wire<FitResult>[] = 'candidates' in fit && Array.isArray(fit.candidates) && fit.candidates.length > 0 ? fit.candidates : [fit];
  const best = Math.min(...candidates.filter((c) => c.converged && finite(c.aicc)).map((c) => c.aicc));
  return candidates.map((c) => {
    const cell = (name: ParameterName): string => (c.parameterNames.includes(name) ? parameterCell(name, c.basis, c.parameters[name], display, c.status === 'converged' || c.status === 'at-bound') : '—');
    return {
      model: c.model,
      label: MODEL_LABELS[c.model],
      chosen: c.model === fit.model,
      status: c.status,
      converged: c.converged,
      aicc: finite(c.aicc) ? fixed(c.aicc, 1) : '—',
      deltaAicc: finite(c.aicc) && Number.isFinite(best) && c.converged ? fixed(c.aicc - best, 1) : '—',
      theta0: cell('theta0'),
      tau: cell('tau'),
      thetaInf: cell('thetaInf'),
      b: cell('b'),
      rmse: finite(c.rmseK) ? display.format('temperatureDifference', c.rmseK, 2) : '—',
      message: c.message,
    };
  });
}

export interface Fact {
  label: string;
  value: string;
  note?: string;
  /** 'warn' draws the fact as a caution (a limit already reached, a forecast that failed). */
  tone?: 'warn';
}

/** The latest reading the fit would use: its instant and production temperature. */
export interface NowReading { ms: number; celsius: number }

export interface FactsInput {
  display: Display;
  trefC: number | null;
  now: NowReading | null;
  /** Readings of the whole record the fit would use / leave out (before a fit arrives). */
  recordCounts: { included: number; excluded: number };
  fit: Wire<FitWellResponse> | null;
  forecast: Wire<ForecastWellResponse> | null;
  /** Why there is no forecast (the refusal of forecastWell), if so. */
  forecastProblem: string | null;
  /** Why no fit is made at all (no Tref), if so; otherwise a missing fit is still coming. */
  fitProblem?: string | null;
}

/** τ of the chosen fit in seconds with its interval: on the mass basis Mc/ṁ at the window's mean flow. */
export function fittedTauS(fit: Wire<FitWellResponse>): { value: number; lo: number | null; hi: number | null; note: string } | null {
  const tau = fit.fit.parameters.tau;
  if (fit.fit.status !== 'converged' || tau === undefined || !finite(tau.value)) return null;
  const [lo, hi] = tau.ci95 ?? [];
  if (fit.basis === 'time') return { value: tau.value, lo: finite(lo) ? lo : null, hi: finite(hi) ? hi : null, note: '' };
  const flow = fit.meanMassFlowKgPerS;
  if (!finite(flow) || !(flow > 0)) return null;
  return {
    value: tau.value / flow,
    lo: finite(lo) ? lo / flow : null,
    hi: finite(hi) ? hi / flow : null,
    note: `Mc/ṁ at the window's mean flow`,
  };
}

function endOfLifeText(display: Display, originMs: number, s: number | null, reached: boolean, horizonYears: number): string {
  if (reached) return 'reached';
  if (!finite(s)) return `not within ${fixed(horizonYears, 0)} yr`;
  return display.date(originMs + 1000 * s);
}

export function facts(input: FactsInput): Fact[] {
  const { display, trefC, now, fit, forecast } = input;
  const out: Fact[] = [];
  out.push({
    label: 'Production temperature now',
    value: now === null ? '—' : display.formatCelsius(now.celsius),
    note: now === null ? 'no reading the fit would use' : `latest reading used, ${display.date(now.ms)}`,
  });
  out.push({
    label: 'θ now (T − Tref)',
    value: now === null || trefC === null ? '—' : display.format('temperatureDifference', now.celsius - trefC),
    note: trefC === null ? 'no Tref set for this well' : `Tref ${display.formatCelsius(trefC)}`,
  });

  const tau = fit === null ? null : fittedTauS(fit);
  out.push({
    label: `Fitted τ${fit === null ? '' : ` (${MODEL_WORDS[fit.fit.model]})`}`,
    value: tau === null ? '—' : display.years(tau.value),
    note: tau === null
      ? (fit === null ? (input.fitProblem ?? 'fitting…') : fit.fit.message || `fit status: ${fit.fit.status}`)
      : `95 %: ${display.yearsRange(tau.lo, tau.hi)}${tau.note === '' ? '' : `; ${tau.note}`}`,
  });

  const theoryS = forecast?.recharge !== null && forecast?.recharge !== undefined && finite(forecast.recharge.tauTheoryS)
    ? forecast.recharge.tauTheoryS
    : forecast?.reservoir?.theory.tau.value ?? null;
  out.push({
    label: 'Theoretical τ',
    value: finite(theoryS) ? display.years(theoryS) : '—',
    note: forecast?.reservoir === null || forecast?.reservoir === undefined
      ? (forecast === null ? '' : 'no reservoir parameters for this well')
      : `${forecast.reservoir.name} v${forecast.reservoir.version.version}, at ${fixed(forecast.reservoir.meanMassFlowKgPerS, 1)} kg/s`,
  });

  const fc = forecast?.forecast;
  if (fc !== undefined && fc.status === 'ok') {
    const origin = Date.parse(forecast?.fit.timeOrigin ?? '');
    const eol = fc.endOfLife;
    const h = forecast?.horizonYears ?? 30;
    const cases: [string, number | null][] = [['P90 (low case)', eol.p90], ['P50', eol.p50], ['P10 (high case)', eol.p10]];
    for (const [name, s] of cases) {
      out.push({ label: `End of life ${name}`, value: endOfLifeText(display, origin, s, eol.alreadyReached, h), tone: eol.alreadyReached ? 'warn' : undefined });
    }
    const heat = fc.remainingHeatJ;
    out.push({
      label: 'Remaining heat to the limit (P50)',
      value: heat === null ? '—' : display.format('energy', heat.p50),
      note: heat === null ? 'not computed' : `P90–P10: ${display.format('energy', heat.p90)} – ${display.format('energy', heat.p10)}${fc.remainingHeatToHorizon ? '; to the horizon where the limit is not reached (a lower bound)' : ''}`,
    });
    out.push({
      label: 'Thermal power now',
      value: display.format('power', fc.currentPowerW),
      note: forecast === null ? undefined : `at ${fixed(forecast.plannedFlow.valueKgPerS, 1)} kg/s planned flow`,
    });
  } else {
    out.push({
      label: 'End of life and remaining heat',
      value: '—',
      note: input.forecastProblem ?? (fc !== undefined ? fc.message : forecast === null && fit === null ? 'forecasting…' : 'no forecast'),
      tone: input.forecastProblem !== null || (fc !== undefined && fc.status !== 'ok') ? 'warn' : undefined,
    });
  }

  const counts = fit?.counts;
  const used = counts?.included ?? input.recordCounts.included;
  const excluded = counts === undefined ? input.recordCounts.excluded : counts.readings - counts.included;
  out.push({
    label: 'Readings used / excluded',
    value: `${used.toLocaleString('en-US')} / ${excluded.toLocaleString('en-US')}`,
    note: counts === undefined ? 'whole record' : fit?.window.from === null && fit?.window.to === null ? 'whole record' : 'in the fit window',
  });
  return out;
}
