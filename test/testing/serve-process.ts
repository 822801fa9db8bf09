/**
 * A real `tunebench serve` child process, a real `tunebench sim` child, a
 * WebSocket client of the served API, and a plain SCPI client that reads the
 * simulated supply's state over TCP — what the browser-mode safety tests
 * need to crash a server mid-run and see what the bench was left in.
 * Everything listens on 127.0.0.1 with ephemeral ports.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdir, mkdtemp, writeFile } from 'node:fs/promises';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { WebSocket, type RawData } from 'ws';

const ROOT = resolve(import.meta.dirname, '..', '..');
const BIN = join(ROOT, 'main', 'bin', 'tunebench.mjs');
export const CRASH_TRIGGER = join(ROOT, 'test', 'testing', 'crash-trigger.mjs');

export interface Child {
  process: ChildProcess;
  out: () => string;
  err: () => string;
  exited: Promise<number | null>;
}

/** The text of a WebSocket message, whatever form `ws` hands it in (one buffer, fragments, an ArrayBuffer). */
export function wsText(data: RawData): string {
  return (Array.isArray(data) ? Buffer.concat(data) : Buffer.isBuffer(data) ? data : Buffer.from(data)).toString(
    'utf8',
  );
}

export function spawnCli(args: string[], env: NodeJS.ProcessEnv = {}, nodeArgs: string[] = []): Child {
  const child = spawn(process.execPath, [...nodeArgs, BIN, ...args], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  let err = '';
  child.stdout?.on('data', (chunk: Buffer) => (out += chunk.toString()));
  child.stderr?.on('data', (chunk: Buffer) => (err += chunk.toString()));
  const exited = new Promise<number | null>((done) => child.once('exit', (code) => done(code)));
  return { process: child, out: () => out, err: () => err, exited };
}

async function waitFor<T>(what: string, probe: () => T | null, child: Child, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = probe();
    if (found !== null) return found;
    if (child.process.exitCode !== null)
      throw new Error(`${what}: the child exited (${child.process.exitCode}); stderr:\n${child.err()}`);
    if (Date.now() > deadline)
      throw new Error(`${what}: not seen within ${timeoutMs} ms; stdout:\n${child.out()}\nstderr:\n${child.err()}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

export interface SimChild extends Child {
  supply: string;
  counter: string;
  thermometer: string;
}

export async function startSim(): Promise<SimChild> {
  const child = spawnCli(['sim', '--base-port', '0']);
  const addresses = await waitFor(
    'tunebench sim addresses',
    () => {
      const found = ['supply', 'counter', 'thermometer'].map(
        (role) => new RegExp(`${role}\\s+(tcp://127\\.0\\.0\\.1:\\d+)`).exec(child.out())?.[1],
      );
      return found.every((a) => a !== undefined) ? found : null;
    },
    child,
  );
  return {
    ...child,
    supply: addresses[0] as string,
    counter: addresses[1] as string,
    thermometer: addresses[2] as string,
  };
}

/** A folder with a stand-in page, so `serve` needs no renderer build in these tests. */
export async function stubRendererDir(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-stub-renderer-'));
  await mkdir(join(dir, 'assets'));
  await writeFile(join(dir, 'index.html'), '<!doctype html><title>tunebench test page</title>\n');
  await writeFile(join(dir, 'assets', 'app.js'), 'console.log("stub");\n');
  return dir;
}

export interface ServeChild extends Child {
  url: string;
  origin: string;
  token: string;
}

export async function startServe(options: {
  runsDir: string;
  rendererDir: string;
  env?: NodeJS.ProcessEnv;
  nodeArgs?: string[];
  args?: string[];
}): Promise<ServeChild> {
  const child = spawnCli(
    ['serve', '--port', '0', '--runs', options.runsDir, ...(options.args ?? [])],
    { TUNEBENCH_RENDERER_DIR: options.rendererDir, ...options.env },
    options.nodeArgs,
  );
  const url = await waitFor(
    'serve URL',
    () => /http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]+/.exec(child.out())?.[0] ?? null,
    child,
  );
  const parsed = new URL(url);
  return { ...child, url, origin: parsed.origin, token: parsed.searchParams.get('token') as string };
}

export interface ApiClient {
  socket: WebSocket;
  call(
    method: string,
    params: unknown[],
  ): Promise<{ ok: boolean; result?: unknown; error?: { message: string; field?: string } }>;
  sendRaw(data: string | Uint8Array): void;
  /** The reply to a message sent with sendRaw under `id`. */
  reply(id: number): Promise<{ ok: boolean; result?: unknown; error?: { message: string; field?: string } }>;
  events: { type: string; [key: string]: unknown }[];
  close(): void;
}

export async function openApi(origin: string, token: string): Promise<ApiClient> {
  const socket = new WebSocket(`${origin.replace('http', 'ws')}/api?token=${token}`, { origin });
  const waiting = new Map<
    number,
    (reply: { ok: boolean; result?: unknown; error?: { message: string; field?: string } }) => void
  >();
  const events: { type: string; [key: string]: unknown }[] = [];
  let nextId = 1;
  socket.on('message', (data, binary) => {
    if (binary) return;
    const message = JSON.parse(wsText(data)) as { id?: number; event?: { type: string } };
    if (message.event) events.push(message.event);
    else if (typeof message.id === 'number') waiting.get(message.id)?.(message as never);
  });
  // Listening before the socket opens: the server's first event can ride in with the handshake.
  await new Promise<void>((done, fail) => {
    socket.once('open', () => done());
    socket.once('error', fail);
  });
  return {
    socket,
    events,
    call(method, params) {
      const id = nextId++;
      return new Promise((done) => {
        waiting.set(id, done);
        socket.send(JSON.stringify({ id, method, params }));
      });
    },
    sendRaw: (text) => socket.send(text),
    reply: (id) => new Promise((done) => waiting.set(id, done)),
    close: () => socket.close(),
  };
}

/** Sends SCPI lines to `address` (tcp://host:port) and returns the reply lines of the queries. */
export async function scpi(address: string, lines: string[]): Promise<string[]> {
  const { hostname, port } = new URL(address.replace('tcp://', 'http://'));
  const socket = connect(Number(port), hostname);
  await new Promise<void>((done, fail) => {
    socket.once('connect', () => done());
    socket.once('error', fail);
  });
  let buffered = '';
  const replies: string[] = [];
  socket.on('data', (chunk: Buffer) => {
    buffered += chunk.toString();
    let at: number;
    while ((at = buffered.indexOf('\n')) >= 0) {
      replies.push(buffered.slice(0, at).trim());
      buffered = buffered.slice(at + 1);
    }
  });
  const queries = lines.filter((line) => line.includes('?')).length;
  for (const line of lines) socket.write(`${line}\n`);
  const deadline = Date.now() + 5000;
  while (replies.length < queries && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
  socket.destroy();
  return replies;
}

/** Channel 1 (the tuning port) of the simulated supply: output state and voltage setpoint. */
export async function readControlChannel(supply: string): Promise<{ output: boolean; volts: number }> {
  const [output, volts] = await scpi(supply, ['INST:NSEL 1;:OUTP?', 'INST:NSEL 1;:SOUR:VOLT?']);
  return { output: output === '1' || output === 'ON', volts: Number(volts) };
}
