/**
 * ISO 8601 instants as plant data systems export them: a calendar date, optionally a time of
 * day to the minute, second or fraction of a second (`T` or a space between), and optionally
 * `Z` or an offset (±HH, ±HHMM, ±HH:MM). Without an offset the caller decides the time zone;
 * this module reads such a naive instant as UTC, which the command line states in its help.
 * Week dates, ordinal dates and two-digit years are not accepted: they are rare in logs and
 * easy to misread.
 */
export type IsoInstant = { ok: true; ms: number; hasOffset: boolean } | { ok: false; reason: string };

const ISO =
  /^(\d{4})-(\d{2})-(\d{2})(?:[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?)?$/;

/** Looks like an attempt at an ISO date (starts with YYYY-MM-DD): used to choose the error message. */
export function looksLikeIsoDate(text: string): boolean {
  return /^\d{4}-\d{2}-\d{2}/.test(text.trim());
}

/** Milliseconds since 1970-01-01T00:00Z, or the reason the text is not a valid instant. */
export function parseIsoInstant(text: string): IsoInstant {
  const m = ISO.exec(text.trim());
  if (m === null) return { ok: false, reason: 'is not an ISO 8601 instant such as 2024-03-01T08:00:00Z' };
  const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const hour = m[4] === undefined ? 0 : Number(m[4]);
  const minute = m[5] === undefined ? 0 : Number(m[5]);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const fractionS = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  if (month < 1 || month > 12) return { ok: false, reason: `has month ${m[2]}; months run 01–12` };
  const days = daysInMonth(year, month);
  if (day < 1 || day > days) return { ok: false, reason: `has day ${m[3]}; ${m[1]}-${m[2]} has ${days} days` };
  if (hour > 23) return { ok: false, reason: `has hour ${m[4]}; hours run 00–23` };
  if (minute > 59) return { ok: false, reason: `has minute ${m[5]}; minutes run 00–59` };
  // A leap second (:60) cannot be placed on the uniform time axis the fit uses.
  if (second > 59) return { ok: false, reason: `has second ${m[6]}; seconds run 00–59` };

  let offsetMin = 0;
  const offset = m[8];
  if (offset !== undefined && offset.toUpperCase() !== 'Z') {
    const digits = offset.slice(1).replace(':', '');
    const oh = Number(digits.slice(0, 2));
    const om = digits.length > 2 ? Number(digits.slice(2)) : 0;
    if (oh > 23 || om > 59) return { ok: false, reason: `has offset ${offset}, which is not a valid UTC offset` };
    offsetMin = (offset[0] === '-' ? -1 : 1) * (oh * 60 + om);
  }
  // setUTCFullYear keeps years 0–99 literal (Date.UTC maps them to 1900–1999).
  const d = new Date(0);
  d.setUTCFullYear(year, month - 1, day);
  d.setUTCHours(hour, minute, second, 0);
  return { ok: true, ms: d.getTime() + fractionS * 1000 - offsetMin * 60_000, hasOffset: offset !== undefined };
}

function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}
