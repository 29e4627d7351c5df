// `npm start` decides between the desktop window and the browser fallback by looking for the
// Electron binary on disk, the way node_modules/electron/index.js does (path.txt names the
// executable below dist/), without loading the electron package: loading it downloads the binary.
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { tempDir } from './db-helpers.js';

vi.mock('electron', () => {
  throw new Error('the launcher must not import electron');
});

const { detectElectron, PROJECT_ROOT } = await import('../src/main/desktop/launcher.mjs');

/** A project folder with node_modules/electron as its install script leaves it. */
function fakeProject(pathTxt: string | undefined, binary?: string): string {
  const root = tempDir();
  const pkg = join(root, 'node_modules', 'electron');
  mkdirSync(join(pkg, 'dist'), { recursive: true });
  if (pathTxt !== undefined) writeFileSync(join(pkg, 'path.txt'), pathTxt);
  if (binary !== undefined) {
    writeFileSync(join(pkg, 'dist', binary), '#!/bin/sh\n');
    chmodSync(join(pkg, 'dist', binary), 0o755);
  }
  return root;
}

describe('detectElectron', () => {
  it('says "not installed" on this machine, where the binary was never downloaded', () => {
    expect(PROJECT_ROOT).toBe(process.cwd());
    // This machine's node_modules/electron has no path.txt and no dist/ (checked when this test was written).
    expect(existsSync(join(PROJECT_ROOT, 'node_modules', 'electron', 'dist'))).toBe(false);
    const found = detectElectron();
    expect(found.installed).toBe(false);
    if (!found.installed) expect(found.reason).toMatch(/path\.txt is missing/);
    // Looking did not trigger the download either.
    expect(existsSync(join(PROJECT_ROOT, 'node_modules', 'electron', 'dist'))).toBe(false);
  });

  it('finds the binary path.txt names below dist/', () => {
    const root = fakeProject('electron', 'electron');
    expect(detectElectron(root)).toEqual({ installed: true, binary: join(root, 'node_modules', 'electron', 'dist', 'electron') });
  });

  it('is not fooled by a path.txt whose file is missing or lies outside dist/', () => {
    expect(detectElectron(fakeProject('electron')).installed).toBe(false);
    expect(detectElectron(fakeProject('')).installed).toBe(false);
    expect(detectElectron(fakeProject('../../../../bin/sh')).installed).toBe(false);
    expect(detectElectron(fakeProject(undefined)).installed).toBe(false);
  });

  it('never loads the electron package: no import or require of it in the launcher', () => {
    const source = readFileSync(join(PROJECT_ROOT, 'src', 'main', 'desktop', 'launcher.mjs'), 'utf8');
    expect(source).not.toMatch(/from\s+['"]electron['"]|import\(\s*['"]electron['"]|require\(\s*['"]electron['"]/);
  });
});
