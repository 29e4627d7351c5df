import { describe, it, expect } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import {
  energyAtJ,
  powerAtW,
  reservoirTheory,
  tauAtMassFlowS,
  thetaAtK,
  type AquiferParams,
  type HotDryRockParams,
  type ReservoirParams,
} from '../src/shared/reservoir/theory.js';
import { parseReservoirParams, reservoirTheoryToJson } from '../src/shared/reservoir/params.js';

const YEAR_S = 365.25 * 86400; // Julian year, DOMAIN.md §9
const C_TO_K = 273.15; // exact Celsius offset (SI Brochure)

/** Granite slab of the worked example below. */
const granite: HotDryRockParams = {
  kind: 'hot-dry-rock',
  surfaceTemperatureK: 10 + C_TO_K,
  gradientKPerM: 0.03,
  minUsefulTemperatureK: 70 + C_TO_K,
  maxDepthM: 5000,
  areaM2: 1e6,
  rockDensityKgPerM3: 2700, // granite, common practice
  rockSpecificHeatJPerKgK: 800, // granite, common practice
  flow: { massFlowKgPerS: 50 },
  fluid: { kind: 'fixed', densityKgPerM3: 1000, specificHeatJPerKgK: 4186 }, // near room temperature, common practice
};

/** Sandstone aquifer of the second worked example. */
const sandstone: AquiferParams = {
  kind: 'aquifer',
  surfaceTemperatureK: 15 + C_TO_K,
  gradientKPerM: 0.03,
  minUsefulTemperatureK: 60 + C_TO_K,
  depthM: 2500,
  thicknessM: 100,
  porosity: 0.2,
  areaM2: 4e6,
  rockDensityKgPerM3: 2650,
  rockSpecificHeatJPerKgK: 850,
  flow: { massFlowKgPerS: 30 },
  fluid: { kind: 'fixed', densityKgPerM3: 1000, specificHeatJPerKgK: 4186 },
};

/** Composite Simpson's rule on [a, b] with n (even) panels. */
function simpson(f: (x: number) => number, a: number, b: number, n = 1000): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += f(a + i * h) * (i % 2 === 1 ? 4 : 2);
  return (sum * h) / 3;
}

function thrown(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw new Error(`expected an InputError, got ${String(e)}`, { cause: e });
  }
  throw new Error('expected an InputError, nothing was thrown');
}

describe('hot-dry-rock slab: worked example', () => {
  it('reproduces the hand arithmetic', () => {
    // Worked example derived by hand (DOMAIN.md §2 formulas):
    //   z1 = (70 − 10)/0.03 = 2000 m;  T2 = 10 + 0.03·5000 = 160 °C = 433.15 K
    //   θ0 = (160 − 70)/2 = 45 K
    //   C  = 2700·800·1e6·(5000 − 2000) = 2.16e12·3000 = 6.48e15 J/K
    //   E0 = C·θ0 = 2.916e17 J  (= 2.16e12·0.03·3000²/2 = 2.16e12·1.35e5, same)
    //   τ  = 6.48e15/(50·4186) = 6.48e15/209300 = 3.0960344e10 s = 981.07 yr (Julian)
    //   P0 = ṁ·cw·θ0 = 209300·45 = 9.4185e6 W;  Mc = C/cw = 6.48e15/4186 = 1.5480172e12 kg
    const t = reservoirTheory(granite);
    expect(t.kind).toBe('hot-dry-rock');
    expect(t.minUsefulDepthM).toBeCloseTo(2000, 6);
    expect(t.bottomTemperatureK).toBeCloseTo(433.15, 9);
    expect(t.theta0K).toBeCloseTo(45, 9);
    expect(t.heatCapacityJPerK / 6.48e15).toBeCloseTo(1, 12);
    expect(t.usefulHeatJ / 2.916e17).toBeCloseTo(1, 12);
    expect(t.tauS / 3.0960344e10).toBeCloseTo(1, 7);
    expect(t.tauS / YEAR_S).toBeCloseTo(981.07, 2);
    expect(t.initialPowerW / 9.4185e6).toBeCloseTo(1, 12);
    expect(t.characteristicMassKg / 1.5480172e12).toBeCloseTo(1, 7);
    expect(t.massFlowKgPerS).toBe(50);
    expect(t.fluid).toEqual({ densityKgPerM3: 1000, specificHeatJPerKgK: 4186, source: 'fixed' });
  });

  it('τ = Mc/ṁ at any other flow', () => {
    // DOMAIN.md §4: τ = Mc/ṁ; at 100 kg/s the worked-example τ halves to 1.5480172e10 s.
    const t = reservoirTheory(granite);
    expect(tauAtMassFlowS(t, 100) / 1.5480172e10).toBeCloseTo(1, 7);
    expect(tauAtMassFlowS(t, 50)).toBeCloseTo(t.tauS, 0);
    expect(tauAtMassFlowS(t, 25) / (t.characteristicMassKg / 25)).toBeCloseTo(1, 12);
  });
});

describe('hot-dry-rock slab: closed forms against numerical integration of the depth profile', () => {
  const cases: HotDryRockParams[] = [
    granite,
    { ...granite, surfaceTemperatureK: 285, gradientKPerM: 0.025, minUsefulTemperatureK: 340, maxDepthM: 6000, areaM2: 2.5e6 },
    { ...granite, gradientKPerM: 0.06, minUsefulTemperatureK: 10 + C_TO_K, maxDepthM: 3000, rockSpecificHeatJPerKgK: 850 },
  ];
  for (const p of cases) {
    it(`G = ${p.gradientKPerM} K/m, z2 = ${p.maxDepthM} m`, () => {
      // Independent check: composite Simpson over z1..z2 of ρr·cr·A·(T(z) − T1) dz for E0,
      // of ρr·cr·A dz for C; the mean excess is then E0/C (DOMAIN.md §2).
      const t = reservoirTheory(p);
      const z1 = (p.minUsefulTemperatureK - p.surfaceTemperatureK) / p.gradientKPerM;
      const rcA = p.rockDensityKgPerM3 * p.rockSpecificHeatJPerKgK * p.areaM2;
      const T = (z: number) => p.surfaceTemperatureK + p.gradientKPerM * z;
      const e0 = simpson((z) => rcA * (T(z) - p.minUsefulTemperatureK), z1, p.maxDepthM);
      const c = simpson(() => rcA, z1, p.maxDepthM);
      expect(t.usefulHeatJ / e0).toBeCloseTo(1, 10);
      expect(t.heatCapacityJPerK / c).toBeCloseTo(1, 10);
      expect(t.theta0K / (e0 / c)).toBeCloseTo(1, 10);
      expect(t.bottomTemperatureK).toBeCloseTo(T(p.maxDepthM), 9);
      expect(t.usefulHeatJ / (t.heatCapacityJPerK * t.theta0K)).toBeCloseTo(1, 12);
    });
  }
});

describe('decline θ(t), E(t), P(t) against numerical integration', () => {
  it('θ(t) matches RK4 of C·dθ/dt = −ṁ·cw·θ', () => {
    // Independent check: classical 4th-order Runge–Kutta on the lumped balance (DOMAIN.md §2),
    // 200 steps per τ out to 5τ; RK4's local error ~ (h/τ)⁵/120 keeps the total below 1e-10.
    for (const p of [granite, sandstone] as ReservoirParams[]) {
      const t = reservoirTheory(p);
      const c = t.heatCapacityJPerK;
      const mcw = t.massFlowKgPerS * t.fluid.specificHeatJPerKgK;
      const rhs = (theta: number) => (-mcw * theta) / c;
      const h = t.tauS / 200;
      let theta = t.theta0K;
      for (let step = 1; step <= 1000; step++) {
        const k1 = rhs(theta);
        const k2 = rhs(theta + (h / 2) * k1);
        const k3 = rhs(theta + (h / 2) * k2);
        const k4 = rhs(theta + h * k3);
        theta += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
        if (step % 100 === 0) expect(thetaAtK(t, step * h) / theta).toBeCloseTo(1, 9);
      }
      expect(thetaAtK(t, 0)).toBe(t.theta0K);
    }
  });

  it('E(0) − E(t) = ∫₀ᵗ P dt and P = ṁ·cw·θ', () => {
    // Energy conservation of the lumped model (DOMAIN.md §2): heat delivered equals heat lost
    // from store; the integral is by composite Simpson, independent of the closed form.
    const t = reservoirTheory(granite);
    for (const multiple of [0.1, 1, 3]) {
      const end = multiple * t.tauS;
      const delivered = simpson((s) => powerAtW(t, s), 0, end);
      expect((energyAtJ(t, 0) - energyAtJ(t, end)) / delivered).toBeCloseTo(1, 10);
      expect(powerAtW(t, end) / (t.massFlowKgPerS * t.fluid.specificHeatJPerKgK * thetaAtK(t, end))).toBeCloseTo(1, 12);
    }
    // One τ leaves e⁻¹ of the heat: 2.916e17·0.36787944 = 1.0727365e17 J (worked example above).
    expect(energyAtJ(t, t.tauS) / 1.0727365e17).toBeCloseTo(1, 7);
  });
});

describe('sanity against facts of the trade', () => {
  it('granite volumetric heat capacity is about 2.2 MJ/(m³·K)', () => {
    // Common practice: granite ρ ≈ 2700 kg/m³, cp ≈ 800–850 J/(kg·K) → 2.16–2.30 MJ/(m³·K).
    for (const cr of [800, 850]) {
      const t = reservoirTheory({ ...granite, rockSpecificHeatJPerKgK: cr });
      const volumetric = t.heatCapacityJPerK / (granite.areaM2 * (granite.maxDepthM - t.minUsefulDepthM));
      expect(volumetric).toBeGreaterThan(2.1e6);
      expect(volumetric).toBeLessThan(2.35e6);
    }
  });

  it('a mean gradient of 25–30 K/km puts 5 km at roughly 135–160 °C', () => {
    // Common practice: mean geothermal gradient 25–30 K/km; from a 10 °C surface,
    // 10 + 25·5 = 135 °C and 10 + 30·5 = 160 °C at 5 km.
    const low = reservoirTheory({ ...granite, gradientKPerM: 0.025 });
    const high = reservoirTheory({ ...granite, gradientKPerM: 0.03 });
    expect(low.bottomTemperatureK - C_TO_K).toBeCloseTo(135, 9);
    expect(high.bottomTemperatureK - C_TO_K).toBeCloseTo(160, 9);
  });
});

describe('aquifer', () => {
  it('reproduces a worked example', () => {
    // Worked example derived by hand (DOMAIN.md §3 formulas):
    //   z1 = (60 − 15)/0.03 = 1500 m;  T2 = 15 + 0.03·2500 = 90 °C;  θ0 = 90 − 60 = 30 K
    //   bulk = 0.2·1000·4186 + 0.8·2650·850 = 837200 + 1802000 = 2639200 J/(m³·K)
    //   C  = 2639200·100·4e6 = 1.05568e15 J/K;  E0 = 30·C = 3.16704e16 J
    //   τ  = 1.05568e15/(30·4186) = 1.05568e15/125580 = 8.4064341e9 s (266.38 yr)
    //   P0 = 125580·30 = 3.7674e6 W
    const t = reservoirTheory(sandstone);
    expect(t.kind).toBe('aquifer');
    expect(t.minUsefulDepthM).toBeCloseTo(1500, 6);
    expect(t.bottomTemperatureK - C_TO_K).toBeCloseTo(90, 9);
    expect(t.theta0K).toBeCloseTo(30, 9);
    expect(t.heatCapacityJPerK / 1.05568e15).toBeCloseTo(1, 12);
    expect(t.usefulHeatJ / 3.16704e16).toBeCloseTo(1, 12);
    expect(t.tauS / 8.4064341e9).toBeCloseTo(1, 7);
    expect(t.initialPowerW / 3.7674e6).toBeCloseTo(1, 12);
  });

  it('porosity 0 reduces to rock only, whatever the fluid', () => {
    // DOMAIN.md §3 with φ = 0: C = ρr·cr·h·A = 2650·850·100·4e6 = 9.01e14 J/K (hand arithmetic).
    const a = reservoirTheory({ ...sandstone, porosity: 0 });
    const b = reservoirTheory({ ...sandstone, porosity: 0, fluid: { kind: 'fixed', densityKgPerM3: 900, specificHeatJPerKgK: 4500 } });
    expect(a.heatCapacityJPerK / 9.01e14).toBeCloseTo(1, 12);
    expect(b.heatCapacityJPerK).toBe(a.heatCapacityJPerK);
    // Independent: Simpson over the layer of the rock-only volumetric heat times A.
    const c = simpson(() => 2650 * 850 * 4e6, sandstone.depthM - 50, sandstone.depthM + 50);
    expect(a.heatCapacityJPerK / c).toBeCloseTo(1, 10);
  });

  it('porosity raises C when water holds more heat per m³ than rock, lowers it otherwise', () => {
    // Water ρw·cw = 4.186 MJ/(m³·K) > sandstone 2650·850 = 2.2525 MJ/(m³·K) (hand arithmetic), so C rises
    // with φ; a hypothetical rock at 3000·1500 = 4.5 MJ/(m³·K) makes it fall.
    const c = (phi: number, p: AquiferParams = sandstone) => reservoirTheory({ ...p, porosity: phi }).heatCapacityJPerK;
    expect(c(0.1)).toBeGreaterThan(c(0));
    expect(c(0.3)).toBeGreaterThan(c(0.1));
    const dense = { ...sandstone, rockDensityKgPerM3: 3000, rockSpecificHeatJPerKgK: 1500 };
    expect(c(0.3, dense)).toBeLessThan(c(0.1, dense));
    // Linear in φ: C(0.2) is the mean of C(0.1) and C(0.3).
    expect(c(0.2) / ((c(0.1) + c(0.3)) / 2)).toBeCloseTo(1, 12);
  });

  it('volume flow converted with the IAPWS-IF97 density gives the mass-flow τ', () => {
    // IAPWS-IF97 (2007) Table 5, T = 500 K, p = 3 MPa: v = 0.120241800e-2 m³/kg, cp = 0.465580682e1 kJ/(kg·K).
    const rho = 1 / 0.120241800e-2; // 831.65754 kg/m³
    const cp = 4655.80682;
    const volumeFlow = 0.06;
    const fluid = { kind: 'iapws', temperatureK: 500, pressurePa: 3e6 } as const;
    const byVolume = reservoirTheory({ ...sandstone, fluid, flow: { volumeFlowM3PerS: volumeFlow } });
    expect(byVolume.fluid.source).toBe('IAPWS-IF97 region 1');
    expect(byVolume.fluid.temperatureK).toBe(500);
    expect(byVolume.fluid.pressurePa).toBe(3e6);
    expect(byVolume.fluid.densityKgPerM3 / rho).toBeCloseTo(1, 8);
    expect(byVolume.fluid.specificHeatJPerKgK / cp).toBeCloseTo(1, 8);
    expect(byVolume.massFlowKgPerS / (volumeFlow * rho)).toBeCloseTo(1, 8);

    const byMass = reservoirTheory({ ...sandstone, fluid, flow: { massFlowKgPerS: byVolume.massFlowKgPerS } });
    expect(byMass.tauS / byVolume.tauS).toBeCloseTo(1, 12);
    expect(tauAtMassFlowS(byVolume, byVolume.massFlowKgPerS) / byVolume.tauS).toBeCloseTo(1, 12);
    // Derived from the Table 5 values by hand: τ = [φ·ρ·cp + (1 − φ)·ρr·cr]·h·A / (V̇·ρ·cp).
    const tauHand = ((0.2 * rho * cp + 0.8 * 2650 * 850) * 100 * 4e6) / (volumeFlow * rho * cp);
    expect(byVolume.tauS / tauHand).toBeCloseTo(1, 7);
  });
});

describe('invalid input throws InputError naming the parameter', () => {
  type Case = [string, ReservoirParams, string];
  const fixed = { kind: 'fixed', densityKgPerM3: 1000, specificHeatJPerKgK: 4186 } as const; // as in granite above
  const cases: Case[] = [
    ['wells above z1', { ...granite, maxDepthM: 2000 }, 'maxDepth'],
    ['aquifer above z1', { ...sandstone, depthM: 1000 }, 'depth'],
    ['zero gradient', { ...granite, gradientKPerM: 0 }, 'gradient'],
    ['negative gradient', { ...granite, gradientKPerM: -0.03 }, 'gradient'],
    ['T1 below surface', { ...granite, minUsefulTemperatureK: 5 + C_TO_K }, 'minUsefulTemperature'],
    ['porosity 1', { ...sandstone, porosity: 1 }, 'porosity'],
    ['porosity < 0', { ...sandstone, porosity: -0.1 }, 'porosity'],
    ['zero mass flow', { ...granite, flow: { massFlowKgPerS: 0 } }, 'massFlow'],
    ['negative volume flow', { ...granite, flow: { volumeFlowM3PerS: -1 } }, 'volumeFlow'],
    ['zero area', { ...granite, areaM2: 0 }, 'area'],
    ['zero rock density', { ...granite, rockDensityKgPerM3: 0 }, 'rockDensity'],
    ['negative rock heat', { ...granite, rockSpecificHeatJPerKgK: -800 }, 'rockSpecificHeat'],
    ['zero fluid density', { ...granite, fluid: { ...fixed, densityKgPerM3: 0 } }, 'fluid.density'],
    ['zero fluid heat', { ...granite, fluid: { ...fixed, specificHeatJPerKgK: 0 } }, 'fluid.specificHeat'],
    ['zero thickness', { ...sandstone, thicknessM: 0 }, 'thickness'],
    ['NaN surface temperature', { ...granite, surfaceTemperatureK: NaN }, 'surfaceTemperature'],
    ['infinite depth', { ...granite, maxDepthM: Infinity }, 'maxDepth'],
    ['NaN T1', { ...granite, minUsefulTemperatureK: NaN }, 'minUsefulTemperature'],
    ['NaN gradient', { ...granite, gradientKPerM: NaN }, 'gradient'],
    ['NaN porosity', { ...sandstone, porosity: NaN }, 'porosity'],
    ['NaN area', { ...granite, areaM2: NaN }, 'area'],
    ['NaN thickness', { ...sandstone, thicknessM: NaN }, 'thickness'],
    ['infinite flow', { ...granite, flow: { massFlowKgPerS: Infinity } }, 'massFlow'],
    ['NaN IAPWS temperature', { ...granite, fluid: { kind: 'iapws', temperatureK: NaN, pressurePa: 3e6 } }, 'fluid.iapws.temperature'],
    // IAPWS-IF97 (2007): region 1 ends at 623.15 K; 700 K is outside it.
    ['IAPWS above region 1', { ...granite, fluid: { kind: 'iapws', temperatureK: 700, pressurePa: 30e6 } }, 'fluid.iapws.temperature'],
    // IAPWS-IF97 (2007) Table 35: ps(500 K) = 2.63889776 MPa, so 1 MPa at 500 K is steam.
    ['IAPWS steam', { ...granite, fluid: { kind: 'iapws', temperatureK: 500, pressurePa: 1e6 } }, 'fluid.iapws.pressure'],
  ];
  for (const [name, params, field] of cases) {
    it(`${name} → ${field}`, () => {
      expect(thrown(() => reservoirTheory(params)).where.field).toBe(field);
    });
  }

  it('says the wells do not reach the minimum useful temperature', () => {
    expect(thrown(() => reservoirTheory({ ...granite, maxDepthM: 1500 })).reason).toMatch(
      /do not reach the minimum useful temperature/,
    );
  });

  it('rejects bad flows and times in the decline functions', () => {
    const t = reservoirTheory(granite);
    expect(thrown(() => tauAtMassFlowS(t, 0)).where.field).toBe('massFlow');
    expect(thrown(() => tauAtMassFlowS(t, NaN)).where.field).toBe('massFlow');
    expect(thrown(() => thetaAtK(t, -1)).where.field).toBe('time');
    expect(thrown(() => energyAtJ(t, NaN)).where.field).toBe('time');
    expect(thrown(() => powerAtW(t, Infinity)).where.field).toBe('time');
  });
});

describe('parseReservoirParams and reservoirTheoryToJson', () => {
  const slabJson = {
    kind: 'hot-dry-rock',
    surfaceTemperature: 10,
    gradient: 0.03,
    minUsefulTemperature: 70,
    maxDepth: 5000,
    area: 1e6,
    rockDensity: 2700,
    rockSpecificHeat: 800,
    massFlow: 50,
    fluid: { density: 1000, specificHeat: 4186 },
  };
  const aquiferJson = {
    kind: 'aquifer',
    surfaceTemperature: 15,
    gradient: 0.03,
    minUsefulTemperature: 60,
    depth: 2500,
    thickness: 100,
    porosity: 0.2,
    area: 4e6,
    rockDensity: 2650,
    rockSpecificHeat: 850,
    volumeFlow: 0.06,
    fluid: { iapws: { temperature: 226.85, pressure: 3 } },
  };

  it('parses a slab into SI (°C + 273.15 = K)', () => {
    const p = parseReservoirParams(slabJson, 'slab.json');
    expect(p.kind).toBe('hot-dry-rock');
    expect(p.surfaceTemperatureK).toBeCloseTo(granite.surfaceTemperatureK, 12);
    expect(p.minUsefulTemperatureK).toBeCloseTo(granite.minUsefulTemperatureK, 12);
    expect(p).toMatchObject({ maxDepthM: 5000, areaM2: 1e6, flow: { massFlowKgPerS: 50 }, fluid: granite.fluid });
    // Same worked example as above: τ = 3.0960344e10 s.
    expect(reservoirTheory(p).tauS / 3.0960344e10).toBeCloseTo(1, 7);
  });

  it('parses an aquifer with an IAPWS fluid state (MPa → Pa)', () => {
    const p = parseReservoirParams(aquiferJson);
    expect(p).toMatchObject({ kind: 'aquifer', depthM: 2500, thicknessM: 100, porosity: 0.2, flow: { volumeFlowM3PerS: 0.06 } });
    if (p.fluid.kind !== 'iapws') throw new Error('expected an IAPWS fluid');
    // 226.85 °C + 273.15 = 500 K; 3 MPa = 3e6 Pa (SI prefixes).
    expect(p.fluid.temperatureK).toBeCloseTo(500, 9);
    expect(p.fluid.pressurePa).toBe(3e6);
  });

  const bad: [string, unknown, string | undefined][] = [
    ['not an object', [1, 2], undefined],
    ['unknown kind', { ...slabJson, kind: 'geyser' }, 'kind'],
    ['missing gradient', { ...slabJson, gradient: undefined }, 'gradient'],
    ['string gradient', { ...slabJson, gradient: '0.03' }, 'gradient'],
    ['unknown key', { ...slabJson, permeability: 1e-15 }, 'permeability'],
    ['aquifer key on a slab', { ...slabJson, porosity: 0.1 }, 'porosity'],
    ['missing maxDepth', { ...slabJson, maxDepth: undefined }, 'maxDepth'],
    ['missing thickness', { ...aquiferJson, thickness: undefined }, 'thickness'],
    ['both flows', { ...slabJson, volumeFlow: 0.05 }, 'volumeFlow'],
    ['no flow', { ...slabJson, massFlow: undefined }, 'massFlow'],
    ['null flow', { ...slabJson, massFlow: null }, 'massFlow'],
    ['missing fluid', { ...slabJson, fluid: undefined }, 'fluid'],
    ['fluid not an object', { ...slabJson, fluid: 'water' }, 'fluid'],
    ['fluid density missing', { ...slabJson, fluid: { specificHeat: 4186 } }, 'fluid.density'],
    ['fluid unknown key', { ...slabJson, fluid: { density: 1000, specificHeat: 4186, viscosity: 1e-3 } }, 'fluid.viscosity'],
    ['fluid mixes both forms', { ...slabJson, fluid: { density: 1000, iapws: { temperature: 20, pressure: 1 } } }, 'fluid.density'],
    ['iapws pressure mistyped', { ...aquiferJson, fluid: { iapws: { temperature: 200, pressure: '3 MPa' } } }, 'fluid.iapws.pressure'],
    ['iapws unknown key', { ...aquiferJson, fluid: { iapws: { temperature: 200, pressure: 3, salinity: 0.1 } } }, 'fluid.iapws.salinity'],
    ['physically invalid gradient', { ...slabJson, gradient: 0 }, 'gradient'],
    ['wells too shallow', { ...slabJson, maxDepth: 1000 }, 'maxDepth'],
    ['porosity 1', { ...aquiferJson, porosity: 1 }, 'porosity'],
  ];
  for (const [name, json, field] of bad) {
    it(`rejects ${name}${field !== undefined ? ` (field ${field})` : ''} with the file named`, () => {
      // JSON.parse(JSON.stringify(…)) drops undefined keys, as a real file would lack them.
      const e = thrown(() => parseReservoirParams(JSON.parse(JSON.stringify(json)), 'res.json'));
      expect(e.where.file).toBe('res.json');
      expect(e.where.field).toBe(field);
    });
  }

  it('writes the theory as SI quantities with units', () => {
    const json = reservoirTheoryToJson(reservoirTheory(granite));
    // Values from the slab worked example above.
    expect(json.minUsefulDepth.unit).toBe('m');
    expect(json.minUsefulDepth.value).toBeCloseTo(2000, 6);
    expect(json.bottomTemperature).toEqual({ value: expect.closeTo(433.15, 9), unit: 'K' });
    expect(json.theta0).toEqual({ value: expect.closeTo(45, 9), unit: 'K' });
    expect(json.heatCapacity.unit).toBe('J/K');
    expect(json.usefulHeat.unit).toBe('J');
    expect(json.tau.unit).toBe('s');
    expect(json.tau.value / 3.0960344e10).toBeCloseTo(1, 7);
    expect(json.initialPower).toEqual({ value: expect.closeTo(9.4185e6, 3), unit: 'W' });
    expect(json.massFlow).toEqual({ value: 50, unit: 'kg/s' });
    expect(json.characteristicMass.unit).toBe('kg');
    expect(json.fluidDensity).toEqual({ value: 1000, unit: 'kg/m3' });
    expect(json.fluidSpecificHeat).toEqual({ value: 4186, unit: 'J/(kg K)' });
    expect(json.fluidSource).toBe('fixed');
    expect(JSON.parse(JSON.stringify(json))).toEqual(json);
  });
});
