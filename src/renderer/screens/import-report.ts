/**
 * The report of an import: where every data row went (rows read = imported + duplicates +
 * conflicts + rejected), the rejected rows with their reason and their text exactly as in the file
 * (exportable as CSV), unknown and created wells, the assumptions the reader applied, and — when
 * the same bytes were imported before — that fact with a way to import them again anyway.
 */
import { downloadText } from '../app/download.js';
import type { AppContext } from '../app/context.js';
import type { Display } from '../app/display.js';
import { h, notice } from '../app/dom.js';
import { accountingFacts, plainOptionWords, type ReportData } from './import-model.js';

export interface ReportHandlers {
  /** Import the same staged file again although its bytes were imported before; absent for a re-opened record. */
  force?: () => void;
}

const STATUS_MARK: Readonly<Record<string, string>> = {
  complete: 'mark-good', running: 'mark-fair', failed: 'mark-poor', cancelled: 'mark-no-data', interrupted: 'mark-poor',
};

export function reportView(app: AppContext, display: Display, data: ReportData, handlers: ReportHandlers): HTMLElement {
  const parts: (HTMLElement | null)[] = [];
  const r = data.record;

  if (data.alreadyImported !== null) {
    const earlier = data.alreadyImported;
    const when = `import #${earlier.id} of ${display.dateTime(earlier.started)} (${earlier.file})`;
    if (r === null) {
      parts.push(notice('warn',
        h('p', {}, h('strong', {}, 'Already imported. '), data.message),
        h('p', {}, `The same bytes were imported completely by ${when}: ${earlier.message}`),
        handlers.force !== undefined ? h('div', { class: 'actions' }, h('button', { type: 'button', onclick: handlers.force }, 'Import again anyway')) : null));
    } else {
      parts.push(notice('info', `The same bytes had been imported by ${when}; they were imported again as asked.`));
    }
  }
  if (data.error !== null) parts.push(notice('error', plainOptionWords(data.error)));

  if (r !== null) {
    const { facts, balanced } = accountingFacts(r, data.blankRows);
    parts.push(
      h('p', { class: 'imp-report-head' },
        h('span', { class: `mark ${STATUS_MARK[r.status] ?? 'mark-no-data'}` }, r.status), ' ',
        `Import #${r.id} of “${r.file}”`, r.field !== null ? ` into ${r.field}` : '', `, ${display.dateTime(r.started)}`),
      h('p', { class: 'imp-accounting' }, data.message),
    );
    // A cancelled or failed import stored nothing: its counts are all zero, and the message says how far it got.
    if (r.status === 'complete') {
      parts.push(
        h('div', { class: 'facts' }, facts.map((f) => h('div', { class: 'fact' },
          h('div', { class: 'fact-label' }, f.label), h('div', { class: 'fact-value' }, f.value), f.note !== undefined ? h('div', { class: 'fact-note' }, f.note) : null))),
        balanced ? null : notice('error', 'The counts do not add up to the rows read; please report this import.'),
      );
    }
    if (data.profileSaved !== null) parts.push(notice('ok', `The choices were saved as profile “${data.profileSaved}”.`));
  }

  if (data.unknownWells.length > 0) {
    parts.push(h('h3', {}, 'Wells the field lacks'),
      h('p', {}, 'Their rows were rejected; import again with “Create the wells the file names” ticked, or create the wells first.'),
      h('ul', {}, data.unknownWells.map((w) => h('li', {}, h('strong', {}, w.name), ` — ${w.rows} ${w.rows === 1 ? 'row' : 'rows'}`))));
  }
  if (data.createdWells.length > 0) {
    parts.push(h('h3', {}, 'Wells created'), h('p', {}, `As production wells: ${data.createdWells.join(', ')}.`));
  }

  if (r !== null && r.rejected > 0) parts.push(rejectedView(app, r.id, data));
  if (data.assumptions.length > 0) {
    parts.push(h('h3', {}, 'Assumptions the reader applied'), h('ul', { class: 'imp-assumptions' }, data.assumptions.map((a) => h('li', {}, a))));
  }
  return h('div', { class: 'imp-report-body' }, parts);
}

function rejectedView(app: AppContext, importId: number, data: ReportData): HTMLElement {
  const status = h('span', { class: 'muted', role: 'status' });
  const exportButton = h('button', { type: 'button' }, 'Export rejected rows (CSV)');
  exportButton.addEventListener('click', () => {
    exportButton.disabled = true;
    status.textContent = 'Preparing the file…';
    app.client.exportData({ kind: 'rejected', importId, format: 'csv' })
      .then((out) => {
        downloadText(out.text, out.suggestedFileName, out.mediaType);
        status.textContent = `${out.rowCount} ${out.rowCount === 1 ? 'row' : 'rows'} in ${out.suggestedFileName}.`;
      })
      .catch((e: unknown) => { status.textContent = `The export failed: ${e instanceof Error ? e.message : String(e)}`; })
      .finally(() => { exportButton.disabled = false; });
  });
  const shown = data.rejected.length;
  return h('div', { class: 'imp-rejected' },
    h('h3', {}, 'Rejected rows'),
    h('div', { class: 'actions' }, exportButton, status),
    shown === 0 ? h('p', { class: 'muted' }, 'The rows are kept with the import; export them to see them all.') : h('div', { class: 'imp-table-wrap', tabindex: '0', role: 'region', 'aria-label': 'Rejected rows' },
      h('table', { class: 'data-table' },
        h('caption', {}, data.rejectedTruncated ? `The first ${shown} rejected rows; the export has them all` : `${shown} rejected ${shown === 1 ? 'row' : 'rows'}`),
        h('thead', {}, h('tr', {}, h('th', { scope: 'col', class: 'num' }, 'Line'), h('th', { scope: 'col' }, 'Reason'), h('th', { scope: 'col' }, 'Text as in the file'))),
        h('tbody', {}, data.rejected.map((row) => h('tr', {},
          h('th', { scope: 'row', class: 'num' }, String(row.line)),
          h('td', {}, plainOptionWords(row.reason)),
          h('td', {}, h('code', { class: 'imp-raw' }, row.raw))))))));
}

/**
 * Hands text to the browser as a download: in a browser tab it lands in the downloads, in the
 * desktop window the shell asks where to save it.
 */
