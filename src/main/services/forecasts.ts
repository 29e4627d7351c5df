/**
 * A forecast of one well: its fit (stored by forecastWell, as fitWell does; not by computeForecast,
 * which fieldOverview runs), projected to the economic limit, and — when
 * the well's reservoir has a parameter version — the recharge estimate against the lumped theory.
 * Defaults, each stated in the response: planned flow = the mean normalised mass flow of the last
 * year of producing readings; cw = IAPWS-IF97 cp at the mean production temperature of the fit and
 * saturation + 1 MPa; the mean flow of the fit window for the theoretical τ.
 */
import { FORECAST_WELL_REQUEST, type ForecastLimit, type ForecastWellRequest, type ForecastWellResponse, type SpecificHeatInfo } from '../../shared/contract/fits.js';
import { ASSUMED_MARGIN_OVER_SATURATION_PA } from '../../shared/contract/reading-rules.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { forecastDecline, type EconomicLimit } from '../../shared/forecast/forecast.js';
import { DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2, estimateRecharge } from '../../shared/forecast/recharge.js';
import { parseReservoirParams, reservoirTheoryToJson } from '../../shared/reservoir/params.js';
import { reservoirTheory } from '../../shared/reservoir/theory.js';
import { meanFlowOverYear, type SeriesReading } from '../../shared/series/well-series.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { liquidWater, saturationPressurePa } from '../../shared/water/iapws97.js';
import type { ServiceContext } from './context.js';
import type { ComputedFit, FitRun, fitServices } from './fits.js';
import { reservoirVersionJson } from './reservoirs.js';

/** Years past the last reading a forecast looks ahead unless told otherwise. */
export const DEFAULT_HORIZON_YEARS = 30;
const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (SI Brochure)

/** A forecast as computed, its fit not yet stored. */
export type ComputedForecast = Omit<ForecastWellResponse, 'fit'> & { fit: ComputedFit };

export function forecastServices(ctx: ServiceContext, fits: ReturnType<typeof fitServices>) {
  /**
   * The one forecast of a well; `req` is already checked, `liveReadings` as for prepareSeries
   * (fits.ts). The fit is returned unstored in `run`.
   */
  function computeForecast(req: ForecastWellRequest, liveReadings?: readonly SeriesReading[]): { forecast: ComputedForecast; run: FitRun } {
    const { limit: limitRequest, horizonYears: h, plannedFlowKgPerS, specificHeatJPerKgK, seed, samples, backgroundHeatFlowWPerM2, ...fitRequest } = req;
    const run = fits.computeFit(fitRequest, liveReadings);
    const { response: fitResponse, prepared } = run;
    const { series, well, referenceTemperatureC: tref } = prepared;
    const fit = fitResponse.fit;
    const assumptions = [...fitResponse.assumptions];

    const cp = specificHeat(specificHeatJPerKgK, series.meanProductionTemperatureC);
    assumptions.push(`specific heat cw = ${round(cp.valueJPerKgK, 6)} J/(kg K): ${cp.note}`);

    const lastMs = series.readings[series.readings.length - 1].timeMs;
    let planned: ForecastWellResponse['plannedFlow'];
    if (plannedFlowKgPerS !== undefined) planned = { valueKgPerS: plannedFlowKgPerS, source: 'given', note: 'given' };
    else {
      const mean = meanFlowOverYear(prepared.history, lastMs);
      if (mean.meanKgPerS === null) {
        throw new InputError(`${well.name} has no producing reading with a flow in the year before ${isoOf(lastMs)}; give the planned flow`, { field: 'plannedFlowKgPerS' });
      }
      planned = {
        // Six significant digits: a mean of logged flows carries no more, and the text stays readable.
        valueKgPerS: round(mean.meanKgPerS, 6), source: 'mean-last-year',
        note: `mean normalised mass flow of the ${mean.readings} producing readings in the year (365.25 d) up to ${isoOf(lastMs)}`,
      };
    }
    assumptions.push(`planned flow ${round(planned.valueKgPerS, 6)} kg/s: ${planned.note}`);

    const limit = economicLimit(limitRequest, tref);
    const horizonYears = h ?? DEFAULT_HORIZON_YEARS;
    const common = {
      limit: limit.engine,
      horizonS: horizonYears * JULIAN_YEAR_S,
      specificHeatJPerKgK: cp.valueJPerKgK,
      plannedMassFlowKgPerS: planned.valueKgPerS,
      ...(seed !== undefined ? { seed } : {}),
      ...(samples !== undefined ? { samples } : {}),
    };
    let nowTimeS: number | undefined;
    if (fitResponse.basis === 'mass') {
      // Now is the last fitted reading, on both axes: its produced mass (the fit's largest x) and its time.
      const lastIncluded = series.include.lastIndexOf(1);
      nowTimeS = ((lastIncluded < 0 ? lastMs : series.readings[lastIncluded].timeMs) - prepared.originMs) / 1000;
    }
    const forecast = forecastDecline(fit, nowTimeS === undefined ? common : { ...common, nowTimeS });

    let recharge: ForecastWellResponse['recharge'] = null;
    let reservoir: ForecastWellResponse['reservoir'] = null;
    const version = well.reservoirId === null ? undefined : ctx.reservoirs.latestVersion(well.reservoirId);
    if (version !== undefined) {
      const params = parseReservoirParams(JSON.parse(version.paramsJson), `reservoir version ${version.version}`);
      const theory = reservoirTheory(params);
      const meanFlow = series.meanMassFlowKgPerS ?? planned.valueKgPerS;
      const background = backgroundHeatFlowWPerM2 ?? DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2;
      recharge = estimateRecharge(fit, {
        theory, areaM2: params.areaM2, meanMassFlowKgPerS: meanFlow, backgroundHeatFlowWPerM2: background,
        ...(seed !== undefined ? { seed } : {}), ...(samples !== undefined ? { samples } : {}),
      });
      const name = ctx.reservoirName(version.reservoirId) as string;
      reservoir = {
        name, version: reservoirVersionJson(version, name), theory: reservoirTheoryToJson(theory),
        areaM2: params.areaM2, meanMassFlowKgPerS: meanFlow, backgroundHeatFlowWPerM2: background,
      };
      assumptions.push(
        `recharge against ${name} version ${version.version} (${isoOf(version.recordedMs)}), theoretical τ at ${series.meanMassFlowKgPerS === null ? 'the planned flow' : 'the mean flow of the fit window'} ` +
          `${round(meanFlow, 6)} kg/s; background heat flow ${background} W/m2${backgroundHeatFlowWPerM2 === undefined ? ' (continental average, common practice)' : ''}`,
      );
    } else {
      assumptions.push(well.reservoirId === null ? `${well.name} belongs to no reservoir: no recharge estimate` : `the reservoir of ${well.name} has no parameter version: no recharge estimate`);
    }
    assumptions.push(`economic limit: ${limit.text}; horizon ${horizonYears} yr past the last reading`);

    const computed: ComputedForecast = {
      fit: fitResponse,
      forecast,
      recharge,
      reservoir,
      specificHeat: cp,
      plannedFlow: planned,
      limit: { ...limitRequest, thetaEconK: forecast.thetaEconK, text: limit.text },
      horizonYears,
      assumptions,
    };
    return { forecast: computed, run };
  }

  return {
    computeForecast,

    forecastWell(request: ForecastWellRequest): ForecastWellResponse {
      const { forecast, run } = computeForecast(validate(FORECAST_WELL_REQUEST, request));
      return { ...forecast, fit: fits.storeFit(run) };
    },
  };
}

function economicLimit(limit: ForecastLimit, trefC: number): { engine: EconomicLimit; thetaEconK: number; text: string } {
  switch (limit.kind) {
    case 'production-temperature': {
      const thetaEconK = limit.temperatureC - trefC;
      if (!(thetaEconK > 0)) {
        throw new InputError(`the limit ${limit.temperatureC} °C is not above the well's Tref ${trefC} °C, so θ never falls to it`, { field: 'limit.temperatureC' });
      }
      return { engine: { kind: 'temperature', thetaEconK }, thetaEconK, text: `production temperature ${limit.temperatureC} °C (θecon = ${limit.temperatureC} − ${trefC} = ${round(thetaEconK, 6)} K)` };
    }
    case 'theta':
      return { engine: { kind: 'temperature', thetaEconK: limit.thetaK }, thetaEconK: limit.thetaK, text: `available temperature θecon = ${limit.thetaK} K` };
    case 'power':
      return { engine: { kind: 'power', minPowerW: limit.powerW }, thetaEconK: NaN, text: `thermal power ${round(limit.powerW / 1e6, 6)} MW` };
  }
}

/** cw as the forecast takes it: given, else IAPWS-IF97 cp at a mean production temperature and saturation + 1 MPa. */
export function specificHeat(given: number | undefined, meanProductionTemperatureC: number | null): SpecificHeatInfo {
  if (given !== undefined) return { valueJPerKgK: given, source: 'given', note: 'given' };
  if (meanProductionTemperatureC === null) {
    throw new InputError('no fitted reading has a production temperature to take cp at; give the specific heat', { field: 'specificHeatJPerKgK' });
  }
  const t = meanProductionTemperatureC + ZERO_CELSIUS_K;
  try {
    const p = saturationPressurePa(t) + ASSUMED_MARGIN_OVER_SATURATION_PA;
    return {
      valueJPerKgK: liquidWater(t, p).specificHeatJPerKgK,
      source: 'IAPWS-IF97 region 1',
      note: `IAPWS-IF97 cp at the mean production temperature ${round(meanProductionTemperatureC, 5)} °C of the fit and ${round(p / 1e6, 4)} MPa (saturation + 1 MPa)`,
      temperatureK: t,
      pressurePa: p,
    };
  } catch (e) {
    if (e instanceof InputError) throw new InputError(`cannot take cp from IAPWS-IF97 (${e.reason}); give the specific heat`, { field: 'specificHeatJPerKgK' });
    throw e;
  }
}

function round(v: number, digits: number): number {
  return Number(v.toPrecision(digits));
}
