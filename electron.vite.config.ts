// Builds the desktop shell: main process, preload bridge and renderer.
// The renderer is the same bundle that `tauwell serve` hands to a browser on loopback.
import { defineConfig } from 'electron-vite';
import { resolve } from 'node:path';

export default defineConfig({
  main: {
    build: {
      outDir: 'out/main',
      rollupOptions: { input: resolve('src/main/desktop/index.ts'), external: ['better-sqlite3', 'electron'] },
    },
  },
  preload: {
    build: {
      outDir: 'out/preload',
      rollupOptions: { input: resolve('src/main/desktop/preload.ts') },
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
