/**
 * `npm start`: builds the app (electron-vite build, and the report page) and opens the desktop window, whose field log
 * is built from the INVENTED demo field the first time. Where the Electron binary is not installed
 * it says so in one line and serves the demo field log to a browser instead (`tauwell serve`).
 *
 *   detectElectron(root?): { installed: true, binary } | { installed: false, reason }
 *
 * The binary is found the way node_modules/electron/index.js finds it (path.txt names the
 * executable below dist/), without loading that module: loading it downloads a missing binary.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The project folder: src/main/desktop is three folders down. */
export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');

/** The browser fallback's field log (ignored by git, like `npm run demo`'s). */
export const DEMO_DB = 'tauwell-demo.sqlite';

export function detectElectron(root = PROJECT_ROOT) {
  const dist = join(root, 'node_modules', 'electron', 'dist');
  const pathFile = join(root, 'node_modules', 'electron', 'path.txt');
  if (!existsSync(pathFile)) return { installed: false, reason: 'node_modules/electron/path.txt is missing: the binary was never downloaded' };
  const named = readFileSync(pathFile, 'utf8').trim();
  const binary = resolve(dist, named);
  if (named === '' || !binary.startsWith(dist + sep)) {
    return { installed: false, reason: 'node_modules/electron/path.txt does not name a file inside node_modules/electron/dist' };
  }
  if (!existsSync(binary) || !statSync(binary).isFile()) return { installed: false, reason: `node_modules/electron/dist/${named} is missing` };
  return { installed: true, binary };
}

/** Runs a Node script of the project to completion; stops the launcher when it fails. */
function runNode(args, what) {
  const r = spawnSync(process.execPath, args, { cwd: PROJECT_ROOT, stdio: 'inherit' });
  if (r.status !== 0) {
    process.stderr.write(`npm start: ${what} failed (exit ${r.status ?? r.signal})\n`);
    process.exit(r.status ?? 1);
  }
}

/** Runs `command` until it exits, passing SIGTERM on; Ctrl+C reaches it directly (same terminal). */
function runUntilExit(command, args) {
  const child = spawn(command, args, { cwd: PROJECT_ROOT, stdio: 'inherit' });
  process.on('SIGINT', () => {});
  process.on('SIGTERM', () => child.kill('SIGTERM'));
  child.on('exit', (code, signal) => process.exit(code ?? (signal === null ? 0 : 1)));
}

function main() {
  runNode([join(PROJECT_ROOT, 'node_modules', 'electron-vite', 'bin', 'electron-vite.js'), 'build'], 'electron-vite build');
  // The offline report page (its own single-file bundle, vite.report.config.ts), for the report action.
  runNode([join(PROJECT_ROOT, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--config', 'vite.report.config.ts', '--logLevel', 'warn'], 'building the report page');
  const electron = detectElectron();
  if (electron.installed) {
    runUntilExit(electron.binary, [PROJECT_ROOT]);
    return;
  }
  process.stdout.write(`npm start: the Electron binary is not installed (${electron.reason}); serving the demo field log to a browser instead\n`);
  runNode([join(PROJECT_ROOT, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', 'tsconfig.cli.json'], 'building the command line');
  const cli = join(PROJECT_ROOT, 'bin', 'tauwell.mjs');
  if (!existsSync(join(PROJECT_ROOT, DEMO_DB))) runNode([cli, 'demo', '--db', DEMO_DB], 'building the demo field log');
  runUntilExit(process.execPath, [cli, 'serve', '--db', DEMO_DB]);
}

if (process.argv[1] !== undefined && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) main();
