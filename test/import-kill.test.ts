// kill -9 in the middle of an import: a child process imports a 300,000-row file through the
// compiled pipeline (dist/, built here as `npm run build:cli` does), says on stdout how far it has
// read, and is killed with SIGKILL mid-file. The field log must then be sound, hold none of that
// import's rows, and show the import as 'interrupted' once opened again. And Ctrl-C (SIGINT) to the
// command: the import is cancelled, rolled back and recorded as such, exit status 130.
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../src/main/db/database.js';
import { FieldRepository } from '../src/main/db/fields.js';
import { WellRepository } from '../src/main/db/wells.js';
import { tempDir } from './db-helpers.js';

const root = fileURLToPath(new URL('..', import.meta.url));
const compiled = join(root, 'dist', 'main', 'services', 'imports.js');
const ROWS = 300_000;
/** Rows the child must report having read before it is killed: well inside the file, well before its end. */
const KILL_AFTER_ROWS = 20_000;

/** Newest modification time of the TypeScript sources under `dir`. */
function newestSource(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource(path));
    else if (entry.name.endsWith('.ts')) newest = Math.max(newest, statSync(path).mtimeMs);
  }
  return newest;
}

beforeAll(() => {
  // `npm test` builds dist/ before the suites run; build here only when it is missing or older than
  // the sources, so that suites running side by side do not rewrite dist/ under each other.
  const sources = ['src/shared', 'src/main/cli', 'src/main/services', 'src/main/db', 'src/main/import']; // tsconfig.cli.json's include
  if (existsSync(compiled) && statSync(compiled).mtimeMs >= Math.max(...sources.map((d) => newestSource(join(root, d))))) return;
  // tsc emits even when files outside the command line have type errors; judged by what it produced.
  try {
    execFileSync(process.execPath, [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', 'tsconfig.cli.json'], { cwd: root, stdio: 'pipe' });
  } catch {
    // Reported below if the module is missing.
  }
  expect(existsSync(compiled)).toBe(true);
}, 180_000);

/** The child: imports `file` into `db`, printing "read N" after every batch. */
const CHILD = `
const [dbFile, csvFile] = process.argv.slice(1);
const { openDatabase } = await import(${JSON.stringify(pathToFileURL(join(root, 'dist', 'main', 'db', 'database.js')).href)});
const { createImportService } = await import(${JSON.stringify(pathToFileURL(compiled).href)});
const fdb = openDatabase(dbFile);
await createImportService(fdb, { who: 'kill test' }).importCsv({ file: csvFile }, {
  onProgress: (p) => { if (p.phase === 'reading') process.stdout.write('read ' + p.counts.rowsRead + '\\n'); },
});
process.stdout.write('done\\n');
`;

/** The command `tauwell import` (its run function), with stderr taken for a terminal so that it draws its bar there. */
const CLI_CHILD = `
const dist = (p) => import(${JSON.stringify(pathToFileURL(join(root, 'dist', 'main')).href)} + p);
const { parseArgs } = await dist('/cli/args.js');
const { IMPORT_COMMAND, importArgv, runImport } = await dist('/cli/commands/import.js');
const stderr = { isTTY: true, write: (t) => process.stderr.write(t) };
const code = await runImport(parseArgs(IMPORT_COMMAND, importArgv(process.argv.slice(1))), { stdout: process.stdout, stderr, env: process.env, cwd: process.cwd() });
process.exitCode = code;
`;

function setUp(dir: string): { dbFile: string; csvFile: string } {
  const dbFile = join(dir, 'field.sqlite');
  const csvFile = join(dir, 'export.csv');
  writeExport(csvFile);
  const setup = openDatabase(dbFile);
  const field = new FieldRepository(setup).create({ name: 'Kill field' });
  const wells = new WellRepository(setup);
  for (let i = 0; i < 10; i++) wells.create({ fieldId: field.id, name: `GT-${i}`, kind: 'production' });
  setup.close();
  return { dbFile, csvFile };
}

function writeExport(path: string): void {
  const lines = ['time,well,temp,flow'];
  const start = Date.UTC(2020, 0, 1);
  for (let i = 0; i < ROWS; i++) lines.push(`${new Date(start + Math.floor(i / 10) * 360_000).toISOString()},GT-${i % 10},${(150 + (i % 7) * 0.1).toFixed(1)},40`);
  writeFileSync(path, lines.join('\n') + '\n');
}

describe('an import killed with SIGKILL mid-file', () => {
  it('leaves a sound field log with none of its rows, the import marked interrupted', async () => {
    const { dbFile, csvFile } = setUp(tempDir());
    const child = spawn(process.execPath, ['--input-type=module', '-e', CHILD, dbFile, csvFile], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => { stderr += d.toString(); });
    const readWhenKilled = await new Promise<number>((resolve, reject) => {
      let buffer = '';
      child.stdout.on('data', (d: Buffer) => {
        buffer += d.toString();
        const lines = buffer.split('\n');
        buffer = lines.pop() as string;
        for (const line of lines) {
          if (line === 'done') reject(new Error('the import finished before it could be killed'));
          const n = Number(line.replace('read ', ''));
          if (n >= KILL_AFTER_ROWS && child.exitCode === null) {
            child.kill('SIGKILL');
            resolve(n);
          }
        }
      });
      child.on('exit', (code) => reject(new Error(`the child exited by itself (${code}): ${stderr}`)));
    });
    await new Promise((resolve) => (child.exitCode !== null || child.signalCode !== null ? resolve(null) : child.once('exit', resolve)));
    expect(child.signalCode).toBe('SIGKILL');
    expect(readWhenKilled).toBeLessThan(ROWS);
    // The uncommitted transaction had reached the write-ahead log: the kill really caught it mid-write.
    expect(statSync(`${dbFile}-wal`).size).toBeGreaterThan(0);

    const fdb = openDatabase(dbFile);
    try {
      expect(fdb.integrityCheck()).toEqual(['ok']);
      const imports = fdb.db.prepare('SELECT id, status, rows_read, imported, message FROM imports').all() as { id: number; status: string; rows_read: number; imported: number; message: string }[];
      expect(imports).toHaveLength(1);
      expect(imports[0]).toMatchObject({ status: 'interrupted', rows_read: 0, imported: 0 });
      expect(imports[0].message).toMatch(/none of its readings were stored/);
      expect(fdb.interruptedImports).toEqual([imports[0].id]);
      const n = (sql: string): number => (fdb.db.prepare(sql).get() as { n: number }).n;
      expect(n('SELECT count(*) AS n FROM readings')).toBe(0);
      expect(n('SELECT count(*) AS n FROM rejected_rows')).toBe(0);
      expect(n('SELECT count(*) AS n FROM conflicts')).toBe(0);
    } finally {
      fdb.close();
    }
  }, 120_000);

  it('Ctrl-C to `tauwell import`: cancelled and rolled back, recorded, exit status 130', async () => {
    const dir = tempDir();
    const { dbFile } = setUp(dir);
    const child = spawn(process.execPath, ['--input-type=module', '-e', CLI_CHILD, 'export.csv', '--db', 'field.sqlite', '--who', 'tester'], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    let signalled = false;
    const exit = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
    child.stderr.on('data', (d: Buffer) => {
      stderr += d.toString();
      // The bar shows "N rows" while reading: interrupt once it is well into the file.
      const rows = [...stderr.matchAll(/% ([\d,]+) rows/g)].map((m) => Number(m[1].replace(/,/g, '')));
      if (!signalled && rows.length > 0 && rows[rows.length - 1] >= KILL_AFTER_ROWS) {
        signalled = true;
        child.kill('SIGINT');
      }
    });
    const code = await exit;
    expect(signalled).toBe(true);
    expect(code).toBe(130);
    expect(stderr).toMatch(/tauwell import: cancelled after [\d]+ data rows \(\d+ % of the file\); nothing from this file was stored\n$/);

    const fdb = openDatabase(dbFile);
    try {
      expect(fdb.integrityCheck()).toEqual(['ok']);
      expect(fdb.db.prepare('SELECT status, rows_read FROM imports').all()).toEqual([{ status: 'cancelled', rows_read: 0 }]);
      expect((fdb.db.prepare('SELECT count(*) AS n FROM readings').get() as { n: number }).n).toBe(0);
      expect(fdb.db.prepare("SELECT who, action FROM audit_log WHERE entity = 'import'").all()).toEqual([{ who: 'tester', action: 'cancel' }]);
    } finally {
      fdb.close();
    }
  }, 120_000);
});
