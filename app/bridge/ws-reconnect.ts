/**
 * One WebSocket to main that comes back by itself (browser mode): opens a
 * socket, tells its owner when it opens, what it receives and when it is lost,
 * and after a loss (or a socket that cannot even be created) tries again after
 * a growing delay, until `close()`. The link state ('connecting' | 'open' |
 * 'lost') is what the page's link banner shows. Socket and timers are injected
 * so tests drive it with fakes.
 */

/** The part of the DOM WebSocket this client uses. */
export interface SocketLike {
  readonly readyState: number;
  /** Set to "arraybuffer": binary replies (app/contract/wire.ts) are read in place. */
  binaryType?: string;
  send(data: string | Uint8Array): void;
  close(): void;
  onopen: (() => void) | null;
  onclose: (() => void) | null;
  onerror: (() => void) | null;
  onmessage: ((message: { data: unknown }) => void) | null;
}

export interface Timers {
  setTimeout(callback: () => void, delayMs: number): unknown;
  clearTimeout(handle: unknown): void;
}

export type LinkState = 'connecting' | 'open' | 'lost';

export interface ReconnectingSocketOptions {
  url: string;
  createSocket: (url: string) => SocketLike;
  timers?: Timers;
  /** Delays between reconnect attempts, ms; the last repeats. Default 250 → 4000. */
  reconnectDelaysMs?: readonly number[];
  onOpen: () => void;
  onMessage: (data: unknown) => void;
  /** The socket closed (not by `close()`); called before the state turns 'lost'. */
  onLost: () => void;
}

const OPEN = 1;
const DEFAULT_DELAYS_MS = [250, 500, 1000, 2000, 4000] as const;

const defaultTimers: Timers = {
  setTimeout: (callback, delayMs) => globalThis.setTimeout(callback, delayMs),
  clearTimeout: (handle) => globalThis.clearTimeout(handle as ReturnType<typeof globalThis.setTimeout>),
};

export class ReconnectingSocket {
  private readonly timers: Timers;
  private readonly delays: readonly number[];
  private readonly stateListeners = new Set<(state: LinkState) => void>();
  private linkState: LinkState = 'connecting';
  private socket: SocketLike | null = null;
  private attempt = 0;
  private retryHandle: unknown = null;
  private closedByUser = false;

  /** Opens the first socket at once. */
  constructor(private readonly options: ReconnectingSocketOptions) {
    this.timers = options.timers ?? defaultTimers;
    this.delays = options.reconnectDelaysMs ?? DEFAULT_DELAYS_MS;
    this.open();
  }

  get state(): LinkState {
    return this.linkState;
  }

  /** True after `close()`: nothing will be sent again. */
  get closed(): boolean {
    return this.closedByUser;
  }

  /** True while a socket is open for sending. */
  get canSend(): boolean {
    return this.socket !== null && this.socket.readyState === OPEN;
  }

  /** Sends on the open socket; call only while `canSend`. */
  send(message: string | Uint8Array): void {
    if (this.socket === null) throw new Error('send: no open socket');
    this.socket.send(message);
  }

  subscribe(listener: (state: LinkState) => void): () => void {
    this.stateListeners.add(listener);
    return () => this.stateListeners.delete(listener);
  }

  /** Stops reconnecting and closes the socket; the state turns 'lost'. */
  close(): void {
    this.closedByUser = true;
    if (this.retryHandle !== null) this.timers.clearTimeout(this.retryHandle);
    this.retryHandle = null;
    const current = this.socket;
    this.socket = null;
    current?.close();
    this.setState('lost');
  }

  private setState(next: LinkState): void {
    if (next === this.linkState) return;
    this.linkState = next;
    for (const listener of this.stateListeners) listener(next);
  }

  private scheduleReconnect(): void {
    if (this.closedByUser || this.retryHandle !== null) return;
    const delay = this.delays[Math.min(this.attempt, this.delays.length - 1)] ?? 4000;
    this.attempt += 1;
    this.retryHandle = this.timers.setTimeout(() => {
      this.retryHandle = null;
      this.open();
    }, delay);
  }

  private open(): void {
    if (this.closedByUser) return;
    let created: SocketLike;
    try {
      created = this.options.createSocket(this.options.url);
    } catch {
      this.setState('lost');
      this.scheduleReconnect();
      return;
    }
    this.socket = created;
    created.binaryType = 'arraybuffer';
    created.onopen = () => {
      if (this.socket !== created) return;
      this.attempt = 0;
      this.setState('open');
      this.options.onOpen();
    };
    created.onmessage = (message) => {
      if (this.socket === created) this.options.onMessage(message.data);
    };
    created.onerror = () => {
      // A close always follows an error; reconnect is handled there.
    };
    created.onclose = () => {
      if (this.socket !== created) return;
      this.socket = null;
      this.options.onLost();
      this.setState('lost');
      this.scheduleReconnect();
    };
  }
}
