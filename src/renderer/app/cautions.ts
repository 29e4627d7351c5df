/** The cautions box shown where forecasts and parameters are shown. */
import { CAUTIONS } from '../../shared/cautions.js';
import { h } from './dom.js';

export function cautionsBox(): HTMLElement {
  return h('aside', { class: 'cautions', 'aria-label': 'Cautions' },
    h('h2', {}, 'Before you act on these numbers'),
    h('ul', {}, CAUTIONS.map((c) => h('li', {}, c))));
}
