// The layering rule of DEVELOPERS.md is executable: ESLint fails the build when a lower layer imports a
// higher one. These cases prove the rule bites, so it cannot silently drift.
import { describe, expect, it } from 'vitest';
import { ESLint } from 'eslint';

const eslint = new ESLint({ cwd: process.cwd() });

async function problems(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result.messages.map((m) => `${m.ruleId}: ${m.message}`);
}

describe('layering lint rule', () => {
  it.each([
    ['src/shared/x.ts', "import { readFileSync } from 'node:fs';\nexport const a = readFileSync;\n"],
    ['src/shared/x.ts', "import { readFileSync } from 'fs';\nexport const a = readFileSync;\n"],
    ['src/shared/x.ts', "import { app } from 'electron';\nexport const a = app;\n"],
    ['src/shared/x.ts', "import Database from 'better-sqlite3';\nexport const a = Database;\n"],
    ['src/shared/x.ts', "import { a } from '../main/cli/index.js';\nexport const b = a;\n"],
    ['src/shared/x.ts', "import { a } from '../renderer/app.js';\nexport const b = a;\n"],
    ['src/shared/x.ts', 'export const a = document.title;\n'],
    ['src/shared/x.ts', 'export const a = process.env;\n'],
    ['src/renderer/x.ts', "import { a } from '../main/services/index.js';\nexport const b = a;\n"],
    ['src/renderer/x.ts', "import { ipcRenderer } from 'electron';\nexport const a = ipcRenderer;\n"],
    ['src/renderer/x.ts', "import { join } from 'node:path';\nexport const a = join;\n"],
    ['src/main/x.ts', "import { a } from '../renderer/app.js';\nexport const b = a;\n"],
  ])('%s rejects: %s', async (file, code) => {
    const found = await problems(file, code);
    expect(found.some((m) => m.startsWith('no-restricted-imports') || m.startsWith('no-restricted-globals'))).toBe(true);
  });

  it.each([
    ['src/shared/x.ts', "import { InputError } from './errors.js';\nexport const a = InputError;\n"],
    ['src/renderer/x.ts', "import { InputError } from '../shared/errors.js';\nexport const a = document.title + String(InputError);\n"],
    ['src/main/x.ts', "import { readFileSync } from 'node:fs';\nimport { InputError } from '../shared/errors.js';\nexport const a = [readFileSync, InputError];\n"],
  ])('%s allows: %s', async (file, code) => {
    expect(await problems(file, code)).toEqual([]);
  });
});
