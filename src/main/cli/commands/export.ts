/**
 * `tauwell export`: readings, rejected import rows, import conflicts or the audit log, as CSV (a
 * header row; SI and °C with the unit in each header; instants in UTC) or JSON.
 */
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { EXPORT_FORMATS, EXPORT_KINDS, type ExportFormat, type ExportKind } from '../../../shared/contract/exports.js';
import { InputError } from '../../../shared/errors.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, TIME_NOTE, asOptions, instantOption, withServices, zoneOf } from '../db-access.js';
import type { CliIo } from '../io.js';

export const EXPORT_COMMAND: CommandSpec = {
  name: 'export',
  summary: 'Export readings, rejected import rows, import conflicts or the audit log as CSV (SI and °C, units in the headers) or JSON.',
  usage: 'tauwell export --db FILE (readings [--well NAME] | rejected [--import ID] | audit | conflicts [--import ID]) [--format csv|json] [--out FILE]',
  options: [
    DB_OPTION,
    { name: 'kind', kind: 'value', placeholder: 'WHAT', choices: EXPORT_KINDS, help: 'what to export; may also be given as the first word after `export`' },
    { name: 'well', kind: 'value', placeholder: 'NAME', help: 'readings: only this well (default: every well)' },
    { name: 'field', kind: 'value', placeholder: 'NAME', help: 'readings: only this field, or the field of --well' },
    { name: 'import', kind: 'value', placeholder: 'ID', help: 'rejected, conflicts: only this import (default: every import)' },
    { name: 'from', kind: 'value', placeholder: 'ISO', help: 'readings, audit: first instant (inclusive)' },
    { name: 'to', kind: 'value', placeholder: 'ISO', help: 'readings, audit: last instant (inclusive)' },
    { name: 'include-deleted', kind: 'flag', help: 'readings: include soft-deleted readings (with their deletion time)' },
    { name: 'format', kind: 'value', placeholder: 'FORMAT', choices: EXPORT_FORMATS, defaultText: 'csv', help: 'csv (RFC 4180, a header row) or json' },
    { name: 'out', kind: 'value', placeholder: 'FILE', help: 'write to FILE instead of the standard output' },
  ],
  notes: [
    'CSV columns of readings: id, well, time [UTC], production_temperature [°C], injection_temperature [°C], mass_flow [kg/s] (normalised), volume_flow [m3/s] (as logged), flow_density [kg/m3], pressure [Pa], status, flags, note, source, import_id, source_line, deleted [UTC].',
    TIME_NOTE,
  ],
};

/** `export readings --well X` → `--kind readings --well X`: the first bare word names what to export. */
export function exportArgv(argv: readonly string[]): string[] {
  const valueOptions = new Set(EXPORT_COMMAND.options.filter((o) => o.kind === 'value').map((o) => o.name));
  const out: string[] = [];
  let kind: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg.startsWith('--')) {
      out.push(arg);
      if (!arg.includes('=') && valueOptions.has(arg.slice(2)) && i + 1 < argv.length && !argv[i + 1].startsWith('--')) out.push(argv[++i]);
    } else if (kind === undefined) kind = arg;
    else out.push(arg);
  }
  return kind === undefined ? out : ['--kind', kind, ...out];
}

export function runExport(args: ParsedArgs, io: CliIo): number {
  const kind = args.string('kind') as ExportKind | undefined;
  if (kind === undefined) throw new InputError(`say what to export: one of ${EXPORT_KINDS.join(', ')} (e.g. \`tauwell export --db FILE readings --well KR-1\`)`, { field: '--kind' });
  const importId = args.integer('import', 1);
  const result = withServices(args, io, (s) => asOptions(() => {
    const well = args.string('well');
    const field = args.string('field');
    const zone = zoneOf(s, { ...(well !== undefined ? { well } : {}), ...(field !== undefined ? { field } : {}) });
    const from = instantOption(args, 'from', zone);
    const to = instantOption(args, 'to', zone);
    return s.exportData({
      kind,
      format: (args.string('format') ?? 'csv') as ExportFormat,
      ...(well !== undefined ? { well } : {}),
      ...(field !== undefined ? { field } : {}),
      ...(importId !== undefined ? { importId } : {}),
      ...(from !== undefined ? { from: from.iso } : {}),
      ...(to !== undefined ? { to: to.iso } : {}),
      ...(args.flag('include-deleted') ? { includeDeleted: true } : {}),
    });
  }));
  const out = args.string('out');
  if (out === undefined) {
    io.stdout.write(result.text);
    return 0;
  }
  try {
    writeFileSync(resolve(io.cwd, out), result.text);
  } catch (e) {
    throw new InputError(`cannot write the file: ${e instanceof Error ? e.message : String(e)}`, { file: out, field: '--out' });
  }
  io.stdout.write(`wrote ${result.rowCount} ${kind === 'audit' ? 'audit entries' : kind === 'readings' ? 'readings' : `${kind} rows`} to ${out} (${result.format})\n`);
  return 0;
}
