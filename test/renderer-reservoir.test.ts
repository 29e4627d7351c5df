import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { Display } from '../src/renderer/app/display.js';
import {
  controlOf, evaluateForm, formFromParams, labelWithUnit, paramsOfForm, withFlowKind, type FormState,
} from '../src/renderer/screens/reservoir-form.js';
import { numericKeys, tauSensitivity } from '../src/renderer/screens/reservoir-sensitivity.js';
import { formatPower, gradientUnit } from '../src/renderer/screens/reservoir-units.js';
import { parseReservoirParams } from '../src/shared/reservoir/params.js';
import { reservoirTheory } from '../src/shared/reservoir/theory.js';

const demo = JSON.parse(readFileSync(new URL('../demo/invented-reservoir.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const si = new Display('si', 'UTC');
const us = new Display('us', 'UTC');
const tauOf = (json: unknown): number => reservoirTheory(parseReservoirParams(json)).tauS;
/** ln(1.1/0.9): the denominator of the central log difference the sensitivity uses. */
const L = Math.log(1.1 / 0.9);

describe('reservoir form: units and round trip', () => {
  it('fills the form from stored parameters and gives them back unchanged (SI)', () => {
    const state = formFromParams(demo, si);
    expect(state.kind).toBe('hot-dry-rock');
    expect(state.fluidKind).toBe('iapws');
    expect(state.text.surfaceTemperature).toBe('12');
    // 0.034 K/m = 34 K/km (1 km = 1000 m, SI prefix).
    expect(state.text.gradient).toBe('34');
    expect(paramsOfForm(state, si)).toEqual(demo);
  });

  it('shows US customary units and still gives back the stored values when nothing is edited', () => {
    const state = formFromParams(demo, us);
    // 12 °C = 12·9/5 + 32 = 53.6 °F (NIST SP 811 B.8).
    expect(state.text.surfaceTemperature).toBe('53.6');
    // 0.034 K/m · 1.8 °F/K · 30.48 m per 100 ft = 1.865376 °F/100 ft (1 ft = 0.3048 m exactly, NIST SP 811).
    expect(state.text.gradient).toBe('1.86538');
    // 5200 m / 0.3048 m/ft = 17060.367… ft, shown to 6 significant digits.
    expect(state.text.maxDepth).toBe('17060.4');
    // 8 MPa = 8e6 Pa / 6894.757… Pa/psi = 1160.30 psi (1 psi = 0.45359237·9.80665 N / 0.0254² m², NIST SP 811).
    expect(state.text['fluid.iapws.pressure']).toBe('1160.3');
    expect(paramsOfForm(state, us)).toEqual(demo);
  });

  it('converts an edited US value to the stored unit', () => {
    const state = formFromParams(demo, us);
    state.text.minUsefulTemperature = '100';
    // (100 − 32)·5/9 = 37.777… °C (NIST SP 811 B.8).
    expect(paramsOfForm(state, us).minUsefulTemperature).toBeCloseTo(68 * 5 / 9, 10);
    state.text.maxDepth = '10000';
    // 10000 ft · 0.3048 m/ft = 3048 m exactly.
    expect(paramsOfForm(state, us).maxDepth).toBeCloseTo(3048, 9);
  });

  it('labels every input with its unit in the display system', () => {
    const state = formFromParams(demo, us);
    expect(labelWithUnit({ key: 'surfaceTemperature', label: 'Surface temperature T0' }, state, us)).toBe('Surface temperature T0 (°F)');
    expect(labelWithUnit({ key: 'maxDepth', label: 'Well depth z2' }, state, si)).toBe('Well depth z2 (m)');
    expect(labelWithUnit({ key: 'flow', label: 'Circulated flow' }, state, si)).toBe('Mass flow ṁ (kg/s)');
    expect(gradientUnit('us').label).toBe('°F/100 ft');
  });

  it('carries the flow over when switching to volume flow, through the water density', () => {
    const state = formFromParams(demo, si);
    const ev = evaluateForm(state, si);
    if (!ev.ok) throw ev.error;
    const volume = withFlowKind(state, 'volume', ev.theory, si);
    const ev2 = evaluateForm(volume, si);
    if (!ev2.ok) throw ev2.error;
    // V̇ = ṁ/ρw and back: the same mass flow within the 4 significant digits shown.
    expect(ev2.theory.massFlowKgPerS).toBeCloseTo(50, 1);
  });
});

describe('reservoir form: errors beside the input they name', () => {
  const broken = (edit: (s: FormState) => void): ReturnType<typeof evaluateForm> => {
    const state = formFromParams(demo, si);
    edit(state);
    return evaluateForm(state, si);
  };

  it('maps the keys of parseReservoirParams and of addReservoirVersion to controls', () => {
    expect(controlOf('gradient')).toBe('gradient');
    expect(controlOf('params.area')).toBe('area');
    expect(controlOf('massFlow')).toBe('flow');
    expect(controlOf('volumeFlow')).toBe('flow');
    expect(controlOf('fluid')).toBe('fluidKind');
    expect(controlOf('fluid.iapws')).toBe('fluid.iapws.temperature');
    expect(controlOf('fluid.iapws.pressure')).toBe('fluid.iapws.pressure');
    expect(controlOf('params')).toBeNull();
    expect(controlOf(undefined)).toBeNull();
  });

  it('names the input that is blank, not a number, or refused by the theory', () => {
    const blank = broken((s) => { s.text.area = ' '; });
    expect(!blank.ok && blank.control).toBe('area');
    const text = broken((s) => { s.text.rockDensity = '2,650'; });
    expect(!text.ok && text.control).toBe('rockDensity');
    const negative = broken((s) => { s.text.gradient = '-30'; });
    expect(!negative.ok && negative.control).toBe('gradient');
    // 1000 m is above z1 = (70 − 12)/0.034 = 1705.9 m: the wells do not reach T1 (theory.ts).
    const shallow = broken((s) => { s.text.maxDepth = '1000'; });
    expect(!shallow.ok && shallow.control).toBe('maxDepth');
    // 400 °C is outside IAPWS-IF97 region 1 (≤ 350 °C, DOMAIN.md §5).
    const hot = broken((s) => { s.text['fluid.iapws.temperature'] = '400'; });
    expect(!hot.ok && hot.control).toBe('fluid.iapws.temperature');
  });
});

describe('live results of the demo parameters', () => {
  it('gives z1, T2, θ0 and C by the slab formulas', () => {
    const ev = evaluateForm(formFromParams(demo, si), si);
    if (!ev.ok) throw ev.error;
    const t = ev.theory;
    // Worked example (DOMAIN.md §2): z1 = (70 − 12)/0.034 = 1705.882 m; T2 = 12 + 0.034·5200 = 188.8 °C;
    // θ0 = (188.8 − 70)/2 = 59.4 K; C = 2650·820·30000·(5200 − 1705.882) = 2.27782e14 J/K.
    expect(t.minUsefulDepthM).toBeCloseTo(1705.882353, 5);
    expect(t.bottomTemperatureK - 273.15).toBeCloseTo(188.8, 9);
    expect(t.theta0K).toBeCloseTo(59.4, 9);
    expect(t.heatCapacityJPerK / 2.277815294117647e14).toBeCloseTo(1, 12);
    // τ = C/(ṁ·cw), E0 = C·θ0 (DOMAIN.md §2).
    expect(t.tauS * 50 * t.fluid.specificHeatJPerKgK / t.heatCapacityJPerK).toBeCloseTo(1, 12);
    expect(t.usefulHeatJ / (t.heatCapacityJPerK * t.theta0K)).toBeCloseTo(1, 12);
  });
});

describe('how τ responds (±10 %)', () => {
  const s = tauSensitivity(demo);
  const row = (key: string) => {
    const r = s.rows.find((x) => x.key === key);
    if (r === undefined) throw new Error(`no row ${key}`);
    return r;
  };

  it('varies every numeric input of the parameters', () => {
    expect(numericKeys(demo)).toEqual([
      'surfaceTemperature', 'gradient', 'minUsefulTemperature', 'maxDepth', 'area', 'rockDensity', 'rockSpecificHeat', 'massFlow',
      'fluid.iapws.temperature', 'fluid.iapws.pressure',
    ]);
    expect(s.rows).toHaveLength(10);
  });

  it('gives elasticity 1 for rock density, as the slab formula says', () => {
    // τ = ρr·cr·A·(z2 − z1)/(ṁ·cw) (theory.ts, DOMAIN.md §2): τ is proportional to ρr with nothing else
    // depending on it, so ln τ = ln ρr + const and d ln τ / d ln ρr = 1 exactly — also for the finite
    // central difference [ln τ(1.1ρ) − ln τ(0.9ρ)]/[ln 1.1 − ln 0.9] = [ln 1.1 − ln 0.9]/[ln 1.1 − ln 0.9] = 1.
    expect(row('rockDensity').elasticity).toBeCloseTo(1, 12);
    expect(row('rockSpecificHeat').elasticity).toBeCloseTo(1, 12);
    expect(row('area').elasticity).toBeCloseTo(1, 12);
    // τ ∝ 1/ṁ (mass flow given, so the water density does not enter): elasticity −1.
    expect(row('massFlow').elasticity).toBeCloseTo(-1, 12);
  });

  it('gives the depth and geotherm elasticities derived from τ ∝ G·z2 − (T1 − T0)', () => {
    // τ ∝ z2 − z1 = [G·z2 − (T1 − T0)]/G, and G·z2 − (T1 − T0) = T2 − T1 = 118.8 K for the demo.
    // Point elasticities: z2: G·z2/(T2 − T1) = 176.8/118.8 = 1.48822; T0: T0/(T2 − T1) = 12/118.8 = 0.10101;
    // T1: −T1/(T2 − T1) = −70/118.8 = −0.58923; G: (T1 − T0)/(T2 − T1) = 58/118.8 = 0.48822.
    // The ±10 % central differences of these affine forms (worked independently, Python 3 math.log):
    //   z2: ln[(1.1·176.8 − 58)/(0.9·176.8 − 58)]/ln(1.1/0.9) = 1.494340
    //   T0: ln[(118.8 + 1.2)/(118.8 − 1.2)]/ln(1.1/0.9) = 0.100676
    //   T1: ln[(176.8 − 77 + 12)/(176.8 − 63 + 12)]/ln(1.1/0.9) = −0.587937
    //   G:  ln[(5200 − 58/0.0374)/(5200 − 58/0.0306)]/ln(1.1/0.9) = 0.494340
    expect(row('maxDepth').elasticity).toBeCloseTo(1.4943395330056084, 10);
    expect(row('surfaceTemperature').elasticity).toBeCloseTo(0.10067592216687128, 10);
    expect(row('minUsefulTemperature').elasticity).toBeCloseTo(-0.5879372833867219, 10);
    expect(row('gradient').elasticity).toBeCloseTo(0.49433953300560796, 10);
    // And near the point elasticities (a 10 % step is not infinitesimal).
    expect(row('maxDepth').elasticity).toBeCloseTo(1.488215, 1);
  });

  it('matches τ evaluated directly on the perturbed parameters', () => {
    const base = tauOf(demo);
    expect(s.tauS).toBe(base);
    // τ(0.9·ρr) = 0.9·τ0 and τ(1.1·ρr) = 1.1·τ0 (τ ∝ ρr); τ(0.9·ṁ) = τ0/0.9.
    expect(row('rockDensity').minus.tauS! / base).toBeCloseTo(0.9, 12);
    expect(row('rockDensity').plus.tauS! / base).toBeCloseTo(1.1, 12);
    expect(row('massFlow').minus.tauS! / base).toBeCloseTo(1 / 0.9, 12);
    // z2 + 10 %: (1.1·176.8 − 58)/118.8 = 136.48/118.8 = 1.148822.
    expect(row('maxDepth').plus.tauS! / base).toBeCloseTo(136.48 / 118.8, 12);
    // Every row against a direct evaluation of the parameters with that key changed by hand.
    const direct: Record<string, (f: number) => unknown> = {
      surfaceTemperature: (f) => ({ ...demo, surfaceTemperature: 12 * f }),
      gradient: (f) => ({ ...demo, gradient: 0.034 * f }),
      minUsefulTemperature: (f) => ({ ...demo, minUsefulTemperature: 70 * f }),
      maxDepth: (f) => ({ ...demo, maxDepth: 5200 * f }),
      area: (f) => ({ ...demo, area: 30000 * f }),
      rockDensity: (f) => ({ ...demo, rockDensity: 2650 * f }),
      rockSpecificHeat: (f) => ({ ...demo, rockSpecificHeat: 820 * f }),
      massFlow: (f) => ({ ...demo, massFlow: 50 * f }),
      'fluid.iapws.temperature': (f) => ({ ...demo, fluid: { iapws: { temperature: 160 * f, pressure: 8 } } }),
      'fluid.iapws.pressure': (f) => ({ ...demo, fluid: { iapws: { temperature: 160, pressure: 8 * f } } }),
    };
    for (const r of s.rows) {
      expect(r.minus.tauS).toBe(tauOf(direct[r.key](0.9)));
      expect(r.plus.tauS).toBe(tauOf(direct[r.key](1.1)));
      expect(r.elasticity).toBeCloseTo((Math.log(r.plus.tauS!) - Math.log(r.minus.tauS!)) / L, 12);
    }
  });

  it('sorts by influence, largest |elasticity| first', () => {
    const magnitudes = s.rows.map((r) => Math.abs(r.elasticity ?? 0));
    expect(magnitudes).toEqual([...magnitudes].sort((a, b) => b - a));
    expect(s.rows[0].key).toBe('maxDepth');
  });

  it('reports a refused side instead of a number, with a one-sided elasticity', () => {
    // z2 − 10 % of 1800 m = 1620 m lies above z1 = 1705.9 m: refused; z2 + 10 % = 1980 m is fine.
    const s2 = tauSensitivity({ ...demo, maxDepth: 1800 });
    const r = s2.rows.find((x) => x.key === 'maxDepth')!;
    expect(r.minus.tauS).toBeNull();
    expect(r.minus.error).toMatch(/do not reach the minimum useful temperature/);
    // One-sided: ln[(1980 − z1)/(1800 − z1)]/ln 1.1, z1 = 58/0.034.
    const z1 = 58 / 0.034;
    expect(r.elasticity).toBeCloseTo(Math.log((1980 - z1) / (1800 - z1)) / Math.log(1.1), 10);
  });

  it('gives the aquifer porosity and water heat elasticities of the bulk heat capacity', () => {
    // Aquifer with fixed water properties 1000 kg/m³ and 4186 J/(kg·K) (common practice, room temperature).
    const aquifer = {
      kind: 'aquifer', surfaceTemperature: 12, gradient: 0.034, minUsefulTemperature: 70, depth: 3000, thickness: 100,
      porosity: 0.2, area: 1e6, rockDensity: 2650, rockSpecificHeat: 820, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 },
    };
    const a = tauSensitivity(aquifer);
    const get = (k: string) => a.rows.find((x) => x.key === k)!.elasticity!;
    // C ∝ φ·ρw·cw + (1 − φ)·ρr·cr (DOMAIN.md §3) with ρw·cw = 4.186e6, ρr·cr = 2.173e6 J/(m³·K):
    // φ: ln[b(0.22)/b(0.18)]/ln(1.1/0.9) = 0.155803 (worked in Python 3, b(φ) the bulk term).
    expect(get('porosity')).toBeCloseTo(0.155803342056371, 10);
    // cw enters C (through φ·ρw·cw) and τ = C/(ṁ·cw): ln[(b(1.1cw)/1.1cw)/(b(0.9cw)/0.9cw)]/ln(1.1/0.9) = −0.675922.
    expect(get('fluid.specificHeat')).toBeCloseTo(-0.6759217623072323, 10);
    // No porosity: a relative change of zero is no change, so no elasticity.
    expect(tauSensitivity({ ...aquifer, porosity: 0 }).rows.find((x) => x.key === 'porosity')!.elasticity).toBeNull();
  });
});

describe('power in display units', () => {
  it('keeps kW and MW readable in SI and switches Btu/h to MMBtu/h in US units', () => {
    expect(formatPower(1440, 'si')).toBe('1.44 kWth');
    expect(formatPower(6.117e6, 'si')).toBe('6.12 MWth');
    expect(formatPower(-9.2e6, 'si')).toBe('−9.2 MWth');
    // 1440 W / (1055.05585262 J/Btu / 3600 s/h) = 4913.4 Btu/h (IT Btu, NIST SP 811 B.8).
    expect(formatPower(1440, 'us')).toBe('4,910 Btu/h');
    // 6.117e6 W → 20.87 MMBtu/h.
    expect(formatPower(6.117e6, 'us')).toBe('20.9 MMBtu/h');
  });
});
