/** `#/decline` without a well: every well of the field log, production wells linking to their decline. */
import type { AppContext } from '../app/context.js';
import { h, notice } from '../app/dom.js';
import { routeTo } from '../app/router.js';

export async function pickWell(root: HTMLElement, app: AppContext): Promise<void> {
  root.append(h('h1', {}, 'Decline'), h('p', { class: 'lede' }, 'Choose a production well to see its readings, the fitted decline and the forecast to the economic limit.'));
  const { fields } = await app.client.listWells();
  if (fields.every((f) => f.wells.length === 0)) {
    root.append(notice('info', 'The field log has no wells yet. ', h('a', { href: routeTo('import') }, 'Import readings'), ' to start.'));
    return;
  }
  for (const f of fields) {
    const display = app.display(f.timeZone);
    root.append(h('section', { class: 'panel decline-picker', 'aria-label': f.name },
      h('h2', {}, f.name),
      h('table', { class: 'data-table' },
        h('thead', {}, h('tr', {},
          h('th', { scope: 'col' }, 'Well'), h('th', { scope: 'col' }, 'Kind'), h('th', { scope: 'col', class: 'num' }, 'Readings'),
          h('th', { scope: 'col' }, 'Latest reading'), h('th', { scope: 'col', class: 'num' }, 'Production temperature'))),
        h('tbody', {}, f.wells.map((w) => h('tr', {},
          h('th', { scope: 'row' }, w.kind === 'production' ? h('a', { href: routeTo('decline', f.name, w.name) }, w.name) : w.name),
          h('td', {}, w.kind === 'production' ? 'production' : 'injection (no decline)'),
          h('td', { class: 'num' }, w.liveReadings.toLocaleString('en-US')),
          h('td', {}, display.date(w.latestReading?.time ?? null)),
          h('td', { class: 'num' }, display.formatCelsius(w.latestReading?.productionTemperatureC ?? null))))))));
  }
}
