// The log book's pure logic (src/renderer/screens/log-model.ts, log-audit-model.ts): local wall-clock time in an IANA zone to
// the contract's UTC instant, the reading form to logReading / editReading requests with the back end's
// rules and messages, stored readings and audit entries as table text.
import { describe, expect, it } from 'vitest';
import type { Wire } from '../src/shared/contract/channels.js';
import type { AuditEntryJson, ReadingJson } from '../src/shared/contract/readings.js';
import { InputError } from '../src/shared/errors.js';
import { Display } from '../src/renderer/app/display.js';
import {
  buildEditRequest, buildLogRequest, emptyForm, flowPreview, formOfReading, instantToLocalInput, localToInstant,
  offsetText, readingRow, timeNote, type ReadingForm, type WellForForm,
} from '../src/renderer/screens/log-model.js';
import { auditChanges, wellAuditRows } from '../src/renderer/screens/log-audit-model.js';

const HOUR = 3_600_000;
const SI = new Display('si', 'Europe/Berlin');
const US = new Display('us', 'Europe/Berlin');

function reason(fn: () => unknown): { field: string | undefined; reason: string } {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return { field: e.where.field, reason: e.reason };
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('local time in the field zone → UTC instant', () => {
  it('summer and winter time in Europe/Berlin', () => {
    // CEST = UTC+2 from the last Sunday of March to the last Sunday of October (IANA tz database, EU rule): 12:00 → 10:00Z.
    const summer = localToInstant('2024-07-01T12:00', 'Europe/Berlin');
    expect(summer.iso).toBe('2024-07-01T10:00:00.000Z');
    expect(summer.kind).toBe('unique');
    expect(summer.offsetMs).toBe(2 * HOUR);
    // CET = UTC+1 in January (IANA tz database): 12:00 → 11:00Z.
    expect(localToInstant('2024-01-15T12:00', 'Europe/Berlin').iso).toBe('2024-01-15T11:00:00.000Z');
  });

  it('the demo field’s zone and a zone west of Greenwich', () => {
    // NZDT = UTC+13 in December (IANA tz database, Pacific/Auckland): 22:00 → 09:00Z the same day.
    expect(localToInstant('2025-12-22T22:00', 'Pacific/Auckland').iso).toBe('2025-12-22T09:00:00.000Z');
    // MDT = UTC−6 in July (IANA tz database, America/Denver): 12:00 → 18:00Z.
    expect(localToInstant('2024-07-01T12:00', 'America/Denver').iso).toBe('2024-07-01T18:00:00.000Z');
    // UTC needs no rules; seconds are kept.
    expect(localToInstant('2024-07-01T12:00:30', 'UTC').iso).toBe('2024-07-01T12:00:30.000Z');
  });

  it('a skipped hour is read with the offset before the change (as the CSV import, RFC 5545 §3.3.5)', () => {
    // 2024-03-31 is the last Sunday of March: Berlin clocks go 02:00 CET → 03:00 CEST (EU rule, IANA tz).
    // 02:30 does not exist; with the CET offset (+1) it is 01:30Z, which the wall clock shows as 03:30 CEST.
    const t = localToInstant('2024-03-31T02:30', 'Europe/Berlin');
    expect(t.kind).toBe('nonexistent');
    expect(t.iso).toBe('2024-03-31T01:30:00.000Z');
    expect(instantToLocalInput(t.ms, 'Europe/Berlin')).toBe('2024-03-31T03:30');
    expect(timeNote('2024-03-31T02:30', 'Europe/Berlin')).toMatch(/does not exist.*01:30 UTC.*03:30 local/);
  });

  it('a repeated hour is its first occurrence', () => {
    // 2024-10-27 is the last Sunday of October: 03:00 CEST → 02:00 CET, so 02:30 occurs twice;
    // the first is 02:30 CEST (UTC+2) = 00:30Z (EU rule, IANA tz; RFC 5545 §3.3.5).
    const t = localToInstant('2024-10-27T02:30', 'Europe/Berlin');
    expect(t.kind).toBe('ambiguous');
    expect(t.iso).toBe('2024-10-27T00:30:00.000Z');
    expect(timeNote('2024-10-27T02:30', 'Europe/Berlin')).toMatch(/occurs twice.*UTC\+02:00.*00:30 UTC/);
  });

  it('refuses what is not a date and time, and an unknown zone, naming the time field', () => {
    expect(reason(() => localToInstant('', 'UTC'))).toEqual({ field: 'time', reason: 'enter the date and time of the reading' });
    // 2023 is not a leap year (Gregorian calendar): there is no 29 February.
    expect(reason(() => localToInstant('2023-02-29T12:00', 'UTC')).field).toBe('time');
    expect(reason(() => localToInstant('12.07.2024 12:00', 'UTC')).field).toBe('time');
    expect(reason(() => localToInstant('2024-07-01T12:00', 'Mars/Olympus_Mons')).field).toBe('time');
  });

  it('back from an instant to the datetime-local text, and offsets in words', () => {
    expect(instantToLocalInput(Date.parse('2024-07-01T10:00:00Z'), 'Europe/Berlin')).toBe('2024-07-01T12:00'); // CEST, UTC+2
    expect(instantToLocalInput(Date.parse('2025-12-22T09:00:00Z'), 'Pacific/Auckland')).toBe('2025-12-22T22:00'); // NZDT, UTC+13
    expect(offsetText(2 * HOUR)).toBe('UTC+02:00');
    expect(offsetText(-3.5 * HOUR)).toBe('UTC−03:30'); // Newfoundland standard time, UTC−3:30 (IANA tz, America/St_Johns)
    expect(offsetText(0)).toBe('UTC+00:00');
  });
});

const PRODUCER: WellForForm = { name: 'KR-3', field: 'Kettle Ridge', kind: 'production' };
const INJECTOR: WellForForm = { name: 'KR-4I', field: 'Kettle Ridge', kind: 'injection' };

function form(values: Partial<ReadingForm>): ReadingForm {
  return { ...emptyForm('si', Date.parse('2024-07-01T10:00:00Z'), 'Europe/Berlin'), ...values };
}

describe('a new reading from the form', () => {
  it('builds the request in the units typed, with the instant in UTC', () => {
    const { request, errors, assumptions } = buildLogRequest(form({
      productionTemperature: '152.3', injectionTemperature: '70,1', flow: '42', pressure: '2.4', note: ' weekly round ', flags: 'Bad',
    }), PRODUCER, 'Europe/Berlin');
    expect(errors).toEqual({});
    expect(assumptions).toEqual([]);
    expect(request).toEqual({
      well: 'KR-3', field: 'Kettle Ridge', time: '2024-07-01T10:00:00.000Z', status: 'producing',
      productionTemperature: 152.3, injectionTemperature: 70.1, temperatureUnit: 'degC',
      flow: 42, flowUnit: 'kg/s', pressure: 2.4, pressureUnit: 'MPa', note: 'weekly round', flags: ['bad'],
    });
  });

  it('turns a volume flow into mass with the IAPWS-IF97 density, as the back end will', () => {
    // IAPWS-IF97 (2007) Table 5: at 300 K (26.85 °C) and 3 MPa, v = 0.100215168e-2 m³/kg.
    // 3.6 m³/h = 0.001 m³/s → 0.001 / 0.100215168e-2 = 0.99785293979 kg/s.
    const f = form({ productionTemperature: '26.85', flow: '3.6', flowUnit: 'm3/h', pressure: '3' });
    const preview = flowPreview(f);
    expect(preview?.massFlowKgPerS).toBeCloseTo(0.99785293979, 8);
    expect(preview?.note).toMatch(/IAPWS-IF97 water density 997\.8\d* kg\/m3 at 26\.85 °C and the logged 3 MPa/);
    const { request, assumptions } = buildLogRequest(f, PRODUCER, 'UTC');
    expect(request).toMatchObject({ flow: 3.6, flowUnit: 'm3/h', productionTemperature: 26.85 });
    expect(assumptions).toHaveLength(1);
    expect(flowPreview(form({ flow: '42', flowUnit: 'kg/s' }))).toBeNull();
  });

  it('shows the back end’s messages beside the fields they name', () => {
    const { request, errors } = buildLogRequest(form({
      time: '', productionTemperature: '500', flow: '-3', pressure: '0', flags: 'bad!', status: 'producing',
    }), PRODUCER, 'UTC');
    expect(request).toBeUndefined();
    expect(errors.time).toBe('enter the date and time of the reading');
    // The plausible range of reading-rules.ts: −50 °C to 400 °C.
    expect(errors.productionTemperature).toMatch(/^impossible temperature 500 °C/);
    expect(errors.flow).toMatch(/^negative flow -3 kg\/s/);
    expect(errors.pressure).toMatch(/^impossible pressure 0 MPa/);
    expect(errors.flags).toMatch(/lower-case letters, digits and dashes/);
  });

  it('the checks of a logged reading: a producer needs its temperature, any reading one value', () => {
    expect(buildLogRequest(form({ flow: '42' }), PRODUCER, 'UTC').errors).toEqual({
      productionTemperature: 'missing: a reading of the production well KR-3 needs its production temperature',
    });
    expect(buildLogRequest(form({}), INJECTOR, 'UTC').errors).toEqual({
      injectionTemperature: 'missing: a reading needs at least one value (temperature, flow or pressure)',
    });
    expect(buildLogRequest(form({ flow: '139.1' }), INJECTOR, 'UTC').request).toMatchObject({ flow: 139.1, flowUnit: 'kg/s' });
    expect(buildLogRequest(form({ flow: '500', flowUnit: 'gpm' }), INJECTOR, 'UTC').errors.flow).toMatch(/^a volume flow needs a production \(or injection\) temperature/);
    expect(buildLogRequest(form({ productionTemperature: 'warm' }), PRODUCER, 'UTC').errors.productionTemperature).toBe('not a number: "warm"');
  });

  it('sends °F as typed, with its unit (the back end converts)', () => {
    // 302 °F = (302 − 32)·5/9 = 150 °C (NIST SP 811 B.8): inside the plausible range.
    const { request } = buildLogRequest(form({ productionTemperature: '302', temperatureUnit: 'degF' }), PRODUCER, 'UTC');
    expect(request).toMatchObject({ productionTemperature: 302, temperatureUnit: 'degF' });
    expect(request?.flowUnit).toBeUndefined();
  });
});

/** A reading as the demo's hand-logged one (db audit row 13): °F, m³/h and bar. */
const LOGGED: Wire<ReadingJson> = {
  id: 2498, well: 'KR-1', time: '2025-12-22T09:00:00.000Z',
  productionTemperatureC: 147.5, injectionTemperatureC: null,
  massFlowKgPerS: 52.41293390316164, volumeFlowM3PerS: 0.05694444444444444, flowDensityKgPerM3: 920.42225390918,
  pressureMPa: 2.4, status: 'producing', flags: [], note: 'weekly round', source: 'manual', importId: null, sourceLine: null,
  entered: { temperatureUnit: 'degF', flowUnit: 'm3/h', pressureUnit: 'bar' }, updatedAt: null, deletedAt: null,
};

describe('editing a stored reading', () => {
  it('shows each value in the unit it was entered in', () => {
    const f = formOfReading(LOGGED, 'Pacific/Auckland', 'si');
    // 147.5 °C · 9/5 + 32 = 297.5 °F; 0.056944… m³/s · 3600 = 205 m³/h; 2.4 MPa = 24 bar (NIST SP 811 B.8).
    expect(f).toMatchObject({ productionTemperature: '297.5', temperatureUnit: 'degF', flow: '205', flowUnit: 'm3/h', pressure: '24', pressureUnit: 'bar' });
    // 09:00Z + 13 h (NZDT, IANA tz) = 22:00 local.
    expect(f.time).toBe('2025-12-22T22:00');
  });

  it('sends only what changed, with its unit, and needs a reason', () => {
    const initial = formOfReading(LOGGED, 'Pacific/Auckland', 'si');
    const well: WellForForm = { name: 'KR-1', field: 'Kettle Ridge', kind: 'production' };
    expect(buildEditRequest(LOGGED, initial, initial, 'typo', well, 'Pacific/Auckland').errors).toEqual({ form: 'nothing was changed' });
    expect(buildEditRequest(LOGGED, initial, { ...initial, note: 'x' }, '  ', well, 'Pacific/Auckland').errors.reason).toMatch(/reason/);
    const { request } = buildEditRequest(LOGGED, initial, { ...initial, productionTemperature: '298', pressure: '' }, 'misread gauge', well, 'Pacific/Auckland');
    expect(request).toEqual({ id: 2498, reason: 'misread gauge', productionTemperature: 298, temperatureUnit: 'degF', pressure: null });
    // A changed unit re-reads the value beside it: 205 typed with kg/s now means 205 kg/s.
    const unit = buildEditRequest(LOGGED, initial, { ...initial, flowUnit: 'kg/s' }, 'was a mass flow', well, 'Pacific/Auckland').request;
    expect(unit).toEqual({ id: 2498, reason: 'was a mass flow', flow: 205, flowUnit: 'kg/s' });
    // 23:00 NZDT (UTC+13) = 10:00Z.
    expect(buildEditRequest(LOGGED, initial, { ...initial, time: '2025-12-22T23:00' }, 'late', well, 'Pacific/Auckland').request?.time).toBe('2025-12-22T10:00:00.000Z');
    expect(buildEditRequest(LOGGED, initial, { ...initial, productionTemperature: '' }, 'x', well, 'Pacific/Auckland').errors.productionTemperature)
      .toMatch(/needs its production temperature/);
  });
});

describe('readings and the audit trail as text', () => {
  it('a reading in SI and US units', () => {
    const si = readingRow(LOGGED, new Display('si', 'Pacific/Auckland'));
    expect(si).toMatchObject({ time: '2025-12-22 22:00', productionTemperature: '147.5 °C', injectionTemperature: '—', flow: '52.4 kg/s', pressure: '2.40 MPa', status: 'producing', source: 'by hand' });
    expect(si.flowAsLogged).toBe('logged as 205 m³/h at 920.4 kg/m³');
    // 2.4 MPa / 6894.757 Pa/psi = 348.09 psi (NIST SP 811 B.8); 147.5 °C = 297.5 °F.
    expect(readingRow(LOGGED, new Display('us', 'UTC'))).toMatchObject({ pressure: '348 psia', productionTemperature: '297.5 °F' });
  });

  const edit: Wire<AuditEntryJson> = {
    id: 9, at: '2026-12-01T10:00:00.000Z', who: 'Kettle Ridge operator (invented)', action: 'edit', entity: 'reading', entityId: 745,
    // The demo's correction of a slipped decimal point (db audit row 9): 16.19 → 161.94 °C.
    old: { id: 745, well_id: 2, time_ms: 1461574800000, production_temperature_c: 16.19, status: 'producing', note: '', flags: '', updated_ms: null },
    new: { id: 745, well_id: 2, time_ms: 1461574800000, production_temperature_c: 161.94, status: 'producing', note: '', flags: '', updated_ms: 1796168475020 },
    reason: 'decimal point slipped on entry; value taken from the field sheet',
  };

  it('an edit as old → new, in the display units', () => {
    expect(auditChanges(edit, SI)).toEqual([{ label: 'production temperature', from: '16.2 °C', to: '161.9 °C' }]);
    // 161.94 °C · 1.8 + 32 = 323.492 °F; 16.19 · 1.8 + 32 = 61.142 °F.
    expect(auditChanges(edit, US)).toEqual([{ label: 'production temperature', from: '61.1 °F', to: '323.5 °F' }]);
  });

  it('a flow correction is one line, a logged reading lists its values only', () => {
    // The demo's dropped digit (db audit row 10): 4.2 → 42.1 kg/s, logged as a mass flow.
    const flow: Wire<AuditEntryJson> = {
      ...edit,
      old: { well_id: 3, mass_flow_kg_s: 4.2, normalised_mass_flow_kg_s: 4.2, flow_unit: 'kg/s' },
      new: { well_id: 3, mass_flow_kg_s: 42.1, normalised_mass_flow_kg_s: 42.1, flow_unit: 'kg/s' },
    };
    expect(auditChanges(flow, SI)).toEqual([{ label: 'mass flow', from: '4.2 kg/s', to: '42.1 kg/s' }]);
    // A volume flow re-converted at a new density: 41.93 and 41.88 kg/s both read 41.9 kg/s at one decimal.
    const small = { ...flow, old: { well_id: 3, normalised_mass_flow_kg_s: 41.93 }, new: { well_id: 3, normalised_mass_flow_kg_s: 41.88 } };
    expect(auditChanges(small, SI)).toEqual([{ label: 'mass flow', from: '41.930 kg/s', to: '41.880 kg/s' }]);
    const logged: Wire<AuditEntryJson> = {
      ...edit, action: 'create', old: null,
      new: {
        well_id: 1, time_ms: Date.UTC(2025, 11, 22, 9), production_temperature_c: 147.5, injection_temperature_c: null, temperature_unit: 'degF',
        mass_flow_kg_s: null, volume_flow_m3_s: 205 / 3600, flow_unit: 'm3/h', normalised_mass_flow_kg_s: 52.41, flow_density_kg_m3: 920.4,
        pressure_pa: 2.4e6, pressure_unit: 'bar', status: 'producing', note: '', flags: '', deleted_ms: null,
      },
    };
    // 205/3600 m³/s shown in m³/h is 205.0 (Display's SI volume flow unit).
    expect(auditChanges(logged, new Display('si', 'UTC'))).toEqual([
      { label: 'time', from: '—', to: '2025-12-22 09:00' },
      { label: 'production temperature', from: '—', to: '147.5 °C' },
      { label: 'mass flow', from: '—', to: '52.4 kg/s' },
      { label: 'volume flow as logged', from: '—', to: '205.0 m³/h' },
      { label: 'pressure', from: '—', to: '2.40 MPa' },
      { label: 'status', from: '—', to: 'producing' },
    ]);
  });

  it('keeps the entries of one well, newest first', () => {
    const other = { ...edit, id: 10, old: { ...(edit.old as object), well_id: 3 }, new: { ...(edit.new as object), well_id: 3 } };
    const created: Wire<AuditEntryJson> = {
      id: 6, at: '2026-12-01T09:00:00.000Z', who: 'demo', action: 'create', entity: 'well', entityId: 2, old: null,
      new: { id: 2, name: 'KR-2', kind: 'production', referenceTemperatureC: 70, productionStartMs: null }, reason: '',
    };
    const rows = wellAuditRows([created, other, edit], 2, new Display('si', 'UTC'));
    expect(rows.map((r) => r.id)).toEqual([9, 6]);
    expect(rows[0]).toMatchObject({ action: 'edited', what: 'reading of 2016-04-25 09:00', reason: edit.reason });
    expect(rows[1]).toMatchObject({ action: 'created', what: 'well KR-2' });
    expect(rows[1].changes).toEqual([
      { label: 'name', from: '—', to: 'KR-2' }, { label: 'kind', from: '—', to: 'production' }, { label: 'Tref', from: '—', to: '70.0 °C' },
    ]);
  });
});
