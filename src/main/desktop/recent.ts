/**
 * The recent field logs (File → Open recent) and the one to reopen at the next start, kept as JSON
 * in userData. The list holds at most MAX_RECENT absolute paths, most recent first. `last` is kept
 * apart from the list so that "Clear recent" does not change which log the next start opens.
 * Files that have gone are dropped when the list is read, and the caller is told which (a note for
 * the user), so the menu never offers a file that is not there.
 *
 *   RECENT_FILE, MAX_RECENT, EMPTY_RECENT, interface RecentState { last?, files }
 *   withOpened(state, file), withoutFile(state, file), cleared(state)          pure
 *   dropMissing(state, exists): { state, dropped }, droppedNote(dropped)       pure
 *   parseRecent(text): { state, problem? }                                     pure
 *   loadRecent(folder): { state, dropped, problem? }, saveRecent(folder, state)
 */
import { existsSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { isAbsolute, join, resolve } from 'node:path';

export const RECENT_FILE = 'recent-field-logs.json';
export const MAX_RECENT = 10;

export interface RecentState {
  /** The log open when the app last switched logs or started: reopened at the next start. */
  readonly last?: string;
  /** Most recent first, no duplicates, at most MAX_RECENT. */
  readonly files: readonly string[];
}

export const EMPTY_RECENT: RecentState = Object.freeze({ files: Object.freeze([]) as readonly string[] });

/**
 * Paths are compared after `resolve`, exactly: a case-insensitive file system may then list one
 * file twice under two spellings, which is harmless, where folding case could merge two files.
 */
export function withOpened(state: RecentState, file: string): RecentState {
  const path = resolve(file);
  return { last: path, files: [path, ...state.files.filter((f) => f !== path)].slice(0, MAX_RECENT) };
}

export function withoutFile(state: RecentState, file: string): RecentState {
  const path = resolve(file);
  const files = state.files.filter((f) => f !== path);
  return state.last === path ? { files } : { last: state.last, files };
}

export function cleared(state: RecentState): RecentState {
  return state.last === undefined ? { files: [] } : { last: state.last, files: [] };
}

export function dropMissing(state: RecentState, exists: (file: string) => boolean): { state: RecentState; dropped: string[] } {
  const dropped = [...new Set([...(state.last === undefined ? [] : [state.last]), ...state.files].filter((f) => !exists(f)))];
  const gone = new Set(dropped);
  const files = state.files.filter((f) => !gone.has(f));
  return { state: state.last === undefined || gone.has(state.last) ? { files } : { last: state.last, files }, dropped };
}

/** The user's note for files dropped from the list, or undefined when none was. */
export function droppedNote(dropped: readonly string[]): string | undefined {
  if (dropped.length === 0) return undefined;
  const which = dropped.length === 1 ? 'this field log, which no longer exists' : `these ${dropped.length} field logs, which no longer exist`;
  return `Removed from the recent list ${which}:\n${dropped.join('\n')}`;
}

/** Reads the JSON leniently: a damaged file costs the list, never the start of the app. */
export function parseRecent(text: string): { state: RecentState; problem?: string } {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return { state: EMPTY_RECENT, problem: 'the recent list is not valid JSON; starting a new one' };
  }
  if (typeof value !== 'object' || value === null || !Array.isArray((value as { files?: unknown }).files)) {
    return { state: EMPTY_RECENT, problem: 'the recent list has no "files" list; starting a new one' };
  }
  const isPath = (f: unknown): f is string => typeof f === 'string' && isAbsolute(f);
  const raw = value as { last?: unknown; files: unknown[] };
  const files = [...new Set(raw.files.filter(isPath).map((f) => resolve(f)))].slice(0, MAX_RECENT);
  return { state: isPath(raw.last) ? { last: resolve(raw.last), files } : { files } };
}

const isFile = (file: string): boolean => existsSync(file) && statSync(file).isFile();

export function loadRecent(folder: string): { state: RecentState; dropped: string[]; problem?: string } {
  const path = join(folder, RECENT_FILE);
  if (!existsSync(path)) return { state: EMPTY_RECENT, dropped: [] };
  const parsed = parseRecent(readFileSync(path, 'utf8'));
  const { state, dropped } = dropMissing(parsed.state, isFile);
  return parsed.problem === undefined ? { state, dropped } : { state, dropped, problem: parsed.problem };
}

/** Written beside and renamed into place, so a crash mid-write leaves the old list whole. */
export function saveRecent(folder: string, state: RecentState): void {
  const path = join(folder, RECENT_FILE);
  const body = { version: 1, ...(state.last === undefined ? {} : { last: state.last }), files: state.files };
  writeFileSync(`${path}.tmp`, `${JSON.stringify(body, null, 2)}\n`);
  renameSync(`${path}.tmp`, path);
}
