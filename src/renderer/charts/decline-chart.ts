/**
 * The decline chart with its residuals panel beneath: readings (included and excluded apart), the
 * fitted curve over the window, the P10–P90 band and P50 line of the forecast, the economic limit
 * and the theoretical decline above; observed − fitted below. Wheel zoom and drag pan
 * (chartjs-plugin-zoom), and the fit window as a shaded span chosen by Shift+drag (or drag while
 * "choose window" is on).
 *
 * The residuals are a second y scale stacked under the first in the same chart (chart.js stacked
 * scales), not a second chart: both panels then share one x scale, so a zoom or pan moves both
 * with one layout and one draw — half the work of keeping two charts in step.
 *
 * Built for a million readings: one {x, y} array per dataset made once (decline-data.ts), parsing
 * off, `normalized`, min-max decimation of what is visible, no animation, point radius 0 when the
 * readings are decimated, curves on a few hundred grid points. A window change redraws the shading
 * only (chart.draw(), no update); the refit that follows is the screen's business.
 *
 * Timing marks for the benchmark (bench/decline-chart.mjs):
 *   tauwell:decline:chart-drawn  once, when the main chart first draws with its readings
 *   tauwell:decline:redrawn      after each redraw caused by zoom, pan or a window change
 */
import type { ChartDataset, Plugin, TooltipItem } from 'chart.js';
import { Chart, COLOURS } from './setup.js';
import { levelFor, minMaxLevels, visibleCount, type Point } from './decline-data.js';
import { EMPTY_OVERLAY, type OverlayView, type ReadingsView } from './decline-overlay.js';
import { fastPointsPlugin, limitLabelPlugin, noReplayPlugin, residualPanelPlugin, windowShadePlugin } from './decline-plugins.js';

export const MARK_CHART_DRAWN = 'tauwell:decline:chart-drawn';
export const MARK_REDRAWN = 'tauwell:decline:redrawn';

/** Both panels reserve this width for their y axis, so they line up. */
const Y_AXIS_WIDTH = 68;

// The data types live with their pure builders; re-exported for the chart's users.
export { EMPTY_OVERLAY, type OverlayView, type ReadingsView } from './decline-overlay.js';

export interface ChartHandlers {
  /** A drag chose the window from chart x `a` to `b` (the shading is already drawn). */
  onWindowDrag(a: number, b: number): void;
}

// Dataset indices; the band's upper line fills down to the line before it.
const READINGS = 0;
const EXCLUDED = 1;
const BAND_LOW = 2;
const BAND_HIGH = 3;
const P50 = 4;
const FIT = 5;
const LIMIT = 6;
const THEORY = 7;
const RESIDUALS = 8;
const P90_LABEL = 'P90';

type LineChart = Chart<'line', Point[]>;

export class DeclineCharts {
  private chart: LineChart | null = null;
  private view: ReadingsView | null = null;
  private window: [number, number] | null = null;
  private drag: { from: number; to: number; pointerId: number } | null = null;
  private chooseMode = false;
  private drawnMarked = false;
  private limitLabel: { y: number; label: string } | null = null;
  /** minMaxLevels of the readings (dataset 0) and of the residuals; the chart holds one level of each. */
  private readonly levels = new Map<number, Point[][]>();
  private levelTimer = 0;
  private readonly cleanup: (() => void)[] = [];

  /**
   * `legendBox` receives the legend as HTML buttons (each shows or hides its dataset): readable
   * text, reachable by keyboard, and no legend layout inside every redraw of the canvas.
   */
  constructor(private readonly canvas: HTMLCanvasElement, private readonly legendBox: HTMLElement, private readonly handlers: ChartHandlers) {
    const listeners: [string, (e: PointerEvent) => void][] = [
      ['pointerdown', (e) => this.pointerDown(e)],
      ['pointermove', (e) => this.pointerMove(e)],
      ['pointerup', (e) => this.pointerUp(e)],
      ['pointercancel', (e) => this.pointerUp(e)],
    ];
    for (const [type, f] of listeners) canvas.addEventListener(type, f as EventListener);
    this.cleanup.push(() => { for (const [type, f] of listeners) canvas.removeEventListener(type, f as EventListener); });
  }

  /** (Re)draws the chart for a new axis, quantity or series, with the window's shading. */
  setReadings(view: ReadingsView, overlay: OverlayView = EMPTY_OVERLAY, window: [number, number] | null = null): void {
    this.chart?.destroy();
    this.view = view;
    this.window = window;
    this.limitLabel = overlay.limit;
    // Decimation starts above 4 points per pixel (chart.js's default threshold); then the readings are a line.
    const decimating = view.included.length > 4 * Math.max(300, this.canvas.parentElement?.clientWidth ?? 1000);
    this.levels.clear();
    globalThis.clearTimeout(this.levelTimer);
    this.chart = new Chart<'line', Point[]>(this.canvas, {
      type: 'line',
      data: { datasets: this.datasets(view, overlay, decimating) },
      options: this.options(view),
      plugins: [
        this.levelPlugin(),
        windowShadePlugin(() => (this.drag === null ? this.window : [this.drag.from, this.drag.to])),
        limitLabelPlugin(LIMIT, () => this.limitLabel),
        residualPanelPlugin('yResidual'),
        fastPointsPlugin([
          { index: EXCLUDED, scale: 'y', kind: 'cross', size: 3 },
          // Decimated residuals are drawn as a line through each pixel's lowest and highest (their
          // envelope); marks at those extremes alone would read as two bands of residuals.
          ...(decimating ? [] : [{ index: RESIDUALS, scale: 'yResidual', kind: 'square' as const, size: 3 }]),
        ]),
        noReplayPlugin,
        this.markPlugin(),
      ],
    });
    this.renderLegend();
    // The coarse levels are for zooming; building them can wait until the readings are on screen.
    this.levelTimer = globalThis.setTimeout(() => {
      this.levels.set(READINGS, minMaxLevels(view.included));
      if (!this.levels.has(RESIDUALS)) this.levels.set(RESIDUALS, minMaxLevels(overlay.residuals));
    }, 0);
  }

  /** New fit and forecast: the curves, band, limit, theory and residuals. */
  setOverlay(overlay: OverlayView): void {
    const chart = this.chart;
    if (chart === null || this.view === null) return;
    const sets = chart.data.datasets;
    const [x0, x1] = this.xExtent(overlay);
    sets[BAND_LOW].data = overlay.bandLow;
    sets[BAND_HIGH].data = overlay.bandHigh;
    sets[P50].data = overlay.p50;
    sets[FIT].data = overlay.fit;
    sets[FIT].label = overlay.fitLabel;
    sets[LIMIT].data = overlay.limit === null ? [] : [{ x: x0, y: overlay.limit.y }, { x: x1, y: overlay.limit.y }];
    sets[LIMIT].label = overlay.limit?.label ?? 'economic limit';
    sets[THEORY].data = overlay.theory;
    sets[THEORY].label = overlay.theoryLabel;
    this.levels.set(RESIDUALS, minMaxLevels(overlay.residuals));
    sets[RESIDUALS].data = overlay.residuals;
    this.limitLabel = overlay.limit;
    chart.update('none');
    this.renderLegend();
  }

  /** The fit window's shading in chart x, or null for none; redraws at once (no data update). */
  setWindow(range: [number, number] | null): void {
    this.window = range;
    this.chart?.draw();
    performance.mark(MARK_REDRAWN);
  }

  setChooseMode(on: boolean): void {
    this.chooseMode = on;
    this.canvas.classList.toggle('choosing-window', on);
  }

  resetZoom(): void {
    if (this.chart === null) return;
    this.chart.resetZoom('none');
    performance.mark(MARK_REDRAWN);
  }

  destroy(): void {
    globalThis.clearTimeout(this.levelTimer);
    for (const f of this.cleanup) f();
    this.chart?.destroy();
    this.chart = null;
  }

  // ---- datasets and options ----

  private datasets(view: ReadingsView, overlay: OverlayView, decimating: boolean): ChartDataset<'line', Point[]>[] {
    const [x0, x1] = this.xExtent(overlay, view);
    const line = (label: string, data: Point[], colour: string, extra: Partial<ChartDataset<'line', Point[]>> = {}): ChartDataset<'line', Point[]> => ({
      label, data, borderColor: colour, backgroundColor: colour, pointRadius: 0, pointHoverRadius: 0, borderWidth: 1.5, fill: false, yAxisID: 'y', ...extra,
    });
    return [
      line('readings', view.included, COLOURS.readings, decimating
        ? { borderWidth: 1, order: 3 }
        : { showLine: false, pointRadius: 2, pointHoverRadius: 4, order: 3 }),
      // Radius 0: fastPointsPlugin draws these marks, all in one path.
      line('excluded (not producing, flagged, …)', view.excluded, COLOURS.excluded, {
        showLine: false, pointRadius: 0, pointHoverRadius: 5, pointStyle: 'crossRot', borderWidth: 1.2, order: 4,
      }),
      line(P90_LABEL, overlay.bandLow, 'rgba(0,0,0,0)', { borderWidth: 0, order: 6 }),
      line('P10–P90 band', overlay.bandHigh, COLOURS.band, { borderWidth: 0, backgroundColor: COLOURS.band, fill: '-1', order: 6 }),
      line('P50 forecast', overlay.p50, COLOURS.fit, { borderDash: [6, 4], order: 1 }),
      line(overlay.fitLabel, overlay.fit, COLOURS.fit, { borderWidth: 2.5, order: 0 }),
      line(overlay.limit?.label ?? 'economic limit', overlay.limit === null ? [] : [{ x: x0, y: overlay.limit.y }, { x: x1, y: overlay.limit.y }], COLOURS.limit, { borderDash: [2, 3], order: 2 }),
      line(overlay.theoryLabel, overlay.theory, COLOURS.theory, { borderDash: [9, 3, 2, 3], order: 2 }),
      line('residual (observed − fitted)', overlay.residuals, COLOURS.residual, decimating
        ? { yAxisID: 'yResidual', borderWidth: 0.75, pointHoverRadius: 3, order: 5 }
        : { yAxisID: 'yResidual', showLine: false, pointRadius: 0, pointHoverRadius: 3, borderWidth: 0, order: 5 }),
    ];
  }

  /** From the first reading to the end of the forecast, for the limit line. */
  private xExtent(overlay: OverlayView, view: ReadingsView | null = this.view): [number, number] {
    let lo = Infinity;
    let hi = -Infinity;
    for (const arr of [view?.included ?? [], view?.excluded ?? [], overlay.fit, overlay.p50, overlay.bandHigh, overlay.theory]) {
      if (arr.length === 0) continue;
      lo = Math.min(lo, arr[0].x);
      hi = Math.max(hi, arr[arr.length - 1].x);
    }
    return Number.isFinite(lo) ? [lo, hi] : [0, 1];
  }

  private options(view: ReadingsView): NonNullable<LineChart['options']> {
    const x = view.axis.basis === 'time'
      ? { type: 'time' as const, ticks: { maxRotation: 0, autoSkipPadding: 16, sampleSize: 8 }, grid: { color: COLOURS.grid } }
      : { type: 'linear' as const, title: { display: true, text: view.xTitle }, ticks: { maxRotation: 0, sampleSize: 8 }, grid: { color: COLOURS.grid } };
    // The two panels meet: the upper one drops its lowest tick label, the lower one its highest.
    const yScale = (title: string, weight: number, dropLabel: 'first' | 'last') => ({
      type: 'linear' as const,
      axis: 'y' as const,
      position: 'left' as const,
      stack: 'decline',
      stackWeight: weight,
      title: { display: true, text: title, color: COLOURS.ink },
      grid: { color: COLOURS.grid },
      ticks: { sampleSize: 8 },
      afterFit: (scale: { width: number }) => { scale.width = Y_AXIS_WIDTH; },
      afterTickToLabelConversion: (scale: { ticks: { label?: string | string[] | null }[] }) => {
        const tick = dropLabel === 'first' ? scale.ticks[0] : scale.ticks[scale.ticks.length - 1];
        if (tick !== undefined && scale.ticks.length > 2) tick.label = '';
      },
    });
    const clearHover = ({ chart }: { chart: unknown }): boolean => {
      // Before a zoom or pan moves the points, drop the tooltip rather than leave it at a stale place.
      const c = chart as LineChart;
      c.tooltip?.setActiveElements([], { x: 0, y: 0 });
      c.setActiveElements([]);
      return true;
    };
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      parsing: false,
      normalized: true,
      spanGaps: true,
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      // Stacked scales are laid out bottom up in the order defined: the residuals go below.
      scales: { x, yResidual: yScale(view.residualTitle, 1, 'last'), y: yScale(view.yTitle, 3, 'first') },
      plugins: {
        decimation: { enabled: true, algorithm: 'min-max' },
        // The legend is HTML (renderLegend). false, which chart.js accepts for any plugin though its
        // types do not say so, keeps the legend plugin out of every update.
        legend: false as never,
        tooltip: {
          callbacks: {
            title: (items: TooltipItem<'line'>[]) => (items.length > 0 ? view.formatX(items[0].parsed.x ?? NaN) : ''),
            label: (item: TooltipItem<'line'>) => `${item.dataset.label ?? ''}: ${item.datasetIndex === RESIDUALS ? view.formatResidual(item.parsed.y ?? NaN) : view.formatY(item.parsed.y ?? NaN)}`,
          },
          filter: (item) => item.dataset.label !== P90_LABEL,
        },
        zoom: {
          limits: { x: { min: 'original', max: 'original' } },
          pan: {
            enabled: true, mode: 'x',
            onPanStart: (ctx) => !(this.chooseMode || (ctx.event.srcEvent as PointerEvent | undefined)?.shiftKey === true) && clearHover(ctx),
            onPan: () => performance.mark(MARK_REDRAWN),
          },
          zoom: {
            wheel: { enabled: true, speed: 0.15 },
            pinch: { enabled: true },
            mode: 'x',
            onZoomStart: clearHover,
            onZoom: () => performance.mark(MARK_REDRAWN),
          },
        },
      },
    };
  }

  /** One button per drawn dataset, in dataset order (readings first); the band's two lines are one entry. */
  private renderLegend(): void {
    const chart = this.chart;
    if (chart === null) return;
    const doc = this.legendBox.ownerDocument;
    const items: HTMLElement[] = [];
    chart.data.datasets.forEach((ds, i) => {
      if (i === BAND_LOW || ds.data.length === 0) return;
      const button = doc.createElement('button');
      button.type = 'button';
      button.className = 'legend-item';
      const visible = chart.isDatasetVisible(i);
      button.setAttribute('aria-pressed', String(visible));
      button.title = visible ? 'Shown: press to hide' : 'Hidden: press to show';
      const swatch = doc.createElement('span');
      const kind = i === BAND_HIGH ? 'band' : i === EXCLUDED ? 'cross' : i === RESIDUALS ? 'square' : ds.showLine === false ? 'dot'
        : Array.isArray(ds.borderDash) && ds.borderDash.length > 0 ? 'dashed' : 'line';
      swatch.className = `legend-swatch legend-${kind}`;
      swatch.style.color = String(i === BAND_HIGH ? COLOURS.fit : ds.borderColor);
      if (i === BAND_HIGH) swatch.style.backgroundColor = COLOURS.band;
      swatch.setAttribute('aria-hidden', 'true');
      button.append(swatch, doc.createTextNode(ds.label ?? ''));
      button.addEventListener('click', () => {
        const show = !chart.isDatasetVisible(i);
        chart.setDatasetVisibility(i, show);
        if (i === BAND_HIGH) chart.setDatasetVisibility(BAND_LOW, show);
        chart.update('none');
        this.renderLegend();
      });
      items.push(button);
    });
    this.legendBox.replaceChildren(...items);
  }

  /**
   * Before each update (a zoom, a pan, new data), hands chart.js the coarsest level of the long
   * series that still has ≥ 16 points per pixel over the visible span: its min-max decimation then
   * scans tens of thousands of points rather than a million, and draws the same extremes.
   */
  private levelPlugin(): Plugin<'line'> {
    return {
      id: 'declineLevels',
      beforeUpdate: (chart) => {
        const x = chart.options.scales?.x;
        const min = typeof x?.min === 'number' ? x.min : undefined;
        const max = typeof x?.max === 'number' ? x.max : undefined;
        for (const [index, levels] of this.levels) {
          if (levels.length <= 1) continue;
          const level = levels[levelFor(levels.length, visibleCount(levels[0], min, max), chart.width)];
          const ds = chart.data.datasets[index];
          // With decimation on, `data` reads the decimated copy and writes the source (chart.js decimation plugin).
          if ((ds as { _data?: Point[] })._data !== level) ds.data = level;
        }
      },
    };
  }

  private markPlugin(): Plugin<'line'> {
    return {
      id: 'declineMarks',
      afterDraw: () => {
        if (this.drawnMarked || this.view === null || this.view.included.length + this.view.excluded.length === 0) return;
        this.drawnMarked = true;
        performance.mark(MARK_CHART_DRAWN);
      },
    };
  }

  // ---- the window: shading and drag ----

  private chartX(e: PointerEvent): number | null {
    const chart = this.chart;
    if (chart === null) return null;
    const area = chart.chartArea;
    if (e.offsetX < area.left || e.offsetX > area.right || e.offsetY < area.top || e.offsetY > area.bottom) return null;
    return chart.scales.x.getValueForPixel(e.offsetX) ?? null;
  }

  private pointerDown(e: PointerEvent): void {
    if (!(e.shiftKey || this.chooseMode) || e.button !== 0) return;
    const x = this.chartX(e);
    if (x === null) return;
    e.preventDefault();
    this.drag = { from: x, to: x, pointerId: e.pointerId };
    this.canvas.setPointerCapture(e.pointerId);
  }

  private pointerMove(e: PointerEvent): void {
    if (this.drag === null || e.pointerId !== this.drag.pointerId || this.chart === null) return;
    const area = this.chart.chartArea;
    const px = Math.min(area.right, Math.max(area.left, e.offsetX));
    this.drag.to = this.chart.scales.x.getValueForPixel(px) ?? this.drag.to;
    this.chart.draw();
  }

  private pointerUp(e: PointerEvent): void {
    const drag = this.drag;
    if (drag === null || e.pointerId !== drag.pointerId) return;
    this.drag = null;
    if (this.canvas.hasPointerCapture(e.pointerId)) this.canvas.releasePointerCapture(e.pointerId);
    const chart = this.chart;
    // A click without a drag (under 3 px) chooses nothing.
    if (chart === null || Math.abs(chart.scales.x.getPixelForValue(drag.to) - chart.scales.x.getPixelForValue(drag.from)) < 3) {
      chart?.draw();
      return;
    }
    this.window = [Math.min(drag.from, drag.to), Math.max(drag.from, drag.to)];
    this.handlers.onWindowDrag(drag.from, drag.to);
  }
}
