/**
 * What the form's parameters give, recomputed on every keystroke with the shared theory (no round
 * trip): z1, T2, θ0, C, E0, τ and the initial power, each with its unit; and how τ responds to a
 * ±10 % change of each input, as a table and a horizontal bar chart sorted by influence.
 */
import { COLOURS, Chart } from '../charts/setup.js';
import type { Display } from '../app/display.js';
import { h, notice, replace } from '../app/dom.js';
import { JULIAN_YEAR_S } from '../../shared/units.js';
import { fact } from './reservoir-dom.js';
import { labelOfKey, shownStored, type Evaluation } from './reservoir-form.js';
import { relativeChange, tauSensitivity, type Sensitivity, type SensitivitySide } from './reservoir-sensitivity.js';
import { formatLinear, formatPower, heatCapacityUnit, lengthUnit, significant } from './reservoir-units.js';

export interface ResultsView {
  /** The live results. */
  element: HTMLElement;
  /** "How τ responds": table and chart. */
  sensitivityElement: HTMLElement;
  show(evaluation: Evaluation, context: string): void;
  destroy(): void;
}

const yr = (s: number | null, digits = 2): string => (s === null || !Number.isFinite(s) ? '—' : `${(s / JULIAN_YEAR_S).toFixed(digits)} yr`);

const signedPercent = (f: number | null): string => {
  if (f === null || !Number.isFinite(f)) return '—';
  const t = (100 * f).toFixed(1);
  return f > 0 ? `+${t} %` : t.startsWith('-') ? `−${t.slice(1)} %` : `${t} %`;
};

export function resultsView(display: Display): ResultsView {
  const caption = h('p', { class: 'muted reservoir-results-context' });
  const facts = h('div', { class: 'facts reservoir-facts' });
  const problem = h('div', {});
  const element = h('section', { class: 'panel reservoir-results', 'aria-label': 'Live results' },
    h('h2', {}, 'Results'), caption, problem, facts);

  const table = h('div', { class: 'reservoir-sensitivity-table' });
  const canvas = h('canvas', { role: 'img', 'aria-label': 'Change of τ for a 10 % decrease and a 10 % increase of each input, largest influence first' });
  const chartBox = h('div', { class: 'chart-box reservoir-tornado' }, canvas);
  const sensitivityElement = h('section', { class: 'panel reservoir-sensitivity', 'aria-labelledby': 'reservoir-sensitivity-title' },
    h('h2', { id: 'reservoir-sensitivity-title' }, 'How τ responds'),
    h('p', { class: 'muted' },
      'Each input moved to −10 % and +10 % of its value, all others held. The elasticity d ln τ / d ln x says by how many per cent τ changes ',
      'per per cent of the input: 1 is in proportion, −1 inversely. Temperatures are moved by 10 % of their value in °C and pressures of theirs in MPa, as the parameters store them.'),
    h('div', { class: 'reservoir-sensitivity-body' }, table, chartBox));
  let chart: Chart<'bar'> | null = null;

  function drawChart(s: Sensitivity): void {
    const rows = s.rows.filter((r) => r.elasticity !== null);
    const labels = rows.map((r) => labelOfKey(r.key));
    const minus = rows.map((r) => pctOrNull(relativeChange(r.minus, s.tauS)));
    const plus = rows.map((r) => pctOrNull(relativeChange(r.plus, s.tauS)));
    chartBox.style.height = `${Math.max(160, 46 + 30 * rows.length)}px`;
    if (chart === null) {
      chart = new Chart(canvas, {
        type: 'bar',
        data: {
          labels,
          datasets: [
            { label: 'input −10 %', data: minus, backgroundColor: COLOURS.readings, borderColor: COLOURS.readings, barPercentage: 0.9, categoryPercentage: 0.8 },
            { label: 'input +10 %', data: plus, backgroundColor: COLOURS.fit, borderColor: COLOURS.fit, barPercentage: 0.9, categoryPercentage: 0.8 },
          ],
        },
        options: {
          indexAxis: 'y',
          maintainAspectRatio: false,
          scales: {
            x: { title: { display: true, text: 'change of τ (%)' }, grid: { color: (c) => (c.tick.value === 0 ? COLOURS.ink : COLOURS.grid) } },
            y: { grid: { display: false } },
          },
          plugins: {
            legend: { position: 'bottom' },
            tooltip: { callbacks: { label: (c) => `${c.dataset.label ?? ''}: τ ${signedPercent((c.parsed.x ?? NaN) / 100)}` } },
          },
        },
      });
    } else {
      chart.data.labels = labels;
      chart.data.datasets[0].data = minus;
      chart.data.datasets[1].data = plus;
      chart.update('none');
    }
    chart.resize();
  }

  function drawTable(s: Sensitivity): void {
    const cell = (side: SensitivitySide): HTMLElement =>
      side.tauS === null
        ? h('td', { class: 'num', title: side.error ?? '' }, h('span', { class: 'muted' }, 'refused'), h('span', { class: 'visually-hidden' }, `: ${side.error ?? ''}`))
        : h('td', { class: 'num' }, yr(side.tauS), h('span', { class: 'muted' }, ` (${signedPercent(relativeChange(side, s.tauS))})`));
    replace(table, h('table', { class: 'data-table' },
      h('caption', {}, `τ = ${yr(s.tauS)} as entered`),
      h('thead', {}, h('tr', {},
        h('th', { scope: 'col' }, 'Input'),
        h('th', { scope: 'col', class: 'num' }, 'Value'),
        h('th', { scope: 'col', class: 'num' }, 'τ at −10 %'),
        h('th', { scope: 'col', class: 'num' }, 'τ at +10 %'),
        h('th', { scope: 'col', class: 'num', title: 'd ln τ / d ln x' }, 'Elasticity'))),
      h('tbody', {}, s.rows.map((r) => h('tr', {},
        h('th', { scope: 'row' }, labelOfKey(r.key)),
        h('td', { class: 'num' }, shownStored(r.key, r.base, display)),
        cell(r.minus),
        cell(r.plus),
        h('td', { class: 'num' }, r.elasticity === null ? (r.base === 0 ? 'zero input' : '—') : significant(r.elasticity, 3)))))));
  }

  function show(evaluation: Evaluation, context: string): void {
    caption.textContent = context;
    if (!evaluation.ok) {
      replace(problem, notice('warn', `No result until the inputs are complete: ${evaluation.error.message}`));
      replace(facts, ...placeholderFacts());
      replace(table, h('p', { class: 'muted' }, 'The table appears when the parameters give a time constant.'));
      chart?.destroy();
      chart = null;
      chartBox.hidden = true;
      return;
    }
    replace(problem);
    const t = evaluation.theory;
    const u = display.units;
    const fluidNote = `ρw ${significant(t.fluid.densityKgPerM3, 4)} kg/m³, cw ${significant(t.fluid.specificHeatJPerKgK, 4)} J/(kg·K), ${t.fluid.source === 'fixed' ? 'as given' : 'from IAPWS-IF97'}`;
    replace(facts,
      fact('Depth of the minimum useful temperature, z1', formatLinear(t.minUsefulDepthM, lengthUnit(u)), 'z1 = (T1 − T0)/G'),
      fact('Temperature at z2, T2', display.format('temperature', t.bottomTemperatureK), 'T2 = T0 + G·z2'),
      fact('Mean available temperature θ0', display.format('temperatureDifference', t.theta0K), t.kind === 'hot-dry-rock' ? 'θ0 = (T2 − T1)/2' : 'θ0 = T2 − T1'),
      fact('Heat capacity C', formatLinear(t.heatCapacityJPerK, heatCapacityUnit(u), 4), t.kind === 'hot-dry-rock' ? 'C = ρr·cr·A·(z2 − z1)' : 'C = [φ·ρw·cw + (1 − φ)·ρr·cr]·h·A'),
      fact('Heat in place E0', `${significant(display.value('energy', t.usefulHeatJ), 4)} ${display.unit('energy')}`, `E0 = C·θ0 = ${significant(t.usefulHeatJ / 3.6e12, 4)} GWh`),
      fact('Time constant τ (theory)', yr(t.tauS), `τ = C/(ṁ·cw) at ṁ = ${display.format('massFlow', t.massFlowKgPerS)}`, 'fact-key'),
      fact('Initial thermal power P0', formatPower(t.initialPowerW, u), 'P0 = E0/τ'),
      fact('Water properties used', `cw ${significant(t.fluid.specificHeatJPerKgK, 4)} J/(kg·K)`, fluidNote));
    const s = tauSensitivity(evaluation.json);
    drawTable(s);
    chartBox.hidden = false;
    drawChart(s);
  }

  return {
    element,
    sensitivityElement,
    show,
    destroy() {
      chart?.destroy();
      chart = null;
    },
  };
}

function pctOrNull(f: number | null): number | null {
  return f === null ? null : 100 * f;
}

function placeholderFacts(): HTMLElement[] {
  return ['Depth of the minimum useful temperature, z1', 'Temperature at z2, T2', 'Mean available temperature θ0', 'Heat capacity C', 'Heat in place E0', 'Time constant τ (theory)']
    .map((label) => fact(label, '—'));
}
