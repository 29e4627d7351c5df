/**
 * Spikes: a production temperature far from its neighbours in the same well is imported and
 * flagged 'spike' (kept in the log, left out of fits), never rejected — the user decides.
 *
 * The test is a Hampel identifier (Hampel, J. Amer. Statist. Assoc. 69 (1974) 383–393; as a moving
 * window filter: Pearson, IEEE Trans. Control Syst. Technol. 10 (2002) 55–63) over up to 3 readings
 * either side in time, applied to each side: a reading T is a spike when, for each side that has
 * neighbours, |T − median of that side| > max(5 K, 6 × 1.4826 × MAD), at least 3 neighbours in all.
 * MAD is the median of the neighbours' absolute deviations from their own side's median; 1.4826 =
 * 1/Φ⁻¹(3/4) makes it estimate a normal standard deviation. On a smooth series both side medians are
 * the window's median and this is the textbook filter. Judging each side on its own is our choice, so
 * that a step change (a new flow rate) never flags the last reading before it or the first after it,
 * even where the window holds more readings on one side of the step (the start of a file). Six
 * spreads (twice the usual three) keep sensor noise and the slow decline from being flagged; the 5 K
 * floor keeps a very smooth series from flagging a 1 K wobble.
 *
 * Only producing readings with a production temperature take part, as candidates or neighbours:
 * shut-in and test temperatures follow another regime, and readings already flagged bad or spike are
 * known outliers. A reading with fewer than 3 neighbours is not judged. Neighbours are the stored
 * readings of the well, the import's own and earlier ones alike, so a file that continues a log is
 * judged against the log.
 *
 * Cost: the import feeds each well's readings through a 7-reading window as it stores them (the
 * file is read once; nothing is read back), which is valid when the file lists each well in time
 * order and the log holds no other reading inside the file's span of that well — checked at the end
 * with one count on the (well, time) index. A well that fails the check (an unsorted file, a file
 * that interleaves with stored readings) is judged again from the log, read in pages along the
 * index, which costs about 1.7 µs per reading.
 *
 *   isSpike(valueC, beforeC, afterC): boolean        the 3 nearest of each are used
 *   isSpikeAmong(valueC, values, nBefore, nAfter)    the same, allocation-free
 *   class SpikeWindow(onSpike)   push(id, valueC, candidate) in time order, then end()
 *   class ImportSpikes(db, importId)
 *     row(wellId, timeMs, id, valueC, takesPart, candidate)   every stored or matched row of a production well, in file order
 *     finish(spans: ImportedSpan[]): number                   flags the import's spikes (caller's transaction); how many
 *   flagSpansFromLog(db, importId, spans): number              the judgement from the log alone
 */
import type Database from 'better-sqlite3';
import { FIT_EXCLUDING_FLAGS } from '../../shared/contract/reading-rules.js';

export const SPIKE_HALF_WINDOW = 3;
export const SPIKE_MIN_NEIGHBOURS = 3;
export const SPIKE_FLOOR_K = 5;
export const SPIKE_MAD_MULTIPLE = 6;
/** 1/Φ⁻¹(0.75): the MAD of a normal sample times this estimates its standard deviation. */
const MAD_TO_SIGMA = 1.4826;
export const SPIKE_RULE_TEXT =
  `a producing reading is flagged 'spike' when its production temperature lies more than max(${SPIKE_FLOOR_K} K, `
  + `${SPIKE_MAD_MULTIPLE} × 1.4826 × MAD) from the median of the ${SPIKE_HALF_WINDOW} producing readings before it and from that of the `
  + `${SPIKE_HALF_WINDOW} after it in the same well (at least ${SPIKE_MIN_NEIGHBOURS} neighbours in all; Hampel identifier on each side)`;

/** Sorts a[0..n) in place; n ≤ 6, where insertion sort beats anything cleverer. */
function sortSmall(a: Float64Array, n: number): void {
  for (let i = 1; i < n; i++) {
    const v = a[i];
    let j = i - 1;
    for (; j >= 0 && a[j] > v; j--) a[j + 1] = a[j];
    a[j + 1] = v;
  }
}

function medianOfSorted(a: Float64Array, n: number): number {
  const m = n >> 1;
  return n % 2 === 1 ? a[m] : (a[m - 1] + a[m]) / 2;
}

const sideBuffer = new Float64Array(SPIKE_HALF_WINDOW);
const deviations = new Float64Array(2 * SPIKE_HALF_WINDOW);

/** Sorts one side into sideBuffer, appends its deviations from its median at `at`; returns the median. */
function side(values: ArrayLike<number>, from: number, n: number, at: number): number {
  for (let i = 0; i < n; i++) sideBuffer[i] = values[from + i];
  sortSmall(sideBuffer, n);
  const m = medianOfSorted(sideBuffer, n);
  for (let i = 0; i < n; i++) deviations[at + i] = Math.abs(sideBuffer[i] - m);
  return m;
}

/** The test on one reading; `values` holds `nBefore` neighbours before it, then `nAfter` after it (each ≤ 3). */
export function isSpikeAmong(valueC: number, values: ArrayLike<number>, nBefore: number, nAfter: number): boolean {
  if (nBefore + nAfter < SPIKE_MIN_NEIGHBOURS) return false;
  const mBefore = nBefore > 0 ? side(values, 0, nBefore, 0) : NaN;
  const mAfter = nAfter > 0 ? side(values, nBefore, nAfter, nBefore) : NaN;
  // The threshold is never below the floor: a side median that close settles it without the MAD.
  if (Math.abs(valueC - mBefore) <= SPIKE_FLOOR_K || Math.abs(valueC - mAfter) <= SPIKE_FLOOR_K) return false;
  sortSmall(deviations, nBefore + nAfter);
  const threshold = Math.max(SPIKE_FLOOR_K, SPIKE_MAD_MULTIPLE * MAD_TO_SIGMA * medianOfSorted(deviations, nBefore + nAfter));
  return (nBefore === 0 || Math.abs(valueC - mBefore) > threshold) && (nAfter === 0 || Math.abs(valueC - mAfter) > threshold);
}

export function isSpike(valueC: number, beforeC: readonly number[], afterC: readonly number[]): boolean {
  const before = beforeC.slice(-SPIKE_HALF_WINDOW);
  const after = afterC.slice(0, SPIKE_HALF_WINDOW);
  return isSpikeAmong(valueC, [...before, ...after], before.length, after.length);
}

const WINDOW = 2 * SPIKE_HALF_WINDOW + 1;

/**
 * A sliding window of 2·3 + 1 readings over one well in time order: each candidate is judged once
 * the 3 readings after it have arrived (or the well has ended). Memory is the window, however long
 * the well: a ring of 7.
 */
export class SpikeWindow {
  private readonly ids = new Float64Array(WINDOW);
  private readonly values = new Float64Array(WINDOW);
  private readonly candidates = new Uint8Array(WINDOW);
  private readonly neighbours = new Float64Array(WINDOW - 1);
  /** Readings pushed so far, and the position (in that count) of the next one to judge. */
  private pushed = 0;
  private next = 0;

  constructor(private readonly onSpike: (id: number) => void) {}

  push(id: number, valueC: number, candidate: boolean): void {
    const at = this.pushed % WINDOW;
    this.ids[at] = id;
    this.values[at] = valueC;
    this.candidates[at] = candidate ? 1 : 0;
    this.pushed++;
    if (this.pushed - this.next > SPIKE_HALF_WINDOW) this.judge();
  }

  end(): void {
    while (this.next < this.pushed) this.judge();
  }

  private judge(): void {
    const i = this.next++;
    const at = i % WINDOW;
    if (this.candidates[at] === 0) return;
    let n = 0;
    const from = Math.max(0, i - SPIKE_HALF_WINDOW);
    const to = Math.min(this.pushed, i + SPIKE_HALF_WINDOW + 1);
    for (let j = from; j < to; j++) if (j !== i) this.neighbours[n++] = this.values[j % WINDOW];
    if (isSpikeAmong(this.values[at], this.neighbours, i - from, to - i - 1)) this.onSpike(this.ids[at]);
  }
}

/** The time span of one production well's readings stored by this import. */
export interface ImportedSpan {
  wellId: number;
  fromMs: number;
  toMs: number;
}

const PAGE_ROWS = 4096;
/** Readings that take part: producing, with a production temperature, not flagged bad or spike. */
const TAKES_PART =
  `deleted_ms IS NULL AND status = 'producing' AND production_temperature_c IS NOT NULL AND `
  + FIT_EXCLUDING_FLAGS.map((f) => `instr(',' || flags || ',', ',${f},') = 0`).join(' AND ');
const COLUMNS = 'id, time_ms, production_temperature_c, import_id';

type Row = [id: number, timeMs: number, valueC: number, importId: number | null];

/** Whether a stored reading's status and flags let it take part, as TAKES_PART says in SQL. */
export function takesPart(status: string, flags: string): boolean {
  if (status !== 'producing') return false;
  if (flags === '') return true;
  const list = flags.split(',');
  return !FIT_EXCLUDING_FLAGS.some((f) => list.includes(f));
}

class SpikeStatements {
  readonly before: Database.Statement<[number, number, number]>;
  readonly after: Database.Statement<[number, number, number]>;
  readonly page: Database.Statement<[number, number, number]>;
  readonly live: Database.Statement<[number, number, number], { n: number }>;
  readonly flag: Database.Statement<[number]>;

  constructor(db: Database.Database) {
    this.before = db.prepare<[number, number, number]>(
      `SELECT ${COLUMNS} FROM readings WHERE well_id = ? AND time_ms < ? AND ${TAKES_PART} ORDER BY time_ms DESC LIMIT ?`,
    ).raw();
    this.after = db.prepare<[number, number, number]>(
      `SELECT ${COLUMNS} FROM readings WHERE well_id = ? AND time_ms > ? AND ${TAKES_PART} ORDER BY time_ms LIMIT ?`,
    ).raw();
    this.page = db.prepare<[number, number, number]>(
      `SELECT ${COLUMNS} FROM readings WHERE well_id = ? AND time_ms > ? AND time_ms <= ? AND ${TAKES_PART} ORDER BY time_ms LIMIT ${PAGE_ROWS}`,
    ).raw();
    this.live = db.prepare('SELECT count(*) AS n FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ? AND deleted_ms IS NULL');
    this.flag = db.prepare(`UPDATE readings SET flags = CASE WHEN flags = '' THEN 'spike' ELSE flags || ',spike' END WHERE id = ?`);
  }

  beforeRows(wellId: number, timeMs: number): Row[] {
    return (this.before.all(wellId, timeMs, SPIKE_HALF_WINDOW) as Row[]).reverse();
  }

  afterRows(wellId: number, timeMs: number): Row[] {
    return this.after.all(wellId, timeMs, SPIKE_HALF_WINDOW) as Row[];
  }
}

/** One well's stream of rows during an import. */
interface WellStream {
  window: SpikeWindow | null;
  /** Spikes flagged so far (at once, while the reading's page is still in the cache). */
  flagged: number;
  firstMs: number;
  lastMs: number;
  /** Rows that moved to a later instant: each is one distinct live reading of the span. */
  instants: number;
}

/** Spikes of one import, judged while it stores the rows; see the module comment. */
export class ImportSpikes {
  private readonly sql: SpikeStatements;
  private readonly wells = new Map<number, WellStream>();
  private readonly unflag: Database.Statement<[number, number]>;

  constructor(private readonly db: Database.Database, private readonly importId: number) {
    this.sql = new SpikeStatements(db);
    // Only this import's readings, which it stored with no flags: 'spike' is the one it can have set.
    this.unflag = db.prepare(`UPDATE readings SET flags = '' WHERE import_id = ? AND well_id = ? AND flags = 'spike'`);
  }

  /**
   * A row of a production well that the import stored (`candidate`) or found stored (a duplicate or
   * conflict: then `id` and `valueC` are the stored reading's). Rows come in file order.
   */
  row(wellId: number, timeMs: number, id: number, valueC: number, takesPart: boolean, candidate: boolean): void {
    let s = this.wells.get(wellId);
    if (s === undefined) {
      const stream: WellStream = { window: null, flagged: 0, firstMs: timeMs, lastMs: timeMs, instants: 1 };
      stream.window = new SpikeWindow((spike) => {
        this.sql.flag.run(spike);
        stream.flagged++;
      });
      this.wells.set(wellId, stream);
      for (const [bid, , bv] of this.sql.beforeRows(wellId, timeMs)) stream.window.push(bid, bv, false);
      s = stream;
    } else {
      if (s.window === null) return;
      if (timeMs < s.lastMs) {
        // Not in time order: this well is judged from the log at the end.
        this.abandon(wellId, s);
        return;
      }
      if (timeMs === s.lastMs) return; // the same live reading as the row before
      s.lastMs = timeMs;
      s.instants++;
    }
    if (takesPart) s.window?.push(id, valueC, candidate);
  }

  /** Finishes the judgement; `spans` are the production wells' spans of stored readings. Returns the spikes flagged. */
  finish(spans: readonly ImportedSpan[]): number {
    const fromLog: ImportedSpan[] = [];
    let flagged = 0;
    for (const span of spans) {
      const s = this.wells.get(span.wellId);
      if (s !== undefined && s.window !== null) {
        for (const [aid, , av] of this.sql.afterRows(span.wellId, s.lastMs)) s.window.push(aid, av, false);
        s.window.end();
        // Every live reading inside the span must have passed through the window.
        if ((this.sql.live.get(span.wellId, s.firstMs, s.lastMs) as { n: number }).n === s.instants) {
          flagged += s.flagged;
          continue;
        }
        this.abandon(span.wellId, s);
      }
      fromLog.push(span);
    }
    return flagged + flagSpansFromLog(this.db, this.importId, fromLog, this.sql);
  }

  private abandon(wellId: number, s: WellStream): void {
    if (s.flagged > 0) this.unflag.run(this.importId, wellId);
    s.window = null;
    s.flagged = 0;
  }
}

/**
 * Flags the spikes among the readings import `importId` stored in `spans`, judged from the log:
 * each well is read in pages along the (well, time) index — the 3 readings before the span, the
 * span, the 3 after — so memory stays flat and the flag updates can run between pages.
 */
export function flagSpansFromLog(db: Database.Database, importId: number, spans: readonly ImportedSpan[], statements?: SpikeStatements): number {
  const sql = statements ?? new SpikeStatements(db);
  let flagged = 0;
  const spikes: number[] = [];
  const flagAll = (): void => {
    for (const id of spikes) sql.flag.run(id);
    flagged += spikes.length;
    spikes.length = 0;
  };
  for (const span of spans) {
    const window = new SpikeWindow((id) => spikes.push(id));
    const feed = (rows: Row[], judge: boolean): void => {
      for (const [id, , valueC, imp] of rows) window.push(id, valueC, judge && imp === importId);
    };
    feed(sql.beforeRows(span.wellId, span.fromMs), false);
    let lastMs = span.fromMs - 1;
    for (;;) {
      const rows = sql.page.all(span.wellId, lastMs, span.toMs) as Row[];
      feed(rows, true);
      flagAll();
      if (rows.length < PAGE_ROWS) break;
      lastMs = rows[rows.length - 1][1];
    }
    feed(sql.afterRows(span.wellId, span.toMs), false);
    window.end();
    flagAll();
  }
  return flagged;
}
