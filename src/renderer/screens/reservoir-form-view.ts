/**
 * The reservoir form on screen: the three choices (heat model, how the flow is given, where the
 * water properties come from), the numeric inputs of the chosen model grouped as the physics
 * groups them, each labelled with its unit, and a message slot beside each. Read-only while a
 * stored version is viewed; versions are never edited in place.
 */
import { field, h, replace, select } from '../app/dom.js';
import {
  controlGroups, labelWithUnit, withFlowKind, withFluidKind,
  type ControlKey, type FlowKind, type FluidKind, type FormDisplay, type FormState, type ModelKind,
} from './reservoir-form.js';
import type { ReservoirTheory } from '../../shared/reservoir/theory.js';

export interface FormView {
  element: HTMLElement;
  /** Fills the form (rebuilding the inputs) and sets whether it can be edited. */
  load(state: FormState, readOnly: boolean): void;
  /**
   * Clears every message, then shows `message` beside `control`; under the form (as `whole`, which
   * names the parameter) when the control is null or not on screen.
   */
  showError(control: ControlKey | null, message: string | null, whole?: string): void;
  /** The input of a control, to focus it. */
  controlElement(control: ControlKey): HTMLElement | undefined;
}

export function formView(display: FormDisplay, onChange: (state: FormState) => void, lastTheory: () => ReservoirTheory | null): FormView {
  let state: FormState;
  let readOnly = true;
  const setters = new Map<ControlKey, (m: string | null) => void>();
  const controls = new Map<ControlKey, HTMLElement>();

  const kind = field('Heat model', select([['hot-dry-rock', 'Hot dry rock (slab)'], ['aquifer', 'Hot aquifer (layer)']]),
    'slab: heat between the depths of T1 and z2; aquifer: a thin layer at depth z2');
  const flowKind = field('Flow given as', select([['mass', `Mass flow (${display.unit('massFlow')})`], ['volume', `Volume flow (${display.unit('volumeFlow')})`]]));
  const fluidKind = field('Water properties from', select([['iapws', 'IAPWS-IF97 from T and p'], ['fixed', 'Fixed ρw and cw']]));
  const note = field('Where the values came from (stored with the parameters)', h('textarea', { rows: 3, class: 'reservoir-note' }));
  const groups = h('div', { class: 'reservoir-groups' });
  const formMessage = h('p', { class: 'field-error reservoir-form-error', role: 'alert' });

  for (const [key, f] of [['kind', kind], ['flowKind', flowKind], ['fluidKind', fluidKind], ['note', note]] as const) {
    setters.set(key, f.setError);
    controls.set(key, f.control);
  }

  kind.control.addEventListener('change', () => {
    state = { ...state, kind: kind.control.value as ModelKind };
    rebuild();
    onChange(state);
  });
  flowKind.control.addEventListener('change', () => {
    state = withFlowKind(state, flowKind.control.value as FlowKind, lastTheory(), display);
    rebuild();
    onChange(state);
  });
  fluidKind.control.addEventListener('change', () => {
    state = withFluidKind(state, fluidKind.control.value as FluidKind, lastTheory());
    rebuild();
    onChange(state);
  });
  note.control.addEventListener('input', () => {
    state = { ...state, note: note.control.value };
    onChange(state);
  });

  function rebuild(): void {
    for (const key of [...setters.keys()]) {
      if (key !== 'kind' && key !== 'flowKind' && key !== 'fluidKind' && key !== 'note') {
        setters.delete(key);
        controls.delete(key);
      }
    }
    const sets = controlGroups(state, display.units).map((group) => {
      const inputs = group.controls.map((c) => {
        const input = h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', spellcheck: 'false', name: c.key });
        input.value = state.text[c.key] ?? '';
        input.readOnly = readOnly;
        input.addEventListener('input', () => {
          state = { ...state, text: { ...state.text, [c.key]: input.value } };
          onChange(state);
        });
        const f = field(labelWithUnit(c, state, display), input, c.hint);
        setters.set(c.key, f.setError);
        controls.set(c.key, input);
        return f.wrap;
      });
      const extra = group.title === 'Circulation' ? flowKind.wrap : group.title === 'Water properties' ? fluidKind.wrap : null;
      return h('fieldset', { class: 'reservoir-group' }, h('legend', {}, group.title), h('div', { class: 'form-row' }, extra, inputs));
    });
    replace(groups, sets);
  }

  return {
    element: h('div', { class: 'reservoir-form' },
      h('div', { class: 'form-row' }, kind.wrap),
      groups,
      note.wrap,
      formMessage),
    load(next, ro) {
      state = next;
      readOnly = ro;
      kind.control.value = state.kind;
      flowKind.control.value = state.flowKind;
      fluidKind.control.value = state.fluidKind;
      note.control.value = state.note;
      for (const c of [kind.control, flowKind.control, fluidKind.control]) c.disabled = ro;
      note.control.readOnly = ro;
      rebuild();
    },
    showError(control, message, whole) {
      for (const set of setters.values()) set(null);
      formMessage.textContent = '';
      if (message === null) return;
      const set = control === null ? undefined : setters.get(control);
      if (set !== undefined) set(message);
      else formMessage.textContent = whole ?? message;
    },
    controlElement(control) {
      return controls.get(control);
    },
  };
}
