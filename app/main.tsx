/** Renderer entry: pick the transport, build the stores, mount the shell. */
import { createRoot } from 'react-dom/client';
import { pickBridge } from './bridge/pick-bridge.ts';
import { exposePlotWork } from './plots/frame-work.ts';
import { startApp } from './views/start-app.tsx';

const root = document.getElementById('root');
if (root) startApp(createRoot(root), pickBridge(window));
// Read-only timing figures for `npm run bench` (test/bench/browser.ts).
exposePlotWork(window as { tunebenchPlotWorkSince?: (sinceMs: number) => number[] });
