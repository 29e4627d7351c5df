/** `tauwell init`: a new, empty field log (or the schema check of an existing one), optionally with a first field. */
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, WHO_OPTION, withServices } from '../db-access.js';
import type { CliIo } from '../io.js';

export const INIT_COMMAND: CommandSpec = {
  name: 'init',
  summary: 'Create a new field log (an SQLite file), or bring an existing one to the newest schema; optionally add a first field.',
  usage: 'tauwell init --db FILE [--field NAME --time-zone ZONE [--notes TEXT]] [--who NAME]',
  options: [
    DB_OPTION,
    { name: 'field', kind: 'value', placeholder: 'NAME', help: 'also create a field of this name' },
    { name: 'time-zone', kind: 'value', placeholder: 'ZONE', defaultText: 'UTC', help: 'IANA time zone of the new field, e.g. Pacific/Auckland; naive timestamps of the field are local to it' },
    { name: 'notes', kind: 'value', placeholder: 'TEXT', help: 'notes on the new field' },
    WHO_OPTION,
  ],
  notes: ['Wells are added with `tauwell add-well`; readings with `tauwell log` (or the CSV import).'],
};

export function runInit(args: ParsedArgs, io: CliIo): number {
  const typed = args.requireString('db');
  const existed = existsSync(resolve(io.cwd, typed));
  const lines = withServices(args, io, (services, fdb) => {
    const out = [
      existed
        ? `${typed}: a field log with schema ${fdb.schemaVersion}${fdb.backupPath === null ? '' : ` (upgraded; the previous file is kept as ${fdb.backupPath})`}`
        : `created the field log ${typed} (schema ${fdb.schemaVersion})`,
    ];
    const field = args.string('field');
    if (field !== undefined) {
      const zone = args.string('time-zone');
      const notes = args.string('notes');
      const f = services.createField({ name: field, ...(zone !== undefined ? { timeZone: zone } : {}), ...(notes !== undefined ? { notes } : {}) });
      out.push(`added the field ${JSON.stringify(f.name)} (time zone ${f.timeZone})`);
    } else if (args.has('time-zone') || args.has('notes')) {
      out.push('note: --time-zone and --notes describe a new field; give --field NAME to create one');
    }
    return out;
  }, false);
  io.stdout.write(lines.join('\n') + '\n');
  return 0;
}
