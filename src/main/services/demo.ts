/**
 * Builds the INVENTED demo field "Kettle Ridge (invented)" into an empty field log, from the seeded
 * model in src/shared/demo/invented-field.ts: the field, its reservoir with two parameter versions,
 * three production wells and an injection well, twelve years of weekly readings (the history is
 * loaded in one transaction without an audit row per reading, as a migration of old records would
 * be), and then the operator's corrections made through the services, so they sit in the audit log
 * with who, why and the values before and after. Last, the settings of the demo scenario: its
 * economic limit, a production temperature of DEMO_LIMIT_TEMPERATURE_C (the limit `npm run demo`
 * forecasts KR-3 to), also through the services and so in the audit log.
 */
import type { BuildDemoResponse } from '../../shared/contract/demo.js';
import { normaliseReading } from '../../shared/contract/reading-rules.js';
import type { EditReadingRequest } from '../../shared/contract/readings.js';
import { isoOf } from '../../shared/contract/schema.js';
import { INVENTED_FIELD, INVENTED_RESERVOIR, INVENTED_START_MS, INVENTED_WELLS, REFERENCE_TEMPERATURE_C } from '../../shared/demo/invented-field.js';
import { inventedDemoLog, type DemoReading } from '../../shared/demo/invented-log.js';
import { InputError } from '../../shared/errors.js';
import type { FieldDb } from '../db/database.js';
import { createContext } from './context.js';
import { readingServices } from './readings.js';
import { reservoirServices } from './reservoirs.js';
import { settingsServices } from './settings.js';
import { wellServices } from './wells.js';

/** Who made the demo's entries and corrections: an invented operator, so no real person is named. */
export const DEMO_OPERATOR = 'Kettle Ridge operator (invented)';

/** The demo scenario's economic limit, °C (package.json: `npm run demo` forecasts with --limit-temp 115). */
export const DEMO_LIMIT_TEMPERATURE_C = 115;

export function buildDemo(fdb: FieldDb): BuildDemoResponse {
  const ctx = createContext(fdb, { who: DEMO_OPERATOR });
  if (ctx.fields.list().length > 0) {
    throw new InputError('the field log already holds fields; the invented demo is built into a new, empty field log', { field: 'database' });
  }
  const wells = wellServices(ctx);
  const reservoirs = reservoirServices(ctx);
  const readings = readingServices(ctx);
  const log = inventedDemoLog();

  const build = fdb.db.transaction((): BuildDemoResponse => {
    const field = wells.createField({ name: INVENTED_FIELD.name, timeZone: INVENTED_FIELD.timeZone, notes: INVENTED_FIELD.notes });
    reservoirs.createReservoir({ field: field.name, name: INVENTED_RESERVOIR.name });
    for (const v of INVENTED_RESERVOIR.versions) {
      reservoirs.addReservoirVersion({ field: field.name, reservoir: INVENTED_RESERVOIR.name, params: v.params, note: v.note });
    }
    const ids = new Map<string, number>();
    for (const w of INVENTED_WELLS) {
      const info = wells.createWell({
        field: field.name, name: w.name, kind: w.kind, reservoir: INVENTED_RESERVOIR.name, productionStart: isoOf(INVENTED_START_MS),
        ...(w.kind === 'production' ? { referenceTemperatureC: REFERENCE_TEMPERATURE_C } : {}),
      });
      ids.set(w.name, info.id);
    }

    const key = (well: string, timeMs: number): string => `${well}@${timeMs}`;
    const firstEntered = new Map(log.corrections.filter((c) => c.kind === 'edit').map((c) => [key(c.well, c.timeMs), c.entered]));
    const insert = (r: DemoReading): void => {
      const { assumptions: _assumptions, ...values } = normaliseReading({
        productionTemperature: r.productionTemperatureC, injectionTemperature: r.injectionTemperatureC, temperatureUnit: 'degC',
        flow: r.flow, flowUnit: r.flowUnit, pressure: r.pressureBar, pressureUnit: 'bar', status: r.status,
      });
      ctx.readings.insert({ wellId: ids.get(r.well) as number, timeMs: r.timeMs, source: 'manual', ...values, note: r.note, flags: r.flags });
    };
    for (const r of log.readings) insert({ ...r, ...firstEntered.get(key(r.well, r.timeMs)) });
    for (const c of log.corrections) if (c.kind === 'delete') insert({ ...(c.entered as DemoReading), well: c.well, timeMs: c.timeMs });

    for (const c of log.corrections) {
      const stored = ctx.readings.findLive(ids.get(c.well) as number, c.timeMs);
      if (stored === undefined) throw new Error(`invented demo: no reading of ${c.well} at ${isoOf(c.timeMs)} to correct`);
      if (c.kind === 'delete') {
        readings.deleteReading({ id: stored.id, reason: c.reason });
        continue;
      }
      const right = log.readings.find((r) => r.well === c.well && r.timeMs === c.timeMs) as DemoReading;
      const edit: EditReadingRequest = { id: stored.id, reason: c.reason };
      if (c.entered.productionTemperatureC !== undefined) Object.assign(edit, { productionTemperature: right.productionTemperatureC, temperatureUnit: 'degC' });
      if (c.entered.flow !== undefined) Object.assign(edit, { flow: right.flow, flowUnit: right.flowUnit });
      if (c.entered.status !== undefined) edit.status = right.status;
      readings.editReading(edit);
    }
    settingsServices(ctx).updateSettings({
      economicLimit: { kind: 'production-temperature', temperatureC: DEMO_LIMIT_TEMPERATURE_C },
      reason: 'the invented demo scenario\'s economic limit',
    });

    const count = (sql: string): number => (fdb.db.prepare(sql).get() as { n: number }).n;
    return {
      invented: true,
      field,
      wells: INVENTED_WELLS.map((w) => w.name),
      reservoir: INVENTED_RESERVOIR.name,
      reservoirVersions: INVENTED_RESERVOIR.versions.length,
      liveReadings: count('SELECT count(*) AS n FROM readings WHERE deleted_ms IS NULL'),
      deletedReadings: count('SELECT count(*) AS n FROM readings WHERE deleted_ms IS NOT NULL'),
      flaggedReadings: count("SELECT count(*) AS n FROM readings WHERE flags <> '' AND deleted_ms IS NULL"),
      corrections: log.corrections.length,
      auditEntries: count('SELECT count(*) AS n FROM audit_log'),
    };
  });
  return build.immediate();
}
