/** `tauwell wells`: the fields of a field log and their wells, each with its latest reading. */
import type { ReadingJson } from '../../../shared/contract/readings.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, withServices } from '../db-access.js';
import { MISSING, num } from '../display.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { renderTable } from '../table.js';

export const WELLS_COMMAND: CommandSpec = {
  name: 'wells',
  summary: 'List the fields and wells of a field log with each well\'s latest live reading (°C, kg/s, MPa).',
  usage: 'tauwell wells --db FILE [--field NAME] [--json]',
  options: [
    DB_OPTION,
    { name: 'field', kind: 'value', placeholder: 'NAME', help: 'only this field' },
    { name: 'json', kind: 'flag', help: 'print JSON: fields with their wells and latest readings (°C, kg/s, MPa, ISO 8601 UTC)' },
  ],
};

export function runWells(args: ParsedArgs, io: CliIo): number {
  const field = args.string('field');
  const list = withServices(args, io, (s) => s.listWells(field !== undefined ? { field } : {}));
  if (args.flag('json')) {
    io.stdout.write(toJsonText(list));
    return 0;
  }
  const lines: string[] = [];
  if (list.fields.length === 0) lines.push('the field log has no fields yet; add one with `tauwell init --db FILE --field NAME --time-zone ZONE`');
  for (const f of list.fields) {
    if (lines.length > 0) lines.push('');
    lines.push(`${f.name} — time zone ${f.timeZone}${f.notes === '' ? '' : ` — ${f.notes}`}`);
    if (f.wells.length === 0) {
      lines.push('  no wells yet');
      continue;
    }
    const rows = f.wells.map((w) => [
      w.name, w.kind, w.referenceTemperatureC === null ? MISSING : num(w.referenceTemperatureC), w.reservoir ?? MISSING, String(w.liveReadings),
      ...latestCells(w.latestReading),
    ]);
    lines.push(...renderTable(
      ['well', 'kind', 'Tref °C', 'reservoir', 'readings', 'latest reading (UTC)', 'T prod °C', 'T inj °C', 'flow kg/s', 'p MPa', 'status'],
      rows, ['left', 'left', 'right', 'left', 'right', 'left', 'right', 'right', 'right', 'right', 'left'],
    ));
  }
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}

function latestCells(r: ReadingJson | null): string[] {
  if (r === null) return [MISSING, MISSING, MISSING, MISSING, MISSING, MISSING];
  return [r.time.replace('.000Z', 'Z'), num(r.productionTemperatureC), num(r.injectionTemperatureC), num(r.massFlowKgPerS, 4), num(r.pressureMPa, 4), r.status + (r.flags.length > 0 ? ` (${r.flags.join(', ')})` : '')];
}
