/**
 * The one IPC gate of the desktop app. Every handler registers here; a call
 * is answered only when it comes from one of the app's own windows (its top
 * frame, showing the app's own origin), and only after the contract's schemas
 * have checked every argument. Handlers never see raw IPC arguments.
 *
 * Electron is reached through the narrow interfaces below (types only), so a
 * test drives the gate with fakes and never launches Electron.
 */
import type { BenchApi, BenchEvent } from '../../app/contract/bench-api.ts';
import { checkCall, describeError, invokeValidated } from '../service/call-guard.ts';
import { callChannel, EVENT_CHANNEL, type IpcMethod, type IpcOutcome } from './channels.ts';

/** What the gate reads from an IPC event (a subset of IpcMainInvokeEvent). */
export interface IpcCallEvent {
  sender: { id: number };
  senderFrame: { url: string; parent: unknown } | null;
}

export interface IpcMainLike {
  handle(channel: string, listener: (event: IpcCallEvent, ...args: unknown[]) => Promise<IpcOutcome>): void;
  removeHandler(channel: string): void;
}

export interface TrustedWindow {
  webContentsId: number;
  send(channel: string, payload: unknown): void;
}

export interface IpcGate {
  /** A window whose calls are answered and which receives pushed events. */
  trust(window: TrustedWindow): () => void;
  /** Registers one method; `handler` gets validated arguments and the caller's window. */
  handle(method: IpcMethod, handler: (args: unknown[], caller: TrustedWindow) => Promise<unknown>): void;
  /** Sends a pushed event to every trusted window. */
  broadcast(event: BenchEvent): void;
  dispose(): void;
}

export function createIpcGate(ipcMain: IpcMainLike, isAppUrl: (url: string) => boolean): IpcGate {
  const windows = new Map<number, TrustedWindow>();
  const channels: string[] = [];

  const callerOf = (event: IpcCallEvent): TrustedWindow | null => {
    const window = windows.get(event.sender.id);
    const frame = event.senderFrame;
    // Only the top frame of our own window, still on our own page.
    if (!window || !frame || frame.parent !== null || !isAppUrl(frame.url)) return null;
    return window;
  };

  return {
    trust(window) {
      windows.set(window.webContentsId, window);
      return () => windows.delete(window.webContentsId);
    },
    handle(method, handler) {
      const channel = callChannel(method);
      channels.push(channel);
      ipcMain.handle(channel, async (event, ...args): Promise<IpcOutcome> => {
        try {
          const caller = callerOf(event);
          if (!caller)
            return { ok: false, error: { message: `${method}: refused, the caller is not a tunebench window` } };
          const checked = checkCall(method, args);
          if (!checked.ok) return checked;
          const result = await handler(checked.args, caller);
          return { ok: true, result: result === undefined ? null : result };
        } catch (error) {
          return { ok: false, error: describeError(error) };
        }
      });
    },
    broadcast(event) {
      for (const window of windows.values()) window.send(EVENT_CHANNEL, event);
    },
    dispose() {
      for (const channel of channels.splice(0)) ipcMain.removeHandler(channel);
      windows.clear();
    },
  };
}

/** Feature setup: every BenchApi method, answered by the service. Returns the event unsubscriber. */
export function setupBenchIpc(gate: IpcGate, api: BenchApi, methods: readonly IpcMethod[]): () => void {
  for (const method of methods) gate.handle(method, (args) => invokeValidated(api, method, args));
  return api.subscribe((event) => gate.broadcast(event));
}
