/**
 * Local wall-clock time in an IANA time zone → UTC, using the zone rules of the runtime's
 * Intl.DateTimeFormat (the IANA tz database as bundled with ICU). Local times are passed as
 * "wall milliseconds": the epoch milliseconds the same calendar date and clock time would have
 * in UTC, so that the zone offset is simply wall − utc.
 *
 * Clock changes are resolved as RFC 5545 (iCalendar) §3.3.5 specifies for a DATE-TIME with a
 * time-zone reference:
 * - a local time that occurs twice (clocks set back) is the FIRST occurrence, still on the
 *   offset in force before the change (e.g. 02:30 on the last Sunday of October in Berlin is
 *   02:30 CEST, 00:30 UTC);
 * - a local time that does not occur (clocks set forward) is read with the offset in force
 *   BEFORE the gap, which lands it as far past the gap as it was into it (02:30 on the last
 *   Sunday of March in Berlin is 01:30 UTC, shown as 03:30 CEST).
 * Both are counted so that the import record can say how many readings were resolved this way.
 *
 * Speed: Intl is slow (microseconds a call), so offsets are cached per local calendar day. A day is
 * "plain" when the offset is the same one day before and two days after it (and at its middle);
 * every time on a plain day maps with that offset. Days near a transition take the exact path,
 * three Intl calls a value. The cache grows with the number of distinct days, not rows.
 */
import { InputError } from '../errors.js';

const DAY_MS = 86_400_000;
/** Marks a cached day that holds (or neighbours) a clock change: resolve each time exactly. */
const NEAR_TRANSITION = NaN;
/** Zone names that mean UTC itself (upper-cased). */
const UTC_NAMES = new Set(['UTC', 'ETC/UTC', 'GMT', 'ETC/GMT', 'ZULU', 'ETC/ZULU', 'UCT', 'ETC/UCT', 'UNIVERSAL', 'ETC/UNIVERSAL']);

export type LocalTimeKind = 'unique' | 'ambiguous' | 'nonexistent';

export class ZoneResolver {
  readonly zone: string;
  /** How the last toUtcMs() call resolved its time. */
  lastKind: LocalTimeKind = 'unique';
  private readonly fixedOffsetMs: number | null;
  private readonly format: Intl.DateTimeFormat | null;
  private readonly dayOffsets = new Map<number, number>();
  private lastDay = NaN;
  private lastDayOffset = NaN;

  /** Throws an InputError naming `field` when `zone` is not a time zone the runtime knows. */
  constructor(zone: string, field = 'timeZone') {
    // UTC needs no zone rules; building an Intl formatter costs milliseconds (it loads the ICU zone data).
    if (UTC_NAMES.has(zone.toUpperCase())) {
      this.zone = 'UTC';
      this.fixedOffsetMs = 0;
      this.format = null;
      return;
    }
    let format: Intl.DateTimeFormat;
    try {
      format = new Intl.DateTimeFormat('en-US', {
        timeZone: zone,
        hourCycle: 'h23',
        year: 'numeric',
        month: 'numeric',
        day: 'numeric',
        hour: 'numeric',
        minute: 'numeric',
        second: 'numeric',
        era: 'short',
      });
    } catch {
      throw new InputError(`unknown time zone "${zone}"; give an IANA zone name such as Europe/Berlin or America/Denver`, { field });
    }
    this.zone = format.resolvedOptions().timeZone;
    const utc = UTC_NAMES.has(this.zone.toUpperCase());
    this.fixedOffsetMs = utc ? 0 : null;
    this.format = utc ? null : format;
  }

  /** UTC epoch milliseconds of the local time `wallMs` (see the module comment for clock changes). */
  toUtcMs(wallMs: number): number {
    if (this.fixedOffsetMs !== null) {
      this.lastKind = 'unique';
      return wallMs - this.fixedOffsetMs;
    }
    const day = Math.floor(wallMs / DAY_MS);
    let offset: number;
    if (day === this.lastDay) offset = this.lastDayOffset;
    else {
      const cached = this.dayOffsets.get(day);
      offset = cached === undefined ? this.classifyDay(day) : cached;
      this.lastDay = day;
      this.lastDayOffset = offset;
    }
    if (offset === offset) {
      // Not NaN: a plain day.
      this.lastKind = 'unique';
      return wallMs - offset;
    }
    return this.resolveExactly(wallMs);
  }

  /** Offset (wall − utc) in force at the instant `utcMs`, in milliseconds. */
  offsetAtMs(utcMs: number): number {
    if (this.fixedOffsetMs !== null) return this.fixedOffsetMs;
    const format = this.format as Intl.DateTimeFormat;
    const wholeSecondMs = utcMs - mod(utcMs, 1000);
    let year = 0, month = 0, day = 0, hour = 0, minute = 0, second = 0;
    let bc = false;
    for (const part of format.formatToParts(wholeSecondMs)) {
      switch (part.type) {
        case 'year': year = Number(part.value); break;
        case 'month': month = Number(part.value); break;
        case 'day': day = Number(part.value); break;
        case 'hour': hour = Number(part.value); break;
        case 'minute': minute = Number(part.value); break;
        case 'second': second = Number(part.value); break;
        case 'era': bc = part.value === 'BC' || part.value === 'B'; break;
        default: break;
      }
    }
    if (bc) year = 1 - year;
    return wallMsOf(year, month, day, hour, minute, second) - wholeSecondMs;
  }

  private classifyDay(day: number): number {
    const start = day * DAY_MS;
    const before = this.offsetAtMs(start - DAY_MS);
    const after = this.offsetAtMs(start + 2 * DAY_MS);
    const middle = this.offsetAtMs(start + DAY_MS / 2 - before);
    const offset = before === after && before === middle ? before : NEAR_TRANSITION;
    this.dayOffsets.set(day, offset);
    return offset;
  }

  /**
   * The candidates are the wall time minus the offsets a day before and a day after it; a
   * candidate is a real instant when the zone shows that wall time at it. Two real: the first
   * occurrence; none: a gap, read with the offset before it (RFC 5545 §3.3.5).
   */
  private resolveExactly(wallMs: number): number {
    const early = this.offsetAtMs(wallMs - DAY_MS);
    const late = this.offsetAtMs(wallMs + DAY_MS);
    const first = wallMs - early;
    const second = wallMs - late;
    const firstReal = this.offsetAtMs(first) === early;
    const secondReal = early !== late && this.offsetAtMs(second) === late;
    if (firstReal && secondReal) {
      this.lastKind = 'ambiguous';
      return Math.min(first, second);
    }
    if (firstReal || secondReal) {
      this.lastKind = 'unique';
      return firstReal ? first : second;
    }
    this.lastKind = 'nonexistent';
    return first;
  }
}

function mod(a: number, n: number): number {
  return ((a % n) + n) % n;
}

/**
 * Days from 1970-01-01 of a proleptic Gregorian date (H. Hinnant, "chrono-Compatible Low-Level
 * Date Algorithms", days_from_civil), integer arithmetic only: no Date object per row.
 */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = month > 2 ? month - 3 : month + 9;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Wall milliseconds of a calendar date and clock time (no zone applied). */
export function wallMsOf(year: number, month: number, day: number, hour: number, minute: number, second: number): number {
  return daysFromCivil(year, month, day) * DAY_MS + ((hour * 60 + minute) * 60 + second) * 1000;
}

/** Days in a month of the proleptic Gregorian calendar. */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}
