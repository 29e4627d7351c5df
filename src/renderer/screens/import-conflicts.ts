/**
 * The conflicts an import held back — a row whose instant a stored reading already holds with
 * other values — each with the stored reading and the imported values side by side, decided one by
 * one or all at once (keep the stored reading, or replace it by the imported values; both with a
 * reason for the audit log).
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ConflictJson, KeepChoice } from '../../shared/contract/imports.js';
import { InputError } from '../../shared/errors.js';
import type { AppContext } from '../app/context.js';
import type { Display } from '../app/display.js';
import { field, h, notice, replace, uid } from '../app/dom.js';
import { conflictComparison } from './import-model.js';

export interface ConflictsView {
  element: HTMLElement;
  /** Shows the open conflicts of an import (null: none chosen). */
  load(importId: number | null): Promise<void>;
}

export function conflictsView(app: AppContext, displayOf: (fieldName: string) => Display, onResolved: () => void): ConflictsView {
  const heading = h('h2', { id: uid('conflicts-heading'), tabindex: '-1' }, 'Conflicts to decide');
  const body = h('div', { class: 'imp-conflicts-body' });
  const element = h('section', { class: 'panel imp-conflicts', 'aria-labelledby': heading.id, hidden: true }, heading, body);
  let importId: number | null = null;

  const reason = field('Reason for the decision', h('input', { type: 'text', maxlength: 1000, autocomplete: 'off' }), 'kept in the audit log');

  async function resolve(request: { id?: number; importId?: number; all?: boolean; keep: KeepChoice }, buttons: HTMLButtonElement[]): Promise<void> {
    reason.setError(null);
    for (const b of buttons) b.disabled = true;
    try {
      const out = await app.client.resolveConflicts({ ...request, reason: reason.control.value.trim() });
      const n = out.resolved.length;
      app.tell('ok', `${n} ${n === 1 ? 'conflict' : 'conflicts'} decided: ${request.keep === 'existing' ? 'the stored reading kept' : 'the imported values used'}.`);
      await load(importId);
      onResolved();
    } catch (e) {
      for (const b of buttons) b.disabled = false;
      if (e instanceof InputError && e.where.field === 'reason') reason.setError(e.reason);
      else app.tell('error', `The conflict could not be decided: ${e instanceof InputError ? e.reason : e instanceof Error ? e.message : String(e)}`);
    }
  }

  function conflictCard(c: Wire<ConflictJson>): HTMLElement {
    const display = displayOf(c.field);
    const titleId = uid('conflict');
    const keep = h('button', { type: 'button', 'aria-describedby': titleId }, 'Keep stored');
    const use = h('button', { type: 'button', 'aria-describedby': titleId }, 'Use imported');
    keep.addEventListener('click', () => void resolve({ id: c.id, keep: 'existing' }, [keep, use]));
    use.addEventListener('click', () => void resolve({ id: c.id, keep: 'new' }, [keep, use]));
    const rows = conflictComparison(c, display);
    return h('article', { class: 'imp-conflict', 'aria-labelledby': titleId },
      h('h3', { id: titleId }, `${c.well} · ${display.dateTime(c.time)} · line ${c.line}`),
      h('table', { class: 'data-table imp-compare' },
        h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Value'), h('th', { scope: 'col' }, 'Stored reading'), h('th', { scope: 'col' }, 'Imported'))),
        h('tbody', {}, rows.map((r) => h('tr', { class: r.differs ? 'imp-differs' : null },
          h('th', { scope: 'row' }, r.label, r.differs ? h('span', { class: 'imp-differs-mark' }, ' differs') : null),
          h('td', { class: 'num' }, r.stored), h('td', { class: 'num' }, r.imported))))),
      h('p', { class: 'imp-raw-line' }, 'As in the file: ', h('code', { class: 'imp-raw' }, c.raw)),
      h('div', { class: 'actions' }, keep, use));
  }

  async function load(id: number | null): Promise<void> {
    importId = id;
    if (id === null) {
      element.hidden = true;
      return;
    }
    let conflicts: Wire<ConflictJson>[];
    try {
      conflicts = (await app.client.listConflicts({ importId: id, open: true })).conflicts;
    } catch (e) {
      element.hidden = false;
      replace(body, notice('error', `The conflicts could not be listed: ${e instanceof Error ? e.message : String(e)}`));
      return;
    }
    if (importId !== id) return;
    element.hidden = false;
    if (conflicts.length === 0) {
      replace(body, h('p', { class: 'muted' }, `Import #${id} has no open conflicts.`));
      return;
    }
    const keepAll = h('button', { type: 'button' }, 'Keep all stored');
    const useAll = h('button', { type: 'button' }, 'Use all imported');
    const cards = conflicts.map(conflictCard);
    const all = [keepAll, useAll, ...cards.flatMap((c) => [...c.querySelectorAll('button')])];
    keepAll.addEventListener('click', () => void resolve({ importId: id, all: true, keep: 'existing' }, all));
    useAll.addEventListener('click', () => void resolve({ importId: id, all: true, keep: 'new' }, all));
    replace(body,
      h('p', {}, `Import #${id} held back ${conflicts.length} ${conflicts.length === 1 ? 'row' : 'rows'} whose instant a stored reading already holds with other values. Using the imported values replaces the stored reading (the old one stays in the audit log).`),
      h('div', { class: 'form-row imp-bulk' }, reason.wrap, h('div', { class: 'actions' }, keepAll, useAll)),
      cards);
  }

  return { element, load };
}
