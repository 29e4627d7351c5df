/**
 * One self-contained HTML file from the built report page (out/report/report.html, made by
 * vite.report.config.ts) and a report model: the page's script and stylesheet are inlined, the model
 * goes in as JSON, and the print rules for the chosen paper are added — running headers with the
 * report and well, footers with when and by which version it was made and "page N of M".
 *
 * A Content-Security-Policy meta tag lets only the inlined code run (script-src and style-src by
 * SHA-256 hash, CSP Level 3) and forbids every fetch (default-src 'none', connect-src 'none'), so
 * the file opens offline in any browser and makes no request.
 *
 * Running headers per well: the page gives the section of well i the attribute
 * data-report-page="well-i" (src/renderer/report/report.ts); the rules here put that section on
 * the named page well-i (CSS Paged Media: `page`), whose top margin box names the well.
 *
 * Exported API:
 *   type Paper = 'a4' | 'letter'
 *   DEFAULT_PAGE_FILE
 *   assembleReportHtml(model, { paper, pageFile? }): string
 *   reportPageCss(model, paper): string
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, isAbsolute, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError } from '../../shared/errors.js';
import type { ReportModel } from '../../shared/report/model.js';

export type Paper = 'a4' | 'letter';
export const PAPERS: readonly Paper[] = ['a4', 'letter'];

/** Three folders up from src/main/report, dist/main/report and out/main/desktop alike: the project. */
export const DEFAULT_PAGE_FILE = fileURLToPath(new URL('../../../out/report/report.html', import.meta.url));

/** The id of the JSON element the page reads the model from (src/renderer/report/report.ts). */
export const MODEL_ELEMENT_ID = 'tauwell-report';

/** Brackets the placeholders of inlined files: a character no HTML page contains (U+FFFF is a noncharacter). */
const MARK = '\uffff';

const PAPER_SIZE: Record<Paper, string> = { a4: 'A4', letter: 'letter' };

export function assembleReportHtml(model: ReportModel, options: { paper: Paper; pageFile?: string }): string {
  const pageFile = options.pageFile ?? DEFAULT_PAGE_FILE;
  if (!existsSync(pageFile)) {
    throw new InputError('the report page is not built; run `npm run build:renderer` in the project folder', { file: pageFile });
  }
  const folder = dirname(pageFile);
  let html = normalise(readFileSync(pageFile, 'utf8'));
  const scripts: string[] = [];
  const styles: string[] = [];

  // The model first, while the page is only the page ('<' is escaped in the JSON, so no tag can hide in it).
  const placeholder = new RegExp(`<script type="application/json" id="${MODEL_ELEMENT_ID}">[^<]*</script>`);
  if (!placeholder.test(html)) throw new Error(`the report page has no <script type="application/json" id="${MODEL_ELEMENT_ID}"> for the model`);
  html = html.replace(placeholder, () => `<script type="application/json" id="${MODEL_ELEMENT_ID}">${jsonForScript(model)}</script>`);

  // The page's own script and stylesheet become placeholders first, so the check below reads only the page.
  html = html.replace(/<script\b[^>]*\bsrc="([^"]+)"[^>]*><\/script>/g, (_tag, src: string) => {
    scripts.push(escapeScript(normalise(readAsset(folder, src))));
    return `${MARK}script ${scripts.length - 1}${MARK}`;
  });
  html = html.replace(/<link\b[^>]*\brel="stylesheet"[^>]*>/g, (tag) => {
    const href = /\bhref="([^"]+)"/.exec(tag)?.[1];
    if (href === undefined) throw new Error(`the report page links a stylesheet without an address: ${tag}`);
    styles.push(escapeStyle(normalise(readAsset(folder, href))));
    return `${MARK}style ${styles.length - 1}${MARK}`;
  });
  // Nothing else may point elsewhere: a leftover reference would be a request.
  const leftover = /<(?:script|link|img|iframe|source|video|audio)\b[^>]*\b(?:src|href)=/i.exec(html);
  if (leftover !== null) throw new Error(`the report page still refers to a file after inlining: ${html.slice(leftover.index, leftover.index + 120)}`);
  html = html.replace(new RegExp(`${MARK}(script|style) (\\d+)${MARK}`, 'g'), (_m, kind: string, i: string) =>
    kind === 'script' ? `<script type="module">${scripts[Number(i)]}</script>` : `<style>${styles[Number(i)]}</style>`);

  const print = escapeStyle(reportPageCss(model, options.paper));
  styles.push(print);
  const csp = [
    "default-src 'none'",
    `script-src ${scripts.map(hashSource).join(' ')}`,
    `style-src ${styles.map(hashSource).join(' ')}`,
    'img-src data:',
    "font-src 'none'",
    "connect-src 'none'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'none'",
  ].join('; ');

  const head = `<meta http-equiv="Content-Security-Policy" content="${csp}">`;
  if (!/<meta charset="utf-8"\s*\/?>/i.test(html)) throw new Error('the report page has no <meta charset="utf-8">');
  html = html.replace(/<meta charset="utf-8"\s*\/?>/i, (m) => `${m}\n${head}`);
  html = html.replace(/<title>[^<]*<\/title>/, () => `<title>${escapeHtml(model.title)}</title>`);
  html = html.replace('</head>', () => `<style>${print}</style>\n</head>`);
  return html.replace('<html lang="en">', () => `<html lang="en" data-paper="${options.paper}">`);
}

/** Paper, margins, running headers and footers, and one named page per well (see the header comment). */
export function reportPageCss(model: ReportModel, paper: Paper): string {
  const made = `Generated ${model.meta.generatedAt.replace('T', ' ').replace(/\.\d+Z$/, 'Z').replace(/Z$/, ' UTC')} · Tauwell ${model.meta.appVersion}`;
  const box = 'font: 8pt system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", sans-serif; color: #4f585d;';
  const rules = [
    `@page {`,
    `  size: ${PAPER_SIZE[paper]};`,
    '  margin: 18mm 15mm 17mm 15mm;',
    `  @top-left { content: ${cssString(model.title)}; ${box} }`,
    `  @top-right { content: ${cssString(model.subtitle)}; ${box} }`,
    `  @bottom-left { content: ${cssString(made)}; ${box} }`,
    `  @bottom-right { content: "page " counter(page) " of " counter(pages); ${box} }`,
    '}',
  ];
  // Named pages only in a field report: a well report's pages are all the one well's (src/renderer/report/well-page.ts).
  if (model.scope.kind === 'field') model.wells.forEach((w, i) => {
    const name = `well-${i + 1}`;
    rules.push(`@page ${name} { @top-right { content: ${cssString(w.header)}; ${box} } }`);
    rules.push(`[data-report-page="${name}"] { page: ${name}; }`);
  });
  return rules.join('\n');
}

function readAsset(folder: string, ref: string): string {
  if (/^[a-z][a-z0-9+.-]*:/i.test(ref) || ref.startsWith('//') || isAbsolute(ref)) {
    throw new Error(`the report page refers to ${ref}, which is not a file beside it`);
  }
  const path = resolve(folder, ref.split(/[?#]/)[0]);
  if (!existsSync(path)) throw new InputError('a file of the built report page is missing; run `npm run build:renderer` again', { file: path });
  return readFileSync(path, 'utf8');
}

/** The HTML parser turns CR LF and lone CR into LF before a hash is taken: do the same first. */
function normalise(text: string): string {
  return text.replace(/\r\n?/g, '\n');
}

/**
 * Inside <script> the text must not close the element early nor open an HTML comment (which changes
 * how the parser looks for the end). Both spellings can occur only inside string, template or regular
 * expression literals of bundled code, where the escape \x3C is the same '<' in every one of them.
 */
function escapeScript(code: string): string {
  return code.replace(/<(\/script|!--)/gi, '\\x3C$1');
}

/** The same for <style>: '</style' can occur only in a CSS string, where \3c is '<'. */
function escapeStyle(css: string): string {
  return css.replace(/<\/(style)/gi, '\\3c /$1');
}

/** The model as JSON that cannot end its <script> element: every '<' (and the JS line separators) escaped. */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value).replace(/</g, '\\u003c').replace(/\u2028/g, '\\u2028').replace(/\u2029/g, '\\u2029');
}

function hashSource(text: string): string {
  return `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;
}

/** A CSS string literal: quotes, backslashes and line breaks escaped (CSS Syntax §4.3.5), '<' too. */
function cssString(text: string): string {
  return `"${text.replace(/\\/g, '\\\\').replace(/"/g, '\\"').replace(/\n/g, '\\a ').replace(/</g, '\\3c ')}"`;
}

function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}
