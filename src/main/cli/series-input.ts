/**
 * The input options `fit` and `forecast` share: which CSV, which columns, which units; and the
 * fit of each group that both commands start from.
 */
import { fitAuto, fitDecline, type DeclineSeries } from '../../shared/fit/fit.js';
import type { AutoFitResult, DeclineModel, FitResult } from '../../shared/fit/types.js';
import type { OptionSpec, ParsedArgs } from './args.js';
import { parseSeriesCsv, EXCLUDING_FLAGS, type SeriesCsv, type SeriesGroup } from './csv-series.js';
import { readTextFile } from './read-file.js';

export type ModelChoice = DeclineModel | 'auto';
export const MODEL_CHOICES: readonly ModelChoice[] = ['exponential', 'floor', 'hyperbolic', 'auto'];

export const SERIES_OPTIONS: readonly OptionSpec[] = [
  { name: 'csv', kind: 'value', placeholder: 'FILE', required: true, help: 'CSV file with a header row (line 1); one reading per row' },
  {
    name: 'time', kind: 'value', placeholder: 'COL', required: true,
    help: 'column of elapsed time in --time-unit, or of ISO 8601 instants (e.g. 2024-03-01T08:00Z or +01:00); instants become seconds since the first reading of each group; an instant without Z or offset is read as UTC',
  },
  { name: 'time-unit', kind: 'value', placeholder: 'UNIT', defaultText: 'd', help: 'unit of elapsed-time numbers: s, min, h, d or yr (yr = 365.25 d); ignored for ISO instants' },
  {
    name: 'value', kind: 'value', placeholder: 'COL', required: true,
    help: 'column of the available temperature θ in K; with --reference, of the production temperature in °C',
  },
  { name: 'reference', kind: 'value', placeholder: 'C', help: 'reference temperature Tref in °C (minimum useful or reinjection temperature): θ = T − Tref' },
  { name: 'group', kind: 'value', placeholder: 'COL', help: 'column naming the group of each row (e.g. the well); each group is fitted separately' },
  { name: 'weight', kind: 'value', placeholder: 'COL', help: 'column of weights (1/σ², in 1/K²; ≥ 0; 0 leaves the row out)' },
  {
    name: 'exclude', kind: 'value', placeholder: 'COL',
    help: `column flagging rows to leave out of the fit (they are still counted): ${EXCLUDING_FLAGS.join(', ')} (any case) exclude the row; anything else, or empty, includes it; an excluded row may have empty cells`,
  },
  { name: 'model', kind: 'value', placeholder: 'MODEL', choices: MODEL_CHOICES, defaultText: 'exponential', help: 'decline model; auto fits all three and keeps the lowest AICc' },
  { name: 'json', kind: 'flag', help: 'print JSON (SI units: K, s, J, W) instead of tables' },
];

export function loadSeries(args: ParsedArgs, cwd: string): SeriesCsv {
  const file = args.requireString('csv');
  const text = readTextFile(file, cwd);
  return parseSeriesCsv(text, file, {
    timeColumn: args.requireString('time'),
    valueColumn: args.requireString('value'),
    timeUnit: args.string('time-unit') ?? 'd',
    referenceC: args.number('reference'),
    groupColumn: args.string('group'),
    weightColumn: args.string('weight'),
    excludeColumn: args.string('exclude'),
  });
}

export function modelOf(args: ParsedArgs): ModelChoice {
  return (args.string('model') ?? 'exponential') as ModelChoice;
}

export function fitGroup(group: SeriesGroup, model: ModelChoice): FitResult | AutoFitResult {
  const series: DeclineSeries = {
    basis: 'time',
    x: group.x,
    theta: group.theta,
    include: group.include,
    ...(group.weights !== undefined ? { weights: group.weights } : {}),
  };
  return model === 'auto' ? fitAuto(series) : fitDecline(series, model);
}

/** One line saying where time zero is, for the human-readable output. */
export function timeOriginText(csv: SeriesCsv, group: SeriesGroup, timeUnit: string): string {
  if (group.originMs === null) return `time: elapsed, as logged in ${timeUnit}`;
  const naive = csv.naiveInstants > 0 ? `; ${csv.naiveInstants} instant${csv.naiveInstants === 1 ? '' : 's'} without an offset read as UTC` : '';
  return `time zero: ${new Date(group.originMs).toISOString()} (first reading)${naive}`;
}
