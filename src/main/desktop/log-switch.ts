/**
 * Which field log the desktop app has open, and switching to another (File → New…/Open…/recent).
 * A switch opens the new log first, so a file that cannot be opened leaves the user on the old one;
 * then it removes the IPC handlers (no message can reach the old log any more), closes the old
 * log, registers the handlers over the new log's services and reloads the window, so the page
 * forgets what it showed from the old log.
 *
 * The Electron and SQLite parts come in as functions, so the order is testable on its own.
 *
 *   createLogSwitcher(deps): LogSwitcher { active, open(file), close() }
 */
import { closeServices } from '../services/index.js';
import { resolve } from 'node:path';
import type { TauwellServices } from '../../shared/contract/index.js';
import type { FieldDb } from '../db/database.js';

export interface OpenedLog {
  fdb: FieldDb;
  file: string;
  /** True when the file was new and the demo field was built into it. */
  builtDemo: boolean;
}

export interface ActiveLog extends OpenedLog {
  services: TauwellServices;
}

export interface LogSwitchDeps {
  /** Opens (creating or migrating) the log; throws when it cannot. */
  open(file: string): OpenedLog;
  services(fdb: FieldDb): TauwellServices;
  /** Registers IPC over the services; returns the function that removes the handlers (ipc.ts). */
  register(services: TauwellServices): () => void;
  /** Reloads the window, if there is one. */
  reload(): void;
}

export interface LogSwitcher {
  readonly active: ActiveLog | undefined;
  /** Switches to `file` (nothing happens when it is the open log); throws, changing nothing, when it cannot be opened. */
  open(file: string): ActiveLog;
  /** At quit: handlers removed, log closed. */
  close(): void;
}

export function createLogSwitcher(deps: LogSwitchDeps): LogSwitcher {
  let active: ActiveLog | undefined;
  let unregister: (() => void) | undefined;

  const retire = (): void => {
    unregister?.();
    unregister = undefined;
    if (active !== undefined) {
      // A running import job has a connection of its own: it is cancelled and closed in the background.
      void closeServices(active.services).catch(() => undefined);
      active.fdb.close();
    }
    active = undefined;
  };

  return {
    get active() {
      return active;
    },
    open(file) {
      if (active !== undefined && resolve(active.file) === resolve(file)) return active;
      const opened = deps.open(file);
      let services: TauwellServices;
      try {
        services = deps.services(opened.fdb);
      } catch (e) {
        opened.fdb.close();
        throw e;
      }
      const switching = active !== undefined;
      retire();
      unregister = deps.register(services);
      active = { ...opened, services };
      // At start there is no page yet; after a switch the page still shows the old log.
      if (switching) deps.reload();
      return active;
    },
    close: retire,
  };
}
