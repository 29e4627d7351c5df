/**
 * Sends a file the user chose to the back end's staging folder in chunks (beginUpload,
 * uploadChunk, finishUpload), reading one chunk at a time so a large export never sits in memory
 * whole; the back end then previews and imports the staged copy by its id.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { TauwellClient } from '../../shared/contract/client.js';
import { UPLOAD_CHUNK_BYTES, type StagedFileJson } from '../../shared/contract/imports.js';
import { base64OfBytes } from './import-model.js';

export interface UploadHooks {
  onProgress(sentBytes: number, totalBytes: number): void;
  /** Checked between chunks: true stops the upload (the screen was left, or another file chosen). */
  cancelled(): boolean;
}

export class UploadCancelled extends Error {
  constructor() {
    super('upload cancelled');
    this.name = 'UploadCancelled';
  }
}

export async function uploadFile(client: TauwellClient, file: File, hooks: UploadHooks): Promise<Wire<StagedFileJson>> {
  const begun = await client.beginUpload({ name: file.name, sizeBytes: file.size });
  // The back end may ask for smaller chunks; never larger than the contract's limit.
  const chunk = Math.max(1, Math.min(begun.chunkBytes > 0 ? begun.chunkBytes : UPLOAD_CHUNK_BYTES, UPLOAD_CHUNK_BYTES));
  hooks.onProgress(0, file.size);
  for (let offset = 0; offset < file.size; offset += chunk) {
    if (hooks.cancelled()) throw new UploadCancelled();
    const bytes = new Uint8Array(await file.slice(offset, Math.min(offset + chunk, file.size)).arrayBuffer());
    await client.uploadChunk({ staged: begun.staged, offset, base64: base64OfBytes(bytes) });
    hooks.onProgress(offset + bytes.length, file.size);
  }
  if (hooks.cancelled()) throw new UploadCancelled();
  return client.finishUpload({ staged: begun.staged });
}
