#!/usr/bin/env node
// Entry point for `npx tauwell`. The command line is compiled to dist/ by `npm run build:cli`
// (run on `prepare`, so right after `npm install`).
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const here = dirname(fileURLToPath(import.meta.url));
const entry = join(here, '..', 'dist', 'main', 'cli', 'index.js');
if (!existsSync(entry)) {
  process.stderr.write('tauwell: the command line is not built yet; run `npm run build:cli` in the project folder\n');
  process.exit(1);
}
const { main } = await import(entry);
process.exitCode = await main(process.argv.slice(2));
