/**
 * Saving what the back end made: an `<a download>` of a Blob. In a browser that is a download; in
 * the desktop window the shell shows the system's save dialog for it (src/main/desktop/downloads.ts).
 */
import { h } from './dom.js';

export function downloadBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const link = h('a', { href: url, download: fileName, class: 'visually-hidden' }, fileName);
  document.body.append(link);
  link.click();
  link.remove();
  // Revoked later, not at once: the download reads the blob after click() returns.
  window.setTimeout(() => URL.revokeObjectURL(url), 60_000);
}

export function downloadText(text: string, fileName: string, mediaType: string): void {
  downloadBlob(new Blob([text], { type: `${mediaType};charset=utf-8` }), fileName);
}

/** base64 → bytes, for files that travel over the contract as base64 (reports). */
export function bytesOfBase64(base64: string): Uint8Array<ArrayBuffer> {
  const text = atob(base64);
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
  return bytes;
}
