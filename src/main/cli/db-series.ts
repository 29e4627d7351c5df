/**
 * `tauwell fit` and `tauwell forecast` on a well of a field log (--db FILE --well NAME) instead of
 * a CSV file: the options, the check that exactly one source is given, the request, and the JSON
 * and text forms — the CSV path's shapes, with keys added (never removed).
 */
import type { FitWellRequest, FitWellResponse } from '../../shared/contract/fits.js';
import { InputError } from '../../shared/errors.js';
import type { Basis } from '../../shared/fit/types.js';
import type { Services } from '../services/index.js';
import type { OptionSpec, ParsedArgs } from './args.js';
import type { SeriesGroup } from './csv-series.js';
import { instantOption, wellRef, zoneOf } from './db-access.js';
import { num, withUnit, years } from './display.js';
import { fitToJson, type FitJson } from './fit-json.js';
import { SERIES_OPTIONS, type ModelChoice } from './series-input.js';

const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (SI Brochure)

/** Options of the CSV path, no longer required by the parser: --db is the alternative. */
const CSV_ONLY = ['csv', 'time', 'time-unit', 'value', 'reference', 'group', 'weight', 'exclude'];

export const CSV_OR_DB_OPTIONS: readonly OptionSpec[] = [
  ...SERIES_OPTIONS.map((o) => (o.required !== true ? o : { ...o, required: false, help: `${o.help} (${o.name === 'csv' ? 'this or --db is required' : 'required with --csv'})` })),
  { name: 'db', kind: 'value', placeholder: 'FILE', help: 'field log to read the readings of --well from, instead of --csv: θ = T − Tref with the well\'s Tref; shut-in, test and bad/spike-flagged readings are left out (and counted)' },
  { name: 'well', kind: 'value', placeholder: 'NAME', help: 'well of the field log (required with --db)' },
  { name: 'field', kind: 'value', placeholder: 'NAME', help: 'field of the well, when several fields have a well of that name' },
  { name: 'from', kind: 'value', placeholder: 'ISO', help: 'with --db: first reading of the fit window (inclusive; time zero stays the well\'s production start or first reading)' },
  { name: 'to', kind: 'value', placeholder: 'ISO', help: 'with --db: last reading of the fit window (inclusive)' },
  {
    name: 'basis', kind: 'value', placeholder: 'BASIS', choices: ['time', 'mass'], defaultText: 'time',
    help: 'with --db: fit θ against elapsed time (s), or against the cumulative produced mass (kg) from the normalised mass flows, which gives the characteristic mass Mc = C/cw whatever the flow history',
  },
];

export const DB_SERIES_NOTE =
  'With --db, time zero is the well\'s production start (or its first reading); a naive --from/--to is local time in the field\'s zone. Each fit is stored in the field log with a fingerprint of the readings it used.';

/** Which input the command reads; exactly one of --csv and --db. */
export function seriesSource(args: ParsedArgs): 'csv' | 'db' {
  if (args.has('csv') && args.has('db')) throw new InputError('give --csv FILE or --db FILE, not both', { field: '--db' });
  if (args.has('db')) {
    const csvOnly = CSV_ONLY.find((o) => args.has(o));
    if (csvOnly !== undefined) {
      const why = csvOnly === 'reference' ? 'the well\'s own reference temperature is used; change it on the well' : 'it describes a CSV file';
      throw new InputError(`not used with --db: ${why}`, { field: `--${csvOnly}` });
    }
    if (!args.has('well')) throw new InputError('missing: --db needs the well to fit', { field: '--well' });
    return 'db';
  }
  if (!args.has('csv')) throw new InputError('missing input: give --csv FILE --time COL --value COL, or --db FILE --well NAME', { field: '--csv' });
  for (const o of ['well', 'field', 'from', 'to']) if (args.has(o)) throw new InputError('needs --db (a CSV is fitted whole, grouped by --group)', { field: `--${o}` });
  if ((args.string('basis') ?? 'time') !== 'time') throw new InputError('the mass basis needs the flows of a field log: give --db FILE --well NAME', { field: '--basis' });
  return 'csv';
}

export function fitRequestOf(args: ParsedArgs, services: Services): FitWellRequest {
  const ref = wellRef(args);
  const zone = zoneOf(services, ref);
  const from = instantOption(args, 'from', zone);
  const to = instantOption(args, 'to', zone);
  return {
    ...ref,
    model: (args.string('model') ?? 'exponential') as ModelChoice,
    basis: (args.string('basis') ?? 'time') as Basis,
    ...(from !== undefined ? { from: from.iso } : {}),
    ...(to !== undefined ? { to: to.iso } : {}),
  };
}

/** The CSV path's fit JSON for the well (group = the well), with what the field log adds. */
export function dbFitJson(r: FitWellResponse): FitJson & Record<string, unknown> {
  return {
    ...fitToJson(r.fit, r.well.name, Date.parse(r.timeOrigin)),
    well: r.well.name,
    field: r.well.field,
    window: r.window,
    timeOriginSource: r.timeOriginSource,
    referenceTemperature: { value: r.referenceTemperatureC, unit: '°C' },
    counts: r.counts,
    meanMassFlow: { value: r.meanMassFlowKgPerS, unit: 'kg/s' },
    producedMass: r.producedMass === null ? null : { ...r.producedMass, unit: 'kg' },
    stored: r.stored,
    assumptions: r.assumptions,
  };
}

/** The series the CSV path would have built, for the shared text and JSON formatters. */
export function seriesGroupOf(r: FitWellResponse): SeriesGroup {
  const included = r.points.filter((p) => p.included && p.thetaK !== null);
  const meanC = r.meanProductionTemperatureC;
  return {
    group: r.well.name,
    x: Float64Array.from(r.points, (p) => p.x),
    theta: Float64Array.from(r.points, (p) => p.thetaK ?? NaN),
    include: Uint8Array.from(r.points, (p) => (p.included ? 1 : 0)),
    lines: Uint32Array.from(r.points, (p) => p.readingId),
    originMs: Date.parse(r.timeOrigin),
    meanProductionTemperatureK: included.length === 0 || meanC === null ? null : meanC + ZERO_CELSIUS_K,
  };
}

/** Lines that say what the fit read: window, time zero, exclusions, how mass was counted, where it was stored. */
export function dbFitLines(r: FitWellResponse): string[] {
  const lines = r.assumptions.map((a) => `  ${a}`);
  const tau = r.fit.parameters.tau;
  if (r.basis === 'mass' && tau !== undefined && r.meanMassFlowKgPerS !== null && Number.isFinite(tau.value)) {
    lines.push(`  characteristic mass Mc = ${withUnit(tau.value, 'kg')}; at the mean fitted flow ${num(r.meanMassFlowKgPerS)} kg/s, τ = Mc/ṁ = ${years(tau.value / r.meanMassFlowKgPerS, 5)} (${num(tau.value / r.meanMassFlowKgPerS)} s)`);
  }
  lines.push(`  stored as fit ${r.stored.fitId} (${r.stored.engineVersion}; data fingerprint ${r.stored.fingerprint.slice(0, 16)}…)`);
  return lines;
}
