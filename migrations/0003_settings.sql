-- 0003: the field log's analysis and display settings (src/shared/contract/settings.ts), one row per
-- key with its value as JSON. A key without a row has its built-in default (src/main/services/settings.ts);
-- every change is also written to the audit log (entity 'settings').
CREATE TABLE settings (
  key         TEXT    PRIMARY KEY,   -- units, timeZone, economicLimit, wellEconomicLimit.<well id>, ...
  value_json  TEXT    NOT NULL,
  updated_ms  INTEGER NOT NULL,
  updated_by  TEXT    NOT NULL
);
