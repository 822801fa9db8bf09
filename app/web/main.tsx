/**
 * Entry of the web edition: a static page that drives the bench itself. The
 * runs folder is the Origin Private File System; the simulated bench runs in
 * the page; the screens are the app's own (app/views) over the in-page
 * BenchApi. Closing or reloading the page (beforeunload, then pagehide)
 * stops a run and drives the supply to its safe state while the link is
 * still open.
 */
import './buffer-global.ts';
import { createRoot } from 'react-dom/client';
import { startApp } from '../views/start-app.tsx';
import { ScaledClock } from '../../main/time/scaled-clock.ts';
import type { BrowserSerial } from './page/browser-serial.ts';
import { createPageBench } from './page-bench.ts';
import { guardPageClose } from './page-close.ts';
import { simSpeedFrom } from './page-options.ts';
import { memoryDir, opfsDir, type PageDir } from './store/page-dir.ts';

interface SerialNavigator {
  serial?: BrowserSerial;
}

async function runsFolder(): Promise<PageDir> {
  try {
    const origin = await navigator.storage.getDirectory();
    return opfsDir(await origin.getDirectoryHandle('runs', { create: true }));
  } catch (error) {
    // No OPFS (an old browser, a private window that refuses storage): runs live until the page closes.
    console.warn(`tunebench: runs are kept in memory only (${(error as Error).message})`);
    return memoryDir();
  }
}

async function start(): Promise<void> {
  const speed = simSpeedFrom(window.location.search);
  const serial = (navigator as SerialNavigator).serial;
  const bench = createPageBench({
    root: await runsFolder(),
    simClock: speed > 1 ? () => new ScaledClock(speed) : undefined,
    serial,
  });
  guardPageClose(window, bench.service);
  const root = document.getElementById('root');
  if (root)
    startApp(createRoot(root), {
      api: bench.api,
      transport: 'page',
      link: { getState: () => 'open', subscribe: () => () => undefined },
    });
}

void start();
