/** The shell: top bar (name, bench badge, link state, theme), screen rail, the screen. */
import { useEffect, useRef, useSyncExternalStore, type MouseEvent } from 'react';
import { useEffectiveTheme } from './use-theme.ts';
import { SCREENS, type ScreenName, type ThemeChoice } from '../state/settings-store.ts';
import { useStore } from '../state/use-store.ts';
import { useApp } from './app-context.ts';
import { BenchScreen } from './bench/BenchScreen.tsx';
import { CampaignScreen } from './campaign/CampaignScreen.tsx';
import { ConnectionBadge } from './ConnectionBadge.tsx';
import { DatasheetScreen } from './datasheet/DatasheetScreen.tsx';
import { DriftScreen } from './drift/DriftScreen.tsx';
import { LoopScreen } from './loop/LoopScreen.tsx';
import { RunsScreen } from './runs/RunsScreen.tsx';
import { StatusStrip } from './StatusStrip.tsx';
import { SweepScreen } from './sweep/SweepScreen.tsx';

const SCREEN_LABEL: Record<ScreenName, string> = {
  bench: 'Bench',
  sweep: 'Gain sweep',
  drift: 'Drift log',
  runs: 'Run archive',
  datasheet: 'Gain table',
  loop: 'Loop filter',
  campaign: 'Campaign',
};

const THEME_LABEL: Record<ThemeChoice, string> = {
  system: 'Theme: follow system',
  dark: 'Theme: dark',
  light: 'Theme: light',
};

function LinkBanner() {
  const { bridge } = useApp();
  const state = useSyncExternalStore(bridge.link.subscribe, bridge.link.getState);
  if (state === 'open') return null;
  return (
    <div className={`link-banner link-${state}`} role="status" data-testid="link-state">
      {state === 'lost'
        ? 'Link to the bench lost — reconnecting. The bench process keeps control of any run in progress.'
        : 'Reaching the bench…'}
    </div>
  );
}

/** Browser mode: one bench, one operator — anyone else on it can stop, pause or rename a run, so say so. */
function PeerNotice() {
  const { stores } = useApp();
  const others = useStore(stores.connection, (s) => s.peers);
  if (others <= 0) return null;
  return (
    <div className="link-banner" role="status" data-testid="peer-count">
      {others === 1 ? 'One other page' : `${others} other pages`} connected to this bench: whoever is there can stop,
      pause or rename a run too.
    </div>
  );
}

function Notice() {
  const { stores } = useApp();
  const message = useStore(stores.notice, (s) => s.message);
  const dismiss = useStore(stores.notice, (s) => s.dismiss);
  if (!message) return null;
  return (
    <div className="notice" role="alert" data-testid="notice">
      <span>{message}</span>
      <button type="button" className="quiet" onClick={dismiss}>
        Dismiss
      </button>
    </div>
  );
}

/**
 * Moves the keyboard to `selector` (made focusable for the purpose), or to the screen when the screen has no
 * such part yet (no key figures before a run).
 */
function skipTo(event: MouseEvent<HTMLAnchorElement>, selector: string): void {
  event.preventDefault();
  const target = document.querySelector<HTMLElement>(selector) ?? document.getElementById('stage');
  if (!target) return;
  if (!target.hasAttribute('tabindex')) target.tabIndex = -1;
  target.focus();
  target.scrollIntoView({ block: 'start' });
}

export function App() {
  const { stores } = useApp();
  const screen = useStore(stores.settings, (s) => s.screen);
  const show = useStore(stores.settings, (s) => s.show);
  const themeChoice = useStore(stores.settings, (s) => s.theme);
  const cycleTheme = useStore(stores.settings, (s) => s.cycleTheme);
  const theme = useEffectiveTheme();

  useEffect(() => {
    document.documentElement.dataset.theme = theme;
  }, [theme]);
  const shownScreen = useRef(screen);
  useEffect(() => {
    // A control that changed the screen (e.g. "Use the simulated bench") is gone with the old screen; the
    // keyboard continues from the new screen's start instead of the top of the page. Not on first load:
    // there the first Tab belongs to the skip link.
    if (shownScreen.current === screen) return;
    shownScreen.current = screen;
    const at = document.activeElement;
    if (at === null || at === document.body) document.getElementById('stage')?.focus();
  }, [screen]);

  return (
    <div className="shell">
      <a className="skip-link" href="#stage" onClick={(event) => skipTo(event, '#stage')} data-testid="skip-link">
        Skip to the screen
      </a>
      {screen === 'sweep' || screen === 'drift' ? (
        <a
          className="skip-link"
          href="#stage"
          onClick={(event) => skipTo(event, '#stage .key-figures')}
          data-testid="skip-figures"
        >
          Skip to the key figures
        </a>
      ) : null}
      <header className="topbar">
        <div className="brand">
          <span className="brand-mark" aria-hidden="true" />
          tunebench
        </div>
        <ConnectionBadge />
        <div className="topbar-spacer" />
        <button
          type="button"
          className="quiet"
          onClick={cycleTheme}
          data-testid="theme-toggle"
          aria-label={`${THEME_LABEL[themeChoice]}; activate to change`}
        >
          {THEME_LABEL[themeChoice]}
        </button>
      </header>
      <StatusStrip />
      <LinkBanner />
      <PeerNotice />
      <Notice />
      <nav className="rail" aria-label="Screens">
        {SCREENS.map((name) => (
          <button
            key={name}
            type="button"
            className={name === screen ? 'rail-item current' : 'rail-item'}
            aria-current={name === screen ? 'page' : undefined}
            onClick={() => show(name)}
            data-testid={`nav-${name}`}
          >
            {SCREEN_LABEL[name]}
          </button>
        ))}
      </nav>
      <main className="stage" id="stage" tabIndex={-1} key={`${screen}-${theme}`}>
        {screen === 'bench' ? <BenchScreen /> : null}
        {screen === 'sweep' ? <SweepScreen /> : null}
        {screen === 'drift' ? <DriftScreen /> : null}
        {screen === 'runs' ? <RunsScreen /> : null}
        {screen === 'datasheet' ? <DatasheetScreen /> : null}
        {screen === 'loop' ? <LoopScreen /> : null}
        {screen === 'campaign' ? <CampaignScreen /> : null}
      </main>
    </div>
  );
}
