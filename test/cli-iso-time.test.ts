// ISO 8601 instants as the command line reads them. Check values: the instant arithmetic of
// ISO 8601 (local time = UTC + offset), evaluated with Date.UTC, which the ECMAScript
// specification (ECMA-262 §21.4.3.4) defines on the proleptic Gregorian calendar in UTC.
import { describe, it, expect } from 'vitest';
import { parseIsoInstant } from '../src/main/cli/iso-time.js';

const MONDAY = Date.UTC(2020, 0, 6); // 2020-01-06T00:00:00Z

function ms(text: string): number {
  const r = parseIsoInstant(text);
  if (!r.ok) throw new Error(`${text}: ${r.reason}`);
  return r.ms;
}

describe('parseIsoInstant', () => {
  it.each([
    ['2020-01-06T00:00:00Z', MONDAY],
    ['2020-01-06T00:00Z', MONDAY],
    ['2020-01-06t00:00:00z', MONDAY],
    ['2020-01-06T02:00:00+02:00', MONDAY], // 02:00 local at UTC+2 is 00:00 UTC
    ['2020-01-05T19:00-05:00', MONDAY], // 19:00 the day before at UTC−5
    ['2020-01-06T05:30+0530', MONDAY],
    ['2020-01-06T01:00+01', MONDAY],
    ['2020-01-06 00:00:00', MONDAY], // naive: read as UTC by this command
    ['2020-01-06', MONDAY],
    ['2020-01-06T00:00:00.250Z', MONDAY + 250],
    ['2020-01-06T00:00:00,5Z', MONDAY + 500], // ISO 8601 allows the comma as decimal sign
    ['2024-02-29T12:00Z', Date.UTC(2024, 1, 29, 12)], // 2024 is a leap year
    ['2000-02-29', Date.UTC(2000, 1, 29)], // divisible by 400: leap
  ])('%s', (text, expected) => {
    expect(ms(text)).toBe(expected);
  });

  it('keeps years below 100 literal', () => {
    // Date.UTC maps years 0–99 to 1900–1999; the ISO string form does not (ECMA-262 §21.4.1.32).
    expect(ms('0050-03-01')).toBe(new Date('0050-03-01T00:00:00Z').getTime());
  });

  it('says whether an offset was given', () => {
    expect(parseIsoInstant('2020-01-06T00:00Z')).toMatchObject({ ok: true, hasOffset: true });
    expect(parseIsoInstant('2020-01-06T00:00')).toMatchObject({ ok: true, hasOffset: false });
  });

  it.each([
    ['2023-02-29', /2023-02 has 28 days/], // 2023 is not a leap year
    ['1900-02-29', /has 28 days/], // divisible by 100, not by 400: not leap
    ['2020-13-01', /month 13/],
    ['2020-01-06T24:00Z', /hour 24/],
    ['2020-01-06T12:60Z', /minute 60/],
    ['2020-01-06T23:59:60Z', /second 60/],
    ['2020-01-06T00:00+25:00', /offset/],
    ['06/01/2020', /not an ISO 8601 instant/], // day-first or month-first: never guessed (DOMAIN.md §9)
    ['2020-1-6', /not an ISO 8601 instant/],
    ['yesterday', /not an ISO 8601 instant/],
  ])('rejects %s', (text, reason) => {
    const r = parseIsoInstant(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(reason);
  });
});
