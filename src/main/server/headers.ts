/**
 * Response headers of the loopback server, and the Content-Security-Policy the desktop window uses
 * too. The policy admits only the app's own files: no inline script or style, no eval, no remote
 * content, no plugins, no framing; the renderer's `fetch('/api/…')` is same-origin (connect-src).
 * src/renderer/index.html carries a meta-tag policy of its own for the desktop window, which loads
 * the renderer from a file; keep the two in step.
 */
import type { ServerResponse } from 'node:http';

export const RENDERER_CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

/** An API response is data, never a document: it may load nothing at all. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'";

/** On every response. The page URL carries the token, so no Referer may ever leave it. */
export const COMMON_HEADERS: Readonly<Record<string, string>> = {
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'no-referrer',
  'X-Frame-Options': 'DENY',
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Cross-Origin-Resource-Policy': 'same-origin',
  'Cache-Control': 'no-store',
};

export function sendJson(res: ServerResponse, status: number, body: unknown, extra: Record<string, string> = {}): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    ...COMMON_HEADERS,
    'Content-Security-Policy': API_CSP,
    'Content-Type': 'application/json; charset=utf-8',
    'Content-Length': String(Buffer.byteLength(text)),
    ...extra,
  });
  res.end(text);
}

export function sendError(res: ServerResponse, status: number, error: string, extra: Record<string, string> = {}): void {
  sendJson(res, status, { error }, extra);
}
