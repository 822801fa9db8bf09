/**
 * The thin React adapter over a vanilla store: subscribe + getState through
 * useSyncExternalStore. Selectors should return scalars or stable references
 * (an action, a meta object) — never build new objects or arrays in them.
 */
import { useSyncExternalStore } from 'react';
import type { StoreApi } from 'zustand/vanilla';

export function useStore<T, U>(store: StoreApi<T>, selector: (state: T) => U): U {
  const read = () => selector(store.getState());
  return useSyncExternalStore(store.subscribe, read, read);
}
