/**
 * One well's pages of a report: the headline first (one sentence, the decline screen's own facts plus
 * the recharge verdict), then the decline chart with its residuals panel (the screen's own chart), the
 * model comparison (the screen's candidate rows),
 * the reservoir parameters and their version, the data quality, and what the forecast assumes.
 * A well that cannot be forecast says why in place of the numbers.
 */
import type { ReportModel } from '../../shared/report/model.js';
import type { WellReport } from '../../shared/report/well-section.js';
import { fixed, percent, type Display } from '../app/display.js';
import { h, type Child } from '../app/dom.js';
import { DeclineCharts } from '../charts/decline-chart.js';
import { candidateRows, facts, fittedTauS, MODEL_LABELS } from '../screens/decline-rows.js';
import { declineViews } from './decline-view.js';
import { count, factStrip, keyValues, notes, statement, table, unbroken, type FactItem } from './parts.js';
import { importsTable, qualityPart } from './quality.js';

export interface Drawn {
  element: HTMLElement;
  /** Draws the charts once the element is in the document (chart.js measures its box). */
  draw(): number;
}

const VERDICT: Record<string, string> = {
  recharge: 'recharge detected',
  'consistent-with-none': 'no recharge detectable',
  'faster-than-theory': 'cools faster than its parameters allow',
};

export function wellPage(w: WellReport, index: number, model: ReportModel, display: Display): Drawn {
  // In a field report each well has pages of its own, headed with its name; a well report is all one well.
  const page = model.scope.kind === 'field' ? `well-${index + 1}` : null;
  const section = h('section', { class: 'report-well', 'data-report-page': page, 'aria-labelledby': `well-${index + 1}-title` });
  section.append(
    h('h2', { id: `well-${index + 1}-title` }, `Well ${w.well.name}`),
    h('p', { class: 'report-lede' }, identity(w, display)),
  );
  if (w.statement !== null) section.append(statement(w.statement));
  else section.append(h('p', { class: 'report-summary' }, summary(w, display)));
  // The headline (sentence, facts, the limit and the recharge in words), then the chart.
  section.append(headline(w, display), ...readingOfHeadline(w));
  const chartBox = h('div', { class: 'report-charts' });
  section.append(chartBox);
  section.append(...comparison(w, display));
  section.append(...reservoirPart(w, display));
  section.append(h('h3', {}, 'Data quality'), ...qualityPart(w.quality, display));
  if (model.scope.kind === 'well') section.append(importsTable(model.imports, display));
  const said = [...w.assumptions, ...w.notes.map((n) => `note: ${n}`)];
  const assumed = notes('What this forecast assumes', said);
  if (assumed !== null) section.append(assumed);

  return {
    element: section,
    draw: () => drawCharts(chartBox, w, display),
  };
}

function identity(w: WellReport, display: Display): string {
  const parts = [
    `${w.well.kind === 'production' ? 'Production' : 'Injection'} well of ${w.well.field}`,
    w.well.reservoir === null ? 'no reservoir' : `reservoir ${w.well.reservoir}`,
    `Tref ${display.formatCelsius(w.well.referenceTemperatureC)}`,
  ];
  if (w.fit !== null) {
    parts.push(`${MODEL_LABELS[w.fit.model]} on the ${w.fit.basis} basis${w.fit.modelChoice === 'auto' ? ' (chosen by AICc)' : ''}`);
    parts.push(`stored fit ${w.fit.fitId} of ${display.dateTime(w.fit.createdAt)}`);
  }
  return `${parts.join(' · ')}.${w.fit !== null ? ` Why this fit: ${w.fit.why}.` : ''}`;
}

/** The headline in one sentence, with the numbers exactly as the facts below print them. */
function summary(w: WellReport, display: Display): Child[] {
  const hl = w.headline;
  const f = w.forecast;
  if (hl === null || f === null) return [];
  const eol = hl.endOfLife;
  const day = (iso: string | null): Child => (iso === null ? 'beyond the horizon' : unbroken(display.date(iso)));
  const limit = hl.limit.productionTemperatureK === null ? hl.limit.text : display.format('temperature', hl.limit.productionTemperatureK);
  const when: Child[] = eol.alreadyReached
    ? [`${w.well.name} has already reached its economic limit (${limit}).`]
    : eol.p50 === null
      ? [`${w.well.name} does not reach its economic limit (${limit}) within the ${fixed(f.horizonYears, 0)}-year horizon (P50).`]
      : [`${w.well.name} reaches its economic limit (${limit}) on `, day(eol.p50), ' (P50; P90 ', day(eol.p90), ', P10 ', day(eol.p10),
        `), ${fixed(eol.yearsFromLatest.p50 ?? NaN, 1)} years after its latest reading.`];
  const tau = fittedTauS(f.fit);
  const tauText: Child[] = tau === null ? [] : [
    ' Fitted τ ', unbroken(display.years(tau.value)), ' (95 %: ', unbroken(display.yearsRange(tau.lo, tau.hi)), ')',
    hl.theoryTauS === null ? '' : ', theoretical τ ', hl.theoryTauS === null ? '' : unbroken(display.years(hl.theoryTauS)), '.',
  ];
  const verdict = hl.recharge === null ? '' : ` Recharge: ${VERDICT[hl.recharge.verdict] ?? hl.recharge.verdict}.`;
  return [...when, ...tauText, verdict];
}

function headline(w: WellReport, display: Display): HTMLElement {
  const box = h('div', { class: 'report-headline' });
  const f = w.forecast;
  const now = w.latest === null ? null : { ms: Date.parse(w.latest.time), celsius: w.latest.productionTemperatureC };
  const items: FactItem[] = facts({
    display,
    trefC: w.well.referenceTemperatureC,
    now,
    recordCounts: { included: w.quality.included, excluded: w.quality.readings - w.quality.included },
    fit: f?.fit ?? null,
    forecast: f,
    forecastProblem: w.status === 'ok' ? null : 'no forecast: see the statement above',
  });
  const rc = w.headline?.recharge ?? null;
  items.splice(4, 0, {
    label: 'Recharge fraction f',
    value: rc === null ? '—' : percent(rc.fraction.value, 1),
    note: rc === null ? (w.headline?.rechargeMissing ?? 'no recharge estimate') : `95 %: ${percent(rc.fraction.ci95[0], 1)} to ${percent(rc.fraction.ci95[1], 1)}; ${VERDICT[rc.verdict] ?? rc.verdict}`,
    ...(rc !== null && rc.verdict === 'faster-than-theory' ? { tone: 'warn' as const } : {}),
  });
  box.append(factStrip(items, `Headline of well ${w.well.name}`));
  return box;
}

/** The years to the limit from the latest reading, the limit itself, and the recharge in words. */
function readingOfHeadline(w: WellReport): HTMLElement[] {
  const out: HTMLElement[] = [];
  const eol = w.headline?.endOfLife;
  if (eol !== undefined) {
    const y = eol.yearsFromLatest;
    const yr = (v: number | null): string => (v === null ? `not within ${fixed(w.forecast?.horizonYears ?? NaN, 0)} yr` : `${fixed(v, 1)} yr`);
    out.push(h('p', { class: 'report-eol' },
      `Years from the latest reading to the economic limit: P90 ${yr(y.p90)}, P50 ${yr(y.p50)}, P10 ${yr(y.p10)}. `,
      `Limit: ${w.headline?.limit.text ?? '—'}.`));
  }
  const rc = w.headline?.recharge ?? null;
  if (rc !== null) out.push(h('p', { class: 'report-interpretation' }, rc.interpretation));
  return out;
}

function drawCharts(box: HTMLElement, w: WellReport, display: Display): number {
  if (w.series === null) {
    box.append(statement(`No readings of ${w.well.name} to draw.`));
    return 0;
  }
  const views = declineViews(w.series, w.forecast, w.residuals, display);
  const canvas = h('canvas', { role: 'img', 'aria-label': `Decline of ${w.well.name}: readings, fitted curve, P10–P90 forecast band and economic limit, with the residuals of the fit beneath` });
  // The chart's legend is HTML (DeclineCharts renders it into this box), kept on the page with the chart.
  const legend = h('div', { class: 'decline-legend report-legend', role: 'group', 'aria-label': `Legend of the decline chart of ${w.well.name}` });
  box.append(
    h('div', { class: 'report-chart-with-legend' }, legend, h('div', { class: 'chart-box report-chart-decline' }, canvas)),
    h('p', { class: 'fact-note' },
      `${count(w.series.drawn)} of ${count(w.series.readings)} readings drawn`,
      w.series.drawn < w.series.readings ? ' (the lowest and highest of each stretch, so no spike or dip is lost)' : '',
      views.notDrawn > 0 ? `; ${count(views.notDrawn)} have no production temperature` : '',
      w.residuals !== null ? `; ${count(w.residuals.x.length)} of ${count(w.residuals.points)} residuals drawn.` : '.'),
  );
  new DeclineCharts(canvas, legend, { onWindowDrag: () => undefined }).setReadings(views.readings, views.overlay, views.window);
  return 1;
}

function comparison(w: WellReport, display: Display): HTMLElement[] {
  const f = w.forecast;
  if (f === null) return [];
  const rows = candidateRows(f.fit.fit, display);
  const t = table('Candidate models (95 % intervals in brackets; the chosen model marked)', [
    { label: 'Model' }, { label: 'AICc', numeric: true }, { label: 'ΔAICc', numeric: true }, { label: 'θ0' }, { label: 'τ' },
    { label: 'θ∞' }, { label: 'b' }, { label: 'RMSE', numeric: true }, { label: 'Status' },
  ], rows.map((r) => [
    r.chosen ? `${r.label} (chosen)` : r.label, r.aicc, r.deltaAicc, r.theta0, r.tau, r.thetaInf, r.b, r.rmse, r.status,
  ]), { rowHeader: true, className: 'report-candidates' });
  const messages = rows.filter((r) => r.message !== '').map((r) => `${r.label}: ${r.message}`);
  const fit = f.fit.fit;
  const stats = h('p', { class: 'fact-note' },
    `${count(fit.n)} readings fitted, ${count(fit.dof)} degrees of freedom, ${count(fit.iterations)} iterations; R² ${fit.r2 === null ? '—' : fixed(fit.r2, 5)}.`);
  const out: HTMLElement[] = [h('h3', {}, 'Model comparison'), t, stats];
  const m = notes('Messages of the fits', messages);
  if (m !== null) out.push(m);
  return out;
}

function reservoirPart(w: WellReport, display: Display): HTMLElement[] {
  const out: HTMLElement[] = [h('h3', {}, 'Reservoir parameters')];
  const r = w.reservoir;
  if (r === null) {
    if (w.reservoirStatement !== null) out.push(statement(w.reservoirStatement));
    return out;
  }
  out.push(h('p', { class: 'report-lede' },
    `${r.name}, version ${r.version} of ${r.versions}, recorded ${display.dateTime(r.recordedAt)} by ${r.recordedBy}${r.note !== '' ? `: ${r.note}` : ''}.`));
  out.push(keyValues('Parameters as stored (°C, MPa, SI otherwise; the keys of `tauwell theory --params`)',
    r.params.filter((p) => p.key !== 'note').map((p) => [p.key, p.value === null ? '—' : String(p.value)])));
  const t = r.theory;
  out.push(keyValues('What the parameters give (lumped heat model)', [
    ['Theoretical τ at the reservoir\'s flow', display.years(t.tauS, 2)],
    ['Theoretical τ at the mean flow of the fit window', display.years(w.headline?.theoryTauS ?? null, 2)],
    ['Mean mass flow of the fit window', r.meanMassFlowKgPerS === null ? '—' : display.format('massFlow', r.meanMassFlowKgPerS)],
    ['Initial available temperature θ0', display.format('temperatureDifference', t.theta0K)],
    ['Heat capacity C', withPrefix(t.heatCapacityJPerK, 'J/K')],
    ['Useful heat E0', display.format('energy', t.usefulHeatJ)],
    ['Water specific heat cw', t.fluidSpecificHeatJPerKgK === null ? '—' : `${fixed(t.fluidSpecificHeatJPerKgK, 1)} J/(kg·K) (${t.fluidSource})`],
    ['Background heat flow', r.backgroundHeatFlowWPerM2 === null ? '—' : `${fixed(r.backgroundHeatFlowWPerM2 * 1000, 0)} mW/m² over ${r.areaM2 === null ? '—' : `${count(r.areaM2)} m²`}`],
  ]));
  return out;
}

/** Four significant digits with the SI prefix that keeps one to three digits before the point: '182.2 TJ/K'. */
function withPrefix(v: number | null, unit: string): string {
  if (v === null || !Number.isFinite(v)) return '—';
  const prefixes: [number, string][] = [[1e15, 'P'], [1e12, 'T'], [1e9, 'G'], [1e6, 'M'], [1e3, 'k']];
  const [scale, p] = prefixes.find(([s]) => Math.abs(v) >= s) ?? [1, ''];
  return `${Number((v / scale).toPrecision(4))} ${p}${unit}`;
}
