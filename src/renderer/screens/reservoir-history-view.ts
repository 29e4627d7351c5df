/**
 * The reservoir's versions, newest first: when, who, the note, and the τ each gives (computed here
 * from its stored parameters). A version is opened into the form by its button; versions are never
 * rewritten, so the history only grows.
 */
import type { Display } from '../app/display.js';
import { h, replace } from '../app/dom.js';
import type { Wire } from '../../shared/contract/channels.js';
import type { ReservoirVersionJson } from '../../shared/contract/reservoirs.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { theoryOfStored } from './reservoir-form.js';

export interface HistoryView {
  element: HTMLElement;
  show(versions: readonly Wire<ReservoirVersionJson>[], selected: number | null, latest: number | null): void;
}

export function historyView(display: Display, onOpen: (version: number) => void): HistoryView {
  const body = h('div', {});
  const element = h('section', { class: 'panel reservoir-history', 'aria-labelledby': 'reservoir-history-title' },
    h('h2', { id: 'reservoir-history-title' }, 'Version history'), body);
  return {
    element,
    show(versions, selected, latest) {
      if (versions.length === 0) {
        replace(body, h('p', { class: 'muted' }, 'No parameter version yet: fill in the form and save the first one.'));
        return;
      }
      const rows = [...versions].reverse().map((v) => {
        const t = theoryOfStored(v.params);
        const current = v.version === selected;
        return h('tr', { class: current ? 'reservoir-version-current' : null, 'aria-current': current ? 'true' : null },
          h('th', { scope: 'row' },
            h('button', { type: 'button', class: 'reservoir-version-open', 'aria-pressed': current ? 'true' : 'false', onclick: () => onOpen(v.version) },
              `Version ${v.version}`),
            v.version === latest ? h('span', { class: 'mark mark-good reservoir-latest' }, 'latest') : null),
          h('td', {}, display.dateTime(v.recordedAt)),
          h('td', {}, v.recordedBy),
          h('td', { class: 'reservoir-version-note' }, v.note === '' ? h('span', { class: 'muted' }, '(no note)') : v.note),
          h('td', { class: 'num' }, 'theory' in t ? `${(t.theory.tauS / JULIAN_YEAR_S).toFixed(2)} yr` : h('span', { class: 'muted', title: t.error }, 'not computable')));
      });
      replace(body, h('table', { class: 'data-table' },
        h('thead', {}, h('tr', {},
          h('th', { scope: 'col' }, 'Version'),
          h('th', { scope: 'col' }, 'Recorded'),
          h('th', { scope: 'col' }, 'By'),
          h('th', { scope: 'col' }, 'Note'),
          h('th', { scope: 'col', class: 'num' }, 'τ theory'))),
        h('tbody', {}, rows)));
    },
  };
}
