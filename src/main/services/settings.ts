/**
 * The field log's settings (src/shared/contract/settings.ts): read with their built-in defaults,
 * changed with every value checked and one audit row per change, and what the back end has open.
 *
 * Defaults, each reported with source 'default' so a screen can say it is not the user's choice:
 *   units 'si'; timeZone null (each field's own zone);
 *   economicLimit production temperature 100 °C — a placeholder, not a fact of the trade: the
 *     limit is the plant's own economics and must be set;
 *   backgroundHeatFlowWPerM2 0.06 (continental average, common practice; shared/forecast/recharge.ts);
 *   horizonYears 30 (the forecast's own default, services/forecasts.ts).
 *
 * Stored as one row per key (migration 0003): the five above by name, a well's own limit as
 * `wellEconomicLimit.<well id>`. A stored value is checked with the same schema as a request on
 * every read; one that no longer passes (edited by hand outside Tauwell) counts as not set.
 *
 * Exported API:
 *   DEFAULT_ECONOMIC_LIMIT, SETTINGS_AUDIT_ENTITY_ID
 *   readSettings(repo: SettingsRepository): SettingsJson
 *   economicLimitOf(settings, wellId): { limit: ForecastLimit; own: boolean }
 *   settingsServices(ctx): { getSettings, updateSettings, aboutFieldLog }
 */
import { statSync } from 'node:fs';
import { resolve } from 'node:path';
import type { ForecastLimit } from '../../shared/contract/fits.js';
import { REQUEST_SCHEMAS } from '../../shared/contract/index.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import {
  ABOUT_FIELD_LOG_REQUEST, GET_SETTINGS_REQUEST,
  type AboutFieldLogJson, type SettingsJson, type UpdateSettingsRequest,
} from '../../shared/contract/settings.js';
import { InputError } from '../../shared/errors.js';
import { DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2 } from '../../shared/forecast/recharge.js';
import { packageVersion } from '../cli/version.js';
import { canonicalTimeZone } from '../db/fields.js';
import { SettingsRepository, type StoredSetting } from '../db/settings.js';
import type { ServiceContext } from './context.js';
import { engineVersion } from './fit-store.js';
import { DEFAULT_HORIZON_YEARS } from './forecasts.js';

/** A placeholder until the user sets the plant's own limit (not a fact of the trade). */
export const DEFAULT_ECONOMIC_LIMIT: ForecastLimit = { kind: 'production-temperature', temperatureC: 100 };

/** The audit log's entity id for the settings: a field log has one set of them. */
export const SETTINGS_AUDIT_ENTITY_ID = 1;

type SimpleKey = keyof SettingsJson['source'];
const SIMPLE_KEYS: readonly SimpleKey[] = ['units', 'timeZone', 'economicLimit', 'backgroundHeatFlowWPerM2', 'horizonYears'];
const WELL_LIMIT_PREFIX = 'wellEconomicLimit.';
const MEMORY = ':memory:';

const DEFAULTS: Pick<SettingsJson, SimpleKey> = {
  units: 'si',
  timeZone: null,
  economicLimit: DEFAULT_ECONOMIC_LIMIT,
  backgroundHeatFlowWPerM2: DEFAULT_BACKGROUND_HEAT_FLOW_W_PER_M2,
  horizonYears: DEFAULT_HORIZON_YEARS,
};

/** The stored value of a row checked with the request's own schema; undefined when it does not pass. */
function storedValue(row: StoredSetting, wrap: (value: unknown) => unknown, pick: (r: UpdateSettingsRequest) => unknown): unknown {
  try {
    return pick(validate(REQUEST_SCHEMAS.updateSettings, wrap(JSON.parse(row.valueJson))) as UpdateSettingsRequest) ?? undefined;
  } catch {
    return undefined;
  }
}

export function readSettings(repo: SettingsRepository): SettingsJson {
  const out: SettingsJson = {
    ...DEFAULTS,
    wellEconomicLimits: {},
    source: { units: 'default', timeZone: 'default', economicLimit: 'default', backgroundHeatFlowWPerM2: 'default', horizonYears: 'default' },
    updatedAt: null,
  };
  let latestMs: number | null = null;
  for (const row of repo.list()) {
    let used = false;
    if ((SIMPLE_KEYS as readonly string[]).includes(row.key)) {
      const key = row.key as SimpleKey;
      // timeZone may be stored as null ("each field's own"), which is a value, not an absence.
      const value = key === 'timeZone' && row.valueJson === 'null' ? null : storedValue(row, (v) => ({ [key]: v }), (r) => r[key]);
      if (value !== undefined) {
        (out as unknown as Record<string, unknown>)[key] = value;
        out.source[key] = 'set';
        used = true;
      }
    } else if (row.key.startsWith(WELL_LIMIT_PREFIX)) {
      const id = row.key.slice(WELL_LIMIT_PREFIX.length);
      const value = storedValue(row, (v) => ({ wellEconomicLimits: { [id]: v } }), (r) => r.wellEconomicLimits?.[id]);
      if (value !== undefined && value !== null) {
        out.wellEconomicLimits[id] = value as ForecastLimit;
        used = true;
      }
    }
    if (used && (latestMs === null || row.updatedMs > latestMs)) latestMs = row.updatedMs;
  }
  out.updatedAt = latestMs === null ? null : isoOf(latestMs);
  return out;
}

/** The limit a well's forecast runs to: its own when it has one, else the log's. */
export function economicLimitOf(settings: SettingsJson, wellId: number): { limit: ForecastLimit; own: boolean } {
  const own = settings.wellEconomicLimits[String(wellId)];
  return own === undefined ? { limit: settings.economicLimit, own: false } : { limit: own, own: true };
}

export function settingsServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  const repo = new SettingsRepository(ctx.fdb);
  const counts = db.prepare<[], { fields: number; wells: number; readings: number }>(
    `SELECT (SELECT count(*) FROM fields) AS fields, (SELECT count(*) FROM wells) AS wells,
            (SELECT count(*) FROM readings WHERE deleted_ms IS NULL) AS readings`,
  );

  const updateTx = db.transaction((req: UpdateSettingsRequest): SettingsJson => {
    const stored = new Map(repo.list().map((r) => [r.key, r.valueJson]));
    const before = readSettings(repo);
    const old: Record<string, unknown> = {};
    const now: Record<string, unknown> = {};
    const put = (key: string, value: unknown, oldValue: unknown): void => {
      if (stored.get(key) === JSON.stringify(value)) return; // already set to exactly this
      repo.put(key, value, ctx.who);
      old[key] = oldValue;
      now[key] = value;
    };

    for (const key of SIMPLE_KEYS) {
      const value = req[key];
      if (value === undefined) continue;
      put(key, key === 'timeZone' && value !== null ? canonicalTimeZone(value, 'timeZone') : value, before.source[key] === 'set' ? before[key] : null);
    }
    for (const [id, limit] of Object.entries(req.wellEconomicLimits ?? {})) {
      const key = `${WELL_LIMIT_PREFIX}${id}`;
      const field = `wellEconomicLimits.${id}`;
      if (limit === null) {
        if (repo.remove(key)) {
          old[key] = before.wellEconomicLimits[id] ?? null;
          now[key] = null;
        }
        continue;
      }
      const well = ctx.wells.get(Number(id));
      if (well === undefined) throw new InputError(`no well with id ${id}`, { field });
      if (well.kind !== 'production') throw new InputError(`${well.name} is an injection well; economic limits apply to production wells`, { field });
      put(key, limit, before.wellEconomicLimits[id] ?? null);
    }

    if (Object.keys(now).length > 0) {
      ctx.audit.record({ who: ctx.who, action: 'edit', entity: 'settings', entityId: SETTINGS_AUDIT_ENTITY_ID, old, new: now, reason: req.reason ?? '' });
    }
    return readSettings(repo);
  });

  return {
    getSettings(request: Record<string, never> = {}): SettingsJson {
      validate(GET_SETTINGS_REQUEST, request);
      return readSettings(repo);
    },

    updateSettings(request: UpdateSettingsRequest): SettingsJson {
      return updateTx.immediate(validate(REQUEST_SCHEMAS.updateSettings, request) as UpdateSettingsRequest);
    },

    aboutFieldLog(request: Record<string, never> = {}): AboutFieldLogJson {
      validate(ABOUT_FIELD_LOG_REQUEST, request);
      const file = ctx.fdb.file;
      const path = file === MEMORY ? null : resolve(file);
      let sizeBytes: number | null = null;
      if (path !== null) {
        try {
          // The main file only: the write-ahead log beside it is folded back in at checkpoints.
          sizeBytes = statSync(path).size;
        } catch {
          sizeBytes = null;
        }
      }
      const n = counts.get() as { fields: number; wells: number; readings: number };
      return {
        path,
        sizeBytes,
        schemaVersion: ctx.fdb.schemaVersion,
        appVersion: packageVersion(),
        engineVersion: engineVersion(),
        fields: n.fields,
        wells: n.wells,
        liveReadings: n.readings,
      };
    },
  };
}
