#!/usr/bin/env node
// Launcher for the `tunebench` command. The CLI is TypeScript under main/;
// tsx compiles it on load so `npx tunebench` works straight after
// `npm install`, with no build step.
import { register } from 'tsx/esm/api';

register();
const { runCli } = await import('../cli/index.ts');
const code = await runCli(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  env: process.env,
});
process.exitCode = code;
