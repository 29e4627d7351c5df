/**
 * Exports leave the renderer as downloads: the page builds a Blob and clicks an `<a download>` for
 * its object URL. The session lets such a download through only when it is a blob: URL the app's
 * own page made (Chromium names it `blob:<page origin>/<uuid>`, `blob:file:///<uuid>` for a page
 * loaded from a file) and the page that started it is the app's; anything else — a remote URL, a
 * file: URL, a blob of another origin — is cancelled before a byte is written. An allowed download
 * asks where to save with the native dialog, starting in Documents.
 *
 *   isAppBlobUrl(url, location): boolean
 *   decideDownload({ url, pageUrl }, location): DownloadDecision
 *   saveDialogOptions(suggestedName, documentsFolder): SaveDialogOptions
 *   handleDownloads(session, { location, documentsFolder, log? })
 */
import type { SaveDialogOptions, Session } from 'electron';
import { basename, extname, join } from 'node:path';
import type { AppLocation } from './window.js';

// The form of Chromium's object URL ids (a version 4 UUID in lower case).
const OBJECT_ID = /^\/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

function parsed(url: string | undefined): URL | undefined {
  if (url === undefined) return undefined;
  try {
    return new URL(url);
  } catch {
    return undefined;
  }
}

/** An object URL minted by a page of the app's origin: same scheme and host, nothing else in it. */
export function isAppBlobUrl(url: string, location: AppLocation): boolean {
  const blob = parsed(url);
  if (blob === undefined || blob.protocol !== 'blob:' || blob.search !== '' || blob.hash !== '') return false;
  const inner = parsed(blob.pathname);
  const page = parsed(location.url);
  if (inner === undefined || page === undefined) return false;
  return inner.protocol === page.protocol && inner.host === page.host && inner.username === '' && inner.password === ''
    && inner.search === '' && OBJECT_ID.test(inner.pathname);
}

export type DownloadDecision = { allow: true } | { allow: false; reason: string };

export function decideDownload(download: { url: string; pageUrl: string | undefined }, location: AppLocation): DownloadDecision {
  if (download.pageUrl === undefined || !location.isAppDocument(download.pageUrl)) {
    return { allow: false, reason: `it was not started by the Tauwell page (${download.pageUrl ?? 'no page'})` };
  }
  if (!isAppBlobUrl(download.url, location)) return { allow: false, reason: `only the page's own exports are saved, not ${download.url}` };
  return { allow: true };
}

const KINDS: Readonly<Record<string, string>> = {
  csv: 'CSV table', json: 'JSON', html: 'HTML report', pdf: 'PDF document', png: 'PNG image', svg: 'SVG image', txt: 'Text',
};

export function saveDialogOptions(suggestedName: string, documentsFolder: string): SaveDialogOptions {
  // Chromium already makes the suggested name safe; taking the last part of it again costs nothing.
  const name = basename(suggestedName.replace(/\\/g, '/')).trim() || 'tauwell-export';
  const ext = extname(name).slice(1).toLowerCase();
  const all = { name: 'All files', extensions: ['*'] };
  return {
    title: 'Save export',
    defaultPath: join(documentsFolder, name),
    filters: ext === '' ? [all] : [{ name: KINDS[ext] ?? `${ext.toUpperCase()} file`, extensions: [ext] }, all],
    properties: ['createDirectory', 'showOverwriteConfirmation'],
  };
}

export interface DownloadOptions {
  location: AppLocation;
  /** Asked at each download (app.getPath('documents')). */
  documentsFolder(): string;
  log?: (text: string) => void;
}

export function handleDownloads(session: Session, options: DownloadOptions): void {
  const log = options.log ?? ((text: string) => void process.stderr.write(text));
  session.on('will-download', (event, item, contents) => {
    const decision = decideDownload({ url: item.getURL(), pageUrl: contents?.getURL() }, options.location);
    if (!decision.allow) {
      // Electron: preventDefault in will-download cancels the download.
      event.preventDefault();
      log(`tauwell: download cancelled: ${decision.reason}\n`);
      return;
    }
    item.setSaveDialogOptions(saveDialogOptions(item.getFilename(), options.documentsFolder()));
  });
}
