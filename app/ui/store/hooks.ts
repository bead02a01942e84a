/**
 * React adapter for createStore: subscribe to a selected slice with useSyncExternalStore. The
 * selector should return something stable by reference (a state field, not a new object).
 */
import { useSyncExternalStore } from 'react';
import type { Store } from './createStore';

export function useStoreSlice<S extends object, T>(store: Store<S>, select: (s: S) => T): T {
  return useSyncExternalStore(
    store.subscribe,
    () => select(store.getState()),
    () => select(store.getState()),
  );
}
