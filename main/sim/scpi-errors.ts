/**
 * SCPI error codes used by the simulated instruments (SCPI-99 volume 2,
 * chapter 21, "Error/event queue" — standard numbers and messages, from memory).
 */
export const SCPI_ERRORS = {
  syntax: { code: -102, message: 'Syntax error' },
  dataType: { code: -104, message: 'Data type error' },
  parameterNotAllowed: { code: -108, message: 'Parameter not allowed' },
  missingParameter: { code: -109, message: 'Missing parameter' },
  undefinedHeader: { code: -113, message: 'Undefined header' },
  headerSuffixOutOfRange: { code: -114, message: 'Header suffix out of range' },
  settingsConflict: { code: -221, message: 'Settings conflict' },
  dataOutOfRange: { code: -222, message: 'Data out of range' },
  illegalParameterValue: { code: -224, message: 'Illegal parameter value' },
  dataStale: { code: -230, message: 'Data corrupt or stale' },
  queueOverflow: { code: -350, message: 'Queue overflow' },
  queryInterrupted: { code: -410, message: 'Query INTERRUPTED' },
} as const;

export type ScpiErrorName = keyof typeof SCPI_ERRORS;

/** Thrown by a command handler; the device pushes it onto its error queue. */
export class ScpiError extends Error {
  override name = 'ScpiError';
  readonly code: number;
  /** Text for the queue: the standard message, optionally with `;detail`. */
  readonly queueText: string;

  constructor(kind: ScpiErrorName, detail?: string) {
    const { code, message } = SCPI_ERRORS[kind];
    const text = detail ? `${message};${detail}` : message;
    super(text);
    this.code = code;
    this.queueText = text;
  }
}

/** Event Status Register bit for an error code (IEEE 488.2 §11.5.1, from memory). */
export function esrBitFor(code: number): number {
  if (code <= -100 && code > -200) return 1 << 5; // CME command error
  if (code <= -200 && code > -300) return 1 << 4; // EXE execution error
  if (code <= -300 && code > -400) return 1 << 3; // DDE device-dependent error
  if (code <= -400 && code > -500) return 1 << 2; // QYE query error
  return 1 << 3;
}
