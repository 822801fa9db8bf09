/**
 * Builds the object the preload exposes as `window.tunebench`: the BenchApi
 * methods and subscribe, nothing else (no ipcRenderer, no channel names the
 * page could choose). Pure, with `invoke`/`on` injected, so a test checks the
 * surface without Electron.
 */
import type { BenchApi, BenchEvent } from '../app/contract/bench-api.ts';
import { callChannel, EVENT_CHANNEL, IPC_METHODS, type IpcMethod, type IpcOutcome } from './ipc/channels.ts';

export interface IpcPort {
  invoke(channel: string, ...args: unknown[]): Promise<unknown>;
  /** Adds a listener for a main → renderer channel; returns its remover. */
  on(channel: string, listener: (payload: unknown) => void): () => void;
}

/** An error from main, carrying the field the schema rejected (when any). */
export class BenchIpcError extends Error {
  override name = 'BenchIpcError';
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

function unwrap(method: IpcMethod, outcome: unknown): unknown {
  const value = outcome as Partial<IpcOutcome> | null;
  if (value && value.ok === true) return (value as { result: unknown }).result;
  if (value && value.ok === false && value.error && typeof value.error.message === 'string') {
    throw new BenchIpcError(value.error.message, value.error.field);
  }
  throw new BenchIpcError(`${method}: unreadable reply from main`);
}

export function buildPreloadApi(port: IpcPort): BenchApi {
  const api: Record<string, unknown> = {};
  for (const method of IPC_METHODS) {
    const channel = callChannel(method);
    // Parameters go across as given; main validates every one of them.
    api[method] = async (...params: unknown[]): Promise<unknown> =>
      unwrap(method, await port.invoke(channel, ...params));
  }
  api.subscribe = (listener: (event: BenchEvent) => void): (() => void) => {
    if (typeof listener !== 'function') throw new TypeError('subscribe: listener must be a function');
    return port.on(EVENT_CHANNEL, (payload) => listener(payload as BenchEvent));
  };
  return Object.freeze(api) as unknown as BenchApi;
}
