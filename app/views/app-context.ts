/** What every screen needs: the bench contract and the app's stores. */
import { createContext, useContext } from 'react';
import type { Bridge } from '../bridge/pick-bridge.ts';
import type { AppStores } from '../state/app-stores.ts';

export interface AppContextValue {
  bridge: Bridge;
  stores: AppStores;
}

export const AppContext = createContext<AppContextValue | null>(null);

export function useApp(): AppContextValue {
  const value = useContext(AppContext);
  if (!value) throw new Error('useApp outside <AppContext.Provider>');
  return value;
}
