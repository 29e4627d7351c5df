/** `tauwell log`: one wellhead reading typed in by hand, in the units of the user's choice. */
import type { LogReadingRequest, ReadingJson, ReadingStatus } from '../../../shared/contract/readings.js';
import { READING_STATUSES } from '../../../shared/contract/reading-rules.js';
import type { CommandSpec, OptionSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, FIELD_OPTION, TIME_NOTE, WELL_OPTION, WHO_OPTION, asOptions, cliInstant, listOption, wellRef, withServices, zoneOf } from '../db-access.js';
import { num } from '../display.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';

/** The value options `log` and `edit` share. */
export const VALUE_OPTIONS: readonly OptionSpec[] = [
  { name: 'production-temperature', kind: 'value', placeholder: 'V', help: 'production (wellhead) temperature in --temperature-unit; required for a production well; below −50 °C or above 400 °C is refused' },
  { name: 'injection-temperature', kind: 'value', placeholder: 'V', help: 'reinjection temperature in --temperature-unit' },
  { name: 'temperature-unit', kind: 'value', placeholder: 'U', defaultText: 'degC', help: 'unit of the temperatures: degC, degF or K' },
  { name: 'flow', kind: 'value', placeholder: 'V', help: 'flow in --flow-unit (≥ 0); a volume flow is converted to mass with the IAPWS-IF97 water density at the production temperature and the logged pressure (saturation + 1 MPa when none is logged), and that density is stored with the reading' },
  { name: 'flow-unit', kind: 'value', placeholder: 'U', help: 'unit of --flow: kg/s, t/h, kg/h (mass) or m3/s, m3/h, m3/d, L/s, gpm, bbl/d (volume)' },
  { name: 'pressure', kind: 'value', placeholder: 'V', help: 'absolute wellhead pressure in --pressure-unit' },
  { name: 'pressure-unit', kind: 'value', placeholder: 'U', defaultText: 'MPa', help: 'unit of --pressure: MPa, kPa, bar, psi, Pa or atm (absolute)' },
  { name: 'status', kind: 'value', placeholder: 'S', choices: READING_STATUSES, help: 'well status at the reading; only producing readings enter fits' },
  { name: 'note', kind: 'value', placeholder: 'TEXT', help: 'free-text note' },
  { name: 'flags', kind: 'value', placeholder: 'LIST', help: 'comma list of flags, e.g. bad or spike (a flagged reading is kept but left out of fits)' },
];

export const LOG_COMMAND: CommandSpec = {
  name: 'log',
  summary: 'Log one wellhead reading by hand: temperatures in °C, °F or K, flow as mass or volume, pressure in MPa, kPa, bar or psi; written to the audit log.',
  usage: 'tauwell log --db FILE --well NAME --time ISO --production-temperature V [--temperature-unit U] [--flow V --flow-unit U] [--injection-temperature V] [--pressure V --pressure-unit U] [--status S] [--note TEXT] [--json]',
  options: [
    DB_OPTION, WELL_OPTION, FIELD_OPTION,
    { name: 'time', kind: 'value', placeholder: 'ISO', required: true, help: 'instant of the reading' },
    ...VALUE_OPTIONS,
    WHO_OPTION,
    { name: 'json', kind: 'flag', help: 'print the stored reading as JSON (°C, kg/s, m3/s, MPa, ISO 8601 UTC)' },
  ],
  notes: [TIME_NOTE, 'A well has at most one reading per instant: logging the same instant again is refused (edit that reading instead).'],
};

export function runLog(args: ParsedArgs, io: CliIo): number {
  const ref = wellRef(args);
  const { response, timeNote } = withServices(args, io, (s) => asOptions(() => {
    const time = cliInstant(args.requireString('time'), zoneOf(s, ref), '--time');
    const request: LogReadingRequest = { ...ref, time: time.iso, ...valueOptions(args) };
    return { response: s.logReading(request), timeNote: time.note };
  }));
  if (args.flag('json')) {
    io.stdout.write(toJsonText(response));
    return 0;
  }
  const lines = [`logged reading ${response.reading.id}: ${readingLine(response.reading)}`];
  if (timeNote !== '') lines.push(`  time: ${timeNote}`);
  for (const a of response.assumptions) lines.push(`  assumption: ${a}`);
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}

/** The value options given, as contract keys. */
export function valueOptions(args: ParsedArgs): Omit<LogReadingRequest, 'well' | 'field' | 'time'> {
  const out: Record<string, unknown> = {};
  const numbers = [['production-temperature', 'productionTemperature'], ['injection-temperature', 'injectionTemperature'], ['flow', 'flow'], ['pressure', 'pressure']] as const;
  for (const [option, key] of numbers) {
    const v = args.number(option);
    if (v !== undefined) out[key] = v;
  }
  const texts = [['temperature-unit', 'temperatureUnit'], ['flow-unit', 'flowUnit'], ['pressure-unit', 'pressureUnit'], ['note', 'note']] as const;
  for (const [option, key] of texts) {
    const v = args.string(option);
    if (v !== undefined) out[key] = v;
  }
  const status = args.string('status');
  if (status !== undefined) out.status = status as ReadingStatus;
  const flags = listOption(args, 'flags');
  if (flags !== undefined) out.flags = flags;
  return out;
}

export function readingLine(r: ReadingJson): string {
  const parts = [`${r.well} at ${r.time.replace('.000Z', 'Z')}`];
  if (r.productionTemperatureC !== null) parts.push(`production ${num(r.productionTemperatureC)} °C`);
  if (r.injectionTemperatureC !== null) parts.push(`injection ${num(r.injectionTemperatureC)} °C`);
  if (r.massFlowKgPerS !== null) parts.push(`flow ${num(r.massFlowKgPerS)} kg/s${r.volumeFlowM3PerS === null ? '' : ` (${num(r.volumeFlowM3PerS)} m3/s × ${num(r.flowDensityKgPerM3, 6)} kg/m3)`}`);
  if (r.pressureMPa !== null) parts.push(`pressure ${num(r.pressureMPa)} MPa`);
  parts.push(r.status);
  if (r.flags.length > 0) parts.push(`flags ${r.flags.join(',')}`);
  return parts.join(', ');
}
