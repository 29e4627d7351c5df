// Builds the desktop shell: main process, preload bridge and renderer.
// The renderer is the same bundle that `tauwell serve` hands to a browser on loopback.
import { defineConfig } from 'electron-vite';
import { resolve } from 'node:path';

export default defineConfig({
  main: {
    build: {
      outDir: 'out/main',
      // The app's code goes to out/main/desktop/, three folders below the project like src/main/db and
      // dist/main/db, because the field log finds migrations/ (and package.json) three folders up from
      // its own module. out/main/index.js (package.json "main") only imports it.
      rollupOptions: {
        // The reader thread of long series (services/time-column.ts) loads ./series-worker.js beside the
        // module that starts it: out/main/desktop/, where the app's code and its chunks are.
        input: {
          index: resolve('src/main/desktop/entry.ts'),
          'desktop/index': resolve('src/main/desktop/index.ts'),
          'desktop/series-worker': resolve('src/main/services/series-worker.ts'),
        },
        output: { chunkFileNames: 'desktop/[name]-[hash].js' },
        external: ['better-sqlite3', 'electron'],
      },
    },
  },
  preload: {
    build: {
      outDir: 'out/preload',
      // CommonJS: Electron runs a sandboxed preload as a plain script, so an ES-module preload would not load.
      rollupOptions: { input: resolve('src/main/desktop/preload.ts'), output: { format: 'cjs', entryFileNames: '[name].cjs' } },
    },
  },
  renderer: {
    root: resolve('src/renderer'),
    build: {
      outDir: resolve('out/renderer'),
      rollupOptions: { input: resolve('src/renderer/index.html') },
    },
  },
});
