// Fields, wells and reservoirs through the service layer: listing with the latest reading, naming
// wells across fields, reservoir parameter versions and their theory.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { START_MS, WEEK_MS, fixture, inputError, iso, type Fixture } from './services-helpers.js';

let f: Fixture;
beforeEach(() => { f = fixture(); });
afterEach(() => f.fdb.close());

// Granite slab worked example (hand arithmetic, DOMAIN.md §2, as in test/cli.test.ts):
//   z1 = (70 − 10)/0.03 = 2000 m; C = 2700·800·1e6·(5000 − 2000) = 6.48e15 J/K;
//   τ = 6.48e15/(50·4186) = 3.0960344e10 s. Doubling the area doubles C and τ.
const GRANITE = {
  kind: 'hot-dry-rock', surfaceTemperature: 10, gradient: 0.03, minUsefulTemperature: 70, maxDepth: 5000,
  area: 1e6, rockDensity: 2700, rockSpecificHeat: 800, massFlow: 50, fluid: { density: 1000, specificHeat: 4186 },
};

describe('listWells', () => {
  it('lists each field with its wells and each well\'s latest live reading', () => {
    f.s.createWell({ field: 'Test field', name: 'W-2I', kind: 'injection' });
    f.s.logReading({ well: 'W-1', time: iso(START_MS), productionTemperature: 150 });
    const latest = f.s.logReading({ well: 'W-1', time: iso(START_MS + WEEK_MS), productionTemperature: 149, flow: 40, flowUnit: 'kg/s' });
    const deleted = f.s.logReading({ well: 'W-1', time: iso(START_MS + 2 * WEEK_MS), productionTemperature: 148 });
    f.s.deleteReading({ id: deleted.reading.id, reason: 'test' });

    const list = f.s.listWells();
    expect(list.fields).toHaveLength(1);
    const field = list.fields[0];
    expect(field.name).toBe('Test field');
    expect(field.timeZone).toBe('UTC');
    expect(field.wells.map((w) => w.name)).toEqual(['W-1', 'W-2I']);
    const [w1, w2] = field.wells;
    expect(w1.kind).toBe('production');
    expect(w1.referenceTemperatureC).toBe(70);
    expect(w1.productionStart).toBe(iso(START_MS));
    expect(w1.liveReadings).toBe(2);
    expect(w1.latestReading).toEqual(latest.reading); // the deleted, later one does not count
    expect(w2.liveReadings).toBe(0);
    expect(w2.latestReading).toBeNull();
  });

  it('a well name used in two fields needs the field', () => {
    f.s.createField({ name: 'Other field', timeZone: 'europe/berlin' });
    expect(f.s.listWells({ field: 'Other field' }).fields[0].timeZone).toBe('Europe/Berlin'); // stored in the canonical IANA spelling
    f.s.createWell({ field: 'Other field', name: 'W-1', kind: 'production' });
    const e = inputError(() => f.s.getWell({ well: 'W-1' }));
    expect(e.where.field).toBe('field');
    expect(e.reason).toMatch(/2 fields have a well named "W-1"/);
    expect(f.s.getWell({ well: 'W-1', field: 'Other field' }).field.name).toBe('Other field');
    expect(inputError(() => f.s.getWell({ well: 'W-1', field: 'Nowhere' })).reason).toMatch(/no field named "Nowhere"; the field log has "Other field", "Test field"/);
  });

  it('refuses an unknown time zone, a duplicate name and a reservoir of another field', () => {
    expect(inputError(() => f.s.createField({ name: 'Z', timeZone: 'Mars/Olympus' })).where.field).toBe('timeZone');
    expect(inputError(() => f.s.createWell({ field: 'Test field', name: 'W-1', kind: 'production' })).reason).toMatch(/already has a well named "W-1"/);
    f.s.createField({ name: 'Other field' });
    f.s.createReservoir({ field: 'Other field', name: 'R' });
    expect(inputError(() => f.s.createWell({ field: 'Test field', name: 'W-3', kind: 'production', reservoir: 'R' })).reason).toMatch(/has no reservoir named "R"/);
  });

  it('updateWell changes Tref and production start with an audit row', () => {
    const w = f.s.updateWell({ well: 'W-1', referenceTemperatureC: 65, productionStart: null, reason: 'Tref is the reinjection temperature' });
    expect(w.referenceTemperatureC).toBe(65);
    expect(w.productionStart).toBeNull();
    const audit = f.s.auditLog({ entity: 'well', entityId: w.id }).entries;
    expect(audit[0].action).toBe('edit');
    expect(audit[0].reason).toBe('Tref is the reinjection temperature');
  });
});

describe('reservoir parameter versions', () => {
  it('adds versions as new rows, lists them oldest first, and evaluates the latest or a named one', () => {
    f.s.createReservoir({ field: 'Test field', name: 'Slab' });
    f.s.addReservoirVersion({ reservoir: 'Slab', params: GRANITE, note: 'first' });
    f.s.addReservoirVersion({ reservoir: 'Slab', params: { ...GRANITE, area: 2e6 }, note: 'area doubled' });
    const list = f.s.listReservoirVersions({ reservoir: 'Slab' });
    expect(list.reservoir.versions).toBe(2);
    expect(list.versions.map((v) => [v.version, v.note, v.recordedBy])).toEqual([[1, 'first', 'tester'], [2, 'area doubled', 'tester']]);
    expect(list.versions[0].params).toEqual(GRANITE); // version 1 is never rewritten

    const latest = f.s.reservoirTheory({ reservoir: 'Slab' });
    expect(latest.version.version).toBe(2);
    expect(latest.theory.heatCapacity.value).toBeCloseTo(2 * 6.48e15, -3); // worked example above, area doubled
    const first = f.s.reservoirTheory({ reservoir: 'Slab', version: 1 });
    expect(first.theory.heatCapacity.value).toBeCloseTo(6.48e15, -3);
    expect(Math.abs(first.theory.tau.value / 3.0960344e10 - 1)).toBeLessThan(1e-7);
    expect(inputError(() => f.s.reservoirTheory({ reservoir: 'Slab', version: 3 })).where.field).toBe('version');
  });

  it('refuses parameters the theory cannot use, naming the key', () => {
    f.s.createReservoir({ field: 'Test field', name: 'Slab' });
    const e = inputError(() => f.s.addReservoirVersion({ reservoir: 'Slab', params: { ...GRANITE, gradient: -0.03 } }));
    expect(e.where.field).toBe('params.gradient');
    const water = inputError(() => f.s.addReservoirVersion({ reservoir: 'Slab', params: { ...GRANITE, fluid: { iapws: { temperature: 400, pressure: 8 } } } }));
    expect(water.where.field).toBe('params.fluid.iapws.temperature');
    expect(water.reason).toMatch(/outside IAPWS-IF97 region 1/);
    expect(f.s.listReservoirVersions({ reservoir: 'Slab' }).versions).toHaveLength(0);
  });
});
