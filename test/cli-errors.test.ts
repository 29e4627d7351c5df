// Bad input to `tauwell`: exit status 2 and exactly one line on stderr naming the file, line and
// field at fault — never a stack trace. Internal errors: status 1, one line, stack only on request.
import { rmSync } from 'node:fs';
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { main } from '../src/main/cli/index.js';
import { cli, tempDir, writeFile } from './cli-helpers.js';

let dir: string;

beforeAll(() => {
  dir = tempDir();
  // 15 good rows (lines 2–16), then the bad cell on physical line 17.
  const good = Array.from({ length: 15 }, (_, i) => `2024-01-${String(i + 1).padStart(2, '0')}T08:00Z,A,${(120 - i * 0.1).toFixed(1)},`);
  writeFile(dir, 'wells.csv', ['date,well,temp_C,status', ...good, '2024-01-16T08:00Z,A,abc,', '2024-01-17T08:00Z,A,118.4,'].join('\n') + '\n');
  writeFile(dir, 'ok.csv', 'day,temp_C,flag\n0,120,\n7,119.9,\n14,119.8,\n21,,\n28,119.6,shut-in\n35,119.5,\n');
  writeFile(dir, 'times.csv', 'date,temp_C\n2024-01-01T08:00Z,120\n2024-01-08T08:00Z,119.9\n2024-02-30T08:00Z,119.8\n');
  writeFile(dir, 'mixed.csv', 'date,temp_C\n2024-01-01T08:00Z,120\n7,119.9\n');
  writeFile(dir, 'garbled.csv', 'date,temp_C\nlast tuesday,120\n');
  writeFile(dir, 'short-row.csv', 'day,well,temp_C\n0,A,120\n7,A\n');
  writeFile(dir, 'empty.csv', '');
  writeFile(dir, 'header-only.csv', 'day,temp_C\n');
  writeFile(dir, 'bad-key.json', JSON.stringify({ kind: 'hot-dry-rock', surfaceTemperature: 10, gradient: 0.03, minUsefulTemperature: 70, maxDepth: 5000, area: 1e6, rockDensity: 2700, rockSpecificHeat: 800, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 }, colour: 'red' }));
  writeFile(dir, 'broken.json', '{\n  "kind": "hot-dry-rock",\n  "gradient": 0.03,,\n}\n');
  writeFile(dir, 'steam.json', JSON.stringify({ kind: 'hot-dry-rock', surfaceTemperature: 10, gradient: 0.03, minUsefulTemperature: 70, maxDepth: 5000, area: 1e6, rockDensity: 2700, rockSpecificHeat: 800, massFlow: 50, fluid: { iapws: { temperature: 150, pressure: 0.1 } } }));
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

const fit = (...more: string[]): string[] => ['fit', '--csv', 'ok.csv', '--time', 'day', '--value', 'temp_C', ...more];
const fc = (...more: string[]): string[] => ['forecast', '--csv', 'ok.csv', '--time', 'day', '--value', 'temp_C', '--exclude', 'flag', ...more];

// [what, argv, the one stderr line (a pattern, or the exact text)]
const CASES: [string, string[], RegExp | string][] = [
  ['unparseable number', ['fit', '--csv', 'wells.csv', '--time', 'date', '--value', 'temp_C', '--reference', '60'], 'tauwell: wells.csv:17, field "temp_C": "abc" is not a number'],
  ['unknown column, listing the columns', ['fit', '--csv', 'wells.csv', '--time', 'date', '--value', 'temp'], /^tauwell: wells\.csv:1, field "temp": no such column; the columns are: "date", "well", "temp_C", "status"$/],
  ['unknown group column', ['fit', '--csv', 'wells.csv', '--time', 'date', '--value', 'temp_C', '--group', 'site'], /^tauwell: wells\.csv:1, field "site": no such column/],
  ['empty value cell on a row not excluded', fit(), /^tauwell: ok\.csv:5, field "temp_C": empty cell/],
  ['empty value cell with an exclude column that does not flag it', fit('--exclude', 'flag'), /^tauwell: ok\.csv:5, field "temp_C": empty cell on a row that is not excluded/],
  ['impossible date', ['fit', '--csv', 'times.csv', '--time', 'date', '--value', 'temp_C'], /^tauwell: times\.csv:4, field "date": "2024-02-30T08:00Z" has day 30; 2024-02 has 29 days$/],
  ['number among instants', ['fit', '--csv', 'mixed.csv', '--time', 'date', '--value', 'temp_C'], /^tauwell: mixed\.csv:3, field "date": "7" is not an ISO 8601 instant/],
  ['neither number nor instant', ['fit', '--csv', 'garbled.csv', '--time', 'date', '--value', 'temp_C'], /^tauwell: garbled\.csv:2, field "date": "last tuesday" is neither a number .* nor an ISO 8601 instant$/],
  ['row with too few fields', ['fit', '--csv', 'short-row.csv', '--time', 'day', '--value', 'temp_C'], /^tauwell: short-row\.csv:3, field "temp_C": missing: the row has 2 fields, the header 3$/],
  ['empty file', ['fit', '--csv', 'empty.csv', '--time', 'day', '--value', 'temp_C'], /^tauwell: empty\.csv: the file is empty/],
  ['header without data', ['fit', '--csv', 'header-only.csv', '--time', 'day', '--value', 'temp_C'], /^tauwell: header-only\.csv:2: no data rows/],
  ['missing file', ['fit', '--csv', 'nowhere.csv', '--time', 'day', '--value', 'temp_C'], 'tauwell: nowhere.csv: cannot read the file: no such file'],
  ['unknown option', fit('--colour', 'red'), /^tauwell: field "--colour": unknown option for `tauwell fit`; known: --csv, /],
  ['missing option', ['fit', '--csv', 'ok.csv', '--time', 'day'], /^tauwell: field "--value": missing required option/],
  ['option without its value', ['fit', '--csv', 'ok.csv', '--time', 'day', '--value'], /^tauwell: field "--value": needs a value/],
  ['option given twice', fit('--model', 'floor', '--model', 'auto'), /^tauwell: field "--model": given more than once$/],
  ['unknown model', fit('--model', 'linear'), /^tauwell: field "--model": "linear" is not one of exponential, floor, hyperbolic, auto$/],
  ['unknown time unit', fit('--time-unit', 'fortnight', '--exclude', 'flag'), /^tauwell: field "--time-unit": unknown unit "fortnight" for time; known: s, min, h, d, yr$/],
  ['unparseable option number', fit('--reference', '60,5'), /^tauwell: field "--reference": "60,5" is not a number$/],
  ['stray argument', ['fit', 'ok.csv'], /^tauwell: field "ok\.csv": unexpected argument/],
  ['unknown command', ['fitt'], /^tauwell: unknown command "fitt"; one of fit, forecast, theory, water/],
  ['no command', [], /^tauwell: missing command/],
  ['forecast without a limit', fc(), /^tauwell: field "--limit-temp": missing economic limit/],
  ['two limits', fc('--limit-theta', '20', '--limit-power', '3'), /^tauwell: field "--limit-power": give one economic limit/],
  ['temperature limit without reference', fc('--limit-temp', '60'), /^tauwell: field "--reference": /],
  ['power limit without planned flow', fc('--limit-power', '3'), /^tauwell: field "--planned-flow": /],
  ['recharge without a flow', fc('--limit-theta', '20', '--params', 'bad-key.json'), /^tauwell: field "--mean-flow": /],
  ['negative planned flow', fc('--limit-theta', '20', '--planned-flow', '-5'), /^tauwell: field "--planned-flow": must be greater than zero/],
  ['fractional seed', fc('--limit-theta', '20', '--seed', '1.5'), /^tauwell: field "--seed": must be a whole number/],
  ['unknown key in the parameter file', ['theory', '--params', 'bad-key.json'], /^tauwell: bad-key\.json, field "colour": unknown key/],
  ['parameter file that is not JSON', ['theory', '--params', 'broken.json'], /^tauwell: broken\.json(:\d+)?: not valid JSON/],
  ['parameter file naming steam', ['theory', '--params', 'steam.json'], /^tauwell: steam\.json, field "fluid\.iapws\.pressure": .*steam/],
  ['missing parameter file', ['theory', '--params', 'none.json'], 'tauwell: none.json: cannot read the file: no such file'],
  ['water above region 1', ['water', '--temperature', '400', '--pressure', '30'], /^tauwell: field "--temperature": .*outside IAPWS-IF97 region 1/],
  ['water that is steam', ['water', '--temperature', '150', '--pressure', '0.1'], /^tauwell: field "--pressure": .*steam/],
  ['water temperature below absolute zero', ['water', '--temperature', '-300', '--pressure', '1'], /^tauwell: field "--temperature": .*below absolute zero/],
];

describe('bad input: exit 2, one line naming file, line and field', () => {
  it.each(CASES)('%s', async (_what, argv, expected) => {
    const run = await cli(argv, dir);
    expect(run.code).toBe(2);
    expect(run.stdout).toBe('');
    expect(run.stderr.endsWith('\n')).toBe(true);
    const lines = run.stderr.slice(0, -1).split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).not.toMatch(/\bat .*\(.*:\d+:\d+\)/); // no stack frame
    if (typeof expected === 'string') expect(lines[0]).toBe(expected);
    else expect(lines[0]).toMatch(expected);
  });

  it('an excluded row may leave its cells empty', async () => {
    writeFile(dir, 'shut.csv', 'day,temp_C,flag\n0,120,\n7,119.9,\n14,,shut-in\n21,119.7,\n28,119.6,\n35,119.5,\n');
    const run = await cli(['fit', '--csv', 'shut.csv', '--time', 'day', '--value', 'temp_C', '--exclude', 'flag', '--json'], dir);
    expect(run.code).toBe(0);
    expect(JSON.parse(run.stdout).fits[0].nExcluded).toBe(1);
  });
});

describe('internal errors', () => {
  const failingStdout = { write: (): never => { throw new Error('disk full'); } };

  it('print one line and exit 1', async () => {
    let stderr = '';
    const code = await main(['water', '--temperature', '20', '--pressure', '1'], { stdout: failingStdout, stderr: { write: (s: string) => { stderr += s; } }, env: {} });
    expect(code).toBe(1);
    expect(stderr).toBe('tauwell: internal error: disk full\n');
  });

  it('add the stack with TAUWELL_DEBUG=1', async () => {
    let stderr = '';
    const code = await main(['water', '--temperature', '20', '--pressure', '1'], { stdout: failingStdout, stderr: { write: (s: string) => { stderr += s; } }, env: { TAUWELL_DEBUG: '1' } });
    expect(code).toBe(1);
    const lines = stderr.trimEnd().split('\n');
    expect(lines[0]).toBe('tauwell: internal error: disk full');
    expect(lines.length).toBeGreaterThan(2);
    expect(stderr).toMatch(/\n\s+at /);
  });
});
