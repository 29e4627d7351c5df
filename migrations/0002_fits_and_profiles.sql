-- 0002: stored fits, which know the data they were made from, and saved import profiles.

-- data_fingerprint is a hash of the readings that entered the fit (instants, values, statuses, flags):
-- when the well's readings change, the fingerprint no longer matches and the fit is stale.
CREATE TABLE fits (
  id                INTEGER PRIMARY KEY,
  well_id           INTEGER NOT NULL REFERENCES wells(id),
  model             TEXT    NOT NULL,
  basis             TEXT    NOT NULL CHECK (basis IN ('time', 'mass')),
  window_from_ms    INTEGER,
  window_to_ms      INTEGER,
  result_json       TEXT    NOT NULL,
  data_fingerprint  TEXT    NOT NULL,
  engine_version    TEXT    NOT NULL,
  created_ms        INTEGER NOT NULL
);
CREATE INDEX fits_well ON fits (well_id, created_ms);

CREATE TABLE import_profiles (
  id            INTEGER PRIMARY KEY,
  name          TEXT    NOT NULL UNIQUE,
  mapping_json  TEXT    NOT NULL,
  units_json    TEXT    NOT NULL,
  options_json  TEXT    NOT NULL DEFAULT '{}',
  created_ms    INTEGER NOT NULL
);
