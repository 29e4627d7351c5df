/** `tauwell fit`: fits a decline model to each group of a CSV series. */
import type { CommandSpec, ParsedArgs } from '../args.js';
import { withServices } from '../db-access.js';
import { CSV_OR_DB_OPTIONS, DB_SERIES_NOTE, dbFitJson, dbFitLines, fitRequestOf, seriesSource } from '../db-series.js';
import { fitToJson } from '../fit-json.js';
import { fitLines, groupHeading } from '../fit-text.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { fitGroup, loadSeries, modelOf, timeOriginText } from '../series-input.js';

export const FIT_COMMAND: CommandSpec = {
  name: 'fit',
  summary: 'Fit a thermal-decline model θ(t) to field readings: θ0 (K), τ (s and years), θ∞ (K) or b, with standard errors, 95 % intervals, RMSE, R² and AICc.',
  usage:
    'tauwell fit --csv FILE --time COL --value COL [--time-unit s|d|yr] [--reference C] [--group COL] [--weight COL] [--exclude COL] [--model exponential|floor|hyperbolic|auto] [--json]\n' +
    '       tauwell fit --db FILE --well NAME [--from ISO] [--to ISO] [--basis time|mass] [--model …] [--json]',
  options: CSV_OR_DB_OPTIONS,
  notes: [
    'Models: exponential θ = θ0·e^(−t/τ); floor θ = θ∞ + (θ0 − θ∞)·e^(−t/τ); hyperbolic (Arps) θ = θ0·(1 + b·t/τ)^(−1/b). On the mass basis t is the produced mass M (kg) and τ the characteristic mass Mc (kg).',
    'JSON output is SI: θ in K, τ in s (kg on the mass basis), with each parameter\'s standard error and 95 % interval; non-finite numbers are null.',
    DB_SERIES_NOTE,
  ],
};

export function runFit(args: ParsedArgs, io: CliIo): number {
  if (seriesSource(args) === 'db') return runFitDb(args, io);
  const csv = loadSeries(args, io.cwd);
  const model = modelOf(args);
  const results = csv.groups.map((g) => ({ group: g, fit: fitGroup(g, model) }));
  if (args.flag('json')) {
    io.stdout.write(toJsonText({ fits: results.map(({ group, fit }) => fitToJson(fit, group.group, group.originMs)) }));
    return 0;
  }
  const referenceC = args.number('reference');
  const timeUnit = args.string('time-unit') ?? 'd';
  const lines: string[] = [`tauwell fit: ${csv.file}, ${csv.dataRows} data rows, ${csv.groups.length} group${csv.groups.length === 1 ? '' : 's'}`];
  lines.push(referenceC === undefined ? 'θ read from the value column in K' : `θ = T − Tref with Tref = ${referenceC} °C`);
  for (const { group, fit } of results) {
    lines.push('', groupHeading(group.group, 'Fit'), `  ${timeOriginText(csv, group, timeUnit)}`, ...fitLines(fit, referenceC));
  }
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}

/** The same output for a well of a field log; the JSON adds the field log's keys to the CSV path's. */
function runFitDb(args: ParsedArgs, io: CliIo): number {
  const file = args.requireString('db');
  const r = withServices(args, io, (s) => s.fitWell(fitRequestOf(args, s)));
  if (args.flag('json')) {
    io.stdout.write(toJsonText({ fits: [dbFitJson(r)] }));
    return 0;
  }
  const lines = [
    `tauwell fit: ${r.well.name} of ${JSON.stringify(r.well.field)} in ${file}, ${r.counts.readings} readings, ${r.basis} basis`,
    `θ = T − Tref with Tref = ${r.referenceTemperatureC} °C`,
    '', `Fit — well ${r.well.name}`, ...dbFitLines(r), ...fitLines(r.fit, r.referenceTemperatureC),
  ];
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}
