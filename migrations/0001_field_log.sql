-- 0001: the field log. Instants are UTC, stored as Unix epoch milliseconds (INTEGER) so that ordering
-- and range queries use the index; numbers are SI except temperatures, which are kept in °C (the
-- trade's working unit). Each measured value keeps the unit it was entered in beside it.

CREATE TABLE fields (
  id          INTEGER PRIMARY KEY,
  name        TEXT    NOT NULL UNIQUE,
  time_zone   TEXT    NOT NULL DEFAULT 'UTC',   -- IANA zone: naive timestamps of this field are local to it
  notes       TEXT    NOT NULL DEFAULT '',
  created_ms  INTEGER NOT NULL
);

CREATE TABLE reservoirs (
  id          INTEGER PRIMARY KEY,
  field_id    INTEGER NOT NULL REFERENCES fields(id),
  name        TEXT    NOT NULL,
  UNIQUE (field_id, name)
);

-- Heat-model assumptions are versioned: a change adds a row, it never rewrites an earlier one.
CREATE TABLE reservoir_versions (
  id            INTEGER PRIMARY KEY,
  reservoir_id  INTEGER NOT NULL REFERENCES reservoirs(id),
  version       INTEGER NOT NULL,
  params_json   TEXT    NOT NULL,               -- the keys of `tauwell theory --params`
  recorded_ms   INTEGER NOT NULL,
  recorded_by   TEXT    NOT NULL,
  note          TEXT    NOT NULL DEFAULT '',
  UNIQUE (reservoir_id, version)
);

CREATE TABLE wells (
  id                       INTEGER PRIMARY KEY,
  field_id                 INTEGER NOT NULL REFERENCES fields(id),
  reservoir_id             INTEGER REFERENCES reservoirs(id),
  name                     TEXT    NOT NULL,
  kind                     TEXT    NOT NULL CHECK (kind IN ('production', 'injection')),
  reference_temperature_c  REAL,                -- Tref: minimum useful temperature for θ = Tprod − Tref
  production_start_ms      INTEGER,
  created_ms               INTEGER NOT NULL,
  UNIQUE (field_id, name)
);

CREATE TABLE imports (
  id             INTEGER PRIMARY KEY,
  file_name      TEXT    NOT NULL,
  file_size      INTEGER NOT NULL,
  sha256         TEXT    NOT NULL,
  field_id       INTEGER REFERENCES fields(id),
  mapping_json   TEXT    NOT NULL,              -- column role -> header
  units_json     TEXT    NOT NULL,              -- column role -> unit used
  options_json   TEXT    NOT NULL DEFAULT '{}', -- delimiter, decimal, date order, time zone, encoding
  rows_read      INTEGER NOT NULL DEFAULT 0,
  imported       INTEGER NOT NULL DEFAULT 0,
  duplicates     INTEGER NOT NULL DEFAULT 0,
  conflicts      INTEGER NOT NULL DEFAULT 0,
  rejected       INTEGER NOT NULL DEFAULT 0,
  flagged        INTEGER NOT NULL DEFAULT 0,
  started_ms     INTEGER NOT NULL,
  finished_ms    INTEGER,
  status         TEXT    NOT NULL CHECK (status IN ('running', 'complete', 'failed', 'cancelled', 'interrupted')),
  message        TEXT    NOT NULL DEFAULT ''
);
CREATE INDEX imports_sha256 ON imports (sha256);

CREATE TABLE readings (
  id                        INTEGER PRIMARY KEY,
  well_id                   INTEGER NOT NULL REFERENCES wells(id),
  time_ms                   INTEGER NOT NULL,
  production_temperature_c  REAL,
  injection_temperature_c   REAL,
  temperature_unit          TEXT,               -- unit the temperatures were entered in
  mass_flow_kg_s            REAL,               -- as entered, if entered as mass
  volume_flow_m3_s          REAL,               -- as entered, if entered as volume
  flow_unit                 TEXT,
  normalised_mass_flow_kg_s REAL,               -- mass flow, volume converted with the water density below
  flow_density_kg_m3        REAL,               -- density used for that conversion (the recorded assumption)
  pressure_pa               REAL,
  pressure_unit             TEXT,
  status                    TEXT    NOT NULL DEFAULT 'producing' CHECK (status IN ('producing', 'shut-in', 'test')),
  note                      TEXT    NOT NULL DEFAULT '',
  source                    TEXT    NOT NULL,   -- 'manual' or 'import'
  import_id                 INTEGER REFERENCES imports(id),
  source_line               INTEGER,            -- line of the imported file
  flags                     TEXT    NOT NULL DEFAULT '',  -- comma list: spike, bad
  created_ms                INTEGER NOT NULL,
  updated_ms                INTEGER,
  deleted_ms                INTEGER             -- soft delete; the audit log holds who and why
);
-- One live reading per well and instant; deleted ones stay for the record.
CREATE UNIQUE INDEX readings_well_time ON readings (well_id, time_ms) WHERE deleted_ms IS NULL;
CREATE INDEX readings_import ON readings (import_id);

CREATE TABLE rejected_rows (
  id         INTEGER PRIMARY KEY,
  import_id  INTEGER NOT NULL REFERENCES imports(id),
  line       INTEGER NOT NULL,
  raw        TEXT    NOT NULL,
  reason     TEXT    NOT NULL
);
CREATE INDEX rejected_rows_import ON rejected_rows (import_id);

-- Same well and instant as a stored reading but different values: held for the user, never overwritten.
CREATE TABLE conflicts (
  id                   INTEGER PRIMARY KEY,
  import_id            INTEGER NOT NULL REFERENCES imports(id),
  line                 INTEGER NOT NULL,
  raw                  TEXT    NOT NULL,
  well_id              INTEGER NOT NULL REFERENCES wells(id),
  time_ms              INTEGER NOT NULL,
  values_json          TEXT    NOT NULL,
  existing_reading_id  INTEGER NOT NULL REFERENCES readings(id),
  resolution           TEXT    NOT NULL DEFAULT 'open' CHECK (resolution IN ('open', 'kept-existing', 'replaced')),
  resolved_ms          INTEGER
);
CREATE INDEX conflicts_import ON conflicts (import_id);

CREATE TABLE audit_log (
  id         INTEGER PRIMARY KEY,
  at_ms      INTEGER NOT NULL,
  who        TEXT    NOT NULL,
  action     TEXT    NOT NULL,                  -- create, edit, delete, resolve, ...
  entity     TEXT    NOT NULL,                  -- reading, well, reservoir, conflict, ...
  entity_id  INTEGER NOT NULL,
  old_json   TEXT,
  new_json   TEXT,
  reason     TEXT    NOT NULL DEFAULT ''
);
CREATE INDEX audit_log_entity ON audit_log (entity, entity_id);
