/**
 * `tauwell forecast --db FILE --well NAME`: the forecast of a well of a field log, with the JSON and
 * text of the CSV path (keys added, never removed). Tref is the well's; the recharge estimate uses
 * the latest parameter version of the well's reservoir; planned flow and cw default as the service
 * states in its assumptions.
 */
import type { ForecastLimit, ForecastWellResponse } from '../../../shared/contract/fits.js';
import { InputError } from '../../../shared/errors.js';
import { parseReservoirParams } from '../../../shared/reservoir/params.js';
import { reservoirTheory } from '../../../shared/reservoir/theory.js';
import { toSI } from '../../../shared/units.js';
import type { ParsedArgs } from '../args.js';
import { asOptions, withServices } from '../db-access.js';
import { dbFitJson, dbFitLines, fitRequestOf, seriesGroupOf } from '../db-series.js';
import { fitLines } from '../fit-text.js';
import { forecastToJson, rechargeToJson, type ReservoirInput } from '../forecast-json.js';
import { CAUTIONS, PERCENTILE_NOTE, forecastLines, rechargeLines } from '../forecast-text.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';

/** Options of the CSV path that the field log answers itself. */
const NOT_WITH_DB: Readonly<Record<string, string>> = {
  params: "the latest parameter version of the well's reservoir is used",
  'mean-flow': 'the mean flow of the fit window is taken from the readings',
};

function limitOf(args: ParsedArgs): ForecastLimit {
  const given = ['limit-temp', 'limit-theta', 'limit-power'].filter((n) => args.has(n));
  if (given.length === 0) throw new InputError('missing economic limit: give --limit-temp C, --limit-theta K or --limit-power MW', { field: '--limit-temp' });
  if (given.length > 1) throw new InputError(`give one economic limit, not ${given.map((n) => `--${n}`).join(' and ')}`, { field: `--${given[1]}` });
  if (given[0] === 'limit-temp') return { kind: 'production-temperature', temperatureC: args.requireNumber('limit-temp') };
  if (given[0] === 'limit-theta') return { kind: 'theta', thetaK: args.requireNumber('limit-theta') };
  return { kind: 'power', powerW: toSI(args.positive('limit-power') as number, 'MW', 'power') };
}

export function runForecastDb(args: ParsedArgs, io: CliIo): number {
  for (const [option, why] of Object.entries(NOT_WITH_DB)) if (args.has(option)) throw new InputError(`not used with --db: ${why}`, { field: `--${option}` });
  const limit = limitOf(args);
  const file = args.requireString('db');
  const r = withServices(args, io, (s) => asOptions(() => {
    const horizon = args.positive('horizon-years');
    const planned = args.positive('planned-flow');
    const cp = args.positive('specific-heat');
    const seed = args.integer('seed', 0);
    const samples = args.integer('samples', 100);
    const background = args.positive('background-heat-flow');
    return s.forecastWell({
      ...fitRequestOf(args, s), limit,
      ...(horizon !== undefined ? { horizonYears: horizon } : {}),
      ...(planned !== undefined ? { plannedFlowKgPerS: planned } : {}),
      ...(cp !== undefined ? { specificHeatJPerKgK: cp } : {}),
      ...(seed !== undefined ? { seed } : {}),
      ...(samples !== undefined ? { samples } : {}),
      ...(background !== undefined ? { backgroundHeatFlowWPerM2: background } : {}),
    });
  }));
  const group = seriesGroupOf(r.fit);
  const reservoir = reservoirInput(r);
  if (args.flag('json')) {
    const json = {
      ...forecastToJson(group, r.forecast, r.specificHeat, r.plannedFlow.valueKgPerS, dbFitJson(r.fit),
        r.recharge === null || reservoir === null ? null : { ...rechargeToJson(r.recharge, reservoir), reservoirVersion: r.reservoir?.version ?? null }),
      well: r.fit.well.name,
      field: r.fit.well.field,
      plannedFlowSource: r.plannedFlow.source,
      limit: r.limit,
      assumptions: r.assumptions,
    };
    io.stdout.write(toJsonText({ forecasts: [json] }));
    return 0;
  }
  const lines = [
    `tauwell forecast: ${r.fit.well.name} of ${JSON.stringify(r.fit.well.field)} in ${file}, ${r.fit.counts.readings} readings, ${r.fit.basis} basis`,
    `economic limit: ${r.limit.text}; horizon ${r.horizonYears} yr past the last reading; seed ${r.forecast.seed}`,
    '', `Forecast — well ${r.fit.well.name}`, ...dbFitLines(r.fit), ...fitLines(r.fit.fit, r.fit.referenceTemperatureC), '',
    ...forecastLines({ group, cp: r.specificHeat, forecast: r.forecast }, r.fit.referenceTemperatureC, r.plannedFlow.valueKgPerS),
    `  planned flow: ${r.plannedFlow.note}`,
  ];
  if (r.recharge !== null && reservoir !== null) lines.push('', ...rechargeLines(r.recharge, reservoir, r.fit.fit.model));
  else lines.push(`  recharge: ${r.assumptions.find((a) => a.includes('no recharge estimate')) ?? 'not estimated'}`);
  lines.push('', PERCENTILE_NOTE, '', ...CAUTIONS);
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}

/** The reservoir as the CSV path's formatters take it, evaluated again from the stored version. */
function reservoirInput(r: ForecastWellResponse): ReservoirInput | null {
  if (r.reservoir === null) return null;
  const params = parseReservoirParams(r.reservoir.version.params);
  return {
    file: `${r.reservoir.name} version ${r.reservoir.version.version}`,
    params,
    theory: reservoirTheory(params),
    meanFlowKgPerS: r.reservoir.meanMassFlowKgPerS,
    backgroundWPerM2: r.reservoir.backgroundHeatFlowWPerM2,
  };
}

