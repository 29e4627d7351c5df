/**
 * An import running as a job on the back end: a progress bar with the phase and the rows read,
 * polled every quarter second, and a Cancel button (the back end rolls the import back, so nothing
 * of the file is stored). The end of the job, however it ended, goes to `onEnded`.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ImportJobJson, StartImportRequest } from '../../shared/contract/imports.js';
import type { AppContext } from '../app/context.js';
import { h } from '../app/dom.js';
import { progressText } from './import-model.js';

const POLL_MS = 250;

export interface JobPanel {
  element: HTMLElement;
  running(): boolean;
  /** Starts the import; rejects (InputError, CallError) when the back end refuses to start it. */
  start(request: StartImportRequest): Promise<void>;
  hide(): void;
  /** Stops polling (the screen is left); the job itself runs on. */
  stop(): void;
}

export function jobPanel(app: AppContext, onEnded: (job: Wire<ImportJobJson>) => void): JobPanel {
  const bar = h('progress', { max: 1, value: 0, 'aria-label': 'Import progress' });
  const text = h('p', { class: 'imp-job-text', role: 'status', 'aria-live': 'polite' });
  const cancelButton = h('button', { type: 'button', class: 'danger' }, 'Cancel import');
  const element = h('section', { class: 'panel', 'aria-label': 'Import progress', hidden: true },
    h('h2', {}, '3 · Import'), bar, text, h('div', { class: 'actions' }, cancelButton));
  let job: Wire<ImportJobJson> | null = null;
  let timer: number | undefined;
  let stopped = false;

  function show(j: Wire<ImportJobJson>): void {
    const p = j.progress;
    if (j.state === 'complete') {
      bar.max = 1;
      bar.value = 1;
    } else if (p !== null && p.totalBytes > 0) {
      bar.max = p.totalBytes;
      bar.value = p.bytesDone;
    } else bar.removeAttribute('value'); // indeterminate until the reader reports
    const refused = j.result !== null && j.result.import === null && j.result.alreadyImported !== null;
    text.textContent = refused
      ? 'Not imported: the same bytes were imported before (see the report).'
      : j.state === 'running' ? `Importing “${j.file.name}”: ${progressText(j)}` : `Import ${j.state}: ${progressText(j)}`;
  }

  function take(j: Wire<ImportJobJson>): void {
    job = j;
    show(j);
    if (j.state === 'running') {
      poll();
      return;
    }
    window.clearTimeout(timer);
    cancelButton.hidden = true;
    onEnded(j);
  }

  function poll(): void {
    window.clearTimeout(timer);
    if (stopped || job === null) return;
    const jobId = job.jobId;
    timer = window.setTimeout(() => {
      app.client.importJob({ jobId })
        .then((j) => { if (!stopped && job?.jobId === jobId && job.state === 'running') take(j); })
        .catch((e: unknown) => {
          if (stopped) return;
          text.textContent = `Lost touch with the import: ${e instanceof Error ? e.message : String(e)}; retrying…`;
          timer = window.setTimeout(poll, 4 * POLL_MS);
        });
    }, POLL_MS);
  }

  cancelButton.addEventListener('click', () => {
    if (job === null || job.state !== 'running') return;
    cancelButton.disabled = true;
    text.textContent = 'Cancelling: nothing from this file will be stored…';
    app.client.cancelImport({ jobId: job.jobId })
      .then((j) => { if (!stopped && job?.state === 'running') take(j); })
      .catch((e: unknown) => {
        cancelButton.disabled = false;
        app.tell('error', `The import could not be cancelled: ${e instanceof Error ? e.message : String(e)}`);
      });
  });

  return {
    element,
    running: () => job !== null && job.state === 'running',
    async start(request) {
      const j = await app.client.startImport(request);
      element.hidden = false;
      cancelButton.disabled = false;
      cancelButton.hidden = false;
      element.scrollIntoView({ block: 'nearest' });
      take(j);
    },
    hide() {
      if (job === null || job.state !== 'running') element.hidden = true;
    },
    stop() {
      stopped = true;
      window.clearTimeout(timer);
    },
  };
}
