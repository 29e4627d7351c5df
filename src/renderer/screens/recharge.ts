/**
 * Recharge screen (#/recharge[/<field>/<well>]): a production well's fitted decline against its
 * reservoir's lumped theory — τfit and τtheory with their intervals, R = τfit/τtheory, the recharge
 * fraction, the recharge heat flow Qr against the background heat flow qb·A — and the verdict in
 * plain words. The forecast runs with the well's stored fit (model, basis, window) and the settings.
 */
import '../styles/recharge.css';
import { cautionsBox } from '../app/cautions.js';
import type { AppContext, Screen } from '../app/context.js';
import { field, h, notice, replace, select } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import type { Chart } from '../charts/setup.js';
import { CallError } from '../../shared/contract/client.js';
import type { Wire } from '../../shared/contract/channels.js';
import type { ForecastWellResponse } from '../../shared/contract/fits.js';
import type { WellInfo } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import { tauChart } from './recharge-chart.js';
import { forecastRequestOf, rechargeView, whyNoRecharge, type RechargeView } from './recharge-model.js';
import { fact } from './reservoir-dom.js';

let chart: Chart | null = null;
let generation = 0;

export const rechargeScreen: Screen = {
  title: 'Recharge',
  async mount(root, params, app) {
    const mine = ++generation;
    root.append(
      h('h1', {}, 'Recharge'),
      h('p', { class: 'lede' }, 'Does the rock around the reservoir resupply heat? The fitted time constant of a well’s decline set against the one its reservoir’s parameters predict.'));
    const listing = await app.client.listWells();
    const wells: WellInfo[] = listing.fields.flatMap((f) => f.wells);
    const well = findWell(wells, params);

    const producers = wells.filter((w) => w.kind === 'production');
    const options: [string, string][] = [['', 'Choose a well…'], ...producers.map((w) => [JSON.stringify([w.field, w.name]), `${w.name} — ${w.field}${w.reservoir === null ? ' (no reservoir)' : ''}`] as [string, string])];
    const picker = field('Well', select(options, well !== undefined ? JSON.stringify([well.field, well.name]) : ''));
    picker.control.addEventListener('change', () => {
      if (picker.control.value === '') return;
      const [f, w] = JSON.parse(picker.control.value) as [string, string];
      app.navigate(routeTo('recharge', f, w));
    });
    root.append(h('div', { class: 'panel recharge-toolbar' }, h('div', { class: 'form-row' }, picker.wrap)));

    if (well === undefined) {
      root.append(params.length >= 2
        ? notice('warn', `There is no well “${params[1]}” in ${params[0]}. Choose one above.`)
        : notice('info', producers.length > 0 ? 'Choose a production well to compare its decline with its reservoir’s theory.' : 'The field log has no production well yet.'));
      if (producers.length > 0) {
        root.append(h('section', { class: 'panel', 'aria-labelledby': 'recharge-wells-title' },
          h('h2', { id: 'recharge-wells-title' }, 'Production wells'),
          h('ul', { class: 'recharge-well-list' }, producers.map((w) => h('li', {},
            h('a', { href: routeTo('recharge', w.field, w.name) }, w.name),
            h('span', { class: 'muted' }, ` — ${w.field}, ${w.reservoir === null ? 'no reservoir' : `reservoir ${w.reservoir}`}`))))));
      }
      root.append(cautionsBox());
      return;
    }

    const why = whyNoRecharge(well);
    if (why !== null) {
      root.append(notice('info', why, ' ', well.kind === 'production'
        ? h('a', { href: routeTo('reservoir') }, 'Go to the reservoir screen')
        : null), cautionsBox());
      return;
    }

    const body = h('div', { class: 'recharge-body' }, h('p', { class: 'muted', role: 'status' }, `Fitting ${well.name} and comparing it with its reservoir…`));
    root.append(body, cautionsBox());
    const settings = app.settings();
    let response: Wire<ForecastWellResponse>;
    let fitSource: string;
    try {
      const status = await app.client.fitStatus({ well: well.name, field: well.field }).catch(() => null);
      const request = forecastRequestOf(well, status, settings);
      fitSource = status?.latest != null
        ? `the stored fit of ${app.display().dateTime(status.latest.createdAt)} (model ${status.latest.model}, ${status.latest.basis} basis${windowText(status.latest.window)})${status.stale === true ? ' — its readings have changed since, so this is a refit' : ''}`
        : 'no stored fit: the automatic model choice (lowest AICc) on the time basis, all readings';
      response = await app.client.forecastWell(request);
    } catch (e) {
      if (mine !== generation) return;
      replace(body, notice('error', `No recharge comparison for ${well.name}: ${e instanceof InputError || e instanceof CallError || e instanceof Error ? e.message : String(e)}`));
      return;
    }
    if (mine !== generation) return;
    const zone = listing.fields.find((f) => f.name === well.field)?.timeZone;
    const view = rechargeView(response, settings, app.display(zone).units);
    if (view === null) {
      replace(body, notice('info', `${well.name}’s reservoir “${well.reservoir ?? ''}” has no parameter version yet, so there is no theoretical time constant to compare with. `,
        h('a', { href: routeTo('reservoir', well.field, well.reservoir ?? '') }, `Enter its parameters on the reservoir screen`), '.'));
      return;
    }
    replace(body, ...drawView(app, well, response, view, fitSource, zone));
    const canvas = body.querySelector<HTMLCanvasElement>('canvas.recharge-tau-canvas');
    if (canvas !== null) chart = tauChart(canvas, view);
  },
  unmount() {
    generation += 1;
    chart?.destroy();
    chart = null;
  },
};

/** The well the route names: by field and name, else by name alone when that is unique. */
function findWell(wells: readonly WellInfo[], params: readonly string[]): WellInfo | undefined {
  if (params.length < 2) return undefined;
  const [f, name] = params;
  const exact = wells.find((w) => w.field === f && w.name === name);
  if (exact !== undefined) return exact;
  const byName = wells.filter((w) => w.name === name);
  return byName.length === 1 ? byName[0] : undefined;
}

function windowText(w: { from: string | null; to: string | null }): string {
  if (w.from === null && w.to === null) return ', all readings';
  return `, readings ${w.from ?? 'from the start'} to ${w.to ?? 'the latest'}`;
}

const VERDICT_CLASS: Record<RechargeView['verdict'], string> = {
  recharge: 'recharge-verdict-recharge',
  'consistent-with-none': 'recharge-verdict-none',
  'faster-than-theory': 'recharge-verdict-faster',
  'no-fit': 'recharge-verdict-none',
};

function drawView(app: AppContext, well: WellInfo, response: Wire<ForecastWellResponse>, view: RechargeView, fitSource: string, zone: string | undefined): HTMLElement[] {
  const display = app.display(zone);
  const res = view.reservoir;
  const fitted = response.fit.fit;
  const flow = (kgPerS: number | null): string => display.format('massFlow', kgPerS);
  const verdict = h('section', { class: `recharge-verdict ${VERDICT_CLASS[view.verdict]}`, 'aria-label': 'Recharge verdict' },
    h('h2', {}, view.headline),
    h('p', { class: 'recharge-interpretation' }, view.interpretation),
    view.message !== '' ? h('p', { class: 'recharge-message' }, view.message) : null);

  const facts = h('div', { class: 'facts recharge-facts' },
    fact('Fitted time constant τfit', view.tauFit.value, view.tauFit.interval),
    fact('Theoretical time constant τtheory', view.tauTheory, `at the fit window’s mean flow ${flow(res.meanMassFlowKgPerS)}`),
    fact('Ratio R = τfit/τtheory', view.ratio.value, view.ratio.interval, 'fact-key'),
    fact('Recharge fraction f', view.fraction.value, [view.fraction.interval, view.fractionNote !== '' ? h('div', {}, view.fractionNote) : null], 'fact-key'));

  const heat = h('section', { class: 'panel recharge-heat', 'aria-labelledby': 'recharge-heat-title' },
    h('h2', { id: 'recharge-heat-title' }, 'Recharge heat flow against the background heat flow'),
    h('div', { class: 'facts' },
      fact('Recharge heat flow Qr now', view.rechargeHeatFlow.value, view.rechargeHeatFlow.interval),
      fact('Background heat flow through the footprint qb·A', view.backgroundHeatFlow,
        `${view.background.short} over ${res.areaM2 === null ? '—' : `${(res.areaM2 / 1e6).toPrecision(3)} km²`}`)),
    h('p', {}, view.comparedWithBackground),
    h('p', { class: 'muted' }, 'Qr = ṁ·cw·θfit + C·dθfit/dt, the heat the decline implies is flowing in now. Conduction from below brings only qb·A; a larger Qr needs heat or fluid coming in from the sides.'));

  const chartPanel = h('section', { class: 'panel recharge-chart', 'aria-labelledby': 'recharge-chart-title' },
    h('h2', { id: 'recharge-chart-title' }, 'τ fitted against τ theory'),
    h('div', { class: 'chart-box recharge-tau-box' },
      h('canvas', { class: 'recharge-tau-canvas', role: 'img', 'aria-label': `Fitted time constant ${view.tauFit.value} (${view.tauFit.interval}) against the theoretical ${view.tauTheory}` })),
    h('p', { class: 'muted' }, 'The bar is the 95 % interval of the fitted τ; the theory has no interval of its own — it follows from the parameters, which carry their own uncertainty.'));

  const basis = h('section', { class: 'panel recharge-basis', 'aria-labelledby': 'recharge-basis-title' },
    h('h2', { id: 'recharge-basis-title' }, 'What this rests on'),
    h('dl', { class: 'recharge-terms' },
      h('dt', {}, 'Reservoir parameters'),
      h('dd', {},
        h('a', { href: routeTo('reservoir', res.field, res.name, String(res.version)) }, `${res.name}, version ${res.version}`),
        ` — recorded ${display.dateTime(res.recordedAt)} by ${res.recordedBy}${res.note !== '' ? `: “${res.note}”` : ''}. `,
        `Its own τ is ${res.tauAtOwnFlow} at ${flow(res.ownMassFlowKgPerS)}.`),
      h('dt', {}, 'Background heat flow qb'),
      h('dd', {}, view.background.text),
      h('dt', {}, 'Decline fit'),
      h('dd', {}, `${fitted.model} model on the ${fitted.basis} basis, from ${fitSource}.`),
      h('dt', {}, 'Economic limit'),
      h('dd', {}, response.limit.text)),
    response.assumptions.length > 0
      ? h('details', {}, h('summary', {}, 'Every assumption of the forecast'), h('ul', {}, response.assumptions.map((a) => h('li', {}, a))))
      : null,
    h('p', {}, h('a', { href: routeTo('decline', well.field, well.name) }, `The decline of ${well.name}`)));

  return [verdict, facts, h('div', { class: 'grid-2' }, chartPanel, heat), basis];
}
