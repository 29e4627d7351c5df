/** `tauwell demo`: the INVENTED demo field "Kettle Ridge (invented)" built into a new field log. */
import { existsSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../../shared/errors.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, openFieldLog } from '../db-access.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { createServices } from '../../services/index.js';
import { DEMO_OPERATOR } from '../../services/demo.js';

export const DEMO_COMMAND: CommandSpec = {
  name: 'demo',
  summary: 'Build the INVENTED demo field "Kettle Ridge (invented)" — not a real site — into a new field log: four wells, twelve years of weekly readings, two reservoir versions, corrections in the audit log.',
  usage: 'tauwell demo --db FILE [--force] [--json]',
  options: [
    DB_OPTION,
    { name: 'force', kind: 'flag', help: 'replace FILE if it exists (its readings are lost)' },
    { name: 'json', kind: 'flag', help: 'print what was built as JSON' },
  ],
  notes: [
    'The demo readings come from a seeded model (src/shared/demo/invented-field.ts), the same one that writes demo/invented-field.csv; the entries and corrections are recorded as made by "' + DEMO_OPERATOR + '".',
  ],
};

export function runDemo(args: ParsedArgs, io: CliIo): number {
  const typed = args.requireString('db');
  const path = resolve(io.cwd, typed);
  if (existsSync(path)) {
    if (!args.flag('force')) throw new InputError('the file exists; the demo is built into a new file (give --force to replace it)', { file: typed, field: '--db' });
    for (const suffix of ['', '-wal', '-shm']) rmSync(path + suffix, { force: true });
  }
  const fdb = openFieldLog(args, io, false);
  let summary;
  try {
    summary = createServices(fdb).buildDemo();
  } finally {
    fdb.close();
  }
  if (args.flag('json')) {
    io.stdout.write(toJsonText(summary));
    return 0;
  }
  io.stdout.write([
    `built the INVENTED demo field "${summary.field.name}" into ${typed} — not a real site`,
    `  time zone ${summary.field.timeZone}; wells ${summary.wells.join(', ')}; reservoir "${summary.reservoir}" with ${summary.reservoirVersions} parameter versions`,
    `  ${summary.liveReadings} readings (${summary.flaggedReadings} flagged bad, ${summary.deletedReadings} deleted), ${summary.corrections} corrections, ${summary.auditEntries} audit entries`,
    `  try: tauwell wells --db ${typed}    tauwell fit --db ${typed} --well KR-1 --basis mass --model auto`,
  ].join('\n') + '\n');
  return 0;
}
