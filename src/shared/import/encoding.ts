/**
 * Which text encoding a file is in, and where it stops being that encoding. The import reads
 * UTF-8 (with or without a byte-order mark) and UTF-16 LE/BE with a byte-order mark; anything
 * else — most often a Windows-1252 export, whose '°' is the lone byte 0xB0 — is refused with the
 * line of the first invalid byte rather than turned into mojibake.
 *
 * The decoding itself is the runtime's (fast and native); these byte scans run only to sniff the
 * start of the file and, after the decoder has refused a chunk, to say where.
 * UTF-8 validity follows RFC 3629 §4 (no overlongs, no surrogates, nothing above U+10FFFF);
 * UTF-16 validity follows RFC 2781 §2.2 (a high surrogate must be followed by a low one).
 */
import { InputError } from '../errors.js';
import type { TextEncoding } from './types.js';

export interface SniffedEncoding {
  encoding: TextEncoding;
  /** Length of the byte-order mark (0, 2 or 3). */
  bomBytes: number;
}

/** Encoding from the byte-order mark at the start of the file; UTF-8 without one. */
export function sniffEncoding(start: Uint8Array): SniffedEncoding {
  if (start.length >= 3 && start[0] === 0xef && start[1] === 0xbb && start[2] === 0xbf) return { encoding: 'utf-8', bomBytes: 3 };
  if (start.length >= 2 && start[0] === 0xff && start[1] === 0xfe) return { encoding: 'utf-16le', bomBytes: 2 };
  if (start.length >= 2 && start[0] === 0xfe && start[1] === 0xff) return { encoding: 'utf-16be', bomBytes: 2 };
  return { encoding: 'utf-8', bomBytes: 0 };
}

/** Expected length of the UTF-8 sequence led by byte `b`, or 0 when `b` cannot lead one (RFC 3629 §4). */
function utf8SequenceLength(b: number): number {
  if (b < 0x80) return 1;
  if (b >= 0xc2 && b <= 0xdf) return 2;
  if (b >= 0xe0 && b <= 0xef) return 3;
  if (b >= 0xf0 && b <= 0xf4) return 4;
  return 0;
}

/**
 * Bytes at the end of `bytes` that begin a character the chunk does not finish (0–3): a stream
 * decoder holds them back until the next chunk arrives.
 */
export function incompleteTailLength(bytes: Uint8Array, encoding: TextEncoding): number {
  const n = bytes.length;
  if (encoding === 'utf-8') {
    for (let back = 1; back <= 3 && back <= n; back++) {
      const b = bytes[n - back];
      if ((b & 0xc0) !== 0x80) {
        const length = utf8SequenceLength(b);
        return length > back ? back : 0;
      }
    }
    return 0;
  }
  const odd = n % 2;
  const lastUnitEnd = n - odd;
  if (lastUnitEnd >= 2 && isHighSurrogate(unitAt(bytes, lastUnitEnd - 2, encoding))) return 2 + odd;
  return odd;
}

function unitAt(bytes: Uint8Array, i: number, encoding: TextEncoding): number {
  return encoding === 'utf-16le' ? bytes[i] | (bytes[i + 1] << 8) : (bytes[i] << 8) | bytes[i + 1];
}

function isHighSurrogate(u: number): boolean {
  return u >= 0xd800 && u <= 0xdbff;
}

function isLowSurrogate(u: number): boolean {
  return u >= 0xdc00 && u <= 0xdfff;
}

/**
 * Index of the first byte of `bytes` that is not valid `encoding`, scanning from `from` (which
 * must be at a character boundary), or −1. With `final` false an incomplete character at the very
 * end is not an error (more bytes may follow).
 */
export function firstInvalidByte(bytes: Uint8Array, encoding: TextEncoding, from = 0, final = true): number {
  const n = bytes.length;
  if (encoding !== 'utf-8') {
    for (let i = from; i < n; i += 2) {
      if (i + 1 >= n) return final ? i : -1;
      const u = unitAt(bytes, i, encoding);
      if (isLowSurrogate(u)) return i;
      if (isHighSurrogate(u)) {
        if (i + 3 >= n) return final ? i : -1;
        if (!isLowSurrogate(unitAt(bytes, i + 2, encoding))) return i;
        i += 2;
      }
    }
    return -1;
  }
  let i = from;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    const length = utf8SequenceLength(b);
    if (length === 0) return i;
    // Second-byte ranges exclude overlongs (E0, F0), surrogates (ED) and code points above U+10FFFF (F4).
    const lo = b === 0xe0 ? 0xa0 : b === 0xf0 ? 0x90 : 0x80;
    const hi = b === 0xed ? 0x9f : b === 0xf4 ? 0x8f : 0xbf;
    for (let k = 1; k < length; k++) {
      if (i + k >= n) return final ? i : -1;
      const c = bytes[i + k];
      if (k === 1 ? c < lo || c > hi : (c & 0xc0) !== 0x80) return i;
    }
    i += length;
  }
  return -1;
}

/** Line breaks (LF, or CR in a CR-only file) in bytes[from, to) of `encoding`. */
export function countLineBreaks(bytes: Uint8Array, encoding: TextEncoding, from: number, to: number, breakChar = 0x0a): number {
  let count = 0;
  if (encoding === 'utf-8') {
    for (let i = from; i < to; i++) if (bytes[i] === breakChar) count++;
    return count;
  }
  for (let i = from; i + 1 < to; i += 2) if (unitAt(bytes, i, encoding) === breakChar) count++;
  return count;
}

const ENCODING_NAME: Readonly<Record<TextEncoding, string>> = { 'utf-8': 'UTF-8', 'utf-16le': 'UTF-16 LE', 'utf-16be': 'UTF-16 BE' };

/**
 * The one-line error for the first invalid byte, `byte`, at byte offset `offset` of the file, on
 * physical `line`; `byte` null: the file ends in the middle of a character.
 */
export function invalidTextError(file: string, line: number, encoding: TextEncoding, byte: number | null, offset: number): InputError {
  const name = ENCODING_NAME[encoding];
  if (byte === null) {
    return new InputError(`the file ends in the middle of a ${name} character (byte offset ${offset}): it is cut short, or not ${name} text`, { file, line });
  }
  if (encoding !== 'utf-8') {
    return new InputError(`the text is not valid ${name}: an unpaired surrogate at byte offset ${offset}; save the file as UTF-8 and import again`, { file, line });
  }
  const hex = byte.toString(16).toUpperCase().padStart(2, '0');
  return new InputError(
    `the text is not valid UTF-8: byte 0x${hex} at byte offset ${offset} (a Windows-1252 or Latin-1 export?); save the file as UTF-8, or UTF-16 with a byte-order mark, and import again`,
    { file, line },
  );
}

/** A NUL character in the text: UTF-16 without a byte-order mark, UTF-32, or not a text file at all. */
export function nulCharacterError(file: string, line: number): InputError {
  return new InputError(
    'the text contains NUL characters: UTF-16 without a byte-order mark, UTF-32 or not a CSV file; save it as UTF-8 (or UTF-16 with a byte-order mark) and import again',
    { file, line },
  );
}
