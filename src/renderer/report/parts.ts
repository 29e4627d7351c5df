/**
 * The small pieces every part of the report is made of: a table that never splits a row across
 * pages (report.css), a strip of facts, a plain statement, a list of notes. Text only (dom.ts's h()),
 * so nothing from the field log can become markup.
 */
import { h, type Child } from '../app/dom.js';

export interface TableColumn {
  label: string;
  numeric?: boolean;
  /** Cells that must not wrap (names and dates like KR-3 or 2028-05-21 would break at the hyphen). */
  nowrap?: boolean;
}

function cellClass(c: TableColumn | undefined): string | null {
  const names = [c?.numeric === true ? 'num' : '', c?.nowrap === true ? 'nowrap' : ''].filter((n) => n !== '');
  return names.length === 0 ? null : names.join(' ');
}

/** Tables of at most this many rows are never split across pages. */
const KEEP_WHOLE_ROWS = 14;

/** A table with a caption, column headers (scope col) and, when `rowHeader`, the first cell as a row header. */
export function table(caption: string, columns: readonly TableColumn[], rows: readonly Child[][], options: { rowHeader?: boolean; className?: string } = {}): HTMLTableElement {
  const head = h('tr', {}, columns.map((c) => h('th', { scope: 'col', class: c.numeric === true ? 'num' : null }, c.label)));
  const body = rows.map((cells, r) => h('tr', { 'data-row': r },
    cells.map((cell, i) => (i === 0 && options.rowHeader === true
      ? h('th', { scope: 'row', class: cellClass(columns[i]) }, cell)
      : h('td', { class: cellClass(columns[i]) }, cell)))));
  // A short table moves to the next page whole rather than leave its caption and header behind.
  const keep = rows.length <= KEEP_WHOLE_ROWS ? ' report-keep' : '';
  return h('table', { class: `data-table report-table${keep}${options.className !== undefined ? ` ${options.className}` : ''}` },
    h('caption', {}, caption), h('thead', {}, head), h('tbody', {}, body));
}

/** A two-column table of label and value. */
export function keyValues(caption: string, rows: readonly (readonly [string, Child])[]): HTMLTableElement {
  return table(caption, [{ label: 'Item' }, { label: 'Value' }], rows.map(([k, v]) => [k, v]), { rowHeader: true, className: 'report-kv' });
}

export interface FactItem {
  label: string;
  value: string;
  note?: string;
  tone?: 'warn';
}

export function factStrip(items: readonly FactItem[], label: string): HTMLElement {
  return h('dl', { class: 'facts report-facts', 'aria-label': label },
    items.map((f) => h('div', { class: `fact${f.tone === 'warn' ? ' fact-warn' : ''}` },
      h('dt', { class: 'fact-label' }, f.label),
      h('dd', { class: 'fact-value' }, f.value),
      f.note !== undefined && f.note !== '' ? h('dd', { class: 'fact-note' }, f.note) : null)));
}

/** What a section cannot show and why: said plainly where the numbers would be. */
export function statement(text: string): HTMLElement {
  return h('p', { class: 'notice notice-warn report-statement', role: 'note' }, text);
}

export function notes(heading: string, items: readonly string[]): HTMLElement | null {
  if (items.length === 0) return null;
  return h('div', { class: 'report-notes' }, h('h4', {}, heading), h('ul', {}, items.map((t) => h('li', {}, t))));
}

/** Text that must stay on one line (a date, a well name). */
export function unbroken(text: string): HTMLElement {
  return h('span', { class: 'nowrap' }, text);
}

/** A count with thousands separators. */
export function count(n: number | null | undefined): string {
  return n === null || n === undefined || !Number.isFinite(n) ? '—' : n.toLocaleString('en-US');
}
