/**
 * What every screen is handed: the typed client, the settings and their Display, navigation, and a
 * way to tell the user something. Screens talk to the back end only through `client` (the contract
 * in src/shared/contract), never by URL or IPC of their own.
 */
import type { TauwellClient } from '../../shared/contract/client.js';
import type { SettingsJson } from '../../shared/contract/settings.js';
import type { Wire } from '../../shared/contract/channels.js';
import type { Display } from './display.js';

export interface AppContext {
  readonly client: TauwellClient;
  /** The settings as last loaded; call reloadSettings() after changing them. */
  settings(): Wire<SettingsJson>;
  /**
   * How to show numbers and instants: the settings' units, and their zone — or, when the settings
   * say "each field's own", the zone given here (the field on screen).
   */
  display(fieldTimeZone?: string): Display;
  reloadSettings(): Promise<void>;
  /** Goes to a route such as `#/well/Kettle Ridge/KR-3` (see router.ts). */
  navigate(route: string): void;
  /** A short message in the status strip ('error' is announced assertively). */
  tell(kind: 'info' | 'ok' | 'warn' | 'error', text: string): void;
}

export interface Screen {
  /** Shown in the page title and the heading. */
  readonly title: string;
  /** Draws the screen into `root` (already empty). May be async; a rejection is shown as an error. */
  mount(root: HTMLElement, params: readonly string[], app: AppContext): void | Promise<void>;
  /** Called before another screen mounts: stop timers, destroy charts. */
  unmount?(): void;
}
