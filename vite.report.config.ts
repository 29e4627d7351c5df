// Builds the report page (src/renderer/report) into one script and one stylesheet, which
// src/main/report/assemble.ts inlines with the report's data into a single self-contained HTML file.
import { defineConfig } from 'vite';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));

export default defineConfig({
  root: resolve(here, 'src/renderer/report'),
  // Relative asset paths: the assembler reads them from beside report.html.
  base: './',
  logLevel: 'warn',
  build: {
    outDir: resolve(here, 'out/report'),
    emptyOutDir: true,
    cssCodeSplit: false,
    assetsInlineLimit: 1e9,
    modulePreload: false,
    rolldownOptions: {
      input: resolve(here, 'src/renderer/report/report.html'),
      // One chunk: the assembler inlines exactly one script (Vite 8's spelling of inlineDynamicImports: true).
      output: { codeSplitting: false },
    },
  },
});
