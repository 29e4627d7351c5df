/**
 * The report action of the well and field screens: the offline decline report (PDF or one
 * self-contained HTML file) made by the back end and saved by the user.
 */
import type { ReportFormat } from '../../shared/contract/reports.js';
import type { AppContext } from './context.js';
import { bytesOfBase64, downloadBlob } from './download.js';
import { h } from './dom.js';

export function reportActions(app: AppContext, subject: { well?: string; field?: string }): HTMLElement {
  const status = h('span', { class: 'muted', role: 'status', 'aria-live': 'polite' });
  const what = subject.well !== undefined ? `the report of ${subject.well}` : `the report of ${subject.field ?? 'the field'}`;
  const button = (format: ReportFormat, label: string): HTMLButtonElement => {
    const b = h('button', { type: 'button' }, label);
    b.addEventListener('click', () => {
      b.disabled = true;
      status.textContent = `Making ${what} (${format.toUpperCase()})…`;
      app.client.makeReport({ ...subject, format })
        .then((r) => {
          downloadBlob(new Blob([bytesOfBase64(r.base64)], { type: r.mediaType }), r.suggestedFileName);
          status.textContent = `Saved ${r.suggestedFileName} (${Math.max(1, Math.round(r.sizeBytes / 1024))} KiB).`;
        })
        .catch((e: unknown) => { status.textContent = `The report could not be made: ${e instanceof Error ? e.message : String(e)}`; })
        .finally(() => { b.disabled = false; });
    });
    return b;
  };
  return h('div', { class: 'actions report-actions', role: 'group', 'aria-label': 'Offline report' },
    button('pdf', 'Save report (PDF)'), button('html', 'Save report (HTML)'), status);
}
