/**
 * Reservoir screen (#/reservoir[/<field>/<reservoir>[/<version>]]): the heat-model parameters of a
 * reservoir — hot-dry-rock slab or aquifer — as a form in the user's units, its results and how τ
 * responds to each input as the user types (shared theory, no round trip), its version history,
 * "Save as new version" (versions are never rewritten), and the recharge of its wells now.
 */
import '../styles/reservoir.css';
import { cautionsBox } from '../app/cautions.js';
import type { AppContext, Screen } from '../app/context.js';
import type { Display } from '../app/display.js';
import { field, h, notice, replace, select } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import type { Wire } from '../../shared/contract/channels.js';
import type { ReservoirVersionJson } from '../../shared/contract/reservoirs.js';
import type { WellInfo } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import type { ReservoirTheory } from '../../shared/reservoir/theory.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { createReservoirForm } from './reservoir-create.js';
import { controlOf, emptyForm, evaluateForm, formFromParams, labelOfKey, theoryOfStored, type FormState } from './reservoir-form.js';
import { formView } from './reservoir-form-view.js';
import { historyView } from './reservoir-history-view.js';
import { resultsView, type ResultsView } from './reservoir-results-view.js';
import { wellsView } from './reservoir-wells-view.js';

interface ReservoirRef {
  field: string;
  name: string;
}

let results: ResultsView | null = null;

export const reservoirScreen: Screen = {
  title: 'Reservoir',
  async mount(root, params, app) {
    root.append(
      h('h1', {}, 'Reservoir'),
      h('p', { class: 'lede' }, 'The heat-model parameters of a reservoir, what they give, and the recharge of its wells against them. Each change is saved as a new version; earlier versions stay as they were.'));

    const listing = await app.client.listWells();
    const allWells: WellInfo[] = listing.fields.flatMap((f) => f.wells);
    const fieldNames = listing.fields.map((f) => f.name);
    const known = new Map<string, ReservoirRef>();
    for (const w of allWells) if (w.reservoir !== null) known.set(JSON.stringify([w.field, w.reservoir]), { field: w.field, name: w.reservoir });
    const routeRef: ReservoirRef | null = params.length >= 2 ? { field: params[0], name: params[1] } : null;
    if (routeRef !== null) known.set(JSON.stringify([routeRef.field, routeRef.name]), routeRef);
    const ref = routeRef ?? [...known.values()][0] ?? null;

    if (ref === null) {
      root.append(
        notice('info', 'No reservoir yet: no well of the field log names one. Create one here, then give it parameters.'),
        fieldNames.length > 0 ? createReservoirForm(app, fieldNames, undefined, true) : notice('warn', 'The field log has no field yet: import readings or add a well first.'),
        cautionsBox());
      return;
    }

    const picker = field('Reservoir', select([...known.entries()].map(([key, r]) => [key, `${r.name} — ${r.field}`] as const), JSON.stringify([ref.field, ref.name])));
    picker.control.addEventListener('change', () => {
      const chosen = known.get(picker.control.value);
      if (chosen !== undefined) app.navigate(routeTo('reservoir', chosen.field, chosen.name));
    });
    root.append(h('div', { class: 'panel reservoir-toolbar' },
      h('div', { class: 'form-row' }, picker.wrap),
      createReservoirForm(app, fieldNames, { field: ref.field })));

    let versions: Wire<ReservoirVersionJson>[];
    try {
      versions = (await app.client.listReservoirVersions({ reservoir: ref.name, field: ref.field })).versions;
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      root.append(
        notice('warn', `There is no reservoir “${ref.name}” in ${ref.field}: ${e.reason}`),
        createReservoirForm(app, fieldNames, { field: fieldNames.includes(ref.field) ? ref.field : undefined, name: ref.name }, true),
        cautionsBox());
      return;
    }

    const zone = listing.fields.find((f) => f.name === ref.field)?.timeZone;
    const display = app.display(zone);
    const wells = allWells.filter((w) => w.field === ref.field && w.reservoir === ref.name);
    mountEditor(root, app, display, ref, versions, wells, params[2] !== undefined ? Number(params[2]) : null);
  },
  unmount() {
    results?.destroy();
    results = null;
  },
};

function mountEditor(
  root: HTMLElement, app: AppContext, display: Display, ref: ReservoirRef,
  initialVersions: Wire<ReservoirVersionJson>[], wells: WellInfo[], routeVersion: number | null,
): void {
  let versions = initialVersions;
  let selected: number | null = null;
  let editing = false;
  let form: FormState = emptyForm();
  let lastTheory: ReservoirTheory | null = null;

  const view = formView(display, (next) => { form = next; evaluate(); }, () => lastTheory);
  results = resultsView(display);
  const history = historyView(display, (v) => open(v));
  const wellsPanel = wellsView(app);
  const modeBar = h('div', { class: 'reservoir-mode' });
  const versionNote = field('What changed and why (version note)', h('input', { type: 'text', maxlength: 2000, autocomplete: 'off' }),
    'kept with the version in the history');
  const saveButton = h('button', { type: 'button', class: 'primary' }, 'Save as new version');
  saveButton.addEventListener('click', () => void save());

  root.append(
    h('div', { class: 'reservoir-layout' },
      h('section', { class: 'panel reservoir-editor', 'aria-labelledby': 'reservoir-editor-title' },
        h('h2', { id: 'reservoir-editor-title' }, `Parameters of ${ref.name}`),
        modeBar,
        view.element),
      h('div', { class: 'reservoir-side' }, results.element, history.element)),
    results.sensitivityElement,
    wellsPanel.element,
    cautionsBox());

  const latest = (): Wire<ReservoirVersionJson> | undefined => versions[versions.length - 1];

  function evaluate(): void {
    const ev = evaluateForm(form, display);
    if (ev.ok) lastTheory = ev.theory;
    const v = versions.find((x) => x.version === selected);
    const context = editing
      ? `As typed: not saved yet${v !== undefined ? ` (started from version ${v.version})` : ''}.`
      : v !== undefined ? `Version ${v.version} as stored.` : '';
    results?.show(ev, context);
    if (ev.ok) view.showError(null, null);
    else {
      const f = ev.error.where.field;
      view.showError(ev.control, ev.error.reason, f !== undefined ? `${labelOfKey(f)}: ${ev.error.reason}` : ev.error.message);
    }
  }

  function drawMode(): void {
    const v = versions.find((x) => x.version === selected);
    if (!editing && v !== undefined) {
      const edit = h('button', { type: 'button' }, 'Edit as new version');
      edit.addEventListener('click', () => {
        editing = true;
        load();
        view.controlElement('surfaceTemperature')?.focus();
      });
      replace(modeBar, notice('info',
        h('strong', {}, `Version ${v.version}`), ` recorded ${display.dateTime(v.recordedAt)} by ${v.recordedBy}: read only. `,
        'A saved version is never changed; edit a copy to save it as a new one.'),
      h('div', { class: 'actions' }, edit));
      return;
    }
    const discard = versions.length > 0 ? h('button', { type: 'button' }, 'Discard changes') : null;
    discard?.addEventListener('click', () => open(selected ?? latest()?.version ?? null));
    const next = (latest()?.version ?? 0) + 1;
    replace(modeBar,
      notice('warn', v !== undefined
        ? `Editing a copy of version ${v.version}. Saving adds version ${next}; version ${v.version} stays as it is.`
        : 'No version yet: enter the parameters and save the first version.'),
      h('div', { class: 'reservoir-save' }, versionNote.wrap, h('div', { class: 'actions' }, saveButton, discard)));
  }

  function load(): void {
    const v = versions.find((x) => x.version === selected);
    if (v !== undefined && !editing) form = formFromParams(v.params, display);
    view.load(form, !editing);
    drawMode();
    history.show(versions, selected, latest()?.version ?? null);
    evaluate();
  }

  function open(version: number | null): void {
    const v = versions.find((x) => x.version === version);
    selected = v?.version ?? null;
    editing = v === undefined;
    form = v !== undefined ? formFromParams(v.params, display) : emptyForm();
    versionNote.control.value = '';
    versionNote.setError(null);
    load();
  }

  async function save(): Promise<void> {
    const ev = evaluateForm(form, display);
    if (!ev.ok) {
      evaluate();
      if (ev.control !== null) view.controlElement(ev.control)?.focus();
      app.tell('warn', `Not saved: ${ev.error.message}`);
      return;
    }
    const note = versionNote.control.value.trim();
    if (note === '') {
      versionNote.setError('say what changed and why: the note is what the history shows');
      versionNote.control.focus();
      return;
    }
    versionNote.setError(null);
    const before = latest();
    const tauBefore = before !== undefined ? tauText(before.params) : null;
    saveButton.disabled = true;
    try {
      const saved = await app.client.addReservoirVersion({ reservoir: ref.name, field: ref.field, params: ev.json, note });
      versions = (await app.client.listReservoirVersions({ reservoir: ref.name, field: ref.field })).versions;
      app.tell('ok', `Saved as version ${saved.version} of ${ref.name}.`);
      open(saved.version);
      // The back end's own theory of what it stored, so the screen shows what forecasts will use.
      const confirmed = await app.client.reservoirTheory({ reservoir: ref.name, field: ref.field, version: saved.version });
      const tauNow = confirmed.theory.tau.value;
      await wellsPanel.refresh(wells, saved.version, {
        version: saved.version,
        tauNow: tauNow === null ? '—' : `${(tauNow / JULIAN_YEAR_S).toFixed(2)} yr`,
        tauBefore,
      });
    } catch (e) {
      if (e instanceof InputError) {
        const f = e.where.field;
        if (f === 'note') versionNote.setError(e.reason);
        else view.showError(controlOf(f), e.reason, e.message);
        app.tell('warn', `Not saved: ${e.message}`);
      } else app.tell('error', `Not saved: ${e instanceof Error ? e.message : String(e)}`);
    } finally {
      saveButton.disabled = false;
    }
  }

  const start = routeVersion !== null && versions.some((v) => v.version === routeVersion) ? routeVersion : latest()?.version ?? null;
  open(start);
  void wellsPanel.refresh(wells, latest()?.version ?? null);
}

function tauText(params: unknown): string | null {
  const t = theoryOfStored(params);
  return 'theory' in t ? `${(t.theory.tauS / JULIAN_YEAR_S).toFixed(2)} yr` : null;
}
