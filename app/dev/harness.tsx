/**
 * DEV ONLY — not shipped. Mounts the real app on the in-memory fake bench so
 * the screens can be looked at (and screenshotted) without the main process.
 * Query: ?theme=dark|light, ?screen=<name>, ?demo=sweep|drift (start a run), ?big=N (an N-row stored drift run).
 */
import { createRoot } from 'react-dom/client';
import { startApp } from '../views/start-app.tsx';
import { createFakeBench } from './fake-bench-api.ts';

const query = new URLSearchParams(window.location.search);
const big = Number(query.get('big') ?? '0');
const api = createFakeBench(big > 0 ? { bigDriftRows: big } : {});
const theme = query.get('theme');
if (theme === 'dark' || theme === 'light') window.localStorage.setItem('tunebench.theme', theme);
const root = document.getElementById('root');
if (root)
  startApp(createRoot(root), {
    api,
    transport: 'ipc',
    link: { getState: () => 'open', subscribe: () => () => undefined },
  });

// Drive the UI like a user would, through its buttons.
const click = (testId: string) => {
  const selector = testId.endsWith('*') ? `[data-testid^="${testId.slice(0, -1)}"]` : `[data-testid="${testId}"]`;
  document.querySelector<HTMLElement>(selector)?.click();
};
// ?then=a,b*,c clicks those test ids in turn after the screen is shown (b* = first id starting with b).
const then = (query.get('then') ?? '').split(',').filter((id) => id !== '');
const clickInTurn = (ids: string[]) => {
  const [first, ...rest] = ids;
  if (first === undefined) return;
  click(first);
  setTimeout(() => clickInTurn(rest), 300);
};
const demo = query.get('demo');
const screen = query.get('screen');
setTimeout(() => {
  if (demo) click('use-sim');
  setTimeout(() => {
    if (demo === 'sweep') click('start-sweep');
    if (demo === 'drift') {
      click('nav-drift');
      setTimeout(() => click('start-drift'), 100);
    }
    if (screen)
      setTimeout(
        () => {
          click(`nav-${screen}`);
          setTimeout(() => clickInTurn(then), 300);
        },
        demo ? 4000 : 50,
      );
  }, 200);
}, 100);
