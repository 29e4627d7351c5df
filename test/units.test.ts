import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { InputError } from '../src/shared/errors.js';
import {
  findUnit, toSI, fromSI, unitsOf, flowKind, flowToMassFlowKgPerS, JULIAN_YEAR_S, SECONDS_PER_DAY, type Quantity,
} from '../src/shared/units.js';

// Sources used below:
//   [SP811]  NIST SP 811 (2008), Appendix B.8, "Factors for units listed alphabetically". It prints
//            seven significant digits; factors in boldface are exact. Footnote 22: pound = 0.453 592 37 kg
//            exactly; footnote 23: pound-force = 4.448 221 615 260 5 N exactly.
//   [SP811-4] NIST SP 811 (2008) §4.2.1.1: t/°C = T/K − 273.15.
//   [HB44]   NIST Handbook 44, Appendix C: 1 US gallon = 231 in³ exactly; 1 acre = 43 560 ft².

/** |actual − expected| ≤ rel·|expected|. */
function expectRel(actual: number, expected: number, rel: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

/** A value printed to seven significant digits agrees to within half a unit in its last digit. */
function expectPrinted7(actual: number, printed: number): void {
  expectRel(actual, printed, 5e-7);
}

const ALL: Quantity[] = [
  'temperature', 'temperatureDifference', 'massFlow', 'volumeFlow', 'pressure', 'length', 'area', 'energy', 'power', 'time',
];

describe('exact factors against NIST SP 811', () => {
  it('length: foot and the metric multiples', () => {
    expect(toSI(1, 'ft')).toBe(0.3048); // [SP811] foot = 3.048 E-01 m, exact
    expect(toSI(1, 'km')).toBe(1000); // SI prefix, exact
    expect(toSI(1, 'cm')).toBe(0.01); // SI prefix, exact
  });

  it('US gallon per minute', () => {
    // Exact: 231 in³ [HB44] × (0.0254 m/in)³ [SP811 inch = 2.54 E-02 exact] = 231 × 1.6387064e-5 = 3.785411784e-3 m³;
    // per minute: 3.785411784e-3 / 60 = 6.30901964e-5 m³/s.
    expectRel(toSI(1, 'gpm'), 6.30901964e-5, 1e-15);
    expectRel(toSI(60, 'gpm'), 231 * 0.0254 ** 3, 1e-15);
    expectPrinted7(toSI(60, 'gpm'), 3.785412e-3); // [SP811] gallon [U.S.] = 3.785 412 E-03 m³
    expectPrinted7(toSI(1, 'gpm'), 6.30902e-5); // [SP811] gallon [U.S.] per minute = 6.309 020 E-05 m³/s
  });

  it('petroleum barrel per day', () => {
    // Exact: 42 US gal [SP811 barrel for petroleum, 42 gallons (U.S.)] × 3.785411784e-3 m³ = 0.158987294928 m³.
    expectRel(toSI(SECONDS_PER_DAY, 'bbl/d'), 0.158987294928, 1e-15);
    expectPrinted7(toSI(SECONDS_PER_DAY, 'bbl/d'), 1.589873e-1); // [SP811] barrel = 1.589 873 E-01 m³
    // Per day: 0.158987294928 / 86400 = 1.840130728333…e-6 m³/s.
    expectRel(toSI(1, 'bbl/d'), 1.8401307283333333e-6, 1e-15);
    // 1 bbl/d = 42 gal / 1440 min = 0.0291666… gpm (worked example from the two definitions).
    expectRel(toSI(1, 'bbl/d'), toSI(42 / 1440, 'gpm'), 1e-15);
  });

  it('psi from the exact pound, standard gravity and inch', () => {
    // 0.45359237 kg × 9.80665 m/s² / (0.0254 m)² = 4.4482216152605 N / 6.4516e-4 m²
    // = 6894.757293168361336722… Pa (exact decimal, Python 3 fractions.Fraction).
    expectRel(toSI(1, 'psi'), 6894.757293168361, 2e-16);
    expectRel(toSI(1, 'psi'), 4.4482216152605 / 6.4516e-4, 2e-16); // [SP811] footnote 23, pound-force exact
    expectPrinted7(toSI(1, 'psi'), 6.894757e3); // [SP811] pound-force per square inch = 6.894 757 E+03 Pa
  });

  it('bar, atmosphere and the metric pressure units', () => {
    expect(toSI(1, 'bar')).toBe(1e5); // [SP811] bar = 1.0 E+05 Pa, exact
    expect(toSI(1, 'atm')).toBe(101325); // [SP811] atmosphere, standard = 1.013 25 E+05 Pa, exact
    expect(toSI(1, 'kPa')).toBe(1e3); // SI prefix, exact
    expect(toSI(1, 'MPa')).toBe(1e6); // SI prefix, exact
  });

  it('energy: kilowatt hour and its multiples', () => {
    expect(toSI(1, 'kWh')).toBe(3.6e6); // [SP811] kilowatt hour = 3.6 E+06 J, exact
    expect(toSI(1, 'Wh')).toBe(3600); // [SP811] watt hour = 3.6 E+03 J, exact
    expect(toSI(1, 'MWh')).toBe(3.6e9); // 1000 × 3.6e6 J
    expect(toSI(1, 'GWh')).toBe(3.6e12); // 1e6 × 3.6e6 J
    expect(toSI(1, 'GWh')).toBe(toSI(3.6, 'TJ')); // 3.6e12 J = 3.6 TJ
    expect(toSI(2, 'PJ')).toBe(2e15); // SI prefix, exact
  });

  it('international acre', () => {
    // 43 560 ft² [HB44] × 0.3048² m²/ft² [SP811] = 43 560 × 0.09290304 = 4046.8564224 m², exact.
    expectRel(toSI(1, 'acre'), 4046.8564224, 1e-15);
    expectRel(toSI(1, 'acre'), toSI(43560, 'ft2'), 1e-15);
    // [SP811] prints acre = 4.046 873 E+03 m², but for the U.S. survey foot (1200/3937 m):
    // 43 560 × (1200/3937)² = 4046.87261 m². The international acre is 4.0 ppm smaller, outside
    // the printed rounding, which is why the printed value is not ours.
    expectRel(43560 * (1200 / 3937) ** 2, 4.046873e3, 5e-7);
    expect(Math.abs(toSI(1, 'acre') / 4.046873e3 - 1)).toBeGreaterThan(3e-6);
    expect(toSI(1, 'ha')).toBe(1e4); // NIST SP 811 Table 6: 1 ha = 10⁴ m²
  });

  it('absolute temperature (NIST SP 811 §4.2.1.1 and B.8)', () => {
    // [SP811] T/K = (t/°F + 459.67)/1.8 and t/°C = (t/°F − 32)/1.8; [SP811-4] t/°C = T/K − 273.15.
    expectRel(toSI(32, 'degF'), 273.15, 1e-15); // (32 + 459.67)/1.8 = 491.67/1.8 = 273.15
    expectRel(toSI(212, 'degF'), 373.15, 1e-15); // (212 + 459.67)/1.8 = 671.67/1.8 = 373.15
    expectRel(fromSI(toSI(212, 'degF'), 'degC'), 100, 1e-13); // boiling point of water, 212 °F = 100 °C (common practice)
    expectRel(toSI(-40, 'degF'), toSI(-40, 'degC'), 1e-15); // (−40 − 32)/1.8 = −40: the scales cross at −40
    expect(toSI(0, 'degC')).toBe(273.15); // [SP811-4]
    expect(Math.abs(fromSI(0, 'degF') - -459.67)).toBeLessThan(1e-12); // (0 − 273.15)·1.8 + 32 = −459.67
    expectRel(toSI(98.6, 'degF'), (98.6 + 459.67) / 1.8, 1e-15); // [SP811] formula at an arbitrary point
    expect(toSI(300, 'K')).toBe(300);
    expectRel(fromSI(423.15, 'degC'), 150, 1e-13); // 423.15 − 273.15 = 150
  });

  it('temperature differences: 1 °F interval = 5/9 K', () => {
    expectRel(toSI(1, 'degF', 'temperatureDifference'), 5 / 9, 1e-15); // [SP811] T/K = (t/°F + 459.67)/1.8: slope 1/1.8
    expectRel(toSI(18, 'degF', 'temperatureDifference'), 10, 1e-15); // 18/1.8 = 10
    expect(toSI(25, 'degC', 'temperatureDifference')).toBe(25); // a kelvin equals a degree Celsius [SP811-4]
    expect(toSI(25, 'K', 'temperatureDifference')).toBe(25);
    expect(findUnit('K').quantity).toBe('temperature'); // without a quantity, K is absolute
  });

  it('mass flow: t/h = 1/3.6 kg/s', () => {
    expectRel(toSI(1, 't/h'), 1 / 3.6, 1e-15); // 1000 kg / 3600 s (NIST SP 811 Table 6: t = 10³ kg, h = 3600 s)
    expectRel(toSI(3600, 'kg/h'), 1, 1e-15);
    expect(toSI(7, 'kg/s')).toBe(7);
  });

  it('volume flow: the metric units', () => {
    expectRel(toSI(3600, 'm3/h'), 1, 1e-15);
    expectRel(toSI(SECONDS_PER_DAY, 'm3/d'), 1, 1e-15);
    expect(toSI(1000, 'L/s')).toBe(1); // NIST SP 811 Table 6: 1 L = 10⁻³ m³
  });

  it('time: Julian year of 365.25 d', () => {
    expect(JULIAN_YEAR_S).toBe(31_557_600); // 365.25 × 86 400 s, IAU convention (common practice)
    expect(SECONDS_PER_DAY).toBe(86_400); // NIST SP 811 Table 6: 1 d = 86 400 s
    expect(toSI(1, 'yr')).toBe(31_557_600);
    expect(toSI(1, 'a')).toBe(31_557_600);
    expect(toSI(1, 'year')).toBe(31_557_600);
    expect(toSI(2, 'h')).toBe(7200);
    expect(toSI(1, 'min')).toBe(60);
    expect(fromSI(86_400, 'd')).toBe(1);
  });

  it('power: the metric multiples', () => {
    expect(toSI(3, 'MW')).toBe(3e6);
    expect(toSI(1, 'GW')).toBe(1e9);
    expect(fromSI(2500, 'kW')).toBe(2.5);
  });
});

describe('round trips', () => {
  // Log-uniform magnitudes 1e-6..1e12 of either sign: the range of logged and reported values.
  const magnitude = fc
    .tuple(fc.double({ min: -6, max: 12, noNaN: true }), fc.boolean())
    .map(([e, negative]) => (negative ? -1 : 1) * 10 ** e);

  it('fromSI(toSI(v)) returns v to 1e-12 relative for every multiplicative unit', () => {
    const linear = ALL.filter((q) => q !== 'temperature');
    for (const quantity of linear) {
      for (const unit of unitsOf(quantity)) {
        fc.assert(
          fc.property(magnitude, (v) => Math.abs(fromSI(toSI(v, unit, quantity), unit, quantity) - v) <= 1e-12 * Math.abs(v)),
          { seed: 20240611, numRuns: 300 },
        );
      }
    }
  });

  it('absolute temperatures round-trip from absolute zero to 10 000 K', () => {
    // The 273.15 offset cancels near 0 °C / 0 °F, so the tolerance is relative to the offset's size
    // (500) rather than to v, which can be arbitrarily close to zero.
    for (const unit of unitsOf('temperature')) {
      const lo = fromSI(0, unit, 'temperature');
      const hi = fromSI(1e4, unit, 'temperature');
      fc.assert(
        fc.property(fc.double({ min: lo, max: hi, noNaN: true }), (v) => {
          const back = fromSI(toSI(v, unit, 'temperature'), unit, 'temperature');
          return Math.abs(back - v) <= 1e-12 * Math.max(Math.abs(v), 500);
        }),
        { seed: 20240611, numRuns: 300 },
      );
    }
  });
});

describe('names, aliases and case', () => {
  it('accepts the aliases people type', () => {
    const same: [string, string, Quantity?][] = [
      ['°C', 'degC'], ['C', 'degC'], ['celsius', 'degC'], ['Celsius', 'degC'], ['℃', 'degC'], ['ºC', 'degC'],
      ['°F', 'degF'], ['F', 'degF'], ['Fahrenheit', 'degF'],
      ['l/s', 'L/s'], ['m³/h', 'm3/h'], ['m^3/h', 'm3/h'], ['M3/H', 'm3/h'], ['m³/d', 'm3/d'],
      ['US gal/min', 'gpm'], ['gal/min', 'gpm'], ['GPM', 'gpm'], ['bbl/day', 'bbl/d'], ['BPD', 'bbl/d'],
      ['t/hr', 't/h'], ['T/H', 't/h'], ['kg / s', 'kg/s'], ['Kg/s', 'kg/s'],
      ['kpa', 'kPa'], ['KPA', 'kPa'], ['PSI', 'psi'], ['psia', 'psi'], ['Bar', 'bar'],
      ['km²', 'km2'], ['hectare', 'ha'], ['acres', 'acre'], ['kwh', 'kWh'], ['KWH', 'kWh'], ['gj', 'GJ'],
      ['MWth', 'MW'], ['kw', 'kW'], ['years', 'yr'], ['hr', 'h'], ['days', 'd'],
    ];
    for (const [alias, canonical, quantity] of same) {
      expect(findUnit(alias, quantity).symbol, alias).toBe(canonical);
    }
  });

  it('keeps K/k and M/m (mega/milli) apart', () => {
    expect(findUnit('K').symbol).toBe('K');
    expect(() => findUnit('k')).toThrow(InputError);
    expect(findUnit('MPa').symbol).toBe('MPa');
    expect(() => findUnit('mPa', 'pressure')).toThrow(/case matters.*"MPa"/);
    expect(() => findUnit('mpa', 'pressure')).toThrow(InputError);
    expect(() => findUnit('mW', 'power')).toThrow(InputError);
    expect(() => findUnit('mwh', 'energy')).toThrow(InputError);
    expect(() => findUnit('pj', 'energy')).toThrow(InputError);
    expect(() => findUnit('M', 'length')).toThrow(InputError);
    expect(findUnit('kelvin', 'temperatureDifference').symbol).toBe('K');
    expect(findUnit('KELVIN').symbol).toBe('K');
  });

  it('lists canonical names, SI first', () => {
    expect(unitsOf('pressure')).toEqual(['Pa', 'kPa', 'MPa', 'bar', 'psi', 'atm']);
    expect(unitsOf('volumeFlow')).toEqual(['m3/s', 'm3/h', 'm3/d', 'L/s', 'gpm', 'bbl/d']);
    expect(unitsOf('temperature')).toEqual(['K', 'degC', 'degF']);
    for (const q of ALL) expect(toSI(1, unitsOf(q)[0], q)).toBe(1);
  });
});

describe('US customary display units against NIST SP 811', () => {
  it('pound-mass flows', () => {
    // [SP811] footnote 22: pound = 0.453 592 37 kg exactly; 1 h = 3600 s.
    expect(toSI(1, 'lb/s')).toBe(0.45359237);
    expectRel(toSI(1, 'lb/h'), 0.45359237 / 3600, 1e-15);
    expectRel(toSI(1, 'klb/h'), 453.59237 / 3600, 1e-15); // 0.125 997 88… kg/s
  });

  it('British thermal unit (International Table) and MMBtu/h', () => {
    // [SP811] B.8: British thermal unit_IT = 1.055 056 E+03 J, exact value 1.055 055 852 62 E+03 J (footnote 9).
    expect(toSI(1, 'Btu')).toBe(1055.05585262);
    expectPrinted7(toSI(1, 'Btu'), 1.055056e3);
    expectRel(toSI(1, 'MMBtu'), 1.05505585262e9, 1e-15);
    // 1 MMBtu/h = 1.05505585262e9 J / 3600 s = 293 071.07… W
    expectRel(toSI(1, 'MMBtu/h'), 1.05505585262e9 / 3600, 1e-15);
    expectRel(fromSI(1e6, 'MMBtu/h'), 3.412141633, 1e-9); // 1 MW = 3.412 141 63 MMBtu/h (same factor, inverted)
  });
});

describe('flow', () => {
  it('tells mass from volume', () => {
    expect(flowKind('t/h')).toBe('mass');
    expect(flowKind('kg/s')).toBe('mass');
    expect(flowKind('m³/h')).toBe('volume');
    expect(flowKind('US gal/min')).toBe('volume');
    expect(() => flowKind('kPa', 'flowUnit')).toThrow(InputError);
  });

  it('converts a volume flow with the density', () => {
    // 36 m³/h × 950 kg/m³ / 3600 s/h = 9.5 kg/s (worked example).
    expectRel(flowToMassFlowKgPerS(36, 'm3/h', 950), 9.5, 1e-15);
    // 100 gpm × 6.30901964e-5 m³/s per gpm × 1000 kg/m³ = 6.30901964 kg/s (worked example).
    expectRel(flowToMassFlowKgPerS(100, 'gpm', 1000), 6.30901964, 1e-15);
    // 3.6 t/h = 1 kg/s; a density given with a mass unit is ignored.
    expectRel(flowToMassFlowKgPerS(3.6, 't/h'), 1, 1e-15);
    expectRel(flowToMassFlowKgPerS(3.6, 't/h', 950), 1, 1e-15);
  });

  it('requires a positive density for volume units', () => {
    expect(() => flowToMassFlowKgPerS(10, 'L/s')).toThrow(InputError);
    expect(() => flowToMassFlowKgPerS(10, 'L/s')).toThrow(/density/);
    expect(() => flowToMassFlowKgPerS(10, 'L/s', 0)).toThrow(InputError);
    expect(() => flowToMassFlowKgPerS(10, 'L/s', Number.NaN)).toThrow(InputError);
  });
});

describe('errors', () => {
  function caught(fn: () => unknown): InputError {
    try {
      fn();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      return e as InputError;
    }
    throw new Error('expected an InputError');
  }

  it('an unknown unit names itself, the quantity and the known units, on one line', () => {
    const e = caught(() => findUnit('xyz', 'pressure', 'wellheadPressure'));
    expect(e.reason).toBe('unknown unit "xyz" for pressure; known: Pa, kPa, MPa, bar, psi, atm');
    expect(e.where.field).toBe('wellheadPressure');
    expect(e.message).not.toContain('\n');
  });

  it('a unit of the wrong quantity says which quantity it belongs to', () => {
    const e = caught(() => toSI(5, 'kPa', 'massFlow', 'flow'));
    expect(e.reason).toContain('"kPa" is a pressure unit, not a massFlow unit');
    expect(e.reason).toContain('kg/s, t/h, kg/h');
    expect(e.where.field).toBe('flow');
    expect(caught(() => flowToMassFlowKgPerS(1, 'degC', 1000)).reason).toContain('temperature unit');
  });

  it('without a quantity, all known units are listed', () => {
    const e = caught(() => fromSI(1, 'furlong'));
    expect(e.reason).toContain('unknown unit "furlong"');
    expect(e.reason).toContain('bbl/d');
    expect(e.reason).toContain('(time)');
  });

  it('a missing unit and gauge pressure are rejected', () => {
    expect(caught(() => findUnit('  ', 'length')).reason).toContain('missing unit for length');
    expect(() => findUnit('barg', 'pressure')).toThrow(InputError); // gauge: needs the ambient pressure, not a factor
  });

  it('an absolute temperature below absolute zero is rejected', () => {
    expect(caught(() => toSI(-10, 'K', 'temperature', 'temperatureK')).where.field).toBe('temperatureK');
    expect(() => toSI(-300, 'degC')).toThrow(/absolute zero/);
    expect(toSI(-10, 'K', 'temperatureDifference')).toBe(-10);
    expect(toSI(-459.67, 'degF')).toBeCloseTo(0, 12);
  });
});
