// Column roles and units from the header row: synonyms, unit annotations, overrides, and the errors
// that stop an import whose header cannot be read. Unit symbols are those of src/shared/units.ts (NIST
// SP 811 factors, tested in units.test.ts); the header spellings are those plant exports use (common practice).
import { describe, expect, it } from 'vitest';
import { DEFAULT_UNITS, readHeader, resolveColumns, ROLE_SYNONYMS } from '../src/shared/import/columns.js';
import { COLUMN_ROLES, type ColumnRole } from '../src/shared/import/types.js';
import { inputErrorOf, readCsvText } from './import-helpers.js';

describe('header annotations', () => {
  it.each([
    ['Temp (°F)', 'production-temperature', '°F'],
    ['flow [gpm]', 'flow', 'gpm'],
    ['temp_degC', 'production-temperature', 'degC'],
    ['T_prod (C)', 'production-temperature', 'C'],
    ['Flow (m3/h)', 'flow', 'm3/h'],
    ['WHP [bar]', 'pressure', 'bar'],
    ['pressure_psi', 'pressure', 'psi'],
    ['Mass flow rate (t/h)', 'flow', 't/h'],
    ['Production rate [bbl/d]', 'flow', 'bbl/d'],
    ['Return temp (K)', 'injection-temperature', 'K'],
    ['Wellhead pressure (kPa)', 'pressure', 'kPa'],
    ['flow_L/s', 'flow', 'L/s'],
    ['flow_kg_s', 'flow', 'kg/s'], // '_' standing for '/', as in the demo export demo/invented-field.csv
    ['production_temp_C', 'production-temperature', 'C'],
    ['Temp °F', 'production-temperature', '°F'],
    ['T_prod', 'production-temperature', null], // "prod" is not a unit: the whole header is the name
    ['Time (UTC)', 'time', 'UTC'],
    ['Borehole temperature', null, null],
  ])('%s → %s, %s', (header, role, annotation) => {
    expect(readHeader(header)).toEqual({ role, annotation });
  });

  it.each([
    ['time', ['date', 'Datetime', 'timestamp', 'Date/Time', 'Time Stamp']],
    ['well', ['Well', 'well_name', 'Well ID', 'WellName']],
    ['production-temperature', ['production temperature', 'Prod Temp', 'wellhead temperature', 'T_prod', 'outlet temp', 'Temperature']],
    ['flow', ['flow', 'Flow Rate', 'mass flow', 'production rate', 'FlowRate']],
    ['injection-temperature', ['reinjection', 'Injection Temperature', 'return temp', 'T_inj', 'Reinjection temp']],
    ['pressure', ['WHP', 'wellhead pressure', 'Pressure', 'Well-head pressure']],
    ['status', ['status', 'State', 'mode']],
    ['note', ['note', 'Comment', 'remarks', 'Notes']],
  ] as const)('synonyms of %s', (role, headers) => {
    for (const h of headers) expect(readHeader(h).role).toBe(role);
  });

  it('the synonym table gives each name one role', () => {
    const all = COLUMN_ROLES.flatMap((r: ColumnRole) => [...ROLE_SYNONYMS[r]]);
    expect(new Set(all).size).toBe(all.length);
  });
});

describe('resolving the header', () => {
  const headers = ['Timestamp', 'Well', 'T_prod (°F)', 'Flow (m3/h)', 'WHP', 'Operator', 'Status'];

  it('maps roles, reads units, keeps unknown columns unmapped, defaults the rest', () => {
    const c = resolveColumns(headers, 'f.csv', 1, {});
    expect(c.header).toMatchObject({ time: 'Timestamp', well: 'Well', 'production-temperature': 'T_prod (°F)', flow: 'Flow (m3/h)', pressure: 'WHP', status: 'Status', note: null });
    expect(c.unmappedHeaders).toEqual(['Operator']);
    expect(c.units).toEqual({
      'production-temperature': { unit: 'degF', source: 'header' },
      'injection-temperature': { unit: 'degC', source: 'default' },
      flow: { unit: 'm3/h', source: 'header' },
      pressure: { unit: 'MPa', source: 'default' },
    });
    expect(DEFAULT_UNITS).toEqual({ 'production-temperature': 'degC', 'injection-temperature': 'degC', flow: 'kg/s', pressure: 'MPa' });
  });

  it('options override columns and units; an option over a header annotation is noted', () => {
    const c = resolveColumns(headers, 'f.csv', 1, {
      columns: { 'injection-temperature': 'Operator', status: null },
      units: { pressure: 'bar', 'production-temperature': 'degC' },
    });
    expect(c.header['injection-temperature']).toBe('Operator');
    expect(c.header.status).toBe(null);
    expect(c.unmappedHeaders).toEqual(['Status']);
    expect(c.units.pressure).toEqual({ unit: 'bar', source: 'option' });
    expect(c.units['production-temperature']).toEqual({ unit: 'degC', source: 'option' });
    expect(c.notes[0]).toContain('says °F but the units option says degC');
  });

  it('a column override may name a header no synonym knows, and its bracketed unit is read', () => {
    const c = resolveColumns(['when', 'which', 'hot (K)'], 'f.csv', 1, { columns: { time: 'when', well: 'which', 'production-temperature': 'hot (K)' } });
    expect(c.index).toMatchObject({ time: 0, well: 1, 'production-temperature': 2 });
    expect(c.units['production-temperature']).toEqual({ unit: 'K', source: 'header' });
  });

  it('the well option stands in for a missing well column', () => {
    const c = resolveColumns(['date', 'temp'], 'f.csv', 1, { well: 'GT-1' });
    expect(c.index.well).toBe(-1);
  });
});

describe('header errors stop the import', () => {
  it('missing required roles name the file and list the headers found', async () => {
    const err = await inputErrorOf('when,where,value\n2024-01-01,A,150\n');
    expect(err.where.line).toBe(1);
    expect(err.where.file).toMatch(/export\.csv$/);
    expect(err.reason).toContain('no column for time, well, production temperature');
    expect(err.reason).toContain('headers found: "when", "where", "value"');
    expect(err.reason).toContain('--well <name>');
  });

  it('two columns claiming one role', async () => {
    const err = await inputErrorOf('time,well,Temp,Temperature (F)\n');
    expect(err.reason).toContain('columns "Temp" and "Temperature (F)" both read as production temperature');
    expect(err.where.field).toBe('Temperature (F)');
  });

  it('an unknown unit annotation (a gauge pressure here) names the header', async () => {
    const err = await inputErrorOf('time,well,temp,WHP (barg)\n');
    expect(err.where.field).toBe('WHP (barg)');
    expect(err.reason).toContain('unknown unit "barg"');
    expect(err.reason).toContain('--unit pressure=<unit>');
  });

  it('a unit of the wrong quantity', async () => {
    const err = await inputErrorOf('time,well,Temp (bar)\n');
    expect(err.reason).toContain('"bar" is a pressure unit, not a temperature unit');
  });

  it('an override naming a header that is not there lists the headers', async () => {
    const err = await inputErrorOf('time,well,temp\n', { columns: { flow: 'Q' } });
    expect(err.where.field).toBe('columns.flow');
    expect(err.reason).toContain('no column "Q"; headers found: "time", "well", "temp"');
  });

  it('bad options are refused before reading, naming the option', async () => {
    expect((await inputErrorOf('time,well,temp\n', { columns: { speed: 'x' } as never })).where.field).toBe('columns');
    expect((await inputErrorOf('time,well,temp\n', { units: { flow: 'furlongs' } })).where.field).toBe('units.flow');
    expect((await inputErrorOf('time,well,temp\n', { dateOrder: 'dym' as never })).where.field).toBe('dateOrder');
    expect((await inputErrorOf('time,well,temp\n', { timeZone: 'Europe/Atlantis' })).where.field).toBe('timeZone');
    expect((await inputErrorOf('time,well,temp\n', { delimiter: ':' as never })).where.field).toBe('delimiter');
  });

  it('an empty file has no header', async () => {
    expect((await inputErrorOf('')).reason).toContain('the file is empty');
    expect((await inputErrorOf('\n\n  \n')).reason).toContain('the file is empty');
  });
});

describe('through the reader', () => {
  it('unknown extra columns stay in the raw text and are never an error', async () => {
    const r = await readCsvText('time,Operator,well,temp,Shift\n2024-01-01T00:00Z,Ann,A,150,night\n');
    expect(r.rejections).toEqual([]);
    expect(r.readings[0].raw).toBe('2024-01-01T00:00Z,Ann,A,150,night');
    expect(r.info.unmappedHeaders).toEqual(['Operator', 'Shift']);
  });

  it('the chosen units and their sources are reported, defaults listed among the assumptions', async () => {
    const r = await readCsvText('time,well,temp,flow,WHP\n2024-01-01T00:00Z,A,150,40,2\n');
    expect(r.info.units.flow).toEqual({ unit: 'kg/s', source: 'default' });
    expect(r.info.assumptions.some((a) => a.startsWith('wellhead pressure in MPa'))).toBe(true);
    expect(r.readings[0]).toMatchObject({ pressurePa: 2e6, pressureUnit: 'MPa', massFlowKgPerS: 40, flowUnit: 'kg/s' });
  });
});
