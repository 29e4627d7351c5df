// The field-log commands in-process: init, demo, add-well, wells, log, readings, edit, delete, export —
// their output shapes, the audit's `who`, and bad input (exit 2, one line naming the option or file).
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { userInfo } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { commandHelp } from '../src/main/cli/args.js';
import { ADD_WELL_COMMAND } from '../src/main/cli/commands/add-well.js';
import { DEMO_COMMAND } from '../src/main/cli/commands/demo.js';
import { DELETE_COMMAND, EDIT_COMMAND } from '../src/main/cli/commands/edit.js';
import { EXPORT_COMMAND } from '../src/main/cli/commands/export.js';
import { FIT_COMMAND } from '../src/main/cli/commands/fit.js';
import { FORECAST_COMMAND } from '../src/main/cli/commands/forecast.js';
import { INIT_COMMAND } from '../src/main/cli/commands/init.js';
import { LOG_COMMAND } from '../src/main/cli/commands/log.js';
import { READINGS_COMMAND } from '../src/main/cli/commands/readings.js';
import { WELLS_COMMAND } from '../src/main/cli/commands/wells.js';
import { cli, tempDir } from './cli-helpers.js';

let dir: string;
beforeAll(async () => {
  dir = tempDir();
  const run = await cli(['demo', '--db', 'kr.sqlite'], dir);
  expect(run.code).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function ok(argv: string[]): Promise<string> {
  const run = await cli(argv, dir);
  if (run.code !== 0) throw new Error(`exit ${run.code}: ${run.stderr}`);
  return run.stdout;
}

/** Runs a command that must fail on bad input: exit 2, one line on stderr. */
async function bad(argv: string[]): Promise<string> {
  const run = await cli(argv, dir);
  expect(run.code).toBe(2);
  expect(run.stdout).toBe('');
  expect(run.stderr.endsWith('\n')).toBe(true);
  expect(run.stderr.trimEnd().split('\n')).toHaveLength(1);
  return run.stderr;
}

describe('tauwell demo and init', () => {
  it('demo says the field is invented, and refuses to overwrite a file without --force', async () => {
    const again = await bad(['demo', '--db', 'kr.sqlite']);
    expect(again).toBe('tauwell: kr.sqlite, field "--db": the file exists; the demo is built into a new file (give --force to replace it)\n');
    const forced = await ok(['demo', '--db', 'other.sqlite', '--json']);
    expect(JSON.parse(forced)).toMatchObject({ invented: true, liveReadings: 2496 });
    const replaced = await ok(['demo', '--db', 'other.sqlite', '--force']);
    expect(replaced).toMatch(/^built the INVENTED demo field "Kettle Ridge \(invented\)" into other.sqlite — not a real site/);
  });

  it('init makes an empty log, optionally with a field; add-well adds a well', async () => {
    expect(await ok(['init', '--db', 'new.sqlite', '--field', 'North', '--time-zone', 'Europe/Berlin'])).toBe(
      'created the field log new.sqlite (schema 4)\nadded the field "North" (time zone Europe/Berlin)\n',
    );
    expect(existsSync(join(dir, 'new.sqlite'))).toBe(true);
    expect(await ok(['init', '--db', 'new.sqlite'])).toBe('new.sqlite: a field log with schema 4\n');
    expect(await ok(['add-well', '--db', 'new.sqlite', '--field', 'North', '--name', 'N-1', '--kind', 'production', '--reference-temperature', '65', '--production-start', '2024-03-01 08:00']))
      .toBe('added the production well N-1 to "North"\n');
    const wells = JSON.parse(await ok(['wells', '--db', 'new.sqlite', '--json']));
    // 08:00 CET (UTC+1, Europe/Berlin in March before the change; IANA tz, common practice) = 07:00Z
    expect(wells.fields[0].wells[0]).toMatchObject({ name: 'N-1', referenceTemperatureC: 65, productionStart: '2024-03-01T07:00:00.000Z', latestReading: null });
    expect(await bad(['readings', '--db', 'missing.sqlite', '--well', 'X'])).toMatch(/^tauwell: missing.sqlite, field "--db": no such field log; create one with `tauwell init --db missing.sqlite`/);
  });
});

describe('tauwell log, readings, edit, delete', () => {
  it('logs a reading in the user\'s units, naive times read in the field\'s zone, who = the OS user', async () => {
    const out = await ok([
      'log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2025-12-22 22:00', '--production-temperature', '298.9', '--temperature-unit', 'degF',
      '--flow', '560', '--flow-unit', 'm3/h', '--pressure', '24.1', '--pressure-unit', 'bar', '--note', 'typed in',
    ]);
    // 22:00 NZDT (UTC+13, Pacific/Auckland in December; IANA tz, common practice) = 09:00Z
    expect(out).toMatch(/^logged reading \d+: KR-1 at 2025-12-22T09:00:00Z, production 148.28 °C, flow [\d.]+ kg\/s \(0.15556 m3\/s × [\d.]+ kg\/m3\), pressure 2.41 MPa, producing\n/);
    expect(out).toMatch(/time: 2025-12-22 22:00 read as local time in Pacific\/Auckland/);
    expect(out).toMatch(/assumption: volume flow converted to mass with the IAPWS-IF97 water density/);
    const audit = JSON.parse(await ok(['export', '--db', 'kr.sqlite', 'audit', '--format', 'json'])).rows;
    expect(audit.at(-1)).toMatchObject({ action: 'create', entity: 'reading', who: userInfo().username, reason: 'logged by hand' });
  });

  it('readings --json prints the documented shape', async () => {
    const json = JSON.parse(await ok(['readings', '--db', 'kr.sqlite', '--well', 'KR-1', '--from', '2025-12-15T09:00Z', '--json']));
    expect(Object.keys(json)).toEqual(['readings']);
    expect(json.readings).toHaveLength(2);
    const [stored, typed] = json.readings;
    for (const key of ['time', 'productionTemperatureC', 'injectionTemperatureC', 'massFlowKgPerS', 'volumeFlowM3PerS', 'pressureMPa', 'status', 'flags', 'source']) {
      expect(stored).toHaveProperty(key);
    }
    expect(stored).toMatchObject({ time: '2025-12-15T09:00:00.000Z', productionTemperatureC: 148.6, massFlowKgPerS: 56.8, volumeFlowM3PerS: null, pressureMPa: 2.38, status: 'producing', flags: [], source: 'manual' });
    expect(typed.time).toBe('2025-12-22T09:00:00.000Z');
    // (298.9 − 32)·5/9 = 148.2777… °C (NIST SP 811 B.8)
    expect(typed.productionTemperatureC).toBeCloseTo(148.27777777777777, 12);
    expect(typed.injectionTemperatureC).toBeNull();
    expect(typed.volumeFlowM3PerS).toBeCloseTo(560 / 3600, 12); // m³/h → m³/s
    expect(typed.massFlowKgPerS).toBeCloseTo(typed.volumeFlowM3PerS * typed.flowDensityKgPerM3, 8);
  });

  it('readings as a table and as CSV', async () => {
    const table = await ok(['readings', '--db', 'kr.sqlite', '--well', 'KR-3', '--from', '2025-12-08T09:00Z']);
    expect(table.split('\n')[0]).toBe('KR-3: 2 readings');
    expect(table).toMatch(/id\s+time \(UTC\)\s+T prod °C/);
    const csv = await ok(['readings', '--db', 'kr.sqlite', '--well', 'KR-3', '--from', '2025-12-08T09:00Z', '--csv']);
    expect(csv.split('\r\n')[0]).toMatch(/^id,well,time \[UTC\],production_temperature \[°C\]/);
    expect(csv.split('\r\n')).toHaveLength(4); // header, 2 rows, final line break
  });

  it('edit and delete, with --who for the audit log', async () => {
    const [r] = JSON.parse(await ok(['readings', '--db', 'kr.sqlite', '--well', 'KR-1', '--from', '2025-12-22T09:00Z', '--json'])).readings;
    const edit = await ok(['edit', '--db', 'kr.sqlite', '--id', String(r.id), '--production-temperature', '148.5', '--clear', 'pressure', '--reason', 'gauge misread', '--who', 'A. Operator']);
    expect(edit).toMatch(new RegExp(`^corrected reading ${r.id}: KR-1 at 2025-12-22T09:00:00Z, production 148.5 °C`));
    expect(edit).not.toMatch(/pressure \d/);
    expect(await ok(['delete', '--db', 'kr.sqlite', '--id', String(r.id), '--reason', 'test entry', '--who', 'A. Operator'])).toMatch(/^deleted reading/);
    const audit = JSON.parse(await ok(['export', '--db', 'kr.sqlite', 'audit', '--format', 'json'])).rows.slice(-2);
    expect(audit.map((a: { action: string; who: string; reason: string }) => [a.action, a.who, a.reason])).toEqual([['edit', 'A. Operator', 'gauge misread'], ['delete', 'A. Operator', 'test entry']]);
    expect(await bad(['edit', '--db', 'kr.sqlite', '--id', String(r.id), '--note', 'x', '--reason', 'x'])).toMatch(/field "--id": reading \d+ was deleted at/);
  });
});

describe('tauwell wells and export', () => {
  it('wells lists the invented field with its wells and latest readings', async () => {
    const text = await ok(['wells', '--db', 'kr.sqlite']);
    expect(text.split('\n')[0]).toMatch(/^Kettle Ridge \(invented\) — time zone Pacific\/Auckland — INVENTED demo field/);
    expect(text).toMatch(/KR-4I\s+injection/);
    const json = JSON.parse(await ok(['wells', '--db', 'kr.sqlite', '--json']));
    expect(json.fields[0].wells.map((w: { name: string; liveReadings: number }) => [w.name, w.liveReadings])).toEqual([['KR-1', 624], ['KR-2', 624], ['KR-3', 624], ['KR-4I', 624]]);
    expect(json.fields[0].wells[1].latestReading).toMatchObject({ time: '2025-12-15T09:00:00.000Z', productionTemperatureC: 140.24 });
  });

  it('export takes what to export as its first word, or --kind; --out writes a file', async () => {
    const csv = await ok(['export', '--db', 'kr.sqlite', 'readings', '--well', 'KR-2']);
    const rows = csv.trimEnd().split('\r\n');
    expect(rows).toHaveLength(625); // header + 624 weekly readings
    expect(rows[0].split(',').slice(0, 4)).toEqual(['id', 'well', 'time [UTC]', 'production_temperature [°C]']);
    expect(await ok(['export', '--db', 'kr.sqlite', '--kind', 'readings', '--well', 'KR-2'])).toBe(csv);
    expect(await ok(['export', 'readings', '--db', 'kr.sqlite', '--well', 'KR-2', '--format', 'json', '--out', 'kr2.json'])).toBe('wrote 624 readings to kr2.json (json)\n');
    expect(JSON.parse(readFileSync(join(dir, 'kr2.json'), 'utf8')).rows).toHaveLength(624);
    expect(await ok(['export', '--db', 'kr.sqlite', 'rejected'])).toBe('import_id,file,line,reason,raw\r\n');
    expect(await bad(['export', '--db', 'kr.sqlite'])).toMatch(/field "--kind": say what to export/);
    expect(await bad(['export', '--db', 'kr.sqlite', 'everything'])).toMatch(/field "--kind": "everything" is not one of readings, rejected, conflicts, audit/);
    expect(await bad(['export', '--db', 'kr.sqlite', 'rejected', '--import', '7'])).toMatch(/field "--import": no import with id 7/);
  });
});

describe('bad input exits 2 with one line naming the option', () => {
  const cases: [string, string[], RegExp][] = [
    ['an impossible temperature', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2026-01-05T09:00Z', '--production-temperature', '1763.4'], /field "--production-temperature": impossible temperature 1763.4 °C/],
    ['a negative flow', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2026-01-05T09:00Z', '--production-temperature', '148', '--flow', '-41.8', '--flow-unit', 'kg/s'], /field "--flow": negative flow/],
    ['an unknown flow unit', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2026-01-05T09:00Z', '--production-temperature', '148', '--flow', '4', '--flow-unit', 'gpx'], /field "--flow-unit": unknown unit "gpx"/],
    ['a missing production temperature', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2026-01-05T09:00Z'], /field "--production-temperature": missing/],
    ['a duplicate instant', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2025-12-15T09:00Z', '--production-temperature', '148'], /field "--time": KR-1 already has a reading at 2025-12-15T09:00:00.000Z \(reading \d+\)/],
    ['a time that is not one', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '15.12.2025', '--production-temperature', '148'], /field "--time": "15.12.2025" is not an ISO 8601 instant/],
    ['an unknown well', ['log', '--db', 'kr.sqlite', '--well', 'KR-9', '--time', '2026-01-05T09:00Z', '--production-temperature', '148'], /field "--well": no well named "KR-9"/],
    ['an unknown status', ['log', '--db', 'kr.sqlite', '--well', 'KR-1', '--time', '2026-01-05T09:00Z', '--production-temperature', '148', '--status', 'running'], /field "--status": "running" is not one of producing, shut-in, test/],
    ['an edit without a reason', ['edit', '--db', 'kr.sqlite', '--id', '1', '--note', 'x'], /field "--reason": missing required option/],
    ['an unknown reading', ['delete', '--db', 'kr.sqlite', '--id', '999999', '--reason', 'x'], /field "--id": no reading with id 999999/],
    ['a clear of something not clearable', ['edit', '--db', 'kr.sqlite', '--id', '1', '--clear', 'status', '--reason', 'x'], /field "--clear": cannot clear "status"/],
  ];
  it.each(cases)('%s', async (_what, argv, message) => {
    expect(await bad(argv)).toMatch(message);
  });
});

describe('help texts list every option with its unit', () => {
  const specs = [INIT_COMMAND, DEMO_COMMAND, ADD_WELL_COMMAND, WELLS_COMMAND, LOG_COMMAND, READINGS_COMMAND, EDIT_COMMAND, DELETE_COMMAND, EXPORT_COMMAND, FIT_COMMAND, FORECAST_COMMAND];
  it.each(specs.map((s) => [s.name, s] as const))('%s --help', async (name, spec) => {
    const help = await ok([name, '--help']);
    expect(help).toBe(commandHelp(spec));
    for (const o of spec.options) expect(help).toContain(`--${o.name}`);
  });

  it('log names the units it takes', async () => {
    const help = await ok(['log', '--help']);
    for (const unit of ['degC', 'degF', 'K', 'kg/s', 't/h', 'm3/s', 'm3/h', 'L/s', 'gpm', 'bbl/d', 'MPa', 'kPa', 'bar', 'psi']) expect(help).toContain(unit);
  });

  it('the overview lists the field-log commands', async () => {
    const help = await ok(['--help']);
    for (const name of ['init', 'demo', 'add-well', 'wells', 'log', 'readings', 'edit', 'delete', 'export']) expect(help).toMatch(new RegExp(`^  ${name}\\s`, 'm'));
  });
});
