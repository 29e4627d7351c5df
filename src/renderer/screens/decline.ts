/**
 * Well decline: a well's readings against time or produced mass, the decline fitted over a window,
 * its forecast to the economic limit with the P10–P90 band, the residuals, every candidate model and
 * the stored fit's status.   #/decline/<field>/<well>   (#/decline alone: pick a well)
 *
 * Order of calls, so a long log shows quickly: the readings (chartSeries, packed) are drawn first; then the
 * stored fit's status (its model, basis and window become the initial choices); then the forecast
 * (forecastWell, which carries the fit); fitWell alone when the forecast is refused for a reason of
 * its own (the limit, the planned flow). Every call after a change of choice is generation-counted,
 * so a late answer to an old choice is dropped.
 */
import { reportActions } from '../app/report-action.js';
import '../styles/decline.css';
import type { Wire } from '../../shared/contract/channels.js';
import type { FitStatusResponse, FitWellRequest, FitWellResponse, ForecastLimit, ForecastWellResponse, ModelChoice } from '../../shared/contract/fits.js';
import { MODEL_CHOICES } from '../../shared/contract/fits.js';
import type { FieldInfo, WellInfo } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import type { Basis } from '../../shared/fit/types.js';
import { cautionsBox } from '../app/cautions.js';
import type { AppContext, Screen } from '../app/context.js';
import type { Display } from '../app/display.js';
import { field, h, notice, replace, select } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import { DeclineCharts } from '../charts/decline-chart.js';
import { decodeChartSeries, type DecodedSeries } from '../charts/packed-series.js';
import { latestIncluded, massUnit, yMap, type XAxis, type YMap, type YQuantity } from '../charts/decline-data.js';
import type { WindowMs } from '../charts/decline-model.js';
import { buildOverlay, EMPTY_OVERLAY, MODEL_WORDS, readingsView, type OverlayView } from '../charts/decline-overlay.js';
import { chartRangeOfWindow, isoOfMs, readingMs, windowDates, windowOfChartRange, windowOfDates } from '../charts/decline-window.js';
import { setChartTimeZone } from '../charts/setup.js';
import { assumptionsBox, candidateTable, factCards, statusLine } from './decline-parts.js';
import { facts, MODEL_LABELS } from './decline-rows.js';
import { pickWell } from './decline-picker.js';

/** Set once the fit and forecast of the current choices are on screen (for the benchmark). */
export const MARK_FIT_SHOWN = 'tauwell:decline:fit-shown';

type Series = DecodedSeries;
type FitResponse = Wire<FitWellResponse>;
type ForecastResponse = Wire<ForecastWellResponse>;

interface Choices {
  quantity: YQuantity;
  basis: Basis;
  model: ModelChoice;
  window: WindowMs;
}

/** Request fields that belong to the forecast alone: a refusal there still leaves a fit to show. */
const FORECAST_FIELDS = ['limit', 'plannedFlowKgPerS', 'specificHeatJPerKgK', 'horizonYears', 'backgroundHeatFlowWPerM2', 'samples', 'seed'];

let current: DeclineView | null = null;

export const declineScreen: Screen = {
  title: 'Decline',
  async mount(root, params, app) {
    if (params.length < 2) {
      await pickWell(root, app);
      return;
    }
    current = new DeclineView(root, params[0], params[1], app);
    await current.start();
  },
  unmount() {
    current?.dispose();
    current = null;
  },
};

class DeclineView {
  private display!: Display;
  private well!: WellInfo;
  private fieldInfo!: FieldInfo;
  private readonly series = new Map<Basis, Series>();
  private choices: Choices = { quantity: 'temperature', basis: 'time', model: 'auto', window: { fromMs: null, toMs: null } };
  private fit: FitResponse | null = null;
  private forecast: ForecastResponse | null = null;
  private forecastProblem: string | null = null;
  private status: Wire<FitStatusResponse> | null = null;
  /** 'opening': the status read before this screen's own fits (which the back end stores too). */
  private statusWhen: 'opening' | 'refit' = 'opening';
  private charts: DeclineCharts | null = null;
  private fitGen = 0;
  /** Readings of the whole record the fit would use and leave out (from the last drawn series). */
  private recordCounts = { included: 0, excluded: 0 };
  private disposed = false;

  // The parts of the page that change.
  private readonly section = h('section', { class: 'decline', 'data-busy': 'true' });
  private readonly factsBox = h('div', { class: 'facts decline-facts' });
  private readonly statusBox = h('div', { class: 'decline-status' });
  private readonly fitMessage = h('div', { class: 'decline-fit-message', role: 'status', 'aria-live': 'polite' });
  private readonly tableBox = h('div', { class: 'decline-table' });
  private readonly notesBox = h('div', { class: 'decline-notes' });
  private readonly chartNote = h('p', { class: 'decline-chart-note muted' });
  private readonly theoryNote = h('p', { class: 'decline-chart-note muted' });
  private readonly canvas = h('canvas', { role: 'img' });
  private readonly legend = h('div', { class: 'decline-legend', role: 'group', 'aria-label': 'Chart legend: press an entry to show or hide it' });
  private readonly quantity = field('Show', select([['temperature', 'Production temperature'], ['theta', 'θ = T − Tref']], 'temperature'));
  private readonly basis = field('Against', select([['time', 'Time'], ['mass', 'Cumulative produced mass']], 'time'));
  private readonly model = field('Model', select((['auto', 'exponential', 'floor', 'hyperbolic'] as const).map((m) => [m, MODEL_LABELS[m]] as const), 'auto'));
  private readonly from = field('Fit window from', h('input', { type: 'date' }), 'first day in the fit');
  private readonly to = field('Fit window to', h('input', { type: 'date' }), 'last day in the fit');
  private readonly chooseButton = h('button', { type: 'button', 'aria-pressed': 'false' }, 'Choose window');
  private readonly refitButton = h('button', { type: 'button', class: 'primary' }, 'Refit');

  constructor(private readonly root: HTMLElement, private readonly fieldName: string, private readonly wellName: string, private readonly app: AppContext) {}

  dispose(): void {
    this.disposed = true;
    this.fitGen++;
    this.charts?.destroy();
    this.charts = null;
  }

  async start(): Promise<void> {
    const client = this.app.client;
    this.root.append(this.section);
    replace(this.section, h('h1', {}, `Decline · ${this.wellName}`), h('p', { class: 'lede' }, 'Loading the readings…'));
    let got;
    try {
      got = await client.getWell({ well: this.wellName, field: this.fieldName });
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      replace(this.section, h('h1', {}, 'Decline'), notice('error', `${e.reason}. `, h('a', { href: routeTo('decline') }, 'Choose a well'), '.'));
      this.section.dataset.busy = 'false';
      return;
    }
    if (this.disposed) return;
    this.well = got.well;
    this.fieldInfo = got.field;
    this.display = this.app.display(got.field.timeZone);
    setChartTimeZone(this.display.timeZone);
    if (got.well.kind === 'injection') {
      replace(this.section, h('h1', {}, `Decline · ${this.wellName}`),
        notice('info', `${this.wellName} is an injection well: decline fits are made of production wells. Its readings are in the `,
          h('a', { href: routeTo('log', this.fieldName, this.wellName) }, 'Log book'), '; ', h('a', { href: routeTo('decline') }, 'choose another well'), '.'));
      this.section.dataset.busy = 'false';
      return;
    }

    const series = decodeChartSeries(await client.chartSeries({ well: this.wellName, field: this.fieldName, basis: 'time' }));
    if (this.disposed) return;
    this.series.set('time', series);
    this.layout(series);
    if (series.count === 0) {
      this.fitMessage.replaceChildren(notice('info', `${this.wellName} has no readings yet. Log some in the `, h('a', { href: routeTo('log', this.fieldName, this.wellName) }, 'Log book'), '.'));
      this.section.dataset.busy = 'false';
      return;
    }
    this.drawReadings();
    if (series.referenceTemperatureC === null) {
      this.section.dataset.busy = 'false';
      return;
    }

    // The stored fit's choices come second: reading its status costs a pass over the data.
    this.status = await client.fitStatus({ well: this.wellName, field: this.fieldName }).catch(() => null);
    if (this.disposed) return;
    this.renderStatus();
    const latest = this.status?.latest ?? null;
    if (latest !== null) {
      const model = (MODEL_CHOICES as readonly string[]).includes(latest.model) ? (latest.model as ModelChoice) : 'auto';
      const window = { fromMs: latest.window.from === null ? null : Date.parse(latest.window.from), toMs: latest.window.to === null ? null : Date.parse(latest.window.to) };
      this.choices = { ...this.choices, model, basis: latest.basis, window };
      this.model.control.value = model;
      this.showWindowInputs();
      if (latest.basis !== 'time' && !(await this.loadSeries(latest.basis))) this.choices.basis = 'time';
      if (this.disposed) return;
      this.basis.control.value = this.choices.basis;
      if (this.choices.basis !== 'time') this.drawReadings();
      else this.charts?.setWindow(this.windowRange());
    }
    await this.runFit();
  }

  // ---- layout ----

  private layout(series: Series): void {
    const well = this.well;
    const tref = series.referenceTemperatureC;
    const origin = series.timeOrigin;
    const lede = [
      `${this.fieldInfo.name}`,
      tref === null ? 'no Tref set' : `Tref ${this.display.formatCelsius(tref)}`,
      origin === null ? null : `time zero ${this.display.date(origin)}${well.productionStart === null ? ' (first reading)' : ' (production start)'}`,
      `${series.count.toLocaleString('en-US')} readings`,
    ].filter((s) => s !== null).join(' · ');

    const quantityControl = this.quantity.control;
    if (tref === null) (quantityControl.querySelector('option[value="theta"]') as HTMLOptionElement | null)?.setAttribute('disabled', '');
    quantityControl.addEventListener('change', () => {
      this.choices.quantity = quantityControl.value as YQuantity;
      this.drawReadings();
    });
    this.basis.control.addEventListener('change', () => void this.changeBasis(this.basis.control.value as Basis));
    this.model.control.addEventListener('change', () => {
      this.choices.model = this.model.control.value as ModelChoice;
      this.model.setError(null);
      void this.runFit();
    });
    for (const input of [this.from, this.to]) input.control.addEventListener('change', () => this.windowFromInputs());
    this.chooseButton.addEventListener('click', () => this.setChooseMode(this.chooseButton.getAttribute('aria-pressed') !== 'true'));
    this.refitButton.addEventListener('click', () => void this.refit(this.refitButton));

    const links = h('nav', { class: 'decline-links', 'aria-label': 'This well elsewhere' },
      h('a', { href: routeTo('log', this.fieldName, this.wellName) }, 'Log book'),
      h('a', { href: routeTo('recharge', this.fieldName, this.wellName) }, 'Recharge'),
      h('a', { href: routeTo('decline') }, 'Other wells'));
    this.canvas.setAttribute('aria-label', `Readings of ${this.wellName} with the fitted decline, the forecast band and the economic limit, and beneath them the residuals (observed minus fitted); the numbers are in the facts and the table below`);

    replace(this.section,
      h('div', { class: 'decline-head' }, h('div', {}, h('h1', {}, `Decline · ${this.wellName}`), h('p', { class: 'lede' }, lede)), links),
      reportActions(this.app, { well: this.wellName, field: this.fieldName }),
      tref === null ? notice('warn', `${this.wellName} has no reference temperature Tref, so θ = T − Tref and the fit cannot be computed. Set it with the well's details.`) : null,
      h('div', { class: 'panel decline-controls', role: 'group', 'aria-label': 'What the chart shows and fits' },
        h('div', { class: 'form-row' }, this.quantity.wrap, this.basis.wrap, this.model.wrap, this.from.wrap, this.to.wrap),
        h('div', { class: 'actions' },
          this.chooseButton,
          h('button', { type: 'button', onclick: () => this.applyWindow({ fromMs: null, toMs: null }) }, 'Whole record'),
          h('button', { type: 'button', onclick: () => this.charts?.resetZoom() }, 'Reset zoom'),
          h('span', { class: 'field-hint decline-hint' }, 'Wheel: zoom · drag: pan · Shift+drag (or Choose window, then drag): fit window · the date fields set it from the keyboard'))),
      this.statusBox,
      this.fitMessage,
      this.factsBox,
      h('div', { class: 'chart-box decline-main' }, this.legend, h('div', { class: 'decline-canvas' }, this.canvas)),
      this.chartNote,
      this.theoryNote,
      h('h2', {}, 'Candidate models'),
      this.tableBox,
      this.notesBox,
      cautionsBox());
    this.charts = new DeclineCharts(this.canvas, this.legend, { onWindowDrag: (a, b) => this.windowFromDrag(a, b) });
  }

  // ---- readings and overlay ----

  private axis(basis: Basis = this.choices.basis): XAxis {
    if (basis === 'mass') return { basis: 'mass', ...massUnit(this.display.units) };
    const s = this.series.get('time');
    const origin = s?.timeOrigin ?? null;
    return { basis: 'time', originMs: origin === null ? (s?.epochMs ?? 0) : Date.parse(origin) };
  }

  private yMap(): YMap {
    const trefC = this.series.get(this.choices.basis)?.referenceTemperatureC ?? null;
    return yMap(this.display, this.choices.quantity, trefC);
  }

  private current(): Series | undefined {
    return this.series.get(this.choices.basis);
  }

  private drawReadings(): void {
    const series = this.current();
    if (series === undefined || this.charts === null) return;
    const axis = this.axis();
    const { view, datasets: d } = readingsView(series, axis, this.yMap(), this.display);
    this.charts.setReadings(view, this.overlay(), this.windowRange());
    this.recordCounts = { included: d.includedCount, excluded: d.excludedCount };
    this.renderFacts();
    this.chartNote.textContent = d.notDrawn > 0
      ? `${d.notDrawn.toLocaleString('en-US')} readings are not drawn (no production temperature${axis.basis === 'mass' ? ', or before time zero' : ''}).`
      : '';
  }

  /** The curves of the current fit and forecast in chart coordinates. */
  private overlay(): OverlayView {
    const series = this.current();
    const fit = this.fit;
    if (series === undefined || fit === null || fit.basis !== this.choices.basis) return EMPTY_OVERLAY;
    return buildOverlay({ series: series, axis: this.axis(), map: this.yMap(), display: this.display, fit, forecast: this.forecast, limit: this.limit() });
  }

  private drawOverlay(): void {
    const overlay = this.overlay();
    this.charts?.setOverlay(overlay);
    this.theoryNote.textContent = overlay.theory.length === 0 ? '' : this.choices.basis === 'time'
      ? 'The theoretical curve starts at the fitted θ0 and falls with the τ the reservoir parameters give at the mean flow of the fit window.'
      : 'The theoretical curve starts at the fitted θ0 and falls with the characteristic mass Mc = C/cw of the reservoir parameters.';
  }

  // ---- the window ----

  private windowRange(): [number, number] | null {
    const w = this.choices.window;
    const series = this.current();
    if ((w.fromMs === null && w.toMs === null) || series === undefined) return null;
    return chartRangeOfWindow(series, this.axis(), w);
  }

  private showWindowInputs(): void {
    const dates = windowDates(this.choices.window, this.display.timeZone);
    this.from.control.value = dates.from;
    this.to.control.value = dates.to;
    this.from.setError(null);
    this.to.setError(null);
  }

  private windowFromInputs(): void {
    // A date typed only in part reads as '' (an open end); say so rather than open the window.
    for (const f of [this.from, this.to]) {
      if (f.control.validity.badInput) {
        f.setError('incomplete date');
        return;
      }
    }
    const r = windowOfDates(this.from.control.value, this.to.control.value, this.display.timeZone);
    if ('error' in r) {
      (r.field === 'from' ? this.from : this.to).setError(r.error);
      return;
    }
    this.applyWindow(r.window, false);
  }

  private windowFromDrag(a: number, b: number): void {
    const series = this.current();
    if (series === undefined) return;
    const w = windowOfChartRange(series, this.axis(), a, b);
    this.setChooseMode(false);
    if (w === null) {
      this.app.tell('warn', 'No reading lies in the span you dragged; the fit window is unchanged.');
      this.charts?.setWindow(this.windowRange());
      return;
    }
    this.applyWindow(w);
  }

  /** The shading is redrawn at once; the refit waits for the next frame so the redraw shows first. */
  private applyWindow(w: WindowMs, updateInputs = true): void {
    this.choices.window = w;
    if (updateInputs) this.showWindowInputs();
    else {
      this.from.setError(null);
      this.to.setError(null);
    }
    this.charts?.setWindow(this.windowRange());
    afterPaint(() => void this.runFit());
  }

  private setChooseMode(on: boolean): void {
    this.chooseButton.setAttribute('aria-pressed', String(on));
    this.chooseButton.classList.toggle('active', on);
    this.charts?.setChooseMode(on);
  }

  private async changeBasis(basis: Basis): Promise<void> {
    this.basis.setError(null);
    if (!(await this.loadSeries(basis))) {
      this.basis.control.value = this.choices.basis;
      return;
    }
    this.choices.basis = basis;
    this.drawReadings();
    await this.runFit();
  }

  /** The series on `basis`, fetched once; false (with the reason beside the control) when refused. */
  private async loadSeries(basis: Basis): Promise<boolean> {
    if (this.series.has(basis)) return true;
    this.fitMessage.replaceChildren(h('p', { class: 'muted' }, 'Loading the readings on that basis…'));
    try {
      const s = decodeChartSeries(await this.app.client.chartSeries({ well: this.wellName, field: this.fieldName, basis }));
      if (this.disposed) return false;
      this.series.set(basis, s);
      this.fitMessage.replaceChildren();
      return true;
    } catch (e) {
      this.fitMessage.replaceChildren();
      this.basis.setError(e instanceof InputError ? e.reason : e instanceof Error ? e.message : String(e));
      return false;
    }
  }

  // ---- fits ----

  private limit(): ForecastLimit {
    const s = this.app.settings();
    return (s.wellEconomicLimits?.[String(this.well.id)] as ForecastLimit | undefined) ?? (s.economicLimit as ForecastLimit);
  }

  /** Why no fit can be made (no Tref), or null. */
  private fitProblem(): string | null {
    return this.current()?.referenceTemperatureC === null ? 'no Tref set for this well' : null;
  }

  private fitRequest(): FitWellRequest {
    const c = this.choices;
    const request: FitWellRequest = { well: this.wellName, field: this.fieldName, model: c.model, basis: c.basis, points: false, residuals: false };
    if (c.window.fromMs !== null) request.from = isoOfMs(c.window.fromMs);
    if (c.window.toMs !== null) request.to = isoOfMs(c.window.toMs);
    return request;
  }

  private async runFit(): Promise<void> {
    if (this.fitProblem() !== null || this.disposed) {
      this.section.dataset.busy = 'false';
      return;
    }
    const gen = ++this.fitGen;
    const client = this.app.client;
    const settings = this.app.settings();
    const request = this.fitRequest();
    this.section.dataset.busy = 'true';
    this.fitMessage.replaceChildren(h('p', { class: 'muted decline-busy' }, 'Fitting the window and forecasting…'));
    let fit: FitResponse | null = null;
    let forecast: ForecastResponse | null = null;
    let problem: string | null = null;
    let failure: unknown = null;
    try {
      forecast = await client.forecastWell({ ...request, limit: this.limit(), horizonYears: settings.horizonYears, backgroundHeatFlowWPerM2: settings.backgroundHeatFlowWPerM2 });
      fit = forecast.fit;
    } catch (e) {
      if (gen !== this.fitGen) return;
      const where = e instanceof InputError ? (e.where.field ?? '') : '';
      if (e instanceof InputError && FORECAST_FIELDS.some((f) => where === f || where.startsWith(`${f}.`))) {
        problem = `No forecast: ${e.reason}`;
        try {
          fit = await client.fitWell(request);
        } catch (e2) {
          failure = e2;
        }
      } else failure = e;
    }
    if (gen !== this.fitGen) return;
    this.fit = fit;
    this.forecast = forecast;
    this.forecastProblem = problem;
    this.fitMessage.replaceChildren();
    if (failure !== null) this.showFitFailure(failure);
    else if (fit !== null && fit.fit.status !== 'converged') {
      this.fitMessage.append(notice('warn', `The ${MODEL_WORDS[fit.fit.model]} fit did not converge (${fit.fit.status})${fit.fit.message === '' ? '' : `: ${fit.fit.message}`}`));
    }
    this.drawOverlay();
    this.renderFacts();
    this.renderTable();
    this.renderNotes();
    this.renderStatus();
    this.section.dataset.busy = 'false';
    performance.mark(MARK_FIT_SHOWN);
  }

  private showFitFailure(e: unknown): void {
    if (e instanceof InputError) {
      const f = e.where.field;
      // Beside the control it names, and above the chart where the fit would be.
      const control = f === 'from' ? this.from : f === 'to' ? this.to : f === 'model' ? this.model : f === 'basis' ? this.basis : null;
      control?.setError(e.reason);
      this.fitMessage.append(notice('error', `No fit: ${e.reason}`));
      return;
    }
    this.fitMessage.append(notice('error', `The fit could not be made: ${e instanceof Error ? e.message : String(e)}`));
  }

  /** Refit: fitWell with the current choices (which stores a new fit), then the stored fit's status again. */
  private async refit(button: HTMLButtonElement): Promise<void> {
    button.disabled = true;
    const gen = ++this.fitGen;
    this.section.dataset.busy = 'true';
    try {
      const fit = await this.app.client.fitWell(this.fitRequest());
      if (gen === this.fitGen) {
        this.fit = fit;
        this.drawOverlay();
        this.renderFacts();
        this.renderTable();
      }
      this.status = await this.app.client.fitStatus({ well: this.wellName, field: this.fieldName });
      this.statusWhen = 'refit';
      if (this.disposed) return;
      this.app.tell('ok', `Stored a new fit of ${this.wellName} (${MODEL_LABELS[fit.model]}).`);
    } catch (e) {
      if (this.disposed) return;
      this.app.tell('error', `Refit failed: ${e instanceof InputError ? e.reason : e instanceof Error ? e.message : String(e)}`);
    } finally {
      button.disabled = false;
      if (!this.disposed) {
        this.renderStatus();
        if (gen === this.fitGen) this.section.dataset.busy = 'false';
      }
    }
  }

  // ---- words ----

  private renderStatus(): void {
    replace(this.statusBox, statusLine({ status: this.status, when: this.statusWhen, shownFitId: this.fit?.stored.fitId ?? null, display: this.display, refit: this.refitButton }));
  }

  private renderFacts(): void {
    const series = this.current();
    const i = series === undefined ? -1 : latestIncluded(series);
    const now = series === undefined || i < 0 ? null : { ms: readingMs(series, i), celsius: series.productionTemperatureC[i] as number };
    replace(this.factsBox, factCards(facts({
      display: this.display,
      trefC: series?.referenceTemperatureC ?? this.well.referenceTemperatureC,
      now,
      recordCounts: this.recordCounts,
      fit: this.fit,
      forecast: this.forecast,
      forecastProblem: this.fitProblem() ?? this.forecastProblem,
      fitProblem: this.fitProblem(),
    })));
  }

  private renderTable(): void {
    if (this.fit === null) replace(this.tableBox, h('p', { class: 'muted' }, 'No fit to show.'));
    else replace(this.tableBox, candidateTable(this.fit, this.display));
  }

  private renderNotes(): void {
    const lines = [...(this.forecast?.assumptions ?? this.fit?.assumptions ?? []), ...(this.forecast?.forecast.notes ?? [])];
    const interpretation = this.forecast?.recharge?.interpretation;
    if (interpretation !== undefined && interpretation !== '') lines.push(interpretation);
    replace(this.notesBox, assumptionsBox(lines));
  }
}

/** Runs `f` once the next frame has been painted (a task queued from the frame callback runs after it). */
function afterPaint(f: () => void): void {
  requestAnimationFrame(() => window.setTimeout(f, 0));
}
