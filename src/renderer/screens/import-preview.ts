/**
 * The preview of a staged file: what the reader decided about it (encoding, delimiter, header line,
 * zone), and its first rows as a table whose header gives each column's role and unit as selects,
 * with every row's outcome — the reading it would become, or why it would be rejected.
 */
import type { Wire } from '../../shared/contract/channels.js';
import { COLUMN_ROLES, ROLE_LABEL, type ChosenUnit, type ColumnRole, type CsvFileInfo, type UnitRole } from '../../shared/import/types.js';
import { h, uid } from '../app/dom.js';
import { delimiterName, plainOptionWords, unitChoices, unitLabel, type PreviewTableModel } from './import-model.js';

export interface PreviewHandlers {
  role(header: string, role: ColumnRole | null): void;
  /** '' returns the role to the unit the file (or the default) gives. */
  unit(role: UnitRole, unit: string): void;
}

const NOT_USED = '';

/** Facts about the file the reader found, as a compact list. */
export function fileFacts(info: Wire<CsvFileInfo>, sizeBytes: number): HTMLElement {
  const facts: [string, string][] = [
    ['Size', sizeText(sizeBytes)],
    ['Encoding', `${info.encoding.toUpperCase()}${info.byteOrderMark ? ' with byte-order mark' : ''}`],
    ['Delimiter', `${delimiterName(info.delimiter)}${info.delimiterDetected ? ' (detected)' : ''}`],
    ['Decimal separator', `${info.decimal === ',' ? 'comma' : 'point'}${info.decimalDetected ? ' (detected)' : ''}`],
    ['Line ends', info.linebreak === '\r\n' ? 'CRLF (Windows)' : info.linebreak === '\r' ? 'CR' : 'LF'],
    ['Header line', String(info.headerLine)],
    ['Naive times read in', info.timeZone],
  ];
  return h('dl', { class: 'imp-file-facts' }, facts.map(([k, v]) => h('div', {}, h('dt', {}, k), h('dd', {}, v))));
}

export function sizeText(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 ** 2) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / 1024 ** 2).toFixed(1)} MiB`;
}

/**
 * The rows as a table. `detectedUnits` holds, per unit role, the unit the file gave before any
 * override, so the "as the file says" choice can name it. Controls carry data-focus keys so the
 * screen can put focus back after redrawing the table.
 */
export function previewTable(
  model: PreviewTableModel,
  chosenUnits: Partial<Record<UnitRole, string>>,
  detectedUnits: Partial<Record<UnitRole, ChosenUnit>>,
  handlers: PreviewHandlers,
): HTMLElement {
  const headCells = model.columns.map((c, i) => {
    const roleSelect = h('select', { id: uid('role'), 'data-focus': `role:${i}:${c.header}` },
      h('option', { value: NOT_USED }, 'not used'),
      COLUMN_ROLES.map((r) => h('option', { value: r }, ROLE_LABEL[r])));
    roleSelect.value = c.role ?? NOT_USED;
    roleSelect.addEventListener('change', () => handlers.role(c.header, roleSelect.value === NOT_USED ? null : roleSelect.value as ColumnRole));
    const parts: HTMLElement[] = [
      h('span', { class: 'imp-col-header' }, c.header === '' ? '(no header)' : c.header),
      h('label', { for: roleSelect.id }, 'Role', h('span', { class: 'imp-vh' }, ` of column “${c.header}”`)),
      roleSelect,
    ];
    if (c.unitRole !== null && c.unit !== null) {
      const unitRole = c.unitRole;
      const detected = detectedUnits[unitRole];
      const unitSelect = h('select', { id: uid('unit'), 'data-focus': `unit:${unitRole}` },
        h('option', { value: '' }, detected !== undefined ? `${unitLabel(detected.unit)} (${detected.source === 'header' ? 'from the header' : 'default'})` : 'as the file says'),
        unitChoices(unitRole).map((g) => h('optgroup', { label: g.group }, g.units.map((u) => h('option', { value: u }, unitLabel(u))))));
      unitSelect.value = chosenUnits[unitRole] ?? '';
      unitSelect.addEventListener('change', () => handlers.unit(unitRole, unitSelect.value));
      parts.push(h('label', { for: unitSelect.id }, 'Unit', h('span', { class: 'imp-vh' }, ` of column “${c.header}”`)), unitSelect);
    }
    return h('th', { scope: 'col', class: c.role === null ? 'imp-col-unused' : null }, h('div', { class: 'imp-col-head' }, parts));
  });
  const extraHead = model.extraCells > 0 ? h('th', { scope: 'col', class: 'imp-col-unused' }, '(extra cells)') : null;

  const body = model.rows.map((r) => {
    const cells = r.cells.slice(0, model.columns.length).map((text, i) => h('td', { class: model.columns[i]?.role === null ? 'imp-col-unused' : null }, text));
    const extra = model.extraCells > 0 ? h('td', { class: 'imp-col-unused' }, r.cells.slice(model.columns.length).join(' | ')) : null;
    const outcome = r.rejected !== null
      ? h('td', { class: 'imp-outcome' }, h('span', { class: 'mark mark-poor' }, 'rejected'), ' ', plainOptionWords(r.rejected))
      : r.unknownWell
        ? h('td', { class: 'imp-outcome' }, h('span', { class: 'mark mark-fair' }, 'well not in the field'), ' ', r.readAs ?? '', h('span', { class: 'imp-unknown-note' }, ' — rejected unless the wells are created'))
        : h('td', { class: 'imp-outcome' }, h('span', { class: 'mark mark-good' }, 'reads as'), ' ', r.readAs ?? '');
    return h('tr', { class: r.rejected !== null ? 'imp-row-rejected' : null }, h('th', { scope: 'row', class: 'num' }, String(r.line)), outcome, cells, extra);
  });

  const caption = `First ${model.rows.length} data ${model.rows.length === 1 ? 'row' : 'rows'} of the file` +
    (model.rejectedCount > 0 ? `; ${model.rejectedCount} would be rejected (marked)` : '; none would be rejected');
  return h('div', { class: 'imp-table-wrap', tabindex: '0', role: 'region', 'aria-label': 'Preview of the file’s first rows' },
    h('table', { class: 'data-table imp-preview' },
      h('caption', {}, caption),
      h('thead', {}, h('tr', {}, h('th', { scope: 'col', class: 'num' }, 'Line'), h('th', { scope: 'col', class: 'imp-outcome' }, 'Outcome'), headCells, extraHead)),
      h('tbody', {}, body)));
}
