/**
 * What every report carries besides its numbers: the title, when it was generated and by which
 * version, the field log and the fingerprint of the data it came from, the display units, the
 * cautions — and, at the end, the method in short with its published sources.
 */
import type { ReportModel } from '../../shared/report/model.js';
import type { Display } from '../app/display.js';
import { h } from '../app/dom.js';
import { keyValues } from './parts.js';

const UNITS = { si: 'SI (°C, kg/s, MPa, MWth, PJ)', us: 'US customary (°F, klb/h, psia, MMBtu/h, MMBtu)' } as const;

/** The top of the first page: title, where the report comes from in one line, and a pointer to the cautions. */
export function cover(model: ReportModel, display: Display): HTMLElement {
  const m = model.meta;
  return h('header', { class: 'report-cover' },
    h('p', { class: 'report-brand' }, 'Tau', h('span', { class: 'wordmark-accent' }, 'well'), ' · decline report'),
    h('h1', {}, model.title),
    h('p', { class: 'report-subtitle' }, model.subtitle),
    h('p', { class: 'report-provenance' },
      `Generated ${display.dateTime(m.generatedAt)} (${display.timeZone}) by Tauwell ${m.appVersion} from ${m.database ?? 'an in-memory field log'}`,
      m.fingerprint === null ? '' : ` · data fingerprint ${m.fingerprint.slice(0, 16)}…`, ` · ${UNITS[m.units]}.`),
    h('p', { class: 'report-caution-line' }, 'These are estimates from a simplified model and field readings: read the cautions at the end before acting on them.'));
}

/** The closing pages: where the report comes from in full, the cautions, the method and its sources. */
export function closing(model: ReportModel, display: Display): HTMLElement {
  const m = model.meta;
  const fits = m.fits.map((f) => `${f.well}: fit ${f.fitId} of ${display.dateTime(f.createdAt)}, readings ${f.fingerprint.slice(0, 16)}…`).join('; ');
  return h('section', { class: 'report-method', 'aria-labelledby': 'about-title' },
    h('h2', { id: 'about-title' }, 'About this report'),
    keyValues('Where this report comes from', [
      ['Generated', `${display.dateTime(m.generatedAt)} (${display.timeZone}); ${m.generatedAt}`],
      ['Version', `Tauwell ${m.appVersion}; engine ${m.engineVersion}`],
      ['Field log', `${m.database ?? 'in memory'} (schema ${m.schemaVersion})`],
      ['Data fingerprint', m.fingerprint === null ? 'no well could be fitted' : m.fingerprint],
      ['Stored fits', fits === '' ? 'none' : fits],
      ['Display units', UNITS[m.units]],
      ['Dates and times', `in ${m.timeZone}`],
      ['Forecast horizon', `${m.horizonYears} years of 365.25 d past the latest reading`],
    ]),
    h('p', { class: 'fact-note' }, 'The data fingerprint is a SHA-256 over the stored fits\' fingerprints, each a SHA-256 over the readings the fit used: the same readings give the same fingerprint.'),
    cautions(model),
    h('h3', {}, 'The method in short'),
    h('dl', {}, model.method.steps.flatMap((s) => [h('dt', {}, s.heading), h('dd', {}, s.text)])),
    h('h3', {}, 'Published sources'),
    h('ol', { class: 'report-sources' }, model.method.sources.map((s) => h('li', {}, s))));
}

export function cautions(model: ReportModel): HTMLElement {
  return h('aside', { class: 'cautions', 'aria-label': 'Cautions' },
    h('h2', {}, 'Before you act on these numbers'),
    h('ul', {}, model.meta.cautions.map((c) => h('li', {}, c))));
}
