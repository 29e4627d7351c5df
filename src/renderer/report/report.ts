/**
 * The report page: reads the report model from the JSON element the assembler filled
 * (src/main/report/assemble.ts), draws it with the app's own DOM builders and chart.js charts, and
 * marks the document ready (data-report-ready, data-report-charts) once every chart is drawn — the
 * moment to print. It talks to no back end and fetches nothing: the page's CSP forbids it.
 *
 * Print layout (report.css and the assembler's @page rules): the title and the first section (the
 * well, or the field's summary) on the first page, then in a field report each well on pages of its
 * own (data-report-page names its running header), and last where the report comes from, the
 * cautions and the method.
 */
import '../styles/base.css';
// The decline chart's HTML legend is styled there (.decline-legend, .legend-*), as on the decline screen.
import '../styles/decline.css';
import './report.css';
import type { ReportModel } from '../../shared/report/model.js';
import { REPORT_FORMAT } from '../../shared/report/model.js';
import { Display } from '../app/display.js';
import { h, replace } from '../app/dom.js';
import { Chart, setChartTimeZone } from '../charts/setup.js';
import { fieldPage } from './field-page.js';
import { closing, cover } from './front.js';
import { wellPage, type Drawn } from './well-page.js';

/** Print resolution of the charts: twice the CSS pixels, so lines stay sharp on paper. */
const PRINT_PIXEL_RATIO = 2;

function readModel(): ReportModel | null {
  const text = document.getElementById('tauwell-report')?.textContent ?? 'null';
  const value: unknown = JSON.parse(text);
  if (value === null || typeof value !== 'object' || (value as { format?: unknown }).format !== REPORT_FORMAT) return null;
  return value as ReportModel;
}

function render(root: HTMLElement): void {
  const model = readModel();
  if (model === null) {
    replace(root, h('p', { class: 'notice notice-error', role: 'alert' }, 'This page holds no report. Reports are made with `tauwell report` or from the app.'));
    document.documentElement.dataset.reportReady = 'true';
    document.documentElement.dataset.reportCharts = '0';
    return;
  }
  document.title = model.title;
  const display = new Display(model.meta.units, model.meta.timeZone);
  setChartTimeZone(display.timeZone);
  Chart.defaults.devicePixelRatio = Math.max(PRINT_PIXEL_RATIO, window.devicePixelRatio || 1);

  const parts: Drawn[] = [];
  if (model.field !== null) parts.push(fieldPage(model.field, model, display));
  model.wells.forEach((w, i) => parts.push(wellPage(w, i, model, display)));
  replace(root, cover(model, display), parts.map((p) => p.element), closing(model, display));
  let charts = 0;
  for (const p of parts) charts += p.draw();
  document.documentElement.dataset.reportCharts = String(charts);
  document.documentElement.dataset.reportReady = 'true';
}

const root = document.getElementById('report');
if (root !== null) {
  try {
    render(root);
  } catch (e) {
    replace(root, h('p', { class: 'notice notice-error', role: 'alert' }, `This report could not be drawn: ${e instanceof Error ? e.message : String(e)}`));
    document.documentElement.dataset.reportReady = 'error';
  }
}
