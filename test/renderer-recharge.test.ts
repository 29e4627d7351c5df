// The recharge view model of the recharge and reservoir screens: the request a well's stored fit
// implies, and the words and numbers shown for each verdict (DOMAIN.md §7).
import { describe, it, expect } from 'vitest';
import { toWire, type Wire } from '../src/shared/contract/channels.js';
import type { FitStatusResponse, ForecastLimit, ForecastWellResponse } from '../src/shared/contract/fits.js';
import type { WellInfo } from '../src/shared/contract/wells.js';
import type { FitResult } from '../src/shared/fit/types.js';
import { estimateRecharge } from '../src/shared/forecast/recharge.js';
import { reservoirTheory, type HotDryRockParams } from '../src/shared/reservoir/theory.js';
import {
  backgroundText, economicLimitOf, forecastRequestOf, intervalText, rechargeLine, rechargeView, whyNoRecharge,
} from '../src/renderer/screens/recharge-model.js';

const YEAR = 365.25 * 86400; // Julian year, DOMAIN.md §9

/**
 * Granite slab: z1 = (70 − 10)/0.03 = 2000 m, z2 = 2500 m, A = 0.2 km².
 * C = 2700 × 850 × 2e5 × 500 = 2.295e14 J/K; at 50 kg/s and cw = 4186 J/(kg·K)
 * τtheory = 2.295e14/(50 × 4186) = 1.0965121834687052e9 s = 34.75 yr (worked).
 */
const slab: HotDryRockParams = {
  kind: 'hot-dry-rock', surfaceTemperatureK: 283.15, gradientKPerM: 0.03, minUsefulTemperatureK: 343.15, maxDepthM: 2500,
  areaM2: 2e5, rockDensityKgPerM3: 2700, rockSpecificHeatJPerKgK: 850, flow: { massFlowKgPerS: 50 },
  fluid: { kind: 'fixed', densityKgPerM3: 1000, specificHeatJPerKgK: 4186 }, // granite and water, common practice
};
const theory = reservoirTheory(slab);
const TAU_TH = 1.0965121834687052e9;

/** An exponential fit with τ = k·τtheory and the 95 % interval [lo·τth, hi·τth]. */
function exponentialFit(k: number, lo: number, hi: number): FitResult {
  const tau = k * TAU_TH;
  return {
    model: 'exponential', basis: 'time', status: 'converged', converged: true, message: '',
    n: 500, nExcluded: 0, dof: 498, parameterNames: ['theta0', 'tau'], estimates: { theta0: 40, tau },
    parameters: {
      theta0: { value: 40, stderr: 0.1, ci95: [39.8, 40.2], unit: 'K' },
      tau: { value: tau, stderr: 0.05 * tau, ci95: [lo * TAU_TH, hi * TAU_TH], unit: 's' },
    },
    covariance: [[0.01, 0], [0, (0.05 * tau) ** 2]], correlation: [[1, 0], [0, 1]],
    x: new Float64Array(0), residuals: new Float64Array(0), sse: 1, rmseK: 0.1, r2: 0.99, aicc: 0,
    iterations: 5, evaluations: 6, xRange: [0, 10 * YEAR],
  };
}

function response(k: number, lo: number, hi: number, qb = 0.06): Wire<ForecastWellResponse> {
  const recharge = estimateRecharge(exponentialFit(k, lo, hi), { theory, areaM2: 2e5, meanMassFlowKgPerS: 50, backgroundHeatFlowWPerM2: qb });
  // Only the parts the view reads; the rest of a forecast answer does not enter the recharge view.
  return toWire({
    fit: { well: { field: 'Test field' } },
    recharge,
    reservoir: {
      name: 'Test slab', areaM2: 2e5, meanMassFlowKgPerS: 50, backgroundHeatFlowWPerM2: qb,
      version: { reservoir: 'Test slab', version: 3, params: {}, recordedAt: '2025-01-01T00:00:00Z', recordedBy: 'tester', note: 'smaller area' },
      theory: { tau: { value: TAU_TH, unit: 's' }, massFlow: { value: 50, unit: 'kg/s' } },
    },
  }) as Wire<ForecastWellResponse>;
}

const limit: ForecastLimit = { kind: 'production-temperature', temperatureC: 100 };
const own: ForecastLimit = { kind: 'theta', thetaK: 20 };
const settings = {
  economicLimit: limit, wellEconomicLimits: { '7': own }, backgroundHeatFlowWPerM2: 0.06, horizonYears: 30,
  source: { backgroundHeatFlowWPerM2: 'default' as const },
};
const well = { id: 3, name: 'KR-3', field: 'Kettle Ridge (invented)' };

describe('the forecast request of a well', () => {
  it('uses the model, basis and window of the stored fit and the settings', () => {
    const status = { latest: { model: 'floor', basis: 'mass', window: { from: '2015-01-01T00:00:00Z', to: null } } } as unknown as Wire<FitStatusResponse>;
    expect(forecastRequestOf(well, status, settings)).toEqual({
      well: 'KR-3', field: 'Kettle Ridge (invented)', model: 'floor', basis: 'mass', points: false, residuals: false, limit,
      horizonYears: 30, backgroundHeatFlowWPerM2: 0.06, from: '2015-01-01T00:00:00Z',
    });
  });

  it('falls back to the automatic model on the time basis without a stored fit, or with an unknown model', () => {
    const r = forecastRequestOf(well, { latest: null } as Wire<FitStatusResponse>, settings);
    expect([r.model, r.basis, r.from, r.to]).toEqual(['auto', 'time', undefined, undefined]);
    const odd = { latest: { model: 'cubic', basis: 'time', window: { from: null, to: null } } } as unknown as Wire<FitStatusResponse>;
    expect(forecastRequestOf(well, odd, settings).model).toBe('auto');
  });

  it('takes the well’s own economic limit before the field log’s', () => {
    expect(economicLimitOf(settings, 7)).toEqual(own);
    expect(economicLimitOf(settings, 3)).toEqual(limit);
    expect(forecastRequestOf({ ...well, id: 7 }, null, settings).limit).toEqual(own);
  });

  it('says plainly why an injection well or a well without a reservoir has no comparison', () => {
    const base: Pick<WellInfo, 'name' | 'kind' | 'reservoir'> = { name: 'KR-4I', kind: 'injection', reservoir: 'slab' };
    expect(whyNoRecharge(base)).toMatch(/injection well/);
    expect(whyNoRecharge({ ...base, name: 'KR-9', kind: 'production', reservoir: null })).toMatch(/no reservoir assigned/);
    expect(whyNoRecharge({ ...base, kind: 'production' })).toBeNull();
  });
});

describe('the recharge view', () => {
  it('recharge: τfit = 2·τtheory gives R = 2 and f = 0.5, far above conduction from below', () => {
    const view = rechargeView(response(2, 1.8, 2.2), settings, 'si')!;
    expect(view.verdict).toBe('recharge');
    expect(view.headline).toMatch(/^Recharge/);
    // R = τfit/τth = 2 with interval 1.8–2.2 (τ's interval mapped, recharge.ts).
    expect(view.ratio).toEqual({ value: '2', interval: '95 % interval 1.8 to 2.2' });
    // f = 1 − 1/R = 0.5; interval 1 − 1/1.8 = 0.4444, 1 − 1/2.2 = 0.5455.
    expect(view.fraction).toEqual({ value: '50.0 %', interval: '95 % interval 44.4 % to 54.5 %' });
    // τtheory = 1.0965e9 s / 31 557 600 s/yr = 34.75 yr → 34.7 (toFixed rounds the binary value 34.746…);
    // τfit = 69.49 yr → 69.5 yr.
    expect(view.tauTheory).toBe('34.7 yr');
    expect(view.tauFit.value).toBe('69.5 yr');
    expect(view.tauFitYears.low! / view.tauTheoryYears!).toBeCloseTo(1.8, 12);
    // qb·A = 0.06 W/m² × 2e5 m² = 12 kW (common practice qb, DOMAIN.md §7).
    expect(view.backgroundHeatFlow).toBe('12 kWth');
    expect(view.comparedWithBackground).toMatch(/far more than conduction from below/);
    expect(view.fractionNote).toMatch(/About 50 % of the heat/);
    expect(view.reservoir).toMatchObject({ name: 'Test slab', field: 'Test field', version: 3, tauAtOwnFlow: '34.7 yr' });
    expect(rechargeLine(view)).toEqual({ ratio: '2', fraction: '50.0 %', tauFit: '69.5 yr', tauTheory: '34.7 yr', verdict: 'recharge', headline: view.headline });
  });

  it('faster than theory: a negative fraction is explained as missing swept volume, not shown alone', () => {
    const view = rechargeView(response(0.5, 0.45, 0.55), settings, 'si')!;
    expect(view.verdict).toBe('faster-than-theory');
    expect(view.headline).toMatch(/swept volume is probably smaller than assumed/);
    // f = 1 − 1/0.5 = −1.
    expect(view.fraction.value).toBe('−100.0 %');
    expect(view.fractionNote).toMatch(/not a recharge but the measure of the missing volume/);
    // R = 0.5: the decline behaves as if about 50 % of the rock were swept.
    expect(view.fractionNote).toMatch(/about 50 % of the assumed rock/);
    expect(view.comparedWithBackground).toMatch(/^Qr is not positive/);
    expect(view.interpretation).toMatch(/short-circuits along fractures/);
  });

  it('consistent with none when the ratio’s interval spans 1', () => {
    const view = rechargeView(response(1.02, 0.95, 1.1), settings, 'us')!;
    expect(view.verdict).toBe('consistent-with-none');
    expect(view.headline).toMatch(/No recharge detectable/);
    // 12 kW = 12000 / 293.071 W per kBtu/h = 40 945 Btu/h (IT Btu, NIST SP 811 B.8).
    expect(view.backgroundHeatFlow).toBe('40,900 Btu/h');
  });

  it('names the default background heat flow as the common-practice continental average', () => {
    const view = rechargeView(response(2, 1.8, 2.2), settings, 'si')!;
    expect(view.background.isDefault).toBe(true);
    expect(view.background.text).toMatch(/^60 mW\/m²: the built-in default, the continental average ≈ 60 mW\/m² \(common practice\)/);
    expect(backgroundText(0.085, false)).toBe('85 mW/m², as set in Settings.');
    const set = rechargeView(response(2, 1.8, 2.2, 0.085), { ...settings, backgroundHeatFlowWPerM2: 0.085, source: { backgroundHeatFlowWPerM2: 'set' } }, 'si')!;
    expect(set.background.isDefault).toBe(false);
    // 0.085 W/m² × 2e5 m² = 17 kW.
    expect(set.backgroundHeatFlow).toBe('17 kWth');
  });

  it('has no view without a reservoir version, and shows missing interval ends plainly', () => {
    expect(rechargeView({ ...response(2, 1.8, 2.2), recharge: null, reservoir: null }, settings, 'si')).toBeNull();
    // On the wire NaN and ±∞ are null (channels.ts).
    expect(intervalText(null, 2, String)).toBe('95 % interval up to 2, no lower bound');
    expect(intervalText(1, null, String)).toBe('95 % interval from 1, no upper bound');
    expect(intervalText(null, null, String)).toBe('no interval');
  });
});
