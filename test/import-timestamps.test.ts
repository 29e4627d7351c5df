// Timestamps of a plant export. Expected instants are derived by hand in the comments from the
// zone rules of the IANA tz database (files `europe` and `northamerica`), which the runtime's ICU
// data carries: Europe/Berlin is CET (UTC+1) with EU summer time CEST (UTC+2) from the last Sunday
// of March, 01:00 UTC, to the last Sunday of October, 01:00 UTC (Rule EU); America/Denver is MST
// (UTC−7) with MDT (UTC−6) from the second Sunday of March, 02:00 local, to the first Sunday of
// November, 02:00 local (Rule US, since 2007). In 2024 those Sundays are 31 March and 27 October
// (2024-01-01 was a Monday; 31 March is day 91, (91 − 1) mod 7 = 6 days on: a Sunday; 27 October
// is day 301, (301 − 1) mod 7 = 6) and 10 March and 3 November (days 70 and 308, same check).
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/shared/errors.js';
import { collectDateOrderEvidence, dateOrderOf, TimestampReader } from '../src/shared/import/timestamps.js';
import { daysFromCivil, ZoneResolver } from '../src/shared/import/time-zone.js';
import type { DateOrder, SerialDates } from '../src/shared/import/types.js';
import { inputErrorOf, readCsvText, utc } from './import-helpers.js';

function reader(zone = 'UTC', dateOrder: DateOrder | null = null, serialDates: SerialDates = 'auto', decimalComma = false): TimestampReader {
  return new TimestampReader({ zone: new ZoneResolver(zone), dateOrder, serialDates, decimalComma, file: 'f.csv', field: 'time' });
}

function read(text: string, r = reader()): number | string {
  const ms = r.read(text, 2);
  return Number.isNaN(ms) ? r.reason : ms;
}

describe('ISO 8601', () => {
  it.each([
    ['2024-03-01T08:00:00Z', '2024-03-01T08:00:00Z'],
    ['2024-03-01t08:00:00z', '2024-03-01T08:00:00Z'],
    ['2024-03-01T08:00Z', '2024-03-01T08:00:00Z'],
    ['2024-03-01 08:00:00Z', '2024-03-01T08:00:00Z'],
    ['2024-03-01T08:00:00.250Z', '2024-03-01T08:00:00.250Z'],
    ['2024-03-01T08:00:00,5Z', '2024-03-01T08:00:00.500Z'],
    ['2024-03-01T08:00:00.123456789Z', '2024-03-01T08:00:00.123Z'], // nine digits, rounded to the millisecond
    ['2024-03-01T09:00:00+01:00', '2024-03-01T08:00:00Z'], // 09:00 at UTC+1 is 08:00 UTC
    ['2024-03-01T09:00:00+0100', '2024-03-01T08:00:00Z'],
    ['2024-03-01T09:00:00+01', '2024-03-01T08:00:00Z'],
    ['2024-03-01T01:30:00-06:30', '2024-03-01T08:00:00Z'], // 01:30 at UTC−6:30 is 08:00 UTC
    ['2024-03-01 09:00 +01:00', '2024-03-01T08:00:00Z'],
    ['  2024-03-01T08:00:00Z ', '2024-03-01T08:00:00Z'],
  ])('%s is %s', (text, iso) => {
    expect(read(text)).toBe(utc(iso));
  });

  it('a naive time and a date alone are local time in the zone (UTC here)', () => {
    const r = reader();
    expect(read('2024-03-01T08:00:00', r)).toBe(utc('2024-03-01T08:00:00Z'));
    expect(r.naive).toBe(true);
    expect(read('2024-03-01', r)).toBe(utc('2024-03-01T00:00:00Z'));
    expect(read('2024-03-01T08:00:00Z', r)).toBe(utc('2024-03-01T08:00:00Z'));
    expect(r.naive).toBe(false);
  });

  it.each([
    ['2024-13-01T00:00:00Z', 'has month 13'],
    ['2023-02-29T00:00:00Z', 'has day 29; February 2023 has 28 days'], // 2023 is not a leap year
    ['2024-04-31', 'has day 31; April 2024 has 30 days'],
    ['2024-03-01T24:00:00Z', 'has hour 24'],
    ['2024-03-01T08:60:00Z', 'has minute 60'],
    ['2016-12-31T23:59:60Z', 'has second 60'], // a leap second (IERS Bulletin C 52) has no place on the axis
    ['2024-03-01T08:00:00+25:00', 'has UTC offset +25:00, which does not exist'],
    ['1899-12-31T00:00:00Z', 'has year 1899'],
    ['2024-03-01T8:00:00Z', 'is not an ISO 8601 timestamp'],
    ['2024-03-01X08:00', 'is not an ISO 8601 timestamp'],
    ['2024-03-01T08:00:00Zjunk', 'is not an ISO 8601 timestamp'],
    ['yesterday', 'is not a timestamp'],
  ])('%s is rejected: %s', (text, reason) => {
    expect(read(text)).toContain(reason);
  });

  it('leap years follow the Gregorian rule (2000 yes, 1900 and 2100 no)', () => {
    expect(read('2000-02-29')).toBe(utc('2000-02-29T00:00:00Z'));
    expect(read('2100-02-29')).toContain('February 2100 has 28 days');
    // days_from_civil against the worked values: 1970-01-01 is day 0, 2000-03-01 is 11017 (30 years of 365 d + 7 leap days + 59 d).
    expect(daysFromCivil(1970, 1, 1)).toBe(0);
    expect(daysFromCivil(2000, 3, 1)).toBe(30 * 365 + 7 + 60);
  });
});

describe('naive times across daylight-saving changes (RFC 5545 §3.3.5 resolution)', () => {
  it.each([
    // Europe/Berlin, spring forward on 2024-03-31 at 01:00 UTC: 02:00 CET becomes 03:00 CEST.
    ['Europe/Berlin', '2024-03-31T01:59:00', '2024-03-31T00:59:00Z', 'unique'], // CET: 01:59 − 1 h
    ['Europe/Berlin', '2024-03-31T02:30:00', '2024-03-31T01:30:00Z', 'nonexistent'], // skipped; offset before the gap (+1 h): 02:30 − 1 h, shown as 03:30 CEST
    ['Europe/Berlin', '2024-03-31T03:00:00', '2024-03-31T01:00:00Z', 'unique'], // CEST: 03:00 − 2 h
    // Europe/Berlin, fall back on 2024-10-27 at 01:00 UTC: 03:00 CEST becomes 02:00 CET; 02:00–02:59 happens twice.
    ['Europe/Berlin', '2024-10-27T01:59:59', '2024-10-26T23:59:59Z', 'unique'], // CEST: 01:59:59 − 2 h
    ['Europe/Berlin', '2024-10-27T02:30:00', '2024-10-27T00:30:00Z', 'ambiguous'], // first occurrence, CEST: 02:30 − 2 h
    ['Europe/Berlin', '2024-10-27T03:00:00', '2024-10-27T02:00:00Z', 'unique'], // CET: 03:00 − 1 h
    ['Europe/Berlin', '2024-07-01T12:00:00', '2024-07-01T10:00:00Z', 'unique'], // summer, CEST
    ['Europe/Berlin', '2024-01-15T12:00:00', '2024-01-15T11:00:00Z', 'unique'], // winter, CET
    // America/Denver, spring forward on 2024-03-10 at 02:00 MST: 02:00–02:59 does not exist.
    ['America/Denver', '2024-03-10T01:59:00', '2024-03-10T08:59:00Z', 'unique'], // MST: 01:59 + 7 h
    ['America/Denver', '2024-03-10T02:30:00', '2024-03-10T09:30:00Z', 'nonexistent'], // offset before the gap (−7 h): 02:30 + 7 h = 03:30 MDT
    ['America/Denver', '2024-03-10T03:00:00', '2024-03-10T09:00:00Z', 'unique'], // MDT: 03:00 + 6 h
    // America/Denver, fall back on 2024-11-03 at 02:00 MDT: 01:00–01:59 happens twice.
    ['America/Denver', '2024-11-03T00:59:00', '2024-11-03T06:59:00Z', 'unique'], // MDT: 00:59 + 6 h
    ['America/Denver', '2024-11-03T01:30:00', '2024-11-03T07:30:00Z', 'ambiguous'], // first occurrence, MDT: 01:30 + 6 h
    ['America/Denver', '2024-11-03T02:00:00', '2024-11-03T09:00:00Z', 'unique'], // MST: 02:00 + 7 h
    // The two worked examples of RFC 5545 §3.3.5 itself (America/New_York, 2007).
    ['America/New_York', '2007-11-04T01:30:00', '2007-11-04T05:30:00Z', 'ambiguous'], // "1:30 A.M. EDT (UTC-04:00)"
    ['America/New_York', '2007-03-11T02:30:00', '2007-03-11T07:30:00Z', 'nonexistent'], // "3:30 A.M. EDT (UTC-04:00)"
  ])('%s %s is %s (%s)', (zone, local, expected, kind) => {
    const r = reader(zone);
    expect(read(local, r)).toBe(utc(expected));
    expect(r.localKind).toBe(kind);
  });

  it('every local minute of both 2024 change days in Berlin maps as the rules say', () => {
    // Independent check: walk UTC minutes and format them in the zone with Intl; each wall time that
    // appears must map back to its first UTC minute, and skipped wall times must move forward 1 h.
    const zone = new ZoneResolver('Europe/Berlin');
    const wall = new Intl.DateTimeFormat('sv-SE', { timeZone: 'Europe/Berlin', dateStyle: 'short', timeStyle: 'short' });
    const firstSeen = new Map<string, number>();
    for (const day of ['2024-03-30T12:00:00Z', '2024-10-26T12:00:00Z']) {
      for (let m = 0; m < 36 * 60; m++) {
        const t = utc(day) + m * 60_000;
        const key = wall.format(t).replace(' ', 'T');
        if (!firstSeen.has(key)) firstSeen.set(key, t);
      }
    }
    for (const [key, t] of firstSeen) {
      expect(zone.toUtcMs(Date.parse(`${key}:00Z`))).toBe(t);
    }
    expect(firstSeen.has('2024-03-31T02:30')).toBe(false); // skipped in spring
    expect(zone.toUtcMs(Date.parse('2024-03-31T02:30:00Z'))).toBe(utc('2024-03-31T01:30:00Z'));
  });

  it('an unknown zone is an InputError naming the option', () => {
    expect(() => new ZoneResolver('Mars/Olympus_Mons')).toThrow(InputError);
    try {
      new ZoneResolver('Mars/Olympus_Mons');
    } catch (err) {
      expect((err as InputError).where.field).toBe('timeZone');
    }
  });

  it('a file of naive times reads them in the field zone and counts the clock-change cases', async () => {
    const csv = 'time,well,temp\n2024-10-27T02:30:00,A,150\n2024-03-31T02:30:00,A,150\n2024-07-01T12:00:00,A,150\n2024-07-01T12:00:00Z,B,150\n';
    const r = await readCsvText(csv, { timeZone: 'Europe/Berlin' });
    expect(r.readings.map((x) => x.timeMs)).toEqual([
      utc('2024-10-27T00:30:00Z'), utc('2024-03-31T01:30:00Z'), utc('2024-07-01T10:00:00Z'), utc('2024-07-01T12:00:00Z'),
    ]);
    expect(r.counts).toMatchObject({ naiveTimestamps: 3, ambiguousLocalTimes: 1, nonexistentLocalTimes: 1 });
    expect(r.info.timeZone).toBe('Europe/Berlin');
    expect(r.info.assumptions.join(' ')).toContain('RFC 5545');
  });

  it('a time header annotated (UTC) reads naive times as UTC whatever the field zone', async () => {
    const r = await readCsvText('Time (UTC),well,temp\n2024-07-01 12:00,A,150\n', { timeZone: 'Europe/Berlin' });
    expect(r.readings[0].timeMs).toBe(utc('2024-07-01T12:00:00Z'));
    expect(r.info).toMatchObject({ timeZone: 'UTC', timeZoneSource: 'header' });
  });

  it('any other time annotation is not taken for a zone, and the assumptions say so', async () => {
    const r = await readCsvText('Time (CET),well,temp\n2024-07-01 12:00,A,150\n', { timeZone: 'Europe/Berlin' });
    expect(r.readings[0].timeMs).toBe(utc('2024-07-01T10:00:00Z')); // CEST in July: 12:00 − 2 h
    expect(r.info.assumptions.join(' ')).toContain('says "CET", which is not read as a time zone');
  });
});

describe('numeric dates: read only in the stated order', () => {
  it.each([
    ['dmy', '03/04/2024', '2024-04-03T00:00:00Z'],
    ['mdy', '03/04/2024', '2024-03-04T00:00:00Z'],
    ['dmy', '3.4.2024', '2024-04-03T00:00:00Z'],
    ['dmy', '03-04-2024 14:30', '2024-04-03T14:30:00Z'],
    ['dmy', '25/04/2024 14:30:15', '2024-04-25T14:30:15Z'],
    ['mdy', '4/25/2024 2:30 PM', '2024-04-25T14:30:00Z'],
    ['mdy', '4/25/2024 12:05 AM', '2024-04-25T00:05:00Z'], // 12 AM is midnight (12-hour clock, common practice)
    ['mdy', '4/25/2024 12:05 PM', '2024-04-25T12:05:00Z'],
    ['ymd', '2024/04/25', '2024-04-25T00:00:00Z'],
    ['ymd', '2024.4.5 07:00', '2024-04-05T07:00:00Z'],
  ] as const)('%s: %s is %s', (order, text, iso) => {
    expect(read(text, reader('UTC', order))).toBe(utc(iso));
  });

  it.each([
    ['dmy', '13/13/2024', 'has month 13'],
    ['mdy', '25/04/2024', 'has month 25'],
    ['dmy', '31/04/2024', 'April 2024 has 30 days'],
    ['dmy', '03/04/24', 'two-digit year'],
    ['dmy', '2024/04/03', 'does not match the stated date order dmy'],
    ['ymd', '03/04/2024', 'does not match the stated date order ymd'],
    ['mdy', '4/25/2024 13:00 PM', 'a 12-hour clock runs 1–12'],
  ] as const)('%s: %s is rejected (%s)', (order, text, reason) => {
    expect(read(text, reader('UTC', order))).toContain(reason);
  });

  it('classifies what a value proves about the order', () => {
    expect(dateOrderOf('25/04/2024')).toBe('dmy');
    expect(dateOrderOf('04/25/2024')).toBe('mdy');
    expect(dateOrderOf('2024/04/25')).toBe('ymd');
    expect(dateOrderOf('03/04/2024')).toBe('ambiguous');
    expect(dateOrderOf('2024-04-25T00:00Z')).toBe(null);
    expect(collectDateOrderEvidence([{ line: 2, text: '03/04/2024' }, { line: 3, text: '25/04/2024' }])).toEqual({ dmy: { line: 3, text: '25/04/2024' } });
  });

  it('an ambiguous date without a stated order stops the import, naming file, line and field', async () => {
    const err = await inputErrorOf('time,well,temp\n2024-01-01T00:00Z,A,150\n03/04/2024,A,151\n');
    expect(err.where).toMatchObject({ line: 3, field: 'time' });
    expect(err.where.file).toMatch(/export\.csv$/);
    expect(err.reason).toContain('"03/04/2024" could be 3 April 2024 (day first) or March 4, 2024 (month first)');
    expect(err.reason).toContain('--date-order');
  });

  it('the message names the order the file appears to use, from values elsewhere in the file', async () => {
    const err = await inputErrorOf('time,well,temp\n03/04/2024,A,150\n25/04/2024,A,151\n');
    expect(err.where.line).toBe(2);
    expect(err.reason).toContain('the file appears to use dmy (day/month/year) (line 3: "25/04/2024")');
    expect(err.reason).toContain('--date-order dmy');
  });

  it('even an unambiguous date is not guessed: the import stops and says which order it proves', async () => {
    const err = await inputErrorOf('time,well,temp\n04/25/2024 14:00,A,150\n');
    expect(err.where.line).toBe(2);
    expect(err.reason).toContain('read only when the order of its parts is stated');
    expect(err.reason).toContain('appears to use mdy');
  });

  it('a file that mixes proofs of both orders says so', async () => {
    const err = await inputErrorOf('time,well,temp\n25/04/2024,A,150\n04/26/2024,A,151\n');
    expect(err.reason).toContain('the file mixes dmy');
    expect(err.reason).toContain('mdy');
  });

  it('with the order stated the same file reads', async () => {
    const r = await readCsvText('time,well,temp\n03/04/2024,A,150\n25/04/2024,A,151\n', { dateOrder: 'dmy' });
    expect(r.readings.map((x) => x.timeMs)).toEqual([utc('2024-04-03T00:00:00Z'), utc('2024-04-25T00:00:00Z')]);
  });
});

describe('spreadsheet serial dates', () => {
  // The 1900 date system counts days from 1899-12-31 as day 1 and includes the nonexistent 1900-02-29 as
  // day 60, so from day 61 (1900-03-01) on, serial = days since 1899-12-30; the 1904 system counts from
  // 1904-01-01 = day 0, 1462 days later (common practice: spreadsheet programs document both systems).
  it.each([
    // 45292 − 25569 (the serial of 1970-01-01) = 19723 days = 54 years of 365 d + 13 leap days (1972–2020): 2024-01-01; 0.375 d = 9 h.
    ['auto', '45292.375', '2024-01-01T09:00:00Z'],
    ['auto', '25569', '1970-01-01T00:00:00Z'],
    ['1900', '45292.375', '2024-01-01T09:00:00Z'],
    ['1900', '61', '1900-03-01T00:00:00Z'], // first day after the fictitious 29 February
    ['1900', '59', '1900-02-28T00:00:00Z'], // day 59 counted from 1899-12-31
    ['1900', '1', '1900-01-01T00:00:00Z'],
    ['1900', '45292.33333', '2024-01-01T08:00:00Z'], // 0.33333 d = 28 799.7 s, rounded to the second
    ['1904', '43830.375', '2024-01-01T09:00:00Z'], // 45292 − 1462
    ['1904', '0', '1904-01-01T00:00:00Z'],
  ] as const)('%s: %s is %s', (mode, text, iso) => {
    expect(read(text, reader('UTC', null, mode))).toBe(utc(iso));
  });

  it.each([
    ['1900', '60', 'fictitious 1900-02-29'],
    ['1900', '0.5', 'a time of day without a date'],
    ['auto', '25568.5', 'outside 25569–73051'],
    ['auto', '1704067200', 'outside 25569–73051'], // Unix seconds are not serial days
    ['off', '45292.375', 'serial dates is off'],
  ] as const)('%s: %s is rejected (%s)', (mode, text, reason) => {
    expect(read(text, reader('UTC', null, mode))).toContain(reason);
  });

  it('a serial with a decimal comma, and serials as local times in the field zone', async () => {
    const r = await readCsvText('Datum;Bohrung;Temp\n45292,375;GT-1;150,5\n', { timeZone: 'Europe/Berlin', columns: { time: 'Datum', well: 'Bohrung' } });
    // 2024-01-01 09:00 in Berlin is CET (UTC+1): 08:00 UTC.
    expect(r.readings[0]).toMatchObject({ timeMs: utc('2024-01-01T08:00:00Z'), productionTemperatureC: 150.5 });
  });
});

describe('repeated texts', () => {
  it('the same text read twice gives the same instant and state', () => {
    const r = reader('Europe/Berlin');
    expect(read('2024-10-27T02:30:00', r)).toBe(utc('2024-10-27T00:30:00Z'));
    expect(read('2024-10-27T02:30:00', r)).toBe(utc('2024-10-27T00:30:00Z'));
    expect(r.localKind).toBe('ambiguous');
    expect(read('bad', r)).toContain('not a timestamp');
    expect(read('2024-10-27T02:30:00', r)).toBe(utc('2024-10-27T00:30:00Z'));
  });

  it('the date-order error is thrown as an InputError, not returned', () => {
    expect(() => reader().read('03/04/2024', 7)).toThrow(InputError);
  });
});
