/**
 * `npm run build:web`: the web edition as a static site in out/web/ (no
 * server code; any static file server over HTTPS, or http://localhost).
 * The four Node-facing modules resolve to their page stand-ins
 * (app/web/page-modules.ts), and any Node built-in that would still reach the
 * page stops the build, naming the importer.
 */
import { builtinModules } from 'node:module';
import { dirname, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig, type Plugin } from 'vite';
import { PAGE_MODULES } from './page-modules.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));
const webDir = fileURLToPath(new URL('.', import.meta.url));
export const WEB_OUT_DIR = resolve(repo, 'out/web');

const BUILTINS = new Set(builtinModules);
/** The npm `buffer` package, imported by name by app/web/buffer-global.ts only. */
const NPM_BUFFER_IMPORTER = resolve(webDir, 'buffer-global.ts');

function pageModules(): Plugin {
  const standIns = new Map(Object.entries(PAGE_MODULES).map(([from, to]) => [resolve(repo, from), resolve(repo, to)]));
  return {
    name: 'tunebench-page-modules',
    enforce: 'pre',
    resolveId(source, importer) {
      if (importer === undefined) return null;
      const bare = source.startsWith('node:') ? source.slice(5) : source;
      if (source.startsWith('node:') || BUILTINS.has(bare) || BUILTINS.has(bare.split('/')[0] ?? '')) {
        if (source === 'buffer' && importer === NPM_BUFFER_IMPORTER) return null;
        this.error(`${relative(repo, importer)} imports the Node built-in "${source}", which a web page does not have`);
      }
      if (!source.startsWith('.')) return null;
      return standIns.get(resolve(dirname(importer), source)) ?? null;
    },
  };
}

export default defineConfig({
  root: webDir,
  base: './',
  publicDir: false,
  plugins: [pageModules(), react()],
  build: {
    outDir: WEB_OUT_DIR,
    emptyOutDir: true,
    target: 'es2022',
    chunkSizeWarningLimit: 2048,
  },
  worker: { format: 'es' },
});
