#!/usr/bin/env node
// The build step: `node main/bin/build.mjs [cli] [renderer]` (both when
// none is named). Run by `npm install`/`npm ci` (the `prepare` script), by
// `npm pack`, and by hand after editing sources.
//  - cli: bundles main/cli/ with esbuild into out/cli/tunebench.mjs, so the
//    launcher starts without compiling TypeScript. Packages with native parts
//    or only needed by some commands (serialport, ws) stay outside and load
//    on first use.
//  - renderer: builds app/ with vite into out/renderer, which `tunebench
//    serve` serves as is. Needs the devDependencies; skipped with a note in an
//    install without them (a packed tarball carries the built folder).
import { mkdir, mkdtemp, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BUNDLE_FILE, INPUTS_FILE, loadBundle, PROJECT_ROOT } from './cli-bundle.mjs';
import { writeSourceManifest } from './source-manifest.mjs';

const EXTERNAL = [
  'serialport',
  '@serialport/*',
  'ws',
  'bufferutil',
  'utf-8-validate',
  'tsx',
  'vite',
  '@vitejs/*',
  'electron',
];

// zod re-exports every message locale as `z.locales` (300 KB of the bundle); the CLI only uses
// English, the one zod configures itself with. The bundle gets a locales module with English alone.
const zodEnglishOnly = {
  name: 'zod-english-only',
  setup(build) {
    build.onResolve({ filter: /^\.\.\/locales\/index\.js$/ }, (args) =>
      /[\\/]zod[\\/]/.test(args.importer)
        ? { path: join(args.resolveDir, '../locales/en.js'), namespace: 'zod-en' }
        : undefined,
    );
    build.onLoad({ filter: /.*/, namespace: 'zod-en' }, (args) => ({
      contents: `export { default as en } from ${JSON.stringify(args.path)};`,
      resolveDir: dirname(args.path),
    }));
  },
};

/**
 * esbuild escapes non-ASCII characters everywhere but in regular-expression literals; one such
 * character makes V8 hold the whole bundle as a two-byte string (twice the memory to read and
 * keep). \uXXXX means the same inside a regular expression, a string or a template.
 */
async function escapeNonAscii(file) {
  const text = await readFile(file, 'utf8');
  // eslint-disable-next-line no-control-regex
  if (!/[^\x00-\x7f]/.test(text)) return;
  const escaped = text.replace(/[^\x00-\x7f]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
  await writeFile(file, escaped);
}

async function buildCli() {
  const { build } = await import('esbuild');
  const tempFile = `${BUNDLE_FILE}.${process.pid}.tmp`;
  await mkdir(new URL('../../out/cli/', import.meta.url), { recursive: true });
  const result = await build({
    absWorkingDir: PROJECT_ROOT,
    entryPoints: ['main/cli/index.ts'],
    outfile: tempFile,
    bundle: true,
    platform: 'node',
    // CommonJS so the launcher can load it through vm.Script with V8's code cache.
    format: 'cjs',
    target: 'node20',
    // import() of a package left outside becomes require(), which the launcher provides.
    supported: { 'dynamic-import': false },
    define: { 'import.meta.url': '__tunebenchModuleUrl' },
    external: EXTERNAL,
    plugins: [zodEnglishOnly],
    metafile: true,
    logLevel: 'warning',
    legalComments: 'none',
    // Less to read and to deserialise at every start; names stay, so stack traces still read.
    minifyWhitespace: true,
    minifySyntax: true,
    // The sources find resources/ from their own URL; the bundle sits as deep as they do.
    banner: { js: "const __tunebenchModuleUrl = require('node:url').pathToFileURL(__filename).href;" },
  });
  // The CSV import worker (main/service/import-off-thread.ts) is its own entry beside the bundle:
  // out/cli/import-worker.js, an ES module (the package is "type": "module").
  const worker = await build({
    absWorkingDir: PROJECT_ROOT,
    entryPoints: ['main/service/import-worker.ts'],
    outfile: fileURLToPath(new URL('../../out/cli/import-worker.js', import.meta.url)),
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    external: EXTERNAL,
    plugins: [zodEnglishOnly],
    metafile: true,
    logLevel: 'warning',
    legalComments: 'none',
    banner: {
      js: "import { createRequire as __tunebenchRequire } from 'node:module';\nconst require = __tunebenchRequire(import.meta.url);",
    },
  });
  await escapeNonAscii(tempFile);
  const inputs = [...new Set([...Object.keys(result.metafile.inputs), ...Object.keys(worker.metafile.inputs)])]
    .filter((input) => !input.startsWith('zod-en:'))
    .map((input) => relative(PROJECT_ROOT, `${PROJECT_ROOT}${input}`).split(sep).join('/'))
    .filter((input) => !input.startsWith('node_modules/'));
  // A dependency upgrade changes package.json or the lock file.
  inputs.push('package.json');
  // The source list first, the bundle last: a launcher that sees the new
  // bundle also sees its list.
  writeSourceManifest(INPUTS_FILE, PROJECT_ROOT, inputs);
  for (const name of await readdir(dirname(BUNDLE_FILE)))
    if (name.endsWith('.v8cache')) await rm(join(dirname(BUNDLE_FILE), name), { force: true });
  await rename(tempFile, BUNDLE_FILE);
  await warmCodeCache();
  console.log(`build: CLI bundled from ${inputs.length} files into ${relative(PROJECT_ROOT, BUNDLE_FILE)}`);
}

/** A 100-point sweep CSV of our own (a gently bending tuning curve): what the warm-up analyses. */
function warmUpCsv() {
  const lines = ['control_v,frequency_hz'];
  for (let i = 0; i < 100; i++) {
    const v = 0.5 + i * 0.04;
    lines.push(`${v.toFixed(2)},${(40e3 + 9e3 * v - 600 * v * v).toFixed(0)}`);
  }
  return `${lines.join('\n')}\n`;
}

/**
 * Writes V8's code cache beside the bundle. It holds the functions compiled
 * by the time it is written, and each command's code loads only when that
 * command runs: so the commands whose start people wait for (help, analyze
 * of a CSV, as text and JSON) run here first, in this process, on a CSV of
 * our own.
 */
async function warmCodeCache() {
  const { exports, saveCache } = loadBundle();
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-build-'));
  try {
    const csv = join(dir, 'warm-up.csv');
    await writeFile(csv, warmUpCsv());
    const sink = { write: () => true };
    const io = { stdout: sink, stderr: sink, env: {} };
    await exports.runCli(['--help'], io);
    await exports.runCli(['analyze', csv], io);
    await exports.runCli(['analyze', csv, '--json'], io);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
  saveCache();
}

async function hasPackage(name) {
  try {
    await import(name);
    return true;
  } catch {
    return false;
  }
}

async function buildRenderer() {
  if (!(await hasPackage('vite')) || !(await hasPackage('@vitejs/plugin-react'))) {
    console.log(
      'build: renderer skipped (vite is a devDependency and is not installed); `tunebench serve` needs out/renderer from a full install or a packed tarball',
    );
    return;
  }
  const { register } = await import('tsx/esm/api');
  register();
  const { buildRendererNow, RENDERER_OUT_DIR } = await import('../server/renderer-build.ts');
  await buildRendererNow();
  console.log(`build: renderer built into ${relative(PROJECT_ROOT, RENDERER_OUT_DIR)}`);
}

const steps = { cli: buildCli, renderer: buildRenderer };
const wanted = process.argv.slice(2);
for (const name of wanted)
  if (!(name in steps)) {
    console.error(`build: unknown step "${name}"; known: ${Object.keys(steps).join(', ')}`);
    process.exit(2);
  }
for (const name of wanted.length > 0 ? wanted : Object.keys(steps)) {
  await steps[name]();
}
