/**
 * The decline screen's blocks of words as DOM: the stored fit's status line, the facts strip, the
 * table of candidate models and the assumptions. Each builds from plain values (decline-rows.ts
 * makes the strings), so the screen module only decides when to redraw them.
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { FitStatusResponse, FitWellResponse, ModelChoice } from '../../shared/contract/fits.js';
import type { Display } from '../app/display.js';
import { h, type Child } from '../app/dom.js';
import { candidateRows, MODEL_LABELS, type Fact } from './decline-rows.js';

export interface StatusInput {
  status: Wire<FitStatusResponse> | null;
  /** 'opening': read before this screen's own fits (which the back end stores too). */
  when: 'opening' | 'refit';
  /** The stored record of the fit on screen, once there is one. */
  shownFitId: number | null;
  display: Display;
  /** The Refit (or Fit and store) button, shown when the stored fit is stale or missing. */
  refit: HTMLButtonElement;
}

/** "Stored fit: [stored fit is current] …" or "[Stale: data changed since the fit] … [Refit]". */
export function statusLine(input: StatusInput): Child[] {
  const { status: s, display } = input;
  const describe = (latest: NonNullable<Wire<FitStatusResponse>['latest']>): string =>
    `${MODEL_LABELS[latest.model as ModelChoice] ?? latest.model} on ${latest.basis === 'mass' ? 'produced mass' : 'time'}, stored ${display.dateTime(latest.createdAt)}`;
  let mark: HTMLElement;
  let text: string;
  if (s === null) {
    mark = h('span', { class: 'mark mark-no-data' }, 'stored fit unknown');
    text = 'The stored fit could not be read.';
  } else if (s.latest === null) {
    mark = h('span', { class: 'mark mark-no-data' }, 'no stored fit');
    text = s.message;
  } else if (s.stale === true) {
    mark = h('span', { class: 'mark mark-stale' }, 'Stale: data changed since the fit');
    text = `${describe(s.latest)}. ${s.message}`;
  } else {
    mark = h('span', { class: 'mark mark-good' }, 'stored fit is current');
    text = `${describe(s.latest)}${s.engineChanged === true ? ` by engine ${s.latest.engineVersion} (a refit may differ slightly)` : ''}.`;
  }
  const missing = s === null || s.latest === null;
  input.refit.textContent = missing ? 'Fit and store' : 'Refit';
  return [
    h('span', { class: 'decline-status-label' }, input.when === 'opening' ? 'Stored fit when opened:' : 'Stored fit:'),
    mark,
    h('span', { class: 'decline-status-text' }, text),
    s?.stale === true || (missing && input.shownFitId === null) ? input.refit : null,
    // Every fit the back end makes is stored, so the fit shown below is one too: say which.
    input.shownFitId === null ? null : h('span', { class: 'decline-status-text' }, `The fit shown below is stored as fit #${input.shownFitId}.`),
  ];
}

export function factCards(list: readonly Fact[]): HTMLElement[] {
  return list.map((f) => h('div', { class: f.tone === 'warn' ? 'fact fact-warn' : 'fact' },
    h('div', { class: 'fact-label' }, f.label),
    h('div', { class: 'fact-value' }, f.value),
    f.note !== undefined && f.note !== '' ? h('div', { class: 'fact-note' }, f.note) : null));
}

/** Every candidate model with AICc, ΔAICc, parameters with 95 % intervals, status; the chosen one marked. */
export function candidateTable(fit: Wire<FitWellResponse>, display: Display): Child[] {
  const rows = candidateRows(fit.fit, display);
  const headers = ['Model', 'Status', 'AICc', 'ΔAICc', 'θ0', fit.basis === 'mass' ? 'Mc = C/cw' : 'τ', 'θ∞', 'b', 'RMSE'];
  const span = fit.window.from === null && fit.window.to === null
    ? 'the whole record'
    : `the window ${fit.window.from === null ? 'start' : display.date(fit.window.from)} – ${fit.window.to === null ? 'end' : display.date(fit.window.to)}`;
  const table = h('table', { class: 'data-table decline-candidates' },
    h('caption', {}, `Models fitted to θ over ${span}; 95 % intervals in brackets`),
    h('thead', {}, h('tr', {}, headers.map((label, i) => h('th', { scope: 'col', class: i >= 2 ? 'num' : null }, label)))),
    h('tbody', {}, rows.map((r) => h('tr', { class: r.chosen ? 'chosen' : null, 'aria-current': r.chosen ? 'true' : null },
      h('th', { scope: 'row' }, r.label, r.chosen ? h('span', { class: 'mark mark-good decline-chosen' }, 'chosen') : null),
      h('td', {}, h('span', { class: `mark ${r.converged ? 'mark-good' : 'mark-poor'}`, title: r.message || null }, r.status)),
      [r.aicc, r.deltaAicc, r.theta0, r.tau, r.thetaInf, r.b, r.rmse].map((v) => h('td', { class: 'num' }, v))))));
  const messages = rows.filter((r) => r.message !== '').map((r) => h('li', {}, `${r.label}: ${r.message}`));
  return [h('div', { class: 'decline-table-scroll' }, table), messages.length > 0 ? h('ul', { class: 'decline-messages' }, messages) : null];
}

/** The assumptions and notes of the fit and forecast, folded away. */
export function assumptionsBox(lines: readonly string[]): HTMLElement | null {
  return lines.length === 0 ? null : h('details', { class: 'decline-assumptions' },
    h('summary', {}, 'Assumptions behind these numbers'),
    h('ul', {}, lines.map((l) => h('li', {}, l))));
}
