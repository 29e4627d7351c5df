// The hand-written decimal reader of the import's hot path, against the engine's own correctly
// rounded Number() (ECMAScript's StringToNumber, round-to-nearest per IEEE 754) as the reference.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isBlankCell, parseDecimal } from '../src/shared/import/numbers.js';

describe('parseDecimal', () => {
  it('equals Number() on every shortest round-trip decimal of a double, with point or comma', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (v) => {
        const text = String(v);
        expect(Object.is(parseDecimal(text, false), Number(text))).toBe(true);
        if (!text.includes('e')) expect(Object.is(parseDecimal(text.replace('.', ','), true), Number(text))).toBe(true);
      }),
      { numRuns: 20_000 },
    );
  });

  it('equals Number() on decimals as logged: up to 15 digits, fixed point', () => {
    fc.assert(
      fc.property(fc.integer({ min: -999_999_999, max: 999_999_999 }), fc.integer({ min: 0, max: 9 }), (m, k) => {
        const text = (m / 10 ** k).toFixed(k);
        expect(parseDecimal(text, false)).toBe(Number(text));
      }),
      { numRuns: 20_000 },
    );
  });

  it.each(['175.3', ' 175.3 ', '+175.3', '-0.5', '.5', '5.', '1e3', '1.5E-3', '007', '0.1', '123456789012345678'])('reads %j as Number() does', (text) => {
    expect(parseDecimal(text, false)).toBe(Number(text));
  });

  it('reads the decimal comma only when asked', () => {
    expect(parseDecimal('175,3', true)).toBe(175.3);
    expect(parseDecimal('175,3', false)).toBeNaN();
    expect(parseDecimal('175.3', true)).toBeNaN();
    expect(parseDecimal('1,5e3', true)).toBe(1500);
  });

  it.each(['', '   ', '-', '+', '.', ',', '0x1A', 'Infinity', 'NaN', '1,234.5', '1 234', '1e', '1e+', '12a', '--1', '1..2', '1e309'])('%j is not a number', (text) => {
    // Number('') is 0, Number('0x1A') 26 and Number('Infinity') Infinity: none of them is a logged reading.
    expect(parseDecimal(text, false)).toBeNaN();
  });

  it('blank cells', () => {
    expect(isBlankCell('')).toBe(true);
    expect(isBlankCell(' \t ')).toBe(true);
    expect(isBlankCell(' 0 ')).toBe(false);
  });
});
