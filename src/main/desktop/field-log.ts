/**
 * The desktop app's field log: `tauwell.sqlite` in Electron's userData folder, built from the
 * INVENTED demo field the first time, so a new user sees data at once.
 *
 * better-sqlite3 is a native addon compiled for one ABI. The Node build in node_modules serves the
 * tests and the command line; Electron needs a build of its own, kept apart at
 * native/electron/better_sqlite3.node (DEVELOPERS.md says how to make it) and handed to
 * openDatabase as `nativeBinding`, so neither build overwrites the other.
 *
 *   FIELD_LOG_FILE, ELECTRON_ADDON
 *   electronAddonPath(appRoot): string | undefined
 *   openDesktopFieldLog(folder, { nativeBinding? }): { fdb, file, builtDemo }
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
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

export function openDesktopFieldLog(folder: string, options: { nativeBinding?: string } = {}): DesktopFieldLog {
  const file = join(folder, FIELD_LOG_FILE);
  const isNew = !existsSync(file);
  const fdb = openDatabase(file, options.nativeBinding !== undefined ? { nativeBinding: options.nativeBinding } : {});
  if (!isNew) return { fdb, file, builtDemo: false };
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
