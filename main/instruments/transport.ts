/**
 * Byte transport to one instrument: serial port, raw TCP socket or an
 * in-process simulated instrument. Nothing above this interface knows which.
 * (Habit from node-serialport's bindings interface: the hardware sits behind
 * promises for open/write/close, and data arrives as events.)
 */
export interface TransportEvents {
  data: (chunk: Uint8Array) => void;
  /** The link went away (remote closed, cable pulled, process died). */
  close: (reason: Error | null) => void;
}

export interface Transport {
  /** Human-readable address, e.g. `tcp://127.0.0.1:5025`. */
  readonly address: string;
  readonly isOpen: boolean;
  open(): Promise<void>;
  write(data: Uint8Array | string): Promise<void>;
  close(): Promise<void>;
  /** Subscribe; returns an unsubscribe function. */
  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void;
  /**
   * Present on a transport that frames lines itself (serial, with
   * @serialport/parser-readline): `onLine` gets each reply line, terminator
   * removed, definite blocks whole; a partial line does not outlive the port
   * it came from. Returns an unsubscribe function. Without it, ScpiLink frames the
   * `data` events with its own LineFramer.
   */
  onLines?(terminator: string, onLine: (line: Buffer) => void): () => void;
}
