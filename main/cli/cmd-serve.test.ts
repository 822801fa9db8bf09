import { mkdtemp, rm } from 'node:fs/promises';
import { get } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { ensureRendererBuilt } from '../server/renderer-build.ts';
import { serveCommand } from './cmd-serve.ts';
import { UsageError } from './types.ts';

function statusOf(url: string): Promise<number> {
  return new Promise((resolve, reject) =>
    get(url, (res) => (res.resume(), resolve(res.statusCode ?? 0))).on('error', reject),
  );
}

function io(signal: AbortSignal) {
  let stdout = '';
  let stderr = '';
  return {
    io: {
      stdout: { write: (t: string) => ((stdout += t), true) },
      stderr: { write: (t: string) => ((stderr += t), true) },
      env: {},
      signal,
    },
    out: () => stdout,
    err: () => stderr,
  };
}

describe('tunebench serve', () => {
  // serve only serves a build; the tests make one as the build step would.
  beforeAll(async () => {
    await ensureRendererBuilt();
  }, 240_000);

  it('prints a loopback URL with a token, serves it, refuses without it, and stops cleanly on the signal', async () => {
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-serve-cli-'));
    const stop = new AbortController();
    const cli = io(stop.signal);
    const running = serveCommand.run(['--port', '0', '--runs', runsDir], cli.io);
    const deadline = Date.now() + 60_000;
    while (!/token=/.test(cli.out()) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
    const url = /http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]+/.exec(cli.out())?.[0];
    expect(url).toBeDefined();
    expect(await statusOf(url as string)).toBe(200);
    expect(await statusOf((url as string).replace(/\?token=.*/, ''))).toBe(401);
    expect(cli.err()).toContain(runsDir);
    stop.abort();
    await expect(running).resolves.toBe(0);
    await rm(runsDir, { recursive: true, force: true });
  }, 240_000);

  it('serves the built renderer without loading vite (a devDependency)', async () => {
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-serve-novite-'));
    // A resolve hook that refuses vite and its React plugin, as an install without devDependencies would.
    const hook =
      'export async function resolve(s, c, next) { if (/^(vite|@vitejs\\/)/.test(s)) throw new Error("no devDependency " + s); return next(s, c); }';
    const register = `import { register } from 'node:module'; register(${JSON.stringify(`data:text/javascript,${encodeURIComponent(hook)}`)});`;
    const bin = fileURLToPath(new URL('../bin/tunebench.mjs', import.meta.url));
    const child = spawn(
      process.execPath,
      [
        '--import',
        `data:text/javascript,${encodeURIComponent(register)}`,
        bin,
        'serve',
        '--port',
        '0',
        '--runs',
        runsDir,
      ],
      {
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    );
    let out = '';
    let err = '';
    child.stdout.on('data', (chunk: Buffer) => (out += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (err += chunk.toString()));
    try {
      const deadline = Date.now() + 60_000;
      while (!/token=/.test(out) && child.exitCode === null && Date.now() < deadline)
        await new Promise((r) => setTimeout(r, 50));
      const url = /http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]+/.exec(out)?.[0];
      expect(url, `serve printed no URL; stderr: ${err}`).toBeDefined();
      expect(await statusOf(url as string)).toBe(200);
      expect(err).not.toMatch(/no devDependency|building the app/);
    } finally {
      child.kill('SIGTERM');
      await new Promise((r) => (child.exitCode === null ? child.once('exit', r) : r(null)));
      await rm(runsDir, { recursive: true, force: true });
    }
  }, 90_000);

  it('refuses a bad port or a stray argument with a message naming it', async () => {
    const cli = io(new AbortController().signal);
    await expect(serveCommand.run(['--port', '70000'], cli.io)).rejects.toThrow(UsageError);
    await expect(serveCommand.run(['--port', 'http'], cli.io)).rejects.toThrow(/--port: expected a TCP port/);
    await expect(serveCommand.run(['extra'], cli.io)).rejects.toThrow(/unexpected argument "extra"/);
  });
});
