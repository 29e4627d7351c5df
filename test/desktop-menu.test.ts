// The application menu as data (src/main/desktop/menu.ts): its items, their shortcuts and what each
// click calls. Shortcut choices (Ctrl/Cmd+N new, +O open, +I import, Alt+digit for screens) are
// common practice for desktop document apps; role names are those of Electron 45.5.0's
// MenuItemConstructorOptions.role (node_modules/electron/electron.d.ts, checked by tsc).
import type { MenuItemConstructorOptions } from 'electron';
import { describe, expect, it, vi } from 'vitest';
import { NAVIGATE_ROUTES } from '../src/shared/contract/channels.js';
import { buildMenuTemplate, SCREENS, type MenuActions } from '../src/main/desktop/menu.js';

vi.mock('electron', () => {
  throw new Error('the menu template is pure: it must not load electron');
});

type Item = MenuItemConstructorOptions;

function spyActions(): MenuActions & { calls: unknown[][] } {
  const calls: unknown[][] = [];
  const record = (name: string) => (...args: unknown[]) => void calls.push([name, ...args]);
  return {
    calls,
    newLog: record('newLog'), openLog: record('openLog'), openRecent: record('openRecent'), clearRecent: record('clearRecent'),
    showLogInFolder: record('showLogInFolder'), navigate: record('navigate'), about: record('about'), cautions: record('cautions'),
    userGuide: record('userGuide'),
  };
}

const submenu = (item: Item | undefined): Item[] => (item?.submenu ?? []) as Item[];
const plain = (label: string | undefined) => label?.replace(/&(?!&)/g, '').replace(/&&/g, '&');
const top = (template: Item[], label: string) => template.find((i) => plain(i.label) === label);
const item = (menu: Item[], label: string) => {
  const found = menu.find((i) => plain(i.label) === label);
  if (found === undefined) throw new Error(`no item ${label} in ${menu.map((i) => i.label ?? i.role ?? i.type).join(', ')}`);
  return found;
};
const click = (i: Item) => (i.click as unknown as () => void)();

/** Every item, at any depth. */
function walk(items: Item[]): Item[] {
  return items.flatMap((i) => [i, ...walk(submenu(i))]);
}

const RECENT = ['/logs/kettle ridge.sqlite', '/logs/R&D.sqlite'];

describe('the menu on Windows and Linux', () => {
  const actions = spyActions();
  const template = buildMenuTemplate({ platform: 'linux', recent: RECENT, devTools: false }, actions);

  it('has File, Edit, View and Help, with access keys', () => {
    expect(template.map((i) => i.label)).toEqual(['&File', '&Edit', '&View', '&Help']);
  });

  it('File: new, open, recent, show in folder, import CSV, quit, with their shortcuts', () => {
    const file = submenu(top(template, 'File'));
    expect(file.filter((i) => i.type !== 'separator').map((i) => i.label ?? i.role)).toEqual(
      ['New field log…', 'Open field log…', 'Open recent', 'Show field log in folder', 'Import CSV…', 'quit']);
    expect(item(file, 'New field log…').accelerator).toBe('CmdOrCtrl+N');
    expect(item(file, 'Open field log…').accelerator).toBe('CmdOrCtrl+O');
    expect(item(file, 'Import CSV…').accelerator).toBe('CmdOrCtrl+I');
    actions.calls.length = 0;
    click(item(file, 'New field log…'));
    click(item(file, 'Open field log…'));
    click(item(file, 'Show field log in folder'));
    click(item(file, 'Import CSV…'));
    expect(actions.calls).toEqual([['newLog'], ['openLog'], ['showLogInFolder'], ['navigate', '#/import']]);
  });

  it('Open recent lists the files most recent first, each opening its file, then "Clear recent"', () => {
    const recent = submenu(item(submenu(top(template, 'File')), 'Open recent'));
    // "&" in a label is an access key on Windows and Linux, so a literal one is written "&&".
    expect(recent.map((i) => i.label ?? i.type)).toEqual(['/logs/kettle ridge.sqlite', '/logs/R&&D.sqlite', 'separator', 'Clear recent']);
    actions.calls.length = 0;
    click(recent[1]);
    click(recent[0]);
    click(item(recent, 'Clear recent'));
    expect(actions.calls).toEqual([['openRecent', '/logs/R&D.sqlite'], ['openRecent', '/logs/kettle ridge.sqlite'], ['clearRecent']]);
    expect(item(recent, 'Clear recent').enabled).toBe(true);
  });

  it('an empty recent list says so, and "Clear recent" is disabled', () => {
    const empty = buildMenuTemplate({ platform: 'win32', recent: [], devTools: false }, spyActions());
    const recent = submenu(item(submenu(top(empty, 'File')), 'Open recent'));
    expect(recent[0]).toMatchObject({ label: 'No recent field logs', enabled: false });
    expect(item(recent, 'Clear recent').enabled).toBe(false);
  });

  it('View: the seven screens on Alt+1…7, then reload, zoom and full screen', () => {
    const view = submenu(top(template, 'View'));
    const screens = view.slice(0, 7);
    expect(screens.map((i) => i.accelerator)).toEqual(['Alt+1', 'Alt+2', 'Alt+3', 'Alt+4', 'Alt+5', 'Alt+6', 'Alt+7']);
    actions.calls.length = 0;
    for (const s of screens) click(s);
    expect(actions.calls).toEqual(['#/field', '#/decline', '#/log', '#/import', '#/reservoir', '#/recharge', '#/settings'].map((r) => ['navigate', r]));
    // Every route the menu sends is one the preload lets through.
    expect(SCREENS.map((s) => s.route)).toEqual([...NAVIGATE_ROUTES]);
    expect(view.filter((i) => i.role !== undefined).map((i) => i.role)).toEqual(['reload', 'zoomIn', 'zoomOut', 'resetZoom', 'togglefullscreen']);
  });

  it('developer tools only when asked (not in a packaged app)', () => {
    const dev = buildMenuTemplate({ platform: 'linux', recent: [], devTools: true }, spyActions());
    expect(walk(dev).some((i) => i.role === 'toggleDevTools')).toBe(true);
    expect(walk(template).some((i) => i.role === 'toggleDevTools')).toBe(false);
  });

  it('Edit has the standard roles (copy and paste in the page\'s fields)', () => {
    expect(submenu(top(template, 'Edit')).filter((i) => i.role !== undefined).map((i) => i.role)).toEqual(['undo', 'redo', 'cut', 'copy', 'paste', 'selectAll']);
  });

  it('Help: the user guide, the cautions, About', () => {
    const help = submenu(top(template, 'Help'));
    actions.calls.length = 0;
    click(item(help, 'Open the user guide'));
    click(item(help, 'Cautions'));
    click(item(help, 'About Tauwell'));
    expect(actions.calls).toEqual([['userGuide'], ['cautions'], ['about']]);
  });

  it('every item does something, and no two share a shortcut', () => {
    const all = walk(template);
    for (const i of all) {
      if (i.type === 'separator' || i.role !== undefined || i.submenu !== undefined || i.enabled === false) continue;
      expect(typeof i.click, String(i.label)).toBe('function');
    }
    const accelerators = all.map((i) => i.accelerator).filter((a) => a !== undefined);
    expect(new Set(accelerators).size).toBe(accelerators.length);
  });
});

describe('the menu on macOS', () => {
  const actions = spyActions();
  const template = buildMenuTemplate({ platform: 'darwin', recent: RECENT, devTools: false }, actions);

  it('starts with the application menu, which holds About and Quit; no access-key ampersands', () => {
    // macOS convention: the first menu is the app's, with About at the top and Quit at the bottom (common practice).
    expect(template.map((i) => i.label)).toEqual(['Tauwell', 'File', 'Edit', 'View', 'Help']);
    const appMenu = submenu(template[0]);
    expect(appMenu[0].label).toBe('About Tauwell');
    expect(appMenu.at(-1)?.role).toBe('quit');
    actions.calls.length = 0;
    click(appMenu[0]);
    expect(actions.calls).toEqual([['about']]);
    expect(walk(template).filter((i) => i.role === 'quit')).toHaveLength(1);
    expect(walk(template).filter((i) => i.label === 'About Tauwell')).toHaveLength(1);
    const recent = submenu(item(submenu(top(template, 'File')), 'Open recent'));
    expect(recent[1].label).toBe('/logs/R&D.sqlite');
  });

  it('keeps the same shortcuts', () => {
    const file = submenu(top(template, 'File'));
    expect(item(file, 'New field log…').accelerator).toBe('CmdOrCtrl+N');
    expect(item(file, 'Show field log in Finder').click).toBeTypeOf('function');
    expect(submenu(top(template, 'View')).slice(0, 7).map((i) => i.accelerator)).toEqual(SCREENS.map((s) => s.accelerator));
  });
});
