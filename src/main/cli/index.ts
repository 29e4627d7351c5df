/**
 * The `tauwell` command line: a thin adapter from arguments and CSV/JSON files to the engine in
 * src/shared. Exit status 0 on success, 2 on bad input (one line on stderr naming the file, line
 * and field), 1 on an internal error (one line; the stack only with TAUWELL_DEBUG=1).
 */
import { InputError } from '../../shared/errors.js';
import { commandHelp, optionLines, parseArgs, type CommandSpec, type ParsedArgs } from './args.js';
import { ADD_WELL_COMMAND, runAddWell } from './commands/add-well.js';
import { DEMO_COMMAND, runDemo } from './commands/demo.js';
import { DELETE_COMMAND, EDIT_COMMAND, runDelete, runEdit } from './commands/edit.js';
import { EXPORT_COMMAND, exportArgv, runExport } from './commands/export.js';
import { FIT_COMMAND, runFit } from './commands/fit.js';
import { FORECAST_COMMAND, runForecast } from './commands/forecast.js';
import { CONFLICTS_COMMAND, RESOLVE_COMMAND, runConflicts, runResolve } from './commands/conflicts.js';
import { IMPORT_COMMAND, importArgv, runImport } from './commands/import.js';
import { INIT_COMMAND, runInit } from './commands/init.js';
import { LOG_COMMAND, runLog } from './commands/log.js';
import { READINGS_COMMAND, runReadings } from './commands/readings.js';
import { REPORT_COMMAND, runReport } from './commands/report.js';
import { SERVE_COMMAND, runServe } from './commands/serve.js';
import { THEORY_COMMAND, runTheory } from './commands/theory.js';
import { WATER_COMMAND, runWater } from './commands/water.js';
import { WELLS_COMMAND, runWells } from './commands/wells.js';
import { resolveIo, type CliIo } from './io.js';
import { packageVersion } from './version.js';

export type { CliIo } from './io.js';

interface Command {
  spec: CommandSpec;
  run(args: ParsedArgs, io: CliIo): number | Promise<number>;
  /** Rewrites the arguments before parsing, e.g. a leading word into an option (`export readings`). */
  argv?(rest: readonly string[]): string[];
}

const COMMANDS: readonly Command[] = [
  // the engine on files
  { spec: FIT_COMMAND, run: runFit },
  { spec: FORECAST_COMMAND, run: runForecast },
  { spec: THEORY_COMMAND, run: runTheory },
  { spec: WATER_COMMAND, run: runWater },
  // the field log
  { spec: INIT_COMMAND, run: runInit },
  { spec: DEMO_COMMAND, run: runDemo },
  { spec: ADD_WELL_COMMAND, run: runAddWell },
  { spec: WELLS_COMMAND, run: runWells },
  { spec: LOG_COMMAND, run: runLog },
  { spec: READINGS_COMMAND, run: runReadings },
  { spec: EDIT_COMMAND, run: runEdit },
  { spec: DELETE_COMMAND, run: runDelete },
  { spec: EXPORT_COMMAND, run: runExport, argv: exportArgv },
  { spec: SERVE_COMMAND, run: runServe },
  { spec: IMPORT_COMMAND, run: runImport, argv: importArgv },
  { spec: CONFLICTS_COMMAND, run: runConflicts },
  { spec: RESOLVE_COMMAND, run: runResolve },
  { spec: REPORT_COMMAND, run: runReport },
];

export async function main(argv: string[], io: Partial<CliIo> = {}): Promise<number> {
  const out = resolveIo(io);
  try {
    return await dispatch(argv, out);
  } catch (e) {
    if (e instanceof InputError) {
      out.stderr.write(`tauwell: ${oneLine(e.message)}\n`);
      return 2;
    }
    const message = e instanceof Error ? e.message : String(e);
    out.stderr.write(`tauwell: internal error: ${oneLine(message)}\n`);
    if (out.env.TAUWELL_DEBUG === '1' && e instanceof Error && e.stack !== undefined) out.stderr.write(`${e.stack}\n`);
    return 1;
  }
}

async function dispatch(argv: readonly string[], io: CliIo): Promise<number> {
  const [first, ...rest] = argv;
  if (first === '--version' || first === '-V') {
    io.stdout.write(`tauwell ${packageVersion()}\n`);
    return 0;
  }
  if (first === '--help' || first === '-h' || first === 'help') {
    const topic = first === 'help' ? COMMANDS.find((c) => c.spec.name === rest[0]) : undefined;
    io.stdout.write(topic === undefined ? mainHelp() : commandHelp(topic.spec));
    return 0;
  }
  if (first === undefined) throw new InputError(`missing command; one of ${COMMANDS.map((c) => c.spec.name).join(', ')} (see \`tauwell --help\`)`);
  const command = COMMANDS.find((c) => c.spec.name === first);
  if (command === undefined) {
    throw new InputError(`unknown command ${JSON.stringify(first)}; one of ${COMMANDS.map((c) => c.spec.name).join(', ')} (see \`tauwell --help\`)`);
  }
  const args = parseArgs(command.spec, command.argv === undefined ? rest : command.argv(rest));
  if (args.flag('help')) {
    io.stdout.write(commandHelp(command.spec));
    return 0;
  }
  return await command.run(args, io);
}

/** Overview and every command's options with their units. */
function mainHelp(): string {
  const width = Math.max(...COMMANDS.map((c) => c.spec.name.length)) + 4;
  const lines = [
    `tauwell ${packageVersion()} — thermal-decline fitting and forecasting for geothermal heat-extraction reservoirs`,
    '',
    'Usage: tauwell <command> [options]      tauwell <command> --help      tauwell --version',
    '',
    'Commands:',
    ...COMMANDS.map((c) => `  ${c.spec.name.padEnd(width)}${c.spec.summary}`),
    '',
    'Output: tables with SI and everyday units (years, °C, GWh/TJ, MW); --json prints SI only.',
    'Exit status: 0 success, 2 bad input (one line naming the file, line and field), 1 internal error.',
  ];
  for (const c of COMMANDS) {
    lines.push('', c.spec.usage, ...optionLines(c.spec.options));
  }
  return lines.join('\n') + '\n';
}

function oneLine(text: string): string {
  return text.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}
