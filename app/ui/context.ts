/** React access to the app controller and thin hooks over its stores. */
import { createContext, useContext, useMemo } from 'react';
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

/**
 * All current problems (UI-side checks and, for the current document, the engine's run errors).
 * Returns the same array while nothing changed, so it can be a hook dependency.
 */
export function useAllIssues(): Issue[] {
  const validation = useAppState((s) => s.validation);
  const pipeline = useAppState((s) => s.pipeline);
  return useMemo(() => {
    if (pipeline.status !== 'invalid' || pipeline.errors.length === 0) return validation.errors;
    const seen = new Set(validation.errors.map((i) => `${i.path}|${i.rule}`));
    return [...validation.errors, ...pipeline.errors.filter((i) => !seen.has(`${i.path}|${i.rule}`))];
  }, [validation, pipeline]);
}

function useWarnings(): Issue[] {
  return useAppState((s) => s.validation.warnings);
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
