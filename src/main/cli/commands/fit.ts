/** `tauwell fit`: fits a decline model to each group of a CSV series. */
import type { CommandSpec, ParsedArgs } from '../args.js';
import { fitToJson } from '../fit-json.js';
import { fitLines, groupHeading } from '../fit-text.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { SERIES_OPTIONS, fitGroup, loadSeries, modelOf, timeOriginText } from '../series-input.js';

export const FIT_COMMAND: CommandSpec = {
  name: 'fit',
  summary: 'Fit a thermal-decline model θ(t) to field readings: θ0 (K), τ (s and years), θ∞ (K) or b, with standard errors, 95 % intervals, RMSE, R² and AICc.',
  usage: 'tauwell fit --csv FILE --time COL --value COL [--time-unit s|d|yr] [--reference C] [--group COL] [--weight COL] [--exclude COL] [--model exponential|floor|hyperbolic|auto] [--json]',
  options: SERIES_OPTIONS,
  notes: [
    'Models: exponential θ = θ0·e^(−t/τ); floor θ = θ∞ + (θ0 − θ∞)·e^(−t/τ); hyperbolic (Arps) θ = θ0·(1 + b·t/τ)^(−1/b).',
    'JSON output is SI: θ in K, τ in s, with each parameter\'s standard error and 95 % interval; non-finite numbers are null.',
  ],
};

export function runFit(args: ParsedArgs, io: CliIo): number {
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
