/**
 * The renderer's wiring, outside React: the document store, the playback clock, the worker
 * runner and the bridge. Every scenario change (edit, undo, redo, open) schedules a debounced
 * pipeline run when the UI-side checks pass; replies for older scenarios are dropped. Menu and
 * keyboard commands land in `command`.
 */
import type { Issue } from '../engine/errors';
import type { PipelineOutput } from '../engine/pipeline/types';
import type { OpenResult, SaveResult, SlewsmithBridge, UiCommand } from '../bridge/api';
import { createStore, type Store } from './store/createStore';
import { createAppStore, type AppStore } from './store/document';
import { createClock, type PlaybackClock } from './playback/clock';
import { createPipelineRunner, type PipelineRunner, type WorkerLike } from './worker/client';
import type { PrestartedPass } from './worker/prestart';
import { preflight } from './preflight';
import { issueLine, presentIssues } from './issues/present';
import { STARTER_FILE_NAME, starterScenario } from './starter';

export interface UiFlags {
  exportOpen: boolean;
  /** Short status message (saved, exported, failed …) and its kind. */
  notice: { text: string; kind: 'info' | 'error' } | null;
}

export interface AppController {
  store: AppStore;
  clock: PlaybackClock;
  ui: Store<UiFlags>;
  bridge: SlewsmithBridge;
  command(c: UiCommand): void;
  /** Open a file from the shell's recent list (desktop only). */
  openRecent(path: string): void;
  /** Ids of the scenario's controllers being compared (sent as runPipeline's `controllers`). */
  comparedIds(): string[];
  /** Reasons running is not possible now (empty when it is). */
  blockers(): Issue[];
  notify(text: string, kind?: 'info' | 'error'): void;
  dispose(): void;
}

export interface AppControllerOptions {
  bridge: SlewsmithBridge;
  spawnWorker: () => WorkerLike;
  /** The scenario shown until the shell gives one (the bundled demo). */
  fallbackScenario: unknown;
  fallbackName: string;
  /** Quiet time after an edit before the pass is sent (default 10 ms: a burst of keys within one frame is one pass). */
  debounceMs?: number;
  /** Pipeline workers sharing each pass (default 1; main.tsx gives one per core beyond two, up to 4). */
  pipelineWorkers?: number;
  /** The fallback's pass posted before the app loaded (app/boot.ts), taken over when it is the same pass. */
  prestarted?: PrestartedPass | null;
}

type Obj = Record<string, unknown>;

function controllersOf(s: unknown): Obj[] {
  const list = (s as Obj | null)?.controllers;
  return Array.isArray(list) ? (list as Obj[]) : [];
}

/** The controller ids of a scenario that are not excluded, in file order. */
function comparedControllerIds(scenario: unknown, excluded: readonly string[]): string[] {
  return controllersOf(scenario)
    .map((c) => c.id)
    .filter((id): id is string => typeof id === 'string' && !excluded.includes(id));
}

function runEnd(out: PipelineOutput): number {
  let tMax = 0;
  for (const r of out.runs) if (r.trace.n > 0) tMax = Math.max(tMax, r.trace.t[r.trace.n - 1]!);
  return tMax;
}

export function createAppController(o: AppControllerOptions): AppController {
  const store = createAppStore(o.fallbackScenario, { validate: preflight });
  store.load(o.fallbackScenario, o.fallbackName, true);
  const clock = createClock();
  const ui = createStore<UiFlags>({ exportOpen: false, notice: null });
  const bridge = o.bridge;
  let noticeTimer: ReturnType<typeof setTimeout> | null = null;

  const runner: PipelineRunner = createPipelineRunner({
    spawn: o.spawnWorker,
    workers: o.pipelineWorkers ?? 1,
    prestarted: o.prestarted ?? null,
    debounceMs: o.debounceMs ?? 10,
    // An edit after a quiet spell is posted in its own keystroke, before React renders it (issue 12).
    leadingEdge: true,
    onStart: () => store.setPipeline({ status: 'running' }),
    // The first run of a pass is shown as soon as it has flown (partialOutput.ts has the rules).
    partialAfterRuns: 1,
    partialSkipsFirstPass: true,
    onPartial: (output, total, _input, id, source) => {
      const s = store.getState();
      const src = source as { scenario: unknown; excluded: unknown };
      if (src.scenario !== s.scenario || src.excluded !== s.excludedControllerIds) return; // stale
      if (store.setPartialOutput(output, src.scenario, { passId: id, done: output.runs.length, total }))
        clock.setRange(0, runEnd(store.getState().output!));
    },
    // `source` is the document and comparison the request was made for.
    onResult: (result, _input, id, source) => {
      const s = store.getState();
      const src = source as { scenario: unknown; excluded: unknown };
      if (src.scenario !== s.scenario || src.excluded !== s.excludedControllerIds) return; // stale
      if (result.ok) {
        store.setOutput(result.value, src.scenario, id);
        store.setPipeline({
          status: 'done',
          errors: [],
          message: `${result.value.runs.length} run(s) in ${Math.round(result.value.elapsedMs)} ms`,
        });
        clock.setRange(0, runEnd(result.value));
      } else {
        store.setPipeline({ status: 'invalid', errors: result.errors, message: 'The engine rejected the scenario' });
      }
    },
    onCrash: (message) => {
      store.setPipeline({ status: 'failed', errors: [], message });
    },
  });

  function blockers(): Issue[] {
    const s = store.getState();
    const out: Issue[] = [...s.validation.errors];
    if (s.pipeline.status === 'invalid') {
      const seen = new Set(out.map((i) => `${i.path}|${i.rule}`));
      for (const i of s.pipeline.errors) if (!seen.has(`${i.path}|${i.rule}`)) out.push(i);
    }
    if (controllersOf(s.scenario).length > 0 && comparedIds().length === 0)
      out.push({ path: 'controllers', rule: 'compare-none', message: 'Choose at least one controller to compare' });
    return out;
  }

  function comparedIds(): string[] {
    const s = store.getState();
    return comparedControllerIds(s.scenario, s.excludedControllerIds);
  }

  function request(now: boolean) {
    const s = store.getState();
    const ids = comparedIds();
    if (!s.validation.ok || ids.length === 0) {
      runner.cancel();
      store.setPipeline({ status: 'invalid', errors: [], message: 'Fix the listed problems to run' });
      return;
    }
    store.setPipeline({ status: 'waiting', errors: [], message: '' });
    const tag = { scenario: s.scenario, excluded: s.excludedControllerIds };
    if (now) runner.runNow(s.scenario, { controllers: ids }, tag);
    else runner.schedule(s.scenario, { controllers: ids }, tag);
  }

  const unsubscribe = store.subscribe((s, prev) => {
    if (s.scenario !== prev.scenario || s.excludedControllerIds !== prev.excludedControllerIds) request(false);
    if (s.dirty !== prev.dirty) bridge.setDirty(s.dirty);
  });

  function notify(text: string, kind: 'info' | 'error' = 'info') {
    ui.setState({ notice: { text, kind } });
    if (noticeTimer) clearTimeout(noticeTimer);
    noticeTimer = setTimeout(() => ui.setState({ notice: null }), kind === 'error' ? 9000 : 4000);
  }

  function issuesText(list: readonly Issue[], scenario: unknown = store.getState().scenario): string {
    const shown = presentIssues(list, scenario);
    const first = shown
      .slice(0, 3)
      .map((p) => issueLine(p))
      .join('; ');
    return shown.length > 3 ? `${first}; … (${shown.length} fields with problems)` : first;
  }

  function applyOpen(r: OpenResult) {
    if (r.status === 'opened') {
      store.load(r.scenario, r.file.name, r.template);
      clock.pause();
      clock.setTime(0);
      request(true);
      if (r.warnings.length) notify(`Opened with warnings: ${issuesText(r.warnings)}`);
    } else if (r.status === 'invalid') notify(`${r.file.name} is not a valid scenario: ${issuesText(r.errors, null)}`, 'error');
    else if (r.status === 'failed') notify(r.message, 'error');
  }

  /**
   * Every save ends in a notice. A rejected bridge call (a refused message, a scenario the IPC
   * cannot clone, a crash in the shell) is a failed save like any other: the document stays dirty.
   * `forClose` answers the shell's close-with-save, which closes the window only on success.
   */
  async function save(as: boolean, forClose = false) {
    const s = store.getState();
    let r: SaveResult;
    try {
      // Main knows the document's path: for an untitled one, saveBeforeClose asks where to write.
      if (forClose) r = await bridge.saveBeforeClose(s.scenario);
      else r = as || s.untitled ? await bridge.saveScenarioAs(s.scenario) : await bridge.saveScenario(s.scenario);
    } catch (e) {
      r = { status: 'failed', message: e instanceof Error ? e.message : String(e) };
    }
    if (r.status === 'saved') {
      // Only the snapshot that was sent counts as saved, even if edits happened meanwhile.
      if (store.getState().scenario === s.scenario) store.markSaved(r.file.name);
      notify(`Saved ${r.file.name}`);
    } else if (r.status === 'invalid') notify(`Not saved: ${issuesText(r.errors)}`, 'error');
    else if (r.status === 'failed') notify(`Not saved: ${r.message}`, 'error');
  }

  /** A rejected open/new is reported, never dropped. */
  function reportFailure(what: string) {
    return (e: unknown) => notify(`${what} failed: ${e instanceof Error ? e.message : String(e)}`, 'error');
  }

  async function newDocument() {
    const r = await bridge.newScenario();
    if (r.status !== 'created') return;
    // A new document is a small valid starter of our own (starter.ts), not the demo.
    store.load(starterScenario(), STARTER_FILE_NAME, true);
    clock.pause();
    clock.setTime(0);
    request(true);
  }

  function command(c: UiCommand) {
    switch (c) {
      case 'undo':
        store.undo();
        break;
      case 'redo':
        store.redo();
        break;
      case 'run':
        request(true);
        break;
      case 'new':
        void newDocument().catch(reportFailure('New'));
        break;
      case 'open':
        void bridge.openScenario().then(applyOpen, reportFailure('Open'));
        break;
      case 'save':
        void save(false);
        break;
      case 'save-as':
        void save(true);
        break;
      case 'save-before-close':
        void save(false, true);
        break;
      case 'export':
        ui.setState({ exportOpen: true });
        break;
    }
  }

  const offCommand = bridge.onCommand(command);
  // The bundled fallback's pass starts now, before React's first render and before the shell
  // answers; the shell's document (the demo under `npm start` and in the browser) replaces it only
  // when it differs, so the usual first start flies the demo once.
  request(true);
  const fallback = store.getState().scenario;
  void bridge.initialScenario().then((r) => {
    if (r.status === 'none') return;
    const s = store.getState();
    const untouched = s.scenario === fallback && s.undoStack.length === 0;
    if (r.status === 'opened' && untouched && JSON.stringify(r.scenario) === JSON.stringify(fallback)) {
      // Same document: take its name and template flag, keep the pass already running.
      store.setFileName(r.file.name, r.template);
      if (r.warnings.length) notify(`Opened with warnings: ${issuesText(r.warnings)}`);
    } else applyOpen(r);
  }, reportFailure('Opening the first scenario'));

  return {
    store,
    clock,
    ui,
    bridge,
    command,
    openRecent(path) {
      void bridge.openRecent(path).then(applyOpen, reportFailure('Open'));
    },
    comparedIds,
    blockers,
    notify,
    dispose() {
      unsubscribe();
      offCommand();
      runner.dispose();
    },
  };
}
