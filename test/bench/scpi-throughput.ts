/**
 * SCPI query throughput over TCP loopback: the full instrument stack
 * (TcpTransport + LineFramer + ScpiSession + reply parsing) against a bare
 * socket ping-pong, both talking to the same line responder in a child
 * process (so client and server do not share one event loop), measured in
 * the same run, alternating rounds. Prints both rates and their ratio.
 *
 *   npx tsx test/bench/scpi-throughput.ts
 */
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { createTransport } from '../../main/instruments/create-transport.ts';
import { ScpiSession } from '../../main/instruments/scpi-session.ts';
import { RealClock } from '../../main/time/real-clock.ts';

export interface ScpiThroughputResult {
  /** Queries per second through the bare socket (write line, wait for reply line). */
  bareQueriesPerS: number;
  /** Queries per second through ScpiSession.queryNumeric. */
  sessionQueriesPerS: number;
  /** session / bare; the target is 0.8 or more. */
  ratio: number;
  roundS: number;
  rounds: number;
}

export interface ScpiThroughputOptions {
  /** Length of each measured round, s; default 0.5 (short rounds, many: the best of each catches quiet moments on a shared machine). */
  roundS?: number;
  /** Rounds per method (alternating; the best of each is kept); default 8. */
  rounds?: number;
  /** Print the figures (as `npm run bench` expects of every suite); default true. */
  print?: boolean;
}

const COMMAND = 'MEAS:VOLT?';
const REPLY = '+1.234500E+00';

// Plain JavaScript so the child needs no TypeScript loader: answers every line, in order.
const SERVER_SOURCE = `
const net = require('node:net');
const server = net.createServer((socket) => {
  socket.setNoDelay(true);
  let pending = '';
  socket.on('data', (chunk) => {
    pending += chunk.toString('latin1');
    let out = '';
    let nl = pending.indexOf('\\n');
    while (nl !== -1) {
      const line = pending.slice(0, nl);
      pending = pending.slice(nl + 1);
      out += line === '*IDN?' ? 'Tunebench Bench,Line Responder,0,1\\n' : '${REPLY}\\n';
      nl = pending.indexOf('\\n');
    }
    if (out !== '') socket.write(out);
  });
  socket.on('error', () => {});
});
server.listen(0, '127.0.0.1', () => process.stdout.write(String(server.address().port) + '\\n'));
`;

async function startServer(): Promise<{ port: number; child: ChildProcess }> {
  const child = spawn(process.execPath, ['-e', SERVER_SOURCE], { stdio: ['ignore', 'pipe', 'inherit'] });
  const port = await new Promise<number>((resolve, reject) => {
    let text = '';
    child.once('error', reject);
    child.stdout?.on('data', (chunk: Buffer) => {
      text += chunk.toString();
      if (text.includes('\n')) resolve(Number(text.trim()));
    });
  });
  return { port, child };
}

/** One outstanding query at a time over a raw socket: the floor any SCPI client pays. */
async function bareRound(port: number, roundS: number): Promise<number> {
  const socket = net.createConnection({ host: '127.0.0.1', port });
  socket.setNoDelay(true);
  await new Promise<void>((resolve, reject) => {
    socket.once('connect', resolve);
    socket.once('error', reject);
  });
  const line = `${COMMAND}\n`;
  const count = await new Promise<number>((resolve) => {
    let pending = '';
    let n = 0;
    const end = performance.now() + roundS * 1000;
    socket.on('data', (chunk: Buffer) => {
      pending += chunk.toString('utf8');
      const nl = pending.indexOf('\n');
      if (nl === -1) return;
      pending = pending.slice(nl + 1);
      n += 1;
      if (performance.now() >= end) resolve(n);
      else socket.write(line);
    });
    socket.write(line);
  });
  socket.destroy();
  return count / roundS;
}

async function sessionRound(port: number, roundS: number): Promise<number> {
  const session = new ScpiSession({ transport: createTransport(`tcp://127.0.0.1:${port}`), clock: new RealClock() });
  await session.open();
  const end = performance.now() + roundS * 1000;
  let n = 0;
  let sum = 0;
  while (performance.now() < end) {
    const reading = await session.queryNumeric(COMMAND);
    if (reading.kind !== 'finite') throw new Error(`unexpected reply kind ${reading.kind}`);
    sum += reading.value;
    n += 1;
  }
  await session.close();
  if (Math.abs(sum / n - 1.2345) > 1e-12) throw new Error('replies were misread');
  return n / roundS;
}

export async function runScpiThroughputBench(options: ScpiThroughputOptions = {}): Promise<ScpiThroughputResult> {
  const roundS = options.roundS ?? 0.5;
  const rounds = options.rounds ?? 8;
  const { port, child } = await startServer();
  try {
    await bareRound(port, 0.3); // warm-up (JIT, socket buffers)
    await sessionRound(port, 0.3);
    let bare = 0;
    let session = 0;
    for (let r = 0; r < rounds; r += 1) {
      bare = Math.max(bare, await bareRound(port, roundS));
      session = Math.max(session, await sessionRound(port, roundS));
    }
    const result = { bareQueriesPerS: bare, sessionQueriesPerS: session, ratio: session / bare, roundS, rounds };
    if (options.print ?? true) printResult(result);
    return result;
  } finally {
    child.kill();
  }
}

function printResult(result: ScpiThroughputResult): void {
  console.log(
    `SCPI throughput over TCP loopback (${COMMAND}, one query in flight, best of ${result.rounds} x ${result.roundS} s)`,
  );
  const us = (qps: number): string => (1e6 / qps).toFixed(1);
  console.log(
    `  bare socket ping-pong : ${result.bareQueriesPerS.toFixed(0)} queries/s (${us(result.bareQueriesPerS)} us each)`,
  );
  console.log(
    `  ScpiSession stack     : ${result.sessionQueriesPerS.toFixed(0)} queries/s (${us(result.sessionQueriesPerS)} us each)`,
  );
  console.log(`  ratio                 : ${result.ratio.toFixed(3)} (target >= 0.8)`);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await runScpiThroughputBench();
}
