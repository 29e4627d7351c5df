/**
 * Strict decoding of a file read in chunks: the runtime's TextDecoder with `fatal: true` (native
 * and fast) does the work; when it refuses a chunk, the byte scans of shared/import/encoding.ts
 * find the first invalid byte, its offset in the file and its physical line, for a one-line
 * InputError instead of mojibake.
 */
import { TextDecoder } from 'node:util';
import type { InputError } from '../../shared/errors.js';
import { countLineBreaks, firstInvalidByte, incompleteTailLength, invalidTextError } from '../../shared/import/encoding.js';
import type { TextEncoding } from '../../shared/import/types.js';

export class StrictTextDecoder {
  private readonly decoder: TextDecoder;
  /** The last chunk decoded and the file offset where it starts: to place an invalid byte. */
  private previousChunk: Uint8Array | null = null;
  private previousOffset = 0;

  /**
   * `lineBreaksHandedOn` tells, when a chunk is refused, how many line breaks the text decoded so
   * far holds, or null when that text is only the previous chunk (counted here from its bytes).
   * `breakByte` is the line break counted: LF, or CR in a CR-only file.
   */
  constructor(
    private readonly file: string,
    readonly encoding: TextEncoding,
    private readonly bomBytes: number,
    private readonly lineBreaksHandedOn: () => number | null,
    private readonly breakByte: () => number,
  ) {
    // ignoreBOM false (the default): the byte-order mark is dropped, not read as U+FEFF in the first header.
    this.decoder = new TextDecoder(encoding, { fatal: true });
  }

  /** The text of `bytes`; `final` flushes a character the last chunk left incomplete. */
  decode(bytes: Uint8Array, final: boolean): string {
    try {
      const text = final ? this.decoder.decode(bytes) : this.decoder.decode(bytes, { stream: true });
      if (bytes.length > 0) {
        this.previousOffset = this.previousChunk === null ? 0 : this.previousOffset + this.previousChunk.length;
        this.previousChunk = bytes;
      }
      return text;
    } catch (err) {
      if (!(err instanceof TypeError)) throw err;
      throw this.invalidText(bytes, final);
    }
  }

  /** The first invalid byte of `bytes`, after the incomplete character the previous chunk ended with. */
  private invalidText(bytes: Uint8Array, final: boolean): InputError {
    const encoding = this.encoding;
    const previous = this.previousChunk;
    const offset = previous === null ? 0 : this.previousOffset + previous.length;
    const carried = previous === null ? 0 : incompleteTailLength(previous, encoding);
    let scanned = bytes;
    if (carried > 0 && previous !== null) {
      scanned = new Uint8Array(carried + bytes.length);
      scanned.set(previous.subarray(previous.length - carried), 0);
      scanned.set(bytes, carried);
    }
    const from = previous === null ? this.bomBytes : 0;
    const breakByte = this.breakByte();
    let at = firstInvalidByte(scanned, encoding, from, final);
    const tail = incompleteTailLength(scanned, encoding);
    if (at === -1) at = scanned.length - tail;
    const truncated = final && tail > 0 && at === scanned.length - tail;
    let before = this.lineBreaksHandedOn();
    if (before === null) {
      before = previous === null ? 0 : countLineBreaks(previous, encoding, this.previousOffset === 0 ? this.bomBytes : 0, previous.length - carried, breakByte);
    }
    const line = 1 + before + countLineBreaks(scanned, encoding, from, at, breakByte);
    return invalidTextError(this.file, line, encoding, truncated ? null : scanned[at], offset - carried + at);
  }
}
