/**
 * A well's readings as columns for a chart (contract: wellSeries and chartSeries in
 * src/shared/contract/overview.ts): every live reading (and the soft-deleted ones on request), each
 * with the code of why the fit would leave it out and its basis value, judged by the fit's own
 * rules — time zero from timeOriginOf (services/fits.ts), the exclusion rule exclusionOf and the
 * produced mass ProducedMassCounter (src/shared/series/well-series.ts) — so the chart and the fit
 * cannot disagree.
 *
 * Built for a million readings. Reading rows out of SQLite costs per value handed to JavaScript,
 * and most for a row as an array or an object, so each column is read on its own as bare numbers:
 * the instants; the temperatures, where a reading that is not plain production (shut-in or test,
 * flagged, deleted: a few in a hundred) holds the marker 'S' instead; the flows where they are
 * needed. Those few readings come from their own index (migration 0004) with their status, flags
 * and temperature, in the same order, and are taken in turn at each marker. All in one read
 * transaction. With a ColumnReader (column-reader.ts) the instants and temperatures are read on
 * two threads meanwhile. wellSeries turns the typed columns into the contract's arrays, chartSeries into
 * base64. On the mass basis a reading's M is the counter's total as it takes the reading in;
 * flagged and deleted readings get theirs from a search afterwards.
 *
 * Exported API:
 *   wellSeriesServices(ctx, threads?: ColumnReader | null): { wellSeries(request): WellSeriesResponse; chartSeries(request): ChartSeriesResponse }
 */
import {
  CHART_SERIES_REQUEST, EXCLUSION_CODES, WELL_SERIES_REQUEST,
  type ChartSeriesResponse, type WellSeriesRequest, type WellSeriesResponse,
} from '../../shared/contract/overview.js';
import type { ReadingStatus } from '../../shared/contract/reading-rules.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { Basis } from '../../shared/fit/types.js';
import { ProducedMassCounter, exclusionOf, isFlaggedOut } from '../../shared/series/well-series.js';
import { SPECIAL, columnSql, fillTemperatures, seriesOrder } from '../db/series-columns.js';
import type { Well } from '../db/wells.js';
import type { ServiceContext } from './context.js';
import type { ColumnReader } from './column-reader.js';
import { timeOriginOf } from './fits.js';
import { wellInfo } from './views.js';

const DELETED = EXCLUSION_CODES.deleted;

/** The readings of one well as typed columns; NaN where a value is missing. */
interface Columns {
  well: Well;
  basis: Basis;
  originMs: number | null;
  count: number;
  epochMs: number;
  timeMs: Float64Array;
  /** s after time zero or kg since time zero; NaN before time zero. */
  x: Float64Array;
  temperatureC: Float64Array;
  exclusion: Uint8Array;
  /** With `withIds` only. */
  flowKgPerS: Float64Array | null;
  ids: Float64Array | null;
}

/** status, flags, deleted_ms, production_temperature_c of a reading that is not plain. */
type SpecialRow = [ReadingStatus, string, number | null, number | null];

/** `threads`: the reader threads of the instants and temperatures (column-reader.ts), or null to read every column here. */
export function wellSeriesServices(ctx: ServiceContext, threads: ColumnReader | null = null) {
  const db = ctx.fdb.db;
  // Each column is read on its own as bare values (`pluck`), in the same order (db/series-columns.ts): the
  // live queries walk the partial index (well_id, time_ms) WHERE deleted_ms IS NULL.
  const column = (sql: string) => db.prepare<[number], number | string | null>(sql).pluck(true);
  const columns = [false, true].map((includeDeleted) => ({
    time: column(columnSql('time', includeDeleted)),
    temperature: column(columnSql('temperature', includeDeleted)),
    flow: column(`SELECT normalised_mass_flow_kg_s FROM readings WHERE ${seriesOrder(includeDeleted)}`),
    id: column(`SELECT id FROM readings WHERE ${seriesOrder(includeDeleted)}`),
    special: db.prepare<[number], SpecialRow>(
      `SELECT status, flags, deleted_ms, production_temperature_c FROM readings INDEXED BY readings_special
       WHERE well_id = ? ${includeDeleted ? '' : 'AND deleted_ms IS NULL '}AND ${SPECIAL} ORDER BY time_ms, id`,
    ).raw(true),
  }));
  const firstLive = db.prepare<[number], { t: number | null }>('SELECT min(time_ms) AS t FROM readings WHERE well_id = ? AND deleted_ms IS NULL');
  const countLive = db.prepare<[number], number>('SELECT count(*) FROM readings WHERE well_id = ? AND deleted_ms IS NULL').pluck(true);
  const countAll = db.prepare<[number], number>('SELECT count(*) FROM readings WHERE well_id = ?').pluck(true);

  // One read transaction: every column is read from the same readings.
  const read = db.transaction((req: WellSeriesRequest, withIds: boolean, parallel: boolean): Columns & { parallel: boolean } => {
    const { well } = ctx.well(req);
    const basis = req.basis ?? 'time';
    if (basis === 'mass' && well.kind !== 'production') {
      throw new InputError(`${well.name} is an injection well: it produces no mass to count; use the time basis`, { field: 'basis' });
    }
    const q = columns[req.includeDeleted === true ? 1 : 0];
    const firstLiveMs = (firstLive.get(well.id) as { t: number | null }).t;
    const originMs = firstLiveMs === null ? well.productionStartMs : timeOriginOf(well, firstLiveMs).originMs;
    const origin = originMs ?? Infinity; // without a time zero every reading lies "before" it (no live reading at all)
    const counter = basis === 'mass' && originMs !== null ? new ProducedMassCounter(originMs) : null;

    // The instants and temperatures on the reader threads where there are some, while this one reads the rest.
    const includeDeleted = req.includeDeleted === true;
    const count = parallel && threads !== null ? ((includeDeleted ? countAll : countLive).get(well.id) as number) : 0;
    const waitForTimes = parallel && threads !== null ? threads.start('time', well.id, includeDeleted, count) : null;
    const waitForTemperatures = parallel && threads !== null ? threads.start('temperature', well.id, includeDeleted, count) : null;
    const flows = counter !== null || withIds ? (q.flow.all(well.id) as (number | null)[]) : null;
    const specials = q.special.all(well.id) as SpecialRow[];
    const timesFromThread = waitForTimes?.() ?? null;
    const temperaturesFromThread = waitForTemperatures?.() ?? null;
    const timeMs = timesFromThread?.values ?? Float64Array.from(q.time.all(well.id) as number[]);
    const n = timeMs.length;
    const { values: temperatureC, marks } = temperaturesFromThread === null
      ? temperatureColumn(q.temperature.all(well.id), n)
      : { values: temperaturesFromThread.values, marks: temperaturesFromThread.marks as Uint8Array };
    const x = new Float64Array(n);
    const exclusion = new Uint8Array(n);
    const pending: number[] = [];
    let k = 0;
    for (let i = 0; i < n; i++) {
      const t = timeMs[i];
      const flow = flows === null ? null : flows[i];
      let temperature: number | null = temperatureC[i];
      let status: ReadingStatus = 'producing';
      let flaggedOut = false;
      let deleted = false;
      if (marks[i] === 1) {
        // The next reading that is not plain, in the same order.
        const row = specials[k++];
        if (row === undefined) throw new ColumnsDisagree(`wellSeries: ${well.name} has more readings marked as not plain than ${specials.length}`);
        status = row[0];
        flaggedOut = row[1] !== '' && isFlaggedOut(row[1].split(','));
        deleted = row[2] !== null;
        temperature = row[3];
        temperatureC[i] = temperature ?? NaN;
      } else if (Number.isNaN(temperature)) temperature = null;
      let counted = false;
      if (deleted) exclusion[i] = DELETED;
      else {
        exclusion[i] = EXCLUSION_CODES[exclusionOf(t, origin, status, flaggedOut, temperature !== null) ?? 'included'];
        if (counter !== null) counted = counter.add(t, status, flaggedOut, flow);
      }
      if (t < origin) x[i] = NaN;
      else if (counter === null) x[i] = (t - origin) / 1000;
      else if (counted) x[i] = counter.totalKg;
      else pending.push(i); // a flagged or deleted reading: its M needs the next trusted reading
    }
    if (k !== specials.length || temperatureC.length !== n || (flows !== null && flows.length !== n)) {
      throw new ColumnsDisagree(`wellSeries: the columns of ${well.name} disagree (${n} instants, ${temperatureC.length} temperatures, ${k} of ${specials.length} other readings)`);
    }
    if (counter !== null) for (const j of pending) x[j] = counter.massAt(timeMs[j]);
    const nanOfNull = (v: number | null): number => v ?? NaN;
    return {
      parallel: timesFromThread !== null || temperaturesFromThread !== null,
      well, basis, originMs, count: n, epochMs: n > 0 ? timeMs[0] : (originMs ?? 0), timeMs, x, temperatureC, exclusion,
      flowKgPerS: withIds && flows !== null ? Float64Array.from(flows, nanOfNull) : null,
      ids: withIds ? Float64Array.from(q.id.all(well.id) as number[]) : null,
    };
  });

  /** The columns, read with the threads when there are some, and again without them if another connection committed meanwhile. */
  const columnsOf = (req: WellSeriesRequest, withIds: boolean): Columns => {
    if (threads === null) return read(req, withIds, false);
    const before = threads.dataVersion();
    let c: Columns & { parallel: boolean };
    try {
      c = read(req, withIds, true);
    } catch (e) {
      // A thread saw other readings than this connection (a commit between their snapshots).
      if (e instanceof ColumnsDisagree) return read(req, withIds, false);
      throw e;
    }
    return !c.parallel || threads.dataVersion() === before ? c : read(req, withIds, false);
  };

  const head = (c: Columns) => ({
    well: wellInfo(ctx, c.well),
    basis: c.basis,
    timeOrigin: c.originMs === null ? null : isoOf(c.originMs),
    referenceTemperatureC: c.well.referenceTemperatureC,
    count: c.count,
    epochMs: c.epochMs,
  });

  return {
    wellSeries(request: WellSeriesRequest): WellSeriesResponse {
      const c = columnsOf(validate(WELL_SERIES_REQUEST, request), true);
      const orNull = (v: number): number | null => (Number.isNaN(v) ? null : v);
      return {
        ...head(c),
        timeS: Array.from(c.timeMs, (t) => (t - c.epochMs) / 1000),
        x: Array.from(c.x, orNull),
        productionTemperatureC: Array.from(c.temperatureC, orNull),
        massFlowKgPerS: Array.from(c.flowKgPerS as Float64Array, orNull),
        exclusion: Array.from(c.exclusion),
        readingId: Array.from(c.ids as Float64Array),
      };
    },
    chartSeries(request: WellSeriesRequest): ChartSeriesResponse {
      const c = columnsOf(validate(CHART_SERIES_REQUEST, request), false);
      return {
        ...head(c),
        columns: {
          timeMs: base64(c.timeMs),
          productionTemperatureC: base64(c.temperatureC),
          exclusion: base64(c.exclusion),
          x: c.basis === 'time' ? null : base64(c.x),
        },
      };
    },
  };
}

/** Columns of one series that do not line up: a bug when one thread read them all. */
class ColumnsDisagree extends Error {}

/** The temperature column as read here: values with NaN for none and the marks of readings that are not plain. */
function temperatureColumn(values: (number | string | null)[], n: number): { values: Float64Array; marks: Uint8Array } {
  const out = new Float64Array(values.length);
  const marks = new Uint8Array(values.length);
  fillTemperatures(values, out, marks);
  if (values.length !== n) throw new ColumnsDisagree(`wellSeries: ${values.length} temperatures for ${n} instants`);
  return { values: out, marks };
}

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** The bytes of a typed array in this platform's order, which must be little-endian, in base64. */
function base64(array: Float64Array | Uint8Array): string {
  if (!LITTLE_ENDIAN) throw new Error('chartSeries packs little-endian columns; this platform is big-endian');
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength).toString('base64');
}
