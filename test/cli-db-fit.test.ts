// `tauwell fit` and `tauwell forecast` from a field log equal the same series through the CSV path,
// number for number, and their JSON keeps every key of the CSV path's.
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../src/main/db/database.js';
import { createServices } from '../src/main/services/index.js';
import { DAY_S, YEAR_S, cli, cliJson, tempDir, writeFile } from './cli-helpers.js';

// Synthetic well (worked example of our own): θ = 20 K + 60 K·e^(−t/8 yr) with T = 70 °C + θ, weekly for
// six years, seeded noise of 0.2 K; a shut-in week, a test week and a reading flagged bad, all left out.
// The generating formula's parameters are what a floor fit should find.
const START_MS = Date.UTC(2020, 0, 6, 9);
const WEEKS = 6 * 52;
const PARAMS = {
  kind: 'hot-dry-rock', surfaceTemperature: 12, gradient: 0.034, minUsefulTemperature: 70, maxDepth: 5200,
  area: 30000, rockDensity: 2650, rockSpecificHeat: 820, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 },
};

let dir: string;
beforeAll(() => {
  dir = tempDir();
  let seed = 12345;
  const uniform = (): number => ((seed = (seed * 16807) % 2147483647) / 2147483647); // Park–Miller minimal standard generator
  const rows: string[] = ['time,temp_C,flow_kg_s,status'];
  const fdb = openDatabase(join(dir, 'w.sqlite'));
  const s = createServices(fdb, { who: 'tester' });
  s.createField({ name: 'F', timeZone: 'UTC' });
  s.createReservoir({ field: 'F', name: 'R' });
  s.addReservoirVersion({ reservoir: 'R', params: PARAMS });
  s.createWell({ field: 'F', name: 'W-1', kind: 'production', reservoir: 'R', referenceTemperatureC: 70 });
  for (let k = 0; k <= WEEKS; k++) {
    const t = k * 7 * DAY_S;
    const noise = 0.2 * Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    const temp = (70 + 20 + 60 * Math.exp(-t / (8 * YEAR_S)) + noise).toFixed(3);
    const status = k === 40 ? 'shut-in' : k === 90 ? 'test' : 'producing';
    const flagged = k === 150;
    const time = new Date(START_MS + t * 1000).toISOString();
    rows.push([time, temp, '50', flagged ? 'bad' : status].join(','));
    s.logReading({ well: 'W-1', time, productionTemperature: Number(temp), flow: 50, flowUnit: 'kg/s', status, ...(flagged ? { flags: ['bad'] } : {}) });
  }
  fdb.close();
  writeFile(dir, 'w.csv', rows.join('\n') + '\n');
  writeFile(dir, 'r.json', JSON.stringify(PARAMS));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const CSV = ['--csv', 'w.csv', '--time', 'time', '--value', 'temp_C', '--reference', '70', '--exclude', 'status'];
const DB = ['--db', 'w.sqlite', '--well', 'W-1'];

describe('fit --db equals fit --csv', () => {
  it('gives the same numbers for the same series', async () => {
    const csv = (await cliJson(['fit', ...CSV, '--model', 'auto'], dir)).fits[0];
    const db = (await cliJson(['fit', ...DB, '--model', 'auto'], dir)).fits[0];
    for (const key of Object.keys(csv)) {
      if (key === 'group' || key === 'candidates') continue;
      expect(db[key], key).toEqual(csv[key]);
    }
    expect(db.candidates.map((c: { aicc: number }) => c.aicc)).toEqual(csv.candidates.map((c: { aicc: number }) => c.aicc));
    expect(db.group).toBe('W-1');
    expect(db.n).toBe(WEEKS + 1 - 3); // shut-in, test and the bad reading are left out
    expect(db.nExcluded).toBe(3);
    expect(db.timeOrigin).toBe(new Date(START_MS).toISOString());
    expect(db.model).toBe('floor');
    // The generating formula (above): θ∞ = 20 K, θ0 = 80 K, τ = 8 yr, each within three standard errors
    // (six years of an eight-year decline leave θ∞ and τ correlated, so their errors are not small).
    for (const [name, truth] of [['thetaInf', 20], ['theta0', 80], ['tau', 8 * YEAR_S]] as const) {
      expect(Math.abs(db.parameters[name].value - truth), name).toBeLessThan(3 * db.parameters[name].stderr);
    }
    // Keys the field log adds.
    expect(db).toMatchObject({ well: 'W-1', field: 'F', timeOriginSource: 'first-reading', referenceTemperature: { value: 70, unit: '°C' } });
    expect(db.counts).toEqual({ readings: WEEKS + 1, included: WEEKS - 2, excludedNotProducing: 2, excludedFlagged: 1, excludedNoTemperature: 0, excludedBeforeTimeZero: 0 });
    expect(db.stored.fingerprint).toMatch(/^[0-9a-f]{64}$/);
  });

  it('a window and the mass basis', async () => {
    const windowed = (await cliJson(['fit', ...DB, '--from', '2022-01-01T00:00Z'], dir)).fits[0];
    expect(windowed.timeOrigin).toBe(new Date(START_MS).toISOString());
    expect(windowed.window.from).toBe('2022-01-01T00:00:00.000Z');
    const mass = (await cliJson(['fit', ...DB, '--basis', 'mass'], dir)).fits[0];
    expect(mass.basis).toBe('mass');
    expect(mass.parameters.tau.unit).toBe('kg');
    // Constant 50 kg/s: Mc = τ·ṁ, so the mass-basis τ is the time-basis τ times 50 kg/s up to the shut-in weeks.
    const time = (await cliJson(['fit', ...DB], dir)).fits[0];
    expect(mass.parameters.tau.value / (time.parameters.tau.value * 50)).toBeGreaterThan(0.97);
    expect(mass.parameters.tau.value / (time.parameters.tau.value * 50)).toBeLessThan(1.0);
    const text = await cli(['fit', ...DB, '--basis', 'mass'], dir);
    expect(text.stdout).toMatch(/characteristic mass Mc = [\d.e]+ kg; at the mean fitted flow 50 kg\/s, τ = Mc\/ṁ = [\d.]+ yr/);
  });

  it('refuses mixed or incomplete inputs, naming the option', async () => {
    const cases: [string[], RegExp][] = [
      [['fit', ...CSV, ...DB], /field "--db": give --csv FILE or --db FILE, not both/],
      [['fit', '--db', 'w.sqlite'], /field "--well": missing/],
      [['fit', ...DB, '--reference', '70'], /field "--reference": not used with --db/],
      [['fit', ...CSV, '--basis', 'mass'], /field "--basis": the mass basis needs the flows of a field log/],
      [['fit'], /field "--csv": missing input/],
      [['forecast', ...DB, '--limit-temp', '120', '--params', 'r.json'], /field "--params": not used with --db/],
    ];
    for (const [argv, message] of cases) {
      const run = await cli(argv, dir);
      expect(run.code, argv.join(' ')).toBe(2);
      expect(run.stderr).toMatch(message);
    }
  });
});

describe('forecast --db', () => {
  it('keeps every key of the CSV path, with the same numbers for the same inputs', async () => {
    const common = ['--limit-temp', '100', '--planned-flow', '50', '--samples', '500'];
    const csv = (await cliJson(['forecast', ...CSV, ...common, '--params', 'r.json', '--mean-flow', '50'], dir)).forecasts[0];
    const db = (await cliJson(['forecast', ...DB, ...common], dir)).forecasts[0];
    for (const key of Object.keys(csv)) expect(db, key).toHaveProperty(key);
    for (const key of Object.keys(csv.recharge)) expect(db.recharge, key).toHaveProperty(key);
    for (const key of Object.keys(csv.fit)) expect(db.fit, key).toHaveProperty(key);
    expect(db.thetaEcon).toEqual(csv.thetaEcon); // 100 °C − 70 °C = 30 K
    expect(db.timeOrigin).toBe(csv.timeOrigin);
    // cw is IAPWS-IF97 at the same mean temperature, averaged in °C here and in K there: equal to rounding.
    expect(db.specificHeat.value).toBeCloseTo(csv.specificHeat.value, 8);
    for (const p of ['p90', 'p50', 'p10'] as const) expect(Math.abs(db.endOfLife[p] / csv.endOfLife[p] - 1)).toBeLessThan(1e-9);
    expect(Math.abs(db.recharge.ratio.value / csv.recharge.ratio.value - 1)).toBeLessThan(1e-12);
    expect(db.recharge.params).toBe('R version 1');
    expect(db).toMatchObject({ well: 'W-1', plannedFlowSource: 'given' });
    expect(db.assumptions.join('\n')).toMatch(/recharge against R version 1/);
  });

  it('defaults the planned flow to the last year\'s mean and says so', async () => {
    const db = (await cliJson(['forecast', ...DB, '--limit-temp', '100', '--samples', '200'], dir)).forecasts[0];
    expect(db.plannedFlow).toEqual({ value: 50, unit: 'kg/s' }); // every reading logs 50 kg/s
    expect(db.plannedFlowSource).toBe('mean-last-year');
    const text = await cli(['forecast', ...DB, '--limit-temp', '100', '--samples', '200'], dir);
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/planned flow: mean normalised mass flow of the \d+ producing readings in the year/);
    expect(text.stdout).toMatch(/Cautions:/);
  });
});
