// The field log's settings: built-in defaults, checked and audited changes, a well's own economic
// limit, what is stored across a reopen, the demo scenario's settings, and aboutFieldLog.
import { readFileSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { openDatabase } from '../src/main/db/database.js';
import { loadMigrations } from '../src/main/db/migrations.js';
import { createServices } from '../src/main/services/index.js';
import { economicLimitOf } from '../src/main/services/settings.js';
import { freshDb, T0_MS, tempDir } from './db-helpers.js';
import { START_MS, fixture, inputError, iso } from './services-helpers.js';

const PACKAGE = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string; scripts: Record<string, string> };

describe('getSettings on a new field log', () => {
  it('gives the built-in defaults, each marked as a default', () => {
    const fdb = freshDb();
    try {
      expect(createServices(fdb).getSettings()).toEqual({
        units: 'si',
        timeZone: null, // each field's own zone
        economicLimit: { kind: 'production-temperature', temperatureC: 100 }, // a placeholder until the plant's own limit is set
        backgroundHeatFlowWPerM2: 0.06, // continental average conductive heat flow, 60 mW/m² (common practice)
        horizonYears: 30, // the forecast's own default horizon (src/main/services/forecasts.ts)
        wellEconomicLimits: {},
        source: { units: 'default', timeZone: 'default', economicLimit: 'default', backgroundHeatFlowWPerM2: 'default', horizonYears: 'default' },
        updatedAt: null,
      });
    } finally {
      fdb.close();
    }
  });
});

describe('updateSettings', () => {
  it('stores what it is given, the zone in its canonical spelling, and writes one audit row per change', () => {
    const fdb = freshDb();
    try {
      const s = createServices(fdb, { who: 'tester' });
      const after = s.updateSettings({ units: 'us', timeZone: 'europe/berlin', horizonYears: 25, reason: 'our plant' });
      expect(after).toMatchObject({ units: 'us', timeZone: 'Europe/Berlin', horizonYears: 25, economicLimit: { temperatureC: 100 } });
      expect(after.source).toEqual({ units: 'set', timeZone: 'set', economicLimit: 'default', backgroundHeatFlowWPerM2: 'default', horizonYears: 'set' });
      expect(after.updatedAt).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
      expect(s.getSettings()).toEqual(after);

      const audit = s.auditLog({ entity: 'settings' }).entries;
      expect(audit).toHaveLength(1);
      expect(audit[0]).toMatchObject({
        who: 'tester', action: 'edit', entity: 'settings', entityId: 1, reason: 'our plant',
        old: { units: null, timeZone: null, horizonYears: null }, new: { units: 'us', timeZone: 'Europe/Berlin', horizonYears: 25 },
      });

      // The same values again change nothing and write nothing.
      s.updateSettings({ units: 'us', timeZone: 'Europe/Berlin' });
      expect(s.auditLog({ entity: 'settings' }).entries).toHaveLength(1);
      s.updateSettings({ units: 'si', reason: 'back' });
      const second = s.auditLog({ entity: 'settings' }).entries[0]; // newest first
      expect(second).toMatchObject({ old: { units: 'us' }, new: { units: 'si' }, reason: 'back' });
      // null is a value: instants in each field's own zone, chosen on purpose.
      expect(s.updateSettings({ timeZone: null })).toMatchObject({ timeZone: null, source: { timeZone: 'set' } });
    } finally {
      fdb.close();
    }
  });

  it('refuses a bad value, naming it, and stores nothing of the request', () => {
    const fdb = freshDb();
    try {
      const s = createServices(fdb);
      const zone = inputError(() => s.updateSettings({ units: 'us', timeZone: 'Mars/Olympus_Mons' }));
      expect(zone.where.field).toBe('timeZone');
      expect(zone.reason).toMatch(/unknown time zone/);
      expect(inputError(() => s.updateSettings({ horizonYears: 0 })).where.field).toBe('horizonYears');
      expect(inputError(() => s.updateSettings({ backgroundHeatFlowWPerM2: -0.06 })).where.field).toBe('backgroundHeatFlowWPerM2');
      expect(inputError(() => s.updateSettings({ economicLimit: { kind: 'pressure' } } as never)).where.field).toBe('economicLimit.kind');
      expect(inputError(() => s.updateSettings({ colour: 'blue' } as never)).where.field).toBe('colour');
      expect(inputError(() => s.updateSettings('si' as never)).reason).toBe('must be an object (got string)');
      expect(s.getSettings().source.units).toBe('default'); // the refused request left units alone too
      expect(s.auditLog({ entity: 'settings' }).entries).toHaveLength(0);
    } finally {
      fdb.close();
    }
  });

  it('keeps a well\'s own limit by well id, for production wells that exist, and removes it on null', () => {
    const f = fixture();
    try {
      const w1 = f.s.getWell({ well: 'W-1' }).well.id;
      const inj = f.s.createWell({ field: 'Test field', name: 'I-1', kind: 'injection' }).id;
      const own = { kind: 'theta', thetaK: 25 } as const;
      const after = f.s.updateSettings({ economicLimit: { kind: 'power', powerW: 2e6 }, wellEconomicLimits: { [String(w1)]: own } });
      expect(after.wellEconomicLimits).toEqual({ [String(w1)]: own });
      expect(economicLimitOf(after, w1)).toEqual({ limit: own, own: true });
      expect(economicLimitOf(after, inj)).toEqual({ limit: { kind: 'power', powerW: 2e6 }, own: false });

      expect(inputError(() => f.s.updateSettings({ wellEconomicLimits: { 999: own } })).where.field).toBe('wellEconomicLimits.999');
      expect(inputError(() => f.s.updateSettings({ wellEconomicLimits: { [String(inj)]: own } })).reason).toMatch(/injection well/);
      expect(inputError(() => f.s.updateSettings({ wellEconomicLimits: { 'W-1': own } } as never)).where.field).toBe('wellEconomicLimits.W-1');

      const removed = f.s.updateSettings({ wellEconomicLimits: { [String(w1)]: null }, reason: 'use the field\'s' });
      expect(removed.wellEconomicLimits).toEqual({});
      const audit = f.s.auditLog({ entity: 'settings' }).entries[0];
      expect(audit.old).toEqual({ [`wellEconomicLimit.${w1}`]: own });
      expect(audit.new).toEqual({ [`wellEconomicLimit.${w1}`]: null });
    } finally {
      f.fdb.close();
    }
  });

  it('is kept in the field log across a reopen; a stored value edited by hand into nonsense counts as not set', () => {
    const file = join(tempDir(), 'settings.sqlite');
    const first = openDatabase(file, { now: () => T0_MS });
    createServices(first).updateSettings({ units: 'us', backgroundHeatFlowWPerM2: 0.09 });
    first.close();
    const again = openDatabase(file);
    try {
      const s = createServices(again);
      // T0_MS = 2025-03-01T12:00:00Z (db-helpers.ts)
      expect(s.getSettings()).toMatchObject({ units: 'us', backgroundHeatFlowWPerM2: 0.09, updatedAt: '2025-03-01T12:00:00.000Z' });
      again.db.prepare("UPDATE settings SET value_json = '\"furlongs\"' WHERE key = 'units'").run();
      expect(s.getSettings()).toMatchObject({ units: 'si', source: { units: 'default', backgroundHeatFlowWPerM2: 'set' } });
    } finally {
      again.close();
    }
  });
});

describe('the demo scenario', () => {
  it('sets the economic limit that `npm run demo` forecasts with, in the audit log', () => {
    const fdb = freshDb();
    try {
      const s = createServices(fdb);
      s.buildDemo();
      // package.json's demo script: `tauwell forecast … --limit-temp 115`.
      const limitTemp = Number(/--limit-temp (\d+(?:\.\d+)?)/.exec(PACKAGE.scripts.demo)?.[1]);
      expect(limitTemp).toBe(115);
      const settings = s.getSettings();
      expect(settings.economicLimit).toEqual({ kind: 'production-temperature', temperatureC: limitTemp });
      expect(settings.source.economicLimit).toBe('set');
      expect(s.auditLog({ entity: 'settings' }).entries.map((e) => e.who)).toEqual(['Kettle Ridge operator (invented)']);
    } finally {
      fdb.close();
    }
  });
});

describe('aboutFieldLog', () => {
  it('names the open file, its schema, the versions and what it holds', () => {
    const file = join(tempDir(), 'about.sqlite');
    const fdb = openDatabase(file);
    try {
      const s = createServices(fdb, { who: 'tester' });
      s.createField({ name: 'F', timeZone: 'UTC' });
      s.createWell({ field: 'F', name: 'W', kind: 'production', referenceTemperatureC: 70 });
      const ids = [0, 1, 2].map((k) => s.logReading({ well: 'W', time: iso(START_MS + k * 3_600_000), productionTemperature: 150 }).reading.id);
      s.deleteReading({ id: ids[1], reason: 'entered twice' });
      const about = s.aboutFieldLog();
      expect(about).toEqual({
        path: resolve(file),
        sizeBytes: statSync(file).size,
        schemaVersion: loadMigrations().length, // migrations/ 0001…000n
        appVersion: PACKAGE.version,
        engineVersion: `tauwell ${PACKAGE.version}`, // as stored fits name it (src/main/services/fit-store.ts)
        fields: 1,
        wells: 1,
        liveReadings: 2, // three logged, one deleted
      });
      expect(about.schemaVersion).toBe(4);
    } finally {
      fdb.close();
    }
  });

  it('says an in-memory log has no path', () => {
    const fdb = openDatabase(':memory:');
    try {
      expect(createServices(fdb).aboutFieldLog()).toMatchObject({ path: null, sizeBytes: null, fields: 0, wells: 0, liveReadings: 0 });
    } finally {
      fdb.close();
    }
  });
});
