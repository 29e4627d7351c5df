/** `tauwell readings`: one well's readings as a table, JSON or CSV. */
import type { ReadingJson } from '../../../shared/contract/readings.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { InputError } from '../../../shared/errors.js';
import { DB_OPTION, FIELD_OPTION, TIME_NOTE, WELL_OPTION, instantOption, wellRef, withServices, zoneOf } from '../db-access.js';
import { MISSING, num } from '../display.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { renderTable } from '../table.js';

export const READINGS_COMMAND: CommandSpec = {
  name: 'readings',
  summary: 'List a well\'s readings: production and injection temperature (°C), normalised mass flow (kg/s), wellhead pressure (MPa), status, flags.',
  usage: 'tauwell readings --db FILE --well NAME [--field NAME] [--from ISO] [--to ISO] [--include-deleted] [--json|--csv]',
  options: [
    DB_OPTION, WELL_OPTION, FIELD_OPTION,
    { name: 'from', kind: 'value', placeholder: 'ISO', help: 'first instant to list (inclusive)' },
    { name: 'to', kind: 'value', placeholder: 'ISO', help: 'last instant to list (inclusive)' },
    { name: 'include-deleted', kind: 'flag', help: 'list soft-deleted readings too (they carry deletedAt)' },
    { name: 'json', kind: 'flag', help: 'print {"readings":[…]}: time ISO 8601 UTC, °C, kg/s (massFlowKgPerS is the normalised mass flow), m3/s, MPa; absent values null' },
    { name: 'csv', kind: 'flag', help: 'print CSV with a header row (SI and °C, units in the headers), as `tauwell export readings`' },
  ],
  notes: [TIME_NOTE],
};

export function runReadings(args: ParsedArgs, io: CliIo): number {
  if (args.flag('json') && args.flag('csv')) throw new InputError('give --json or --csv, not both', { field: '--csv' });
  const ref = wellRef(args);
  const out = withServices(args, io, (s) => {
    const zone = zoneOf(s, ref);
    const from = instantOption(args, 'from', zone);
    const to = instantOption(args, 'to', zone);
    const window = { ...(from !== undefined ? { from: from.iso } : {}), ...(to !== undefined ? { to: to.iso } : {}) };
    if (args.flag('csv')) {
      return s.exportData({ kind: 'readings', format: 'csv', ...ref, ...window, ...(args.flag('include-deleted') ? { includeDeleted: true } : {}) }).text;
    }
    const list = s.listReadings({ ...ref, ...window, ...(args.flag('include-deleted') ? { includeDeleted: true } : {}) });
    if (args.flag('json')) return toJsonText({ readings: list.readings });
    return readingsText(list.well.name, list.readings);
  });
  io.stdout.write(out);
  return 0;
}

function readingsText(well: string, readings: readonly ReadingJson[]): string {
  const rows = readings.map((r) => [
    String(r.id), r.time.replace('.000Z', 'Z'), num(r.productionTemperatureC), num(r.injectionTemperatureC), num(r.massFlowKgPerS, 5),
    num(r.pressureMPa, 4), r.status, r.flags.join(',') || MISSING, r.source, (r.deletedAt === null ? '' : `deleted ${r.deletedAt} `) + r.note,
  ]);
  const head = `${well}: ${readings.length} reading${readings.length === 1 ? '' : 's'}`;
  if (rows.length === 0) return `${head}\n`;
  return [head, ...renderTable(
    ['id', 'time (UTC)', 'T prod °C', 'T inj °C', 'flow kg/s', 'p MPa', 'status', 'flags', 'source', 'note'],
    rows, ['right', 'left', 'right', 'right', 'right', 'right', 'left', 'left', 'left', 'left'],
  )].join('\n') + '\n';
}
