// `tauwell forecast` in-process: JSON shape and values against the closed forms of the
// exponential decline (DOMAIN.md §8), the specific-heat defaults, the recharge block, the cautions.
import { rmSync } from 'node:fs';
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { liquidWater, saturationPressurePa } from '../src/shared/water/iapws97.js';
import { DAY_S, YEAR_S, cli, cliJson, exponential, tempDir, weeklyRows, writeFile } from './cli-helpers.js';

function expectRel(actual: number, expected: number, rel: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

// θ = 45·e^(−t/τ) K, τ = 10 yr, weekly for 260 weeks (= 1820 d = 4.98289 yr), σ = 0.01 K; written as
// T = 70 °C + θ. The generating formula gives the check values (worked example of our own):
//   now = 1820 d; θ(now) = 45·e^(−1820 d/10 yr) = 27.34 K
//   end of life at θecon = 20 K: t = τ·ln(45/20) = 10 yr · 0.810930 = 8.10930 yr after time zero
//   power now at 50 kg/s, cw = 4186: P = 50·4186·θ(now) ≈ 5.72 MW
//   heat from now to the limit: ṁ·cw·∫θ dt = ṁ·cw·τ·(θ(now) − θecon)
const TAU_S = 10 * YEAR_S;
const NOW_S = 1820 * DAY_S;
const THETA_NOW_K = 45 * Math.exp(-NOW_S / TAU_S);
const rows = weeklyRows(260, exponential(45, TAU_S), 0.01, 21);

let dir: string;
const base = ['forecast', '--csv', 'decline.csv', '--time', 'day', '--value', 'temp_C', '--reference', '70'];

beforeAll(() => {
  dir = tempDir();
  writeFile(dir, 'decline.csv', ['day,temp_C', ...rows.map((r) => `${r.day},${(70 + r.theta).toFixed(5)}`)].join('\n') + '\n');
  // Granite slab worked example: C = 2700·800·1e6·(5000 − 2000) = 6.48e15 J/K (hand arithmetic, DOMAIN.md §2).
  writeFile(dir, 'granite.json', JSON.stringify({
    kind: 'hot-dry-rock', surfaceTemperature: 10, gradient: 0.03, minUsefulTemperature: 70, maxDepth: 5000,
    area: 1e6, rockDensity: 2700, rockSpecificHeat: 800, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 },
  }));
  // θ = 25 + 20·e^(−t/3 yr) K in K, no reference: a floor above a 20 K limit.
  const floor = weeklyRows(520, (t) => 25 + 20 * Math.exp(-t / (3 * YEAR_S)), 0.02, 22);
  writeFile(dir, 'floor.csv', ['day,theta', ...floor.map((r) => `${r.day},${r.theta.toFixed(5)}`)].join('\n') + '\n');
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe('tauwell forecast --json', () => {
  it('end of life, power and remaining heat match the closed forms of the exponential', async () => {
    const out = await cliJson([...base, '--limit-temp', '90', '--planned-flow', '50', '--specific-heat', '4186'], dir);
    expect(out.forecasts).toHaveLength(1);
    const f = out.forecasts[0];
    expect(f.group).toBeNull();
    expect(f.model).toBe('exponential');
    expect(f.status).toBe('ok');
    expect(f.thetaEcon).toEqual({ value: 20, unit: 'K' }); // θecon = 90 − 70 °C
    const e = f.endOfLife;
    expect(e.unit).toBe('s');
    expect(e.reached).toBe(true);
    expectRel(e.p50, TAU_S * Math.log(45 / 20), 2e-3);
    expect(e.p90).toBeLessThanOrEqual(e.p50); // P90 is the low case: the shortest life
    expect(e.p50).toBeLessThanOrEqual(e.p10);
    expect(f.currentPower.unit).toBe('W');
    expectRel(f.currentPower.value, 50 * 4186 * THETA_NOW_K, 2e-3);
    expect(f.remainingHeat.unit).toBe('J');
    expectRel(f.remainingHeat.p50, 50 * 4186 * TAU_S * (THETA_NOW_K - 20), 5e-3);
    expect(f.remainingHeat.p90).toBeLessThanOrEqual(f.remainingHeat.p10);
    // The band starts at now and is ordered P90 ≤ P50 ≤ P10 at every time.
    expect(f.band.time[0]).toBeCloseTo(NOW_S, 3);
    expect(f.band.p50).toHaveLength(f.band.time.length);
    f.band.time.forEach((_: number, i: number) => {
      expect(f.band.p90[i]).toBeLessThanOrEqual(f.band.p50[i] + 1e-12);
      expect(f.band.p50[i]).toBeLessThanOrEqual(f.band.p10[i] + 1e-12);
    });
    // The fit inside is the same object as `tauwell fit --json` prints.
    const fit = await cliJson(['fit', '--csv', 'decline.csv', '--time', 'day', '--value', 'temp_C', '--reference', '70'], dir);
    expect(f.fit).toEqual(fit.fits[0]);
    expect(f.recharge).toBeNull();
  });

  it('is reproducible for a seed and changes with it', async () => {
    const args = [...base, '--limit-theta', '20', '--samples', '500'];
    const a = await cliJson([...args, '--seed', '7'], dir);
    const b = await cliJson([...args, '--seed', '7'], dir);
    const c = await cliJson([...args, '--seed', '8'], dir);
    expect(a).toEqual(b);
    expect(c.forecasts[0].endOfLife.p90).not.toBe(a.forecasts[0].endOfLife.p90);
  });

  it('a floor above the limit is never reached: nulls, not NaN', async () => {
    // θ = 25 + 20·e^(−t/3 yr) K (floor.csv): a floor of 25 K stays above θecon = 20 K at any horizon.
    const run = await cli(['forecast', '--csv', 'floor.csv', '--time', 'day', '--value', 'theta', '--model', 'floor', '--limit-theta', '20', '--json'], dir);
    expect(run.code).toBe(0);
    expect(run.stdout).not.toMatch(/NaN|Infinity/);
    const e = JSON.parse(run.stdout).forecasts[0].endOfLife;
    expect(e.reached).toBe(false);
    expect(e.p50).toBeNull();
  });

  it('--limit-power becomes θecon = Pmin/(ṁ·cw)', async () => {
    const out = await cliJson([...base, '--limit-power', '4', '--planned-flow', '50', '--specific-heat', '4186'], dir);
    expectRel(out.forecasts[0].thetaEcon.value, 4e6 / (50 * 4186), 1e-12); // 4 MW / (50 kg/s · 4186 J/(kg·K)) = 19.11 K
  });

  it('specific heat: IAPWS-IF97 at the mean production temperature with --reference, else 4186 assumed', async () => {
    const withRef = (await cliJson([...base, '--limit-theta', '20', '--samples', '200'], dir)).forecasts[0].specificHeat;
    expect(withRef.source).toBe('IAPWS-IF97 region 1');
    expect(withRef.assumption).toBe(false);
    // The state the option promises: the mean of the logged temperatures, 1 MPa above saturation.
    const meanK = rows.reduce((s, r) => s + 70 + Number(r.theta.toFixed(5)), 0) / rows.length + 273.15;
    expectRel(withRef.value, liquidWater(meanK, saturationPressurePa(meanK) + 1e6).specificHeatJPerKgK, 1e-9);
    const plain = await cliJson(['forecast', '--csv', 'floor.csv', '--time', 'day', '--value', 'theta', '--limit-theta', '20', '--samples', '200'], dir);
    expect(plain.forecasts[0].specificHeat).toMatchObject({ value: 4186, source: 'assumed', assumption: true });
  });

  it('--params adds the recharge estimate against the reservoir theory', async () => {
    const out = await cliJson([...base, '--limit-temp', '90', '--planned-flow', '50', '--params', 'granite.json', '--samples', '500'], dir);
    const r = out.forecasts[0].recharge;
    expect(r.status).toBe('ok');
    expect(r.tauTheory.unit).toBe('s');
    expectRel(r.tauTheory.value, 6.48e15 / (50 * 4186), 1e-12); // τtheory = C/(ṁ·cw) at the mean flow of 50 kg/s
    expectRel(r.tauFit.value, out.forecasts[0].fit.parameters.tau.value, 1e-12);
    expectRel(r.ratio.value, r.tauFit.value / r.tauTheory.value, 1e-9); // R = τfit/τtheory (DOMAIN.md §7)
    expectRel(r.rechargeFraction.value, 1 - r.tauTheory.value / r.tauFit.value, 1e-9); // f = 1 − τtheory/τfit
    // τfit = 10 yr against τtheory = 981 yr: far faster than the slab allows.
    expect(r.verdict).toBe('faster-than-theory');
    expect(r.backgroundHeatFlow).toEqual({ value: expect.closeTo(0.06 * 1e6, 6), unit: 'W' }); // qb·A = 0.060 W/m² · 1 km²
    expect(r.theory.tau.unit).toBe('s');
  });

  it('two groups give two forecasts', async () => {
    const lines = rows.flatMap((r) => [`${r.day},W1,${r.theta.toFixed(5)}`, `${r.day},W2,${(r.theta * 0.8).toFixed(5)}`]);
    writeFile(dir, 'two.csv', ['day,well,theta', ...lines].join('\n') + '\n');
    const out = await cliJson(['forecast', '--csv', 'two.csv', '--time', 'day', '--value', 'theta', '--group', 'well', '--limit-theta', '15', '--samples', '300'], dir);
    expect(out.forecasts.map((f: { group: string }) => f.group)).toEqual(['W1', 'W2']);
    // W2 is W1 scaled by 0.8: θ0 = 36 K, same τ, so it reaches 15 K at τ·ln(36/15) rather than τ·ln(45/15).
    expectRel(out.forecasts[0].endOfLife.p50, TAU_S * Math.log(45 / 15), 3e-3);
    expectRel(out.forecasts[1].endOfLife.p50, TAU_S * Math.log(36 / 15), 3e-3);
  });
});

describe('tauwell forecast (tables)', () => {
  it('prints years, MW, GWh/TJ, °C, the P90 line and the cautions', async () => {
    const run = await cli([...base, '--limit-temp', '90', '--planned-flow', '50', '--params', 'granite.json', '--samples', '500'], dir);
    expect(run.code).toBe(0);
    expect(run.stderr).toBe('');
    for (const text of ['P90 (low case)', 'yr', 'MW', 'GWh', 'TJ', '90.00 °C', 'recharge', 'faster-than-theory']) expect(run.stdout).toContain(text);
    expect(run.stdout).toContain('P90 = the low case, exceeded with 90 % probability');
    // DOMAIN.md §10, verbatim.
    expect(run.stdout).toContain(
      "Forecasts are estimates from a simplified model and field data; they do not replace a licensed reservoir engineer's assessment. " +
        'Drilling, stimulation, reinjection and plant operation are governed by local codes and permits; fluid injection can induce seismicity. ' +
        "Wellhead fluids are hot and under pressure: readings are taken under the site's safety procedures.",
    );
  });

  it('states the assumed specific heat', async () => {
    const run = await cli(['forecast', '--csv', 'floor.csv', '--time', 'day', '--value', 'theta', '--limit-theta', '20', '--samples', '200'], dir);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain('ASSUMED 4186 J/(kg K)');
  });
});
