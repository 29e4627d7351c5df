/**
 * The data-quality part of a well's pages (readings, what the fit left out and why, the excluded
 * periods, the field overview's mark and notes) and the import history of the field (files, rows
 * imported, rejected rows).
 */
import type { ImportSummary } from '../../shared/report/model.js';
import type { QualitySummary } from '../../shared/report/well-section.js';
import { fixed, type Display } from '../app/display.js';
import { h } from '../app/dom.js';
import { qualityLabel } from '../screens/field-model.js';
import { count, keyValues, notes, table } from './parts.js';

const REASON: Record<string, string> = {
  'not-producing': 'not producing (shut in or test)',
  flagged: 'flagged bad or spike',
  'no-temperature': 'no production temperature',
  'before-time-zero': 'before time zero',
};

export function qualityPart(q: QualitySummary, display: Display): HTMLElement[] {
  const out: HTMLElement[] = [];
  out.push(keyValues('Readings and what the fit left out (they stay in the log)', [
    ['Live readings', count(q.readings)],
    ['Fitted', count(q.included)],
    ['Left out: not producing', count(q.excluded.notProducing)],
    ['Left out: flagged bad or spike', count(q.excluded.flagged)],
    ['Left out: no production temperature', count(q.excluded.noTemperature)],
    ['Left out: before time zero', count(q.excluded.beforeTimeZero)],
    ['First and latest reading', q.firstReading === null ? '—' : `${display.date(q.firstReading)} to ${display.date(q.lastReading)}`],
    ['Longest gap between readings', q.longestGapDays === null ? '—' : `${fixed(q.longestGapDays, 1)} d`],
    ['Quality mark', q.mark === null ? '—' : qualityLabel(q.mark)],
  ]));
  const why = notes('Why the mark is what it is', q.notes);
  if (why !== null) out.push(why);
  if (q.periods.length > 0) {
    out.push(table(`Excluded periods${q.morePeriods > 0 ? ` (the first ${q.periods.length}; ${count(q.morePeriods)} more)` : ''}`,
      [{ label: 'From', nowrap: true }, { label: 'To', nowrap: true }, { label: 'Why' }, { label: 'Readings', numeric: true }],
      q.periods.map((p) => [display.date(p.from), display.date(p.to), REASON[p.reason] ?? p.reason, count(p.readings)])));
  } else {
    out.push(h('p', { class: 'fact-note' }, 'No excluded periods: every reading was producing and unflagged.'));
  }
  return out;
}

export function importsTable(imports: ImportSummary, display: Display): HTMLElement {
  const wrap = h('div', { class: 'report-imports' }, h('h3', {}, `Imports into ${imports.field}`));
  if (!imports.available) {
    wrap.append(h('p', { class: 'fact-note' }, 'The import history of this field log could not be read: imports and rejected rows are not counted here.'));
    return wrap;
  }
  if (imports.files === 0) {
    wrap.append(h('p', { class: 'fact-note' }, 'No CSV file has been imported into this field: its readings were logged by hand (or by the demo).'));
    return wrap;
  }
  wrap.append(h('p', { class: 'report-lede' },
    `${count(imports.files)} file${imports.files === 1 ? '' : 's'}: ${count(imports.rowsRead)} rows read, ${count(imports.imported)} imported, ` +
    `${count(imports.duplicates)} duplicates skipped, ${count(imports.conflicts)} conflicts held, ${count(imports.rejected)} rejected. ` +
    'A file may hold readings of several wells.'));
  wrap.append(table(`Imports${imports.rows.length < imports.files ? ` (the latest ${imports.rows.length})` : ''}`, [
    { label: 'File' }, { label: 'Started' }, { label: 'Status' }, { label: 'Rows', numeric: true }, { label: 'Imported', numeric: true },
    { label: 'Duplicates', numeric: true }, { label: 'Conflicts', numeric: true }, { label: 'Rejected', numeric: true }, { label: 'Flagged', numeric: true },
  ], imports.rows.map((r) => [
    r.file, display.dateTime(r.started), r.status, count(r.rowsRead), count(r.imported), count(r.duplicates), count(r.conflicts), count(r.rejected), count(r.flagged),
  ]), { rowHeader: true }));
  return wrap;
}
