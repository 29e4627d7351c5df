/**
 * The recharge of every production well of the reservoir now, with the reservoir's latest version
 * (the one forecasts use): τtheory at the well's mean flow, τfit, R = τfit/τtheory, the recharge
 * fraction and the verdict. After a new version is saved the table is recomputed and shows each
 * value before → now, which is how a change of parameters shows up in the recharge.
 */
import type { AppContext } from '../app/context.js';
import { h, notice, replace } from '../app/dom.js';
import { routeTo } from '../app/router.js';
import type { WellInfo } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import { forecastRequestOf, rechargeLine, rechargeView, whyNoRecharge, type RechargeLine } from './recharge-model.js';
import { verdictMark } from './reservoir-dom.js';

export interface SavedChange {
  version: number;
  /** τ of the new and the previous version at their own flows, as text. */
  tauNow: string;
  tauBefore: string | null;
}

export interface WellsView {
  element: HTMLElement;
  /** Recomputes the recharge of `wells` (the reservoir's); `saved` after a new version. */
  refresh(wells: readonly WellInfo[], latestVersion: number | null, saved?: SavedChange): Promise<void>;
}

type Outcome = { line: RechargeLine } | { problem: string };

export function wellsView(app: AppContext): WellsView {
  const body = h('div', {});
  const element = h('section', { class: 'panel reservoir-wells', 'aria-label': 'Recharge of the wells' },
    h('h2', {}, 'Recharge of the wells now'), body);
  let previous = new Map<string, Outcome>();
  let generation = 0;

  async function outcomeOf(well: WellInfo): Promise<Outcome> {
    const why = whyNoRecharge(well);
    if (why !== null) return { problem: why };
    try {
      const settings = app.settings();
      const status = await app.client.fitStatus({ well: well.name, field: well.field }).catch(() => null);
      const response = await app.client.forecastWell(forecastRequestOf(well, status, settings));
      const view = rechargeView(response, settings, app.display().units);
      return view === null ? { problem: 'the reservoir has no parameter version yet' } : { line: rechargeLine(view) };
    } catch (e) {
      return { problem: e instanceof InputError ? e.message : e instanceof Error ? e.message : String(e) };
    }
  }

  return {
    element,
    async refresh(wells, latestVersion, saved) {
      const mine = ++generation;
      const producers = wells.filter((w) => w.kind === 'production');
      const injectors = wells.filter((w) => w.kind !== 'production');
      if (latestVersion === null) {
        replace(body, h('p', { class: 'muted' }, 'No parameter version yet: the wells’ recharge appears once one is saved.'));
        return;
      }
      if (producers.length === 0) {
        replace(body, h('p', { class: 'muted' }, 'No production well uses this reservoir yet. A well’s reservoir is part of the well’s details.'));
        return;
      }
      replace(body, h('p', { class: 'muted', role: 'status' }, `Computing the recharge of ${producers.map((w) => w.name).join(', ')} with version ${latestVersion}…`));
      const outcomes = await Promise.all(producers.map((w) => outcomeOf(w)));
      if (mine !== generation) return;
      const before = saved !== undefined ? previous : new Map<string, Outcome>();
      const change = (get: (l: RechargeLine) => string, name: string, now: Outcome): string | HTMLElement => {
        if (!('line' in now)) return '—';
        const was = before.get(name);
        const nowText = get(now.line);
        if (was === undefined || !('line' in was) || get(was.line) === nowText) return nowText;
        return h('span', {}, h('span', { class: 'muted' }, `${get(was.line)} → `), h('strong', {}, nowText));
      };
      const rows = producers.map((w, i) => {
        const o = outcomes[i];
        const link = h('a', { href: routeTo('recharge', w.field, w.name) }, w.name);
        if ('problem' in o) return h('tr', {}, h('th', { scope: 'row' }, link), h('td', { colspan: 5, class: 'muted' }, o.problem));
        return h('tr', {},
          h('th', { scope: 'row' }, link),
          h('td', { class: 'num' }, change((l) => l.tauTheory, w.name, o)),
          h('td', { class: 'num' }, o.line.tauFit),
          h('td', { class: 'num' }, change((l) => l.ratio, w.name, o)),
          h('td', { class: 'num' }, change((l) => l.fraction, w.name, o)),
          h('td', {}, verdictMark(o.line.verdict)));
      });
      previous = new Map(producers.map((w, i) => [w.name, outcomes[i]]));
      replace(body,
        saved !== undefined
          ? notice('ok', `Version ${saved.version} saved. τtheory at the parameters’ own flow: `,
            saved.tauBefore !== null ? `${saved.tauBefore} → ` : '', h('strong', {}, saved.tauNow), '. The wells’ recharge below is recomputed with it.')
          : null,
        h('p', { class: 'muted' }, `With version ${latestVersion} (the latest, which forecasts use), each well’s stored fit and the economic limit of the settings. τtheory is at the mean flow of the well’s fit window.`),
        h('table', { class: 'data-table' },
          h('thead', {}, h('tr', {},
            h('th', { scope: 'col' }, 'Well'),
            h('th', { scope: 'col', class: 'num' }, 'τ theory'),
            h('th', { scope: 'col', class: 'num' }, 'τ fitted'),
            h('th', { scope: 'col', class: 'num' }, 'R = τfit/τtheory'),
            h('th', { scope: 'col', class: 'num' }, 'Recharge fraction f'),
            h('th', { scope: 'col' }, 'Verdict'))),
          h('tbody', {}, rows)),
        injectors.length > 0 ? h('p', { class: 'muted' }, `${injectors.map((w) => w.name).join(', ')}: injection, no decline to compare.`) : null);
    },
  };
}
