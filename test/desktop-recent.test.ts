// The recent field logs (src/main/desktop/recent.ts): at most 10, most recent first, no
// duplicates, missing files dropped with a note, kept as JSON in userData. Ten entries and "most
// recent first" are common practice for a File → Open Recent list.
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  cleared, droppedNote, dropMissing, EMPTY_RECENT, loadRecent, MAX_RECENT, parseRecent, RECENT_FILE, saveRecent, withOpened, withoutFile,
} from '../src/main/desktop/recent.js';
import { tempDir } from './db-helpers.js';

const paths = (n: number) => Array.from({ length: n }, (_, i) => `/logs/log-${i + 1}.sqlite`);

describe('the list (pure)', () => {
  it('puts the opened file first, without duplicates, and remembers it as the last', () => {
    let s = EMPTY_RECENT;
    for (const f of ['/a.sqlite', '/b.sqlite', '/c.sqlite', '/a.sqlite']) s = withOpened(s, f);
    expect(s).toEqual({ last: '/a.sqlite', files: ['/a.sqlite', '/c.sqlite', '/b.sqlite'] });
    // "/x/../a.sqlite" is "/a.sqlite": one file, one entry.
    expect(withOpened(s, '/x/../b.sqlite').files).toEqual(['/b.sqlite', '/a.sqlite', '/c.sqlite']);
  });

  it('keeps at most 10, dropping the oldest', () => {
    expect(MAX_RECENT).toBe(10);
    let s = EMPTY_RECENT;
    for (const f of paths(12)) s = withOpened(s, f);
    // Opened 1…12 in turn: the newest ten are 12 down to 3.
    expect(s.files).toEqual(paths(12).reverse().slice(0, 10));
    expect(s.files).toHaveLength(10);
  });

  it('"Clear recent" empties the list but keeps the log the next start opens', () => {
    const s = withOpened(withOpened(EMPTY_RECENT, '/a.sqlite'), '/b.sqlite');
    expect(cleared(s)).toEqual({ last: '/b.sqlite', files: [] });
    expect(withoutFile(s, '/b.sqlite')).toEqual({ files: ['/a.sqlite'] });
    expect(withoutFile(s, '/a.sqlite')).toEqual({ last: '/b.sqlite', files: ['/b.sqlite'] });
  });

  it('drops files that are gone, and says which', () => {
    const s = { last: '/gone.sqlite', files: ['/gone.sqlite', '/here.sqlite', '/also-gone.sqlite'] };
    const { state, dropped } = dropMissing(s, (f) => f === '/here.sqlite');
    expect(state).toEqual({ files: ['/here.sqlite'] });
    expect(dropped).toEqual(['/gone.sqlite', '/also-gone.sqlite']);
    expect(droppedNote(dropped)).toBe('Removed from the recent list these 2 field logs, which no longer exist:\n/gone.sqlite\n/also-gone.sqlite');
    expect(droppedNote(['/x.sqlite'])).toBe('Removed from the recent list this field log, which no longer exists:\n/x.sqlite');
    expect(droppedNote([])).toBeUndefined();
  });

  it('reads a damaged or hand-edited file leniently', () => {
    expect(parseRecent('{not json')).toMatchObject({ state: { files: [] }, problem: expect.stringMatching(/not valid JSON/) });
    expect(parseRecent('[]')).toMatchObject({ state: { files: [] }, problem: expect.stringMatching(/no "files"/) });
    const odd = JSON.stringify({ last: 'relative.sqlite', files: ['/a.sqlite', 42, 'relative.sqlite', '/a.sqlite', ...paths(12)] });
    const { state, problem } = parseRecent(odd);
    expect(problem).toBeUndefined();
    expect(state.last).toBeUndefined();
    expect(state.files).toEqual(['/a.sqlite', ...paths(9)]);
  });
});

describe('the file in userData', () => {
  it('round-trips through JSON, and drops what has gone when read', () => {
    const folder = tempDir();
    const logs = join(folder, 'logs');
    mkdirSync(logs);
    const [a, b, c] = ['a.sqlite', 'b.sqlite', 'c.sqlite'].map((n) => join(logs, n));
    for (const f of [a, b, c]) writeFileSync(f, '');
    let s = EMPTY_RECENT;
    for (const f of [a, b, c]) s = withOpened(s, f);
    saveRecent(folder, s);
    expect(JSON.parse(readFileSync(join(folder, RECENT_FILE), 'utf8'))).toEqual({ version: 1, last: c, files: [c, b, a] });
    expect(existsSync(join(folder, `${RECENT_FILE}.tmp`))).toBe(false);
    expect(loadRecent(folder)).toEqual({ state: { last: c, files: [c, b, a] }, dropped: [] });

    rmSync(c);
    expect(loadRecent(folder)).toEqual({ state: { files: [b, a] }, dropped: [c] });
  });

  it('is empty when there is no file, and survives a damaged one', () => {
    const folder = tempDir();
    expect(loadRecent(folder)).toEqual({ state: { files: [] }, dropped: [] });
    writeFileSync(join(folder, RECENT_FILE), '\u0000garbage');
    expect(loadRecent(folder)).toMatchObject({ state: { files: [] }, dropped: [], problem: expect.any(String) });
  });

  it('does not count a folder as a field log', () => {
    const folder = tempDir();
    const dir = join(folder, 'a-folder.sqlite');
    mkdirSync(dir);
    saveRecent(folder, withOpened(EMPTY_RECENT, dir));
    expect(loadRecent(folder)).toEqual({ state: { files: [] }, dropped: [dir] });
  });
});
