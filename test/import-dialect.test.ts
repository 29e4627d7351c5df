// Delimiter, decimal separator and line break of a plant export, detected and overridden. The
// dialects are those spreadsheet programs write (common practice): comma with a decimal point;
// semicolon with a decimal comma in locales that write 175,3; tab and pipe from data systems.
import { describe, expect, it } from 'vitest';
import { detectDecimal, detectDelimiter, detectDialect, detectLinebreak, splitSampleRows } from '../src/shared/import/dialect.js';
import { readCsvText } from './import-helpers.js';

describe('detection from a sample', () => {
  it.each([
    [',', 'time,well,temp\n2024-01-01,A,150.5\n'],
    [';', 'time;well;temp\n2024-01-01;A;150,5\n'],
    ['\t', 'time\twell\ttemp\n2024-01-01\tA\t150.5\n'],
    ['|', 'time|well|temp\n2024-01-01|A|150.5\n'],
    // Commas in the data of a semicolon file (decimal commas) do not make it a comma file: the header has none.
    [';', 'time;well;temp;flow\n2024-01-01;A;150,5;40,2\n2024-01-02;A;151,0;40,1\n'],
    // A quoted field holding the other delimiters does not count.
    [',', 'time,well,note\n2024-01-01,A,"a;b;c|d"\n'],
  ])('delimiter %j', (delimiter, text) => {
    expect(detectDelimiter(text, '\n', true)).toBe(delimiter);
  });

  it('one column only: no delimiter to detect', () => {
    expect(detectDelimiter('time\n2024-01-01\n', '\n', true)).toBe(null);
  });

  it('decimal comma only with a non-comma delimiter and more decimal commas than points in the data', () => {
    const rows = (text: string, d: ';' | ',') => splitSampleRows(text, d, '\n', true);
    expect(detectDecimal(rows('t;w;temp\n2024-01-01;A;175,3\n', ';'), ';')).toBe(',');
    expect(detectDecimal(rows('t;w;temp\n2024-01-01;A;175.3\n', ';'), ';')).toBe('.');
    expect(detectDecimal(rows('t;w;temp\n2024-01-01;A;175\n', ';'), ';')).toBe('.'); // integers prove nothing
    expect(detectDecimal(rows('t;w;temp;p\n2024-01-01;A;175,3;2,5\n2024-01-02;A;175.4;2,5\n', ';'), ';')).toBe(',');
    expect(detectDecimal(rows('t;w;temp;p\n01.02.2024;A;175,3;2,1\n', ';'), ';')).toBe(','); // a dotted date is not a decimal point
    expect(detectDecimal(rows('t,w,temp\n2024-01-01,A,"175,3"\n', ','), ',')).toBe('.'); // a comma file: told, never guessed
  });

  it('line breaks: LF, CRLF, lone CR; one inside quotes does not count', () => {
    expect(detectLinebreak('a,b\nc,d')).toBe('\n');
    expect(detectLinebreak('a,b\r\nc,d')).toBe('\r\n');
    expect(detectLinebreak('a,b\rc,d')).toBe('\r');
    expect(detectLinebreak('a,"x\ny"\r\nc,d')).toBe('\r\n');
  });

  it('options win over detection and are reported as given', () => {
    const d = detectDialect('time;well;temp\n2024-01-01;A;150,5\n', true, { delimiter: ';', decimal: '.' });
    expect(d).toEqual({ delimiter: ';', decimal: '.', linebreak: '\n', delimiterDetected: false, decimalDetected: false });
  });
});

describe('through the reader', () => {
  it('a semicolon export with decimal commas reads 175,3 as 175.3', async () => {
    const r = await readCsvText('time;well;T_prod (C);flow (kg/s);WHP (bar)\n2024-01-01T00:00Z;GT-1;175,3;41,25;12,5\n');
    expect(r.info).toMatchObject({ delimiter: ';', decimal: ',', delimiterDetected: true, decimalDetected: true });
    expect(r.readings[0]).toMatchObject({ productionTemperatureC: 175.3, massFlowKgPerS: 41.25, pressurePa: 1.25e6 });
  });

  it('a tab export and a pipe export', async () => {
    const tab = await readCsvText('time\twell\ttemp\n2024-01-01T00:00Z\tGT-1\t175.5\n');
    const pipe = await readCsvText('time|well|temp\n2024-01-01T00:00Z|GT-1|175.5\n');
    expect(tab.info.delimiter).toBe('\t');
    expect(pipe.info.delimiter).toBe('|');
    expect(tab.readings[0].productionTemperatureC).toBe(175.5);
    expect(pipe.readings[0].productionTemperatureC).toBe(175.5);
  });

  it('quoted fields may hold the delimiter, doubled quotes and line breaks', async () => {
    const r = await readCsvText('time,well,temp,note\n2024-01-01T00:00Z,"GT,1",175.5,"said ""hot""\nthen left"\n');
    expect(r.readings[0]).toMatchObject({ wellName: 'GT,1', note: 'said "hot"\nthen left' });
  });

  it('the decimal option reads a comma-delimited file with quoted decimal commas', async () => {
    const r = await readCsvText('time,well,temp\n2024-01-01T00:00Z,A,"175,3"\n', { decimal: ',' });
    expect(r.readings[0].productionTemperatureC).toBe(175.3);
  });

  it('the delimiter option by name', async () => {
    const r = await readCsvText('time;well;temp\n2024-01-01T00:00Z;A;175\n', { delimiter: 'semicolon' });
    expect(r.info).toMatchObject({ delimiter: ';', delimiterDetected: false });
  });

  it('a number with the other separator is rejected, saying how the file is read', async () => {
    const r = await readCsvText('time;well;temp\n2024-01-01T00:00Z;A;175,3\n2024-01-02T00:00Z;A;175.4\n2024-01-03T00:00Z;A;175,5\n');
    expect(r.readings.map((x) => x.productionTemperatureC)).toEqual([175.3, 175.5]);
    expect(r.rejections[0].reason).toBe('column "temp" (production temperature): "175.4" is not a number (this file is read with a decimal comma)');
  });
});
