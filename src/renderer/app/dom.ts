/**
 * Small DOM builders: `h('button', { class: 'primary', onclick }, 'Refit')`. Text is always set as
 * text (never HTML), so nothing from the field log can inject markup.
 */
export type Child = Node | string | number | null | undefined | false;
export type Attrs = Record<string, string | number | boolean | null | undefined | EventListener>;

export function h<K extends keyof HTMLElementTagNameMap>(tag: K, attrs: Attrs = {}, ...children: (Child | Child[])[]): HTMLElementTagNameMap[K] {
  const el = document.createElement(tag);
  for (const [key, value] of Object.entries(attrs)) {
    if (value === null || value === undefined || value === false) continue;
    if (key.startsWith('on') && typeof value === 'function') el.addEventListener(key.slice(2), value);
    else if (value === true) el.setAttribute(key, '');
    else el.setAttribute(key, String(value));
  }
  append(el, children);
  return el;
}

export function append(parent: Node, children: (Child | Child[])[]): void {
  for (const child of children.flat()) {
    if (child === null || child === undefined || child === false) continue;
    parent.appendChild(typeof child === 'string' || typeof child === 'number' ? document.createTextNode(String(child)) : child);
  }
}

/** Replaces every child of `parent`. */
export function replace(parent: Node, ...children: (Child | Child[])[]): void {
  while (parent.firstChild !== null) parent.removeChild(parent.firstChild);
  append(parent, children);
}

let idCounter = 0;
/** A document-unique id for label/aria wiring. */
export function uid(prefix: string): string {
  idCounter += 1;
  return `${prefix}-${idCounter}`;
}

/**
 * A labelled form control with room for its validation message beside it:
 * returns the wrapper, the control and a function that shows (or clears) the message.
 */
export function field<E extends HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>(
  label: string, control: E, hint?: string,
): { wrap: HTMLElement; control: E; setError(message: string | null): void } {
  const id = control.id !== '' ? control.id : uid('f');
  control.id = id;
  const message = h('span', { class: 'field-error', id: `${id}-error`, role: 'alert', 'aria-live': 'polite' });
  const wrap = h('div', { class: 'field' },
    h('label', { for: id }, label),
    control,
    hint !== undefined ? h('span', { class: 'field-hint', id: `${id}-hint` }, hint) : null,
    message);
  if (hint !== undefined) control.setAttribute('aria-describedby', `${id}-hint ${id}-error`);
  else control.setAttribute('aria-describedby', `${id}-error`);
  return {
    wrap,
    control,
    setError(text) {
      message.textContent = text ?? '';
      if (text === null || text === '') control.removeAttribute('aria-invalid');
      else control.setAttribute('aria-invalid', 'true');
    },
  };
}

export function select(options: readonly (readonly [value: string, label: string])[], value?: string, attrs: Attrs = {}): HTMLSelectElement {
  const el = h('select', attrs, options.map(([v, label]) => h('option', { value: v }, label)));
  if (value !== undefined) el.value = value;
  return el;
}

/** A message strip: kind 'error' is announced assertively, the rest politely. */
export function notice(kind: 'info' | 'warn' | 'error' | 'ok', ...children: (Child | Child[])[]): HTMLElement {
  return h('div', { class: `notice notice-${kind}`, role: kind === 'error' ? 'alert' : 'status' }, ...children);
}

export interface Column<R> {
  key: string;
  label: string;
  /** Cell content. */
  cell(row: R): Child;
  /** Sort key; a column without one is not sortable. null sorts last. */
  sort?: (row: R) => number | string | null;
  numeric?: boolean;
  title?: string;
}

/**
 * A table whose sortable headers are buttons (keyboard reachable) and carry aria-sort.
 * `onRow` makes each row activatable (click, or Enter on its first cell's link/button).
 */
export function sortableTable<R>(columns: Column<R>[], rows: R[], options: { caption?: string; initial?: { key: string; dir: 'asc' | 'desc' }; rowAttrs?: (row: R) => Attrs } = {}): HTMLTableElement {
  let sortKey = options.initial?.key ?? null;
  let dir: 'asc' | 'desc' = options.initial?.dir ?? 'asc';
  const table = h('table', { class: 'data-table' });
  const tbody = h('tbody');
  const headRow = h('tr');
  const render = (): void => {
    const sorted = [...rows];
    const col = columns.find((c) => c.key === sortKey);
    if (col?.sort !== undefined) {
      const key = col.sort;
      sorted.sort((a, b) => {
        const ka = key(a);
        const kb = key(b);
        if (ka === null && kb === null) return 0;
        if (ka === null) return 1;
        if (kb === null) return -1;
        const c = ka < kb ? -1 : ka > kb ? 1 : 0;
        return dir === 'asc' ? c : -c;
      });
    }
    replace(tbody, sorted.map((r) => h('tr', options.rowAttrs?.(r) ?? {}, columns.map((c) => h('td', { class: c.numeric === true ? 'num' : null }, c.cell(r))))));
    for (const th of headRow.children) {
      const key = (th as HTMLElement).dataset.key;
      if (key === sortKey) th.setAttribute('aria-sort', dir === 'asc' ? 'ascending' : 'descending');
      else th.removeAttribute('aria-sort');
    }
  };
  for (const c of columns) {
    const th = h('th', { scope: 'col', class: c.numeric === true ? 'num' : null, title: c.title ?? null });
    th.dataset.key = c.key;
    if (c.sort !== undefined) {
      th.append(h('button', {
        type: 'button', class: 'sort',
        onclick: () => {
          if (sortKey === c.key) dir = dir === 'asc' ? 'desc' : 'asc';
          else { sortKey = c.key; dir = 'asc'; }
          render();
        },
      }, c.label));
    } else th.append(c.label);
    headRow.append(th);
  }
  if (options.caption !== undefined) table.append(h('caption', {}, options.caption));
  table.append(h('thead', {}, headRow), tbody);
  render();
  return table;
}
