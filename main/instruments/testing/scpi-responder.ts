/**
 * A tiny SCPI instrument for transport tests and the throughput benchmark:
 * enough of a supply and a counter to answer *IDN?, *OPC?, SYST:ERR?,
 * INST:NSEL / SOUR:VOLT / OUTP / MEAS:VOLT? / READ?, and two test hooks
 * (`TEST:DELAY? s` answers late, `TEST:DROP` hangs up). Unknown headers go
 * to the error queue as -113 (SCPI-99), with no reply, as real instruments do.
 */
import net from 'node:net';
import { performance } from 'node:perf_hooks';

export const RESPONDER_IDN = 'Tunebench Test,Line Responder,T0001,1.0';

export interface ResponderActions {
  reply: (line: string, delayS?: number) => void;
  hangUp: () => void;
}

export class ScpiResponder {
  readonly errors: string[] = [];
  private channel = 1;
  private readonly volts = new Map<number, number>();
  private readonly outputs = new Map<number, boolean>();
  received = 0;
  private ese = 0;

  /** Handles one command line (may hold several ;-separated commands). */
  handle(line: string, act: ResponderActions): void {
    this.received += 1;
    for (const raw of line.split(';')) {
      const command = raw.trim().replace(/^:/, '');
      const space = command.indexOf(' ');
      const header = (space === -1 ? command : command.slice(0, space)).toUpperCase();
      const arg = space === -1 ? '' : command.slice(space + 1).trim();
      this.command(header, arg, act);
    }
  }

  private command(header: string, arg: string, act: ResponderActions): void {
    switch (header) {
      case '*IDN?':
        return act.reply(RESPONDER_IDN);
      case '*OPC?':
        return act.reply('1');
      case '*ESE':
        this.ese = Number(arg);
        return;
      case '*ESE?':
        return act.reply(String(this.ese));
      case '*RST':
        this.volts.clear();
        this.outputs.clear();
        return;
      case '*CLS':
        this.errors.length = 0;
        return;
      case 'SYST:ERR?':
        return act.reply(this.errors.shift() ?? '+0,"No error"');
      case 'INST:NSEL':
        this.channel = Number(arg);
        return;
      case 'SOUR:VOLT':
      case 'VOLT': {
        const v = Number(arg);
        if (!Number.isFinite(v) || v < 0 || v > 30) this.errors.push('-222,"Data out of range"');
        else this.volts.set(this.channel, v);
        return;
      }
      case 'SOUR:VOLT?':
        return act.reply((this.volts.get(this.channel) ?? 0).toExponential(6).toUpperCase());
      case 'OUTP':
        this.outputs.set(this.channel, arg.toUpperCase() === 'ON' || arg === '1');
        return;
      case 'OUTP?':
        return act.reply(this.outputs.get(this.channel) === true ? '1' : '0');
      case 'MEAS:VOLT?':
        return act.reply(`+${(this.volts.get(this.channel) ?? 1.2345).toExponential(6).toUpperCase()}`);
      case 'READ?':
      case 'MEAS:FREQ?':
        return act.reply('+1.00000123E+07');
      case 'TEST:DELAY?':
        return act.reply('+4.2E+00', Number(arg));
      case 'TEST:DROP':
        return act.hangUp();
      default:
        this.errors.push('-113,"Undefined header"');
    }
  }
}

export interface TcpResponderServer {
  port: number;
  responder: ScpiResponder;
  /** Connections accepted so far. */
  connections: () => number;
  /** Hangs up on every client (the server keeps listening). */
  dropClients: () => void;
  close: () => Promise<void>;
}

/** Serves a ScpiResponder on 127.0.0.1 (loopback only); port 0 picks a free port. */
export function startTcpResponder(port = 0): Promise<TcpResponderServer> {
  const responder = new ScpiResponder();
  const sockets = new Set<net.Socket>();
  let accepted = 0;
  const server = net.createServer((socket) => {
    accepted += 1;
    sockets.add(socket);
    socket.setNoDelay(true);
    socket.on('close', () => sockets.delete(socket));
    socket.on('error', () => undefined);
    let pending = '';
    // Replies leave in command order, as a real instrument's do: a late one holds up those behind it.
    // One chain, not one timer per reply: two timers due at the same moment may fire in either order.
    let holdUntilMs = 0;
    let chain: Promise<void> = Promise.resolve();
    const act: ResponderActions = {
      reply: (text, delayS) => {
        const nowMs = performance.now();
        const dueMs = Math.max(nowMs + (delayS ?? 0) * 1000, holdUntilMs);
        if (dueMs <= nowMs) {
          socket.write(`${text}\n`);
          return;
        }
        holdUntilMs = dueMs;
        chain = chain
          .then(() => new Promise<void>((resolve) => setTimeout(resolve, Math.max(0, dueMs - performance.now()))))
          .then(() => {
            if (socket.writable) socket.write(`${text}\n`);
          });
      },
      hangUp: () => socket.destroy(),
    };
    socket.on('data', (chunk: Buffer) => {
      pending += chunk.toString('utf8');
      let nl = pending.indexOf('\n');
      while (nl !== -1) {
        responder.handle(pending.slice(0, nl).replace(/\r$/, ''), act);
        pending = pending.slice(nl + 1);
        nl = pending.indexOf('\n');
      }
    });
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      const address = server.address();
      if (address === null || typeof address === 'string') {
        reject(new Error('no TCP address'));
        return;
      }
      resolve({
        port: address.port,
        responder,
        connections: () => accepted,
        dropClients: () => {
          for (const socket of sockets) socket.destroy();
        },
        close: () =>
          new Promise<void>((done) => {
            for (const socket of sockets) socket.destroy();
            server.close(() => done());
          }),
      });
    });
  });
}
