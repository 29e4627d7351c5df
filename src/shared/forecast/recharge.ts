/**
 * Recharge: the fitted decline against the lumped theory (DOMAIN.md §7).
 *
 * With the lumped balance plus a recharge term, C·dθ/dt = −ṁ·cw·θ + Qr, so for any fitted model
 *   Qr(t) = ṁ·cw·θfit(t) + C·dθfit/dt,
 * evaluated now; on the mass basis dθ/dt = ṁ·dθ/dM. The recharge fraction f = Qr/(ṁ·cw·θ) is the share of
 * the extracted heat being replenished; for the exponential it is f = 1 − τtheory/τfit, and in general
 * f = 1 − τtheory/τeff with the effective time constant τeff = −θ/(dθ/dt) now. R = τfit/τtheory = 1/(1 − f).
 * On the mass basis R is the ratio of characteristic masses Mc,fit/Mc,theory and does not depend on flow.
 *
 * Intervals: for the exponential, from τ's Student-t interval through the monotone maps above; for the
 * other models, from seeded draws of the parameters (quantiles of f and Qr; R and τ follow from f).
 */
import { InputError, requireFinite, requirePositive } from '../errors.js';
import { declineSlope, declineValue } from '../fit/models.js';
import type { DeclineParameters, FitResult } from '../fit/types.js';
import type { ReservoirTheory } from '../reservoir/theory.js';
import { columnQuantiles } from './quantiles.js';
import { DEFAULT_SAMPLES, DEFAULT_SEED, sampleParameters, writeParameters } from './sampling.js';
import { percent, ratio, watts } from './words.js';

export interface RechargeOptions {
  theory: ReservoirTheory;
  areaM2: number;
  meanMassFlowKgPerS?: number;
  backgroundHeatFlowWPerM2?: number;
  nowX?: number;
  samples?: number;
  seed?: number;
}

export type RechargeVerdict = 'recharge' | 'consistent-with-none' | 'faster-than-theory';

export interface Interval {
  value: number;
  ci95: [number, number];
}

export interface RechargeResult {
  status: 'ok' | 'no-fit';
  message: string;
  tauFitS: Interval;
  tauTheoryS: number;
  ratio: Interval;
  rechargeFraction: Interval;
  rechargeHeatFlowW: Interval;
  backgroundHeatFlowW: number;
  ratioToBackground: number;
  verdict: RechargeVerdict;
  interpretation: string;
}

/** Continental average conductive heat flow, W/m² (common practice). */
export const DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2 = 0.06;

export function estimateRecharge(fit: FitResult, options: RechargeOptions): RechargeResult {
  const o = options;
  if (o === null || typeof o !== 'object') throw new InputError('recharge options are missing', { field: 'options' });
  const theory = o.theory;
  if (theory === null || typeof theory !== 'object') throw new InputError('the reservoir theory is required', { field: 'theory' });
  const capacity = requirePositive(theory.heatCapacityJPerK, 'theory.heatCapacityJPerK');
  const cw = requirePositive(theory.fluid?.specificHeatJPerKgK, 'theory.fluid.specificHeatJPerKgK');
  const area = requirePositive(o.areaM2, 'areaM2');
  const qb = o.backgroundHeatFlowWPerM2 === undefined ? DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2 : requirePositive(o.backgroundHeatFlowWPerM2, 'backgroundHeatFlowWPerM2');
  const samples = o.samples === undefined ? DEFAULT_SAMPLES : requireCount(o.samples, 'samples');
  const seed = o.seed === undefined ? DEFAULT_SEED : requireFinite(o.seed, 'seed');
  if (!Number.isSafeInteger(seed)) throw new InputError(`must be an integer (got ${seed})`, { field: 'seed' });
  let flow: number;
  let message = '';
  if (o.meanMassFlowKgPerS !== undefined) flow = requirePositive(o.meanMassFlowKgPerS, 'meanMassFlowKgPerS');
  else if (fit.basis === 'time') throw new InputError('a time-basis recharge estimate needs the mean mass flow of the fit window', { field: 'meanMassFlowKgPerS' });
  else {
    flow = requirePositive(theory.massFlowKgPerS, 'theory.massFlowKgPerS');
    message = `no mean flow of the fit window given: R and f do not depend on it (mass basis), but τ and Qr are stated at the theory's flow of ${flow} kg/s`;
  }
  const background = qb * area;
  const tauTheory = capacity / (flow * cw);

  if (fit.status !== 'converged') {
    const nan: Interval = { value: NaN, ci95: [NaN, NaN] };
    const why = `no recharge estimate: the ${fit.model} fit did not converge (status ${fit.status})${fit.message !== '' ? `: ${fit.message}` : ''}`;
    return {
      status: 'no-fit', message: why,
      tauFitS: nan, tauTheoryS: tauTheory, ratio: nan, rechargeFraction: nan, rechargeHeatFlowW: nan,
      backgroundHeatFlowW: background, ratioToBackground: NaN,
      verdict: 'consistent-with-none', interpretation: why,
    };
  }

  const nowX = o.nowX === undefined ? fit.xRange[1] : requireFinite(o.nowX, 'nowX');
  // dθ/dt per unit dθ/dx: 1 on the time basis, ṁ on the mass basis (dM = ṁ·dt).
  const dxdt = fit.basis === 'time' ? 1 : flow;
  const fractionOf = (p: DeclineParameters): number => {
    const theta = declineValue(fit.model, p, nowX);
    return 1 + (capacity * dxdt * declineSlope(fit.model, p, nowX)) / (flow * cw * theta);
  };
  const thetaNow = declineValue(fit.model, fit.estimates, nowX);
  const extractedW = flow * cw * thetaNow;
  const f = fractionOf(fit.estimates);

  let fCi: [number, number];
  let qrCi: [number, number];
  if (fit.model === 'exponential') {
    // τ's Student-t interval in seconds (Mc/ṁ on the mass basis), mapped by f = 1 − τth/τ, increasing in τ > 0.
    // An interval end at τ ≤ 0 means no lower bound on f.
    const fOfTau = (tauS: number): number => (Number.isNaN(tauS) ? NaN : tauS > 0 ? 1 - tauTheory / tauS : -Infinity);
    const [lo, hi] = (fit.parameters.tau?.ci95 ?? [NaN, NaN]).map((v) => v / dxdt);
    fCi = [fOfTau(lo), fOfTau(hi)];
    qrCi = [extractedW * fCi[0], extractedW * fCi[1]];
  } else {
    try {
      [fCi, qrCi] = sampledIntervals(fit, samples, seed, nowX, (p) => fractionOf(p), flow * cw);
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      fCi = [NaN, NaN];
      qrCi = [NaN, NaN];
      message = [message, `the fit's covariance cannot be sampled (${e.reason}): no intervals`].filter((m) => m !== '').join('; ');
    }
  }

  const qr = f * extractedW;
  const ratioOf = (fr: number): number => (fr < 1 ? 1 / (1 - fr) : Infinity);
  const rValue = ratioOf(f);
  const rCi: [number, number] = [ratioOf(fCi[0]), ratioOf(fCi[1])];
  const verdict: RechargeVerdict = rCi[0] > 1 ? 'recharge' : rCi[1] < 1 ? 'faster-than-theory' : 'consistent-with-none';
  const result: RechargeResult = {
    status: 'ok', message,
    tauFitS: { value: rValue * tauTheory, ci95: [rCi[0] * tauTheory, rCi[1] * tauTheory] },
    tauTheoryS: tauTheory,
    ratio: { value: rValue, ci95: rCi },
    rechargeFraction: { value: f, ci95: fCi },
    rechargeHeatFlowW: { value: qr, ci95: qrCi },
    backgroundHeatFlowW: background,
    ratioToBackground: qr / background,
    verdict,
    interpretation: '',
  };
  result.interpretation = interpret(result, qb, area, extractedW);
  return result;
}

/** 95 % intervals of f and Qr from seeded parameter draws (2.5th and 97.5th percentiles). */
function sampledIntervals(
  fit: FitResult, count: number, seed: number, nowX: number,
  fractionOf: (p: DeclineParameters) => number, flowTimesCw: number,
): [[number, number], [number, number]] {
  // A draw whose θ now is not positive has no recharge fraction: refused and counted like τ ≤ 0.
  const drawn = sampleParameters(fit, count, seed, (p) => declineValue(fit.model, p, nowX) > 0);
  if (drawn.count === 0) return [[NaN, NaN], [NaN, NaN]];
  const fs = new Float64Array(drawn.count);
  const qs = new Float64Array(drawn.count);
  const p: DeclineParameters = { ...fit.estimates };
  for (let s = 0; s < drawn.count; s++) {
    writeParameters(drawn.names, drawn.values, s * drawn.names.length, p);
    fs[s] = fractionOf(p);
    qs[s] = fs[s] * flowTimesCw * declineValue(fit.model, p, nowX);
  }
  const [fLo, fHi] = columnQuantiles(fs, 1, drawn.count, [0.025, 0.975]);
  const [qLo, qHi] = columnQuantiles(qs, 1, drawn.count, [0.025, 0.975]);
  return [[fLo[0], fHi[0]], [qLo[0], qHi[0]]];
}

function interpret(r: RechargeResult, qb: number, area: number, extractedW: number): string {
  const R = r.ratio, f = r.rechargeFraction, q = r.rechargeHeatFlowW;
  const rText = `R = τfit/τtheory = ${ratio(R.value)} (95 % interval ${ratio(R.ci95[0])} to ${ratio(R.ci95[1])})`;
  const bg = `the background conductive heat flow through the footprint (qb·A = ${watts(r.backgroundHeatFlowW)} at ${Number((qb * 1000).toPrecision(3))} mW/m² over ${Number((area / 1e6).toPrecision(3))} km²)`;
  switch (r.verdict) {
    case 'recharge': {
      const head = `The reservoir cools more slowly than its parameters predict: ${rText}. About ${percent(f.value)} of the extracted heat is being replenished (f = ${f.value.toPrecision(3)}), Qr ≈ ${watts(q.value)} now.`;
      if (q.ci95[0] > r.backgroundHeatFlowW) {
        return `${head} That is ${r.ratioToBackground.toPrecision(3)} times ${bg}: far more than conduction from below can supply, so heat or fluid flows in laterally.`;
      }
      return `${head} That is within reach of ${bg}: conduction from below can account for it.`;
    }
    case 'faster-than-theory':
      return `The reservoir cools faster than its parameters allow: ${rText}. The swept rock volume is smaller than assumed — about ${percent(R.value)} of the assumed volume — ` +
        'most likely because the flow short-circuits along fractures. ' +
        `The recharge fraction f = ${f.value.toPrecision(3)} is negative: that is not a recharge but the measure of the missing volume.`;
    case 'consistent-with-none': {
      const lean = R.value < 0.995
        ? ` Taken alone, the central value would mean a swept volume somewhat smaller than assumed (about ${percent(R.value)}), but the interval includes the theory.`
        : '';
      return `The fitted decline agrees with the theory within its uncertainty: ${rText} spans 1, so no recharge (and no loss of swept volume) is detectable.${lean} ` +
        `For scale, ${bg} is ${percent(r.backgroundHeatFlowW / extractedW)} of the extracted power ${watts(extractedW)}.`;
    }
  }
}

function requireCount(value: number, field: string): number {
  const v = requireFinite(value, field);
  if (!Number.isInteger(v) || v < 1) throw new InputError(`must be an integer ≥ 1 (got ${v})`, { field });
  return v;
}
