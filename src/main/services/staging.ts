/**
 * Staged files: the bytes of a file a front end sends in chunks (it cannot name a path on the back
 * end's disk), kept in a private folder until the back end closes, then previewed or imported by an
 * id nobody can guess. The folder is made on the first upload (mode 0700, under the OS temp folder
 * unless told otherwise) so that a front end that never uploads leaves nothing behind.
 *
 *   new StagingArea(parentDir?)
 *     begin({ name, sizeBytes }): BeginUploadResponse       chunk(request): UploadChunkResponse
 *     finish({ staged }): StagedFileJson                     file(staged): { path, json }   (finished only)
 *     close(): void                                          removes the folder and everything in it
 *
 * Chunks arrive in order: each chunk's offset must be the bytes received so far, which makes a
 * repeated or lost chunk an error the sender sees at once instead of a silently wrong file. The
 * SHA-256 is taken as the chunks arrive, so finishing costs no second pass over the file.
 */
import { createHash, randomBytes, type Hash } from 'node:crypto';
import { chmodSync, closeSync, mkdtempSync, openSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  UPLOAD_CHUNK_BYTES,
  type BeginUploadRequest, type BeginUploadResponse, type StagedFileJson, type StagedFileRef, type UploadChunkRequest, type UploadChunkResponse,
} from '../../shared/contract/imports.js';
import { InputError } from '../../shared/errors.js';

interface Staged {
  id: string;
  path: string;
  name: string;
  sizeBytes: number;
  received: number;
  hash: Hash | null;
  sha256: string | null;
}

/** RFC 4648 §4 base64 with padding: whole 4-character groups. */
const BASE64 = /^(?:[A-Za-z0-9+/]{4})*(?:[A-Za-z0-9+/]{2}==|[A-Za-z0-9+/]{3}=)?$/;

export class StagingArea {
  private dir: string | null = null;
  private readonly files = new Map<string, Staged>();
  private closed = false;

  constructor(private readonly parentDir: string = tmpdir()) {}

  begin(request: BeginUploadRequest): BeginUploadResponse {
    const name = userFileName(request.name);
    const id = randomBytes(18).toString('base64url');
    const path = join(this.folder(), `${id}.upload`);
    closeSync(openSync(path, 'wx', 0o600));
    this.files.set(id, { id, path, name, sizeBytes: request.sizeBytes, received: 0, hash: createHash('sha256'), sha256: null });
    return { staged: id, chunkBytes: UPLOAD_CHUNK_BYTES };
  }

  chunk(request: UploadChunkRequest): UploadChunkResponse {
    const f = this.staged(request.staged);
    if (f.hash === null) throw new InputError('this upload is finished; begin a new one to send the file again', { field: 'staged' });
    if (request.offset !== f.received) {
      throw new InputError(`must be ${f.received}, the bytes received so far (got ${request.offset}); chunks are sent in order, each once`, { field: 'offset' });
    }
    if (request.base64.length % 4 !== 0 || !BASE64.test(request.base64)) {
      throw new InputError('is not valid base64 (RFC 4648: A–Z, a–z, 0–9, + and /, padded with = to whole groups of 4)', { field: 'base64' });
    }
    const bytes = Buffer.from(request.base64, 'base64');
    if (bytes.length > UPLOAD_CHUNK_BYTES) throw new InputError(`holds ${bytes.length} bytes; a chunk holds at most ${UPLOAD_CHUNK_BYTES}`, { field: 'base64' });
    if (f.received + bytes.length > f.sizeBytes) {
      throw new InputError(`would take the file to ${f.received + bytes.length} bytes, more than the ${f.sizeBytes} declared (sizeBytes)`, { field: 'base64' });
    }
    const fd = openSync(f.path, 'r+');
    try {
      for (let done = 0; done < bytes.length;) done += writeSync(fd, bytes, done, bytes.length - done, f.received + done);
    } finally {
      closeSync(fd);
    }
    f.hash.update(bytes);
    f.received += bytes.length;
    return { receivedBytes: f.received };
  }

  finish(request: StagedFileRef): StagedFileJson {
    const f = this.staged(request.staged);
    if (f.hash !== null) {
      if (f.received !== f.sizeBytes) {
        throw new InputError(`received ${f.received} of the ${f.sizeBytes} bytes declared; send the rest before finishing`, { field: 'staged' });
      }
      f.sha256 = f.hash.digest('hex');
      f.hash = null;
    }
    return json(f);
  }

  /** A finished staged file: where its bytes are, and what the front end knows of it. */
  file(staged: string): { path: string; json: StagedFileJson } {
    const f = this.staged(staged);
    if (f.sha256 === null) throw new InputError('this upload is not finished yet (finishUpload)', { field: 'staged' });
    return { path: f.path, json: json(f) };
  }

  /** The staging folder, if one was made (for tests and the log). */
  get folderPath(): string | null {
    return this.dir;
  }

  close(): void {
    this.closed = true;
    this.files.clear();
    if (this.dir !== null) rmSync(this.dir, { recursive: true, force: true });
    this.dir = null;
  }

  private folder(): string {
    if (this.closed) throw new Error('staging: used after close()');
    if (this.dir === null) {
      this.dir = mkdtempSync(join(this.parentDir, 'tauwell-staging-'));
      chmodSync(this.dir, 0o700); // mkdtemp makes it 0700 on POSIX already; said here, not assumed
    }
    return this.dir;
  }

  private staged(id: string): Staged {
    const f = this.files.get(id);
    if (f === undefined) throw new InputError('no staged file with this id (uploads are kept until the back end closes)', { field: 'staged' });
    return f;
  }
}

function json(f: Staged): StagedFileJson {
  return { staged: f.id, name: f.name, sizeBytes: f.sizeBytes, sha256: f.sha256 ?? '' };
}

/**
 * The user's name for the file, without any folders (a browser may send "C:\fakepath\x.csv") or
 * control characters: it is shown and kept in the import record, never used as a path.
 */
export function userFileName(given: string): string {
  // eslint-disable-next-line no-control-regex
  const base = (given.split(/[\\/]/).pop() ?? '').replace(/[\u0000-\u001f\u007f]/g, '').trim();
  if (base === '' || base === '.' || base === '..') throw new InputError(`is not a file name (got ${JSON.stringify(given)})`, { field: 'name' });
  return base;
}
