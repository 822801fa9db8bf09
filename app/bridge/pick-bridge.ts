/**
 * Chooses how the renderer reaches main. Inside Electron the preload exposes
 * `window.tunebench` (IPC); in a plain browser the page was served by
 * `tunebench serve` and the same BenchApi runs over a WebSocket at /api,
 * carrying the page's access token.
 */
import type { BenchApi } from '../contract/bench-api.ts';
import { createWsBench, type LinkState, type SocketLike } from './ws-client.ts';

declare global {
  interface Window {
    tunebench?: BenchApi;
  }
}

export interface Bridge {
  api: BenchApi;
  transport: 'ipc' | 'websocket' | 'page';
  link: {
    getState: () => LinkState;
    subscribe: (listener: (state: LinkState) => void) => () => void;
  };
}

/** ws(s)://<same host>/api?token=<token> from the page location. */
export function socketUrlFor(location: { protocol: string; host: string; search: string }): string {
  const token = new URLSearchParams(location.search).get('token') ?? '';
  const scheme = location.protocol === 'https:' ? 'wss:' : 'ws:';
  return `${scheme}//${location.host}/api?token=${encodeURIComponent(token)}`;
}

function isBenchApi(value: unknown): value is BenchApi {
  return (
    typeof value === 'object' && value !== null && typeof (value as { subscribe?: unknown }).subscribe === 'function'
  );
}

export function pickBridge(win: Window): Bridge {
  if (isBenchApi(win.tunebench)) {
    // IPC does not drop while the window lives.
    return { api: win.tunebench, transport: 'ipc', link: { getState: () => 'open', subscribe: () => () => undefined } };
  }
  const ws = createWsBench({
    url: socketUrlFor(win.location),
    createSocket: (url) => new WebSocket(url) as unknown as SocketLike,
  });
  return { api: ws.api, transport: 'websocket', link: ws.link };
}
