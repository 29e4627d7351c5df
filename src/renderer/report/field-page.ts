/**
 * The summary pages of a field report: every well ranked by the years left to its economic limit,
 * the field's thermal output and its forecast, and the field's imports.
 */
import type { ReportModel } from '../../shared/report/model.js';
import type { FieldReport, RankRow } from '../../shared/report/field-section.js';
import { fixed, percent, type Display } from '../app/display.js';
import { h } from '../app/dom.js';
import { drawOutputChart } from './output-chart.js';
import { statement, table } from './parts.js';
import { importsTable } from './quality.js';
import type { Drawn } from './well-page.js';

export function fieldPage(field: FieldReport, model: ReportModel, display: Display): Drawn {
  const section = h('section', { class: 'report-field', 'aria-labelledby': 'field-title' },
    h('h2', { id: 'field-title' }, `Field ${field.name}`),
    field.notes !== '' ? h('p', { class: 'report-lede' }, field.notes) : null);
  if (field.statement !== null) section.append(statement(field.statement));
  section.append(ranking(field.ranking, model, display));

  const box = h('div', { class: 'report-charts' });
  section.append(h('h3', {}, 'Thermal output of the field'), box);
  section.append(importsTable(model.imports, display));
  return {
    element: section,
    draw: () => {
      if (field.output === null && field.forecast === null) {
        box.append(statement(field.outputStatement ?? 'There is no thermal output to show.'));
        return 0;
      }
      const canvas = h('canvas', { role: 'img', 'aria-label': `Thermal output of ${field.name} per week, measured and forecast` });
      box.append(h('div', { class: 'chart-box report-chart-output' }, canvas));
      if (field.outputStatement !== null) box.append(statement(field.outputStatement));
      if (field.output !== null) box.append(h('p', { class: 'fact-note' }, `Measured: ${field.output.note}`));
      if (field.forecast !== null) box.append(h('p', { class: 'fact-note' }, `Forecast: ${field.forecast.note}`));
      drawOutputChart(canvas, field, display);
      return 1;
    },
  };
}

function years(v: number | null | undefined): string {
  return v === null || v === undefined ? '—' : `${fixed(v, 1)}`;
}

function ranking(rows: readonly RankRow[], model: ReportModel, display: Display): HTMLElement {
  if (rows.length === 0) return h('p', { class: 'fact-note' }, 'The field has no wells.');
  const horizon = fixed(model.meta.horizonYears, 0);
  const wait = (r: RankRow, v: number | null | undefined): string => {
    if (r.yearsToLimit === null) return '—';
    if (r.alreadyReached) return 'reached';
    return v === null || v === undefined ? `> ${horizon}` : years(v);
  };
  return table(`Wells ranked by the years from the latest reading to the economic limit (P50, soonest first; "> ${horizon}": not within the horizon)`, [
    { label: 'Well', nowrap: true }, { label: 'P90 yr', numeric: true }, { label: 'P50 yr', numeric: true }, { label: 'P10 yr', numeric: true },
    { label: 'End of life P50', nowrap: true }, { label: 'Fitted τ', numeric: true }, { label: 'Power now', numeric: true },
    { label: 'Recharge f', numeric: true }, { label: 'T now', numeric: true }, { label: 'Note' },
  ], rows.map((r) => [
    r.well,
    wait(r, r.yearsToLimit?.p90), wait(r, r.yearsToLimit?.p50), wait(r, r.yearsToLimit?.p10),
    r.alreadyReached ? 'reached' : r.endOfLifeP50 === null ? (r.yearsToLimit === null ? '—' : 'not within the horizon') : display.date(r.endOfLifeP50),
    display.years(r.tauS),
    display.format('power', r.currentPowerW),
    percent(r.rechargeFraction, 1),
    display.formatCelsius(r.latestProductionTemperatureC),
    r.kind === 'injection' ? 'injection well: no decline forecast' : (r.statement ?? ''),
  ]), { rowHeader: true, className: 'report-ranking' });
}
