/**
 * Typed failures of the instrument layer. Callers branch on the class (or on
 * the `disconnected` / `code` fields), never on message text.
 */

/** The instrument reported one or more entries in its SCPI error queue. */
export class InstrumentError extends Error {
  override readonly name = 'InstrumentError';
  /** SCPI-99 error number of the first entry, e.g. -113 (Undefined header). */
  readonly code: number;
  /** Every entry drained from the queue, oldest first. */
  readonly entries: readonly ScpiErrorEntry[];
  /** The command after which the queue was read, when known. */
  readonly command: string | undefined;

  constructor(entries: readonly ScpiErrorEntry[], command?: string) {
    const first = entries[0] ?? { code: 0, message: 'No error' };
    const more = entries.length > 1 ? ` (+${entries.length - 1} more)` : '';
    super(
      `instrument error ${first.code}, "${first.message}"${command === undefined ? '' : ` after ${command}`}${more}`,
    );
    this.code = first.code;
    this.entries = entries;
    this.command = command;
  }
}

export interface ScpiErrorEntry {
  code: number;
  message: string;
}

/** No reply (or no link) within the allowed time. */
export class TimeoutError extends Error {
  override readonly name = 'TimeoutError';
  readonly timeoutS: number;
  readonly command: string;
  constructor(command: string, timeoutS: number) {
    super(`no reply to ${command} within ${timeoutS} s`);
    this.command = command;
    this.timeoutS = timeoutS;
  }
}

/**
 * The link went away (or could not be reopened), or — with `opening` — never
 * came up: then the message says "cannot open", never "lost".
 */
export class DisconnectedError extends Error {
  override readonly name = 'DisconnectedError';
  readonly disconnected = true as const;
  readonly address: string;
  /** True when the link was never up (open failed). */
  readonly opening: boolean;
  constructor(address: string, detail?: string, options?: { cause?: unknown; opening?: boolean }) {
    const opening = options?.opening === true;
    super(
      `${opening ? `cannot open ${address}` : `link to ${address} lost`}${detail === undefined ? '' : `: ${detail}`}`,
      options,
    );
    this.address = address;
    this.opening = opening;
  }
}

/**
 * A reply that cannot be proven to answer the query it was taken for: after
 * a timeout the link's resync found no proof of alignment, or the reply kept
 * coming late. The reading is a fault, never a value.
 */
export class AlignmentError extends Error {
  override readonly name = 'AlignmentError';
  constructor(
    readonly command: string,
    detail: string,
    options?: { cause?: unknown },
  ) {
    super(`reply to ${command} not proven in step: ${detail}`, options);
  }
}

/** A supply write refused because it would put a channel above its ceiling (channel-ceilings.ts). Nothing was sent. */
export class ChannelLimitError extends Error {
  override readonly name = 'ChannelLimitError';
  constructor(
    readonly channel: number,
    readonly volts: number,
    readonly maxV: number,
    message: string,
  ) {
    super(message);
  }
}

/** A reply that is not what the query's grammar allows. Never a silent wrong value. */
export class ReplyFormatError extends Error {
  override readonly name = 'ReplyFormatError';
  /** The offending reply text (shortened for the message, whole here). */
  readonly reply: string;
  readonly expected: string;
  constructor(expected: string, reply: string) {
    const shown = reply.length > 60 ? `${reply.slice(0, 57)}...` : reply;
    super(`expected ${expected}, got ${JSON.stringify(shown)}`);
    this.reply = reply;
    this.expected = expected;
  }
}

/** The profile says the instrument cannot do this (e.g. no over-voltage protection). */
export class UnsupportedOperationError extends Error {
  override readonly name = 'UnsupportedOperationError';
  readonly operation: string;
  constructor(operation: string, profile: string) {
    super(`profile ${profile} has no command for ${operation}`);
    this.operation = operation;
  }
}

/** An address string that cannot be parsed; the message names the field. */
export class AddressError extends Error {
  override readonly name = 'AddressError';
  readonly field: string;
  constructor(field: string, message: string) {
    super(`address ${field}: ${message}`);
    this.field = field;
  }
}

/** A profile file that fails validation; the message names the field. */
export class ProfileError extends Error {
  override readonly name = 'ProfileError';
  readonly profile: string;
  constructor(profile: string, message: string) {
    super(`profile ${profile}: ${message}`);
    this.profile = profile;
  }
}

const namedFailures = new WeakSet<Error>();

/**
 * Puts the bench role and the instrument's address at the head of a
 * failure's message, once (the class and fields stay, so callers still
 * branch on them): a run that ends on "no reply to SYST:ERR? within 2 s"
 * must say which instrument did not answer.
 */
export function nameInstrument(error: unknown, role: string, address: string): unknown {
  if (!(error instanceof Error) || namedFailures.has(error)) return error;
  namedFailures.add(error);
  error.message = error.message.includes(address)
    ? `${role}: ${error.message}`
    : `${role} at ${address}: ${error.message}`;
  return error;
}

/** True once nameInstrument has named this failure's role and address. */
export function isInstrumentNamed(error: unknown): boolean {
  return error instanceof Error && namedFailures.has(error);
}

/**
 * Bringing up one role of a bench failed: names the role, the address and
 * the last command sent, with the underlying error as cause.
 */
export class RoleConnectError extends Error {
  override readonly name = 'RoleConnectError';
  constructor(
    readonly role: string,
    readonly address: string,
    readonly lastCommand: string | null,
    cause: unknown,
  ) {
    const detail = cause instanceof Error ? cause.message : String(cause);
    const where = isInstrumentNamed(cause) ? '' : detail.includes(address) ? `${role}: ` : `${role} at ${address}: `;
    super(`${where}${detail}${lastCommand === null ? ' (nothing was sent)' : ` (last command sent: ${lastCommand})`}`, {
      cause,
    });
  }
}
