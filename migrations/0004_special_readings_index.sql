-- 0004: an index of the readings that are not plain production (shut-in or test, flagged, or
-- deleted): a few in a hundred. The chart's series (src/main/services/well-series.ts) reads the
-- plain ones as bare numbers and looks these up through this index instead of scanning the well.
-- The condition is the negation of "status = 'producing' AND flags = '' AND deleted_ms IS NULL"
-- (status and flags are NOT NULL), written as the queries write it so the planner can use it.
CREATE INDEX readings_special ON readings (well_id, time_ms, id)
  WHERE status <> 'producing' OR flags <> '' OR deleted_ms IS NOT NULL;
