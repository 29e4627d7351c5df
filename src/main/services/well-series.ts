/**
 * A well's readings as columns for a chart (contract: wellSeries in src/shared/contract/overview.ts):
 * every live reading (and the soft-deleted ones on request), each with the code of why the fit
 * would leave it out and its basis value, judged by the fit's own rules — time zero from
 * timeOriginOf (services/fits.ts), the exclusion rule exclusionOf and the produced mass
 * ProducedMassCounter (src/shared/series/well-series.ts) — so the chart and the fit cannot disagree.
 *
 * Built for a million readings: one prepared statement read as raw rows (arrays, not objects), one
 * pass filling arrays sized beforehand; on the mass basis a reading's M is the counter's total as it
 * takes the reading in, and only flagged and deleted readings need a search afterwards.
 *
 * Exported API:
 *   wellSeriesServices(ctx): { wellSeries(request: WellSeriesRequest): WellSeriesResponse }
 */
import { EXCLUSION_CODES, WELL_SERIES_REQUEST, type WellSeriesRequest, type WellSeriesResponse } from '../../shared/contract/overview.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { ProducedMassCounter, exclusionOf, isFlaggedOut } from '../../shared/series/well-series.js';
import type { ServiceContext } from './context.js';
import { timeOriginOf } from './fits.js';
import { wellInfo } from './views.js';

/** id, time_ms, production_temperature_c, normalised_mass_flow_kg_s, status, flags, deleted_ms */
type Row = [number, number, number | null, number | null, string, string, number | null];

const COLUMNS = 'id, time_ms, production_temperature_c, normalised_mass_flow_kg_s, status, flags, deleted_ms';
const DELETED = EXCLUSION_CODES.deleted;

export function wellSeriesServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  // The live query matches the partial index (well_id, time_ms) WHERE deleted_ms IS NULL.
  const liveRows = db.prepare<[number], Row>(`SELECT ${COLUMNS} FROM readings WHERE well_id = ? AND deleted_ms IS NULL ORDER BY time_ms`).raw(true);
  const allRows = db.prepare<[number], Row>(`SELECT ${COLUMNS} FROM readings WHERE well_id = ? ORDER BY time_ms, id`).raw(true);
  const firstLive = db.prepare<[number], { t: number | null }>('SELECT min(time_ms) AS t FROM readings WHERE well_id = ? AND deleted_ms IS NULL');
  const countLive = db.prepare<[number], { n: number }>('SELECT count(*) AS n FROM readings WHERE well_id = ? AND deleted_ms IS NULL');
  const countAll = db.prepare<[number], { n: number }>('SELECT count(*) AS n FROM readings WHERE well_id = ?');

  // One read transaction: the count that sizes the arrays and the rows see the same readings.
  const read = db.transaction((req: WellSeriesRequest): WellSeriesResponse => {
    const { well } = ctx.well(req);
    const basis = req.basis ?? 'time';
    if (basis === 'mass' && well.kind !== 'production') {
      throw new InputError(`${well.name} is an injection well: it produces no mass to count; use the time basis`, { field: 'basis' });
    }
    const firstLiveMs = (firstLive.get(well.id) as { t: number | null }).t;
    const originMs = firstLiveMs === null ? well.productionStartMs : timeOriginOf(well, firstLiveMs).originMs;
    const origin = originMs ?? Infinity; // without a time zero every reading lies "before" it (no live reading at all)
    const counter = basis === 'mass' && originMs !== null ? new ProducedMassCounter(originMs) : null;

    // Sized by the count first: arrays filled by index are much faster than arrays grown by push.
    const n = ((req.includeDeleted === true ? countAll : countLive).get(well.id) as { n: number }).n;
    const timeMs = new Float64Array(n);
    const timeS = new Array<number>(n);
    const x = new Array<number | null>(n);
    const productionTemperatureC = new Array<number | null>(n);
    const massFlowKgPerS = new Array<number | null>(n);
    const exclusion = new Array<number>(n);
    const readingId = new Array<number>(n);
    const pending: number[] = [];
    let epochMs = originMs ?? 0;
    let i = 0;
    for (const row of (req.includeDeleted === true ? allRows : liveRows).iterate(well.id)) {
      // Indexed reads rather than array destructuring, which walks an iterator per row.
      const t = row[1], temperature = row[2], flow = row[3], status = row[4], flags = row[5];
      const flaggedOut = flags !== '' && isFlaggedOut(flags.split(','));
      let code: number;
      let counted = false;
      if (row[6] !== null) code = DELETED;
      else {
        code = EXCLUSION_CODES[exclusionOf(t, origin, status, flaggedOut, temperature !== null) ?? 'included'];
        if (counter !== null) counted = counter.add(t, status, flaggedOut, flow);
      }
      if (i === 0) epochMs = t;
      timeMs[i] = t;
      timeS[i] = (t - epochMs) / 1000;
      if (t < origin) x[i] = null;
      else if (counter === null) x[i] = (t - origin) / 1000;
      else if (counted) x[i] = counter.totalKg;
      else {
        // A flagged or deleted reading: its M needs the next trusted reading, so it is filled in below.
        x[i] = 0;
        pending.push(i);
      }
      productionTemperatureC[i] = temperature;
      massFlowKgPerS[i] = flow;
      exclusion[i] = code;
      readingId[i] = row[0];
      i++;
    }
    if (counter !== null) for (const k of pending) x[k] = counter.massAt(timeMs[k]);
    return {
      well: wellInfo(ctx, well),
      basis,
      timeOrigin: originMs === null ? null : isoOf(originMs),
      referenceTemperatureC: well.referenceTemperatureC,
      count: n,
      epochMs,
      timeS,
      x,
      productionTemperatureC,
      massFlowKgPerS,
      exclusion,
      readingId,
    };
  });

  return {
    wellSeries(request: WellSeriesRequest): WellSeriesResponse {
      return read(validate(WELL_SERIES_REQUEST, request));
    },
  };
}
