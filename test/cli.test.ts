// The `tauwell` command line in-process: JSON shapes and values of fit, theory and water, the
// human-readable tables, help and version. Forecasts: cli-forecast.test.ts; bad input: cli-errors.test.ts.
import { readFileSync, rmSync } from 'node:fs';
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { FIT_COMMAND } from '../src/main/cli/commands/fit.js';
import { FORECAST_COMMAND } from '../src/main/cli/commands/forecast.js';
import { THEORY_COMMAND } from '../src/main/cli/commands/theory.js';
import { WATER_COMMAND } from '../src/main/cli/commands/water.js';
import { DAY_S, YEAR_S, cli, cliJson, exponential, tempDir, weeklyRows, writeFile } from './cli-helpers.js';

/** |actual − expected| ≤ rel·|expected|. */
function expectRel(actual: number, expected: number, rel: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

let dir: string;

// Synthetic series: θ = 45·e^(−t/τ) K with τ = 10 yr, weekly for five years, noise σ = 0.01 K.
// The generating formula's parameters are the check values (worked example of our own).
const TAU_A_S = 10 * YEAR_S;
const TAU_B_S = 6 * YEAR_S;
const rowsA = weeklyRows(260, exponential(45, TAU_A_S), 0.01, 11);
const rowsB = weeklyRows(260, exponential(30, TAU_B_S), 0.01, 12);

function csv(header: string, lines: string[]): string {
  return [header, ...lines].join('\n') + '\n';
}

// Granite slab worked example (hand arithmetic, DOMAIN.md §2):
//   z1 = (70 − 10)/0.03 = 2000 m; T2 = 10 + 0.03·5000 = 160 °C = 433.15 K; θ0 = (160 − 70)/2 = 45 K
//   C = 2700·800·1e6·(5000 − 2000) = 6.48e15 J/K; E0 = C·θ0 = 2.916e17 J = 81000 GWh = 291600 TJ
//   τ = 6.48e15/(50·4186) = 3.0960344e10 s = 981.07 yr; P0 = 50·4186·45 = 9.4185e6 W
const granite = {
  kind: 'hot-dry-rock', surfaceTemperature: 10, gradient: 0.03, minUsefulTemperature: 70, maxDepth: 5000,
  area: 1e6, rockDensity: 2700, rockSpecificHeat: 800, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 },
};

beforeAll(() => {
  dir = tempDir();
  // T = 70 °C + θ: with Tref = 70 °C the fit must see θ itself.
  writeFile(dir, 'temp.csv', csv('day,temp_C', rowsA.map((r) => `${r.day},${(70 + r.theta).toFixed(5)}`)));
  writeFile(dir, 'granite.json', JSON.stringify(granite));
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe('tauwell fit --json', () => {
  it('recovers τ of an exponential written from the formula, with the documented shape', async () => {
    const file = writeFile(dir, 'exp.csv', csv('day,theta_K', rowsA.map((r) => `${r.day},${r.theta.toFixed(5)}`)));
    const out = await cliJson(['fit', '--csv', file, '--time', 'day', '--value', 'theta_K'], dir);
    expect(out.fits).toHaveLength(1);
    const f = out.fits[0];
    expect(f.group).toBeNull();
    expect(f.model).toBe('exponential');
    expect(f.status).toBe('converged');
    expect(f.message).toBe('');
    expect(f.n).toBe(261);
    expect(f.nExcluded).toBe(0);
    expect(Object.keys(f.parameters).sort()).toEqual(['tau', 'theta0']); // only the model's own parameters
    expect(f.parameters.tau.unit).toBe('s');
    expect(f.parameters.theta0.unit).toBe('K');
    // τ = 10 yr and θ0 = 45 K generated the data; σ = 0.01 K noise moves them by ~1e-4 relative.
    expectRel(f.parameters.tau.value, TAU_A_S, 2e-3);
    expectRel(f.parameters.theta0.value, 45, 1e-3);
    for (const p of Object.values(f.parameters) as { value: number; stderr: number; ci95: [number, number] }[]) {
      expect(p.stderr).toBeGreaterThan(0);
      expect(p.ci95[0]).toBeLessThan(p.value);
      expect(p.ci95[1]).toBeGreaterThan(p.value);
      expect(Object.keys(p).sort()).toEqual(['ci95', 'stderr', 'unit', 'value']);
    }
    expect(f.rmse.unit).toBe('K');
    expect(f.rmse.value).toBeGreaterThan(0.005); // the noise put in: σ = 0.01 K
    expect(f.rmse.value).toBeLessThan(0.02);
    expect(f.r2).toBeGreaterThan(0.9999);
    expect(typeof f.aicc).toBe('number');
    expect(f.iterations).toBeGreaterThan(0);
    expect(f.correlation).toHaveLength(2);
    expect(f.correlation[0][0]).toBeCloseTo(1, 12);
    expect(f.candidates).toBeUndefined();
  });

  it('reads elapsed time in s, d or yr alike', async () => {
    const inUnit = (factorS: number): string[] => rowsA.map((r) => `${(r.day * DAY_S) / factorS},${r.theta.toFixed(5)}`);
    writeFile(dir, 'units-s.csv', csv('t,theta', inUnit(1)));
    writeFile(dir, 'units-yr.csv', csv('t,theta', inUnit(YEAR_S)));
    const s = await cliJson(['fit', '--csv', 'units-s.csv', '--time', 't', '--value', 'theta', '--time-unit', 's'], dir);
    const yr = await cliJson(['fit', '--csv', 'units-yr.csv', '--time', 't', '--value', 'theta', '--time-unit', 'yr'], dir);
    expectRel(s.fits[0].parameters.tau.value, TAU_A_S, 2e-3);
    // Same readings, different units: the same fit up to rounding of the written times.
    expectRel(yr.fits[0].parameters.tau.value, s.fits[0].parameters.tau.value, 1e-6);
  });

  it('turns a production temperature in °C into θ = T − Tref with --reference', async () => {
    const out = await cliJson(['fit', '--csv', 'temp.csv', '--time', 'day', '--value', 'temp_C', '--reference', '70'], dir);
    expectRel(out.fits[0].parameters.theta0.value, 45, 1e-3);
    expectRel(out.fits[0].parameters.tau.value, TAU_A_S, 2e-3);
  });

  it('fits each group of a two-well file in one run', async () => {
    const lines: string[] = [];
    rowsA.forEach((a, i) => lines.push(`${a.day},A,${a.theta.toFixed(5)}`, `${rowsB[i].day},B,${rowsB[i].theta.toFixed(5)}`));
    writeFile(dir, 'wells.csv', csv('day,well,theta', lines));
    const out = await cliJson(['fit', '--csv', 'wells.csv', '--time', 'day', '--value', 'theta', '--group', 'well'], dir);
    expect(out.fits.map((f: { group: string }) => f.group)).toEqual(['A', 'B']);
    expect(out.fits[0].n).toBe(261);
    expect(out.fits[1].n).toBe(261);
    expectRel(out.fits[0].parameters.tau.value, TAU_A_S, 2e-3); // well A: τ = 10 yr generated it
    expectRel(out.fits[1].parameters.tau.value, TAU_B_S, 2e-3); // well B: τ = 6 yr, θ0 = 30 K
    expectRel(out.fits[1].parameters.theta0.value, 30, 1e-3);
  });

  it('reads ISO 8601 instants (Z, offsets, naive as UTC) as seconds since the first reading', async () => {
    const origin = Date.UTC(2021, 0, 4); // 2021-01-04T00:00Z, a Monday
    const lines = rowsA.map((r, i) => {
      const ms = origin + r.day * DAY_S * 1000;
      const iso = new Date(ms).toISOString();
      // Three spellings of the same instant: Z, +02:00 local time, and naive (read as UTC).
      const text =
        i % 3 === 0 ? iso
          : i % 3 === 1 ? new Date(ms + 2 * 3600e3).toISOString().slice(0, 19) + '+02:00'
            : iso.slice(0, 19).replace('T', ' ');
      return `${text},${r.theta.toFixed(5)}`;
    });
    writeFile(dir, 'iso.csv', csv('time,theta', lines));
    const out = await cliJson(['fit', '--csv', 'iso.csv', '--time', 'time', '--value', 'theta'], dir);
    const f = out.fits[0];
    expect(f.timeOrigin).toBe('2021-01-04T00:00:00.000Z');
    expect(f.n).toBe(261);
    expectRel(f.parameters.tau.value, TAU_A_S, 2e-3);
    // Had any offset been ignored, those times would be 2 h off and the residuals would show it;
    // with them right the fit matches the elapsed-day fit of the same readings.
    writeFile(dir, 'iso-days.csv', csv('day,theta', rowsA.map((r) => `${r.day},${r.theta.toFixed(5)}`)));
    const days = await cliJson(['fit', '--csv', 'iso-days.csv', '--time', 'day', '--value', 'theta'], dir);
    expectRel(f.parameters.tau.value, days.fits[0].parameters.tau.value, 1e-9);
  });

  it('--exclude leaves flagged rows out of the fit but counts them', async () => {
    const flags = ['shut-in', 'test', 'bad', 'x', 'yes', '1', 'TRUE'];
    const lines = rowsA.map((r, i) => {
      if (i % 20 === 10) {
        const flag = flags[Math.floor(i / 20) % flags.length];
        // A shut-in well cools at the wellhead: a reading far off the trend, or none at all.
        return `${r.day},${i % 40 === 10 ? '' : '5.0'},${flag}`;
      }
      return `${r.day},${r.theta.toFixed(5)},${i % 2 === 0 ? '' : 'no'}`;
    });
    writeFile(dir, 'flags.csv', csv('day,theta,status', lines));
    const out = await cliJson(['fit', '--csv', 'flags.csv', '--time', 'day', '--value', 'theta', '--exclude', 'status'], dir);
    const excluded = rowsA.filter((_, i) => i % 20 === 10).length; // 13 rows: i = 10, 30, …, 250
    expect(out.fits[0].nExcluded).toBe(excluded);
    expect(out.fits[0].n).toBe(261 - excluded);
    expectRel(out.fits[0].parameters.tau.value, TAU_A_S, 2e-3);
  });

  it('--weight: a zero weight leaves a row out and is counted as excluded', async () => {
    const lines = rowsA.map((r, i) => (i === 100 ? `${r.day},-50,0` : `${r.day},${r.theta.toFixed(5)},1`));
    writeFile(dir, 'weights.csv', csv('day,theta,w', lines));
    const out = await cliJson(['fit', '--csv', 'weights.csv', '--time', 'day', '--value', 'theta', '--weight', 'w'], dir);
    expect(out.fits[0].nExcluded).toBe(1);
    expectRel(out.fits[0].parameters.tau.value, TAU_A_S, 2e-3);
  });

  it('--model auto reports the chosen model and every candidate', async () => {
    // θ = 25 + 20·e^(−t/3 yr) K over ten years: a floor that the floor model should win by AICc.
    const rows = weeklyRows(520, (t) => 25 + 20 * Math.exp(-t / (3 * YEAR_S)), 0.02, 13);
    writeFile(dir, 'floor.csv', csv('day,theta', rows.map((r) => `${r.day},${r.theta.toFixed(5)}`)));
    const out = await cliJson(['fit', '--csv', 'floor.csv', '--time', 'day', '--value', 'theta', '--model', 'auto'], dir);
    const f = out.fits[0];
    expect(f.model).toBe('floor');
    expect(Object.keys(f.parameters).sort()).toEqual(['tau', 'theta0', 'thetaInf']);
    expectRel(f.parameters.thetaInf.value, 25, 1e-2);
    expectRel(f.parameters.tau.value, 3 * YEAR_S, 1e-2);
    expect(f.candidates.map((c: { model: string }) => c.model).sort()).toEqual(['exponential', 'floor', 'hyperbolic']);
    for (const c of f.candidates) {
      expect(c.candidates).toBeUndefined();
      expect(c.group).toBeNull();
    }
    const hyperbolic = f.candidates.find((c: { model: string }) => c.model === 'hyperbolic');
    expect(Object.keys(hyperbolic.parameters).sort()).toEqual(['b', 'tau', 'theta0']);
    expect(hyperbolic.parameters.b.unit).toBe('1');
  });

  it('writes non-finite numbers as null (a fit with too few points)', async () => {
    writeFile(dir, 'short.csv', csv('day,theta', ['0,45', '7,44.9', '14,44.8']));
    const run = await cli(['fit', '--csv', 'short.csv', '--time', 'day', '--value', 'theta', '--model', 'floor', '--json'], dir);
    expect(run.code).toBe(0); // an honest failed fit is a result, not an input error
    expect(run.stdout).not.toMatch(/NaN|Infinity/);
    const f = JSON.parse(run.stdout).fits[0];
    expect(f.status).toBe('too-few-points');
    expect(f.parameters.thetaInf).toEqual({ value: null, stderr: null, ci95: [null, null], unit: 'K' });
    expect(f.aicc).toBeNull();
    expect(f.rmse).toEqual({ value: null, unit: 'K' });
  });

  it('counts physical lines across CRLF, blank lines and quoted line breaks', async () => {
    // Line 1 header, 2–3 data, 4 blank, 5–6 one record with a quoted line break, 7 the bad cell.
    const text = 'day,theta,note\r\n0,45,\r\n7,44.9,\r\n\r\n14,44.8,"pump\r\nswap"\r\n21,abc,\r\n';
    writeFile(dir, 'lines.csv', text);
    const run = await cli(['fit', '--csv', 'lines.csv', '--time', 'day', '--value', 'theta'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toBe('tauwell: lines.csv:7, field "theta": "abc" is not a number\n');
  });
});

describe('tauwell fit (tables)', () => {
  it('shows τ in years as well as s, and absolute temperatures in °C', async () => {
    const run = await cli(['fit', '--csv', 'temp.csv', '--time', 'day', '--value', 'temp_C', '--reference', '70'], dir);
    expect(run.code).toBe(0);
    expect(run.stderr).toBe('');
    expect(run.stdout).toMatch(/τ\s+time constant\s+3\.15\d+e8 s/);
    expect(run.stdout).toMatch(/ (9\.99\d*|10\.00\d*|10) yr ±/); // τ = 10 yr generated the data
    expect(run.stdout).toMatch(/T = 115\.0\d °C/); // θ0 + Tref = 45 + 70 °C
    expect(run.stdout).toMatch(/RMSE .* K/);
  });
});

describe('tauwell theory', () => {
  it('--json gives the slab values in SI with units', async () => {
    const t = await cliJson(['theory', '--params', 'granite.json'], dir);
    expect(t.tau.unit).toBe('s');
    expectRel(t.tau.value, 6.48e15 / (50 * 4186), 1e-12);
    expect(t.minUsefulDepth).toEqual({ value: expect.closeTo(2000, 6), unit: 'm' });
    expectRel(t.bottomTemperature.value, 433.15, 1e-12);
    expect(t.bottomTemperature.unit).toBe('K');
    expectRel(t.theta0.value, 45, 1e-12);
    expectRel(t.heatCapacity.value, 6.48e15, 1e-12);
    expect(t.heatCapacity.unit).toBe('J/K');
    expectRel(t.usefulHeat.value, 2.916e17, 1e-12);
    expect(t.usefulHeat.unit).toBe('J');
    expectRel(t.initialPower.value, 9.4185e6, 1e-12);
    expect(t.initialPower.unit).toBe('W');
  });

  it('the table shows GWh, TJ, MW, years and °C', async () => {
    const run = await cli(['theory', '--params', 'granite.json'], dir);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain('81000 GWh = 291600 TJ');
    expect(run.stdout).toContain('981.07 yr');
    expect(run.stdout).toContain('9.4185 MW');
    expect(run.stdout).toContain('160.00 °C');
  });
});

describe('tauwell water', () => {
  it('matches IAPWS-IF97 (2007) Table 5 at 300 K and 3 MPa', async () => {
    // 300 K = 26.85 °C. Table 5: v = 0.100215168e-2 m³/kg, h = 0.115331273e3 kJ/kg, cp = 0.417301218e1 kJ/(kg·K).
    // Table 35: ps(300 K) = 0.353658941e-2 MPa.
    const w = await cliJson(['water', '--temperature', '26.85', '--pressure', '3'], dir);
    expect(Object.keys(w).sort()).toEqual(['density', 'enthalpy', 'saturationPressure', 'specificHeat']);
    expect(w.density.unit).toBe('kg/m3');
    expectRel(w.density.value, 1 / 0.100215168e-2, 1e-8);
    expect(w.enthalpy.unit).toBe('J/kg');
    expectRel(w.enthalpy.value, 0.115331273e6, 1e-8);
    expect(w.specificHeat.unit).toBe('J/(kg K)');
    expectRel(w.specificHeat.value, 0.417301218e4, 1e-8);
    expect(w.saturationPressure.unit).toBe('Pa');
    expectRel(w.saturationPressure.value, 0.353658941e4, 1e-8);
  });

  it('prints a table with kJ/kg and MPa beside SI', async () => {
    const run = await cli(['water', '--temperature', '26.85', '--pressure', '3'], dir);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain('997.8529 kg/m3');
    expect(run.stdout).toContain('kJ/kg');
    expect(run.stdout).toContain('MPa');
  });
});

describe('help and version', () => {
  const specs = [FIT_COMMAND, FORECAST_COMMAND, THEORY_COMMAND, WATER_COMMAND];

  it.each(specs.map((s) => [s.name, s] as const))('tauwell %s --help lists every option', async (name, spec) => {
    const run = await cli([name, '--help'], dir);
    expect(run.code).toBe(0);
    expect(run.stderr).toBe('');
    for (const o of spec.options) expect(run.stdout).toContain(`--${o.name}`);
    expect(run.stdout).toContain('--help');
  });

  it('tauwell --help lists every command and every option', async () => {
    const run = await cli(['--help'], dir);
    expect(run.code).toBe(0);
    for (const spec of specs) {
      expect(run.stdout).toContain(spec.name);
      for (const o of spec.options) expect(run.stdout).toContain(`--${o.name}`);
    }
  });

  it('help texts name the units', async () => {
    const fit = (await cli(['fit', '--help'], dir)).stdout;
    for (const unit of ['°C', ' K', 'yr', 'ISO 8601', 'UTC']) expect(fit).toContain(unit);
    const forecast = (await cli(['forecast', '--help'], dir)).stdout;
    for (const unit of ['MW', 'kg/s', 'W/m²', 'J/(kg·K)', 'years', 'P90']) expect(forecast).toContain(unit);
    const water = (await cli(['water', '--help'], dir)).stdout;
    for (const unit of ['°C', 'MPa']) expect(water).toContain(unit);
    const theory = (await cli(['theory', '--help'], dir)).stdout;
    for (const unit of ['K/m', 'm²', 'kg/s', '°C']) expect(theory).toContain(unit);
  });

  it('tauwell help fit is the same as tauwell fit --help', async () => {
    expect((await cli(['help', 'fit'], dir)).stdout).toBe((await cli(['fit', '--help'], dir)).stdout);
  });

  it('--version prints the package version', async () => {
    const version = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;
    const run = await cli(['--version'], dir);
    expect(run).toEqual({ code: 0, stdout: `tauwell ${version}\n`, stderr: '' });
  });
});
