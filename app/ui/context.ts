/** React access to the app controller and thin hooks over its stores. */
import { createContext, useContext, useMemo, useRef, useSyncExternalStore } from 'react';
import type { Issue } from '../engine/errors';
import type { AppController } from './appController';
import type { AppState } from './store/document';
import { useStoreSlice } from './store/hooks';
import { getIn, parsePath } from './store/paths';

export const AppContext = createContext<AppController | null>(null);

export function useApp(): AppController {
  const app = useContext(AppContext);
  if (!app) throw new Error('useApp outside <AppContext.Provider>');
  return app;
}

export function useAppState<T>(select: (s: AppState) => T): T {
  return useStoreSlice(useApp().store, select);
}

/** The JSON value at a scenario path (stable by reference thanks to structural sharing). */
export function useScenarioValue(path: string): unknown {
  const tokens = useMemo(() => parsePath(path), [path]);
  return useAppState((s) => getIn(s.scenario, tokens));
}

/** Same issues in the same order (path, rule, message): a new validation pass that found the same. */
function sameIssues(a: readonly Issue[], b: readonly Issue[]): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i]!,
      y = b[i]!;
    if (x.path !== y.path || x.rule !== y.rule || x.message !== y.message) return false;
  }
  return true;
}

const NO_ISSUES: Issue[] = [];

/**
 * A list of issues from the store that keeps its identity while its content does not change:
 * every edit validates the scenario again (new arrays, usually the same or no issues), and the
 * dozens of fields reading their issues should not render again for that.
 */
function useIssueList(select: (s: AppState) => Issue[]): Issue[] {
  const store = useApp().store;
  const last = useRef<Issue[]>(NO_ISSUES);
  const snapshot = () => {
    const next = select(store.getState());
    if (!sameIssues(last.current, next)) last.current = next;
    return last.current;
  };
  return useSyncExternalStore(store.subscribe, snapshot, snapshot);
}

function allIssuesOf(s: AppState): Issue[] {
  const errors = s.validation.errors;
  if (s.pipeline.status !== 'invalid' || s.pipeline.errors.length === 0) return errors;
  const seen = new Set(errors.map((i) => `${i.path}|${i.rule}`));
  return [...errors, ...s.pipeline.errors.filter((i) => !seen.has(`${i.path}|${i.rule}`))];
}

const warningsOf = (s: AppState) => s.validation.warnings;

/**
 * All current problems (UI-side checks and, for the current document, the engine's run errors).
 * Returns the same array while nothing changed, so it can be a hook dependency.
 */
export function useAllIssues(): Issue[] {
  return useIssueList(allIssuesOf);
}

function useWarnings(): Issue[] {
  return useIssueList(warningsOf);
}

/** Issues whose path is exactly `path` (errors first, then warnings). */
export function useIssuesAt(path: string): { errors: Issue[]; warnings: Issue[] } {
  const all = useAllIssues();
  const warn = useWarnings();
  return useMemo(() => ({ errors: all.filter((i) => i.path === path), warnings: warn.filter((i) => i.path === path) }), [all, warn, path]);
}

/** Issues at `prefix` or below it that no field of the section shows (listed at the section). */
export function useIssuesUnder(prefix: string, shownExactly: readonly string[]): Issue[] {
  const all = useAllIssues();
  return useMemo(
    () =>
      all.filter(
        (i) => (i.path === prefix || i.path.startsWith(prefix + '.') || i.path.startsWith(prefix + '[')) && !shownExactly.includes(i.path),
      ),
    [all, prefix, shownExactly],
  );
}
