// Pure logic of the well decline screen: the models on a grid, residuals, the forecast band on the
// mass axis, datasets from the columnar series, the fit window between dates, instants and chart x,
// and the words of the candidate table and facts. No browser needed.
import { describe, expect, it } from 'vitest';
import { Display } from '../src/renderer/app/display.js';
import {
  chartXOfBasis, latestIncluded, levelFor, massUnit, minMaxLevels, readingDatasets, readingsExtent, shownOfCelsius, shownOfTheta, visibleCount, yMap,
  type Point, type SeriesColumns, type XAxis,
} from '../src/renderer/charts/decline-data.js';
import { bandLine, basisAtForecastTime, fittedCurve, parametersOf, residualPoints, thetaOnGrid, theoryCurve } from '../src/renderer/charts/decline-model.js';
import { buildOverlay, limitLabel, readingsView } from '../src/renderer/charts/decline-overlay.js';
import { chartRangeOfWindow, dateInZone, dayEndMs, dayStartMs, windowDates, windowOfChartRange, windowOfDates } from '../src/renderer/charts/decline-window.js';
import { candidateRows, facts, fittedTauS, parameterCell } from '../src/renderer/screens/decline-rows.js';
import type { Wire } from '../src/shared/contract/channels.js';
import type { FitWellResponse, ForecastWellResponse } from '../src/shared/contract/fits.js';
import type { FitResult } from '../src/shared/fit/types.js';

const YEAR_S = 365.25 * 86400; // Julian year (DOMAIN.md §9)
const E = Math.E;
const SI = new Display('si', 'UTC');
const US = new Display('us', 'UTC');
const TIME_AXIS: XAxis = { basis: 'time', originMs: 0 };

describe('decline models on a grid', () => {
  it('exponential θ0·e^(−t/τ) is θ0/e at t = τ', () => {
    const tau = 10 * YEAR_S;
    const { x, theta } = thetaOnGrid('exponential', { theta0: 50, tau }, 0, tau, 2);
    expect(x[0]).toBe(0);
    expect(x[1]).toBe(tau);
    expect(theta[0]).toBe(50); // e^0 = 1
    expect(theta[1]).toBeCloseTo(50 / E, 12); // worked example: 50 / 2.718281828… = 18.3939720586 K
    expect(theta[1]).toBeCloseTo(18.3939720586, 9);
  });

  it('exponential to a floor is θ∞ + (θ0 − θ∞)/e at t = τ and tends to θ∞', () => {
    const p = { theta0: 60, tau: 3, thetaInf: 20 };
    const { theta } = thetaOnGrid('floor', p, 0, 3, 2);
    expect(theta[1]).toBeCloseTo(20 + 40 / E, 12); // worked example: 20 + 40/e = 34.7151776469 K
    expect(thetaOnGrid('floor', p, 0, 3000, 2).theta[1]).toBeCloseTo(20, 9); // e^(−1000) underflows to 0
  });

  it('hyperbolic θ0·(1 + b·t/τ)^(−1/b): harmonic (b = 1) halves at t = τ, b = ½ gives θ0/2.25', () => {
    expect(thetaOnGrid('hyperbolic', { theta0: 50, tau: 4, b: 1 }, 0, 4, 2).theta[1]).toBeCloseTo(25, 12); // 50·(1+1)^(−1) = 25
    expect(thetaOnGrid('hyperbolic', { theta0: 50, tau: 4, b: 0.5 }, 0, 4, 2).theta[1]).toBeCloseTo(50 / 2.25, 12); // 50·(1.5)^(−2) = 22.2222…
  });

  it('spaces the grid evenly and ends exactly at the window end', () => {
    const { x } = thetaOnGrid('exponential', { theta0: 1, tau: 1 }, 0.1, 0.7, 300);
    expect(x.length).toBe(300);
    expect(x[0]).toBe(0.1);
    expect(x[299]).toBe(0.7);
    expect(x[150] - x[149]).toBeCloseTo(0.6 / 299, 14); // (x1 − x0)/(n − 1)
  });

  it('reads wire estimates only when every parameter the model needs is finite', () => {
    expect(parametersOf('exponential', { theta0: 50, tau: 10 })).toEqual({ theta0: 50, tau: 10 });
    expect(parametersOf('floor', { theta0: 50, tau: 10, thetaInf: null })).toBeNull();
    expect(parametersOf('hyperbolic', { theta0: 50, tau: 10, b: 0 })).toBeNull(); // b > 0 (DOMAIN.md §6)
    expect(parametersOf('exponential', { theta0: 50, tau: null })).toBeNull();
  });

  it('places the fitted curve on a time axis in epoch ms from time zero', () => {
    const origin = Date.UTC(2010, 0, 1);
    const axis: XAxis = { basis: 'time', originMs: origin };
    const map = yMap(SI, 'theta', 70);
    const pts = fittedCurve('exponential', { theta0: 50, tau: YEAR_S }, [0, YEAR_S], axis, map, 3);
    expect(pts[0]).toEqual({ x: origin, y: 50 });
    expect(pts[2].x).toBe(origin + 1000 * YEAR_S);
    expect(pts[2].y).toBeCloseTo(50 / E, 12);
  });

  it('draws the theoretical exponential only for a positive decay constant', () => {
    const map = yMap(SI, 'theta', 70);
    expect(theoryCurve(40, 0, 0, 10, TIME_AXIS, map)).toEqual([]);
    const pts = theoryCurve(40, 5, 0, 5, TIME_AXIS, map, 2);
    expect(pts[1].y).toBeCloseTo(40 / E, 12); // θ0/e at x = k
  });
});

describe('display maps', () => {
  it('shows θ as production temperature in °C or °F, and as a difference in K or °F', () => {
    const si = yMap(SI, 'temperature', 70);
    expect(shownOfTheta(si, 0)).toBeCloseTo(70, 10); // T = Tref + θ
    expect(shownOfTheta(si, 52.5)).toBeCloseTo(122.5, 10);
    expect(shownOfCelsius(si, 150)).toBeCloseTo(150, 10);
    const us = yMap(US, 'temperature', 70);
    expect(shownOfTheta(us, 0)).toBeCloseTo(158, 9); // 70 °C·9/5 + 32 = 158 °F (NIST SP 811)
    expect(shownOfTheta(us, 10)).toBeCloseTo(176, 9); // 80 °C → 176 °F
    const usTheta = yMap(US, 'theta', 70);
    expect(shownOfTheta(usTheta, 10)).toBeCloseTo(18, 9); // a difference of 10 K = 18 °F
    expect(shownOfCelsius(usTheta, 80)).toBeCloseTo(18, 9);
  });

  it('shows produced mass in Mt (SI) or Mlb (US)', () => {
    expect(massUnit('si')).toEqual({ label: 'Mt', perKg: 1e-9 });
    expect(2e9 * massUnit('us').perKg).toBeCloseTo(2e9 / 0.45359237 / 1e6, 9); // 1 lb = 0.45359237 kg (NIST SP 811); 2e9 kg = 4409.245 Mlb
  });
});

/** Five readings: one shut-in (code 1), one without a temperature (3), one flagged (2). */
function series(basis: 'time' | 'mass'): SeriesColumns {
  return {
    basis,
    epochMs: Date.UTC(2020, 0, 1),
    timeS: [0, 86400, 2 * 86400, 3 * 86400, 4 * 86400],
    x: basis === 'time' ? [0, 86400, 2 * 86400, 3 * 86400, 4 * 86400] : [0, 1e9, 2e9, 3e9, 4e9],
    productionTemperatureC: [120, 100, null, 118, 116],
    exclusion: [0, 1, 3, 2, 0],
  };
}

describe('datasets from the columns', () => {
  it('splits included and excluded readings and leaves out what cannot be drawn', () => {
    const s = series('time');
    const d = readingDatasets(s, TIME_AXIS, yMap(SI, 'theta', 70));
    expect(d.included).toEqual([{ x: s.epochMs, y: 50 }, { x: s.epochMs + 4 * 86400e3, y: 46 }]); // θ = T − 70
    expect(d.excluded.map((p) => p.y)).toEqual([30, 48]);
    expect(d).toMatchObject({ includedCount: 2, excludedCount: 3, notDrawn: 1 });
    expect(latestIncluded(s)).toBe(4);
  });

  it('places readings on the mass axis and skips those before time zero', () => {
    const s = { ...series('mass'), x: [null, 1e9, 2e9, 3e9, 4e9] };
    const axis: XAxis = { basis: 'mass', ...massUnit('si') };
    const d = readingDatasets(s, axis, yMap(SI, 'temperature', 70));
    expect(d.included).toEqual([{ x: 4, y: expect.closeTo(116, 9) }]);
    expect(d.notDrawn).toBe(2);
    expect(readingsExtent(s, axis)).toEqual([1, 4]);
    expect(chartXOfBasis(axis, 2.5e9)).toBeCloseTo(2.5, 12);
  });
});

describe('the same columns as typed arrays (chartSeries decoded: NaN where wellSeries has null)', () => {
  const typed = (s: SeriesColumns): SeriesColumns => ({
    ...s,
    timeS: Float64Array.from(s.timeS),
    x: Float64Array.from(Array.from(s.x, (v) => v ?? NaN)),
    productionTemperatureC: Float64Array.from(Array.from(s.productionTemperatureC, (v) => v ?? NaN)),
    exclusion: Uint8Array.from(s.exclusion),
  });

  it('gives the same datasets, latest reading and extent on both bases', () => {
    const time = series('time');
    expect(readingDatasets(typed(time), TIME_AXIS, yMap(SI, 'theta', 70))).toEqual(readingDatasets(time, TIME_AXIS, yMap(SI, 'theta', 70)));
    expect(latestIncluded(typed(time))).toBe(latestIncluded(time));
    const mass = { ...series('mass'), x: [null, 1e9, 2e9, 3e9, 4e9] };
    const axis: XAxis = { basis: 'mass', ...massUnit('si') };
    expect(readingDatasets(typed(mass), axis, yMap(SI, 'temperature', 70))).toEqual(readingDatasets(mass, axis, yMap(SI, 'temperature', 70)));
    expect(readingsExtent(typed(mass), axis)).toEqual(readingsExtent(mass, axis));
  });
});

describe('coarse levels for zoomed-out views', () => {
  it('halves each level, keeps the lowest and highest of every four points in x order, and reuses the objects', () => {
    const pts: Point[] = [3, 9, 1, 5, 2, 2, 8, 0].map((y, x) => ({ x, y }));
    const levels = minMaxLevels(pts, 1);
    expect(levels[0]).toBe(pts);
    // Worked example: [3, 9, 1, 5] keeps 9 (x = 1) and 1 (x = 2); [2, 2, 8, 0] keeps 8 (x = 6) and 0 (x = 7).
    expect(levels[1].map((p) => p.x)).toEqual([1, 2, 6, 7]);
    expect(levels[1][0]).toBe(pts[1]);
    expect(levels[2].map((p) => p.y)).toEqual([9, 0]); // of [9, 1, 8, 0]: highest first (x = 1), lowest last (x = 7)
    expect(levels.length).toBe(3);
  });

  it('keeps every extreme, so min-max decimation draws the same envelope', () => {
    const pts: Point[] = Array.from({ length: 100_000 }, (_, x) => ({ x, y: Math.sin(x / 300) + 0.01 * ((x * 7919) % 13) }));
    const coarse = minMaxLevels(pts, 5_000).at(-1) as Point[];
    expect(coarse.length).toBeLessThanOrEqual(10_000);
    expect(Math.max(...coarse.map((p) => p.y))).toBe(Math.max(...pts.map((p) => p.y)));
    expect(Math.min(...coarse.map((p) => p.y))).toBe(Math.min(...pts.map((p) => p.y)));
  });

  it('counts the visible points by binary search and picks the coarsest level with 16 points per pixel', () => {
    const pts: Point[] = Array.from({ length: 1000 }, (_, x) => ({ x, y: 0 }));
    expect(visibleCount(pts, undefined, undefined)).toBe(1000);
    expect(visibleCount(pts, 10, 19)).toBe(10); // x = 10…19 inclusive
    expect(visibleCount(pts, 2000, undefined)).toBe(0);
    // 1,000,000 visible on 1,000 px: 62.5 spare factors of 16 per pixel → level ⌊log2 62.5⌋ = 5.
    expect(levelFor(10, 1_000_000, 1000)).toBe(5);
    expect(levelFor(3, 1_000_000, 1000)).toBe(2); // no coarser level than the last
    expect(levelFor(10, 20_000, 1000)).toBe(0); // fewer than 32 per pixel: full detail
  });
});

describe('residuals and the band', () => {
  it('is observed minus fitted over the included readings inside the window', () => {
    const s: SeriesColumns = {
      basis: 'time', epochMs: 0, timeS: [0, 100, 200, 300], x: [0, 100, 200, 300],
      // 70 + 50·e^(−x/100) + 0.5, exclusion: the third is shut in.
      productionTemperatureC: [0, 100, 200, 300].map((x) => 70 + 50 * Math.exp(-x / 100) + 0.5),
      exclusion: [0, 0, 1, 0],
    };
    const r = residualPoints(s, 'exponential', { theta0: 50, tau: 100 }, { fromMs: 0, toMs: 200_000 }, TIME_AXIS, yMap(US, 'theta', 70));
    expect(r.count).toBe(2); // readings 0 and 1: the shut-in one is left out, reading 3 is after the window
    expect(r.points.map((p) => p.x)).toEqual([0, 100_000]);
    for (const p of r.points) expect(p.y).toBeCloseTo(0.9, 9); // 0.5 K = 0.9 °F (difference)
    expect(r.rmsK).toBeCloseTo(0.5, 9);
  });

  it('turns forecast time into produced mass at the planned flow on the mass basis', () => {
    const place = { timeS: [1e8, 1e8 + 1e6], nowX: 1e9, nowTimeS: 1e8, plannedFlowKgPerS: 40 };
    // Worked example: M = 1e9 kg + 40 kg/s × 1e6 s = 1.04e9 kg = 1.04 Mt.
    expect(basisAtForecastTime('mass', place, 1e8 + 1e6)).toBeCloseTo(1.04e9, 3);
    expect(basisAtForecastTime('time', place, 5)).toBe(5);
    const pts = bandLine({ ...place, values: [30, null] }, { basis: 'mass', ...massUnit('si') }, yMap(SI, 'theta', 70));
    expect(pts).toEqual([{ x: 1, y: 30 }]); // null values are left out
    expect(bandLine({ timeS: [1], values: [3] }, { basis: 'mass', ...massUnit('si') }, yMap(SI, 'theta', 70))).toEqual([]);
  });
});

describe('the fit window', () => {
  it('maps calendar dates in a zone to the start and end of the day', () => {
    expect(dayStartMs('2024-02-29', 'UTC')).toBe(Date.UTC(2024, 1, 29));
    expect(dayStartMs('2023-02-29', 'UTC')).toBeNull(); // no 29 February in 2023
    expect(dayStartMs('29/02/2024', 'UTC')).toBeNull();
    // New Zealand daylight time, UTC+13, until 2024-04-07 03:00 (tz database, Pacific/Auckland).
    expect(dayStartMs('2024-03-10', 'Pacific/Auckland')).toBe(Date.UTC(2024, 2, 9, 11));
    expect(dayEndMs('2024-03-10', 'Pacific/Auckland')).toBe(Date.UTC(2024, 2, 10, 11) - 1);
    // The day daylight time ends is 25 hours long: from 00:00 NZDT (UTC+13) to 24:00 NZST (UTC+12).
    const start = dayStartMs('2024-04-07', 'Pacific/Auckland') as number;
    const end = dayEndMs('2024-04-07', 'Pacific/Auckland') as number;
    expect(start).toBe(Date.UTC(2024, 3, 6, 11));
    expect(end + 1 - start).toBe(25 * 3600e3);
    expect(dateInZone(start, 'Pacific/Auckland')).toBe('2024-04-07');
    expect(dateInZone(end, 'Pacific/Auckland')).toBe('2024-04-07');
  });

  it('reads the two date inputs, an empty one leaving that end open', () => {
    expect(windowOfDates('2020-01-01', '', 'UTC')).toEqual({ window: { fromMs: Date.UTC(2020, 0, 1), toMs: null } });
    expect(windowOfDates('2020-02-01', '2020-01-01', 'UTC')).toEqual({ error: 'the window ends before it starts', field: 'to' });
    expect(windowOfDates('soon', '', 'UTC')).toMatchObject({ field: 'from' });
    expect(windowDates({ fromMs: Date.UTC(2020, 0, 1, 23), toMs: null }, 'Pacific/Auckland')).toEqual({ from: '2020-01-02', to: '' }); // 23:00 UTC = 12:00 next day NZDT
  });

  it('turns a drag on the time axis into whole milliseconds outward', () => {
    expect(windowOfChartRange(series('time'), TIME_AXIS, 2000.7, 1000.2)).toEqual({ fromMs: 1000, toMs: 2001 });
  });

  it('turns a drag on the mass axis into the instants of the readings inside it', () => {
    const s = { ...series('mass'), x: [null, 1e9, 2e9, 3e9, 4e9] };
    const axis: XAxis = { basis: 'mass', ...massUnit('si') };
    const day = 86400e3;
    expect(windowOfChartRange(s, axis, 1.5, 3.2)).toEqual({ fromMs: s.epochMs + 2 * day, toMs: s.epochMs + 3 * day }); // readings at 2 and 3 Mt
    expect(windowOfChartRange(s, axis, 1.2, 1.8)).toBeNull(); // no reading between 1.2 and 1.8 Mt
    // And back: the window from reading 0 (before time zero) to reading 2 shades 1–2 Mt.
    expect(chartRangeOfWindow(s, axis, { fromMs: s.epochMs, toMs: s.epochMs + 2 * day })).toEqual([1, 2]);
    expect(chartRangeOfWindow(s, axis, { fromMs: null, toMs: null })).toEqual([1, 4]);
    expect(chartRangeOfWindow(series('time'), TIME_AXIS, { fromMs: null, toMs: s.epochMs + day })).toEqual([s.epochMs, s.epochMs + day]);
  });
});

/** A wire fit record with the given AICc and τ (s), for the table. */
function wireFit(model: FitResult['model'], aicc: number, tauS: number, converged = true): Wire<FitResult> {
  const names = model === 'exponential' ? ['theta0', 'tau'] : model === 'floor' ? ['theta0', 'tau', 'thetaInf'] : ['theta0', 'tau', 'b'];
  const parameters: Record<string, { value: number; stderr: number; ci95: number[]; unit: string }> = {
    theta0: { value: 50, stderr: 0.1, ci95: [49.8, 50.2], unit: 'K' },
    tau: { value: tauS, stderr: 0.5 * YEAR_S, ci95: [tauS - YEAR_S, tauS + YEAR_S], unit: 's' },
  };
  if (model === 'floor') parameters.thetaInf = { value: 20, stderr: 1, ci95: [18, 22], unit: 'K' };
  if (model === 'hyperbolic') parameters.b = { value: 0.25, stderr: 0.05, ci95: [0.15, 0.35], unit: '1' };
  return {
    model, basis: 'time', status: converged ? 'converged' : 'at-bound', converged, message: converged ? '' : 'b fell to its bound',
    n: 100, nExcluded: 0, dof: 98, parameterNames: names, estimates: { theta0: 50, tau: tauS }, parameters,
    covariance: [], correlation: [], x: [], residuals: [], sse: 1, rmseK: 0.3, r2: 0.99, aicc, iterations: 4, evaluations: 5, xRange: [0, 1],
  } as unknown as Wire<FitResult>;
}

describe('candidate table and facts', () => {
  it('lists every candidate with ΔAICc from the best converged one and marks the chosen model', () => {
    const auto = { ...wireFit('floor', -100, 10 * YEAR_S), candidates: [wireFit('floor', -100, 10 * YEAR_S), wireFit('exponential', -98.5, 11 * YEAR_S), wireFit('hyperbolic', -120, 12 * YEAR_S, false)] };
    const rows = candidateRows(auto as Wire<FitResult>, SI);
    expect(rows.map((r) => r.model)).toEqual(['floor', 'exponential', 'hyperbolic']);
    expect(rows.map((r) => r.deltaAicc)).toEqual(['0.0', '1.5', '—']); // −98.5 − (−100) = 1.5; a fit at its bound is not ranked
    expect(rows.map((r) => r.chosen)).toEqual([true, false, false]);
    expect(rows[0].tau).toBe('10.0 yr (9.0–11.0)'); // τ ± 1 yr, in Julian years
    expect(rows[0].thetaInf).toBe('20.0 K (18.0–22.0)');
    expect(rows[1].thetaInf).toBe('—');
    expect(rows[2].b).toBe('0.250 (0.150–0.350)');
  });

  it('writes a mass-basis τ as the characteristic mass and converts it to years at the mean flow', () => {
    const est = { value: 4e10, stderr: 1e9, ci95: [3.8e10, 4.2e10] as number[], unit: 'kg' };
    expect(parameterCell('tau', 'mass', est as never, SI)).toBe('Mc 40.0 Mt (38.0–42.0)');
    // A fit that did not converge: the last iterate's value, no interval around it.
    expect(parameterCell('tau', 'mass', est as never, SI, false)).toBe('Mc 40.0 Mt');
    const fit = { basis: 'mass', meanMassFlowKgPerS: 40, fit: { ...wireFit('exponential', 0, 0), basis: 'mass', parameters: { tau: est } } } as unknown as Wire<FitWellResponse>;
    const tau = fittedTauS(fit);
    // Worked example: τ = Mc/ṁ = 4e10 kg / 40 kg/s = 1e9 s = 31.69 Julian years.
    expect(tau?.value).toBe(1e9);
    expect(SI.years(tau?.value)).toBe('31.7 yr');
  });

  it('states the current reading, θ and the counts before any fit arrives', () => {
    const list = facts({ display: SI, trefC: 70, now: { ms: Date.UTC(2025, 0, 5), celsius: 122.5 }, recordCounts: { included: 600, excluded: 24 }, fit: null, forecast: null, forecastProblem: null });
    const byLabel = Object.fromEntries(list.map((f) => [f.label, f]));
    expect(byLabel['Production temperature now'].value).toBe('122.5 °C');
    expect(byLabel['θ now (T − Tref)'].value).toBe('52.5 K'); // 122.5 − 70
    expect(byLabel['Readings used / excluded'].value).toBe('600 / 24');
    expect(byLabel['Fitted τ'].note).toBe('fitting…');
  });
});

describe('the overlay from a fit and its forecast', () => {
  const origin = Date.UTC(2010, 0, 1);
  const axis: XAxis = { basis: 'time', originMs: origin };
  const s: SeriesColumns = {
    basis: 'time', epochMs: origin, timeS: [0, YEAR_S], x: [0, YEAR_S],
    productionTemperatureC: [120, 70 + 50 / E], exclusion: [0, 0],
  };
  const fit = {
    basis: 'time', window: { from: null, to: null },
    fit: { ...wireFit('exponential', -10, YEAR_S), estimates: { theta0: 50, tau: YEAR_S }, xRange: [0, YEAR_S] },
  } as unknown as Wire<FitWellResponse>;
  const forecast = {
    fit, plannedFlow: { valueKgPerS: 40 }, reservoir: null, recharge: null,
    forecast: { status: 'ok', thetaEconK: 10, nowTimeS: YEAR_S, band: { timeS: [YEAR_S, 2 * YEAR_S], p90: [18, 6], p50: [18.4, 6.8], p10: [19, 7.5] } },
  } as unknown as Wire<ForecastWellResponse>;

  it('draws the fit over the window, zero residuals on the curve, the band from now and the limit line', () => {
    const map = yMap(SI, 'theta', 70);
    const o = buildOverlay({ series: s, axis, map, display: SI, fit, forecast, limit: { kind: 'theta', thetaK: 10 } });
    expect(o.fit.length).toBe(300);
    expect(o.fit[299].x).toBe(origin + 1000 * YEAR_S);
    expect(o.residuals.map((p) => p.y)).toEqual([0, expect.closeTo(0, 9)]); // readings lie on θ0·e^(−t/τ)
    expect(o.bandLow).toEqual([{ x: origin + 1000 * YEAR_S, y: 18 }, { x: origin + 2000 * YEAR_S, y: 6 }]); // P90 is the low line
    expect(o.bandHigh[1].y).toBe(7.5);
    expect(o.limit).toEqual({ y: 10, label: 'economic limit 10.0 K' });
    expect(o.theory).toEqual([]); // no reservoir parameters
  });

  it('labels the limit in the shown quantity, and a power limit with its power', () => {
    expect(limitLabel(SI, { kind: 'production-temperature', temperatureC: 115 }, 45, yMap(SI, 'temperature', 70))).toBe('economic limit 115.0 °C'); // 70 + 45
    expect(limitLabel(US, { kind: 'production-temperature', temperatureC: 115 }, 45, yMap(US, 'temperature', 70))).toBe('economic limit 239.0 °F'); // 115·9/5 + 32
    expect(limitLabel(SI, { kind: 'power', powerW: 5e6 }, 12, yMap(SI, 'theta', 70))).toBe('economic limit 5.00 MWth (12.0 K)');
  });

  it('titles the axes for the quantity and basis shown', () => {
    const { view, datasets } = readingsView(s, axis, yMap(US, 'theta', 70), US);
    expect(view.yTitle).toBe('θ = T − Tref, °F (difference)');
    expect(view.xTitle).toBe('date');
    expect(datasets.includedCount).toBe(2);
    expect(readingsView(s, { basis: 'mass', ...massUnit('us') }, yMap(US, 'temperature', 70), US).view.xTitle).toBe('produced mass since time zero, Mlb');
  });
});
