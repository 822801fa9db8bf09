import { resolve } from 'node:path';
import { defineConfig } from 'electron-vite';
import react from '@vitejs/plugin-react';

// Three bundles: the Electron main process, the sandboxed preload, and the
// renderer (the same renderer that browser mode serves).
export default defineConfig({
  main: {
    build: {
      outDir: 'out/main',
      rollupOptions: {
        // The CSV import worker (main/service/import-off-thread.ts) is its own entry: out/main/import-worker.js.
        input: {
          index: resolve(__dirname, 'main/index.ts'),
          'import-worker': resolve(__dirname, 'main/service/import-worker.ts'),
        },
      },
      externalizeDeps: true,
    },
  },
  preload: {
    build: {
      outDir: 'out/preload',
      rollupOptions: {
        input: { preload: resolve(__dirname, 'main/preload.ts') },
        output: { format: 'cjs', entryFileNames: '[name].cjs' },
      },
    },
  },
  renderer: {
    root: resolve(__dirname, 'app'),
    // @vitejs/plugin-react's types do not resolve under main/tsconfig.json (it is ESM-only with bundler exports).

    plugins: [react()],
    build: {
      outDir: resolve(__dirname, 'out/renderer'),
      rollupOptions: { input: { index: resolve(__dirname, 'app/index.html') } },
    },
  },
});
