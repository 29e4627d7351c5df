// `tauwell import`, `tauwell conflicts` and `tauwell resolve` run in-process through their own run
// functions, with the same error handling as the command line's main (one line, exit 2).
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseArgs, type CommandSpec, type ParsedArgs } from '../src/main/cli/args.js';
import { CONFLICTS_COMMAND, RESOLVE_COMMAND, runConflicts, runResolve } from '../src/main/cli/commands/conflicts.js';
import { IMPORT_COMMAND, importArgv, runImport } from '../src/main/cli/commands/import.js';
import type { CliIo } from '../src/main/cli/io.js';
import { openDatabase } from '../src/main/db/database.js';
import { FieldRepository } from '../src/main/db/fields.js';
import { ReadingRepository } from '../src/main/db/readings.js';
import { WellRepository } from '../src/main/db/wells.js';
import { InputError } from '../src/shared/errors.js';
import { tempDir, writeFile } from './cli-helpers.js';
import { utc, week } from './import-pipeline-helpers.js';

interface Run { code: number; stdout: string; stderr: string }

const COMMANDS: Record<string, { spec: CommandSpec; run: (a: ParsedArgs, io: CliIo) => number | Promise<number>; argv?: (r: readonly string[]) => string[] }> = {
  import: { spec: IMPORT_COMMAND, run: runImport, argv: importArgv },
  conflicts: { spec: CONFLICTS_COMMAND, run: runConflicts },
  resolve: { spec: RESOLVE_COMMAND, run: runResolve },
};

async function tauwell(argv: string[], cwd: string, stderrIsTty = false): Promise<Run> {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: { write: (s: string) => { stdout += s; } },
    stderr: Object.assign({ write: (s: string) => { stderr += s; } }, stderrIsTty ? { isTTY: true } : {}),
    env: {},
    cwd,
  };
  const [name, ...rest] = argv;
  const c = COMMANDS[name];
  try {
    const code = await c.run(parseArgs(c.spec, c.argv === undefined ? rest : c.argv(rest)), io);
    return { code, stdout, stderr };
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    return { code: 2, stdout, stderr: stderr + `tauwell: ${e.message}\n` };
  }
}

/** A field log "field.sqlite" with field "Test field" (UTC), wells W-1, W-2, and a stored W-1 reading at week 0. */
function setup(): string {
  const dir = tempDir();
  const fdb = openDatabase(join(dir, 'field.sqlite'));
  const field = new FieldRepository(fdb).create({ name: 'Test field' });
  const wells = new WellRepository(fdb);
  const w1 = wells.create({ fieldId: field.id, name: 'W-1', kind: 'production' });
  wells.create({ fieldId: field.id, name: 'W-2', kind: 'production' });
  new ReadingRepository(fdb).insert({ wellId: w1.id, timeMs: utc(week(0)), source: 'manual', productionTemperatureC: 150, massFlowKgPerS: 40, normalisedMassFlowKgPerS: 40 });
  fdb.close();
  return dir;
}

const FILE = ['Zeit,Bohrung,temp,flow', `${week(0)},W-1,151,40`, `${week(1)},W-1,150,40`, `${week(1)},W-3,150,40`, `${week(2)},W-2,n/a,40`].join('\n') + '\n';

describe('tauwell import', () => {
  it('--json prints the record and the rejected rows; repeated --column options are all applied', async () => {
    const dir = setup();
    writeFile(dir, 'export.csv', FILE);
    const r = await tauwell(['import', 'export.csv', '--db', 'field.sqlite', '--column', 'time=Zeit', '--column=well=Bohrung', '--json'], dir);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    // 4 data rows: line 2 conflicts with the stored week-0 reading, line 3 imported, line 4 unknown well, line 5 n/a.
    expect(out.import).toMatchObject({ id: 1, file: join(dir, 'export.csv'), rowsRead: 4, imported: 1, duplicates: 0, conflicts: 1, rejected: 2, flagged: 0, status: 'complete' });
    expect(out.import.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(out.rejected.map((x: { line: number }) => x.line)).toEqual([4, 5]);
    expect(out.rejected[0].reason).toMatch(/unknown well "W-3"/);
    expect(out.unknownWells).toEqual([{ name: 'W-3', rows: 1 }]);
    expect(out.info.columns).toMatchObject({ time: 'Zeit', well: 'Bohrung' });
  });

  it('prints a readable report with the accounting line and the rejected rows; no bar when stderr is not a terminal', async () => {
    const dir = setup();
    writeFile(dir, 'export.csv', FILE);
    const r = await tauwell(['import', 'export.csv', '--db', 'field.sqlite', '--column', 'time=Zeit', '--column', 'well=Bohrung'], dir);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const lines = r.stdout.split('\n');
    expect(lines[0]).toBe('tauwell import: export.csv into "Test field" of field.sqlite: import 1, complete');
    expect(lines[1]).toBe('  4 rows read = 1 imported + 0 duplicates + 1 conflict + 2 rejected');
    expect(r.stdout).toMatch(/unknown wells, their rows rejected: W-3 \(1 row\)/);
    expect(r.stdout).toMatch(/1 conflict held, nothing overwritten: `tauwell conflicts --db field.sqlite --import 1`/);
    expect(r.stdout).toMatch(/\n {2}4: unknown well "W-3"/);
    expect(r.stdout).toMatch(/\n {2}5: .*n\/a/);
  });

  it('draws a progress bar on stderr when it is a terminal', async () => {
    const dir = setup();
    writeFile(dir, 'export.csv', FILE);
    const r = await tauwell(['import', 'export.csv', '--db', 'field.sqlite', '--column', 'time=Zeit', '--column', 'well=Bohrung'], dir, true);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/\r\[#*\.*\] +\d+ %/);
    expect(r.stderr.endsWith('\r\u001b[K')).toBe(true);
  });

  it('reports a file already imported, and imports it again with --force', async () => {
    const dir = setup();
    writeFile(dir, 'export.csv', FILE);
    const args = ['import', 'export.csv', '--db', 'field.sqlite', '--column', 'time=Zeit', '--column', 'well=Bohrung', '--json'];
    await tauwell(args, dir);
    const again = JSON.parse((await tauwell(args, dir)).stdout);
    expect(again.import).toBeNull();
    expect(again.alreadyImported).toMatchObject({ id: 1 });
    const forced = JSON.parse((await tauwell([...args, '--force'], dir)).stdout);
    // The conflict row conflicts again, line 3 is now a duplicate, lines 4 and 5 are rejected again.
    expect(forced.import).toMatchObject({ id: 2, rowsRead: 4, imported: 0, duplicates: 1, conflicts: 1, rejected: 2 });
  });

  it('bad input exits 2 with one line naming the file, line or option', async () => {
    const dir = setup();
    writeFile(dir, 'export.csv', FILE);
    writeFile(dir, 'dates.csv', 'time,well,temp\n03/04/2024 10:00,W-1,150\n');
    const cases: [string[], RegExp][] = [
      [['import', 'missing.csv', '--db', 'field.sqlite'], /^tauwell: missing\.csv: no such file\n$/],
      [['import', '--db', 'field.sqlite'], /^tauwell: field "--file": name the CSV file/],
      [['import', 'export.csv', '--db', 'field.sqlite'], /^tauwell: export\.csv:1: no column for time, well/],
      [['import', 'export.csv', '--db', 'field.sqlite', '--column', 'depth=Zeit'], /^tauwell: field "--column": unknown role "depth"/],
      [['import', 'export.csv', '--db', 'field.sqlite', '--column', 'time=Zeit', '--column', 'well=Bohrung', '--timezone', 'Mars/Olympus'], /^tauwell: field "--timezone": unknown time zone/],
      [['import', 'dates.csv', '--db', 'field.sqlite'], /^tauwell: dates\.csv:2, field "time": .*--date-order/],
      [['import', 'export.csv', '--db', 'nowhere.sqlite'], /^tauwell: nowhere\.sqlite, field "--db": no such field log/],
    ];
    for (const [argv, message] of cases) {
      const r = await tauwell(argv, dir);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    }
  });
});

describe('tauwell conflicts and resolve', () => {
  it('lists the conflicts of an import and resolves them', async () => {
    const dir = setup();
    writeFile(dir, 'export.csv', FILE);
    await tauwell(['import', 'export.csv', '--db', 'field.sqlite', '--column', 'time=Zeit', '--column', 'well=Bohrung'], dir);
    const list = await tauwell(['conflicts', '--db', 'field.sqlite', '--import', '1'], dir);
    expect(list.code).toBe(0);
    expect(list.stdout).toMatch(/^1 conflict of import 1, 1 open:/);
    expect(list.stdout).toMatch(/151 °C, 40 kg\/s\s+150 °C, 40 kg\/s \(reading 1\)\s+open/);

    const json = JSON.parse((await tauwell(['conflicts', '--db', 'field.sqlite', '--json'], dir)).stdout);
    expect(json.conflicts[0]).toMatchObject({ id: 1, importId: 1, line: 2, well: 'W-1', resolution: 'open' });

    expect((await tauwell(['resolve', '--db', 'field.sqlite', '--import', '1', '--keep', 'new'], dir)).stderr).toMatch(/field "--all"/);
    const done = await tauwell(['resolve', '--db', 'field.sqlite', '--import', '1', '--all', '--keep', 'new', '--who', 'op', '--reason', 'plant export is right'], dir);
    expect(done.code).toBe(0);
    expect(done.stdout).toMatch(/^resolved 1 conflict: stored the imported values/);
    const again = await tauwell(['resolve', '--db', 'field.sqlite', '--id', '1', '--keep', 'existing'], dir);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/field "--id": conflict 1 is already resolved \(replaced/);
    expect((await tauwell(['conflicts', '--db', 'field.sqlite', '--open'], dir)).stdout).toBe('no open conflicts\n');
  });
});
