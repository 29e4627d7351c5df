/**
 * The application menu as data: a pure function of the menu's state and the actions its items
 * call, so the whole menu (items, shortcuts, what each click does) is testable without Electron.
 * index.ts hands the template to `Menu.buildFromTemplate` and rebuilds it when the state changes.
 *
 * Screens are reached by a message to the page (NAVIGATE_CHANNEL), never by running script in it.
 * Standard behaviour (edit, reload, zoom, full screen, quit) uses Electron's roles, which carry the
 * platform's own shortcuts.
 *
 *   SCREENS: { label, route, accelerator }[]
 *   buildMenuTemplate(state: MenuState, actions: MenuActions): MenuItemConstructorOptions[]
 */
import type { MenuItemConstructorOptions } from 'electron';
import type { NavigateRoute } from '../../shared/contract/channels.js';

export interface MenuState {
  /** process.platform: macOS gets an application menu of its own. */
  platform: string;
  /** The recent field logs, most recent first (recent.ts). */
  recent: readonly string[];
  /** Developer tools in the View menu: only when the app is not packaged. */
  devTools: boolean;
}

export interface MenuActions {
  newLog(): void;
  openLog(): void;
  openRecent(file: string): void;
  clearRecent(): void;
  showLogInFolder(): void;
  navigate(route: NavigateRoute): void;
  about(): void;
  cautions(): void;
  userGuide(): void;
}

/** The screens in the View menu, in the order of the renderer's navigation, Alt+1…7. */
export const SCREENS: readonly { label: string; route: NavigateRoute; accelerator: string }[] = Object.freeze([
  { label: 'Field overview', route: '#/field', accelerator: 'Alt+1' },
  { label: 'Well decline', route: '#/decline', accelerator: 'Alt+2' },
  { label: 'Weekly log', route: '#/log', accelerator: 'Alt+3' },
  { label: 'Import', route: '#/import', accelerator: 'Alt+4' },
  { label: 'Reservoir parameters', route: '#/reservoir', accelerator: 'Alt+5' },
  { label: 'Recharge', route: '#/recharge', accelerator: 'Alt+6' },
  { label: 'Settings', route: '#/settings', accelerator: 'Alt+7' },
]);

/**
 * On Windows and Linux `&` in a label marks the access key (Alt+F opens File) and `&&` shows one
 * ampersand; macOS has no access keys, so its labels are left as they are.
 */
function accessKey(mac: boolean, label: string): string {
  return mac ? label.replace('&', '') : label;
}
function literalLabel(mac: boolean, text: string): string {
  return mac ? text : text.replace(/&/g, '&&');
}

function recentSubmenu(state: MenuState, actions: MenuActions, mac: boolean): MenuItemConstructorOptions[] {
  const files: MenuItemConstructorOptions[] = state.recent.length === 0
    ? [{ label: 'No recent field logs', enabled: false }]
    : state.recent.map((file) => ({ label: literalLabel(mac, file), click: () => actions.openRecent(file) }));
  return [...files, { type: 'separator' }, { label: 'Clear recent', enabled: state.recent.length > 0, click: () => actions.clearRecent() }];
}

export function buildMenuTemplate(state: MenuState, actions: MenuActions): MenuItemConstructorOptions[] {
  const mac = state.platform === 'darwin';
  const about: MenuItemConstructorOptions = { label: 'About Tauwell', click: () => actions.about() };

  const file: MenuItemConstructorOptions = {
    label: accessKey(mac, '&File'),
    submenu: [
      { label: 'New field log…', accelerator: 'CmdOrCtrl+N', click: () => actions.newLog() },
      { label: 'Open field log…', accelerator: 'CmdOrCtrl+O', click: () => actions.openLog() },
      { label: 'Open recent', submenu: recentSubmenu(state, actions, mac) },
      { type: 'separator' },
      { label: mac ? 'Show field log in Finder' : 'Show field log in folder', click: () => actions.showLogInFolder() },
      { type: 'separator' },
      { label: 'Import CSV…', accelerator: 'CmdOrCtrl+I', click: () => actions.navigate('#/import') },
      // On macOS Quit lives in the application menu.
      ...(mac ? [] : [{ type: 'separator' } as const, { role: 'quit' } as const]),
    ],
  };

  const edit: MenuItemConstructorOptions = {
    // Without these roles macOS has no copy and paste in the page's text fields.
    label: accessKey(mac, '&Edit'),
    submenu: [{ role: 'undo' }, { role: 'redo' }, { type: 'separator' }, { role: 'cut' }, { role: 'copy' }, { role: 'paste' }, { role: 'selectAll' }],
  };

  const view: MenuItemConstructorOptions = {
    label: accessKey(mac, '&View'),
    submenu: [
      ...SCREENS.map((s): MenuItemConstructorOptions => ({ label: s.label, accelerator: s.accelerator, click: () => actions.navigate(s.route) })),
      { type: 'separator' },
      { role: 'reload' },
      ...(state.devTools ? [{ role: 'toggleDevTools' } as const] : []),
      { type: 'separator' },
      { role: 'zoomIn' },
      { role: 'zoomOut' },
      { role: 'resetZoom' },
      { type: 'separator' },
      { role: 'togglefullscreen' },
    ],
  };

  const help: MenuItemConstructorOptions = {
    role: 'help',
    label: accessKey(mac, '&Help'),
    submenu: [
      { label: 'Open the user guide', click: () => actions.userGuide() },
      { label: 'Cautions', click: () => actions.cautions() },
      ...(mac ? [] : [{ type: 'separator' } as const, about]),
    ],
  };

  const appMenu: MenuItemConstructorOptions = {
    label: 'Tauwell',
    submenu: [about, { type: 'separator' }, { role: 'hide' }, { role: 'hideOthers' }, { role: 'unhide' }, { type: 'separator' }, { role: 'quit' }],
  };

  return mac ? [appMenu, file, edit, view, help] : [file, edit, view, help];
}
