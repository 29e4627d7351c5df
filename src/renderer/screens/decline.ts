/** Placeholder until the decline screen lands. */
import type { Screen } from '../app/context.js';
import { h } from '../app/dom.js';

export const declineScreen: Screen = {
  title: 'Decline',
  mount(root) {
    root.append(h('h1', {}, 'Decline'));
  },
};
