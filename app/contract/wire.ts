/**
 * Wire format of BenchApi over a WebSocket (browser mode). Electron IPC
 * carries the same method names and parameter arrays.
 *
 *   client → server  { id, method, params }            one call
 *   server → client  { id, ok: true, result }           its answer
 *                    { id, ok: false, error: { message, field? } }
 *                    { event: BenchEvent }              pushed events
 *
 * The access token travels as `?token=…` on the WebSocket URL, exactly as on
 * the page URL that `tunebench serve` prints.
 */
import type { BenchEvent, BenchMethod, DesktopMethod } from './bench-api.ts';

export interface WireCall {
  id: number;
  method: BenchMethod;
  params: unknown[];
}

export interface WireError {
  message: string;
  /** Dotted path of the offending field, when a schema rejected the call. */
  field?: string;
}

export type WireReply =
  | { id: number; ok: true; result: unknown }
  | { id: number; ok: false; error: WireError };

export interface WireEvent {
  event: BenchEvent;
}

export const BENCH_METHODS: readonly BenchMethod[] = [
  'listSerialPorts',
  'listProfiles',
  'connect',
  'disconnect',
  'getConnection',
  'startSweep',
  'startDrift',
  'startPushing',
  'pauseRun',
  'resumeRun',
  'stopRun',
  'listRuns',
  'openRun',
  'renameRun',
  'addNote',
  'deleteRun',
  'restoreRun',
  'importCsv',
] as const;

/** Optional methods the desktop preload adds (see BenchApi); the WebSocket carrier has none. */
export const DESKTOP_METHODS: readonly DesktopMethod[] = ['printDatasheetPdf'] as const;
