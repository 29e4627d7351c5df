/**
 * Forecast and end of economic life (DOMAIN.md §8): the fitted decline projected from now to now + horizon,
 * with percentile bands from the fit's parameter uncertainty, the time θ reaches the economic limit, the
 * current thermal power ṁ·cw·θ and the heat still producible before the limit.
 *
 * Trade convention (petroleum reserves): P90 is the value exceeded with 90 % probability — the low case,
 * the 10th percentile; P10 the high case, the 90th percentile; P50 the median.
 *
 * On the mass basis θ is a function of produced mass M; at the planned flow M advances as ṁplan per second,
 * so a basis value turns into a time by t = tnow + (M − Mnow)/ṁplan.
 */
import { InputError, requireFinite, requirePositive } from '../errors.js';
import { basisWhereThetaFalls, declineIntegral, declineValue } from '../fit/models.js';
import type { Basis, DeclineModel, FitResult } from '../fit/types.js';
import { gridValues, runEnsemble, type EnsembleGrid } from './ensemble.js';
import { StreamingQuantiles, columnQuantiles } from './quantiles.js';
import { DEFAULT_SAMPLES, DEFAULT_SEED, sampleParameters, type ParameterSamples } from './sampling.js';
import { kelvin, kilograms, percent, watts, years } from './words.js';

export type EconomicLimit =
  | { kind: 'temperature'; thetaEconK: number }
  | { kind: 'power'; minPowerW: number };

export interface ForecastOptions {
  limit: EconomicLimit;
  horizonS: number;
  nowX?: number;
  nowTimeS?: number;
  plannedMassFlowKgPerS?: number;
  specificHeatJPerKgK?: number;
  samples?: number;
  seed?: number;
  gridPoints?: number;
}

/** P90 = low case = 10th percentile, P10 = high case = 90th percentile. */
export interface Percentiles {
  p90: number | null;
  p50: number | null;
  p10: number | null;
}

export interface ForecastResult {
  model: DeclineModel;
  basis: Basis;
  status: 'ok' | 'no-fit';
  message: string;
  thetaEconK: number;
  nowTimeS: number;
  horizonEndS: number;
  band: { timeS: number[]; central: number[]; p90: number[]; p50: number[]; p10: number[] };
  /** Times in s after the series origin; null = not within the horizon. P90 is the shortest life. */
  endOfLife: Percentiles & {
    centralS: number | null;
    unit: 's';
    reached: boolean;
    alreadyReached: boolean;
    fractionReachedWithinHorizon: number;
  };
  currentThetaK: number;
  currentPowerW: number | null;
  remainingHeatJ: (Percentiles & { central: number | null }) | null;
  remainingHeatToHorizon: boolean;
  samplesUsed: number;
  samplesRejected: number;
  seed: number;
  notes: string[];
}

export const DEFAULT_GRID_POINTS = 121;
/** Keeps the ensemble (samples × grid points doubles) within ~160 MB. */
const MAX_ENSEMBLE_VALUES = 20_000_000;
/** The trade's P90, P50, P10 are these quantiles, in this order. */
const PROBABILITIES = [0.1, 0.5, 0.9] as const;

interface Plan {
  thetaEconK: number;
  horizonS: number;
  flow: number | null;
  cw: number | null;
  samples: number;
  seed: number;
  gridPoints: number;
  notes: string[];
}

export function forecastDecline(fit: FitResult, options: ForecastOptions): ForecastResult {
  const plan = readPlan(fit.basis, options);
  if (fit.status !== 'converged') return noFit(fit, options, plan);

  const { thetaEconK, horizonS, flow, cw, notes } = plan;
  const basis = fit.basis;
  const model = fit.model;
  const est = fit.estimates;

  // Now, on the basis and in time.
  let nowX: number, nowTimeS: number;
  if (basis === 'time') {
    nowX = options.nowX !== undefined ? requireFinite(options.nowX, 'nowX') : options.nowTimeS !== undefined ? requireFinite(options.nowTimeS, 'nowTimeS') : fit.xRange[1];
    if (options.nowX !== undefined && options.nowTimeS !== undefined && options.nowTimeS !== options.nowX) {
      throw new InputError(`on the time basis now is one instant: nowTimeS (${options.nowTimeS} s) must equal nowX (${options.nowX} s) or be left out`, { field: 'nowTimeS' });
    }
    nowTimeS = nowX;
  } else {
    nowX = options.nowX !== undefined ? requireFinite(options.nowX, 'nowX') : fit.xRange[1];
    nowTimeS = requireFinite(options.nowTimeS, 'nowTimeS');
  }
  const horizonEndS = nowTimeS + horizonS;
  // On the mass basis readPlan has made sure the planned flow is there.
  const xOfTime = (t: number): number => (basis === 'time' ? t : nowX + (flow as number) * (t - nowTimeS));
  const timeOfX = (x: number): number => (basis === 'time' ? x : nowTimeS + (x - nowX) / (flow as number));
  const grid: EnsembleGrid = { x0: nowX, xEnd: xOfTime(horizonEndS), points: plan.gridPoints };
  const xs = gridValues(grid);
  const timeS = Array.from(xs, (_, g) => (g === xs.length - 1 ? horizonEndS : nowTimeS + (horizonS * g) / (xs.length - 1)));

  // Heat per unit ∫θ dx: ṁ·cw on the time basis (∫θ dt), cw on the mass basis (∫θ dM, no flow needed).
  const heatFactor = cw === null ? null : basis === 'time' ? (flow === null ? null : flow * cw) : cw;

  // Central estimate.
  const currentThetaK = declineValue(model, est, nowX);
  const central = Array.from(xs, (x) => declineValue(model, est, x));
  const crossing = basisWhereThetaFalls(model, est, thetaEconK);
  const alreadyReached = currentThetaK <= thetaEconK;
  let centralEndX: number;
  if (alreadyReached) centralEndX = nowX;
  else centralEndX = crossing === null || crossing > grid.xEnd ? Infinity : crossing;
  const centralS = Number.isFinite(centralEndX) ? (alreadyReached ? nowTimeS : timeOfX(centralEndX)) : null;
  const centralHeat = heatFactor === null ? null : heatFactor * declineIntegral(model, est, nowX, Math.min(centralEndX, grid.xEnd));

  if (model === 'floor' && (est.thetaInf as number) >= thetaEconK) {
    notes.push(`a floor of ${kelvin(est.thetaInf as number)} lies at or above the limit of ${kelvin(thetaEconK)}: θ levels off before it and the limit is not reached at any horizon`);
  }
  if (alreadyReached) {
    let when = '';
    if (crossing !== null && crossing <= nowX) {
      if (crossing < fit.xRange[0]) when = '; the fitted curve lies below it over the whole fit window';
      else if (basis === 'time') when = `; the fitted curve crossed it at t = ${years(crossing)}`;
      else when = `; the fitted curve crossed it at a produced mass of ${kilograms(crossing)}`;
    }
    notes.push(`θ now (${kelvin(currentThetaK)}) is already at or below the limit (${kelvin(thetaEconK)})${when}; end of life is reported as now`);
  } else if (centralS === null && crossing !== null) {
    notes.push(`the central estimate reaches the limit at t = ${years(timeOfX(crossing))}, beyond the horizon (which ends at t = ${years(horizonEndS)})`);
  }

  // Monte Carlo.
  let samples: ParameterSamples | null = null;
  try {
    samples = sampleParameters(fit, plan.samples, plan.seed, (p) => Number.isFinite(declineValue(model, p, nowX)));
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    notes.push(`the fit's covariance cannot be sampled (${e.reason}); the bands and percentiles show the central estimate only`);
  }
  const used = samples?.count ?? 0;
  const rejected = samples?.rejected ?? 0;
  if (rejected > 0) {
    notes.push(
      `${rejected} of ${used + rejected} parameter draws were rejected (τ ≤ 0${model === 'hyperbolic' ? ' or b ≤ 0' : ''}` +
        `${samples !== null && samples.rejectedByCaller > 0 ? ', or θ undefined now' : ''}); the percentiles come from the ${used} kept`,
    );
  }
  if (samples !== null && used < plan.samples) {
    notes.push(`only ${used} of the ${plan.samples} samples asked for could be drawn: the parameter uncertainty is very large compared with the estimates`);
  }

  let band: ForecastResult['band'];
  let eol: Percentiles;
  let heat: Percentiles | null;
  let fractionReached: number;
  let anyCutAtHorizon: boolean;
  if (samples !== null && used > 0) {
    const bands = new StreamingQuantiles(used, PROBABILITIES, grid.points);
    const ensemble = runEnsemble(samples, grid, thetaEconK, (theta) => bands.add(theta));
    const [p90, p50, p10] = bands.out;
    band = { timeS, central, p90: Array.from(p90), p50: Array.from(p50), p10: Array.from(p10) };
    let reachedCount = 0;
    const endS = new Float64Array(used);
    for (let s = 0; s < used; s++) {
      const x = ensemble.endX[s];
      if (Number.isFinite(x)) reachedCount++;
      endS[s] = Number.isFinite(x) ? timeOfX(x) : Infinity;
    }
    fractionReached = reachedCount / used;
    anyCutAtHorizon = reachedCount < used;
    eol = percentiles(columnQuantiles(endS, 1, used, PROBABILITIES));
    if (heatFactor === null) heat = null;
    else {
      const q = new Float64Array(used);
      for (let s = 0; s < used; s++) q[s] = heatFactor * ensemble.integral[s];
      heat = percentiles(columnQuantiles(q, 1, used, PROBABILITIES));
    }
    if (fractionReached > 0 && fractionReached < 1) {
      notes.push(`${percent(1 - fractionReached)} of the samples do not reach the limit within the horizon; a percentile that falls among them is null (not reached within the horizon)`);
    }
  } else {
    band = { timeS, central, p90: [...central], p50: [...central], p10: [...central] };
    const c = centralS;
    eol = { p90: c, p50: c, p10: c };
    heat = centralHeat === null ? null : { p90: centralHeat, p50: centralHeat, p10: centralHeat };
    fractionReached = centralS === null ? 0 : 1;
    anyCutAtHorizon = centralS === null;
  }

  const currentPowerW = flow !== null && cw !== null ? flow * cw * currentThetaK : null;
  const remainingHeatToHorizon = heatFactor !== null && (centralS === null || anyCutAtHorizon);
  if (remainingHeatToHorizon) {
    notes.push('where the limit is not reached within the horizon, remaining heat is counted only to the end of the horizon (a lower bound)');
  }
  return {
    model, basis, status: 'ok', message: '',
    thetaEconK, nowTimeS, horizonEndS,
    band,
    endOfLife: { ...eol, centralS, unit: 's', reached: eol.p50 !== null, alreadyReached, fractionReachedWithinHorizon: fractionReached },
    currentThetaK,
    currentPowerW,
    remainingHeatJ: heat === null ? null : { ...heat, central: centralHeat },
    remainingHeatToHorizon,
    samplesUsed: used, samplesRejected: rejected, seed: plan.seed,
    notes,
  };
}

function percentiles([p90, p50, p10]: Float64Array[]): Percentiles {
  const v = (a: Float64Array): number | null => (Number.isFinite(a[0]) ? a[0] : null);
  return { p90: v(p90), p50: v(p50), p10: v(p10) };
}

/** Checks the options that do not depend on the fit having worked, and derives θecon. */
function readPlan(basis: Basis, o: ForecastOptions): Plan {
  if (o === null || typeof o !== 'object') throw new InputError('forecast options are missing', { field: 'options' });
  const notes: string[] = [];
  const horizonS = requirePositive(o.horizonS, 'horizonS');
  const flow = o.plannedMassFlowKgPerS === undefined ? null : requirePositive(o.plannedMassFlowKgPerS, 'plannedMassFlowKgPerS');
  const cw = o.specificHeatJPerKgK === undefined ? null : requirePositive(o.specificHeatJPerKgK, 'specificHeatJPerKgK');
  const samples = integerOption(o.samples, DEFAULT_SAMPLES, 1, 'samples');
  const gridPoints = integerOption(o.gridPoints, DEFAULT_GRID_POINTS, 2, 'gridPoints');
  if (samples * gridPoints > MAX_ENSEMBLE_VALUES) {
    throw new InputError(`samples × gridPoints = ${samples * gridPoints} is more than ${MAX_ENSEMBLE_VALUES}; ask for fewer samples or grid points`, { field: 'samples' });
  }
  const seed = o.seed === undefined ? DEFAULT_SEED : requireFinite(o.seed, 'seed');
  if (!Number.isSafeInteger(seed)) throw new InputError(`must be an integer (got ${seed})`, { field: 'seed' });
  if (basis === 'mass') {
    if (flow === null) throw new InputError('a mass-basis forecast needs the planned mass flow to turn produced mass into time', { field: 'plannedMassFlowKgPerS' });
    if (o.nowTimeS === undefined) throw new InputError('a mass-basis forecast needs the time of now (s after the series origin)', { field: 'nowTimeS' });
  }

  let thetaEconK: number;
  const limit = o.limit;
  if (limit === null || typeof limit !== 'object') throw new InputError('an economic limit is required', { field: 'limit' });
  if (limit.kind === 'temperature') {
    // θ is the excess over the minimum useful temperature; a limit at or below it is never reached by a decline.
    thetaEconK = requirePositive(limit.thetaEconK, 'limit.thetaEconK');
  } else if (limit.kind === 'power') {
    const pMin = requirePositive(limit.minPowerW, 'limit.minPowerW');
    if (flow === null) throw new InputError('an economic limit by power needs the planned mass flow', { field: 'plannedMassFlowKgPerS' });
    if (cw === null) throw new InputError('an economic limit by power needs the specific heat of the fluid', { field: 'specificHeatJPerKgK' });
    thetaEconK = pMin / (flow * cw);
    notes.push(`economic limit by power: θecon = Pmin/(ṁplan·cw) = ${watts(pMin)} / (${flow} kg/s × ${cw} J/(kg·K)) = ${kelvin(thetaEconK)}`);
  } else {
    throw new InputError(`unknown kind "${String((limit as { kind?: unknown }).kind)}" (expected "temperature" or "power")`, { field: 'limit.kind' });
  }
  if (cw === null) notes.push('no specific heat given: current power and remaining heat are not computed');
  else if (basis === 'time' && flow === null) notes.push('no planned mass flow given: current power and remaining heat are not computed');
  if (basis === 'time' && flow !== null) {
    notes.push('time-basis fit: the decline is assumed to go on as during the fit window; the planned flow only scales power and heat (fit against produced mass to forecast a change of flow)');
  }
  return { thetaEconK, horizonS, flow, cw, samples, seed, gridPoints, notes };
}

function integerOption(value: number | undefined, fallback: number, min: number, field: string): number {
  if (value === undefined) return fallback;
  const v = requireFinite(value, field);
  if (!Number.isInteger(v) || v < min) throw new InputError(`must be an integer ≥ ${min} (got ${v})`, { field });
  return v;
}

function noFit(fit: FitResult, o: ForecastOptions, plan: Plan): ForecastResult {
  const nowTimeS = o.nowTimeS ?? (fit.basis === 'time' ? (o.nowX ?? fit.xRange[1]) : NaN);
  const reason = fit.message !== '' ? `: ${fit.message}` : '';
  return {
    model: fit.model, basis: fit.basis, status: 'no-fit',
    message: `no forecast: the ${fit.model} fit did not converge (status ${fit.status})${reason}`,
    thetaEconK: plan.thetaEconK, nowTimeS, horizonEndS: nowTimeS + plan.horizonS,
    band: { timeS: [], central: [], p90: [], p50: [], p10: [] },
    endOfLife: { p90: null, p50: null, p10: null, centralS: null, unit: 's', reached: false, alreadyReached: false, fractionReachedWithinHorizon: 0 },
    currentThetaK: NaN, currentPowerW: null, remainingHeatJ: null, remainingHeatToHorizon: false,
    samplesUsed: 0, samplesRejected: 0, seed: plan.seed,
    notes: plan.notes,
  };
}
