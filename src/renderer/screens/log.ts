/**
 * The log book: log a wellhead reading by hand (time on the field's wall clock, values in the units of
 * the user's choice), see the well's recent readings, correct or delete one with a reason, and read the
 * well's audit trail. Requests are built and checked in log-model.ts with the back end's own rules;
 * what the back end still refuses is shown beside the field it names.
 */
import '../styles/log.css';
import type { Wire } from '../../shared/contract/channels.js';
import { CallError } from '../../shared/contract/client.js';
import { READING_STATUSES } from '../../shared/contract/reading-rules.js';
import type { ReadingJson } from '../../shared/contract/readings.js';
import type { FieldInfo, WellSummary } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import type { AppContext, Screen } from '../app/context.js';
import type { Display } from '../app/display.js';
import { field, h, notice, replace, select, type Child } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import {
  buildEditRequest, buildLogRequest, emptyForm, FLOW_UNITS, flowPreview, formOfReading, PRESSURE_UNITS, readingRow,
  STATUS_LABELS, TEMPERATURE_UNITS, timeNote, type FieldErrors, type ReadingForm, type WellForForm,
} from './log-model.js';
import { wellAuditRows } from './log-audit-model.js';

const PAGE = 20;
/** Audit entries about readings fetched to find this well's (the audit log is not indexed by well). */
const AUDIT_FETCH = 5000;

let generation = 0;

type FieldWithWells = Wire<FieldInfo & { wells: Wire<WellSummary>[] }>;

export const logScreen: Screen = {
  title: 'Log book',
  async mount(root, params, app) {
    const mine = ++generation;
    root.append(h('h1', {}, 'Log book'), h('p', { class: 'muted' }, 'Loading the wells…'));
    const { fields } = await app.client.listWells({});
    if (mine !== generation) return;
    const page = h('div', { class: 'log-screen' }, h('h1', {}, 'Log book'),
      h('p', { class: 'lede' }, 'The weekly wellhead readings, by hand: log one, correct or delete one with a reason, and see who changed what.'));
    replace(root, page);
    const all = fields.flatMap((f) => f.wells.map((w) => ({ field: f, well: w })));
    if (all.length === 0) {
      page.append(notice('info', 'There are no wells yet. ', h('a', { href: routeTo('field') }, 'Build the demo field or create a field'), ' first.'));
      return;
    }
    const [wantField, wantWell] = params;
    let chosen = all.find((c) => c.field.name === wantField && c.well.name === wantWell);
    if (chosen === undefined && wantWell !== undefined) {
      const byName = all.filter((c) => c.well.name === wantWell);
      if (byName.length === 1) chosen = byName[0];
      else page.append(notice('warn', `No well “${wantWell}” in a field “${wantField ?? ''}”; choose one below.`));
    } else if (chosen === undefined && wantField !== undefined) {
      page.append(notice('warn', `No field “${wantField}” with a well to choose; choose one below.`));
    }
    chosen ??= all.find((c) => c.well.kind === 'production') ?? all[0];
    page.append(wellChooser(fields, chosen.field.name, chosen.well.name, app));
    page.append(wellLog(chosen.field, chosen.well, app, mine));
  },
  unmount() {
    generation += 1;
  },
};

function wellChooser(fields: FieldWithWells[], fieldName: string, wellName: string, app: AppContext): HTMLElement {
  const control = h('select', {}, fields.filter((f) => f.wells.length > 0).map((f) => h('optgroup', { label: f.name },
    f.wells.map((w) => h('option', { value: JSON.stringify([f.name, w.name]) }, `${w.name} (${w.kind})`)))));
  control.value = JSON.stringify([fieldName, wellName]);
  control.addEventListener('change', () => {
    const [f, w] = JSON.parse(control.value) as [string, string];
    app.navigate(routeTo('log', f, w));
  });
  return h('div', { class: 'form-row well-chooser' }, field('Well', control).wrap);
}

function wellLog(fieldInfo: FieldWithWells, well: Wire<WellSummary>, app: AppContext, mine: number): HTMLElement {
  const zone = fieldInfo.timeZone;
  const display = app.display(zone);
  const ref: WellForForm = { name: well.name, field: fieldInfo.name, kind: well.kind };
  const readingsBox = h('div', {}, h('p', { class: 'muted' }, 'Loading the readings…'));
  const auditBox = h('div', {}, h('p', { class: 'muted' }, 'Loading the audit trail…'));
  let shownReadings = PAGE;
  let shownAudit = PAGE;

  const refresh = async (): Promise<void> => {
    const [list, readingAudit, wellAudit] = await Promise.all([
      // The newest ones only: a well can hold a million readings, and the book shows a page at a time.
      app.client.listReadings({ well: well.name, field: fieldInfo.name, latest: shownReadings }),
      app.client.auditLog({ entity: 'reading', limit: AUDIT_FETCH }),
      app.client.auditLog({ entity: 'well', entityId: well.id }),
    ]);
    if (mine !== generation) return;
    const readings = [...list.readings].sort((a, b) => Date.parse(b.time) - Date.parse(a.time));
    drawReadings(readings, list.total);
    drawAudit([...readingAudit.entries, ...wellAudit.entries]);
  };

  const drawReadings = (readings: Wire<ReadingJson>[], total: number): void => {
    if (readings.length === 0) {
      replace(readingsBox, notice('info', `${well.name} has no readings yet.`));
      return;
    }
    const tbody = h('tbody');
    for (const r of readings.slice(0, shownReadings)) tbody.append(...readingRows(r, ref, zone, display, app, refresh));
    const more = total > shownReadings
      ? h('button', { type: 'button', onclick: () => { shownReadings += PAGE; void refresh(); } }, `Show ${Math.min(PAGE, total - shownReadings)} more`)
      : null;
    replace(readingsBox,
      h('div', { class: 'table-scroll' }, h('table', { class: 'data-table readings' },
        h('caption', {}, `${Math.min(shownReadings, readings.length).toLocaleString('en-US')} of ${total.toLocaleString('en-US')} readings, newest first; times in ${display.timeZone}`),
        h('thead', {}, h('tr', {}, ['Time', `Production temperature`, 'Injection temperature', 'Flow', 'Pressure', 'Status', 'Note', 'Source', 'Change']
          .map((label, i) => h('th', { scope: 'col', class: i >= 1 && i <= 4 ? 'num' : null }, label)))),
        tbody)),
      h('div', { class: 'actions' }, more));
  };

  const drawAudit = (entries: Parameters<typeof wellAuditRows>[0]): void => {
    const rows = wellAuditRows(entries, well.id, display);
    if (rows.length === 0) {
      replace(auditBox, notice('info', `No changes of ${well.name} or its readings have been recorded (imported readings are recorded with their import).`));
      return;
    }
    const more = rows.length > shownAudit
      ? h('button', { type: 'button', onclick: () => { shownAudit += PAGE; drawAudit(entries); } }, `Show ${Math.min(PAGE, rows.length - shownAudit)} more`)
      : null;
    replace(auditBox,
      h('div', { class: 'table-scroll' }, h('table', { class: 'data-table audit' },
        h('caption', {}, `${Math.min(shownAudit, rows.length)} of ${rows.length} changes, newest first`),
        h('thead', {}, h('tr', {}, ['When', 'Who', 'Action', 'What', 'Old → new', 'Reason'].map((l) => h('th', { scope: 'col' }, l)))),
        h('tbody', {}, rows.slice(0, shownAudit).map((r) => h('tr', {},
          h('td', { class: 'nowrap' }, r.at), h('td', {}, r.who), h('td', {}, r.action), h('td', {}, r.what),
          h('td', {}, r.changes.length === 0 ? '—' : h('ul', { class: 'changes' }, r.changes.map((c) => h('li', {},
            h('span', { class: 'change-label' }, `${c.label}: `), c.from, ' → ', h('strong', {}, c.to))))),
          h('td', {}, r.reason === '' ? '—' : r.reason)))))),
      h('div', { class: 'actions' }, more));
  };

  const section = h('div', {},
    newReadingPanel(fieldInfo, well, ref, display, app, refresh),
    h('section', { class: 'panel', 'aria-labelledby': 'readings-h' }, h('h2', { id: 'readings-h' }, `Recent readings of ${well.name}`), readingsBox),
    h('section', { class: 'panel', 'aria-labelledby': 'audit-h' }, h('h2', { id: 'audit-h' }, `Audit trail of ${well.name}`), auditBox));
  refresh().catch((e: unknown) => {
    if (mine === generation) replace(readingsBox, notice('error', `The readings could not be loaded: ${e instanceof Error ? e.message : String(e)}`));
  });
  return section;
}

// ---------------------------------------------------------------- the reading's controls

interface ReadingControls {
  element: HTMLElement;
  read(): ReadingForm;
  setErrors(errors: FieldErrors): string[];
  clear(values: Partial<ReadingForm>): void;
}

function flowUnitSelect(value: string): HTMLSelectElement {
  const el = h('select', {},
    h('optgroup', { label: 'Mass flow' }, FLOW_UNITS.filter((u) => u.kind === 'mass').map((u) => h('option', { value: u.symbol }, u.label))),
    h('optgroup', { label: 'Volume flow (converted with the water density)' }, FLOW_UNITS.filter((u) => u.kind === 'volume').map((u) => h('option', { value: u.symbol }, u.label))));
  el.value = value;
  return el;
}

/** The controls of one reading, for the new-reading form and for an edit. */
function readingControls(initial: ReadingForm, zone: string, display: Display, compact: boolean): ReadingControls {
  const num = (value: string): HTMLInputElement => h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', size: 9, value });
  const time = field('Time of the reading', h('input', { type: 'datetime-local', step: 60, value: initial.time }),
    `local time in ${zone}, the field’s time zone`);
  const timeInfo = h('span', { class: 'field-hint time-info', 'aria-live': 'polite' });
  time.wrap.insertBefore(timeInfo, time.wrap.querySelector('.field-error'));
  const prod = field('Production temperature', num(initial.productionTemperature));
  const inj = field('Injection temperature', num(initial.injectionTemperature));
  const tUnit = field('Temperature unit', select(TEMPERATURE_UNITS, initial.temperatureUnit), 'for both temperatures');
  const flow = field('Flow', num(initial.flow));
  const flowInfo = h('span', { class: 'field-hint flow-info', 'aria-live': 'polite' });
  flow.wrap.insertBefore(flowInfo, flow.wrap.querySelector('.field-error'));
  const fUnit = field('Flow unit', flowUnitSelect(initial.flowUnit));
  const pressure = field('Wellhead pressure (absolute)', num(initial.pressure));
  const pUnit = field('Pressure unit', select(PRESSURE_UNITS, initial.pressureUnit));
  const status = field('Status', select(READING_STATUSES.map((s) => [s, STATUS_LABELS[s]] as const), initial.status),
    compact ? undefined : 'shut-in and test readings stay in the log but out of fits');
  const flags = field('Flags', h('input', { type: 'text', autocomplete: 'off', value: initial.flags, size: 14 }),
    compact ? undefined : 'e.g. bad: kept in the log, left out of fits');
  const note = field('Note', h('textarea', { rows: compact ? 1 : 2, maxlength: 2000 }, initial.note));
  const slots: Record<string, { setError(m: string | null): void }> = {
    time, productionTemperature: prod, injectionTemperature: inj, temperatureUnit: tUnit, flow, flowUnit: fUnit,
    pressure, pressureUnit: pUnit, status, flags, note,
  };
  const read = (): ReadingForm => ({
    time: time.control.value,
    productionTemperature: prod.control.value,
    injectionTemperature: inj.control.value,
    temperatureUnit: tUnit.control.value,
    flow: flow.control.value,
    flowUnit: fUnit.control.value,
    pressure: pressure.control.value,
    pressureUnit: pUnit.control.value,
    status: status.control.value as ReadingForm['status'],
    flags: flags.control.value,
    note: note.control.value,
  });
  const update = (): void => {
    timeInfo.textContent = timeNote(time.control.value, zone);
    const preview = flowPreview(read());
    flowInfo.textContent = preview === null ? '' : `= ${display.format('massFlow', preview.massFlowKgPerS)}; ${preview.note}`;
  };
  for (const c of [time, prod, inj, tUnit, flow, fUnit, pressure, pUnit]) c.control.addEventListener('input', update);
  for (const c of [tUnit, fUnit, pUnit]) c.control.addEventListener('change', update);
  update();
  const element = h('div', { class: compact ? 'reading-fields compact' : 'reading-fields' },
    h('div', { class: 'form-row' }, time.wrap),
    h('div', { class: 'form-row' }, prod.wrap, inj.wrap, tUnit.wrap),
    h('div', { class: 'form-row' }, flow.wrap, fUnit.wrap, pressure.wrap, pUnit.wrap),
    h('div', { class: 'form-row' }, status.wrap, flags.wrap, note.wrap));
  return {
    element,
    read,
    setErrors(errors) {
      const unplaced: string[] = [];
      for (const s of Object.values(slots)) s.setError(null);
      for (const [key, message] of Object.entries(errors)) {
        const slot = slots[key];
        if (slot === undefined) unplaced.push(key === 'form' ? message : `${key}: ${message}`);
        else slot.setError(message);
      }
      const first = Object.keys(errors).map((k) => (slots[k] as { control?: HTMLElement } | undefined)?.control).find((c) => c !== undefined);
      first?.focus();
      return unplaced;
    },
    clear(values) {
      if (values.productionTemperature !== undefined) prod.control.value = values.productionTemperature;
      if (values.injectionTemperature !== undefined) inj.control.value = values.injectionTemperature;
      if (values.flow !== undefined) flow.control.value = values.flow;
      if (values.pressure !== undefined) pressure.control.value = values.pressure;
      if (values.flags !== undefined) flags.control.value = values.flags;
      if (values.note !== undefined) note.control.value = values.note;
      update();
    },
  };
}

/** A back-end refusal as an errors map: beside the field it names, else above the form. */
function refusal(e: unknown): FieldErrors {
  if (e instanceof InputError) return { [e.where.field ?? 'form']: e.reason };
  if (e instanceof CallError) return { form: e.message };
  return { form: e instanceof Error ? e.message : String(e) };
}

/** What a change did to the well's stored fit (fitStatus), for the status strip and beside the form. */
async function fitWords(app: AppContext, well: WellForForm): Promise<{ tell: string; nodes: Child[] }> {
  const link = (text: string): HTMLElement => h('a', { href: routeTo('decline', well.field, well.name) }, text);
  try {
    const fit = await app.client.fitStatus({ well: well.name, field: well.field });
    if (fit.latest === null) return { tell: '', nodes: [` ${well.name} has no stored fit yet: `, link('fit it on the Decline screen'), '.'] };
    if (fit.stale === true) {
      return { tell: ' Its stored fit is now stale; refit on the Decline screen.', nodes: [` The stored fit of ${well.name} is now ${fit.message.replace(/; fit again$/, '')}: `, link('Refit on the Decline screen'), '.'] };
    }
    return { tell: '', nodes: [` Stored fit of ${well.name}: ${fit.message} `, link('Decline screen'), '.'] };
  } catch {
    return { tell: '', nodes: [] };
  }
}

// ---------------------------------------------------------------- a new reading

function newReadingPanel(
  fieldInfo: FieldWithWells, well: Wire<WellSummary>, ref: WellForForm, display: Display, app: AppContext, refresh: () => Promise<void>,
): HTMLElement {
  const zone = fieldInfo.timeZone;
  const controls = readingControls(emptyForm(app.settings().units, Date.now(), zone), zone, display, false);
  const status = h('div', { class: 'form-status' });
  const submit = h('button', { type: 'submit', class: 'primary' }, 'Log reading');
  const form = h('form', { novalidate: true, 'aria-labelledby': 'new-reading-h' }, controls.element, h('div', { class: 'actions' }, submit), status);
  const show = (errors: FieldErrors): void => {
    const rest = controls.setErrors(errors);
    replace(status, rest.length === 0 ? null : notice('error', rest.join('; ')));
  };
  form.addEventListener('submit', (e) => {
    e.preventDefault();
    void (async () => {
      const { request, errors } = buildLogRequest(controls.read(), ref, zone);
      if (request === undefined) {
        show(errors);
        return;
      }
      show({});
      submit.disabled = true;
      try {
        const logged = await app.client.logReading(request);
        controls.clear({ productionTemperature: '', injectionTemperature: '', flow: '', pressure: '', flags: '', note: '' });
        const when = display.dateTime(logged.reading.time);
        const fit = await fitWords(app, ref);
        app.tell('ok', `Reading of ${well.name} at ${when} logged.${fit.tell}`);
        replace(status, notice('ok', `Reading of ${well.name} at ${when} logged.`,
          logged.assumptions.map((a) => ` ${a.charAt(0).toUpperCase()}${a.slice(1)}.`), ...fit.nodes));
        await refresh();
      } catch (err) {
        show(refusal(err));
        app.tell('warn', 'The reading was not logged; see the message beside the field.');
      } finally {
        submit.disabled = false;
      }
    })();
  });
  return h('section', { class: 'panel', 'aria-labelledby': 'new-reading-h' },
    h('h2', { id: 'new-reading-h' }, `New reading of ${well.name}`),
    h('p', { class: 'muted' }, `${well.kind === 'production' ? 'Production' : 'Injection'} well in ${fieldInfo.name}. Times are local to the field (${zone}).`),
    form);
}

// ---------------------------------------------------------------- a reading in the table, its edit and its deletion

function readingRows(r: Wire<ReadingJson>, ref: WellForForm, zone: string, display: Display, app: AppContext, refresh: () => Promise<void>): HTMLTableRowElement[] {
  const row = readingRow(r, display);
  const columns = 9;
  const extra = h('tr', { class: 'reading-extra', hidden: true });
  const cell = h('td', { colspan: columns });
  extra.append(cell);
  const close = (): void => { extra.hidden = true; replace(cell); };
  const edit = h('button', { type: 'button', onclick: () => openEdit() }, 'Edit');
  edit.setAttribute('aria-label', `Edit the reading of ${row.time}`);
  const del = h('button', { type: 'button', class: 'danger', onclick: () => openDelete() }, 'Delete');
  del.setAttribute('aria-label', `Delete the reading of ${row.time}`);

  const openEdit = (): void => {
    const initial = formOfReading(r, zone, app.settings().units);
    const controls = readingControls(initial, zone, display, true);
    const reason = field('Reason for the change', h('input', { type: 'text', autocomplete: 'off', size: 40, maxlength: 2000 }), 'goes in the audit log');
    const status = h('div', { class: 'form-status' });
    const save = h('button', { type: 'submit', class: 'primary' }, 'Save the correction');
    const form = h('form', { novalidate: true, class: 'edit-form' },
      h('h3', {}, `Correct the reading of ${row.time}`), controls.element, h('div', { class: 'form-row' }, reason.wrap),
      h('div', { class: 'actions' }, save, h('button', { type: 'button', onclick: () => { close(); edit.focus(); } }, 'Cancel')), status);
    const show = (errors: FieldErrors): void => {
      reason.setError(errors.reason ?? null);
      const { reason: _r, ...rest } = errors;
      const unplaced = controls.setErrors(rest);
      replace(status, unplaced.length === 0 ? null : notice(unplaced[0] === 'nothing was changed' ? 'info' : 'error', unplaced.join('; ')));
      if (errors.reason !== undefined && Object.keys(rest).length === 0) reason.control.focus();
    };
    form.addEventListener('submit', (e) => {
      e.preventDefault();
      void (async () => {
        const { request, errors } = buildEditRequest(r, initial, controls.read(), reason.control.value, ref, zone);
        if (request === undefined) {
          show(errors);
          return;
        }
        save.disabled = true;
        try {
          const result = await app.client.editReading(request);
          app.tell('ok', result.changed ? `Reading of ${row.time} corrected.${(await fitWords(app, ref)).tell}` : 'Nothing changed.');
          await refresh();
        } catch (err) {
          save.disabled = false;
          show(refusal(err));
        }
      })();
    });
    replace(cell, form);
    extra.hidden = false;
    (form.querySelector('input') as HTMLInputElement | null)?.focus();
  };

  const openDelete = (): void => {
    const reason = field('Reason for deleting', h('input', { type: 'text', autocomplete: 'off', size: 40, maxlength: 2000 }), 'goes in the audit log; the reading is kept there and can be looked up');
    const status = h('div', { class: 'form-status' });
    const confirm = h('button', { type: 'submit', class: 'danger' }, 'Delete this reading');
    const form = h('form', { novalidate: true, class: 'delete-form' },
      h('p', {}, h('strong', {}, `Delete the reading of ${row.time}`), ` (${row.productionTemperature}, ${row.flow})? It leaves the fits and the charts.`),
      h('div', { class: 'form-row' }, reason.wrap),
      h('div', { class: 'actions' }, confirm, h('button', { type: 'button', onclick: () => { close(); del.focus(); } }, 'Keep it')), status);
    form.addEventListener('submit', (e) => {
      e.preventDefault();
      void (async () => {
        if (reason.control.value.trim() === '') {
          reason.setError('give a reason for deleting; it goes in the audit log');
          reason.control.focus();
          return;
        }
        confirm.disabled = true;
        try {
          await app.client.deleteReading({ id: r.id, reason: reason.control.value.trim() });
          app.tell('ok', `Reading of ${row.time} deleted.${(await fitWords(app, ref)).tell}`);
          await refresh();
        } catch (err) {
          confirm.disabled = false;
          const errors = refusal(err);
          if (errors.reason !== undefined) reason.setError(errors.reason);
          else replace(status, notice('error', Object.values(errors).join('; ')));
        }
      })();
    });
    replace(cell, form);
    extra.hidden = false;
    reason.control.focus();
  };

  const sub = (main: string, note: string): Child[] => [main, note !== '' ? h('span', { class: 'cell-sub' }, note) : null];
  const main = h('tr', {},
    h('td', { class: 'nowrap' }, ...sub(row.time, row.edited)),
    h('td', { class: 'num' }, row.productionTemperature),
    h('td', { class: 'num' }, row.injectionTemperature),
    h('td', { class: 'num' }, ...sub(row.flow, row.flowAsLogged)),
    h('td', { class: 'num' }, row.pressure),
    h('td', {}, ...sub(row.status, row.flags === '' ? '' : `flags: ${row.flags}`)),
    h('td', { class: 'note' }, row.note),
    h('td', { class: 'nowrap' }, row.source),
    h('td', { class: 'nowrap' }, h('div', { class: 'row-actions' }, edit, del)));
  main.dataset.readingId = String(row.id);
  return [main, extra];
}

