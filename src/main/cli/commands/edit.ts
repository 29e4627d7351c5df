/** `tauwell edit` and `tauwell delete`: correct or soft-delete a reading, with the reason in the audit log. */
import type { EditReadingRequest } from '../../../shared/contract/readings.js';
import { InputError } from '../../../shared/errors.js';
import type { CommandSpec, OptionSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, TIME_NOTE, WHO_OPTION, asOptions, cliInstant, withServices } from '../db-access.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { VALUE_OPTIONS, readingLine, valueOptions } from './log.js';

const ID_OPTION: OptionSpec = { name: 'id', kind: 'value', placeholder: 'N', required: true, help: 'id of the reading (as `tauwell readings` lists it)' };
const REASON_OPTION: OptionSpec = { name: 'reason', kind: 'value', placeholder: 'TEXT', required: true, help: 'why, for the audit log' };

export const EDIT_COMMAND: CommandSpec = {
  name: 'edit',
  summary: 'Correct a reading: only the values given change; the old and new values, who and why go to the audit log.',
  usage: 'tauwell edit --db FILE --id N [--time ISO] [--production-temperature V …] --reason TEXT [--who NAME] [--json]',
  options: [
    DB_OPTION, ID_OPTION,
    { name: 'time', kind: 'value', placeholder: 'ISO', help: 'new instant of the reading' },
    ...VALUE_OPTIONS,
    { name: 'clear', kind: 'value', placeholder: 'LIST', help: 'comma list of values to clear: injection-temperature, flow, pressure' },
    REASON_OPTION, WHO_OPTION,
    { name: 'json', kind: 'flag', help: 'print the corrected reading as JSON' },
  ],
  notes: [TIME_NOTE, 'A changed temperature or pressure converts a volume flow again with the new water density.'],
};

export const DELETE_COMMAND: CommandSpec = {
  name: 'delete',
  summary: 'Soft-delete a reading: it leaves listings and fits but stays in the field log, with who and why in the audit log.',
  usage: 'tauwell delete --db FILE --id N --reason TEXT [--who NAME] [--json]',
  options: [DB_OPTION, ID_OPTION, REASON_OPTION, WHO_OPTION, { name: 'json', kind: 'flag', help: 'print the deleted reading as JSON' }],
};

const CLEARABLE: Readonly<Record<string, 'injectionTemperature' | 'flow' | 'pressure'>> = {
  'injection-temperature': 'injectionTemperature', flow: 'flow', pressure: 'pressure',
};

export function runEdit(args: ParsedArgs, io: CliIo): number {
  const id = readingId(args);
  const result = withServices(args, io, (s) => asOptions(() => {
    const request: EditReadingRequest = { id, reason: args.requireString('reason'), ...valueOptions(args) };
    for (const name of (args.string('clear') ?? '').split(',').map((c) => c.trim()).filter((c) => c !== '')) {
      const key = CLEARABLE[name];
      if (key === undefined) throw new InputError(`cannot clear ${JSON.stringify(name)}; one of ${Object.keys(CLEARABLE).join(', ')}`, { field: '--clear' });
      if (args.has(name)) throw new InputError(`--${name} is both given and cleared`, { field: '--clear' });
      request[key] = null;
    }
    let timeNote = '';
    const time = args.string('time');
    if (time !== undefined) {
      // A naive time is local to the field of the reading's well.
      const { well } = s.getReading({ id });
      const t = cliInstant(time, s.getWell({ well: well.name, field: well.field }).field.timeZone, '--time');
      request.time = t.iso;
      timeNote = t.note;
    }
    return { response: s.editReading(request), timeNote };
  }));
  if (args.flag('json')) {
    io.stdout.write(toJsonText(result.response));
    return 0;
  }
  const r = result.response;
  const lines = [r.changed ? `corrected reading ${r.reading.id}: ${readingLine(r.reading)}` : `reading ${r.reading.id} already had these values; nothing changed`];
  if (result.timeNote !== '') lines.push(`  time: ${result.timeNote}`);
  for (const a of r.assumptions) lines.push(`  assumption: ${a}`);
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}

export function runDelete(args: ParsedArgs, io: CliIo): number {
  const id = readingId(args);
  const response = withServices(args, io, (s) => asOptions(() => s.deleteReading({ id, reason: args.requireString('reason') })));
  io.stdout.write(args.flag('json') ? toJsonText(response) : `deleted reading ${response.reading.id} (${readingLine(response.reading)}); it stays in the field log and the audit log\n`);
  return 0;
}

function readingId(args: ParsedArgs): number {
  const id = args.integer('id', 1);
  if (id === undefined) throw new InputError('missing required option', { field: '--id' });
  return id;
}
