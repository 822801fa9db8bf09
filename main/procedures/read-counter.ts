/**
 * One counter reading, as a row status. A missing oscillation is data
 * (`no-signal`), a late or garbled reply is a failed reading (`timeout`,
 * `error`) that the run records and survives. A dropped link is not a
 * reading at all: it is thrown so the procedure can reconnect or stop.
 */
import {
  AlignmentError,
  DisconnectedError,
  InstrumentError,
  ReplyFormatError,
  TimeoutError,
} from '../instruments/errors.ts';
import type { Counter } from '../instruments/roles.ts';
import type { SampleStatus } from './types.ts';

export interface CounterReading {
  status: SampleStatus;
  /** NaN unless status is 'ok'. */
  frequencyHz: number;
  /** Why the reading is not 'ok' (error message or no-signal cause), else null. */
  detail: string | null;
  /** Error class name for failed readings ('TimeoutError', 'InstrumentError', …). */
  errorName: string | null;
}

export function isLinkLoss(error: unknown): error is DisconnectedError {
  return error instanceof DisconnectedError;
}

/** A failure the run can record and carry on from (the link is still there). */
export function isRecoverableInstrumentFault(
  error: unknown,
): error is TimeoutError | InstrumentError | ReplyFormatError | AlignmentError {
  return (
    error instanceof TimeoutError ||
    error instanceof InstrumentError ||
    error instanceof ReplyFormatError ||
    error instanceof AlignmentError
  );
}

export async function readCounter(counter: Counter): Promise<CounterReading> {
  try {
    const reading = await counter.readFrequency();
    if (reading.status === 'ok') {
      return { status: 'ok', frequencyHz: reading.frequencyHz, detail: null, errorName: null };
    }
    return { status: 'no-signal', frequencyHz: Number.NaN, detail: reading.cause, errorName: null };
  } catch (error) {
    if (error instanceof TimeoutError) {
      return { status: 'timeout', frequencyHz: Number.NaN, detail: error.message, errorName: error.name };
    }
    if (error instanceof InstrumentError || error instanceof ReplyFormatError || error instanceof AlignmentError) {
      return { status: 'error', frequencyHz: Number.NaN, detail: error.message, errorName: error.name };
    }
    throw error;
  }
}
