/**
 * The import's reading options as a form: delimiter, decimal separator, date order (with the
 * preview's problem beside it when the order must be stated), zone of naive timestamps, serial
 * dates, the well of every row, "create the wells the file names", and saved profiles. The form
 * holds no state of its own: it reports each change, and `show` puts the choices and what the last
 * preview found back into the controls without rebuilding them (so focus and typing survive).
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ImportProfileJson, PreviewImportResponse } from '../../shared/contract/imports.js';
import { field, h, replace, select, uid } from '../app/dom.js';
import {
  DATE_ORDER_CHOICES, DECIMAL_CHOICES, DELIMITER_CHOICES, SERIAL_DATE_CHOICES, delimiterName, isDateOrderProblem, plainOptionWords,
  type ImportChoices,
} from './import-model.js';

export interface OptionsHandlers {
  /** A choice changed; `now` asks for the preview at once rather than after the typing pause. */
  change(patch: Partial<ImportChoices>, now: boolean): void;
  rowsShown(rows: number): void;
  loadProfile(name: string): void;
  saveProfile(name: string): void;
}

export interface OptionsForm {
  element: HTMLElement;
  /** "Rows shown", placed by the screen beside the preview's heading. */
  rowsElement: HTMLElement;
  /** Puts the choices into the controls and what the preview found into hints and notices. */
  show(choices: ImportChoices, preview: Wire<PreviewImportResponse> | null, fieldZone: string): void;
  setProfiles(profiles: readonly Wire<ImportProfileJson>[], current: string): void;
  /** The wells offered for "well of every row" (the chosen field's). */
  setWells(names: readonly string[]): void;
  /** The message beside the control an InputError names; false when no control here has that name. */
  setError(key: string, message: string | null): boolean;
  clearErrors(): void;
}

export const PREVIEW_ROW_CHOICES = [20, 50, 200] as const;

export function optionsForm(handlers: OptionsHandlers, wellNames: readonly string[]): OptionsForm {
  const delimiter = field('Delimiter', select(DELIMITER_CHOICES), 'detected from the first rows');
  const decimal = field('Decimal separator', select(DECIMAL_CHOICES), 'detected from the numbers');
  const dateOrder = field('Date order', select(DATE_ORDER_CHOICES), 'of numeric dates such as 03.04.2025; never guessed');
  const timeZone = field('Time zone of naive timestamps', h('input', { type: 'text', list: 'import-zones', autocomplete: 'off', spellcheck: 'false' }), 'timestamps without Z or offset');
  const serialDates = field('Serial dates', select(SERIAL_DATE_CHOICES), 'plain numbers in the time column');
  const well = field('Well of every row', h('input', { type: 'text', list: 'import-wells', autocomplete: 'off' }), 'for a file without a well column');
  const rows = field('Rows shown', select(PREVIEW_ROW_CHOICES.map((n) => [String(n), String(n)] as const), '20'));

  // The date-order problem stands beside its control, prominent, and is part of its description.
  const problemId = uid('date-problem');
  const dateProblem = h('div', { class: 'notice notice-error imp-date-problem', id: problemId, role: 'alert', hidden: true });
  dateOrder.wrap.classList.add('imp-date-order');
  dateOrder.control.setAttribute('aria-describedby', `${dateOrder.control.getAttribute('aria-describedby') ?? ''} ${problemId}`.trim());

  const zones = h('datalist', { id: 'import-zones' }, supportedZones().map((z) => h('option', { value: z })));
  const wells = h('datalist', { id: 'import-wells' }, wellNames.map((w) => h('option', { value: w })));

  const createWells = h('input', { type: 'checkbox', id: uid('create-wells') });
  const createWellsError = h('span', { class: 'field-error', role: 'alert' });
  const unknownList = h('span', { class: 'imp-unknown-wells' });
  const createWrap = h('div', { class: 'imp-create-wells' },
    h('label', { for: createWells.id }, createWells, ' Create the wells the file names that the field lacks (as production wells)'),
    unknownList, createWellsError);

  const profile = field('Saved profile', select([['', 'none loaded']]), 'loads its choices into this form');
  const profileName = field('Profile name', h('input', { type: 'text', autocomplete: 'off', maxlength: 200 }));
  const saveButton = h('button', { type: 'button', onclick: () => handlers.saveProfile(profileName.control.value.trim()) }, 'Save choices as profile');

  delimiter.control.addEventListener('change', () => handlers.change({ delimiter: delimiter.control.value as ImportChoices['delimiter'] }, true));
  decimal.control.addEventListener('change', () => handlers.change({ decimal: decimal.control.value as ImportChoices['decimal'] }, true));
  dateOrder.control.addEventListener('change', () => handlers.change({ dateOrder: dateOrder.control.value as ImportChoices['dateOrder'] }, true));
  serialDates.control.addEventListener('change', () => handlers.change({ serialDates: serialDates.control.value as ImportChoices['serialDates'] }, true));
  timeZone.control.addEventListener('input', () => handlers.change({ timeZone: timeZone.control.value }, false));
  timeZone.control.addEventListener('change', () => handlers.change({ timeZone: timeZone.control.value }, true));
  well.control.addEventListener('input', () => handlers.change({ well: well.control.value }, false));
  well.control.addEventListener('change', () => handlers.change({ well: well.control.value }, true));
  createWells.addEventListener('change', () => handlers.change({ createWells: createWells.checked }, true));
  rows.control.addEventListener('change', () => handlers.rowsShown(Number(rows.control.value)));
  profile.control.addEventListener('change', () => { if (profile.control.value !== '') handlers.loadProfile(profile.control.value); });
  profileName.control.addEventListener('keydown', (e) => { if (e.key === 'Enter') { e.preventDefault(); saveButton.click(); } });

  const slots: Record<string, (m: string | null) => void> = {
    delimiter: delimiter.setError,
    decimal: decimal.setError,
    dateOrder: dateOrder.setError,
    timeZone: timeZone.setError,
    serialDates: serialDates.setError,
    well: well.setError,
    rows: rows.setError,
    createWells: (m) => { createWellsError.textContent = m ?? ''; },
    profile: profile.setError,
    name: profileName.setError,
  };
  const hint = (wrap: HTMLElement, text: string): void => {
    const el = wrap.querySelector('.field-hint');
    if (el !== null) el.textContent = text;
  };

  const element = h('div', { class: 'imp-options' },
    h('div', { class: 'form-row imp-date-row' }, dateOrder.wrap, dateProblem),
    h('div', { class: 'form-row' }, delimiter.wrap, decimal.wrap, timeZone.wrap, serialDates.wrap, well.wrap),
    createWrap,
    h('div', { class: 'form-row imp-profiles' }, profile.wrap, profileName.wrap, h('div', { class: 'imp-profile-save' }, saveButton)),
    zones, wells);

  rows.wrap.classList.add('imp-rows-shown');
  return {
    element,
    rowsElement: rows.wrap,
    show(choices, preview, fieldZone) {
      const info = preview?.info ?? null;
      setValue(delimiter.control, choices.delimiter);
      setValue(decimal.control, choices.decimal);
      setValue(dateOrder.control, choices.dateOrder);
      setValue(serialDates.control, choices.serialDates);
      if (document.activeElement !== timeZone.control) timeZone.control.value = choices.timeZone;
      if (document.activeElement !== well.control) well.control.value = choices.well;
      createWells.checked = choices.createWells;
      timeZone.control.placeholder = fieldZone;

      hint(delimiter.wrap, info === null ? 'detected from the first rows' : info.delimiterDetected ? `detected: ${delimiterName(info.delimiter)}` : `given: ${delimiterName(info.delimiter)}`);
      hint(decimal.wrap, info === null ? 'detected from the numbers' : `${info.decimalDetected ? 'detected' : 'given'}: ${info.decimal === ',' ? 'comma' : 'point'}`);
      hint(timeZone.wrap, info === null
        ? `empty: the field's zone, ${fieldZone}`
        : info.timeZoneSource === 'header' ? `the time column's header says ${info.timeZone}` : `read in ${info.timeZone}${info.timeZoneSource === 'default' ? ' (the field’s zone)' : ''}`);

      const hasWellColumn = info !== null && info.columns.well !== null;
      well.control.disabled = hasWellColumn && choices.well.trim() === '';
      hint(well.wrap, hasWellColumn ? `the file has a well column (“${info.columns.well}”)` : 'for a file without a well column');

      const unknown = preview?.unknownWells ?? [];
      replace(unknownList, unknown.length === 0
        ? h('span', { class: 'muted' }, 'The previewed rows name no well the field lacks.')
        : ['The previewed rows name wells the field lacks: ', h('strong', {}, unknown.join(', ')), choices.createWells ? ' — they will be created.' : ' — their rows will be rejected unless created.']);
      createWrap.classList.toggle('imp-attention', unknown.length > 0 && !choices.createWells);

      const problem = preview?.problem ?? null;
      const dated = isDateOrderProblem(problem);
      dateProblem.hidden = !dated;
      dateProblem.textContent = dated && problem !== null ? plainOptionWords(problem.message) + (problem.line !== null && !/\bline \d/.test(problem.message) ? ` (line ${problem.line})` : '') : '';
      if (dated) dateOrder.control.setAttribute('aria-invalid', 'true');
      else if (dateOrder.wrap.querySelector('.field-error')?.textContent === '') dateOrder.control.removeAttribute('aria-invalid');
      dateOrder.control.required = dated;
    },
    setProfiles(profiles, current) {
      replace(profile.control, h('option', { value: '' }, profiles.length === 0 ? 'no profiles saved' : 'none loaded'),
        profiles.map((p) => h('option', { value: p.name }, p.name)));
      profile.control.value = profiles.some((p) => p.name === current) ? current : '';
    },
    setWells(names) {
      replace(wells, names.map((w) => h('option', { value: w })));
    },
    setError(key, message) {
      const slot = slots[key];
      if (slot === undefined) return false;
      slot(message);
      return true;
    },
    clearErrors() {
      for (const slot of Object.values(slots)) slot(null);
    },
  };
}

function setValue(control: HTMLSelectElement, value: string): void {
  if (control.value !== value) control.value = value;
}

function supportedZones(): string[] {
  try {
    return ['UTC', ...Intl.supportedValuesOf('timeZone').filter((z) => z !== 'UTC')];
  } catch {
    return ['UTC'];
  }
}
