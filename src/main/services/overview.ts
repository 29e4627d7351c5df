/**
 * The field overview (contract: fieldOverview in src/shared/contract/overview.ts): one row per well
 * with the numbers a reviewer scans first, and the field's weekly thermal output.
 *
 * Each production well is fitted and forecast by the same code as forecastWell
 * (forecasts.computeForecast → fits.computeFit), without storing the fit: only fitWell and
 * forecastWell leave a record. The choices:
 *   - model, basis and window of the well's latest stored fit; a well never fitted: model 'auto'
 *     on the time basis over all its readings;
 *   - the economic limit of the settings, the well's own first (settings.ts); the background heat
 *     flow and the horizon of the settings; the forecast's own defaults otherwise (planned flow,
 *     cp, seed and samples), so a row equals forecastWell asked the same;
 *   - no fit points (points: false): the overview shows none.
 * A well that cannot be fitted or forecast (an injection well, no Tref, too few readings, a fit
 * that did not converge, a limit not above Tref, …) gets its row with `problem` in plain words.
 *
 * Exported API:
 *   overviewServices(ctx, fits, forecasts): { fieldOverview(request?): FieldOverviewResponse }
 */
import { FIT_WELL_REQUEST, FORECAST_WELL_REQUEST, type ForecastLimit, type ModelChoice } from '../../shared/contract/fits.js';
import {
  FIELD_OVERVIEW_REQUEST, type FieldOverviewRequest, type FieldOverviewResponse, type Interval95, type WellOverview,
} from '../../shared/contract/overview.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import type { WellSummary } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import type { Basis } from '../../shared/fit/types.js';
import type { Interval } from '../../shared/forecast/recharge.js';
import { exclusionOf, isFlaggedOut, type SeriesReading } from '../../shared/series/well-series.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { SettingsRepository } from '../db/settings.js';
import type { Well } from '../db/wells.js';
import type { ServiceContext } from './context.js';
import { dataQuality } from './data-quality.js';
import { fieldOutput } from './field-output.js';
import type { StoredFit } from './fit-store.js';
import { timeOriginOf, type FitRun, type fitServices } from './fits.js';
import type { ComputedForecast, forecastServices } from './forecasts.js';
import { economicLimitOf, readSettings } from './settings.js';
import { wellServices } from './wells.js';

type Fits = ReturnType<typeof fitServices>;
type Forecasts = ReturnType<typeof forecastServices>;

const YEAR_MS = JULIAN_YEAR_S * 1000;

export function overviewServices(ctx: ServiceContext, fits: Fits, forecasts: Forecasts) {
  const settingsRepo = new SettingsRepository(ctx.fdb);
  const wells = wellServices(ctx);

  function wellRow(summary: WellSummary, well: Well, history: readonly SeriesReading[], settings: ReturnType<typeof readSettings>, fieldLatestMs: number, nowMs: number, withForecast: boolean): WellOverview {
    const { limit } = economicLimitOf(settings, well.id);
    const row: WellOverview = {
      well: summary, thetaK: latestTheta(well, history), fit: null, theoryTauS: null,
      rechargeFraction: null, rechargeVerdict: null, rechargeInterpretation: null, yearsToLimit: null, endOfLife: null, currentPowerW: null,
      limit: { ...limit, text: limitWords(limit) }, quality: dataQuality(well, history, fieldLatestMs, nowMs), problem: null,
    };
    if (well.kind !== 'production') {
      row.problem = `${well.name} is an injection well: decline fits and forecasts are made of production wells`;
      return row;
    }
    if (!withForecast) return row;
    const latest = fits.latestStored(well.id);
    const choice = {
      well: well.name, field: summary.field, points: false,
      model: (latest?.model ?? 'auto') as ModelChoice,
      basis: latest?.basis ?? ('time' as Basis),
      ...(latest?.windowFromMs != null ? { from: isoOf(latest.windowFromMs) } : {}),
      ...(latest?.windowToMs != null ? { to: isoOf(latest.windowToMs) } : {}),
    };
    let computed: { forecast: ComputedForecast; run: FitRun };
    try {
      computed = forecasts.computeForecast(validate(FORECAST_WELL_REQUEST, {
        ...choice, limit, horizonYears: settings.horizonYears, backgroundHeatFlowWPerM2: settings.backgroundHeatFlowWPerM2,
      }), history);
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      row.problem = e.reason;
      // The forecast failed; the fit alone may still have worked (e.g. a limit not above Tref).
      try {
        row.fit = fitPart(fits.computeFit(validate(FIT_WELL_REQUEST, choice), history), latest);
      } catch (again) {
        if (!(again instanceof InputError)) throw again;
      }
      return row;
    }
    const { forecast: f, run } = computed;
    row.fit = fitPart(run, latest);
    row.limit = { ...limit, text: f.limit.text };
    const recharge = f.recharge;
    if (recharge !== null) {
      row.theoryTauS = Number.isFinite(recharge.tauTheoryS) ? recharge.tauTheoryS : null;
      if (recharge.status === 'ok') {
        row.rechargeFraction = interval(recharge.rechargeFraction);
        row.rechargeVerdict = recharge.verdict;
        row.rechargeInterpretation = recharge.interpretation;
      }
    }
    const fc = f.forecast;
    if (fc.status !== 'ok') {
      row.problem = fc.message;
      return row;
    }
    const originMs = run.prepared.originMs;
    const latestMs = history[history.length - 1].timeMs;
    const at = (s: number | null): number | null => (s === null ? null : originMs + s * 1000);
    const eol = fc.endOfLife;
    // Years from the latest reading; an end of life before it (now on the mass basis is the last fitted reading) counts as 0.
    const years = (s: number | null): number | null => (eol.alreadyReached ? 0 : s === null ? null : Math.max(0, ((at(s) as number) - latestMs) / YEAR_MS));
    row.yearsToLimit = { p90: years(eol.p90), p50: years(eol.p50), p10: years(eol.p10), alreadyReached: eol.alreadyReached };
    const iso = (s: number | null): string | null => (s === null ? null : isoOf(at(s) as number));
    row.endOfLife = { p90: iso(eol.p90), p50: iso(eol.p50), p10: iso(eol.p10) };
    row.currentPowerW = fc.currentPowerW;
    return row;
  }

  return {
    /**
     * `forecasts: false` (not reachable through the contract) leaves out each well's fit and
     * forecast: the rows then carry the latest reading, θ, the limit and the data quality, and the
     * field its output — what a report needs besides the forecasts it makes itself.
     */
    fieldOverview(request: FieldOverviewRequest = {}, options: { forecasts?: boolean } = {}): FieldOverviewResponse {
      const req = validate(FIELD_OVERVIEW_REQUEST, request);
      const withForecast = options.forecasts !== false;
      const settings = readSettings(settingsRepo);
      const nowMs = ctx.now();
      const listed = wells.listWells(req.field === undefined ? {} : { field: req.field });
      return {
        fields: listed.fields.map(({ wells: summaries, ...field }) => {
          const logs = summaries.map((summary) => {
            const well = ctx.wells.get(summary.id) as Well;
            return { summary, well, history: ctx.readings.listSeriesLive(well.id) };
          });
          const fieldLatestMs = Math.max(-Infinity, ...logs.map((l) => l.history.at(-1)?.timeMs ?? -Infinity));
          return {
            field,
            wells: logs.map((l) => wellRow(l.summary, l.well, l.history, settings, fieldLatestMs, nowMs, withForecast)),
            output: fieldOutput(logs),
          };
        }),
        settings,
        generatedAt: isoOf(nowMs),
      };
    },
  };
}

/** The fit part of a row: what was followed, its status, and τ in seconds (on the mass basis Mc/ṁ at the mean flow of the fit window). */
function fitPart(run: FitRun, latest: StoredFit | undefined): NonNullable<WellOverview['fit']> {
  const r = run.response;
  const fit = r.fit;
  const stale = latest === undefined ? null : latest.fingerprint !== run.prepared.fingerprint;
  let tau: Interval95 | null = null;
  const p = fit.parameters.tau;
  if (fit.status === 'converged' && p !== undefined) {
    const perS = r.basis === 'time' ? 1 : r.meanMassFlowKgPerS;
    if (perS !== null && perS > 0) tau = { value: p.value / perS, ci95: [p.ci95[0] / perS, p.ci95[1] / perS] };
  }
  const words = [
    latest === undefined
      ? 'no stored fit: model auto on the time basis over all readings'
      : `follows the stored fit of ${isoOf(latest.createdMs)}${stale ? ' (stale: the readings changed since; fit again to store a current one)' : ''}`,
  ];
  if (r.model === 'auto' && fit.status === 'converged') words.push(`auto chose ${fit.model} (lowest AICc)`);
  if (r.basis === 'mass' && tau !== null) words.push(`τ = Mc/ṁ at the mean mass flow of the fit window, ${Number((r.meanMassFlowKgPerS as number).toPrecision(6))} kg/s`);
  if (fit.message !== '') words.push(fit.message);
  return { model: r.model, basis: r.basis, window: r.window, status: fit.status, tau, stale, message: words.join('; ') };
}

/** θ = Tprod − Tref of the latest reading a fit would use (producing, not flagged, with a temperature, from time zero). */
function latestTheta(well: Well, history: readonly SeriesReading[]): number | null {
  const tref = well.referenceTemperatureC;
  if (tref === null || history.length === 0 || well.kind !== 'production') return null;
  const { originMs } = timeOriginOf(well, history[0].timeMs);
  for (let i = history.length - 1; i >= 0; i--) {
    const r = history[i];
    if (exclusionOf(r.timeMs, originMs, r.status, isFlaggedOut(r.flags), r.productionTemperatureC !== null) === null) return (r.productionTemperatureC as number) - tref;
  }
  return null;
}

function interval(i: Interval): Interval95 {
  return { value: i.value, ci95: [i.ci95[0], i.ci95[1]] };
}

/** The limit in words, for rows without a forecast (a forecast states its own, with θecon). */
function limitWords(limit: ForecastLimit): string {
  switch (limit.kind) {
    case 'production-temperature': return `production temperature ${limit.temperatureC} °C`;
    case 'theta': return `available temperature θecon = ${limit.thetaK} K`;
    case 'power': return `thermal power ${Number((limit.powerW / 1e6).toPrecision(6))} MW`;
  }
}
