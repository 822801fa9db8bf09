/**
 * The theme in effect: the user's choice, or the system's when the choice is
 * "follow system". Its own module so screens and the live-run source can use
 * it without importing the shell (App.tsx), which imports them.
 */
import { useSyncExternalStore } from 'react';
import { useStore } from '../state/use-store.ts';
import { useApp } from './app-context.ts';

function usePrefersDark(): boolean {
  return useSyncExternalStore(
    (notify) => {
      const query = window.matchMedia('(prefers-color-scheme: dark)');
      query.addEventListener('change', notify);
      return () => query.removeEventListener('change', notify);
    },
    () => window.matchMedia('(prefers-color-scheme: dark)').matches,
  );
}

export function useEffectiveTheme(): 'dark' | 'light' {
  const { stores } = useApp();
  const choice = useStore(stores.settings, (s) => s.theme);
  const prefersDark = usePrefersDark();
  return choice === 'system' ? (prefersDark ? 'dark' : 'light') : choice;
}
