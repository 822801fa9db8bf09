/**
 * A misbehaving instrument for tests: a line-level TCP proxy on 127.0.0.1
 * (ephemeral port) placed in front of a real SCPI server — normally one
 * device of the simulated bench served by serveDevice / serveSimBench. Its
 * rules can swallow or rewrite commands (an instrument that ignores
 * `OUTP OFF`), and drop, rewrite, garble, delay or un-terminate replies (a
 * link whose replies stop ending while it stays up), or hang up. The rules
 * can be changed while a test runs; every line through it is logged.
 *
 * What the instrument really did is read from the simulator object, never
 * through the proxy.
 */
import net from 'node:net';

export interface ProxyContext {
  /** 1-based index of the client connection this line belongs to (a reconnect makes a new one). */
  connection: number;
  /** The last command line forwarded on this connection (a reply answers it: one in flight at a time). */
  lastCommand: string | null;
  /** Writes raw text to the client now (e.g. a reply a rule held back). */
  toClient(text: string): void;
}

/** What to send back for one reply line: text (terminator included) or nothing, optionally later. */
export type ReplyAction = string | null | { text: string | null; afterS: number };

export interface ProxyRules {
  /** A command line on its way to the instrument: the line to forward, or null to swallow it. */
  command?: (line: string, ctx: ProxyContext) => string | null;
  /** A reply line on its way back; default: forwarded unchanged with "\n". */
  reply?: (line: string, ctx: ProxyContext) => ReplyAction;
}

export interface ProxyLogEntry {
  direction: 'command' | 'reply';
  connection: number;
  line: string;
  /** False when a rule swallowed it. */
  passed: boolean;
}

export interface ScpiProxy {
  /** `tcp://127.0.0.1:PORT` */
  readonly address: string;
  readonly port: number;
  /** Current rules; assign to change behaviour mid-test. */
  rules: ProxyRules;
  readonly log: ProxyLogEntry[];
  /** Client connections accepted so far. */
  readonly connections: number;
  /** Hangs up every open connection (both sides). */
  hangUp(): void;
  close(): Promise<void>;
}

/** Rule helpers. */
export const misbehave = {
  /** The instrument ignores every command matching `pattern` (it reads them, does nothing). */
  ignoreCommands(pattern: RegExp): Pick<ProxyRules, 'command'> {
    return { command: (line) => (pattern.test(line) ? null : line) };
  },
  /** Replies stop ending: bytes keep coming but the terminator never does; the link stays up. */
  unterminatedReplies(onlyConnection?: number): Pick<ProxyRules, 'reply'> {
    return {
      reply: (line, ctx) => (onlyConnection === undefined || ctx.connection === onlyConnection ? line : `${line}\n`),
    };
  },
  /** Every reply matching `pattern` replaced by `text`. */
  replaceReplies(pattern: RegExp, text: string): Pick<ProxyRules, 'reply'> {
    return { reply: (line) => `${pattern.test(line) ? text : line}\n` };
  },
  /** The reply to every command matching `commandPattern` replaced by `text`. */
  answer(commandPattern: RegExp, text: string): Pick<ProxyRules, 'reply'> {
    return {
      reply: (line, ctx) => `${ctx.lastCommand !== null && commandPattern.test(ctx.lastCommand) ? text : line}\n`,
    };
  },
  /**
   * From the first command matching `from` on, every reply slips one query
   * late: held back until the next command arrives, then sent (a counter
   * whose answers lag one query behind).
   */
  slipOneQuery(from: RegExp): ProxyRules {
    let slipping = false;
    const held: string[] = [];
    return {
      command: (line, ctx) => {
        if (from.test(line)) slipping = true;
        const late = held.shift();
        if (late !== undefined) ctx.toClient(`${late}\n`);
        return line;
      },
      reply: (line) => {
        if (!slipping) return `${line}\n`;
        held.push(line);
        return null;
      },
    };
  },
  /** Every reply delayed by `afterS` (order kept). */
  delayReplies(afterS: number): Pick<ProxyRules, 'reply'> {
    return { reply: (line) => ({ text: `${line}\n`, afterS }) };
  },
};

export async function startScpiProxy(
  target: { host: string; port: number },
  rules: ProxyRules = {},
  /** Port to listen on; 0 (default) takes an ephemeral one. A test reopens a closed proxy on its old port. */
  listenPort = 0,
): Promise<ScpiProxy> {
  const log: ProxyLogEntry[] = [];
  const sockets = new Set<net.Socket>();
  let connections = 0;
  const proxy = {
    rules,
    log,
    get connections() {
      return connections;
    },
  };

  const server = net.createServer((client) => {
    connections += 1;
    const ctx: ProxyContext = {
      connection: connections,
      lastCommand: null,
      toClient: (text) => {
        if (!client.destroyed) client.write(text);
      },
    };
    const upstream = net.connect(target.port, target.host);
    client.setNoDelay(true);
    upstream.setNoDelay(true);
    sockets.add(client);
    sockets.add(upstream);
    // Replies leave in order even when a rule delays one.
    let replyChain = Promise.resolve();
    const end = (): void => {
      client.destroy();
      upstream.destroy();
      sockets.delete(client);
      sockets.delete(upstream);
    };
    client.on('close', end);
    upstream.on('close', end);
    client.on('error', end);
    upstream.on('error', end);
    splitLines(client, (line) => {
      const out = proxy.rules.command ? proxy.rules.command(line, ctx) : line;
      log.push({ direction: 'command', connection: ctx.connection, line, passed: out !== null });
      if (out !== null) ctx.lastCommand = out;
      if (out !== null && !upstream.destroyed) upstream.write(`${out}\n`);
    });
    splitLines(upstream, (line) => {
      const action: ReplyAction = proxy.rules.reply ? proxy.rules.reply(line, ctx) : `${line}\n`;
      const { text, afterS } = typeof action === 'object' && action !== null ? action : { text: action, afterS: 0 };
      log.push({ direction: 'reply', connection: ctx.connection, line, passed: text !== null });
      replyChain = replyChain.then(async () => {
        if (afterS > 0) await new Promise((resolve) => setTimeout(resolve, afterS * 1000));
        if (text !== null && !client.destroyed) client.write(text);
      });
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(listenPort, '127.0.0.1', () => resolve());
  });
  const info = server.address();
  const port = typeof info === 'object' && info !== null ? info.port : 0;
  return Object.assign(proxy, {
    address: `tcp://127.0.0.1:${port}`,
    port,
    hangUp() {
      for (const socket of sockets) socket.destroy();
      sockets.clear();
    },
    close() {
      for (const socket of sockets) socket.destroy();
      sockets.clear();
      return new Promise<void>((resolve) => server.close(() => resolve()));
    },
  });
}

/** Calls `onLine` for every "\n"-terminated line (CR stripped) arriving on `socket`. */
function splitLines(socket: net.Socket, onLine: (line: string) => void): void {
  let pending = '';
  socket.setEncoding('utf8');
  socket.on('data', (chunk: string) => {
    pending += chunk;
    let at = pending.indexOf('\n');
    while (at !== -1) {
      onLine(pending.slice(0, at).replace(/\r$/, ''));
      pending = pending.slice(at + 1);
      at = pending.indexOf('\n');
    }
  });
}
