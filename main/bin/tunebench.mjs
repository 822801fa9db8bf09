#!/usr/bin/env node
// Launcher for the `tunebench` command. Runs the prebuilt CLI bundle
// (out/cli/, made by `npm run build:cli`, which `npm install` runs through
// `prepare`) when it is current; in a checkout whose sources have changed
// since, or with TUNEBENCH_FROM_SOURCE=1, tsx compiles the TypeScript on
// load instead, so `npx tunebench` always runs the code you see.
import { bundleStaleReason, tuneForBigWork, loadBundle, useStartFlags } from './cli-bundle.mjs';

useStartFlags();

// TUNEBENCH_SHOW_LAUNCH=1 says on stderr which one ran (tests, bug reports).
function said(line) {
  if (process.env.TUNEBENCH_SHOW_LAUNCH === '1') process.stderr.write(`tunebench launcher: ${line}\n`);
}

async function loadCli() {
  const stale = process.env.TUNEBENCH_FROM_SOURCE === '1' ? 'TUNEBENCH_FROM_SOURCE=1' : bundleStaleReason();
  if (stale === null) {
    said('prebuilt bundle');
    const { exports, saveCache } = loadBundle();
    return { runCli: exports.runCli, after: saveCache };
  }
  said(`sources through tsx (bundle not used: ${stale})`);
  // Compiling TypeScript on the fly is big work: V8's own settings suit it.
  tuneForBigWork();
  const { register } = await import('tsx/esm/api');
  register();
  const { runCli } = await import('../cli/index.ts');
  return { runCli, after: () => undefined };
}

const { runCli, after } = await loadCli();
const code = await runCli(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  env: process.env,
});
after();
process.exitCode = code;
