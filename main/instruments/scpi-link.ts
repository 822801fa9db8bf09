/**
 * The line discipline under a SCPI session: one command in flight (FIFO),
 * per-reply deadlines on the injected Clock, staying in step after timeouts,
 * reopening a dropped link. ScpiSession (scpi-session.ts) adds the SCPI
 * meaning on top: error queue, common commands, numbers.
 *
 * Stale replies. A reply that arrives after its query timed out must never be
 * taken for the next query's reply. Two guards:
 *  1. Counting: every timeout adds one owed late line. A line that arrives
 *     while nothing waits is dropped and pays one off; once all are paid the
 *     link is in step again at no cost.
 *  2. Resync (session-resync.ts): if lines are still owed (or an unsolicited
 *     line arrived) when the next operation starts, the link first sends
 *     `*ESE n;*ESE?` with a fresh random n and drops everything up to the
 *     line "n" (or, with the legacy `syncQuery`, `*OPC?` up to its "1"
 *     plus a short quiet window).
 * A reply that comes after the next command went out is handled by 2, since
 * the next command is only sent after the resync.
 */
import type { Clock } from '../time/clock.ts';
import { DisconnectedError, nameInstrument } from './errors.ts';
import { LineFramer } from './line-framer.ts';
import { LineWaiter } from './line-waiter.ts';
import { oneSync, resync, tokenSync, type ResyncRun, type SyncExchange } from './session-resync.ts';
import { SessionQueue } from './session-queue.ts';
import { reopenWithRetry, type ReconnectPolicy } from './session-reopen.ts';
import type { Transport } from './transport.ts';

export interface ScpiLinkOptions {
  transport: Transport;
  clock: Clock;
  /** Line terminator for commands and replies; default "\n". */
  terminator?: string;
  /** Reply timeout when a query names none, s; default 2. */
  defaultTimeoutS?: number;
  /**
   * Legacy sync query that answers "1" (e.g. "*OPC?"), for an instrument
   * without *ESE. Default: none, the link syncs with `*ESE n;*ESE?`.
   */
  syncQuery?: string;
  /** Quiet time after a legacy sync reply, s; default 0.05. */
  syncQuietS?: number;
  /** Source of the sync token (0 ≤ x < 1); default Math.random. */
  random?: () => number;
  /** Reopen policy after a dropped link; attempts 0 = never reopen on its own. Default 3 tries, 0.5 s apart, growing. */
  reconnect?: ReconnectPolicy;
  /** Diagnostics: stale lines, resyncs, reconnects. */
  onEvent?: (event: SessionEvent) => void;
  /** The bench role this link serves (e.g. "counter"): its failures then name the role and the address. */
  role?: string;
}

export type SessionEvent =
  | { type: 'stale-line'; line: string }
  | { type: 'resync'; discarded: number }
  | { type: 'disconnected'; reason: string }
  | { type: 'reconnected'; attempts: number };

/** What a task run with `exclusive` may do while it holds the link. */
export interface LinkIo {
  /** Sends a command with no reply. */
  send(command: string): Promise<void>;
  /** Sends a command and waits for its reply line. */
  ask(command: string, timeoutS?: number): Promise<string>;
}

export class ScpiLink {
  readonly transport: Transport;
  readonly clock: Clock;
  readonly defaultTimeoutS: number;
  readonly stats = { staleLines: 0, resyncs: 0, reconnects: 0, timeouts: 0 };

  private readonly terminator: string;
  private readonly framer: LineFramer;
  private readonly waiter: LineWaiter;
  private readonly queue = new SessionQueue();
  private readonly releaseSlot = (): void => this.queue.release();
  private readonly syncQuery: string | null;
  private readonly syncQuietS: number;
  private readonly random: () => number;
  private lastToken: number | null = null;
  private readonly reconnectPolicy: ReconnectPolicy;
  private readonly onEvent: ((event: SessionEvent) => void) | undefined;
  private readonly io: LinkIo = {
    send: (command) => this.send(command),
    ask: async (command, timeoutS) =>
      (await this.exchange(command, timeoutS ?? this.defaultTimeoutS, false, null)) as string,
  };
  private lineHook: ((line: Buffer) => void) | null = null;
  /** stats.staleLines when the last timeout happened (resync() reports the difference). */
  private staleAtTimeout = 0;
  private lastSent: string | null = null;
  private resyncRun: ResyncRun | null = null;
  private lateLinesOwed = 0;
  private outOfStep = false;
  private resyncTimeoutS: number;
  private unsubscribe: (() => void)[] = [];
  private state: 'new' | 'open' | 'closed' = 'new';
  /** Set while the link itself closes the transport (reopen), so that close is not a loss. */
  private closingLink = false;
  private readonly role: string | null;
  /** Rethrows a failure with the role and address named in its message (a run's reason must say which instrument). */
  private readonly named = (error: unknown): never => {
    throw this.role === null ? error : nameInstrument(error, this.role, this.address);
  };

  constructor(options: ScpiLinkOptions) {
    this.transport = options.transport;
    this.clock = options.clock;
    this.terminator = options.terminator ?? '\n';
    this.defaultTimeoutS = positive('defaultTimeoutS', options.defaultTimeoutS ?? 2);
    this.syncQuery = options.syncQuery ?? null;
    this.random = options.random ?? Math.random;
    this.syncQuietS = positive('syncQuietS', options.syncQuietS ?? 0.05);
    this.reconnectPolicy = options.reconnect ?? { attempts: 3, delayS: 0.5 };
    if (!(this.reconnectPolicy.attempts >= 0)) throw new TypeError('reconnect.attempts: must be 0 or more');
    this.onEvent = options.onEvent;
    this.role = options.role ?? null;
    this.resyncTimeoutS = this.defaultTimeoutS;
    this.framer = new LineFramer((line) => this.onLine(line), { terminator: this.terminator });
    this.waiter = new LineWaiter(this.clock, (timeoutS) => this.onTimedOut(timeoutS));
  }

  get address(): string {
    return this.transport.address;
  }

  /** A failure found above the link (e.g. a driver's reply check), named with this link's role and address. */
  nameFailure(error: Error): Error {
    return this.role === null ? error : (nameInstrument(error, this.role, this.address) as Error);
  }

  /** The last command written on this link (for error messages), or null. */
  get lastCommand(): string | null {
    return this.lastSent;
  }

  /** True while a timeout or a stray line left the link possibly out of step. */
  get isOutOfStep(): boolean {
    return this.outOfStep;
  }

  async open(): Promise<void> {
    if (this.state === 'open') return;
    this.unsubscribe = [
      // A transport that frames lines itself (serial: the readline parser) does; else the own framer.
      this.transport.onLines?.(this.terminator, (line) => this.onLine(line)) ??
        this.transport.on('data', (chunk) => this.framer.push(chunk)),
      this.transport.on('close', (reason) => this.onTransportClose(reason)),
    ];
    this.state = 'open';
    try {
      await this.transport.open();
    } catch (error) {
      await this.close();
      if (error instanceof DisconnectedError && error.opening) throw error;
      throw new DisconnectedError(this.address, message(error), { cause: error, opening: true });
    }
  }

  async close(): Promise<void> {
    if (this.state === 'closed') return;
    this.state = 'closed';
    const closed = new DisconnectedError(this.address, 'session closed');
    this.resyncRun?.abort(closed);
    this.waiter.fail(closed);
    this.waiter.dispose();
    this.queue.rejectAll(closed);
    for (const off of this.unsubscribe) off();
    this.unsubscribe = [];
    if (this.transport.isOpen) await this.transport.close();
  }

  /** Sends a query and resolves with its reply line (terminator removed, UTF-8). */
  query(command: string, options?: { timeoutS?: number }): Promise<string> {
    const timeoutS = options?.timeoutS ?? this.defaultTimeoutS;
    // Hot path: link in step and nothing queued, so no task wrapper.
    if (!this.needsPreparation() && this.queue.tryAcquire()) {
      return (this.exchange(command, timeoutS, false, this.releaseSlot) as Promise<string>).then(undefined, this.named);
    }
    return this.exclusive((io) => io.ask(command, timeoutS));
  }

  /** Like query, but the reply's bytes untouched (for arbitrary blocks). */
  queryBytes(command: string, options?: { timeoutS?: number }): Promise<Uint8Array> {
    const timeoutS = options?.timeoutS ?? this.defaultTimeoutS;
    return this.exclusive(async () => (await this.exchange(command, timeoutS, true, null)) as Buffer);
  }

  /**
   * Runs `task` with the link to itself (in step, reopened if needed): a
   * sequence such as "write, then SYST:ERR?" that nothing may interleave.
   */
  exclusive<T>(task: (io: LinkIo) => Promise<T>): Promise<T> {
    return this.queue
      .run(async () => {
        if (this.needsPreparation()) await this.prepare();
        return task(this.io);
      })
      .then(undefined, this.named);
  }

  /** Reopens the transport now (bounded retries), then continues in step. */
  reconnect(): Promise<void> {
    return this.queue.run(() => this.reopen()).then(undefined, this.named);
  }

  /**
   * Gets back in step now (normally done on its own before the next
   * operation); resolves with the number of stale lines dropped since the
   * last timeout, counted or resynced away.
   */
  resync(): Promise<number> {
    return this.queue
      .run(async () => {
        if (this.state !== 'open') throw new DisconnectedError(this.address, 'session closed');
        if (!this.transport.isOpen) await this.reopen();
        await this.runResync();
        const dropped = this.stats.staleLines - this.staleAtTimeout;
        this.staleAtTimeout = this.stats.staleLines;
        return dropped;
      })
      .then(undefined, this.named);
  }

  /**
   * Writes `command` at once, ahead of any queued operation and of any
   * resync, with no reply expected: the safe state's way to reach an
   * instrument whose replies have wedged (it may still obey commands). A
   * link that is down is reopened first (bounded retries).
   */
  async sendUrgent(command: string): Promise<void> {
    try {
      if (this.state !== 'open') throw new DisconnectedError(this.address, 'session closed');
      if (!this.transport.isOpen) await this.reopen();
      await this.send(command);
    } catch (error) {
      this.named(error);
    }
  }

  private needsPreparation(): boolean {
    return this.outOfStep || this.state !== 'open' || !this.transport.isOpen;
  }

  private async prepare(): Promise<void> {
    if (this.state !== 'open')
      throw new DisconnectedError(this.address, this.state === 'new' ? 'session not opened' : 'session closed');
    if (!this.transport.isOpen) {
      if (this.reconnectPolicy.attempts === 0) throw new DisconnectedError(this.address, 'link is down');
      await this.reopen();
    }
    if (this.outOfStep) await this.runResync();
  }

  private async reopen(): Promise<void> {
    if (this.state !== 'open') throw new DisconnectedError(this.address, 'session closed');
    if (this.transport.isOpen) {
      this.closingLink = true;
      try {
        await this.transport.close();
      } finally {
        this.closingLink = false;
      }
    }
    const attempts = await reopenWithRetry(this.transport, this.clock, this.reconnectPolicy);
    // A new link carries no old replies.
    this.framer.reset();
    this.lateLinesOwed = 0;
    this.outOfStep = false;
    this.stats.reconnects += 1;
    this.onEvent?.({ type: 'reconnected', attempts });
  }

  private async runResync(): Promise<void> {
    const sync: SyncExchange =
      this.syncQuery !== null ? oneSync(this.syncQuery, this.syncQuietS) : this.nextTokenSync();
    const run = resync({
      clock: this.clock,
      sync,
      timeoutS: this.resyncTimeoutS,
      send: () => this.send(sync.command),
      setLineHook: (hook) => {
        this.lineHook = hook;
      },
    });
    this.resyncRun = run;
    try {
      const discarded = await run.done;
      this.stats.staleLines += discarded;
      this.lateLinesOwed = 0;
      this.outOfStep = false;
      this.resyncTimeoutS = this.defaultTimeoutS;
      this.stats.resyncs += 1;
      this.onEvent?.({ type: 'resync', discarded });
    } finally {
      this.resyncRun = null;
    }
  }

  private nextTokenSync(): SyncExchange {
    const sync = tokenSync(this.random, this.lastToken);
    this.lastToken = sync.token;
    return sync;
  }

  private async send(command: string): Promise<void> {
    this.lastSent = command;
    try {
      await this.transport.write(command + this.terminator);
    } catch (error) {
      throw asDisconnected(this.address, error);
    }
  }

  /** Writes `command` and waits for its one reply line. `onSettle` frees a hot-path slot. */
  private exchange(
    command: string,
    timeoutS: number,
    raw: boolean,
    onSettle: (() => void) | null,
  ): Promise<Buffer | string> {
    // Wait first, then write: a fast (in-process) link may answer before write() returns.
    const reply = this.waiter.expect(command, timeoutS, raw, true, onSettle);
    this.lastSent = command;
    this.transport
      .write(command + this.terminator)
      .then(undefined, (error: unknown) => this.waiter.fail(asDisconnected(this.address, error)));
    return reply;
  }

  private onTimedOut(timeoutS: number): void {
    if (this.lateLinesOwed === 0 && !this.outOfStep) this.staleAtTimeout = this.stats.staleLines;
    this.stats.timeouts += 1;
    this.lateLinesOwed += 1;
    this.outOfStep = true;
    this.resyncTimeoutS = Math.max(this.resyncTimeoutS, timeoutS, this.defaultTimeoutS);
  }

  private onLine(line: Buffer): void {
    if (this.lineHook !== null) {
      this.lineHook(line);
      return;
    }
    if (this.waiter.offer(line)) return;
    // Nobody asked: a late reply (paid off against the count) or an unsolicited line.
    this.stats.staleLines += 1;
    if (this.lateLinesOwed > 0) {
      this.lateLinesOwed -= 1;
      if (this.lateLinesOwed === 0) this.outOfStep = false;
    } else {
      this.outOfStep = true;
    }
    this.onEvent?.({ type: 'stale-line', line: line.toString('utf8') });
  }

  private onTransportClose(reason: Error | null): void {
    if (this.state !== 'open' || this.closingLink) return;
    this.framer.reset();
    const detail = reason === null ? 'closed by the remote end' : reason.message;
    this.onEvent?.({ type: 'disconnected', reason: detail });
    const error = new DisconnectedError(this.address, detail, { cause: reason ?? undefined });
    this.resyncRun?.abort(error);
    this.waiter.fail(error);
  }
}

export function positive(field: string, value: number): number {
  if (!(value > 0) || !Number.isFinite(value)) throw new TypeError(`${field}: must be a positive number, got ${value}`);
  return value;
}

function message(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

function asDisconnected(address: string, error: unknown): Error {
  if (error instanceof DisconnectedError) return error;
  return new DisconnectedError(address, message(error), { cause: error });
}
