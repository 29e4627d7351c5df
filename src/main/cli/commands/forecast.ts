/**
 * `tauwell forecast`: fits each group, then projects the decline to an economic limit with
 * P90/P50/P10 end of life, remaining heat and, given reservoir parameters, the recharge estimate.
 */
import { InputError } from '../../../shared/errors.js';
import type { AutoFitResult, FitResult } from '../../../shared/fit/types.js';
import { forecastDecline, type EconomicLimit, type ForecastResult } from '../../../shared/forecast/forecast.js';
import { estimateRecharge, type RechargeResult } from '../../../shared/forecast/recharge.js';
import { JULIAN_YEAR_S, toSI } from '../../../shared/units.js';
import type { CommandSpec, OptionSpec, ParsedArgs } from '../args.js';
import type { SeriesGroup } from '../csv-series.js';
import { fitToJson } from '../fit-json.js';
import { fitLines, groupHeading } from '../fit-text.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { CSV_OR_DB_OPTIONS, DB_SERIES_NOTE, seriesSource } from '../db-series.js';
import { fitGroup, loadSeries, modelOf, timeOriginText } from '../series-input.js';
import { forecastToJson, rechargeToJson, type ReservoirInput } from '../forecast-json.js';
import { forecastLines, rechargeLines, CAUTIONS, PERCENTILE_NOTE } from '../forecast-text.js';
import { specificHeatFor, type SpecificHeat } from '../specific-heat.js';
import { runForecastDb } from './forecast-db.js';
import { PARAMS_FILE_NOTE, loadTheory } from './theory.js';

const DEFAULT_HORIZON_YEARS = 30;
const DEFAULT_SEED = 1;
/** Continental average conductive heat flow, about 60 mW/m² (common practice, DOMAIN.md §7). */
const DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2 = 0.06;

const FORECAST_OPTIONS: readonly OptionSpec[] = [
  ...CSV_OR_DB_OPTIONS,
  { name: 'limit-temp', kind: 'value', placeholder: 'C', help: 'economic limit as a production temperature in °C (needs --reference, or --db for the well\'s Tref): θecon = Tecon − Tref' },
  { name: 'limit-theta', kind: 'value', placeholder: 'K', help: 'economic limit as an available temperature θecon in K' },
  { name: 'limit-power', kind: 'value', placeholder: 'MW', help: 'economic limit as a thermal power in MW (needs --planned-flow): θecon = Pmin/(ṁ·cw)' },
  { name: 'horizon-years', kind: 'value', placeholder: 'N', defaultText: String(DEFAULT_HORIZON_YEARS), help: 'how far past the last reading to project, in years of 365.25 d' },
  { name: 'seed', kind: 'value', placeholder: 'N', defaultText: String(DEFAULT_SEED), help: 'seed of the parameter sampling; the same seed gives the same result' },
  { name: 'samples', kind: 'value', placeholder: 'N', defaultText: '4000', help: 'number of parameter samples for the P90/P50/P10 band (at least 100)' },
  { name: 'planned-flow', kind: 'value', placeholder: 'KG_PER_S', help: 'planned production mass flow in kg/s, for power and remaining heat (with --db, default: the mean normalised mass flow of the last year of producing readings)' },
  { name: 'mean-flow', kind: 'value', placeholder: 'KG_PER_S', help: 'mean mass flow of the fit window in kg/s, for the recharge estimate (default: --planned-flow; with --db taken from the readings)' },
  {
    name: 'specific-heat', kind: 'value', placeholder: 'J_PER_KG_K',
    help: 'specific heat cw of the produced water in J/(kg·K); default: IAPWS-IF97 cp at the mean production temperature and 1 MPa above saturation when --reference is given, else 4186 (an assumption, stated in the output)',
  },
  { name: 'params', kind: 'value', placeholder: 'FILE.json', help: 'reservoir parameters (as for `tauwell theory`): adds the recharge estimate, fitted τ against theoretical τ (needs --mean-flow or --planned-flow); with --db the latest version of the well\'s reservoir is used instead' },
  { name: 'background-heat-flow', kind: 'value', placeholder: 'W_PER_M2', defaultText: String(DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2), help: 'background conductive heat flow in W/m² that the recharge is compared with' },
];

export const FORECAST_COMMAND: CommandSpec = {
  name: 'forecast',
  summary: 'Fit the decline, then forecast the end of economic life (P90/P50/P10, in years), the remaining producible heat (GWh, TJ) and the current power (MW).',
  usage:
    'tauwell forecast --csv FILE --time COL --value COL (--limit-temp C --reference C | --limit-theta K | --limit-power MW --planned-flow KG_PER_S) [options]\n' +
    '       tauwell forecast --db FILE --well NAME [--from ISO] [--to ISO] [--basis time|mass] (--limit-temp C | --limit-theta K | --limit-power MW) [options]',
  options: FORECAST_OPTIONS,
  notes: [
    DB_SERIES_NOTE,
    'Give exactly one economic limit. Times in the JSON output are seconds after the series\' first point; heat in J, power in W, temperatures in K.',
    PERCENTILE_NOTE,
    PARAMS_FILE_NOTE,
  ],
};

interface ForecastInputs {
  limit: EconomicLimit;
  limitText: string;
  horizonS: number;
  seed: number;
  samples: number | undefined;
  plannedFlowKgPerS: number | undefined;
  referenceC: number | undefined;
  reservoir: ReservoirInput | null;
}

function readInputs(args: ParsedArgs, cwd: string): ForecastInputs {
  const referenceC = args.number('reference');
  const plannedFlowKgPerS = args.positive('planned-flow');
  const given = ['limit-temp', 'limit-theta', 'limit-power'].filter((n) => args.has(n));
  if (given.length === 0) {
    throw new InputError('missing economic limit: give --limit-temp C (with --reference), --limit-theta K or --limit-power MW', { field: '--limit-temp' });
  }
  if (given.length > 1) throw new InputError(`give one economic limit, not ${given.map((n) => `--${n}`).join(' and ')}`, { field: `--${given[1]}` });
  let limit: ForecastInputs['limit'];
  let limitText: string;
  if (given[0] === 'limit-temp') {
    const tC = args.requireNumber('limit-temp');
    if (referenceC === undefined) throw new InputError('--limit-temp is a production temperature in °C and needs --reference C to become θecon', { field: '--reference' });
    toSI(tC, 'degC', 'temperature', '--limit-temp'); // rejects a temperature below absolute zero
    const thetaEconK = tC - referenceC;
    limit = { kind: 'temperature', thetaEconK };
    limitText = `production temperature ${tC} °C (θecon = ${tC} − ${referenceC} = ${thetaEconK} K)`;
  } else if (given[0] === 'limit-theta') {
    const thetaEconK = args.requireNumber('limit-theta');
    limit = { kind: 'temperature', thetaEconK };
    limitText = `available temperature θecon = ${thetaEconK} K`;
  } else {
    const mw = args.positive('limit-power') as number;
    if (plannedFlowKgPerS === undefined) throw new InputError('--limit-power needs the planned mass flow to become θecon = Pmin/(ṁ·cw)', { field: '--planned-flow' });
    limit = { kind: 'power', minPowerW: toSI(mw, 'MW', 'power') };
    limitText = `thermal power ${mw} MW at ${plannedFlowKgPerS} kg/s`;
  }
  const horizonYears = args.positive('horizon-years') ?? DEFAULT_HORIZON_YEARS;

  let reservoir: ForecastInputs['reservoir'] = null;
  const paramsFile = args.string('params');
  if (paramsFile !== undefined) {
    const meanFlowKgPerS = args.positive('mean-flow') ?? plannedFlowKgPerS;
    if (meanFlowKgPerS === undefined) {
      throw new InputError('the recharge estimate (--params) needs the mean mass flow of the fit window: give --mean-flow or --planned-flow (kg/s)', { field: '--mean-flow' });
    }
    const backgroundWPerM2 = args.number('background-heat-flow') ?? DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2;
    if (!(backgroundWPerM2 > 0)) throw new InputError(`must be greater than zero (got ${backgroundWPerM2})`, { field: '--background-heat-flow' });
    reservoir = { file: paramsFile, ...loadTheory(paramsFile, cwd), meanFlowKgPerS, backgroundWPerM2 };
  }
  return {
    limit, limitText,
    horizonS: horizonYears * JULIAN_YEAR_S,
    seed: args.integer('seed', 0) ?? DEFAULT_SEED,
    samples: args.integer('samples', 100),
    plannedFlowKgPerS, referenceC, reservoir,
  };
}

export interface GroupForecast {
  group: SeriesGroup;
  fit: FitResult | AutoFitResult;
  cp: SpecificHeat;
  forecast: ForecastResult;
  recharge: RechargeResult | null;
}

function forecastGroup(group: SeriesGroup, args: ParsedArgs, inputs: ForecastInputs): GroupForecast {
  const fit = fitGroup(group, modelOf(args));
  const cp = specificHeatFor(args.positive('specific-heat'), group.meanProductionTemperatureK);
  const forecast = forecastDecline(fit, {
    limit: inputs.limit,
    horizonS: inputs.horizonS,
    specificHeatJPerKgK: cp.valueJPerKgK,
    seed: inputs.seed,
    ...(inputs.plannedFlowKgPerS !== undefined ? { plannedMassFlowKgPerS: inputs.plannedFlowKgPerS } : {}),
    ...(inputs.samples !== undefined ? { samples: inputs.samples } : {}),
  });
  let recharge: RechargeResult | null = null;
  if (inputs.reservoir !== null) {
    const r = inputs.reservoir;
    recharge = estimateRecharge(fit, {
      theory: r.theory,
      areaM2: r.params.areaM2,
      meanMassFlowKgPerS: r.meanFlowKgPerS,
      backgroundHeatFlowWPerM2: r.backgroundWPerM2,
      seed: inputs.seed,
      ...(inputs.samples !== undefined ? { samples: inputs.samples } : {}),
    });
  }
  return { group, fit, cp, forecast, recharge };
}

export function runForecast(args: ParsedArgs, io: CliIo): number {
  if (seriesSource(args) === 'db') return runForecastDb(args, io);
  const inputs = readInputs(args, io.cwd);
  const csv = loadSeries(args, io.cwd);
  const results = csv.groups.map((g) => forecastGroup(g, args, inputs));
  if (args.flag('json')) {
    const forecasts = results.map((r) => forecastToJson(
      r.group, r.forecast, r.cp, inputs.plannedFlowKgPerS,
      fitToJson(r.fit, r.group.group, r.group.originMs),
      r.recharge === null || inputs.reservoir === null ? null : rechargeToJson(r.recharge, inputs.reservoir),
    ));
    io.stdout.write(toJsonText({ forecasts }));
    return 0;
  }
  const timeUnit = args.string('time-unit') ?? 'd';
  const lines: string[] = [
    `tauwell forecast: ${csv.file}, ${csv.dataRows} data rows, ${csv.groups.length} group${csv.groups.length === 1 ? '' : 's'}`,
    `economic limit: ${inputs.limitText}; horizon ${num0(inputs.horizonS / JULIAN_YEAR_S)} yr past the last reading; seed ${inputs.seed}`,
  ];
  for (const r of results) {
    lines.push('', groupHeading(r.group.group, 'Forecast'), `  ${timeOriginText(csv, r.group, timeUnit)}`);
    lines.push(...fitLines(r.fit, inputs.referenceC), '');
    lines.push(...forecastLines(r, inputs.referenceC, inputs.plannedFlowKgPerS));
    if (r.recharge !== null && inputs.reservoir !== null) lines.push('', ...rechargeLines(r.recharge, inputs.reservoir, r.fit.model));
  }
  lines.push('', PERCENTILE_NOTE, '', ...CAUTIONS);
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}

function num0(v: number): string {
  return String(Number(v.toPrecision(6)));
}
