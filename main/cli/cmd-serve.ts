/**
 * `tunebench serve`: browser mode. Serves the app and the BenchApi on
 * 127.0.0.1 (by default) and prints a URL with a fresh access token. Run as
 * its own process it installs the last-resort guard
 * (main/service/last-resort-guard.ts): SIGINT/SIGTERM/SIGHUP, a crash or a
 * heap near its limit leave any run's supply in the safe state, recorded in
 * the run, before the process exits.
 */
import { homedir } from 'node:os';
import { parseFlags } from './flags.ts';
import { UsageError, WorkFailedError, type CliCommand, type CliIo } from './types.ts';
import { resolveRunsDir } from '../store/index.ts';
import { startBrowserServer } from '../server/http-server.ts';
import { builtRendererDir, RendererMissingError } from '../server/renderer-dir.ts';
import { parseAllowedHosts } from '../service/address-policy.ts';
import { createDefaultBenchService } from '../service/default-ports.ts';
import { installLastResortGuard } from '../service/last-resort-guard.ts';

const USAGE = `usage: tunebench serve [--host 127.0.0.1] [--port 7788] [--runs DIR] [--allow-address HOST,…]

Browser mode: serves the tunebench app and its bench connection on this
machine and prints a URL carrying an access token (?token=…). Open that URL in
a browser on the same machine; requests without the token are refused.

  --host ADDR   address to listen on (default 127.0.0.1, this machine only)
  --port N      TCP port (default 7788; 0 picks a free one)
  --runs DIR    folder of saved runs (default: TUNEBENCH_RUNS, then the
                per-user data folder)
  --allow-address HOST,…
                instrument hosts the page may connect to beyond loopback,
                private LANs and serial devices ("*" for any; default:
                TUNEBENCH_ALLOW_ADDRESS). Profiles are chosen by name only.

Runs until Ctrl+C. A run in progress is stopped and its supply left in the
safe state before the server exits — also on SIGTERM/SIGHUP, a crash or
memory running out. Anyone holding the URL can drive the bench, and every page
connected to it can stop, pause or rename any run (one bench, one operator):
do not share it, and keep --host on loopback unless you must.
`;

function parsePort(text: string | undefined): number {
  if (text === undefined) return 7788;
  const port = Number(text);
  if (!/^\d+$/.test(text) || !Number.isInteger(port) || port > 65535)
    throw new UsageError(`--port: expected a TCP port 0–65535, got "${text}"`);
  return port;
}

/** Resolves when the caller's signal stops the server (in-process use); never, when the process's guard owns the ending. */
function waitForStop(io: CliIo): Promise<void> {
  return new Promise((resolve) => {
    if (!io.signal) return;
    if (io.signal.aborted) resolve();
    else io.signal.addEventListener('abort', () => resolve(), { once: true });
  });
}

export const serveCommand: CliCommand = {
  name: 'serve',
  usage: USAGE,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['host', 'port', 'runs', 'allow-address'] });
    if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
    const host = flags.values.get('host') ?? '127.0.0.1';
    if (!/^[A-Za-z0-9.:[\]-]+$/.test(host))
      throw new UsageError(`--host: expected an address such as 127.0.0.1, got "${host}"`);
    const port = parsePort(flags.values.get('port'));
    const runsDir = resolveRunsDir(flags.values.get('runs'), io.env, process.platform, homedir());
    // TUNEBENCH_RENDERER_DIR serves a page built elsewhere (a packaged install, the tests) instead of out/renderer.
    // Otherwise out/renderer as built by the build step; serve never runs vite (a devDependency).
    const rendererDir =
      io.env.TUNEBENCH_RENDERER_DIR ||
      (await builtRendererDir((line) => io.stderr.write(`${line}\n`)).catch((error: unknown) => {
        throw error instanceof RendererMissingError ? new WorkFailedError(error.message) : error;
      }));
    const extraHosts = parseAllowedHosts(flags.values.get('allow-address') ?? io.env.TUNEBENCH_ALLOW_ADDRESS);
    const service = createDefaultBenchService({ runsDir, addressPolicy: { extraHosts } });
    let server;
    try {
      server = await startBrowserServer({ host, port, rendererDir, api: service, openImport: service.openImport });
    } catch (error) {
      await service.close();
      const code = (error as { code?: string }).code;
      if (code === 'EADDRINUSE')
        throw new WorkFailedError(`port ${port} on ${host} is in use; pick another with --port`);
      if (code === 'EADDRNOTAVAIL') throw new UsageError(`--host: ${host} is not an address of this machine`);
      throw error;
    }
    if (host !== '127.0.0.1' && host !== 'localhost' && host !== '::1') {
      io.stderr.write(
        `warning: listening on ${host}, not loopback only; anyone who can reach it and holds the token can drive the bench\n`,
      );
    }
    if (!io.signal) {
      // This process holds the bench: whatever ends it, the supply is left safe first.
      installLastResortGuard({
        source: process,
        holder: service,
        log: (line) => io.stderr.write(`${line}\n`),
        exit: (code) => process.exit(code),
      });
    }
    io.stderr.write(`runs folder: ${runsDir}\n`);
    io.stdout.write(
      `tunebench is serving the app at\n  ${server.url}\nopen it in a browser on this machine; Ctrl+C stops it\n`,
    );
    await waitForStop(io);
    io.stderr.write('stopping: leaving the bench safe…\n');
    await service.close();
    await server.close();
    return 0;
  },
};
