/**
 * What the menu's items do (menu.ts builds the menu; this module gives it its actions): the native
 * dialogs for New…/Open…, the recent list in userData, the About and Cautions boxes, the user guide
 * and "show in folder" through the OS (local files only: nothing here opens a URL), and the screen
 * requests sent to the page on NAVIGATE_CHANNEL.
 *
 *   LOG_FILTERS, withLogExtension(file), aboutDetail({ version, engine, sqlite, file })
 *   createDesktopShell(options): DesktopShell { actions, openAtStart(), openLogFile(file), showNotes(notes), recent() }
 */
import { dialog, Menu, shell, type BrowserWindow, type MessageBoxOptions } from 'electron';
import { existsSync } from 'node:fs';
import { extname, join, resolve } from 'node:path';
import { CAUTIONS } from '../../shared/cautions.js';
import { NAVIGATE_CHANNEL } from '../../shared/contract/channels.js';
import { FIELD_LOG_FILE, openFailureDetail } from './field-log.js';
import type { LogSwitcher } from './log-switch.js';
import { buildMenuTemplate, type MenuActions } from './menu.js';
import { cleared, droppedNote, loadRecent, saveRecent, withOpened, withoutFile, type RecentState } from './recent.js';

export const LOG_FILTERS = Object.freeze([{ name: 'SQLite field log', extensions: ['sqlite', 'db'] }]);
const LOG_EXTENSIONS = new Set(LOG_FILTERS[0].extensions.map((e) => `.${e}`));

/** Linux save dialogs add no extension of their own; a field log is always named as one. */
export function withLogExtension(file: string): string {
  return LOG_EXTENSIONS.has(extname(file).toLowerCase()) ? file : `${file}.sqlite`;
}

export interface Engine {
  electron?: string;
  chrome?: string;
  node: string;
}

export function aboutDetail(about: { version: string; engine: Engine; sqlite: string | undefined; file: string | undefined }): string {
  const { electron, chrome, node } = about.engine;
  return [
    `Version ${about.version}`,
    `Engine: Electron ${electron ?? '?'} (Chromium ${chrome ?? '?'}, Node ${node}), SQLite ${about.sqlite ?? '?'}`,
    `Field log: ${about.file ?? 'none open'}`,
  ].join('\n');
}

export interface ShellOptions {
  userData: string;
  /** The app's folder: README.md (the user guide) is there. */
  appRoot: string;
  version: string;
  engine: Engine;
  platform: string;
  devTools: boolean;
  switcher: LogSwitcher;
  window(): BrowserWindow | undefined;
  documentsFolder(): string;
  /** Problems nobody needs to click away (a recent list that could not be saved); default stderr. */
  log?: (text: string) => void;
}

export interface DesktopShell {
  readonly actions: MenuActions;
  /**
   * Opens the log of the last session, or the default one in userData (built from the demo when
   * new). Returns notes for the user; throws when not even the default log opens.
   */
  openAtStart(): string[];
  /** Switches to `file`; on failure shows why and stays on the open log. */
  openLogFile(file: string): boolean;
  showNotes(notes: readonly string[]): void;
  recent(): RecentState;
}

export function createDesktopShell(options: ShellOptions): DesktopShell {
  const { switcher } = options;
  const log = options.log ?? ((text: string) => void process.stderr.write(text));
  const defaultLog = join(options.userData, FIELD_LOG_FILE);
  let recent: RecentState = { files: [] };

  const messageBox = (box: MessageBoxOptions) => {
    const win = options.window();
    return win === undefined ? dialog.showMessageBox(box) : dialog.showMessageBox(win, box);
  };

  const refreshMenu = (): void => {
    const template = buildMenuTemplate({ platform: options.platform, recent: recent.files, devTools: options.devTools }, actions);
    Menu.setApplicationMenu(Menu.buildFromTemplate(template));
  };

  const keep = (next: RecentState): void => {
    recent = next;
    try {
      saveRecent(options.userData, recent);
    } catch (e) {
      log(`tauwell: could not save the recent list: ${e instanceof Error ? e.message : String(e)}\n`);
    }
    refreshMenu();
  };

  const openLogFile = (file: string): boolean => {
    try {
      switcher.open(file);
    } catch (e) {
      dialog.showErrorBox('Tauwell cannot open that field log', openFailureDetail(e));
      return false;
    }
    keep(withOpened(recent, file));
    return true;
  };

  const newLog = async (): Promise<void> => {
    const win = options.window();
    const box = {
      title: 'New field log',
      defaultPath: join(options.documentsFolder(), 'field-log.sqlite'),
      buttonLabel: 'Create',
      filters: [...LOG_FILTERS],
      properties: ['createDirectory' as const],
    };
    const chosen = await (win === undefined ? dialog.showSaveDialog(box) : dialog.showSaveDialog(win, box));
    if (chosen.canceled || chosen.filePath === undefined || chosen.filePath === '') return;
    const file = withLogExtension(chosen.filePath);
    if (existsSync(file)) {
      // A new log never overwrites a file: that file may be years of readings.
      const answer = await messageBox({
        type: 'question', title: 'New field log', buttons: ['Open it', 'Cancel'], defaultId: 0, cancelId: 1,
        message: `${file} already exists.`, detail: 'Tauwell does not overwrite a field log. Open the existing file instead?',
      });
      if (answer.response !== 0) return;
    }
    openLogFile(file);
  };

  const openLog = async (): Promise<void> => {
    const win = options.window();
    const box = {
      title: 'Open field log',
      filters: [...LOG_FILTERS, { name: 'All files', extensions: ['*'] }],
      properties: ['openFile' as const],
    };
    const chosen = await (win === undefined ? dialog.showOpenDialog(box) : dialog.showOpenDialog(win, box));
    const [file] = chosen.filePaths;
    if (chosen.canceled || file === undefined) return;
    openLogFile(file);
  };

  const openRecent = (file: string): void => {
    if (existsSync(file)) {
      openLogFile(file);
      return;
    }
    keep(withoutFile(recent, file));
    void messageBox({ type: 'info', title: 'Open recent', message: droppedNote([file]) ?? '' });
  };

  const userGuide = async (): Promise<void> => {
    const guide = join(options.appRoot, 'README.md');
    if (!existsSync(guide)) {
      await messageBox({ type: 'info', title: 'User guide', message: `The user guide is not installed (${guide} is missing).` });
      return;
    }
    const problem = await shell.openPath(guide);
    if (problem !== '') dialog.showErrorBox('Tauwell cannot open the user guide', `${guide}: ${problem}`);
  };

  const sqliteVersion = (): string | undefined => {
    try {
      return (switcher.active?.fdb.db.prepare('SELECT sqlite_version() AS v').get() as { v: string } | undefined)?.v;
    } catch {
      return undefined;
    }
  };

  // Menu clicks cannot await; a failure is logged rather than lost.
  const run = (what: string, task: () => Promise<unknown>): void => {
    task().catch((e: unknown) => log(`tauwell: ${what} failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`));
  };

  const actions: MenuActions = {
    newLog: () => run('New field log', newLog),
    openLog: () => run('Open field log', openLog),
    openRecent,
    clearRecent: () => keep(cleared(recent)),
    showLogInFolder: () => {
      const file = switcher.active?.file;
      if (file !== undefined) shell.showItemInFolder(resolve(file));
    },
    navigate: (route) => options.window()?.webContents.send(NAVIGATE_CHANNEL, route),
    about: () => run('About', () => messageBox({
      type: 'info', title: 'About Tauwell', message: 'Tauwell',
      detail: aboutDetail({ version: options.version, engine: options.engine, sqlite: sqliteVersion(), file: switcher.active?.file }),
    })),
    cautions: () => run('Cautions', () => messageBox({
      type: 'warning', title: 'Cautions', message: 'Before you rely on a forecast', detail: CAUTIONS.map((c) => `• ${c}`).join('\n\n'),
    })),
    userGuide: () => run('User guide', userGuide),
  };

  return {
    actions,
    openAtStart() {
      const loaded = loadRecent(options.userData);
      recent = loaded.state;
      const notes: string[] = [];
      if (loaded.problem !== undefined) log(`tauwell: ${loaded.problem}\n`);
      const gone = droppedNote(loaded.dropped);
      if (gone !== undefined) notes.push(gone);
      const last = recent.last;
      if (last !== undefined && resolve(last) !== resolve(defaultLog)) {
        try {
          switcher.open(last);
          keep(withOpened(recent, last));
          return notes;
        } catch (e) {
          notes.push(`Tauwell could not open the last field log, ${last}:\n${openFailureDetail(e)}\n\nThe default field log is open instead.`);
        }
      }
      switcher.open(defaultLog);
      keep(withOpened(recent, defaultLog));
      return notes;
    },
    openLogFile,
    showNotes(notes) {
      if (notes.length > 0) run('Notes', () => messageBox({ type: 'info', title: 'Tauwell', message: 'Field logs', detail: notes.join('\n\n') }));
    },
    recent: () => recent,
  };
}
