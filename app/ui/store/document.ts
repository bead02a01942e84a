/**
 * The renderer's application state: the scenario JSON being edited with undo/redo for every edit,
 * the dirty flag, the validation of the current JSON, the latest pipeline output and which runs
 * are shown. Plain TypeScript over createStore; React reads it through hooks.ts.
 *
 * Every change to the scenario goes through `edit` / `replace`, which push the previous snapshot
 * on the undo stack. Snapshots share structure (paths.ts setIn), so a deep history is cheap.
 * Consecutive edits of the same field within `coalesceMs` fold into one undo step, so typing
 * "0.125" is one step rather than five.
 *
 * Dirty means "differs from what was last loaded or saved" by identity: undoing back to the saved
 * snapshot makes the document clean again.
 */
import type { Issue } from '../../engine/errors';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { createStore, type Store } from './createStore';
import { formatPath, parsePath, setIn, type PathToken } from './paths';
import { migrateScenario } from '../../engine/scenario/migrate';
import { isStalePass, withComingRuns } from './partialOutput';
import { shareOutput } from './shareOutput';

export interface ValidationState {
  ok: boolean;
  errors: Issue[];
  warnings: Issue[];
}

export interface UndoEntry {
  /** The scenario before the edit. */
  scenario: unknown;
  label: string;
  coalesceKey: string | null;
  at: number;
}

export type PipelineStatus = 'idle' | 'waiting' | 'running' | 'done' | 'invalid' | 'failed';

export interface PipelineState {
  status: PipelineStatus;
  /** Engine errors from the last pass (validation or pipeline), or a crash message. */
  errors: Issue[];
  message: string;
}

/** A pass of which only the first runs have arrived (partialOutput.ts). */
export interface PartialState {
  /** The runner's id of the pass. */
  passId: number;
  /** Runs arrived, and runs the pass will have. */
  done: number;
  total: number;
}

export interface AppState {
  scenario: unknown;
  savedScenario: unknown;
  /** Display name of the document (file name, or "untitled"). */
  fileName: string;
  /** True when Save must ask for a path (a template or a new document). */
  untitled: boolean;
  dirty: boolean;
  undoStack: UndoEntry[];
  redoStack: UndoEntry[];
  validation: ValidationState;
  pipeline: PipelineState;
  output: PipelineOutput | null;
  /** The scenario snapshot `output` was computed from. */
  outputScenario: unknown;
  /**
   * Non-null while `output` is an incomplete pass: its runs are the arrived ones, then the previous
   * output's runs still to come (kept so the plots do not flicker). Its comparison, best marks and
   * warnings are not final; `completeOutput` holds the last complete pass.
   */
  partial: PartialState | null;
  /** The last complete pass (what `output` was before the partial one; equal to `output` otherwise). */
  completeOutput: PipelineOutput | null;
  /** Runner id of the newest pass shown (complete or partial); older passes are ignored. */
  outputPassId: number;
  /** Keys of the runs shown in plots and 3D (ControllerRun.key); the first is the detailed one. */
  selectedRunKeys: string[];
  /** Ids of the scenario's controllers left out of the comparison (unchecked). Kept as the
   *  excluded set so that new or renamed controllers are compared by default. */
  excludedControllerIds: string[];
}

export type Validate = (scenario: unknown) => ValidationState;

export interface EditOptions {
  label?: string;
  /** Fold into the previous undo step when it has the same key and is recent. Default: the path. */
  coalesceKey?: string | null;
}

export interface AppStoreOptions {
  validate: Validate;
  now?: () => number;
  coalesceMs?: number;
  maxUndo?: number;
}

export interface AppStore extends Store<AppState> {
  /** Set one value in the scenario (undefined removes the key). */
  edit(path: string | readonly PathToken[], value: unknown, o?: EditOptions): void;
  /** Set several values as one undo step (e.g. an off-diagonal inertia entry and its mirror). */
  editMany(changes: readonly [string | readonly PathToken[], unknown][], o?: EditOptions): void;
  /** Replace the whole scenario with a new JSON value as one undo step. */
  replace(next: unknown, label: string): void;
  undo(): boolean;
  redo(): boolean;
  /** A freshly opened or created document: clears history, clean. */
  load(scenario: unknown, fileName: string, untitled: boolean): void;
  markSaved(fileName: string): void;
  /** Name the document without touching it (the shell's file turned out to be the one already loaded). */
  setFileName(fileName: string, untitled: boolean): void;
  /** A complete pass; `passId` (the runner's) drops it when a newer pass is already shown. */
  setOutput(output: PipelineOutput, forScenario: unknown, passId?: number): void;
  /** The first runs of a pass (a partial reply); returns false when dropped as stale. */
  setPartialOutput(output: PipelineOutput, forScenario: unknown, partial: PartialState): boolean;
  setPipeline(p: Partial<PipelineState>): void;
  selectRuns(keys: string[]): void;
  setExcluded(ids: string[]): void;
}

const EMPTY_PIPELINE: PipelineState = { status: 'idle', errors: [], message: '' };

export function createAppStore(initialScenario: unknown, o: AppStoreOptions): AppStore {
  const now = o.now ?? (() => Date.now());
  const coalesceMs = o.coalesceMs ?? 1200;
  const maxUndo = o.maxUndo ?? 500;
  const validate = o.validate;

  const base = createStore<AppState>({
    scenario: initialScenario,
    savedScenario: initialScenario,
    fileName: 'untitled',
    untitled: true,
    dirty: false,
    undoStack: [],
    redoStack: [],
    validation: validate(initialScenario),
    pipeline: EMPTY_PIPELINE,
    output: null,
    outputScenario: null,
    partial: null,
    completeOutput: null,
    outputPassId: 0,
    selectedRunKeys: [],
    excludedControllerIds: [],
  });

  /** Common tail of every scenario change: revalidate, recompute dirty. */
  function withScenario(s: AppState, scenario: unknown): Partial<AppState> {
    return { scenario, dirty: scenario !== s.savedScenario, validation: validate(scenario) };
  }

  function pushUndo(stack: UndoEntry[], e: UndoEntry): UndoEntry[] {
    const next = stack.length >= maxUndo ? stack.slice(stack.length - maxUndo + 1) : stack.slice();
    next.push(e);
    return next;
  }

  const store: AppStore = {
    ...base,

    edit(path, value, opts = {}) {
      store.editMany([[path, value]], opts);
    },

    editMany(changes, opts = {}) {
      if (changes.length === 0) return;
      const all = changes.map(([p, v]) => [typeof p === 'string' ? parsePath(p) : p, v] as const);
      const tokens = all[0]![0];
      const key = opts.coalesceKey === undefined ? all.map(([t]) => formatPath(t)).join('+') : opts.coalesceKey;
      base.setState((s) => {
        let next = s.scenario;
        for (const [t, v] of all) next = setIn(next, t, v);
        const t = now();
        const top = s.undoStack[s.undoStack.length - 1];
        const fold = key !== null && top !== undefined && top.coalesceKey === key && t - top.at <= coalesceMs && s.redoStack.length === 0;
        const undoStack = fold
          ? [...s.undoStack.slice(0, -1), { ...top, at: t }]
          : pushUndo(s.undoStack, { scenario: s.scenario, label: opts.label ?? `Edit ${formatPath(tokens)}`, coalesceKey: key, at: t });
        return { ...withScenario(s, next), undoStack, redoStack: [] };
      });
    },

    replace(next, label) {
      base.setState((s) => {
        if (next === s.scenario) return {};
        return {
          ...withScenario(s, next),
          undoStack: pushUndo(s.undoStack, { scenario: s.scenario, label, coalesceKey: null, at: now() }),
          redoStack: [],
        };
      });
    },

    undo() {
      const s = base.getState();
      const top = s.undoStack[s.undoStack.length - 1];
      if (!top) return false;
      base.setState({
        ...withScenario(s, top.scenario),
        undoStack: s.undoStack.slice(0, -1),
        redoStack: [...s.redoStack, { ...top, scenario: s.scenario, coalesceKey: null }],
      });
      return true;
    },

    redo() {
      const s = base.getState();
      const top = s.redoStack[s.redoStack.length - 1];
      if (!top) return false;
      base.setState({
        ...withScenario(s, top.scenario),
        redoStack: s.redoStack.slice(0, -1),
        // Never fold a later edit into a redone step.
        undoStack: pushUndo(s.undoStack, { ...top, scenario: s.scenario, coalesceKey: null }),
      });
      return true;
    },

    load(scenario, fileName, untitled) {
      // An older file format is brought up to date for editing; the document then differs from
      // the file on disk (dirty) until it is saved in the current format.
      const migrated = migrateScenario(scenario).json;
      base.setState({
        scenario: migrated,
        savedScenario: scenario,
        fileName,
        untitled,
        dirty: migrated !== scenario,
        undoStack: [],
        redoStack: [],
        validation: validate(migrated),
        pipeline: EMPTY_PIPELINE,
        output: null,
        outputScenario: null,
        partial: null,
        completeOutput: null,
        selectedRunKeys: [],
        excludedControllerIds: [],
      });
    },

    setFileName(fileName, untitled) {
      base.setState({ fileName, untitled });
    },

    markSaved(fileName) {
      base.setState((s) => ({ savedScenario: s.scenario, fileName, untitled: false, dirty: false }));
    },

    setOutput(output, forScenario, passId) {
      base.setState((s) => {
        if (passId !== undefined && isStalePass(s, passId, true)) return {};
        // Parts equal to the shown output keep its objects (shareOutput.ts): views skip unchanged runs.
        output = shareOutput(s.output, output);
        const keys = output.runs.map((r) => r.key);
        // Keep the user's selection where those runs still exist; otherwise show the first run.
        let selected = s.selectedRunKeys.filter((k) => keys.includes(k));
        if (selected.length === 0 && keys.length > 0) selected = [keys[0]!];
        const shownId = passId ?? Math.max(s.outputPassId, s.partial?.passId ?? 0);
        return {
          output,
          outputScenario: forScenario,
          selectedRunKeys: selected,
          partial: null,
          completeOutput: output,
          outputPassId: shownId,
        };
      });
    },

    setPartialOutput(output, forScenario, partial) {
      let taken = false;
      base.setState((s) => {
        if (isStalePass(s, partial.passId, false)) return {};
        taken = true;
        const shown = withComingRuns(shareOutput(s.output, output), s.output);
        const keys = shown.runs.map((r) => r.key);
        let selected = s.selectedRunKeys.filter((k) => keys.includes(k));
        if (selected.length === 0 && keys.length > 0) selected = [keys[0]!];
        return {
          output: shown,
          outputScenario: forScenario,
          selectedRunKeys: selected,
          partial: { ...partial },
          outputPassId: partial.passId,
        };
      });
      return taken;
    },

    setPipeline(p) {
      base.setState((s) => ({ pipeline: { ...s.pipeline, ...p } }));
    },

    selectRuns(keys) {
      base.setState({ selectedRunKeys: keys });
    },

    setExcluded(ids) {
      base.setState({ excludedControllerIds: ids });
    },
  };
  return store;
}
