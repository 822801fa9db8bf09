/** Renderer entry: pick the transport, build the stores, mount the shell. */
import { createRoot } from 'react-dom/client';
import { pickBridge } from './bridge/pick-bridge.ts';
import { startApp } from './views/start-app.tsx';

const root = document.getElementById('root');
if (root) startApp(createRoot(root), pickBridge(window));
