/**
 * Decimal numbers as plant exports write them: optional sign, digits, one decimal separator
 * ('.' or ','), optional exponent, blanks around. No thousands separators, no 'NaN'/'Infinity',
 * no hexadecimal: anything else is not a number, so a mistyped cell is rejected rather than
 * misread (Number('') is 0 and Number('0x1A') is 26; neither is a reading).
 *
 * This is the hot path of an import (three or four cells a row), so it scans char codes once and,
 * for up to 15 significant digits without an exponent, computes mantissa / 10^k: both operands
 * are exact doubles (< 2^53 and ≤ 10^22), so the one division is correctly rounded and the result
 * equals Number()'s (Clinger, "How to read floating point numbers accurately", PLDI 1990, the
 * exact fast path). Longer or exponent forms go to Number() after the same validation.
 */

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

const ZERO = 48;
const NINE = 57;
const PLUS = 43;
const MINUS = 45;
const DOT = 46;
const COMMA = 44;
const SPACE = 32;
const TAB = 9;
const LOWER_E = 101;
const UPPER_E = 69;

/** True when the cell has nothing but blanks (the cell is empty for the import). */
export function isBlankCell(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c !== SPACE && c !== TAB) return false;
  }
  return true;
}

/**
 * The number written in `text`, or NaN when it is not one. `decimalComma` selects ',' as the
 * decimal separator instead of '.'; the other character is then invalid.
 *
 * The loop here takes the common case, digits with at most one separator and nothing else; any
 * other character (blank, exponent, junk) hands the whole text to the careful reader below.
 */
export function parseDecimal(text: string, decimalComma: boolean): number {
  const n = text.length;
  if (n === 0) return NaN;
  const separator = decimalComma ? COMMA : DOT;
  let i = 0;
  let c = text.charCodeAt(0);
  let negative = false;
  if (c === MINUS || c === PLUS) {
    negative = c === MINUS;
    if (++i === n) return NaN;
    c = text.charCodeAt(i);
  }
  let mantissa = 0;
  let digits = 0;
  let separatorAt = -1;
  for (;;) {
    const d = c - ZERO;
    if (d >= 0 && d <= 9) {
      mantissa = mantissa * 10 + d;
      digits++;
    } else if (c === separator && separatorAt < 0) {
      separatorAt = digits;
    } else return parseDecimalCarefully(text, decimalComma);
    if (++i === n) break;
    c = text.charCodeAt(i);
  }
  if (digits === 0 || digits > 15) return parseDecimalCarefully(text, decimalComma);
  const fractionDigits = separatorAt < 0 ? 0 : digits - separatorAt;
  const v = fractionDigits === 0 ? mantissa : mantissa / POW10[fractionDigits];
  return negative ? -v : v;
}

/** parseDecimal for every form: blanks around, an exponent, more than 15 digits, or not a number at all. */
function parseDecimalCarefully(text: string, decimalComma: boolean): number {
  let i = 0;
  let end = text.length;
  while (i < end && (text.charCodeAt(i) === SPACE || text.charCodeAt(i) === TAB)) i++;
  while (end > i && (text.charCodeAt(end - 1) === SPACE || text.charCodeAt(end - 1) === TAB)) end--;
  if (i === end) return NaN;

  const separator = decimalComma ? COMMA : DOT;
  const start = i;
  let negative = false;
  let c = text.charCodeAt(i);
  if (c === MINUS || c === PLUS) {
    negative = c === MINUS;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  let seenSeparator = false;
  for (; i < end; i++) {
    c = text.charCodeAt(i);
    if (c >= ZERO && c <= NINE) {
      mantissa = mantissa * 10 + (c - ZERO);
      digits++;
      if (seenSeparator) fractionDigits++;
    } else if (c === separator && !seenSeparator) {
      seenSeparator = true;
    } else break;
  }
  if (digits === 0) return NaN;
  if (i === end) {
    if (digits <= 15) {
      const v = fractionDigits === 0 ? mantissa : mantissa / POW10[fractionDigits];
      return negative ? -v : v;
    }
    return slowPath(text, start, end, decimalComma);
  }
  // Only an exponent may follow the digits: e or E, optional sign, at least one digit.
  if (c !== LOWER_E && c !== UPPER_E) return NaN;
  i++;
  if (i < end && (text.charCodeAt(i) === PLUS || text.charCodeAt(i) === MINUS)) i++;
  if (i === end) return NaN;
  for (; i < end; i++) {
    c = text.charCodeAt(i);
    if (c < ZERO || c > NINE) return NaN;
  }
  return slowPath(text, start, end, decimalComma);
}

/** Already validated: Number() reads it exactly once the separator is a point. */
function slowPath(text: string, start: number, end: number, decimalComma: boolean): number {
  const body = text.slice(start, end);
  const v = Number(decimalComma ? body.replace(',', '.') : body);
  return Number.isFinite(v) ? v : NaN;
}
