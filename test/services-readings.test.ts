// Readings through the service layer: logging in the user's units, edits and soft deletes with their
// audit rows, the validation shared with the import, and listing.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { liquidDensityKgPerM3, liquidWater, saturationPressurePa } from '../src/shared/water/iapws97.js';
import { START_MS, WEEK_MS, fixture, inputError, iso, type Fixture } from './services-helpers.js';

let f: Fixture;
beforeEach(() => { f = fixture(); });
afterEach(() => f.fdb.close());

function log(extra: Record<string, unknown>, timeMs = START_MS) {
  return f.s.logReading({ well: 'W-1', time: iso(timeMs), productionTemperature: 150, ...extra });
}

describe('logReading converts the logged units (NIST SP 811 (2008) Appendix B.8 exact factors)', () => {
  it('°F and K become °C', () => {
    // T(°C) = (T(°F) − 32)·5/9: (298.9 − 32)·5/9 = 266.9·5/9 = 148.2777… °C (NIST SP 811 B.8)
    const r1 = log({ productionTemperature: 298.9, injectionTemperature: 158, temperatureUnit: 'degF' }).reading;
    expect(r1.productionTemperatureC).toBeCloseTo(148.27777777777777, 8);
    expect(r1.injectionTemperatureC).toBeCloseTo(70, 9); // (158 − 32)·5/9 = 70 °C
    expect(r1.entered.temperatureUnit).toBe('degF');
    // T(°C) = T(K) − 273.15 (NIST SP 811 §4.2.1.1): 421.15 K = 148 °C
    const r2 = log({ productionTemperature: 421.15, temperatureUnit: 'K' }, START_MS + WEEK_MS).reading;
    expect(r2.productionTemperatureC).toBe(148);
  });

  it('°C is stored exactly as typed', () => {
    expect(log({ productionTemperature: 176.2 }).reading.productionTemperatureC).toBe(176.2);
  });

  it('pressure units become Pa (shown in MPa)', () => {
    const cases: [number, string, number][] = [
      [24.1, 'bar', 2.41], // 1 bar = 10^5 Pa
      [2410, 'kPa', 2.41],
      [2.41, 'MPa', 2.41],
      // 1 psi = 0.45359237 kg × 9.80665 m/s² / (0.0254 m)² = 6894.757293168… Pa (NIST SP 811 B.8, from the exact pound, g and inch)
      [350, 'psi', (350 * 0.45359237 * 9.80665) / (0.0254 * 0.0254) / 1e6],
    ];
    cases.forEach(([value, unit, mpa], i) => {
      const r = log({ pressure: value, pressureUnit: unit }, START_MS + i * WEEK_MS).reading;
      expect(Math.abs((r.pressureMPa as number) / mpa - 1)).toBeLessThan(1e-11);
      expect(r.entered.pressureUnit).toBe(unit);
    });
  });

  it('mass flows become kg/s', () => {
    // 180 t/h = 180 000 kg / 3600 s = 50 kg/s; 36 000 kg/h = 10 kg/s
    expect(log({ flow: 180, flowUnit: 't/h' }).reading.massFlowKgPerS).toBe(50);
    expect(log({ flow: 36000, flowUnit: 'kg/h' }, START_MS + WEEK_MS).reading.massFlowKgPerS).toBe(10);
  });

  it('volume flows are kept as m3/s and converted to mass with the IAPWS-IF97 density at the logged state', () => {
    // IAPWS-IF97 (2007) Table 5: v(300 K, 3 MPa) = 0.100215168e-2 m³/kg, so ρ = 1/v; 300 K = 26.85 °C.
    const rho = 1 / 0.100215168e-2;
    // 180 m3/h = 180/3600 = 0.05 m³/s
    const res = log({ productionTemperature: 26.85, flow: 180, flowUnit: 'm3/h', pressure: 3, pressureUnit: 'MPa' });
    const r = res.reading;
    expect(r.volumeFlowM3PerS).toBe(0.05);
    expect(Math.abs((r.flowDensityKgPerM3 as number) / rho - 1)).toBeLessThan(1e-8);
    expect(Math.abs((r.massFlowKgPerS as number) / (0.05 * rho) - 1)).toBeLessThan(1e-8);
    expect(res.assumptions.join(' ')).toMatch(/IAPWS-IF97 water density .* the logged 3 MPa/);
  });

  it('US gallons and barrels are the NIST SP 811 exact volumes', () => {
    // 1 US gal = 3.785411784e-3 m³ (exact); 1000 gpm = 3.785411784 m³ / 60 s = 0.0630901964 m³/s
    const gpm = log({ flow: 1000, flowUnit: 'gpm', pressure: 2 }).reading;
    expect(gpm.volumeFlowM3PerS).toBeCloseTo(0.0630901964, 12);
    // 1 bbl = 42 US gal; 10 000 bbl/d = 420 000 × 3.785411784e-3 m³ / 86 400 s = 0.0184013045… m³/s
    const bbl = log({ flow: 10000, flowUnit: 'bbl/d', pressure: 2 }, START_MS + WEEK_MS).reading;
    expect(bbl.volumeFlowM3PerS).toBeCloseTo((420000 * 3.785411784e-3) / 86400, 12);
    // 50 L/s = 0.05 m³/s
    expect(log({ flow: 50, flowUnit: 'L/s', pressure: 2 }, START_MS + 2 * WEEK_MS).reading.volumeFlowM3PerS).toBe(0.05);
  });

  it('without a logged pressure the density is taken at saturation + 1 MPa, and that is stated', () => {
    const res = log({ productionTemperature: 150, flow: 180, flowUnit: 'm3/h' });
    // The rule of src/shared/contract/reading-rules.ts, evaluated with the IAPWS-IF97 engine (itself checked against Tables 5 and 35).
    const t = 150 + 273.15;
    const rho = liquidWater(t, saturationPressurePa(t) + 1e6).densityKgPerM3;
    // Within rounding of the full equation; bit for bit the import's density-only path (so duplicates match).
    expect(Math.abs(res.reading.flowDensityKgPerM3! / rho - 1)).toBeLessThan(1e-13);
    expect(res.reading.flowDensityKgPerM3).toBe(liquidDensityKgPerM3(t, saturationPressurePa(t) + 1e6));
    expect(res.assumptions[0]).toMatch(/saturation \+ 1 MPa/);
    // Compressed liquid near 150 °C is about 917 kg/m³ (recalled from memory; steam tables): a coarse sanity check.
    expect(rho).toBeGreaterThan(910);
    expect(rho).toBeLessThan(925);
  });
});

describe('logReading applies the same rules as the import', () => {
  const cases: [string, Record<string, unknown>, string, RegExp][] = [
    ['below −50 °C', { productionTemperature: -60 }, 'productionTemperature', /impossible temperature -60 °C/],
    ['above 400 °C', { productionTemperature: 400.5 }, 'productionTemperature', /impossible temperature 400.5 °C.*between -50 °C and 400 °C/],
    // 753 °F = (753 − 32)·5/9 = 400.56 °C
    ['above 400 °C in °F', { productionTemperature: 753, temperatureUnit: 'degF' }, 'productionTemperature', /753 degF = 400.56 °C/],
    ['an impossible injection temperature', { injectionTemperature: 1763.4 }, 'injectionTemperature', /impossible temperature/],
    ['a negative flow', { flow: -41.8, flowUnit: 'kg/s' }, 'flow', /negative flow -41.8 kg\/s/],
    ['a flow without its unit', { flow: 40 }, 'flowUnit', /needs its unit/],
    ['a unit without its flow', { flowUnit: 'kg/s' }, 'flowUnit', /given without a flow/],
    ['an unknown flow unit', { flow: 40, flowUnit: 'gpx' }, 'flowUnit', /unknown unit "gpx"/],
    ['a temperature unit that is a pressure unit', { temperatureUnit: 'bar' }, 'temperatureUnit', /pressure unit, not a temperature unit/],
    ['an unknown status', { status: 'running' }, 'status', /must be one of "producing", "shut-in", "test"/],
    ['a negative pressure', { pressure: -1 }, 'pressure', /absolute, above zero/],
    ['a zero pressure', { pressure: 0 }, 'pressure', /absolute, above zero/],
    // IAPWS-IF97 (2007) Table 35: ps(450 K ≈ 177 °C) = 0.932203564 MPa, so 0.3 MPa at 150 °C (ps 0.476 MPa) is steam.
    ['a volume flow of steam', { flow: 100, flowUnit: 'm3/h', pressure: 0.3 }, 'flow', /cannot convert the volume flow.*steam/],
    ['a bad flag', { flags: ['Bad!'] }, 'flags[0]', /lower-case letters, digits and dashes/],
  ];
  it.each(cases)('refuses %s, naming the field', (_what, extra, field, message) => {
    const e = inputError(() => log(extra));
    expect(e.where.field).toBe(field);
    expect(e.reason).toMatch(message);
  });

  it('accepts the boundaries −50 °C and 400 °C', () => {
    expect(log({ productionTemperature: -50 }).reading.productionTemperatureC).toBe(-50);
    expect(log({ productionTemperature: 400 }, START_MS + WEEK_MS).reading.productionTemperatureC).toBe(400);
  });

  it('needs the production temperature of a production well', () => {
    const e = inputError(() => f.s.logReading({ well: 'W-1', time: iso(START_MS), flow: 40, flowUnit: 'kg/s' }));
    expect(e.where.field).toBe('productionTemperature');
  });

  it('an injection well logs without one, but a volume flow then needs the injection temperature', () => {
    f.s.createWell({ field: 'Test field', name: 'W-2I', kind: 'injection' });
    const e = inputError(() => f.s.logReading({ well: 'W-2I', time: iso(START_MS), flow: 500, flowUnit: 'm3/h', pressure: 3.8 }));
    expect(e.where.field).toBe('flow');
    expect(e.reason).toMatch(/needs a production \(or injection\) temperature/);
    const ok = f.s.logReading({ well: 'W-2I', time: iso(START_MS), injectionTemperature: 70, flow: 500, flowUnit: 'm3/h', pressure: 3.8 });
    expect(ok.reading.productionTemperatureC).toBeNull();
    // density at the injection temperature 70 °C and 3.8 MPa (IAPWS-IF97 engine)
    expect(ok.reading.flowDensityKgPerM3).toBe(liquidWater(343.15, 3.8e6).densityKgPerM3);
  });

  it('a second reading at the same instant of the same well is a clear error', () => {
    const first = log({});
    const e = inputError(() => log({ productionTemperature: 151 }));
    expect(e.where.field).toBe('time');
    expect(e.reason).toBe(`W-1 already has a reading at ${iso(START_MS)} (reading ${first.reading.id}); edit that reading instead, or correct the time`);
  });

  it('an unknown well names the well', () => {
    const e = inputError(() => f.s.logReading({ well: 'W-9', time: iso(START_MS), productionTemperature: 150 }));
    expect(e.where.field).toBe('well');
    expect(e.reason).toMatch(/no well named "W-9"/);
  });
});

describe('edits and soft deletes write the audit log', () => {
  it('log, edit and delete each leave one audit row with who, old, new, when and why', () => {
    const id = log({ flow: 40, flowUnit: 'kg/s' }).reading.id;
    const edited = f.s.editReading({ id, productionTemperature: 151.5, reason: 'misread the gauge' });
    expect(edited.changed).toBe(true);
    expect(edited.reading.productionTemperatureC).toBe(151.5);
    expect(edited.reading.massFlowKgPerS).toBe(40);
    const deleted = f.s.deleteReading({ id, reason: 'entered for the wrong well' });
    expect(deleted.reading.deletedAt).not.toBeNull();

    const entries = f.s.auditLog({ entity: 'reading', entityId: id }).entries; // newest first
    expect(entries.map((e) => e.action)).toEqual(['delete', 'edit', 'create']);
    expect(entries.every((e) => e.who === 'tester')).toBe(true);
    const [del, edit, create] = entries;
    expect(create.reason).toBe('logged by hand');
    expect(create.old).toBeNull();
    expect(edit.reason).toBe('misread the gauge');
    expect((edit.old as Record<string, unknown>).production_temperature_c).toBe(150);
    expect((edit.new as Record<string, unknown>).production_temperature_c).toBe(151.5);
    expect(del.reason).toBe('entered for the wrong well');
    expect((del.new as Record<string, unknown>).deleted_ms).not.toBeNull();
    expect(Date.parse(del.at)).toBeGreaterThan(Date.parse(edit.at));
  });

  it('an edit that changes nothing writes no audit row', () => {
    const id = log({}).reading.id;
    const same = f.s.editReading({ id, productionTemperature: 150, reason: 'checked' });
    expect(same.changed).toBe(false);
    expect(f.s.auditLog({ entity: 'reading', entityId: id }).entries).toHaveLength(1);
  });

  it('a changed temperature converts a volume flow again with the new density', () => {
    const r = log({ productionTemperature: 150, flow: 180, flowUnit: 'm3/h', pressure: 2 }).reading;
    const e = f.s.editReading({ id: r.id, productionTemperature: 170, reason: 'wrong gauge' });
    const rho = liquidWater(170 + 273.15, 2e6).densityKgPerM3; // IAPWS-IF97 engine at the new state
    expect(e.reading.flowDensityKgPerM3).toBe(rho);
    expect(e.reading.massFlowKgPerS as number).toBeCloseTo(0.05 * rho, 9);
    expect(e.reading.volumeFlowM3PerS).toBe(0.05);
    expect(e.assumptions[0]).toMatch(/converted again/);
  });

  it('clears a value with null and refuses what it refuses on logging', () => {
    const r = log({ injectionTemperature: 70, pressure: 2 }).reading;
    expect(f.s.editReading({ id: r.id, pressure: null, reason: 'no gauge that day' }).reading.pressureMPa).toBeNull();
    expect(inputError(() => f.s.editReading({ id: r.id, productionTemperature: 500, reason: 'x' })).where.field).toBe('productionTemperature');
    expect(inputError(() => f.s.editReading({ id: r.id, productionTemperature: null, reason: 'x' })).where.field).toBe('productionTemperature');
    const other = log({}, START_MS + WEEK_MS).reading;
    const clash = inputError(() => f.s.editReading({ id: other.id, time: iso(START_MS), reason: 'x' }));
    expect(clash.where.field).toBe('time');
    expect(clash.reason).toMatch(/already has a reading/);
  });

  it('a deleted reading cannot be edited or deleted again; an edit needs a reason', () => {
    const id = log({}).reading.id;
    f.s.deleteReading({ id, reason: 'duplicate' });
    expect(inputError(() => f.s.editReading({ id, note: 'x', reason: 'x' })).reason).toMatch(/was deleted at/);
    expect(inputError(() => f.s.deleteReading({ id, reason: 'x' })).where.field).toBe('id');
    expect(inputError(() => f.s.editReading({ id: 999, note: 'x', reason: 'x' })).reason).toBe('no reading with id 999');
    expect(inputError(() => f.s.editReading({ id, note: 'x' } as never)).where.field).toBe('reason');
  });
});

describe('listReadings', () => {
  it('lists in time order within inclusive bounds, with or without the deleted ones', () => {
    const ids = [0, 1, 2, 3].map((k) => log({ productionTemperature: 150 - k }, START_MS + k * WEEK_MS).reading.id);
    f.s.deleteReading({ id: ids[1], reason: 'test' });
    const all = f.s.listReadings({ well: 'W-1' });
    expect(all.readings.map((r) => r.id)).toEqual([ids[0], ids[2], ids[3]]);
    expect(all.well.name).toBe('W-1');
    const window = f.s.listReadings({ well: 'W-1', from: iso(START_MS + WEEK_MS), to: iso(START_MS + 2 * WEEK_MS) });
    expect(window.readings.map((r) => r.id)).toEqual([ids[2]]);
    const withDeleted = f.s.listReadings({ well: 'W-1', includeDeleted: true });
    expect(withDeleted.readings.map((r) => r.id)).toEqual(ids);
    expect(withDeleted.readings[1].deletedAt).not.toBeNull();
    expect(inputError(() => f.s.listReadings({ well: 'W-1', from: iso(START_MS + WEEK_MS), to: iso(START_MS) })).where.field).toBe('to');
  });

  it('gives only the newest `latest` readings of the range, in time order, with the total of the range', () => {
    const ids = [0, 1, 2, 3, 4].map((k) => log({ productionTemperature: 150 - k }, START_MS + k * WEEK_MS).reading.id);
    f.s.deleteReading({ id: ids[3], reason: 'test' });
    const newest = f.s.listReadings({ well: 'W-1', latest: 2 });
    expect(newest.readings.map((r) => r.id)).toEqual([ids[2], ids[4]]);
    expect(newest.total).toBe(4);
    expect(f.s.listReadings({ well: 'W-1', latest: 2, includeDeleted: true }).readings.map((r) => r.id)).toEqual([ids[3], ids[4]]);
    expect(f.s.listReadings({ well: 'W-1', latest: 2, includeDeleted: true }).total).toBe(5);
    expect(f.s.listReadings({ well: 'W-1', latest: 10, to: iso(START_MS + WEEK_MS) })).toMatchObject({ total: 2 });
    expect(f.s.listReadings({ well: 'W-1', latest: 10, to: iso(START_MS + WEEK_MS) }).readings.map((r) => r.id)).toEqual([ids[0], ids[1]]);
    expect(f.s.listReadings({ well: 'W-1' }).total).toBe(4);
    expect(inputError(() => f.s.listReadings({ well: 'W-1', latest: 0 })).where.field).toBe('latest');
  });

  it('shows each reading in the contract shape: UTC instant, °C, kg/s, MPa, nulls for absent values', () => {
    const r = log({ flow: 45, flowUnit: 'kg/s', note: 'weekly round', flags: ['spike'] }).reading;
    expect(r).toEqual({
      id: r.id, well: 'W-1', time: '2024-01-01T00:00:00.000Z',
      productionTemperatureC: 150, injectionTemperatureC: null, massFlowKgPerS: 45, volumeFlowM3PerS: null,
      flowDensityKgPerM3: null, pressureMPa: null, status: 'producing', flags: ['spike'], note: 'weekly round',
      source: 'manual', importId: null, sourceLine: null,
      entered: { temperatureUnit: 'degC', flowUnit: 'kg/s', pressureUnit: null }, updatedAt: null, deletedAt: null,
    });
  });
});
