// Writes the INVENTED demo files — "Kettle Ridge" is not a real field — from the one seeded model in
// src/shared/demo/invented-field.ts (and the export of invented-export.ts), compiled to dist/ by `npm run build:cli`, so the files, the demo
// database (`tauwell demo`) and the tests all come from the same code (test/services-demo.test.ts
// compares the committed files with it):
//   demo/invented-field.csv              twelve years of weekly readings of KR-1..KR-3
//   demo/invented-export-with-faults.csv a plant export of the last weeks with planted faults (demo/README.md)
//
//   npm run build:cli && node demo/generate.mjs [OUT_DIR]      (deterministic; OUT_DIR defaults to demo/)
import { existsSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const compiled = (name) => new URL(`../dist/shared/demo/${name}.js`, import.meta.url);
if (!existsSync(fileURLToPath(compiled('invented-export')))) {
  process.stderr.write('demo/generate.mjs: the model is not compiled yet; run `npm run build:cli` first\n');
  process.exit(1);
}
const { inventedFieldCsv } = await import(compiled('invented-field').href);
const { inventedExportWithFaults } = await import(compiled('invented-export').href);

const outDir = process.argv[2] === undefined ? new URL('./', import.meta.url) : pathToFileURL(resolve(process.argv[2]) + '/');
const field = inventedFieldCsv();
writeFileSync(new URL('invented-field.csv', outDir), field);
writeFileSync(new URL('invented-export-with-faults.csv', outDir), inventedExportWithFaults());
console.log(`wrote ${field.split('\n').length - 2} invented readings to invented-field.csv and the faulty plant export to invented-export-with-faults.csv in ${fileURLToPath(outDir)}`);
