/**
 * Import screen (#/import): choose a plant export, check how it is read, import it, decide its
 * conflicts. The file goes to the back end in chunks (import-upload.ts); every change of a choice
 * re-runs the preview after a short pause; the import runs as a job whose progress is polled; the
 * report and the conflicts follow. The user's choices live here, apart from any response, so a
 * failed preview loses none of them.
 */
import type { Wire } from '../../shared/contract/channels.js';
import { CallError } from '../../shared/contract/client.js';
import type { ImportJobJson, PreviewImportResponse, StagedFileJson } from '../../shared/contract/imports.js';
import type { ListWellsResponse } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import { ROLE_LABEL, UNIT_ROLES, type ChosenUnit, type ColumnRole, type UnitRole } from '../../shared/import/types.js';
import type { AppContext, Screen } from '../app/context.js';
import type { Display } from '../app/display.js';
import { field, h, notice, replace, select, uid } from '../app/dom.js';
import { conflictsView, type ConflictsView } from './import-conflicts.js';
import { recentImportsTable, recordReport } from './import-history.js';
import {
  choicesWithProfile, emptyChoices, isDateOrderProblem, plainOptionWords, previewRequestOf, previewTableModel, profileOptionsOf,
  reportOfResponse, startRequestOf, withRole, type ImportChoices,
} from './import-model.js';
import { jobPanel, type JobPanel } from './import-job.js';
import { optionsForm, type OptionsForm } from './import-options.js';
import { fileFacts, previewTable, sizeText } from './import-preview.js';
import { reportView } from './import-report.js';
import { UploadCancelled, uploadFile } from './import-upload.js';
import '../styles/import.css';

const PREVIEW_PAUSE_MS = 400;

type FieldWithWells = Wire<ListWellsResponse>['fields'][number];

let teardown: (() => void) | null = null;

export const importScreen: Screen = {
  title: 'Import',
  async mount(root, _params, app) {
    teardown = await mountImport(root, app);
  },
  unmount() {
    teardown?.();
    teardown = null;
  },
};

async function mountImport(root: HTMLElement, app: AppContext): Promise<() => void> {
  let alive = true;
  const fields: FieldWithWells[] = (await app.client.listWells()).fields;

  // ---- state ----
  let choices: ImportChoices = emptyChoices(fields.length === 1 ? fields[0].name : '');
  let staged: Wire<StagedFileJson> | null = null;
  let preview: Wire<PreviewImportResponse> | null = null;
  /** The newest preview that could read the file: its table stays while newer choices fail. */
  let lastGood: Wire<PreviewImportResponse> | null = null;
  let previewFailed = false;
  let previewSeq = 0;
  let previewTimer: number | undefined;
  let rowsShown = 20;
  let detectedUnits: Partial<Record<UnitRole, ChosenUnit>> = {};
  let uploadToken = 0;
  let loadedProfile = '';
  let profileColumns: ImportChoices['columns'] = {};

  const fieldInfo = (): FieldWithWells | undefined => fields.find((f) => f.name === choices.field);
  const displayOf = (fieldName?: string): Display => app.display(fields.find((f) => f.name === (fieldName ?? choices.field))?.timeZone);

  // ---- step 1: field and file ----
  const fieldSelect = field('Field to import into', select(
    [...(fields.length === 1 ? [] : [['', fields.length === 0 ? 'no field yet' : 'choose the field'] as const]), ...fields.map((f) => [f.name, f.name] as const)],
    choices.field));
  const fileInput = field('CSV file to import', h('input', { type: 'file', accept: '.csv,.txt,text/csv' }), 'a plant export: comma, semicolon, tab or pipe separated');
  const uploadBar = h('progress', { max: 1, value: 0, 'aria-label': 'Upload progress' });
  const uploadText = h('span', { class: 'muted', role: 'status' });
  const uploadBox = h('div', { class: 'imp-upload', hidden: true }, uploadBar, uploadText);
  const dropZone = h('div', { class: 'imp-drop' }, h('span', { class: 'imp-drop-text' }, 'Drop a CSV file here, or use the file control above.'));
  const stagedLine = h('p', { class: 'imp-staged', hidden: true });

  fieldSelect.control.addEventListener('change', () => {
    fieldSelect.setError(null);
    choices = { ...choices, field: fieldSelect.control.value };
    options.setWells(wellNames());
    options.show(choices, preview, fieldZone());
    schedulePreview(true);
  });
  fileInput.control.addEventListener('change', () => {
    const file = fileInput.control.files?.[0];
    if (file !== undefined) void takeFile(file);
  });
  dropZone.addEventListener('dragover', (e) => { e.preventDefault(); dropZone.classList.add('imp-drop-over'); });
  dropZone.addEventListener('dragleave', () => dropZone.classList.remove('imp-drop-over'));
  dropZone.addEventListener('drop', (e) => {
    e.preventDefault();
    dropZone.classList.remove('imp-drop-over');
    const file = e.dataTransfer?.files[0];
    if (file !== undefined) void takeFile(file);
  });

  const chooseHeading = h('h2', {}, '1 · Choose the file');
  const choosePanel = h('section', { class: 'panel', 'aria-label': 'Choose the file' }, chooseHeading,
    fields.length === 0 ? notice('warn', 'The field log has no field yet; create one (or the demo field) before importing.') : null,
    h('div', { class: 'form-row' }, fieldSelect.wrap, fileInput.wrap),
    dropZone, uploadBox, stagedLine);

  // ---- step 2: how the file is read ----
  const wellNames = (): string[] => fieldInfo()?.wells.map((w) => w.name) ?? [];
  const options: OptionsForm = optionsForm({
    change(patch, now) {
      choices = { ...choices, ...patch };
      options.setError(Object.keys(patch)[0] ?? '', null);
      if ('createWells' in patch) { options.show(choices, preview, fieldZone()); updateImportButton(); return; }
      schedulePreview(now);
    },
    rowsShown(n) { rowsShown = n; schedulePreview(true); },
    loadProfile(name) { void loadProfile(name); },
    saveProfile(name) { void saveProfile(name); },
  }, wellNames());
  const facts = h('div', { class: 'imp-facts' });
  const previewNotice = h('div', { class: 'imp-preview-notice' });
  const tableBox = h('div', { class: 'imp-table-box' });
  const assumptions = h('div', { class: 'imp-preview-assumptions' });
  const busy = h('span', { class: 'muted imp-busy', role: 'status', 'aria-live': 'polite' });
  const importButton = h('button', { type: 'button', class: 'primary', disabled: true }, 'Import');
  const importHint = h('span', { class: 'muted', id: uid('import-hint') });
  importButton.setAttribute('aria-describedby', importHint.id);
  importButton.addEventListener('click', () => void startImport(false));
  const resetButton = h('button', { type: 'button' }, 'Reset choices');
  resetButton.addEventListener('click', () => {
    choices = { ...emptyChoices(choices.field), createWells: choices.createWells };
    loadedProfile = '';
    profileColumns = {};
    options.clearErrors();
    options.show(choices, preview, fieldZone());
    void refreshProfiles();
    schedulePreview(true);
  });
  const previewPanel = h('section', { class: 'panel', 'aria-label': 'Check how the file is read', hidden: true },
    h('h2', {}, '2 · Check how the file is read'),
    facts, options.element, previewNotice,
    h('div', { class: 'imp-preview-head' }, h('h3', {}, 'First rows as they would be read'), options.rowsElement, busy),
    tableBox, assumptions,
    h('div', { class: 'actions imp-import-actions' }, importButton, resetButton, importHint));

  // ---- step 3: the import job, its report, the conflicts ----
  const job: JobPanel = jobPanel(app, (j) => void jobEnded(j));

  const reportHeading = h('h2', { id: uid('report-heading'), tabindex: '-1' }, 'Import report');
  const reportBody = h('div');
  const reportPanel = h('section', { class: 'panel imp-report', 'aria-labelledby': reportHeading.id, hidden: true }, reportHeading, reportBody);

  const conflicts: ConflictsView = conflictsView(app, (f) => displayOf(f), () => void refreshRecent());

  const recentBody = h('div');
  const recentPanel = h('section', { class: 'panel', 'aria-label': 'Recent imports' }, h('h2', {}, 'Recent imports'), recentBody);

  replace(root,
    h('h1', {}, 'Import'),
    h('p', { class: 'lede' }, 'Bring a plant export into the field log. Every data row read is accounted for: imported, a duplicate of a stored reading, a conflict held back for your decision, or rejected with its reason.'),
    choosePanel, previewPanel, job.element, reportPanel, conflicts.element, recentPanel);

  void refreshRecent();

  // ---- behaviour ----
  function fieldZone(): string {
    return fieldInfo()?.timeZone ?? 'UTC';
  }

  async function takeFile(file: File): Promise<void> {
    const token = ++uploadToken;
    fileInput.setError(null);
    if (file.size === 0) {
      fileInput.setError('The file is empty.');
      return;
    }
    staged = null;
    preview = null;
    lastGood = null;
    detectedUnits = {};
    // Column choices name the previous file's headers; a loaded profile's stand, being meant for such files.
    choices = { ...choices, columns: { ...profileColumns } };
    previewPanel.hidden = true;
    if (!job.running()) {
      job.hide();
      reportPanel.hidden = true;
      void conflicts.load(null);
    }
    stagedLine.hidden = true;
    uploadBox.hidden = false;
    uploadBar.max = file.size;
    uploadBar.value = 0;
    uploadText.textContent = `Sending “${file.name}” (${sizeText(file.size)})…`;
    try {
      const result = await uploadFile(app.client, file, {
        onProgress(sent, total) {
          uploadBar.value = sent;
          uploadText.textContent = `Sending “${file.name}”: ${sizeText(sent)} of ${sizeText(total)}`;
        },
        cancelled: () => !alive || token !== uploadToken,
      });
      if (!alive || token !== uploadToken) return;
      staged = result;
      uploadBox.hidden = true;
      stagedLine.hidden = false;
      replace(stagedLine, 'File: ', h('strong', {}, result.name), ` · ${sizeText(result.sizeBytes)} · SHA-256 `, h('code', { class: 'mono', title: result.sha256 }, result.sha256.slice(0, 16) + '…'));
      previewPanel.hidden = false;
      options.show(choices, null, fieldZone());
      void refreshProfiles();
      schedulePreview(true);
    } catch (e) {
      if (e instanceof UploadCancelled || token !== uploadToken) return;
      uploadBox.hidden = true;
      fileInput.setError(`The file could not be sent: ${messageOf(e)}`);
    }
  }

  function schedulePreview(now: boolean): void {
    window.clearTimeout(previewTimer);
    if (staged === null) return;
    previewTimer = window.setTimeout(() => void runPreview(), now ? 0 : PREVIEW_PAUSE_MS);
  }

  async function runPreview(): Promise<void> {
    if (staged === null) return;
    const seq = ++previewSeq;
    busy.textContent = 'Reading the file…';
    importButton.disabled = true;
    try {
      const result = await app.client.previewImport(previewRequestOf(choices, staged.staged, rowsShown));
      if (!alive || seq !== previewSeq) return;
      preview = result;
      previewFailed = false;
      if (result.info !== null) {
        for (const role of UNIT_ROLES) if (result.info.units[role].source !== 'option') detectedUnits[role] = result.info.units[role];
      }
      busy.textContent = '';
      drawPreview(null);
    } catch (e) {
      if (!alive || seq !== previewSeq) return;
      previewFailed = true;
      busy.textContent = '';
      drawPreview(e);
    }
  }

  /**
   * Redraws what depends on the last preview; `failure` is why the newest one failed. When the
   * newest could not read the file, the last table that could stays, marked as showing older choices.
   */
  function drawPreview(failure: unknown): void {
    const display = displayOf();
    options.clearErrors();
    fieldSelect.setError(null);
    options.show(choices, preview, fieldZone());
    const info = preview?.info ?? null;
    if (failure === null && preview !== null && info !== null) lastGood = preview;
    replace(facts, info !== null && preview !== null ? fileFacts(info, preview.file.sizeBytes) : null);

    const notices: HTMLElement[] = [];
    if (failure !== null) notices.push(...failureNotices(failure));
    const problem = failure === null ? preview?.problem ?? null : null;
    if (problem !== null && isDateOrderProblem(problem)) {
      notices.push(notice('error', h('strong', {}, 'State the date order: '), 'the file’s dates need it — see “Date order” above.'));
    } else if (problem !== null) {
      const where = problem.line !== null && !/\bline \d/.test(problem.message) ? ` (line ${problem.line})` : '';
      notices.push(...placeRefusal(problem.field, plainOptionWords(problem.message) + where, 'The file cannot be read as it stands: '));
    }
    if (failure === null && info !== null && info.unmappedHeaders.length > 0) {
      notices.push(notice('info', `Columns not used (their values stay in each row’s text): ${info.unmappedHeaders.map((x) => `“${x}”`).join(', ')}.`));
    }
    replace(previewNotice, notices);

    const focusKey = document.activeElement instanceof HTMLElement && tableBox.contains(document.activeElement) ? document.activeElement.dataset.focus : undefined;
    const shown = lastGood;
    if (shown !== null && shown.info !== null) {
      const shownInfo = shown.info;
      const model = previewTableModel(shown, display);
      replace(tableBox,
        shown !== preview || failure !== null ? h('p', { class: 'imp-stale' }, 'This table shows the last choices the file could be read with; the newest could not be read (see above).') : null,
        previewTable(model, choices.units, detectedUnits, {
          role(header, role) { choices = withRole(choices, shownInfo.columns, header, role); schedulePreview(true); },
          unit(role, unit) {
            const units = { ...choices.units };
            if (unit === '') delete units[role];
            else units[role] = unit;
            choices = { ...choices, units };
            schedulePreview(true);
          },
        }),
        model.rows.length === 0 ? h('p', { class: 'muted' }, 'The file has no data rows after its header.') : null);
    } else replace(tableBox, h('p', { class: 'muted' }, 'The file could not be read far enough to show its rows.'));
    if (focusKey !== undefined) tableBox.querySelector<HTMLElement>(`[data-focus="${CSS.escape(focusKey)}"]`)?.focus();

    replace(assumptions, info !== null && info.assumptions.length > 0
      ? [h('h3', {}, 'Assumptions the reader will apply'), h('ul', { class: 'imp-assumptions' }, info.assumptions.map((a) => h('li', {}, a)))]
      : null);
    updateImportButton();
  }

  function failureNotices(e: unknown): HTMLElement[] {
    if (!(e instanceof InputError)) return [notice('error', `The preview failed: ${messageOf(e)}`)];
    return placeRefusal(e.where.field ?? null, plainOptionWords(e.reason), '');
  }

  /** Where a refusal goes: beside the control it names (and, shorter, above the table), else above the table. */
  function placeRefusal(key: string | null, reason: string, lead: string): HTMLElement[] {
    const head = lead !== '' ? h('strong', {}, lead) : null;
    if (key === 'field') { fieldSelect.setError(reason); return [notice('error', head, `Field to import into: ${reason}`)]; }
    if (key === 'staged') { fileInput.setError(reason); return [notice('error', head, `${reason} Choose the file again.`)]; }
    if (key !== null && options.setError(key, reason)) return [notice('error', head, `${controlLabel(key)}: ${reason}`)];
    const role = key === null ? null : /^(columns|units)\.(.+)$/.exec(key);
    if (role !== null) {
      const isColumns = role[1] === 'columns';
      const clear = h('button', { type: 'button' }, isColumns ? 'Use the columns as detected' : 'Use the units as the file says');
      clear.addEventListener('click', () => {
        choices = isColumns ? { ...choices, columns: {} } : { ...choices, units: {} };
        schedulePreview(true);
      });
      return [notice('error', head, `${isColumns ? 'Column' : 'Unit'} of ${ROLE_LABEL[role[2] as ColumnRole] ?? role[2]}: ${reason} `, clear)];
    }
    return [notice('error', head, key !== null && key !== '' ? `column “${key}”: ${reason}` : reason)];
  }

  function updateImportButton(): void {
    let why = '';
    if (staged === null) why = 'Choose a file first.';
    else if (job.running()) why = 'An import is running.';
    else if (choices.field === '' && fields.length > 1) why = 'Choose the field to import into.';
    else if (preview === null || previewFailed) why = 'The file must preview without errors first.';
    else if (preview.problem !== null) why = isDateOrderProblem(preview.problem) ? 'State the date order first.' : 'The file cannot be read as it stands (see above).';
    else if (preview.info === null) why = 'The file could not be read.';
    importButton.disabled = why !== '';
    importHint.textContent = why !== '' ? why : choices.createWells && preview !== null && preview.unknownWells.length > 0 ? `Wells ${preview.unknownWells.join(', ')} will be created.` : '';
  }

  async function startImport(force: boolean): Promise<void> {
    if (staged === null) return;
    importButton.disabled = true;
    try {
      await job.start(startRequestOf(choices, staged.staged, force));
    } catch (e) {
      if (e instanceof InputError) replace(previewNotice, failureNotices(e));
      else app.tell('error', `The import could not start: ${messageOf(e)}`);
      updateImportButton();
      return;
    }
    reportPanel.hidden = true;
    void conflicts.load(null);
    updateImportButton();
  }

  async function jobEnded(j: Wire<ImportJobJson>): Promise<void> {
    updateImportButton();
    if (!alive) return;
    if (j.result !== null) {
      // A refusal as already imported is the report's own notice; the job's error would only repeat it.
      const refused = j.result.import === null && j.result.alreadyImported !== null;
      showReport(reportView(app, displayOf(), reportOfResponse(j.result, refused ? null : j.error), { force: () => void startImport(true) }));
      const record = j.result.import;
      if (record !== null && record.conflicts > 0) await conflicts.load(record.id);
      app.tell(j.state === 'complete' ? 'ok' : 'warn', j.result.message);
    } else {
      showReport(notice('error', `The import ${j.state}: ${plainOptionWords(j.error ?? 'no report was made')}`));
      app.tell('error', `The import ${j.state}.`);
    }
    void refreshRecent();
  }

  function showReport(content: HTMLElement): void {
    replace(reportBody, content);
    reportPanel.hidden = false;
    reportHeading.focus();
  }

  async function refreshRecent(): Promise<void> {
    try {
      const list = (await app.client.listImports({ limit: 20 })).imports;
      if (!alive) return;
      replace(recentBody, recentImportsTable(list, displayOf(), (id) => void openImport(id)));
    } catch (e) {
      if (alive) replace(recentBody, notice('error', `The imports could not be listed: ${messageOf(e)}`));
    }
  }

  async function openImport(id: number): Promise<void> {
    try {
      const { record, report } = await recordReport(app, id);
      if (!alive) return;
      showReport(reportView(app, displayOf(record.field ?? undefined), report, {}));
      await conflicts.load(record.conflicts > 0 ? id : null);
    } catch (e) {
      app.tell('error', `Import #${id} could not be opened: ${messageOf(e)}`);
    }
  }

  async function refreshProfiles(): Promise<void> {
    try {
      const list = (await app.client.listImportProfiles()).profiles;
      if (alive) options.setProfiles(list, loadedProfile);
    } catch (e) {
      if (alive) options.setError('profile', `The profiles could not be listed: ${messageOf(e)}`);
    }
  }

  async function loadProfile(name: string): Promise<void> {
    try {
      const profile = await app.client.loadImportProfile({ name });
      if (!alive) return;
      choices = choicesWithProfile(choices, profile);
      loadedProfile = name;
      profileColumns = { ...choices.columns };
      options.clearErrors();
      options.show(choices, preview, fieldZone());
      app.tell('ok', `Profile “${name}” loaded.`);
      schedulePreview(true);
    } catch (e) {
      options.setError('profile', messageOf(e));
    }
  }

  async function saveProfile(name: string): Promise<void> {
    options.setError('name', null);
    if (name === '') {
      options.setError('name', 'Give the profile a name.');
      return;
    }
    try {
      const saved = await app.client.saveImportProfile({ name, ...profileOptionsOf(choices) });
      if (!alive) return;
      loadedProfile = saved.name;
      app.tell('ok', `The choices were saved as profile “${saved.name}”.`);
      void refreshProfiles();
    } catch (e) {
      if (e instanceof InputError && !(e.where.field !== undefined && e.where.field !== 'name' && options.setError(e.where.field, e.reason))) options.setError('name', e.reason);
      else if (!(e instanceof InputError)) options.setError('name', messageOf(e));
    }
  }

  return () => {
    alive = false;
    uploadToken++;
    window.clearTimeout(previewTimer);
    job.stop();
  };
}

const CONTROL_LABELS: Readonly<Record<string, string>> = {
  delimiter: 'Delimiter', decimal: 'Decimal separator', dateOrder: 'Date order', timeZone: 'Time zone of naive timestamps',
  serialDates: 'Serial dates', well: 'Well of every row', rows: 'Rows shown', createWells: 'Create the wells', profile: 'Saved profile', name: 'Profile name',
};

function controlLabel(key: string): string {
  return CONTROL_LABELS[key] ?? key;
}

function messageOf(e: unknown): string {
  if (e instanceof InputError) return e.reason;
  if (e instanceof CallError) return e.message;
  return e instanceof Error ? e.message : String(e);
}
