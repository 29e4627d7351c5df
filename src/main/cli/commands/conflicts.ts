/**
 * `tauwell conflicts` lists the rows imports held back because a reading with other values already
 * held their well and instant; `tauwell resolve` settles them one by one or all of an import's at
 * once: keep the existing reading, or replace it by the imported values (the old one is soft-deleted,
 * both stay on record, and the audit log says who and why).
 */
import type { ConflictJson } from '../../../shared/contract/imports.js';
import { InputError } from '../../../shared/errors.js';
import { createImportService } from '../../services/imports.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, WHO_OPTION, openFieldLog, whoOf } from '../db-access.js';
import { num } from '../display.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { renderTable } from '../table.js';

export const CONFLICTS_COMMAND: CommandSpec = {
  name: 'conflicts',
  summary: 'List the rows imports held back as conflicts: same well and instant as a stored reading, other values; nothing was overwritten.',
  usage: 'tauwell conflicts --db FILE [--import ID] [--open] [--json]',
  options: [
    DB_OPTION,
    { name: 'import', kind: 'value', placeholder: 'ID', help: 'only the conflicts of this import' },
    { name: 'open', kind: 'flag', help: 'only conflicts not yet resolved' },
    { name: 'json', kind: 'flag', help: 'print the conflicts as JSON (stored units: °C, kg/s, m3/s, Pa; instants in UTC)' },
  ],
  notes: ['Resolve them with `tauwell resolve --db FILE --id N --keep existing|new` or `--import ID --all --keep existing|new`.'],
};

export const RESOLVE_COMMAND: CommandSpec = {
  name: 'resolve',
  summary: 'Resolve import conflicts: keep the existing reading, or replace it by the imported values (the old one is soft-deleted); written to the audit log.',
  usage: 'tauwell resolve --db FILE (--id N | --import ID --all) --keep existing|new [--reason TEXT] [--json]',
  options: [
    DB_OPTION,
    { name: 'id', kind: 'value', placeholder: 'N', help: 'the conflict to resolve' },
    { name: 'import', kind: 'value', placeholder: 'ID', help: 'with --all: every open conflict of this import' },
    { name: 'all', kind: 'flag', help: 'resolve every open conflict of --import' },
    { name: 'keep', kind: 'value', placeholder: 'WHICH', required: true, choices: ['existing', 'new'], help: 'existing: keep the stored reading; new: store the imported values instead' },
    { name: 'reason', kind: 'value', placeholder: 'TEXT', help: 'why, for the audit log' },
    WHO_OPTION,
    { name: 'json', kind: 'flag', help: 'print the resolved conflicts as JSON' },
  ],
};

function conflictRows(conflicts: readonly ConflictJson[]): string[] {
  const rows = conflicts.map((c) => [
    String(c.id), String(c.importId), String(c.line), c.well, c.time.replace('.000Z', 'Z'),
    `${num(c.values.productionTemperatureC)} °C, ${num(c.values.normalisedMassFlowKgPerS)} kg/s`,
    c.existing === null ? '—' : `${num(c.existing.productionTemperatureC)} °C, ${num(c.existing.massFlowKgPerS)} kg/s (reading ${c.existing.id}${c.existing.deletedAt === null ? '' : ', deleted'})`,
    c.resolution,
  ]);
  return renderTable(['id', 'import', 'line', 'well', 'time (UTC)', 'imported', 'existing', 'resolution'], rows, ['right', 'right', 'right']);
}

export function runConflicts(args: ParsedArgs, io: CliIo): number {
  const importId = args.integer('import', 1);
  const fdb = openFieldLog(args, io);
  try {
    const { conflicts } = createImportService(fdb).listConflicts({
      ...(importId !== undefined ? { importId } : {}), ...(args.flag('open') ? { open: true } : {}),
    });
    if (args.flag('json')) {
      io.stdout.write(toJsonText({ conflicts }));
      return 0;
    }
    const scope = importId === undefined ? '' : ` of import ${importId}`;
    if (conflicts.length === 0) {
      io.stdout.write(`no${args.flag('open') ? ' open' : ''} conflicts${scope}\n`);
      return 0;
    }
    const open = conflicts.filter((c) => c.resolution === 'open').length;
    io.stdout.write([`${conflicts.length} conflict${conflicts.length === 1 ? '' : 's'}${scope}, ${open} open:`, ...conflictRows(conflicts)].join('\n') + '\n');
    return 0;
  } finally {
    fdb.close();
  }
}

export function runResolve(args: ParsedArgs, io: CliIo): number {
  const id = args.integer('id', 1);
  const importId = args.integer('import', 1);
  const all = args.flag('all');
  if (id !== undefined && (importId !== undefined || all)) throw new InputError('give --id N, or --import ID --all, not both', { field: '--id' });
  if (id === undefined && importId === undefined) throw new InputError('name the conflict (--id N) or the import (--import ID --all)', { field: '--id' });
  if (importId !== undefined && !all) throw new InputError('say --all to resolve every open conflict of the import (or give --id N)', { field: '--all' });
  const reason = args.string('reason');
  const fdb = openFieldLog(args, io);
  try {
    const service = createImportService(fdb, { who: whoOf(args) });
    let resolved: ConflictJson[];
    try {
      resolved = service.resolveConflicts({
        ...(id !== undefined ? { id } : { importId: importId as number, all: true }),
        keep: args.requireString('keep') as 'existing' | 'new',
        ...(reason !== undefined ? { reason } : {}),
      }).resolved;
    } catch (e) {
      const option: Record<string, string> = { id: '--id', importId: '--import', all: '--all', reason: '--reason' };
      if (e instanceof InputError && e.where.field !== undefined && option[e.where.field] !== undefined) {
        throw new InputError(e.reason, { ...e.where, field: option[e.where.field] });
      }
      throw e;
    }
    if (args.flag('json')) {
      io.stdout.write(toJsonText({ resolved }));
      return 0;
    }
    const kept = args.requireString('keep') === 'existing' ? 'kept the existing reading' : 'stored the imported values (the old reading soft-deleted)';
    io.stdout.write([`resolved ${resolved.length} conflict${resolved.length === 1 ? '' : 's'}: ${kept}`, ...conflictRows(resolved)].join('\n') + '\n');
    return 0;
  } finally {
    fdb.close();
  }
}
