/**
 * The start screen: every field with its facts, a table of its wells (latest reading, θ, τ fitted and
 * theoretical, recharge, years to the economic limit, data quality) and its thermal output week by
 * week. Rows and facts are built in field-model.ts; this module only draws them.
 */
import { reportActions } from '../app/report-action.js';
import '../styles/field.css';
import type { Wire } from '../../shared/contract/channels.js';
import type { FieldOverview, FieldOverviewResponse } from '../../shared/contract/overview.js';
import { InputError } from '../../shared/errors.js';
import { cautionsBox } from '../app/cautions.js';
import type { AppContext, Screen } from '../app/context.js';
import type { Display } from '../app/display.js';
import { field, h, notice, replace, sortableTable, type Column } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import { outputChartConfig } from '../charts/output-chart.js';
import { Chart, setChartTimeZone } from '../charts/setup.js';
import { fieldFacts, limitText, outputPoints, wellRow, type WellRow } from './field-model.js';
import { checkTimeZone, knownTimeZones } from './settings-model.js';

let charts: Chart[] = [];
/** Bumped on every mount and unmount, so a late answer never draws into another screen. */
let generation = 0;

function destroyCharts(): void {
  for (const c of charts) c.destroy();
  charts = [];
}

export const fieldScreen: Screen = {
  title: 'Field',
  async mount(root, params, app) {
    const mine = ++generation;
    root.append(h('h1', {}, 'Field'), h('p', { class: 'muted' }, 'Loading the field overview…'));
    const overview = await app.client.fieldOverview({});
    if (mine !== generation) return;
    const remount = async (): Promise<void> => {
      destroyCharts();
      replace(root);
      await fieldScreen.mount(root, params, app);
    };
    const page = h('div', { class: 'field-screen' }, h('h1', {}, 'Field'));
    replace(root, page);
    if (overview.fields.length === 0) {
      page.append(emptyLog(app, remount));
      return;
    }
    page.append(limitNotice(overview, app));
    for (const f of overview.fields) page.append(fieldSection(f, overview, app));
    page.append(cautionsBox());
  },
  unmount() {
    generation += 1;
    destroyCharts();
  },
};

/** The economic limit in use, and a warning while it is the built-in placeholder. */
function limitNotice(overview: Wire<FieldOverviewResponse>, app: AppContext): HTMLElement {
  const s = overview.settings;
  const display = app.display();
  const own = Object.keys(s.wellEconomicLimits).length;
  const text = h('p', { class: 'field-limit' },
    h('strong', {}, 'Economic limit: '), limitText(s.economicLimit, display),
    own > 0 ? ` (${own} well${own === 1 ? ' has its' : 's have their'} own)` : '',
    `; forecasts look ${s.horizonYears} years ahead. `,
    h('a', { href: routeTo('settings') }, 'Change in Settings'));
  if (s.source.economicLimit !== 'default') return text;
  return h('div', {}, text, notice('warn',
    'This economic limit is a built-in placeholder, not your plant’s: years to the limit and end-of-life dates follow from it. ',
    h('a', { href: routeTo('settings') }, 'Set the economic limit in Settings'), '.'));
}

function fieldSection(f: Wire<FieldOverview>, overview: Wire<FieldOverviewResponse>, app: AppContext): HTMLElement {
  const display = app.display(f.field.timeZone);
  const section = h('section', { class: 'field-section', 'aria-labelledby': `field-${f.field.id}` },
    h('h2', { id: `field-${f.field.id}` }, f.field.name),
    h('p', { class: 'lede' }, `Time zone ${display.timeZone}`, f.field.notes !== '' ? ` · ${f.field.notes}` : ''),
    reportActions(app, { field: f.field.name }));
  if (f.wells.length === 0) {
    section.append(notice('info',
      'This field has no wells yet. Add them from the command line (tauwell add-well), or import a plant export on the ',
      h('a', { href: routeTo('import') }, 'Import'), ' screen, which can create the wells the export names.'));
    return section;
  }
  section.append(h('div', { class: 'facts' }, fieldFacts(f, display).map((fact) => h('div', { class: 'fact' },
    h('div', { class: 'fact-label' }, fact.label),
    h('div', { class: 'fact-value' }, fact.value),
    fact.note !== undefined ? h('div', { class: 'fact-note' }, fact.note) : null))));
  const rows = f.wells.map((w) => wellRow(w, display, overview.settings.horizonYears));
  section.append(h('div', { class: 'table-scroll' }, wellTable(rows, f.field.name, display)));
  section.append(outputChart(f, display));
  return section;
}

function wellTable(rows: WellRow[], fieldName: string, display: Display): HTMLTableElement {
  const two = (main: string, sub: string): DocumentFragment => {
    const cell = document.createDocumentFragment();
    cell.append(main);
    if (sub !== '') cell.append(h('span', { class: 'cell-sub' }, sub));
    return cell;
  };
  const columns: Column<WellRow>[] = [
    { key: 'well', label: 'Well', sort: (r) => r.well, cell: (r) => h('a', { href: routeTo('decline', r.field, r.well) }, r.well) },
    { key: 'kind', label: 'Kind', sort: (r) => r.kind, cell: (r) => r.kind },
    { key: 'latest', label: 'Latest reading', sort: (r) => r.latestMs, cell: (r) => two(r.latestDate, r.latestTemperature) },
    { key: 'theta', label: 'θ now', numeric: true, sort: (r) => r.thetaK, title: 'production temperature above Tref (a temperature difference), latest producing reading', cell: (r) => r.theta },
    { key: 'tau', label: 'Time constant τ (fitted)', numeric: true, sort: (r) => r.tauS, cell: (r) => two(r.tau, r.tauRange) },
    { key: 'theory', label: 'τ theory', numeric: true, sort: (r) => r.theoryTauS, title: 'from the reservoir parameters at the mean flow', cell: (r) => r.theoryTau },
    {
      key: 'recharge', label: 'Recharge', numeric: true, sort: (r) => r.rechargeFraction, title: 'share of the extracted heat being replenished, 1 − τtheory/τfit',
      cell: (r) => {
        const cell = two(r.recharge, r.rechargeRange);
        if (r.rechargeWords !== '') cell.append(h('span', { class: `cell-sub verdict${r.rechargeFraction !== null && r.rechargeFraction < 0 ? ' verdict-short' : ''}`, title: r.rechargeInterpretation }, r.rechargeWords));
        return cell;
      },
    },
    { key: 'years', label: 'Years to limit (P50)', numeric: true, sort: (r) => r.yearsP50Value, cell: (r) => two(r.yearsP50, r.yearsRange) },
    {
      key: 'fit', label: 'Stored fit', sort: (r) => (r.stale === null ? null : r.stale ? 1 : 0),
      cell: (r) => (r.stale === true ? h('span', { class: 'mark mark-stale', title: 'readings changed since the fit; refit on the Decline screen' }, 'stale') : h('span', { class: 'muted' }, r.staleText)),
    },
    {
      key: 'quality', label: 'Data quality', sort: (r) => ['good', 'fair', 'poor', 'no-data'].indexOf(r.quality.mark),
      cell: (r) => h('span', { class: `mark mark-${r.quality.mark}`, title: r.quality.notes },
        r.quality.label, r.quality.notes !== '' ? h('span', { class: 'visually-hidden' }, `: ${r.quality.notes}`) : null),
    },
    { key: 'problem', label: 'Forecast', cell: (r) => (r.problem === null ? h('span', { class: 'muted' }, 'yes') : h('span', { class: 'problem' }, r.problem)) },
  ];
  return sortableTable(columns, rows, {
    caption: `Wells of ${fieldName} (times in ${display.timeZone}; choose a column heading to sort)`,
    initial: { key: 'well', dir: 'asc' },
  });
}

/** The field's thermal output per week: wheel or pinch to zoom, drag to pan, a button to reset. */
function outputChart(f: Wire<FieldOverview>, display: Display): HTMLElement {
  const points = outputPoints(f.output, display);
  const unit = display.unit('power');
  const wrap = h('div', { class: 'field-output' }, h('h3', {}, 'Thermal output of the field, per week'));
  if (points.length === 0) {
    wrap.append(notice('info', 'No producing readings yet, so no thermal output to show.'), h('p', { class: 'fact-note' }, f.output.note));
    return wrap;
  }
  const canvas = h('canvas', {
    role: 'img',
    'aria-label': `Thermal output of ${f.field.name} per week, ${display.date(points[0].x)} to ${display.date(points[points.length - 1].x)}, in ${unit}`,
  });
  const box = h('div', { class: 'chart-box' }, canvas);
  setChartTimeZone(display.timeZone);
  const chart = new Chart(canvas, outputChartConfig({ measured: points, display, interactive: true }));
  charts.push(chart);
  wrap.append(
    h('div', { class: 'actions' },
      h('button', { type: 'button', onclick: () => chart.resetZoom() }, 'Reset zoom'),
      h('span', { class: 'fact-note' }, 'Scroll to zoom, drag to pan.')),
    box,
    h('p', { class: 'fact-note' }, `How the output is computed: ${f.output.note}`));
  return wrap;
}

/** No field in the log yet: create one, or build the invented demo field. */
function emptyLog(app: AppContext, remount: () => Promise<void>): HTMLElement {
  const name = field('Field name', h('input', { type: 'text', autocomplete: 'off', maxlength: 200 }));
  const zones = knownTimeZones();
  const listId = 'field-zone-list';
  const zone = field('Time zone of the field', h('input', { type: 'text', list: listId, value: Intl.DateTimeFormat().resolvedOptions().timeZone, autocomplete: 'off' }),
    'IANA name, e.g. Europe/Berlin: naive timestamps of this field are read in it');
  const status = h('div');
  const create = async (e: Event): Promise<void> => {
    e.preventDefault();
    name.setError(null);
    zone.setError(null);
    let tz: string;
    try {
      tz = checkTimeZone(zone.control.value);
    } catch (err) {
      zone.setError(err instanceof InputError ? err.reason : String(err));
      return;
    }
    if (name.control.value.trim() === '') {
      name.setError('enter a name for the field');
      return;
    }
    try {
      await app.client.createField({ name: name.control.value.trim(), timeZone: tz });
      app.tell('ok', `Field ${name.control.value.trim()} created.`);
      await remount();
    } catch (err) {
      if (err instanceof InputError) (err.where.field === 'timeZone' ? zone : name).setError(err.reason);
      else replace(status, notice('error', err instanceof Error ? err.message : String(err)));
    }
  };
  const demo = h('button', {
    type: 'button', class: 'primary',
    onclick: async () => {
      demo.disabled = true;
      replace(status, notice('info', 'Building the invented demo field…'));
      try {
        const built = await app.client.buildDemo();
        app.tell('ok', `Demo field ${built.field.name} built: ${built.wells.length} wells, ${built.liveReadings} readings (invented, not a real site).`);
        await remount();
      } catch (err) {
        demo.disabled = false;
        replace(status, notice('error', err instanceof InputError ? err.reason : err instanceof Error ? err.message : String(err)));
      }
    },
  }, 'Build the demo field');
  return h('div', { class: 'panel field-empty' },
    h('h2', {}, 'This field log is empty'),
    h('p', {}, 'Create a field, or build the demo: an invented field with four wells and twelve years of weekly readings, to try every screen on.'),
    h('div', { class: 'actions' }, demo),
    h('form', { class: 'form-row', onsubmit: (e: Event) => void create(e) },
      name.wrap, zone.wrap,
      h('datalist', { id: listId }, zones.map((z) => h('option', { value: z }))),
      h('div', { class: 'field field-button' }, h('button', { type: 'submit' }, 'Create field'))),
    status);
}
