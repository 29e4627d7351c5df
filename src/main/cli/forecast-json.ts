/** The JSON form of one group's forecast and recharge estimate: SI, times in s after the series' first point. */
import { reservoirTheoryToJson } from '../../shared/reservoir/params.js';
import type { ForecastResult } from '../../shared/forecast/forecast.js';
import type { RechargeResult } from '../../shared/forecast/recharge.js';
import type { ReservoirParams, ReservoirTheory } from '../../shared/reservoir/theory.js';
import type { SeriesGroup } from './csv-series.js';
import type { FitJson } from './fit-json.js';
import { finiteOrNull } from './json.js';
import type { SpecificHeat } from './specific-heat.js';

type Interval = [number | null, number | null];

function interval(ci: readonly [number, number]): Interval {
  return [finiteOrNull(ci[0]), finiteOrNull(ci[1])];
}

export function forecastToJson(
  group: SeriesGroup, f: ForecastResult, cp: SpecificHeat, plannedFlowKgPerS: number | undefined, fit: FitJson, recharge: unknown,
): Record<string, unknown> {
  const heat = f.remainingHeatJ;
  return {
    group: group.group,
    model: f.model,
    status: f.status,
    message: f.message,
    endOfLife: {
      p90: finiteOrNull(f.endOfLife.p90),
      p50: finiteOrNull(f.endOfLife.p50),
      p10: finiteOrNull(f.endOfLife.p10),
      unit: 's',
      reached: f.endOfLife.reached,
      central: finiteOrNull(f.endOfLife.centralS),
      alreadyReached: f.endOfLife.alreadyReached,
      fractionReachedWithinHorizon: finiteOrNull(f.endOfLife.fractionReachedWithinHorizon),
    },
    band: {
      unit: 'K',
      timeUnit: 's',
      time: f.band.timeS,
      central: f.band.central,
      p90: f.band.p90,
      p50: f.band.p50,
      p10: f.band.p10,
    },
    remainingHeat: {
      p90: finiteOrNull(heat?.p90),
      p50: finiteOrNull(heat?.p50),
      p10: finiteOrNull(heat?.p10),
      central: finiteOrNull(heat?.central),
      unit: 'J',
      toHorizon: f.remainingHeatToHorizon,
    },
    currentPower: { value: finiteOrNull(f.currentPowerW), unit: 'W' },
    thetaEcon: { value: finiteOrNull(f.thetaEconK), unit: 'K' },
    fit,
    recharge,
    currentTheta: { value: finiteOrNull(f.currentThetaK), unit: 'K' },
    now: { value: finiteOrNull(f.nowTimeS), unit: 's' },
    horizonEnd: { value: finiteOrNull(f.horizonEndS), unit: 's' },
    timeOrigin: group.originMs === null ? null : new Date(group.originMs).toISOString(),
    specificHeat: { value: cp.valueJPerKgK, unit: 'J/(kg K)', source: cp.source, assumption: cp.source === 'assumed', note: cp.note },
    plannedFlow: { value: plannedFlowKgPerS ?? null, unit: 'kg/s' },
    samples: { used: f.samplesUsed, rejected: f.samplesRejected },
    seed: f.seed,
    notes: f.notes,
  };
}

export interface ReservoirInput {
  file: string;
  params: ReservoirParams;
  theory: ReservoirTheory;
  meanFlowKgPerS: number;
  backgroundWPerM2: number;
}

export function rechargeToJson(r: RechargeResult, reservoir: ReservoirInput): Record<string, unknown> {
  return {
    status: r.status,
    message: r.message,
    verdict: r.verdict,
    interpretation: r.interpretation,
    tauFit: { value: finiteOrNull(r.tauFitS.value), ci95: interval(r.tauFitS.ci95), unit: 's' },
    tauTheory: { value: finiteOrNull(r.tauTheoryS), unit: 's' },
    ratio: { value: finiteOrNull(r.ratio.value), ci95: interval(r.ratio.ci95), unit: '1' },
    rechargeFraction: { value: finiteOrNull(r.rechargeFraction.value), ci95: interval(r.rechargeFraction.ci95), unit: '1' },
    rechargeHeatFlow: { value: finiteOrNull(r.rechargeHeatFlowW.value), ci95: interval(r.rechargeHeatFlowW.ci95), unit: 'W' },
    backgroundHeatFlow: { value: finiteOrNull(r.backgroundHeatFlowW), unit: 'W' },
    ratioToBackground: finiteOrNull(r.ratioToBackground),
    meanMassFlow: { value: reservoir.meanFlowKgPerS, unit: 'kg/s' },
    backgroundHeatFlowDensity: { value: reservoir.backgroundWPerM2, unit: 'W/m2' },
    params: reservoir.file,
    theory: reservoirTheoryToJson(reservoir.theory),
  };
}
