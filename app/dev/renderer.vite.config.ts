/**
 * DEV ONLY — not shipped. Builds just the renderer (same settings as the
 * `renderer` section of electron.vite.config.ts) plus the dev harness page,
 * for checking the renderer before the main-process bundle exists:
 *   npx vite build --config app/dev/renderer.vite.config.ts --outDir /tmp/tb-renderer
 */
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

const appDir = fileURLToPath(new URL('..', import.meta.url));

export default defineConfig({
  root: appDir,
  base: './',
  plugins: [react()],
  build: {
    emptyOutDir: true,
    rollupOptions: {
      input: { index: resolve(appDir, 'index.html'), harness: resolve(appDir, 'dev/harness.html') },
    },
  },
});
