/** Reading input files, with the failures a user can fix reported as one-line InputErrors. */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../shared/errors.js';

/**
 * The text of `name` (resolved against `cwd`), without a leading byte-order mark.
 * Errors name the file as the user typed it.
 */
export function readTextFile(name: string, cwd: string): string {
  let text: string;
  try {
    text = readFileSync(resolve(cwd, name), 'utf8');
  } catch (e) {
    throw new InputError(`cannot read the file: ${describeFsError(e)}`, { file: name });
  }
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Parses a JSON file; a syntax error is reported at its line when the runtime says where. */
export function readJsonFile(name: string, cwd: string): unknown {
  const text = readTextFile(name, cwd);
  try {
    return JSON.parse(text);
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    const at = /position (\d+)/.exec(message);
    const line = at === null ? undefined : lineAt(text, Number(at[1]));
    throw new InputError(`not valid JSON: ${message}`, line === undefined ? { file: name } : { file: name, line });
  }
}

function lineAt(text: string, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}

function describeFsError(e: unknown): string {
  const code = typeof e === 'object' && e !== null && 'code' in e ? String((e as { code: unknown }).code) : '';
  switch (code) {
    case 'ENOENT': return 'no such file';
    case 'EACCES': case 'EPERM': return 'permission denied';
    case 'EISDIR': return 'it is a folder, not a file';
    default: return e instanceof Error ? e.message : String(e);
  }
}
