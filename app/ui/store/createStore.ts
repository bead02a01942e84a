/**
 * A tiny observable store: getState / setState / subscribe, no React inside (style.md: the store's
 * core does not depend on React; hooks.ts is the thin adapter). State is treated as immutable:
 * setState replaces the top-level object, so subscribers can compare slices by reference.
 */
export type Listener<S> = (state: S, previous: S) => void;

export interface Store<S> {
  getState(): S;
  /** Shallow-merges a partial (or the result of an updater) into the state and notifies once. */
  setState(patch: Partial<S> | ((s: S) => Partial<S>)): void;
  /** Returns an unsubscribe function. */
  subscribe(listener: Listener<S>): () => void;
}

export function createStore<S extends object>(initial: S): Store<S> {
  let state = initial;
  const listeners = new Set<Listener<S>>();
  return {
    getState: () => state,
    setState(patch) {
      const p = typeof patch === 'function' ? patch(state) : patch;
      const keys = Object.keys(p) as (keyof S)[];
      // Skip the notification when nothing changed by reference (cheap no-op updates).
      if (keys.every((k) => Object.is(p[k], state[k]))) return;
      const previous = state;
      state = { ...state, ...p };
      for (const l of [...listeners]) l(state, previous);
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
  };
}
