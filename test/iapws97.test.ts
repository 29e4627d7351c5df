import { describe, it, expect } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import {
  liquidWater,
  saturationPressurePa,
  saturationTemperatureK,
  REGION1_LIMITS,
} from '../src/shared/water/iapws97.js';

/**
 * The release prints its verification values to 9 significant digits, so a value agrees
 * when it lies within half a unit of the 9th digit: relative 5e-9 of the printed value.
 */
function expectNineDigits(actual: number, printed: number): void {
  expect(Math.abs(actual / printed - 1)).toBeLessThan(5e-9);
}

/** Runs `fn`, expects an InputError naming `field`, and returns its message. */
function inputErrorOf(fn: () => unknown, field: string): string {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    expect((error as InputError).where.field).toBe(field);
    return (error as InputError).reason;
  }
  throw new Error('expected an InputError');
}

// IAPWS-IF97 (2007), Table 5, in the release's units (v m³/kg, h and u kJ/kg, s and cp kJ/(kg·K), w m/s).
// Confirmed against stored copies of open-source IF97 implementations that quote the table,
// found by searching public code for "0.100215168" and "0.124071337": the region 1 test of
// libh2o (v, h, u, s), the validation script of engthermo (all six columns), and several
// other IF97 test suites that quote the cp and w columns with the same digits.
const TABLE_5 = [
  { t: 300, pMPa: 3, v: 0.100215168e-2, h: 0.115331273e3, u: 0.112324818e3, s: 0.392294792, cp: 0.417301218e1, w: 0.150773921e4 },
  { t: 300, pMPa: 80, v: 0.971180894e-3, h: 0.184142828e3, u: 0.106448356e3, s: 0.368563852, cp: 0.401008987e1, w: 0.163469054e4 },
  { t: 500, pMPa: 3, v: 0.1202418e-2, h: 0.975542239e3, u: 0.971934985e3, s: 0.258041912e1, cp: 0.465580682e1, w: 0.124071337e4 },
];

describe('IAPWS-IF97 region 1 basic equation', () => {
  for (const row of TABLE_5) {
    it(`reproduces IAPWS-IF97 (2007), Table 5 at T = ${row.t} K, p = ${row.pMPa} MPa`, () => {
      const w = liquidWater(row.t, row.pMPa * 1e6);
      expectNineDigits(w.specificVolumeM3PerKg, row.v);
      expectNineDigits(w.densityKgPerM3, 1 / row.v);
      expectNineDigits(w.specificEnthalpyJPerKg, row.h * 1e3);
      expectNineDigits(w.specificInternalEnergyJPerKg, row.u * 1e3);
      expectNineDigits(w.specificEntropyJPerKgK, row.s * 1e3);
      expectNineDigits(w.specificHeatJPerKgK, row.cp * 1e3);
      expectNineDigits(w.speedOfSoundMPerS, row.w);
      expect(w.temperatureK).toBe(row.t);
      expect(w.pressurePa).toBe(row.pMPa * 1e6);
    });
  }

  it('reports the saturation pressure of its temperature', () => {
    // IAPWS-IF97 (2007), Table 35: ps(300 K) = 0.353658941e-2 MPa.
    expectNineDigits(liquidWater(300, 3e6).saturationPressurePa, 0.353658941e-2 * 1e6);
  });
});

describe('IAPWS-IF97 region 4 saturation line', () => {
  // IAPWS-IF97 (2007), Table 35 (ps in MPa); confirmed against the stored libh2o test and engthermo validation script.
  const TABLE_35: Array<[number, number]> = [
    [300, 0.353658941e-2],
    [500, 0.263889776e1],
    [600, 0.123443146e2],
  ];
  for (const [t, psMPa] of TABLE_35) {
    it(`reproduces IAPWS-IF97 (2007), Table 35: ps(${t} K)`, () => {
      expectNineDigits(saturationPressurePa(t), psMPa * 1e6);
    });
  }

  // IAPWS-IF97 (2007), Table 36 (Ts in K); confirmed against the stored libh2o test and engthermo validation script.
  const TABLE_36: Array<[number, number]> = [
    [0.1, 0.372755919e3],
    [1, 0.453035632e3],
    [10, 0.584149488e3],
  ];
  for (const [pMPa, ts] of TABLE_36) {
    it(`reproduces IAPWS-IF97 (2007), Table 36: Ts(${pMPa} MPa)`, () => {
      expectNineDigits(saturationTemperatureK(pMPa * 1e6), ts);
    });
  }

  it('the backward equation inverts the forward one', () => {
    // Eq. 31 is the exact algebraic inverse of Eq. 30 in IAPWS-IF97 (2007), so only rounding separates them.
    for (const t of [273.15, 300, 373.15, 450, 550, 623.15, 647]) {
      expect(Math.abs(saturationTemperatureK(saturationPressurePa(t)) - t)).toBeLessThan(1e-9);
    }
  });

  it('refuses temperatures and pressures outside the saturation line', () => {
    // Range of Eqs. 30 and 31, IAPWS-IF97 (2007): 273.15 K to 647.096 K, 611.213 Pa to 22.064 MPa.
    inputErrorOf(() => saturationPressurePa(273.0), 'temperature');
    inputErrorOf(() => saturationPressurePa(647.2), 'temperature');
    inputErrorOf(() => saturationPressurePa(Number.NaN), 'temperature');
    inputErrorOf(() => saturationTemperatureK(600), 'pressure');
    inputErrorOf(() => saturationTemperatureK(22.1e6), 'pressure');
  });
});

describe('IAPWS-IF97 region 1 validity', () => {
  it('exposes the limits of region 1', () => {
    // Range of region 1, IAPWS-IF97 (2007).
    expect(REGION1_LIMITS).toEqual({ minTemperatureK: 273.15, maxTemperatureK: 623.15, maxPressurePa: 100e6 });
  });

  it('calls water below its saturation pressure steam, naming the pressure', () => {
    // ps(453.15 K) = 1.0026 MPa from Eq. 30 of IAPWS-IF97 (2007) (Table 36 brackets it: Ts(1 MPa) = 453.04 K).
    const reason = inputErrorOf(() => liquidWater(453.15, 0.5e6), 'pressure');
    expect(reason).toBe(
      'water at 180 °C and 0.5 MPa is steam, not liquid (saturation pressure 1.0026 MPa); IAPWS-IF97 region 1 needs p ≥ ps(T)',
    );
  });

  it('accepts a state exactly on the saturation line', () => {
    // Table 35 point of IAPWS-IF97 (2007): saturated liquid at 500 K, p = ps(500 K).
    const ps = saturationPressurePa(500);
    expect(liquidWater(500, ps).densityKgPerM3).toBeGreaterThan(800);
    // And the other way round: the Table 36 point at 10 MPa, T = Ts(10 MPa).
    expect(liquidWater(saturationTemperatureK(10e6), 10e6).densityKgPerM3).toBeGreaterThan(600);
    // The corners of region 1, reached through the saturation equations.
    liquidWater(623.15, saturationPressurePa(623.15));
    liquidWater(saturationTemperatureK(saturationPressurePa(623.15)), saturationPressurePa(623.15));
    liquidWater(273.15, saturationPressurePa(273.15));
    // A pressure measurably (1 ppm) below the saturation line is steam.
    inputErrorOf(() => liquidWater(500, ps * (1 - 1e-6)), 'pressure');
  });

  it('refuses temperatures above 350 °C and below 0 °C, naming the temperature', () => {
    // Range of region 1, IAPWS-IF97 (2007): 273.15 K ≤ T ≤ 623.15 K.
    expect(inputErrorOf(() => liquidWater(633.15, 20e6), 'temperature')).toMatch(/above 350 °C .*outside IAPWS-IF97 region 1/);
    expect(inputErrorOf(() => liquidWater(623.16, 50e6), 'temperature')).toMatch(/outside IAPWS-IF97 region 1/);
    expect(inputErrorOf(() => liquidWater(270, 1e6), 'temperature')).toMatch(/below 0 °C .*outside IAPWS-IF97 region 1/);
  });

  it('refuses pressures above 100 MPa, naming the pressure', () => {
    // Range of region 1, IAPWS-IF97 (2007): p ≤ 100 MPa.
    liquidWater(300, 100e6);
    expect(inputErrorOf(() => liquidWater(300, 100.1e6), 'pressure')).toMatch(/above 100 MPa/);
  });

  it('refuses values that are not numbers', () => {
    inputErrorOf(() => liquidWater(Number.NaN, 1e6), 'temperature');
    inputErrorOf(() => liquidWater(300, Number.POSITIVE_INFINITY), 'pressure');
    inputErrorOf(() => liquidWater(300, -1), 'pressure');
  });
});

describe('IAPWS-IF97 region 1 against facts of the trade', () => {
  it('gives 998.2 kg/m³ and about 4182 J/(kg·K) at 20 °C and one atmosphere', () => {
    // Common practice: water at 20 °C is 998.2 kg/m³ and cp ≈ 4182 J/(kg·K) (handbook figures).
    const w = liquidWater(293.15, 101325);
    expect(Number(w.densityKgPerM3.toPrecision(4))).toBe(998.2);
    // IF97 gives 4184.8; the handbook figure is rounded, so agree to 0.1 %.
    expect(Math.abs(w.specificHeatJPerKgK / 4182 - 1)).toBeLessThan(1e-3);
  });

  it('departs from the room-temperature 1000 kg/m³ and 4186 J/(kg·K) at 150–200 °C', () => {
    // Common practice / DOMAIN §5: the room-temperature figures are 5–10 % off in a hot well.
    // p = 5 MPa keeps both states liquid (ps(200 °C) ≈ 1.55 MPa by Eq. 30).
    const at150 = liquidWater(423.15, 5e6);
    const at200 = liquidWater(473.15, 5e6);
    for (const w of [at150, at200]) {
      expect(1 - w.densityKgPerM3 / 1000).toBeGreaterThan(0.05);
    }
    // cp rises with temperature: about 2.6 % above 4186 at 150 °C and over 5 % at 200 °C.
    expect(at150.specificHeatJPerKgK / 4186 - 1).toBeGreaterThan(0.02);
    expect(at200.specificHeatJPerKgK / 4186 - 1).toBeGreaterThan(0.05);
  });
});

describe('density-only path used for logged volume flows', () => {
  it('reproduces IAPWS-IF97 (2007) Table 5 densities and agrees with the full equation everywhere in region 1', async () => {
    const { liquidDensityKgPerM3, liquidWater: full } = await import('../src/shared/water/iapws97.js');
    // Table 5: v = 0.100215168e-2, 0.971180894e-3, 0.120241800e-2 m³/kg.
    expect(liquidDensityKgPerM3(300, 3e6) * 0.100215168e-2).toBeCloseTo(1, 8);
    expect(liquidDensityKgPerM3(300, 80e6) * 0.971180894e-3).toBeCloseTo(1, 8);
    expect(liquidDensityKgPerM3(500, 3e6) * 0.1202418e-2).toBeCloseTo(1, 8);
    for (let t = 275; t <= 620; t += 15) {
      for (const p of [3e6, 17e6, 40e6, 99e6]) {
        let ok = true;
        try { full(t, p); } catch { ok = false; }
        if (!ok) continue;
        expect(Math.abs(liquidDensityKgPerM3(t, p) / full(t, p).densityKgPerM3 - 1)).toBeLessThan(1e-13);
      }
    }
    expect(() => liquidDensityKgPerM3(453.15, 0.5e6)).toThrow(/steam, not liquid/);
  });
});
