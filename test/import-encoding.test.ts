// Encodings of a plant export: UTF-8 with or without a byte-order mark, UTF-16 LE/BE with one, and
// refusal of anything else with the line of the first invalid byte. Byte values are those of the
// Unicode standard's encoding forms (RFC 3629 for UTF-8, RFC 2781 for UTF-16) and of the
// Windows-1252 code page, where '°' is 0xB0 and 'é' is 0xE9 (common practice, the published code chart).
import { describe, expect, it } from 'vitest';
import { firstInvalidByte, incompleteTailLength, sniffEncoding } from '../src/shared/import/encoding.js';
import { inputErrorOf, readCsvText, utc } from './import-helpers.js';

const TEXT = 'time,well,Temp (°C)\n2024-01-01T00:00:00Z,Süd-1,150.5\n2024-01-02T00:00:00Z,Nørd-2,151\n';

function utf16be(text: string): Buffer {
  const le = Buffer.from(text, 'utf16le');
  const be = Buffer.alloc(le.length);
  for (let i = 0; i < le.length; i += 2) {
    be[i] = le[i + 1];
    be[i + 1] = le[i];
  }
  return be;
}

async function expectSameReadings(content: Uint8Array, encoding: string, bom: boolean): Promise<void> {
  const r = await readCsvText(content);
  expect(r.info.encoding).toBe(encoding);
  expect(r.info.byteOrderMark).toBe(bom);
  expect(r.info.headers).toEqual(['time', 'well', 'Temp (°C)']); // the BOM is not part of the first header
  expect(r.readings.map((x) => [x.wellName, x.productionTemperatureC, x.timeMs])).toEqual([
    ['Süd-1', 150.5, utc('2024-01-01T00:00:00Z')],
    ['Nørd-2', 151, utc('2024-01-02T00:00:00Z')],
  ]);
}

describe('encodings that are read', () => {
  it('UTF-8 without a byte-order mark', async () => {
    await expectSameReadings(Buffer.from(TEXT, 'utf8'), 'utf-8', false);
  });

  it('UTF-8 with the byte-order mark EF BB BF', async () => {
    await expectSameReadings(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(TEXT, 'utf8')]), 'utf-8', true);
  });

  it('UTF-16 LE with the byte-order mark FF FE', async () => {
    await expectSameReadings(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(TEXT, 'utf16le')]), 'utf-16le', true);
  });

  it('UTF-16 BE with the byte-order mark FE FF', async () => {
    await expectSameReadings(Buffer.concat([Buffer.from([0xfe, 0xff]), utf16be(TEXT)]), 'utf-16be', true);
  });

  it('multi-byte characters split across read chunks of every size decode the same', async () => {
    const bytes = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(TEXT, 'utf8')]);
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(TEXT.replace('Süd', 'S𝄞d'), 'utf16le')]); // U+1D11E: a surrogate pair
    for (const chunkBytes of [1, 2, 3, 5, 7]) {
      const r = await readCsvText(bytes, { chunkBytes });
      expect(r.readings.map((x) => x.wellName)).toEqual(['Süd-1', 'Nørd-2']);
      const r16 = await readCsvText(utf16, { chunkBytes });
      expect(r16.readings.map((x) => x.wellName)).toEqual(['S𝄞d-1', 'Nørd-2']);
    }
  });
});

describe('encodings that are refused, with the line of the first invalid byte', () => {
  it('a Windows-1252 header ("°" is the lone byte 0xB0) fails on line 1, naming the file and the byte', async () => {
    const bytes = Buffer.from('time,well,Temp (\xb0F)\n2024-01-01T00:00:00Z,A,300\n', 'latin1');
    const err = await inputErrorOf(bytes);
    expect(err.where.line).toBe(1);
    expect(err.where.file).toMatch(/export\.csv$/);
    expect(err.reason).toContain('not valid UTF-8: byte 0xB0 at byte offset 16');
    expect(err.message.split('\n')).toHaveLength(1);
  });

  it('a Windows-1252 "é" (0xE9) on line 3 fails on line 3', async () => {
    const bytes = Buffer.from('time,well,temp\n2024-01-01T00:00:00Z,A,150\n2024-01-02T00:00:00Z,Jos\xe9,150\n', 'latin1');
    const err = await inputErrorOf(bytes);
    expect(err.where.line).toBe(3);
    // Lines 1–2 are 15 + 27 bytes, then "2024-01-02T00:00:00Z,Jos" is 24: offset 66.
    expect(err.reason).toContain('byte 0xE9 at byte offset 66');
  });

  it('an invalid byte past the first 64 KiB is placed on its line and offset whatever the chunk size', async () => {
    // 3000 rows of about 30 bytes put the bad row past the sample read before the header is resolved.
    const rows = Array.from({ length: 3000 }, (_, i) => `2024-01-01T00:00:00Z,Süd-${i},150\n`).join('');
    const bytes = Buffer.concat([Buffer.from(`time,well,temp\n${rows}2024-01-01T00:00:00Z,`), Buffer.from([0xff]), Buffer.from(',1\n')]);
    expect(bytes.length).toBeGreaterThan(65536);
    for (const chunkBytes of [7, 1000, 4096, 65536]) {
      const err = await inputErrorOf(bytes, { chunkBytes });
      expect(err.where.line).toBe(3002); // header + 3000 rows, then the bad row
      expect(err.reason).toContain(`byte 0xFF at byte offset ${bytes.indexOf(0xff)}`);
    }
  });

  it('an invalid continuation right after a chunk boundary inside a character', async () => {
    const head = Buffer.from(`time,well,temp\n${'2024-01-01T00:00:00Z,A,150\n'.repeat(3000)}2024-01-01T00:00:00Z,`);
    const bytes = Buffer.concat([head, Buffer.from([0xc3, 0x41]), Buffer.from(',1\n')]); // C3 must be followed by 80–BF
    const err = await inputErrorOf(bytes, { chunkBytes: head.length + 1 }); // the first chunk ends just after C3
    expect(err.where.line).toBe(3002);
    expect(err.reason).toContain(`byte 0xC3 at byte offset ${head.length}`);
  });

  it('a UTF-8 character cut off at the end of the file', async () => {
    const bytes = Buffer.concat([Buffer.from('time,well,temp\n2024-01-01T00:00:00Z,A,150\nx'), Buffer.from([0xc3])]);
    const err = await inputErrorOf(bytes);
    expect(err.where.line).toBe(3);
    expect(err.reason).toContain('ends in the middle of a UTF-8 character');
  });

  it('UTF-16 without a byte-order mark is refused (its NUL bytes), not read as UTF-8', async () => {
    const err = await inputErrorOf(Buffer.from(TEXT, 'utf16le'));
    expect(err.reason).toContain('NUL characters');
    expect(err.where.line).toBe(1);
  });

  it('UTF-16 with an unpaired surrogate is refused on its line', async () => {
    const good = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('time,well,temp\n2024-01-01T00:00:00Z,A', 'utf16le')]);
    const bytes = Buffer.concat([good, Buffer.from([0x00, 0xd8]), Buffer.from(',150\n', 'utf16le')]); // lone high surrogate D800
    const err = await inputErrorOf(bytes);
    expect(err.where.line).toBe(2);
    expect(err.reason).toContain('unpaired surrogate');
  });
});

describe('byte scans', () => {
  it('sniffs the byte-order marks', () => {
    expect(sniffEncoding(new Uint8Array([0xef, 0xbb, 0xbf, 0x41]))).toEqual({ encoding: 'utf-8', bomBytes: 3 });
    expect(sniffEncoding(new Uint8Array([0xff, 0xfe, 0x41, 0]))).toEqual({ encoding: 'utf-16le', bomBytes: 2 });
    expect(sniffEncoding(new Uint8Array([0xfe, 0xff, 0, 0x41]))).toEqual({ encoding: 'utf-16be', bomBytes: 2 });
    expect(sniffEncoding(new Uint8Array([0x41]))).toEqual({ encoding: 'utf-8', bomBytes: 0 });
  });

  it('finds invalid UTF-8 per RFC 3629 §4: stray continuation, overlong, surrogate, above U+10FFFF', () => {
    expect(firstInvalidByte(Buffer.from('aé€𝄞'), 'utf-8')).toBe(-1);
    expect(firstInvalidByte(new Uint8Array([0x41, 0x80]), 'utf-8')).toBe(1); // continuation byte without a lead
    expect(firstInvalidByte(new Uint8Array([0xc0, 0xaf]), 'utf-8')).toBe(0); // overlong '/'
    expect(firstInvalidByte(new Uint8Array([0xe0, 0x80, 0xaf]), 'utf-8')).toBe(0); // overlong 3-byte form
    expect(firstInvalidByte(new Uint8Array([0xed, 0xa0, 0x80]), 'utf-8')).toBe(0); // U+D800, a surrogate
    expect(firstInvalidByte(new Uint8Array([0xf4, 0x90, 0x80, 0x80]), 'utf-8')).toBe(0); // U+110000
    expect(firstInvalidByte(new Uint8Array([0x41, 0xe2, 0x82]), 'utf-8', 0, false)).toBe(-1); // may continue
    expect(firstInvalidByte(new Uint8Array([0x41, 0xe2, 0x82]), 'utf-8', 0, true)).toBe(1);
  });

  it('measures the incomplete character at the end of a chunk', () => {
    expect(incompleteTailLength(new Uint8Array([0x41, 0xe2, 0x82]), 'utf-8')).toBe(2); // first two bytes of €
    expect(incompleteTailLength(new Uint8Array([0xe2, 0x82, 0xac]), 'utf-8')).toBe(0); // € complete
    expect(incompleteTailLength(new Uint8Array([0x41, 0x00, 0x3d]), 'utf-16le')).toBe(1); // odd byte
    expect(incompleteTailLength(new Uint8Array([0x34, 0xd8]), 'utf-16le')).toBe(2); // high surrogate D834
    expect(incompleteTailLength(new Uint8Array([0xd8, 0x34, 0xdd]), 'utf-16be')).toBe(3);
  });
});
