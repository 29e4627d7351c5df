/**
 * The column queries of a well's series, shared by services/well-series.ts, its reader threads
 * (services/series-worker.ts) and ReadingRepository.listSeriesLive, so all read the same values in
 * the same order and agree on which readings are plain.
 *
 * A plain reading is producing, without flags and live; the others (shut-in or test, flagged,
 * deleted: a few in a hundred) hold NOT_PLAIN in the temperature column and are read with their
 * status and flags through the partial index readings_special (migration 0004), in the same order.
 *
 * Exported API:
 *   type SeriesColumn = 'time' | 'temperature';  interface ColumnJob { column; wellId; includeDeleted }
 *   NOT_PLAIN, PLAIN, SPECIAL: SQL conditions and marker
 *   columnSql(column, includeDeleted): string      one value a row, to be read with pluck
 *   fillTemperatures(values, out, marks)           the temperature column's values into NaN-for-none doubles and marks
 */
export type SeriesColumn = 'time' | 'temperature';

export interface ColumnJob {
  column: SeriesColumn;
  wellId: number;
  includeDeleted: boolean;
}

/** A plain reading: producing, no flags, live. Its negation is the condition of readings_special. */
export const PLAIN = "status = 'producing' AND flags = '' AND deleted_ms IS NULL";
export const SPECIAL = "(status <> 'producing' OR flags <> '' OR deleted_ms IS NOT NULL)";
/** What the temperature column holds for a reading that is not plain (SQLite columns are dynamically typed). */
export const NOT_PLAIN = 'S';

/** The order of every column: the live readings by instant (the partial index), or all by instant and id. */
export function seriesOrder(includeDeleted: boolean): string {
  return includeDeleted ? 'well_id = ? ORDER BY time_ms, id' : 'well_id = ? AND deleted_ms IS NULL ORDER BY time_ms';
}

export function columnSql(column: SeriesColumn, includeDeleted: boolean): string {
  const expression = column === 'time' ? 'time_ms' : `CASE WHEN ${PLAIN} THEN production_temperature_c ELSE '${NOT_PLAIN}' END`;
  return `SELECT ${expression} FROM readings WHERE ${seriesOrder(includeDeleted)}`;
}

/**
 * The plucked temperature column into `out` (NaN where a reading has no temperature or is not plain)
 * and `marks` (1 where it is not plain), over the first out.length values.
 */
export function fillTemperatures(values: readonly (number | string | null)[], out: Float64Array, marks: Uint8Array): void {
  for (let i = 0; i < out.length; i++) {
    const v = values[i];
    if (v === NOT_PLAIN) {
      out[i] = NaN;
      marks[i] = 1;
    } else out[i] = v === null ? NaN : (v as number);
  }
}
