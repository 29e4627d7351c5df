/**
 * Settings of the field log: display units, the zone instants are shown in, the economic limit (one
 * for the log, optionally one per well), the background heat flow recharge is compared with, and the
 * forecast horizon; and which field log is open. Conversions and the update request are built in
 * settings-model.ts; only what the user changed is sent, so a built-in default stays marked as one.
 */
import '../styles/settings.css';
import type { Wire } from '../../shared/contract/channels.js';
import type { ForecastLimit } from '../../shared/contract/fits.js';
import type { AboutFieldLogJson, DisplayUnits, SettingsJson } from '../../shared/contract/settings.js';
import type { WellSummary } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import type { AppContext, Screen } from '../app/context.js';
import { Display } from '../app/display.js';
import { field, h, notice, replace, select, uid } from '../app/dom.js';
import {
  buildSettingsUpdate, DEFAULT_HEAT_FLOW_MW_PER_M2, errorKey, heatFlowShown, knownTimeZones, LIMIT_KINDS, limitQuantity, limitShown,
  reexpress, shortNumber, unitSummary, type LimitKind, type SettingsForm,
} from './settings-model.js';

let generation = 0;

export const settingsScreen: Screen = {
  title: 'Settings',
  async mount(root, params, app) {
    const mine = ++generation;
    root.append(h('h1', {}, 'Settings'), h('p', { class: 'muted' }, 'Loading the settings…'));
    const [settings, wells] = await Promise.all([app.client.getSettings(), app.client.listWells({})]);
    if (mine !== generation) return;
    const page = h('div', { class: 'settings-screen' },
      h('h1', {}, 'Settings'),
      h('p', { class: 'lede' }, 'Kept in the field log, so every screen, the command line and every report use the same settings.'));
    replace(root, page);
    const remount = async (): Promise<void> => {
      replace(root);
      await settingsScreen.mount(root, params, app);
    };
    const production = wells.fields.flatMap((f) => f.wells).filter((w) => w.kind === 'production');
    page.append(settingsForm(settings, production, app, remount));
    const about = h('section', { class: 'panel', 'aria-labelledby': 'about-log' }, h('h2', { id: 'about-log' }, 'Field log'), h('p', { class: 'muted' }, 'Loading…'));
    page.append(about);
    try {
      const info = await app.client.aboutFieldLog({});
      if (mine === generation) replace(about, h('h2', { id: 'about-log' }, 'Field log'), aboutList(info));
    } catch (e) {
      if (mine === generation) replace(about, h('h2', { id: 'about-log' }, 'Field log'), notice('error', e instanceof Error ? e.message : String(e)));
    }
  },
  unmount() {
    generation += 1;
  },
};

interface Slot {
  wrap: HTMLElement;
  setError(message: string | null): void;
}

function settingsForm(settings: Wire<SettingsJson>, wells: Wire<WellSummary>[], app: AppContext, remount: () => Promise<void>): HTMLElement {
  const slots = new Map<string, Slot>();
  let units: DisplayUnits = settings.units;
  const unitLabel = (kind: LimitKind): string => new Display(units, 'UTC').unit(limitQuantity(kind));

  // ---- units
  const unitRadios = (['si', 'us'] as const).map((u) => {
    const id = uid('units');
    const input = h('input', { type: 'radio', name: 'units', id, value: u, checked: settings.units === u });
    return { u, input, el: h('div', { class: 'choice' }, input, h('label', { for: id }, u === 'si' ? 'SI' : 'US customary', h('span', { class: 'choice-note' }, unitSummary(u)))) };
  });
  const unitsError = errorSpan('units');
  slots.set('units', unitsError);
  const unitsSet = h('fieldset', { class: 'choices' }, h('legend', {}, 'Display units'), unitRadios.map((r) => r.el), unitsError.wrap);

  // ---- time zone
  const zoneId = uid('zone');
  const listId = uid('zones');
  const ownInput = h('input', { type: 'radio', name: 'zone-mode', id: uid('zone-own'), value: 'own', checked: settings.timeZone === null });
  const oneInput = h('input', { type: 'radio', name: 'zone-mode', id: uid('zone-one'), value: 'one', checked: settings.timeZone !== null });
  const zoneInput = h('input', {
    type: 'text', id: zoneId, list: listId, autocomplete: 'off', spellcheck: 'false',
    value: settings.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone, 'aria-describedby': `${zoneId}-hint ${zoneId}-error`,
  });
  const syncZone = (): void => { zoneInput.disabled = ownInput.checked; };
  ownInput.addEventListener('change', syncZone);
  oneInput.addEventListener('change', syncZone);
  syncZone();
  const zoneError = errorSpan('timeZone', `${zoneId}-error`, zoneInput);
  slots.set('timeZone', zoneError);
  const zoneSet = h('fieldset', { class: 'choices' }, h('legend', {}, 'Show dates and times in'),
    h('div', { class: 'choice' }, ownInput, h('label', { for: ownInput.id }, 'Each field’s own time zone', h('span', { class: 'choice-note' }, 'the zone set for the field'))),
    h('div', { class: 'choice' }, oneInput, h('label', { for: oneInput.id }, 'One time zone for every field')),
    h('div', { class: 'field zone-field' }, h('label', { for: zoneId }, 'Time zone (IANA name)'), zoneInput,
      h('span', { class: 'field-hint', id: `${zoneId}-hint` }, 'e.g. Europe/Berlin, America/Denver, UTC'), zoneError.wrap),
    h('datalist', { id: listId }, knownTimeZones().map((z) => h('option', { value: z }))));

  // ---- economic limit
  const limitDefault = settings.source.economicLimit === 'default';
  const limitKind = select(LIMIT_KINDS.map((k) => [k.kind, k.label] as const), settings.economicLimit.kind);
  const shownLimit = shortNumber(limitShown(settings.economicLimit as ForecastLimit, units));
  const limitValue = h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', value: limitDefault ? '' : shownLimit, placeholder: limitDefault ? `${shownLimit} (built-in)` : null });
  const kindField = field('Kind of limit', limitKind);
  const valueField = field(`Limit (${unitLabel(limitKind.value as LimitKind)})`, limitValue,
    limitDefault ? 'leave empty to keep the built-in value shown in grey' : 'a well’s forecast ends where it falls below this');
  const valueLabel = valueField.wrap.querySelector('label') as HTMLLabelElement;
  slots.set('economicLimit', valueField);
  let kindBefore = limitKind.value as LimitKind;
  limitKind.addEventListener('change', () => {
    const kind = limitKind.value as LimitKind;
    valueLabel.textContent = `Limit (${unitLabel(kind)})`;
    if (kind !== kindBefore) {
      limitValue.value = kind === settings.economicLimit.kind && !limitDefault ? shortNumber(limitShown(settings.economicLimit as ForecastLimit, units)) : '';
      limitValue.placeholder = kind === settings.economicLimit.kind && limitDefault ? `${shortNumber(limitShown(settings.economicLimit as ForecastLimit, units))} (built-in)` : '';
    }
    kindBefore = kind;
  });
  const limitPanel = h('section', { class: 'panel', 'aria-labelledby': 'limit-h' },
    h('h2', { id: 'limit-h' }, 'Economic limit'),
    h('p', { class: 'muted' }, 'Below this the heat is not worth producing: each well’s forecast runs to it (end of life, years to the limit, remaining heat) unless the well has its own limit below.'),
    limitDefault ? notice('warn', 'The limit in use is a built-in placeholder, not your plant’s. Enter your plant’s limit here and save.') : null,
    h('div', { class: 'form-row' }, kindField.wrap, valueField.wrap));

  // ---- per-well limits
  const wellRows = wells.map((w) => wellLimitRow(w, settings, () => units, slots));
  const wellPanel = h('section', { class: 'panel', 'aria-labelledby': 'well-limits-h' },
    h('h2', { id: 'well-limits-h' }, 'Economic limit per well'),
    h('p', { class: 'muted' }, 'A well whose plant or pipeline differs can have its own limit; leave it on “the field-wide limit” otherwise.'),
    wells.length === 0
      ? notice('info', 'No production wells in this field log yet.')
      : h('table', { class: 'data-table well-limits' },
        h('caption', {}, 'Production wells'),
        h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Well'), h('th', { scope: 'col' }, 'Limit'), h('th', { scope: 'col' }, 'Value'), h('th', { scope: 'col' }, h('span', { class: 'visually-hidden' }, 'Clear')))),
        h('tbody', {}, wellRows.map((r) => r.row))));

  // ---- recharge and forecast
  const heatDefault = settings.source.backgroundHeatFlowWPerM2 === 'default';
  const heatShown = shortNumber(heatFlowShown(settings.backgroundHeatFlowWPerM2));
  const heatField = field('Background heat flow (mW/m²)',
    h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', value: heatDefault ? '' : heatShown, placeholder: heatDefault ? `${heatShown} (built-in)` : null }),
    `conductive heat flow from below that recharge is compared with; default ${DEFAULT_HEAT_FLOW_MW_PER_M2} mW/m², the continental average (common practice)`);
  slots.set('backgroundHeatFlowWPerM2', heatField);
  const horizonDefault = settings.source.horizonYears === 'default';
  const horizonField = field('Forecast horizon (years)',
    h('input', { type: 'text', inputmode: 'decimal', autocomplete: 'off', value: horizonDefault ? '' : String(settings.horizonYears), placeholder: horizonDefault ? `${settings.horizonYears} (built-in)` : null }),
    'how far past the latest reading forecasts look (years of 365.25 days)');
  slots.set('horizonYears', horizonField);
  const rechargePanel = h('section', { class: 'panel', 'aria-labelledby': 'recharge-h' },
    h('h2', { id: 'recharge-h' }, 'Recharge and forecast'),
    h('div', { class: 'form-row' }, heatField.wrap, horizonField.wrap));

  // ---- units change: re-express the limits typed so far
  for (const r of unitRadios) {
    r.input.addEventListener('change', () => {
      if (!r.input.checked) return;
      const from = units;
      units = r.u;
      limitValue.value = reexpress(limitKind.value as LimitKind, limitValue.value, from, units);
      valueLabel.textContent = `Limit (${unitLabel(limitKind.value as LimitKind)})`;
      for (const w of wellRows) w.reexpress(from, units);
    });
  }

  const reasonField = field('Reason for the change (optional)', h('input', { type: 'text', autocomplete: 'off', maxlength: 2000, size: 50 }), 'kept in the audit log with the change');
  const formError = h('div', { class: 'form-status', role: 'status', 'aria-live': 'polite' });
  slots.set('form', { wrap: formError, setError: (m) => replace(formError, m === null ? null : notice('error', m)) });
  const save = h('button', { type: 'submit', class: 'primary' }, 'Save settings');

  const form = h('form', { class: 'settings-form', novalidate: true },
    h('section', { class: 'panel', 'aria-labelledby': 'display-h' }, h('h2', { id: 'display-h' }, 'Units and time'), h('div', { class: 'grid-2' }, unitsSet, zoneSet)),
    limitPanel, wellPanel, rechargePanel,
    h('div', { class: 'form-row' }, reasonField.wrap),
    h('div', { class: 'actions' }, save, h('button', { type: 'button', onclick: () => void remount() }, 'Undo changes')),
    formError);

  form.addEventListener('submit', (e) => {
    e.preventDefault();
    void (async () => {
      for (const s of slots.values()) s.setError(null);
      const values: SettingsForm = {
        units,
        timeZone: ownInput.checked ? null : zoneInput.value,
        limitKind: limitKind.value as LimitKind,
        limitValue: limitValue.value,
        wellLimits: wellRows.map((r) => r.value()),
        heatFlowMilliWPerM2: heatField.control.value,
        horizonYears: horizonField.control.value,
        reason: reasonField.control.value,
      };
      const { request, errors } = buildSettingsUpdate(values, settings);
      if (Object.keys(errors).length > 0) {
        for (const [key, message] of Object.entries(errors)) (slots.get(key) ?? slots.get('form'))?.setError(message);
        app.tell('warn', 'Some settings need correcting; see the messages beside them.');
        return;
      }
      if (Object.keys(request).length === 0) {
        app.tell('info', 'Nothing changed, so nothing was saved.');
        return;
      }
      save.disabled = true;
      try {
        await app.client.updateSettings(request);
        await app.reloadSettings();
        app.tell('ok', 'Settings saved.');
        await remount();
      } catch (err) {
        save.disabled = false;
        if (err instanceof InputError) {
          const key = errorKey(err.where.field);
          (slots.get(key) ?? slots.get('form'))?.setError(slots.has(key) ? err.reason : `${err.where.field ?? 'settings'}: ${err.reason}`);
          app.tell('warn', 'The settings were not saved; see the message beside the field.');
        } else {
          slots.get('form')?.setError(err instanceof Error ? err.message : String(err));
        }
      }
    })();
  });
  return form;
}

/** An error line not built by field() (radio groups, the zone box). */
function errorSpan(key: string, id = uid(`err-${key}`), control?: HTMLElement): Slot {
  const wrap = h('span', { class: 'field-error', id, role: 'alert', 'aria-live': 'polite' });
  return {
    wrap,
    setError(message) {
      wrap.textContent = message ?? '';
      if (message === null || message === '') control?.removeAttribute('aria-invalid');
      else control?.setAttribute('aria-invalid', 'true');
    },
  };
}

function wellLimitRow(w: Wire<WellSummary>, settings: Wire<SettingsJson>, units: () => DisplayUnits, slots: Map<string, Slot>) {
  const key = `wellEconomicLimits.${w.id}`;
  const own = (settings.wellEconomicLimits as Record<string, ForecastLimit>)[String(w.id)];
  const kind = select([['', 'the field-wide limit'], ...LIMIT_KINDS.map((k) => [k.kind, k.label] as const)], own?.kind ?? '',
    { 'aria-label': `Economic limit of ${w.name}` });
  const value = h('input', {
    type: 'text', inputmode: 'decimal', autocomplete: 'off', size: 8,
    value: own === undefined ? '' : shortNumber(limitShown(own, units())), 'aria-label': `Limit value of ${w.name}`,
  });
  const unit = h('span', { class: 'unit' });
  const err = h('span', { class: 'field-error', id: uid('well-limit-err'), role: 'alert', 'aria-live': 'polite' });
  value.setAttribute('aria-describedby', err.id);
  const sync = (): void => {
    const k = kind.value as LimitKind | '';
    value.disabled = k === '';
    unit.textContent = k === '' ? '' : new Display(units(), 'UTC').unit(limitQuantity(k));
  };
  kind.addEventListener('change', () => {
    if (kind.value === '') value.value = '';
    sync();
  });
  sync();
  slots.set(key, {
    wrap: err,
    setError(message) {
      err.textContent = message ?? '';
      if (message === null) value.removeAttribute('aria-invalid');
      else value.setAttribute('aria-invalid', 'true');
    },
  });
  const clear = h('button', { type: 'button', onclick: () => { kind.value = ''; value.value = ''; sync(); } }, `Clear`);
  clear.setAttribute('aria-label', `Clear the own limit of ${w.name}`);
  return {
    row: h('tr', {}, h('th', { scope: 'row' }, w.name, h('span', { class: 'cell-sub' }, w.field)), h('td', {}, kind), h('td', {}, value, ' ', unit, err), h('td', {}, clear)),
    value: () => ({ wellId: w.id, kind: kind.value === '' ? null : (kind.value as LimitKind), value: value.value }),
    reexpress(from: DisplayUnits, to: DisplayUnits) {
      if (kind.value !== '') value.value = reexpress(kind.value as LimitKind, value.value, from, to);
      sync();
    },
  };
}

function aboutList(info: Wire<AboutFieldLogJson>): HTMLElement {
  const size = info.sizeBytes === null ? '—' : info.sizeBytes >= 1024 * 1024 ? `${(info.sizeBytes / (1024 * 1024)).toFixed(1)} MiB` : `${Math.ceil(info.sizeBytes / 1024)} KiB`;
  const rows: [string, string][] = [
    ['File', info.path ?? 'in memory (nothing is saved to disk)'],
    ['Size', size],
    ['Schema version', String(info.schemaVersion)],
    ['Tauwell version', info.appVersion],
    ['Engine version', info.engineVersion],
    ['Fields', String(info.fields)],
    ['Wells', String(info.wells)],
    ['Live readings', info.liveReadings.toLocaleString('en-US')],
  ];
  return h('dl', { class: 'about-log' }, rows.map(([k, v]) => [h('dt', {}, k), h('dd', { class: k === 'File' ? 'mono' : null }, v)]).flat());
}
