/**
 * Small DOM pieces the reservoir and recharge screens share: a labelled fact (its label is its
 * accessible name, so a test or a screen reader finds "Time constant τ" by name), a verdict mark.
 */
import '../styles/recharge.css';
import { h, uid, type Child } from '../app/dom.js';
import type { VerdictKey } from './recharge-model.js';

/** A fact box whose group is named by its label. */
export function fact(label: string, value: Child, note?: Child | Child[], extraClass?: string): HTMLElement {
  const id = uid('fact');
  return h('div', { class: `fact${extraClass !== undefined ? ` ${extraClass}` : ''}`, role: 'group', 'aria-labelledby': id },
    h('div', { class: 'fact-label', id }, label),
    h('div', { class: 'fact-value' }, value),
    note !== undefined && note !== null && note !== '' ? h('div', { class: 'fact-note' }, ...[note].flat()) : null);
}

const VERDICT_MARKS: Record<VerdictKey, [string, string]> = {
  recharge: ['verdict-mark-recharge', 'recharge'],
  'consistent-with-none': ['verdict-mark-none', 'no recharge detectable'],
  'faster-than-theory': ['verdict-mark-faster', 'faster than theory'],
  'no-fit': ['verdict-mark-none', 'no estimate'],
};

/** A short verdict mark for tables: 'recharge', 'faster than theory', … */
export function verdictMark(verdict: VerdictKey): HTMLElement {
  const [cls, text] = VERDICT_MARKS[verdict];
  return h('span', { class: `mark ${cls}` }, text);
}
