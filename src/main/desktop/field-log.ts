/**
 * The desktop app's field log: by default `tauwell.sqlite` in Electron's userData folder, built from
 * the INVENTED demo field the first time, so a new user sees data at once; File → New…/Open… open
 * any other file (log-switch.ts).
 *
 * better-sqlite3 is a native addon compiled for one ABI. The Node build in node_modules serves the
 * tests and the command line; Electron needs a build of its own, kept apart at
 * native/electron/better_sqlite3.node (DEVELOPERS.md says how to make it) and handed to
 * openDatabase as `nativeBinding`, so neither build overwrites the other.
 *
 *   FIELD_LOG_FILE, ELECTRON_ADDON
 *   electronAddonPath(appRoot): string | undefined
 *   openDesktopFieldLog(folder, { nativeBinding? }): { fdb, file, builtDemo }
 *   openFieldLogFile(file, { nativeBinding?, demoWhenNew? }): { fdb, file, builtDemo }
 *   openFailureDetail(error): string
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../../shared/errors.js';
import { openDatabase, type FieldDb } from '../db/database.js';
import { createServices } from '../services/index.js';

export const FIELD_LOG_FILE = 'tauwell.sqlite';
/** Below the app's root folder. */
export const ELECTRON_ADDON = join('native', 'electron', 'better_sqlite3.node');

/** The Electron build of better-sqlite3, or undefined when it was not made. */
export function electronAddonPath(appRoot: string): string | undefined {
  const path = join(appRoot, ELECTRON_ADDON);
  return existsSync(path) ? path : undefined;
}

export interface DesktopFieldLog {
  fdb: FieldDb;
  file: string;
  /** True when the file was new and the demo field was built into it. */
  builtDemo: boolean;
}

/** The default field log in `folder` (userData), built from the demo when it is new. */
export function openDesktopFieldLog(folder: string, options: { nativeBinding?: string } = {}): DesktopFieldLog {
  return openFieldLogFile(join(folder, FIELD_LOG_FILE), { ...options, demoWhenNew: true });
}

/**
 * Any field log file (File → New…/Open…). A new file is an empty, migrated log unless
 * `demoWhenNew`; an existing one is upgraded by openDatabase, which copies it aside first.
 */
export function openFieldLogFile(file: string, options: { nativeBinding?: string; demoWhenNew?: boolean } = {}): DesktopFieldLog {
  const isNew = !existsSync(file);
  const fdb = openDatabase(file, options.nativeBinding !== undefined ? { nativeBinding: options.nativeBinding } : {});
  if (!isNew || options.demoWhenNew !== true) return { fdb, file, builtDemo: false };
  try {
    createServices(fdb).buildDemo();
  } catch (e) {
    // Leave no half-made log behind: the next launch should try the demo again.
    fdb.close();
    for (const suffix of ['', '-wal', '-shm']) rmSync(file + suffix, { force: true });
    throw e;
  }
  return { fdb, file, builtDemo: true };
}

/**
 * What the user reads when a log does not open. An InputError names the file and what is wrong
 * with it; anything else happened below the file, most likely an addon built for Node, not Electron.
 */
export function openFailureDetail(e: unknown): string {
  if (e instanceof InputError) return e.message;
  return `${e instanceof Error ? e.message : String(e)}\n\nThe SQLite addon may be the Node build: make the Electron build at ${ELECTRON_ADDON} with \`npm run build:electron-sqlite\` (DEVELOPERS.md).`;
}
