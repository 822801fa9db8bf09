/**
 * The `tunebench` bin runs the prebuilt bundle when it is current and the
 * TypeScript sources through tsx otherwise, with the same behaviour.
 */
import { execFile } from 'node:child_process';
import { readdir, readFile, stat } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCliCaptured } from '../../test/testing/run-cli-captured.ts';
import { BUNDLE_FILE, bundleStaleReason } from './cli-bundle.mjs';

const run = promisify(execFile);
const BIN = fileURLToPath(new URL('./tunebench.mjs', import.meta.url));
const BUILD = fileURLToPath(new URL('./build.mjs', import.meta.url));
const FIXTURE = fileURLToPath(new URL('../../test/fixtures/sweep-sensor-osc.csv', import.meta.url));

async function bin(args: string[], env: Record<string, string> = {}): Promise<{ stdout: string; stderr: string }> {
  return run(process.execPath, [BIN, ...args], { env: { ...process.env, TUNEBENCH_SHOW_LAUNCH: '1', ...env } });
}

describe('tunebench launcher', () => {
  beforeAll(async () => {
    await run(process.execPath, [BUILD, 'cli']);
  }, 120_000);

  it('runs the freshly built bundle, and prints what the sources print', async () => {
    expect(bundleStaleReason()).toBeNull();
    const fromBundle = await bin(['--help']);
    expect(fromBundle.stderr).toContain('tunebench launcher: prebuilt bundle');
    const inProcess = await runCliCaptured('--help');
    expect(fromBundle.stdout).toBe(inProcess.out);
  }, 60_000);

  it('falls back to the sources through tsx on request, with the same analysis', async () => {
    const fromSource = await bin(['analyze', FIXTURE, '--json'], { TUNEBENCH_FROM_SOURCE: '1' });
    expect(fromSource.stderr).toContain('sources through tsx (bundle not used: TUNEBENCH_FROM_SOURCE=1)');
    const fromBundle = await bin(['analyze', FIXTURE, '--json']);
    expect(fromBundle.stderr).toContain('prebuilt bundle');
    // The bundle finds resources/ and the analysis the same way the sources do.
    expect(JSON.parse(fromBundle.stdout)).toEqual(JSON.parse(fromSource.stdout));
  }, 60_000);

  it('loads only the command that runs: help and analyze start no network, server or worker code', async () => {
    // Node lists every built-in module it has loaded: the browser server needs http, the CSV import
    // worker worker_threads (net says nothing here: a piped stdout loads it too). Before the
    // registry loaded commands on demand, every start evaluated all of them.
    const probe = `
      const { loadBundle } = await import(${JSON.stringify(new URL('./cli-bundle.mjs', import.meta.url).href)});
      const { exports } = loadBundle();
      const sink = { write: () => true };
      const code = await exports.runCli(process.argv.slice(1), { stdout: sink, stderr: sink, env: {} });
      const heavy = ['http', 'worker_threads'].filter((m) => process.moduleLoadList.includes('NativeModule ' + m));
      // zod keeps its global configuration on globalThis once any schema module has been evaluated.
      const zod = '__zod_globalConfig' in globalThis;
      process.stdout.write(JSON.stringify({ code, heavy, zod }));`;
    const loaded = async (args: string[]): Promise<{ code: number; heavy: string[]; zod: boolean }> =>
      JSON.parse((await run(process.execPath, ['--input-type=module', '-e', probe, '--', ...args])).stdout) as {
        code: number;
        heavy: string[];
        zod: boolean;
      };
    expect(await loaded(['--help'])).toEqual({ code: 0, heavy: [], zod: false });
    // A plain CSV needs no schema: the run-folder reader, the campaign file and the flag parser's
    // did-you-mean load without zod.
    expect(await loaded(['analyze', FIXTURE])).toEqual({ code: 0, heavy: [], zod: false });
    // The registry still reaches the heavy commands and the schemas when they are asked for.
    expect((await loaded(['serve', '--help'])).heavy).toContain('http');
    expect((await loaded(['schema', 'bench'])).zod).toBe(true);
  }, 60_000);

  it('ships an ASCII bundle whose code cache the launcher accepts', async () => {
    // One non-ASCII character would make V8 hold the whole bundle as a two-byte string.
    const bundle = await readFile(BUNDLE_FILE);
    expect(bundle.findIndex((byte) => byte > 0x7f)).toBe(-1);
    // The launcher rewrites the cache only when V8 rejects it (other flags or another Node); the
    // build made it with the flags the launcher starts with, so a run leaves it as it was.
    const caches = async (): Promise<string[]> =>
      Promise.all(
        (await readdir(dirname(BUNDLE_FILE)))
          .filter((name) => name.endsWith('.v8cache'))
          .map(async (name) => `${name} ${(await stat(join(dirname(BUNDLE_FILE), name))).mtimeMs}`),
      );
    const before = await caches();
    expect(before).toHaveLength(1);
    const out = await bin(['analyze', FIXTURE]);
    expect(out.stderr).toContain('prebuilt bundle');
    expect(await caches()).toEqual(before);
  }, 60_000);
});
