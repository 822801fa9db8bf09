/**
 * Builds the stores for a bridge, routes events into them, refreshes on
 * every (re)connection of the link, and mounts the shell. Shared by the real
 * entry and the dev harness.
 */
import type { Root } from 'react-dom/client';
import { z } from 'zod';
import { StrictMode } from 'react';
import type { Bridge } from '../bridge/pick-bridge.ts';
import { connectStores, createAppStores, restoreRunContext } from '../state/app-stores.ts';
import { App } from './App.tsx';
import { AppContext } from './app-context.ts';
import '../styles/base.css';
import '../styles/layout.css';
import '../styles/controls.css';
import '../styles/plots.css';

function safeStorage(): Storage | null {
  try {
    return window.localStorage;
  } catch {
    return null;
  }
}

export function startApp(root: Root, bridge: Bridge): void {
  // The page's CSP forbids eval; tell zod not to try compiling validators with new Function.
  z.config({ jitless: true });
  const stores = createAppStores(bridge.api, safeStorage());
  connectStores(bridge.api, stores);
  const refresh = () => {
    void stores.connection.getState().refresh();
    void stores.runs.getState().refresh();
    void restoreRunContext(bridge.api, stores).catch(() => undefined);
  };
  if (bridge.link.getState() === 'open') refresh();
  bridge.link.subscribe((state) => {
    if (state === 'open') refresh();
  });
  root.render(
    <StrictMode>
      <AppContext.Provider value={{ bridge, stores }}>
        <App />
      </AppContext.Provider>
    </StrictMode>,
  );
}
