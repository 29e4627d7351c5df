// Physical line numbers and raw text of each row: the header is line 1, a quoted field with line
// breaks makes its row span lines and the row is numbered by its first, blank lines count, CRLF and
// lone-CR files count the same; the raw text is the row exactly as in the file, without its line
// break. Quoting follows RFC 4180 §2. Expected lines are counted by hand in the comments.
import { describe, expect, it } from 'vitest';
import { MAX_ROW_LINES } from '../src/main/import/csv-rows.js';
import { readCsvText } from './import-helpers.js';

const ROW2 = '2024-01-01T00:00Z,A,150,"multi\nline note"';

describe('line numbers', () => {
  it('LF: a two-line quoted note makes the next row start on line 4; blank lines count and are skipped', async () => {
    const text = [
      'time,well,temp,note', // line 1
      ROW2, // lines 2–3
      '2024-01-01T01:00Z,A,151,plain', // line 4
      '', // line 5, blank
      ',,,', // line 6, every cell blank: skipped as a spreadsheet's empty row
      '2024-01-01T02:00Z,A,152,"x"', // line 7
    ].join('\n');
    const r = await readCsvText(text);
    expect(r.readings.map((x) => x.line)).toEqual([2, 4, 7]);
    expect(r.readings.map((x) => x.raw)).toEqual([ROW2, '2024-01-01T01:00Z,A,151,plain', '2024-01-01T02:00Z,A,152,"x"']);
    expect(r.readings[0].note).toBe('multi\nline note');
    expect(r.counts).toMatchObject({ rowsRead: 3, readings: 3, rejections: 0, blankRows: 2 });
  });

  it('CRLF: the same lines; the raw text keeps the CRLF inside quotes and drops the line break', async () => {
    const rows = ['time,well,temp,note', '2024-01-01T00:00Z,A,150,"multi\r\nline note"', '2024-01-01T01:00Z,A,151,plain', '', '2024-01-01T02:00Z,A,152,x'];
    const r = await readCsvText(`${rows.join('\r\n')}\r\n`);
    expect(r.info.linebreak).toBe('\r\n');
    expect(r.readings.map((x) => x.line)).toEqual([2, 4, 6]);
    expect(r.readings[0].raw).toBe('2024-01-01T00:00Z,A,150,"multi\r\nline note"');
    expect(r.readings[0].note).toBe('multi\r\nline note');
    expect(r.readings[1].raw).toBe('2024-01-01T01:00Z,A,151,plain');
  });

  it('lone CR line breaks (old spreadsheet exports) count lines the same way', async () => {
    const r = await readCsvText('time,well,temp\r2024-01-01T00:00Z,A,150\r\r2024-01-01T01:00Z,A,151');
    expect(r.info.linebreak).toBe('\r');
    expect(r.readings.map((x) => [x.line, x.raw])).toEqual([[2, '2024-01-01T00:00Z,A,150'], [4, '2024-01-01T01:00Z,A,151']]);
  });

  it('the raw text is exact: blanks, quotes, extra fields, a last row without a line break', async () => {
    const raws = [' 2024-01-01T00:00Z , A ,  150 ,"x"', '2024-01-01T01:00Z,"A",151,,,extra,fields', '2024-01-01T02:00Z,A,"1""5""2"'];
    const r = await readCsvText(`time,well,temp,note\n${raws.join('\n')}`);
    expect([...r.readings.map((x) => x.raw), ...r.rejections.map((x) => x.raw)].sort()).toEqual([...raws].sort());
    expect(r.readings[0]).toMatchObject({ wellName: 'A', productionTemperatureC: 150, note: 'x' });
    expect(r.rejections[0].reason).toContain('"1\\"5\\"2" is not a number');
  });

  it('lines stay right whatever the read chunk size (chunks split CRLF pairs and quoted fields)', async () => {
    const rows = ['time,well,temp,note'];
    for (let i = 0; i < 40; i++) rows.push(i % 3 === 0 ? `2024-01-01T00:${String(i).padStart(2, '0')}Z,A,150,"a\r\nb"` : `2024-01-01T00:${String(i).padStart(2, '0')}Z,A,150,c`);
    const text = `${rows.join('\r\n')}\r\n`;
    const reference = await readCsvText(text);
    // Rows 0–38 take 39 lines plus one more for each two-line row among them (i = 0, 3, …, 36: 13),
    // so row 39 starts after the header and those 52 lines, on line 54.
    expect(reference.readings.at(-1)!.line).toBe(1 + 39 + 13 + 1);
    for (const chunkBytes of [1, 2, 3, 5, 8, 13]) {
      const r = await readCsvText(text, { chunkBytes });
      expect(r.readings.map((x) => [x.line, x.raw])).toEqual(reference.readings.map((x) => [x.line, x.raw]));
    }
  });
});

describe('malformed quoting', () => {
  it('a quote that never closes rejects its first line only, and the rows after it are read', async () => {
    const text = 'time,well,temp\n2024-01-01T00:00Z,"A,150\n2024-01-01T01:00Z,B,151\n2024-01-01T02:00Z,C,152\n';
    const r = await readCsvText(text);
    expect(r.rejections).toEqual([{ line: 2, raw: '2024-01-01T00:00Z,"A,150', field: null, reason: 'malformed quoting: a quoted field opens on this line and never closes (a stray quote?)' }]);
    expect(r.readings.map((x) => [x.line, x.wellName])).toEqual([[3, 'B'], [4, 'C']]);
    expect(r.counts).toMatchObject({ rowsRead: 3, readings: 2, rejections: 1 });
  });

  it('text after a closing quote is malformed quoting, rejected on its line', async () => {
    const r = await readCsvText('time,well,temp\n2024-01-01T00:00Z,"A"x,150\n2024-01-01T01:00Z,B,151\n');
    expect(r.rejections[0]).toMatchObject({ line: 2, raw: '2024-01-01T00:00Z,"A"x,150' });
    expect(r.rejections[0].reason).toContain('malformed quoting');
    expect(r.readings.map((x) => x.line)).toEqual([3]);
  });

  it(`an open quote that runs past ${MAX_ROW_LINES} lines is dropped at its first line without reading to the end`, async () => {
    const body = Array.from({ length: 3 * MAX_ROW_LINES }, (_, i) => `2024-01-01T00:00Z,W${i},150`).join('\n');
    const r = await readCsvText(`time,well,temp\n2024-01-01T00:00Z,"stray,150\n${body}\n`, { chunkBytes: 512 });
    expect(r.rejections[0]).toMatchObject({ line: 2, raw: '2024-01-01T00:00Z,"stray,150' });
    expect(r.readings).toHaveLength(3 * MAX_ROW_LINES);
    expect(r.readings[0].line).toBe(3);
  });

  it('a quoted header that never closes stops the import', async () => {
    const { inputErrorOf } = await import('./import-helpers.js');
    const err = await inputErrorOf('time,"well,temp\n2024-01-01T00:00Z,A,150\n');
    expect(err.reason).toContain('the header row is not valid CSV');
    expect(err.where.line).toBe(1);
  });
});
