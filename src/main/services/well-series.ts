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
 * transaction. wellSeries turns the typed columns into the contract's arrays, chartSeries into
 * base64. On the mass basis a reading's M is the counter's total as it takes the reading in;
 * flagged and deleted readings get theirs from a search afterwards.
 *
 * Exported API:
 *   wellSeriesServices(ctx): { wellSeries(request): WellSeriesResponse; chartSeries(request): ChartSeriesResponse }
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
import type { Well } from '../db/wells.js';
import type { ServiceContext } from './context.js';
import { timeOriginOf } from './fits.js';
import { wellInfo } from './views.js';

const DELETED = EXCLUSION_CODES.deleted;
/** A plain reading: producing, no flags, live. Its negation is the condition of the index readings_special (migration 0004). */
const PLAIN = "status = 'producing' AND flags = '' AND deleted_ms IS NULL";
const SPECIAL = "(status <> 'producing' OR flags <> '' OR deleted_ms IS NOT NULL)";
/** What the temperature column holds for a reading that is not plain (SQLite columns are dynamically typed). */
const NOT_PLAIN = 'S';

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

/** id, status, flags, deleted_ms, production_temperature_c of a reading that is not plain. */
type SpecialRow = [number, ReadingStatus, string, number | null, number | null];

export function wellSeriesServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  // Each column is read on its own as bare values (`pluck`), in the same order: the live queries
  // walk the partial index (well_id, time_ms) WHERE deleted_ms IS NULL.
  const order = (includeDeleted: boolean): string => (includeDeleted ? 'well_id = ? ORDER BY time_ms, id' : 'well_id = ? AND deleted_ms IS NULL ORDER BY time_ms');
  const column = (expression: string, includeDeleted: boolean) => db.prepare<[number], number | string | null>(`SELECT ${expression} FROM readings WHERE ${order(includeDeleted)}`).pluck(true);
  const columns = [false, true].map((includeDeleted) => ({
    time: column('time_ms', includeDeleted),
    temperature: column(`CASE WHEN ${PLAIN} THEN production_temperature_c ELSE '${NOT_PLAIN}' END`, includeDeleted),
    flow: column('normalised_mass_flow_kg_s', includeDeleted),
    id: column('id', includeDeleted),
    special: db.prepare<[number], SpecialRow>(
      `SELECT id, status, flags, deleted_ms, production_temperature_c FROM readings INDEXED BY readings_special
       WHERE well_id = ? ${includeDeleted ? '' : 'AND deleted_ms IS NULL '}AND ${SPECIAL} ORDER BY time_ms, id`,
    ).raw(true),
  }));
  const firstLive = db.prepare<[number], { t: number | null }>('SELECT min(time_ms) AS t FROM readings WHERE well_id = ? AND deleted_ms IS NULL');

  // One read transaction: every column is read from the same readings.
  const read = db.transaction((req: WellSeriesRequest, withIds: boolean): Columns => {
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

    const times = q.time.all(well.id) as number[];
    const temperatures = q.temperature.all(well.id);
    const flows = counter !== null || withIds ? (q.flow.all(well.id) as (number | null)[]) : null;
    const specials = q.special.all(well.id) as SpecialRow[];
    const n = times.length;
    const timeMs = Float64Array.from(times);
    const x = new Float64Array(n);
    const temperatureC = new Float64Array(n);
    const exclusion = new Uint8Array(n);
    const pending: number[] = [];
    let k = 0;
    for (let i = 0; i < n; i++) {
      const t = timeMs[i];
      const flow = flows === null ? null : flows[i];
      let temperature = temperatures[i] as number | null;
      let status: ReadingStatus = 'producing';
      let flaggedOut = false;
      let deleted = false;
      if (typeof temperature === 'string') {
        // The next reading that is not plain, in the same order.
        const row = specials[k++];
        status = row[1];
        flaggedOut = row[2] !== '' && isFlaggedOut(row[2].split(','));
        deleted = row[3] !== null;
        temperature = row[4];
      }
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
      temperatureC[i] = temperature ?? NaN;
    }
    if (k !== specials.length || temperatures.length !== n) {
      throw new Error(`wellSeries: the columns of ${well.name} disagree (${n} instants, ${temperatures.length} temperatures, ${k} of ${specials.length} other readings)`);
    }
    if (counter !== null) for (const j of pending) x[j] = counter.massAt(timeMs[j]);
    const nanOfNull = (v: number | null): number => v ?? NaN;
    return {
      well, basis, originMs, count: n, epochMs: n > 0 ? timeMs[0] : (originMs ?? 0), timeMs, x, temperatureC, exclusion,
      flowKgPerS: withIds && flows !== null ? Float64Array.from(flows, nanOfNull) : null,
      ids: withIds ? Float64Array.from(q.id.all(well.id) as number[]) : null,
    };
  });

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
      const c = read(validate(WELL_SERIES_REQUEST, request), true);
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
      const c = read(validate(CHART_SERIES_REQUEST, request), false);
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

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** The bytes of a typed array in this platform's order, which must be little-endian, in base64. */
function base64(array: Float64Array | Uint8Array): string {
  if (!LITTLE_ENDIAN) throw new Error('chartSeries packs little-endian columns; this platform is big-endian');
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength).toString('base64');
}
