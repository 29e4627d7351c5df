/**
 * "New reservoir": a field and a name → createReservoir, then the new reservoir's (empty) history.
 * Refusals are shown beside the input they name.
 */
import type { AppContext } from '../app/context.js';
import { field, h, select } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import { InputError } from '../../shared/errors.js';

export function createReservoirForm(app: AppContext, fields: readonly string[], prefill?: { field?: string; name?: string }, open = false): HTMLElement {
  const fieldSel = field('Field', select(fields.map((f) => [f, f] as const), prefill?.field));
  const name = field('Name of the new reservoir', h('input', { type: 'text', autocomplete: 'off', maxlength: 200 }));
  name.control.value = prefill?.name ?? '';
  const button = h('button', { type: 'button', class: 'primary' }, 'Create reservoir');
  button.addEventListener('click', () => {
    void (async () => {
      fieldSel.setError(null);
      name.setError(null);
      const text = name.control.value.trim();
      if (text === '') {
        name.setError('give the reservoir a name');
        name.control.focus();
        return;
      }
      button.disabled = true;
      try {
        const created = await app.client.createReservoir({ field: fieldSel.control.value, name: text });
        app.tell('ok', `Reservoir “${created.name}” created in ${created.field}: enter its parameters and save the first version.`);
        app.navigate(routeTo('reservoir', created.field, created.name));
      } catch (e) {
        if (e instanceof InputError && e.where.field === 'field') fieldSel.setError(e.reason);
        else if (e instanceof InputError) name.setError(e.reason);
        else app.tell('error', `The reservoir could not be created: ${e instanceof Error ? e.message : String(e)}`);
      } finally {
        button.disabled = false;
      }
    })();
  });
  const details = h('details', { class: 'reservoir-create' },
    h('summary', {}, 'New reservoir'),
    h('div', { class: 'form-row' }, fieldSel.wrap, name.wrap, h('div', { class: 'reservoir-create-action' }, button)));
  details.open = open;
  return details;
}
