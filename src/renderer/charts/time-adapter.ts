/**
 * chart.js's date adapter, written on Intl so that a time axis shows instants in the display zone
 * (settings) rather than the browser's, with no date library. chart.js asks the adapter to parse,
 * format, add and diff instants and to find the start/end of a unit; all in epoch milliseconds.
 *
 * Start-of-unit for days and above is computed in the display zone: the wall-clock fields of the
 * instant are read with Intl, truncated, and turned back into an instant by correcting with the
 * zone's offset at that point (one correction pass suffices away from DST changes at midnight,
 * which no IANA zone in use has at the hour boundaries this needs).
 */
import { _adapters, type TimeUnit } from 'chart.js';

const MS: Record<TimeUnit, number> = {
  millisecond: 1, second: 1000, minute: 60_000, hour: 3_600_000, day: 86_400_000, week: 604_800_000,
  month: 2_629_800_000, quarter: 7_889_400_000, year: 31_557_600_000,
};

let zone = 'UTC';
const partsCache = new Map<string, Intl.DateTimeFormat>();

function partsFormat(timeZone: string): Intl.DateTimeFormat {
  let f = partsCache.get(timeZone);
  if (f === undefined) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', second: 'numeric' });
    partsCache.set(timeZone, f);
  }
  return f;
}

interface Wall { year: number; month: number; day: number; hour: number; minute: number; second: number }

function wall(ms: number): Wall {
  const out: Record<string, number> = {};
  for (const p of partsFormat(zone).formatToParts(ms)) if (p.type !== 'literal') out[p.type] = Number(p.value);
  return { year: out.year, month: out.month, day: out.day, hour: out.hour % 24, minute: out.minute, second: out.second };
}

/** The instant whose wall clock in the zone is `w`. */
function fromWall(w: Wall): number {
  const guess = Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
  const seen = wall(guess);
  const offset = Date.UTC(seen.year, seen.month - 1, seen.day, seen.hour, seen.minute, seen.second) - guess;
  return guess - offset;
}

const formats = new Map<string, Intl.DateTimeFormat>();
const FORMAT_OPTIONS: Record<string, Intl.DateTimeFormatOptions> = {
  datetime: { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' },
  millisecond: { hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' },
  second: { hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' },
  minute: { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' },
  hour: { month: 'short', day: 'numeric', hour: '2-digit', hourCycle: 'h23' },
  day: { month: 'short', day: 'numeric' },
  week: { year: 'numeric', month: 'short', day: 'numeric' },
  month: { year: 'numeric', month: 'short' },
  quarter: { year: 'numeric', month: 'short' },
  year: { year: 'numeric' },
};

function format(ms: number, key: string): string {
  const id = `${zone}|${key}`;
  let f = formats.get(id);
  if (f === undefined) {
    f = new Intl.DateTimeFormat('en-GB', { timeZone: zone, ...(FORMAT_OPTIONS[key] ?? FORMAT_OPTIONS.datetime) });
    formats.set(id, f);
  }
  return f.format(ms);
}

function startOf(ms: number, unit: TimeUnit | 'isoWeek', weekday?: number): number {
  if (unit === 'millisecond') return ms;
  if (unit === 'second' || unit === 'minute' || unit === 'hour') return ms - (ms % MS[unit]);
  const w = wall(ms);
  switch (unit) {
    case 'day': return fromWall({ ...w, hour: 0, minute: 0, second: 0 });
    case 'week':
    case 'isoWeek': {
      const day0 = fromWall({ ...w, hour: 0, minute: 0, second: 0 });
      const dow = new Date(Date.UTC(w.year, w.month - 1, w.day)).getUTCDay();
      const first = unit === 'isoWeek' ? (weekday ?? 1) % 7 : 0;
      const back = (dow - first + 7) % 7;
      return fromWall({ ...wall(day0 - back * MS.day + MS.hour * 12), hour: 0, minute: 0, second: 0 });
    }
    case 'month': return fromWall({ ...w, day: 1, hour: 0, minute: 0, second: 0 });
    case 'quarter': return fromWall({ ...w, month: w.month - ((w.month - 1) % 3), day: 1, hour: 0, minute: 0, second: 0 });
    case 'year': return fromWall({ ...w, month: 1, day: 1, hour: 0, minute: 0, second: 0 });
  }
}

function add(ms: number, amount: number, unit: TimeUnit): number {
  if (unit === 'month' || unit === 'quarter' || unit === 'year') {
    const months = unit === 'month' ? amount : unit === 'quarter' ? 3 * amount : 12 * amount;
    const w = wall(ms);
    const total = w.year * 12 + (w.month - 1) + Math.trunc(months);
    return fromWall({ ...w, year: Math.floor(total / 12), month: (total % 12) + 1 });
  }
  return ms + amount * MS[unit];
}

/** Shows every chart's time axis in `timeZone` from now on (charts drawn later, or updated). */
export function setChartTimeZone(timeZone: string): void {
  zone = timeZone;
}

export function installTimeAdapter(): void {
  _adapters._date.override({
    formats: () => Object.fromEntries(Object.keys(FORMAT_OPTIONS).map((k) => [k, k])) as Record<TimeUnit | 'datetime', string>,
    parse: (value: unknown) => {
      if (value === null || value === undefined) return null;
      if (typeof value === 'number') return Number.isFinite(value) ? value : null;
      if (value instanceof Date) return value.getTime();
      if (typeof value === 'string') {
        const ms = Date.parse(value);
        return Number.isFinite(ms) ? ms : null;
      }
      return null;
    },
    format: (time: number, fmt: string) => format(time, fmt),
    add: (time: number, amount: number, unit: TimeUnit) => add(time, amount, unit),
    diff: (max: number, min: number, unit: TimeUnit) => (max - min) / MS[unit],
    startOf: (time: number, unit: TimeUnit | 'isoWeek', weekday?: number) => startOf(time, unit, weekday),
    endOf: (time: number, unit: TimeUnit | 'isoWeek') => add(startOf(time, unit), 1, unit === 'isoWeek' ? 'week' : unit) - 1,
  });
}
