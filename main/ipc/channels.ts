/**
 * IPC channel names, derived from the contract's method list so the preload
 * and the gate can never disagree. Pure: the preload bundle imports it.
 */
import type { BenchMethod, DesktopMethod } from '../../app/contract/bench-api.ts';
import { BENCH_METHODS, DESKTOP_METHODS } from '../../app/contract/wire.ts';

export type IpcMethod = BenchMethod | DesktopMethod;

/** main → renderer pushed BenchEvents. */
export const EVENT_CHANNEL = 'tunebench:event';

export function callChannel(method: IpcMethod): string {
  return `tunebench:call:${method}`;
}

export const IPC_METHODS: readonly IpcMethod[] = [...BENCH_METHODS, ...DESKTOP_METHODS];

/**
 * What an invoke handler returns: the outcome travels as data, because an
 * exception thrown in main reaches the renderer as a re-worded string and
 * would lose the offending field.
 */
export type IpcOutcome = { ok: true; result: unknown } | { ok: false; error: { message: string; field?: string } };
