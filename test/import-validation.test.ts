// Row validation: every data row ends as a reading or as a rejection whose one-line reason names the
// column and the value. Check values: IAPWS-IF97 (2007) Tables 5 and 35 for water density; NIST SP 811
// (2008) B.8 for °F → °C, (T − 32)·5/9; the rest are worked by hand in the comments.
import { describe, expect, it } from 'vitest';
import { saturationPressurePa, liquidWater } from '../src/shared/water/iapws97.js';
import { readCsvText } from './import-helpers.js';

const HEADER = 'time,well,T_prod (C),T_inj (C),flow (kg/s),WHP (MPa),status,note';
const GOOD = '2024-01-01T00:00:00Z,GT-1,175.5,60,40,2.5,producing,ok';

async function rejectionOf(row: string, header = HEADER, options = {}): Promise<{ reason: string; field: string | null; line: number; raw: string }> {
  const r = await readCsvText(`${header}\n${row}\n`, options);
  expect(r.readings).toHaveLength(0);
  expect(r.rejections).toHaveLength(1);
  return r.rejections[0];
}

describe('a valid row', () => {
  it('becomes a reading with SI values and the units it was entered in', async () => {
    const r = await readCsvText(`${HEADER}\n${GOOD}\n`);
    expect(r.readings).toEqual([{
      line: 2,
      raw: GOOD,
      wellName: 'GT-1',
      timeMs: Date.parse('2024-01-01T00:00:00Z'),
      productionTemperatureC: 175.5,
      injectionTemperatureC: 60,
      temperatureUnit: 'degC',
      massFlowKgPerS: 40,
      volumeFlowM3PerS: null,
      flowUnit: 'kg/s',
      normalisedMassFlowKgPerS: 40,
      flowDensityKgPerM3: null,
      pressurePa: 2.5e6,
      pressureUnit: 'MPa',
      status: 'producing',
      note: 'ok',
    }]);
    expect(r.counts).toMatchObject({ rowsRead: 1, readings: 1, rejections: 0 });
  });

  it('converts °F, K, t/h, psi and bar as NIST SP 811 defines them', async () => {
    const r = await readCsvText('time,well,Temp (°F),Return temp (K),flow (t/h),WHP (psi)\n2024-01-01T00:00Z,A,350,333.15,144,100\n');
    const x = r.readings[0];
    expect(x.productionTemperatureC).toBeCloseTo(((350 - 32) * 5) / 9, 12); // 176.666… °C
    expect(x.injectionTemperatureC).toBeCloseTo(60, 12); // 333.15 K − 273.15
    expect(x.massFlowKgPerS).toBeCloseTo(40, 12); // 144 t/h = 144 000 kg / 3600 s
    expect(x.pressurePa).toBeCloseTo(100 * 6894.757293168361, 6); // 1 psi = 0.45359237 kg · 9.80665 m/s² / 0.0254² m²
    expect(x).toMatchObject({ temperatureUnit: 'degF', flowUnit: 't/h', pressureUnit: 'psi' });
  });

  it('optional cells may be empty; empty status means producing; a short row leaves optional columns empty', async () => {
    const r = await readCsvText(`${HEADER}\n2024-01-01T00:00Z,GT-1,175.5,,,,,\n2024-01-02T00:00Z,GT-1,176\n`);
    expect(r.rejections).toEqual([]);
    for (const x of r.readings) {
      expect(x).toMatchObject({ injectionTemperatureC: null, massFlowKgPerS: null, flowUnit: null, normalisedMassFlowKgPerS: null, pressurePa: null, pressureUnit: null, status: 'producing', note: '' });
    }
  });

  it.each([
    ['on', 'producing'], ['Online', 'producing'], ['P', 'producing'], ['producing', 'producing'],
    ['off', 'shut-in'], ['Shut in', 'shut-in'], ['shut-in', 'shut-in'], ['SI', 'shut-in'],
    ['test', 'test'], ['Testing', 'test'], [' TEST ', 'test'],
  ])('status %j is %s', async (text, status) => {
    const r = await readCsvText(`time,well,temp,status\n2024-01-01T00:00Z,A,150,${text}\n`);
    expect(r.readings[0].status).toBe(status);
  });

  it('the well option names every row; a well column that agrees (or is empty) is fine', async () => {
    const r = await readCsvText('time,well,temp\n2024-01-01T00:00Z,GT-1,150\n2024-01-02T00:00Z,,151\n', { well: 'GT-1' });
    expect(r.readings.map((x) => x.wellName)).toEqual(['GT-1', 'GT-1']);
    const noColumn = await readCsvText('time,temp\n2024-01-01T00:00Z,150\n', { well: 'GT-9' });
    expect(noColumn.readings[0].wellName).toBe('GT-9');
    expect(noColumn.info.well).toBe('GT-9');
  });
});

describe('each rejection reason', () => {
  it.each([
    ['unparseable timestamp', 'yesterday,GT-1,175.5,60,40,2.5,p,', 'time', 'column "time" (time): "yesterday" is not a timestamp (ISO 8601 such as 2024-03-01T08:00:00Z, a numeric date such as 01/03/2024 with --date-order, or a spreadsheet serial date)'],
    ['impossible date', '2024-02-30T00:00Z,GT-1,175.5,60,40,2.5,p,', 'time', 'column "time" (time): "2024-02-30T00:00Z" has day 30; February 2024 has 29 days'],
    ['unparseable production temperature', '2024-01-01T00:00Z,GT-1,hot,60,40,2.5,p,', 'T_prod (C)', 'column "T_prod (C)" (production temperature): "hot" is not a number'],
    ['unparseable injection temperature', '2024-01-01T00:00Z,GT-1,175,6O,40,2.5,p,', 'T_inj (C)', 'column "T_inj (C)" (injection temperature): "6O" is not a number'],
    ['unparseable flow', '2024-01-01T00:00Z,GT-1,175,60,40 kg/s,2.5,p,', 'flow (kg/s)', 'column "flow (kg/s)" (flow): "40 kg/s" is not a number'],
    ['unparseable pressure', '2024-01-01T00:00Z,GT-1,175,60,40,2.5.1,p,', 'WHP (MPa)', 'column "WHP (MPa)" (wellhead pressure): "2.5.1" is not a number'],
    ['production temperature below −50 °C', '2024-01-01T00:00Z,GT-1,-60,60,40,2.5,p,', 'T_prod (C)', 'column "T_prod (C)" (production temperature): "-60" is -60 °C, below -50 °C: physically impossible for these plants (a unit mix-up or a sensor fault?)'],
    ['production temperature above 400 °C', '2024-01-01T00:00Z,GT-1,450,60,40,2.5,p,', 'T_prod (C)', 'column "T_prod (C)" (production temperature): "450" is 450 °C, above 400 °C: physically impossible for these plants (a unit mix-up or a sensor fault?)'],
    ['injection temperature above 400 °C', '2024-01-01T00:00Z,GT-1,175,401,40,2.5,p,', 'T_inj (C)', 'column "T_inj (C)" (injection temperature): "401" is 401 °C, above 400 °C: physically impossible for these plants (a unit mix-up or a sensor fault?)'],
    ['negative flow', '2024-01-01T00:00Z,GT-1,175,60,-3.5,2.5,p,', 'flow (kg/s)', 'column "flow (kg/s)" (flow): "-3.5" is negative; a produced flow cannot be below zero'],
    ['pressure not above zero', '2024-01-01T00:00Z,GT-1,175,60,40,0,p,', 'WHP (MPa)', 'column "WHP (MPa)" (wellhead pressure): "0" is not above zero; wellhead pressures are absolute (MPa)'],
    ['unknown status', '2024-01-01T00:00Z,GT-1,175,60,40,2.5,flowing,', 'status', 'column "status" (status): "flowing" is not a status: use producing (on, online, p), shut-in (off, shut in, si) or test (testing)'],
    ['empty time', ',GT-1,175,60,40,2.5,p,', 'time', 'column "time" (time) is empty; it is required'],
    ['empty well', '2024-01-01T00:00Z, ,175,60,40,2.5,p,', 'well', 'column "well" (well) is empty; it is required'],
    ['empty production temperature', '2024-01-01T00:00Z,GT-1,,60,40,2.5,p,', 'T_prod (C)', 'column "T_prod (C)" (production temperature) is empty; it is required'],
    ['a row too short for a required column', '2024-01-01T00:00Z,GT-1', 'T_prod (C)', 'the row has 2 fields and the header 8: no value for column "T_prod (C)" (production temperature), which is required'],
  ])('%s', async (_what, row, field, reason) => {
    const rejection = await rejectionOf(row);
    expect(rejection).toEqual({ line: 2, raw: row, reason, field });
  });

  it('a temperature entered in °F is shown converted: 900 °F = (900 − 32)·5/9 = 482.222 °C', async () => {
    const { reason } = await rejectionOf('2024-01-01T00:00Z,A,900', 'time,well,Temp (°F)');
    expect(reason).toBe('column "Temp (°F)" (production temperature): "900" in degF is 482.222 °C, above 400 °C: physically impossible for these plants (a unit mix-up or a sensor fault?)');
  });

  it('a well that differs from the well option', async () => {
    const { reason } = await rejectionOf('2024-01-01T00:00Z,GT-2,150', 'time,well,temp', { well: 'GT-1' });
    expect(reason).toBe('column "well" (well): "GT-2" differs from the well given as an option, "GT-1"');
  });

  it('a very long value is shortened in the reason, and the reason stays on one line', async () => {
    const { reason } = await rejectionOf(`2024-01-01T00:00Z,A,"${'9'.repeat(40)}\n${'x'.repeat(100)}"`, 'time,well,temp');
    expect(reason).not.toContain('\n');
    expect(reason.length).toBeLessThan(160);
    expect(reason).toContain('…"');
  });
});

describe('volume flow to mass flow with the IAPWS-IF97 region 1 density', () => {
  it('at the logged temperature and pressure: IAPWS-IF97 (2007) Table 5, 300 K and 3 MPa, v = 0.100215168e-2 m³/kg', async () => {
    const r = await readCsvText('time,well,T (K),flow (m3/h),WHP (MPa)\n2024-01-01T00:00Z,A,300,3600,3\n', { columns: { 'production-temperature': 'T (K)' } });
    const x = r.readings[0];
    const density = 1 / 0.100215168e-2; // 997.853 kg/m³
    expect(x.volumeFlowM3PerS).toBeCloseTo(1, 12); // 3600 m³/h
    expect(x.flowDensityKgPerM3! / density - 1).toBeLessThan(1e-8);
    expect(x.normalisedMassFlowKgPerS! / density - 1).toBeLessThan(1e-8);
    expect(x.massFlowKgPerS).toBe(null);
    expect(x.flowUnit).toBe('m3/h');
    expect(r.counts).toMatchObject({ volumeFlowsConverted: 1, densityAtAssumedPressure: 0 });
  });

  it('at 500 K and 3 MPa: Table 5, v = 0.1202418e-2 m³/kg; 10 L/s is 10e-3 m³/s × 831.65 kg/m³', async () => {
    const r = await readCsvText('time,well,T (K),flow (L/s),WHP (bar)\n2024-01-01T00:00Z,A,500,10,30\n', { columns: { 'production-temperature': 'T (K)' } });
    const density = 1 / 0.1202418e-2;
    expect(r.readings[0].flowDensityKgPerM3! / density - 1).toBeLessThan(1e-8);
    expect(r.readings[0].normalisedMassFlowKgPerS! / (0.01 * density) - 1).toBeLessThan(1e-8);
  });

  it('without a logged pressure, at the saturation pressure + 1 MPa, and says so', async () => {
    // IAPWS-IF97 (2007) Table 35: ps(500 K) = 0.263889776e1 MPa, so the assumed pressure is 3.63889776 MPa.
    const r = await readCsvText('time,well,T (K),flow (m3/s)\n2024-01-01T00:00Z,A,500,1\n', { columns: { 'production-temperature': 'T (K)' } });
    expect(saturationPressurePa(500) / 2.63889776e6 - 1).toBeLessThan(1e-8);
    const expected = liquidWater(500, 2.63889776e6 + 1e6).densityKgPerM3; // the region 1 equation, itself checked against Table 5
    expect(r.readings[0].flowDensityKgPerM3! / expected - 1).toBeLessThan(1e-8);
    expect(r.counts).toMatchObject({ volumeFlowsConverted: 1, densityAtAssumedPressure: 1 });
    expect(r.info.assumptions.join(' ')).toContain('saturation pressure + 1 MPa');
  });

  it.each([
    ['above 350 °C', '360', '', 'outside IAPWS-IF97 region 1'],
    ['below 0 °C', '-5', '', 'below 0 °C (273.15 K), outside IAPWS-IF97 region 1'],
    ['steam at the logged pressure', '180', '0.5', 'water at 180 °C and 0.5 MPa is steam, not liquid (saturation pressure 1.0026 MPa)'],
  ])('outside region 1 (%s) is a rejection with the reason', async (_what, t, p, reason) => {
    const { reason: got, field } = await rejectionOf(`2024-01-01T00:00Z,A,${t},100,${p}`, 'time,well,temp,flow (m3/h),WHP (MPa)');
    expect(field).toBe('flow (m3/h)');
    expect(got).toContain('column "flow (m3/h)" (flow): "100" is a volume flow that cannot be converted to mass: ');
    expect(got).toContain(reason);
  });
});
