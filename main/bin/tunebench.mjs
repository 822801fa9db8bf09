#!/usr/bin/env node
// Launcher for the `tunebench` command. Runs the prebuilt CLI bundle
// (out/cli/, made by `npm run build:cli`, which `npm install` runs through
// `prepare`) when it is current; in a checkout whose sources are newer, or
// with TUNEBENCH_FROM_SOURCE=1, tsx compiles the TypeScript on load instead,
// so `npx tunebench` always runs the code you see.
import { bundleStaleReason, BUNDLE_FILE } from './cli-bundle.mjs';
import { pathToFileURL } from 'node:url';

// TUNEBENCH_SHOW_LAUNCH=1 says on stderr which one ran (tests, bug reports).
function said(line) {
  if (process.env.TUNEBENCH_SHOW_LAUNCH === '1') process.stderr.write(`tunebench launcher: ${line}\n`);
}

async function loadCli() {
  const stale = process.env.TUNEBENCH_FROM_SOURCE === '1' ? 'TUNEBENCH_FROM_SOURCE=1' : bundleStaleReason();
  if (stale === null) {
    said('prebuilt bundle');
    return import(pathToFileURL(BUNDLE_FILE).href);
  }
  said(`sources through tsx (bundle not used: ${stale})`);
  const { register } = await import('tsx/esm/api');
  register();
  return import('../cli/index.ts');
}

const { runCli } = await loadCli();
const code = await runCli(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  env: process.env,
});
process.exitCode = code;
