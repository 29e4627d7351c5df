/**
 * The imports recorded in the field log: a table of the recent ones with their status and
 * accounting, each with a button that re-opens its report, and the loading of such a report (the
 * record, plus its rejected rows from the rejected-rows export).
 */
import type { Wire } from '../../shared/contract/channels.js';
import { REPORT_REJECTED_LIMIT, type ImportRecordJson, type RejectedRowJson } from '../../shared/contract/imports.js';
import type { AppContext } from '../app/context.js';
import type { Display } from '../app/display.js';
import { h } from '../app/dom.js';
import { reportOfRecord, type ReportData } from './import-model.js';

/** A recorded import as a report; rejects when the record cannot be read. */
export async function recordReport(app: AppContext, id: number): Promise<{ record: Wire<ImportRecordJson>; report: ReportData }> {
  const record = await app.client.getImport({ id });
  let rejected: Wire<RejectedRowJson>[] = [];
  if (record.rejected > 0) {
    try {
      const out = await app.client.exportData({ kind: 'rejected', importId: id, format: 'json' });
      // The JSON export is { kind, exportedAt, rows: RejectedRowJson[] }.
      const parsed: unknown = JSON.parse(out.text);
      const rows: unknown = Array.isArray(parsed) ? parsed : typeof parsed === 'object' && parsed !== null ? (parsed as { rows?: unknown }).rows : undefined;
      if (Array.isArray(rows)) rejected = rows.filter(isRejectedRow);
    } catch {
      // The report still offers the CSV export; only the list is missing.
    }
  }
  return { record, report: reportOfRecord(record, rejected, REPORT_REJECTED_LIMIT) };
}

function isRejectedRow(x: unknown): x is Wire<RejectedRowJson> {
  if (typeof x !== 'object' || x === null) return false;
  const r = x as Record<string, unknown>;
  return typeof r.line === 'number' && typeof r.reason === 'string' && typeof r.raw === 'string';
}

const STATUS_MARK: Readonly<Record<string, string>> = {
  complete: 'mark-good', running: 'mark-fair', failed: 'mark-poor', cancelled: 'mark-no-data', interrupted: 'mark-poor',
};

/** Recent imports as a table, newest first, each with a button that re-opens its report. */
export function recentImportsTable(imports: readonly Wire<ImportRecordJson>[], display: Display, open: (id: number) => void): HTMLElement {
  if (imports.length === 0) return h('p', { class: 'muted' }, 'No file has been imported into this field log yet.');
  return h('div', { class: 'imp-table-wrap' },
    h('table', { class: 'data-table imp-recent' },
      h('caption', {}, 'Recent imports'),
      h('thead', {}, h('tr', {},
        h('th', { scope: 'col', class: 'num' }, '#'), h('th', { scope: 'col' }, 'File'), h('th', { scope: 'col' }, 'Field'),
        h('th', { scope: 'col' }, 'Started'), h('th', { scope: 'col' }, 'Status'), h('th', { scope: 'col' }, 'Accounting'),
        h('th', { scope: 'col' }, h('span', { class: 'imp-vh' }, 'Report')))),
      h('tbody', {}, imports.map((r) => h('tr', {},
        h('th', { scope: 'row', class: 'num' }, String(r.id)),
        h('td', {}, r.file),
        h('td', {}, r.field ?? '—'),
        h('td', {}, display.dateTime(r.started)),
        h('td', {}, h('span', { class: `mark ${STATUS_MARK[r.status] ?? 'mark-no-data'}` }, r.status), r.conflicts > 0 ? h('span', { class: 'muted' }, ` ${r.conflicts} conflict${r.conflicts === 1 ? '' : 's'}`) : null),
        h('td', { class: 'imp-recent-message' }, r.message),
        h('td', {}, h('button', { type: 'button', onclick: () => open(r.id), 'aria-label': `Open import #${r.id}` }, 'Open')))))));
}
