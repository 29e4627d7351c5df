/**
 * The built renderer as static files: GET/HEAD only, `/` is index.html, no directory listings,
 * nothing outside the folder. The request path is judged as sent (before any URL normalisation):
 * a segment that decodes to `.` or `..`, or that holds a slash, backslash or NUL once decoded,
 * is refused, as are dot-files; the file found must resolve (symlinks followed) inside the
 * folder and be a regular file. Every refusal is a plain 404, so a probe learns nothing.
 */
import { createReadStream } from 'node:fs';
import { realpath, stat } from 'node:fs/promises';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { extname, join, sep } from 'node:path';
import { COMMON_HEADERS, RENDERER_CSP, sendError } from './headers.js';

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
};

/** The page shown while out/renderer/ has not been built. No script, no style: the CSP allows neither inline. */
const NOT_BUILT_PAGE = `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><title>Tauwell: renderer not built</title></head>
<body>
<h1>Tauwell</h1>
<p>The server is running, but the screens (the renderer) are not built yet.</p>
<p>Build them in the project folder with <code>npx electron-vite build</code> (or <code>npm start</code>),
then reload this page. The API is available meanwhile at <code>POST /api/&lt;method&gt;</code> with the token.</p>
</body>
</html>
`;

/** The path below the folder that `rawUrl` names, or undefined when it is refused. */
export function staticPath(rawUrl: string): string[] | undefined {
  const path = rawUrl.split(/[?#]/, 1)[0];
  if (!path.startsWith('/') || path.includes('\\')) return undefined;
  if (path === '/') return ['index.html'];
  const segments: string[] = [];
  for (const raw of path.slice(1).split('/')) {
    let segment: string;
    try {
      segment = decodeURIComponent(raw);
    } catch {
      return undefined; // malformed %-escape
    }
    if (segment === '' || segment.startsWith('.') || /[/\\\0]/.test(segment)) return undefined;
    segments.push(segment);
  }
  return segments;
}

export async function serveStatic(req: IncomingMessage, res: ServerResponse, folder: string): Promise<void> {
  if (req.method !== 'GET' && req.method !== 'HEAD') {
    sendError(res, 405, 'only GET and HEAD are served here; the API is POST /api/<method>', { Allow: 'GET, HEAD' });
    return;
  }
  const segments = staticPath(req.url ?? '');
  if (segments === undefined) return notFound(res);
  const file = await insideFolder(folder, segments);
  if (file === undefined) {
    if (segments.length === 1 && segments[0] === 'index.html') return send(res, req, 200, 'text/html; charset=utf-8', NOT_BUILT_PAGE);
    return notFound(res);
  }
  const type = CONTENT_TYPES[extname(file.path).toLowerCase()] ?? 'application/octet-stream';
  res.writeHead(200, { ...COMMON_HEADERS, 'Content-Security-Policy': RENDERER_CSP, 'Content-Type': type, 'Content-Length': String(file.size) });
  if (req.method === 'HEAD') {
    res.end();
    return;
  }
  createReadStream(file.path).on('error', () => res.destroy()).pipe(res);
}

/** The regular file at `segments` below `folder`, resolved, or undefined when there is none inside it. */
async function insideFolder(folder: string, segments: readonly string[]): Promise<{ path: string; size: number } | undefined> {
  try {
    const root = await realpath(folder);
    const path = await realpath(join(root, ...segments));
    if (!path.startsWith(root + sep)) return undefined;
    const info = await stat(path);
    return info.isFile() ? { path, size: info.size } : undefined;
  } catch {
    return undefined; // no such file (or folder): the same 404 as a refused path
  }
}

function send(res: ServerResponse, req: IncomingMessage, status: number, type: string, text: string): void {
  res.writeHead(status, { ...COMMON_HEADERS, 'Content-Security-Policy': RENDERER_CSP, 'Content-Type': type, 'Content-Length': String(Buffer.byteLength(text)) });
  res.end(req.method === 'HEAD' ? undefined : text);
}

function notFound(res: ServerResponse): void {
  sendError(res, 404, 'not found');
}
