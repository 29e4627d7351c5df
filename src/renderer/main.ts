/**
 * Renderer entry: connects to the back end (desktop bridge or loopback server), loads the settings,
 * draws the frame (navigation rail, status strip) and mounts the screen the address names.
 */
// The base styles first, so each screen's own stylesheet (imported by its module) can refine them.
import './styles/base.css';
import { connect } from './api.js';
import type { AppContext, Screen } from './app/context.js';
import { Display } from './app/display.js';
import { h, replace } from './app/dom.js';
import { parseRoute, routeTo } from './app/router.js';
import type { Wire } from '../shared/contract/channels.js';
import type { SettingsJson } from '../shared/contract/settings.js';
import { declineScreen } from './screens/decline.js';
import { fieldScreen } from './screens/field.js';
import { importScreen } from './screens/import.js';
import { logScreen } from './screens/log.js';
import { rechargeScreen } from './screens/recharge.js';
import { reservoirScreen } from './screens/reservoir.js';
import { settingsScreen } from './screens/settings.js';

const SCREENS: Record<string, Screen> = {
  field: fieldScreen,
  decline: declineScreen,
  log: logScreen,
  import: importScreen,
  reservoir: reservoirScreen,
  recharge: rechargeScreen,
  settings: settingsScreen,
};

/** The rail's entries: route name, label, keyboard shortcut (Alt + digit). */
const NAV: readonly (readonly [string, string])[] = [
  ['field', 'Field'],
  ['decline', 'Decline'],
  ['log', 'Log book'],
  ['import', 'Import'],
  ['reservoir', 'Reservoir'],
  ['recharge', 'Recharge'],
  ['settings', 'Settings'],
];

async function boot(): Promise<void> {
  const root = document.getElementById('app');
  if (root === null) return;
  let client;
  try {
    client = connect();
  } catch (e) {
    replace(root, h('div', { class: 'boot-error', role: 'alert' }, h('h1', {}, 'Tauwell cannot reach its back end'), h('p', {}, e instanceof Error ? e.message : String(e))));
    return;
  }

  const status = h('div', { class: 'status-strip', role: 'status', 'aria-live': 'polite' });
  const content = h('main', { class: 'screen', id: 'screen', tabindex: '-1' });
  const navLinks = NAV.map(([name, label], i) => h('a', { href: routeTo(name), 'data-route': name, title: `${label} (Alt+${i + 1})` }, label));
  replace(root,
    h('a', { class: 'skip-link', href: '#screen', onclick: (e: Event) => { e.preventDefault(); content.focus(); } }, 'Skip to content'),
    h('header', { class: 'top-bar' },
      h('span', { class: 'wordmark', 'aria-label': 'Tauwell' }, 'Tau', h('span', { class: 'wordmark-accent' }, 'well')),
      h('span', { class: 'top-bar-sub' }, 'geothermal decline and field log'),
      h('span', { class: 'top-bar-log', id: 'log-location' })),
    h('nav', { class: 'rail', 'aria-label': 'Screens' }, navLinks),
    content,
    status);

  let settings: Wire<SettingsJson> = await client.getSettings();
  let display = makeDisplay(settings);
  let current: Screen | undefined;
  let statusTimer: number | undefined;

  const app: AppContext = {
    client,
    settings: () => settings,
    display: (fieldTimeZone) => (fieldTimeZone !== undefined && settings.timeZone === null ? new Display(settings.units, fieldTimeZone) : display),
    async reloadSettings() {
      settings = await client.getSettings();
      display = makeDisplay(settings);
    },
    navigate(route) {
      if (window.location.hash === route) void show();
      else window.location.hash = route;
    },
    tell(kind, text) {
      status.className = `status-strip status-${kind}`;
      status.setAttribute('role', kind === 'error' ? 'alert' : 'status');
      status.textContent = text;
      window.clearTimeout(statusTimer);
      if (kind !== 'error') statusTimer = window.setTimeout(() => { status.textContent = ''; }, 8000);
    },
  };

  async function show(): Promise<void> {
    const route = parseRoute(window.location.hash);
    const screen = SCREENS[route.name] ?? fieldScreen;
    current?.unmount?.();
    current = screen;
    for (const link of navLinks) {
      if (link.dataset.route === route.name) link.setAttribute('aria-current', 'page');
      else link.removeAttribute('aria-current');
    }
    document.title = `${screen.title} · Tauwell`;
    replace(content);
    try {
      await screen.mount(content, route.params, app);
    } catch (e) {
      content.append(h('div', { class: 'notice notice-error', role: 'alert' }, `This screen could not be drawn: ${e instanceof Error ? e.message : String(e)}`));
    }
  }

  window.addEventListener('hashchange', () => void show());
  // The desktop shell's menu (View → screens) sends routes on a one-way channel; a browser has none.
  window.tauwell?.onNavigate?.((route) => app.navigate(route));
  void showLogLocation(client);
  window.addEventListener('keydown', (e) => {
    if (!e.altKey || e.ctrlKey || e.metaKey) return;
    const i = Number(e.key) - 1;
    if (Number.isInteger(i) && i >= 0 && i < NAV.length) {
      e.preventDefault();
      app.navigate(routeTo(NAV[i][0]));
    }
  });
  await show();
}

/** The field log's file in the top bar, so the user always knows which log the screens show. */
async function showLogLocation(client: AppContext['client']): Promise<void> {
  const where = document.getElementById('log-location');
  if (where === null) return;
  try {
    const about = await client.aboutFieldLog({});
    where.textContent = about.path === null ? 'field log in memory' : `field log: ${about.path}`;
    where.title = `schema ${about.schemaVersion} · Tauwell ${about.appVersion} · engine ${about.engineVersion}`;
  } catch {
    where.textContent = '';
  }
}

function makeDisplay(settings: Wire<SettingsJson>): Display {
  const zone = settings.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone;
  return new Display(settings.units, zone);
}

void boot();
