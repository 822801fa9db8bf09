/**
 * Preload of the desktop window (sandboxed, context-isolated). Exposes only
 * the BenchApi verbs as `window.tunebench`; the page never sees ipcRenderer
 * or the IPC event objects.
 */
import { contextBridge, ipcRenderer, type IpcRendererEvent } from 'electron';
import { buildPreloadApi } from './preload-api.ts';

const api = buildPreloadApi({
  invoke: (channel, ...args) => ipcRenderer.invoke(channel, ...args),
  on: (channel, listener) => {
    const wrapped = (_event: IpcRendererEvent, payload: unknown): void => listener(payload);
    ipcRenderer.on(channel, wrapped);
    return () => {
      ipcRenderer.removeListener(channel, wrapped);
    };
  },
});

contextBridge.exposeInMainWorld('tunebench', api);
