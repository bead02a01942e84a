/**
 * The sweep view's controller, outside React (like session.ts for the study): the sweep form, the
 * sweep being run or last run, and the commands on it.
 *
 * - `start` checks the form (sweepForm.ts), asks one worker for the sweep's info (cell 0's study
 *   context, the controllers, the checks against the scenario), then hands out grid cells one at a
 *   time to every worker; a cell's result depends only on (scenario, definition, cell index), so
 *   the results are the same for any number of workers and any order of arrival.
 * - `cancel` stops handing out cells and keeps the finished ones. With a shared cancel flag a
 *   worker stops inside its cell at once (that cell is dropped); without one, a worker still busy
 *   after `hardStopMs` is terminated.
 * - The map reads `resultAt(level)`: the engine's sweepResultOf over the finished cells, with the
 *   boundary at the level the user sets now (recomputed without running anything).
 * - `openCell` opens a cell's worst case for one controller as a normal run through the study's
 *   open-a-case path (the cell's scenario is sweepCellJson(scenario, def, cell)).
 * - Exports (cells.csv, sweep.json) go through the bridge's exportFile like the study's.
 */
import type { Issue } from '../../engine/errors';
import { sweepCellJson, sweepCellsCsv, sweepJson, sweepResultOf } from '../../engine/study';
import type { SweepCell, SweepDefinition, SweepInfo, SweepResult } from '../../engine/study';
import { CAUTION_TEXT } from '../../engine/caution';
import { createStore, type Store } from '../store/createStore';
import type { StudyAppHandles, StudySession } from './session';
import { checkSweepForm, defaultSweepForm, type SweepForm, type SweepFormCheck } from './sweepForm';
import type { FromSweepWorker, SweepWorkerLike } from './sweepProtocol';
import { TimeLeftEstimator } from './timeLeft';

export type SweepPhase = 'idle' | 'starting' | 'running' | 'cancelling' | 'done' | 'cancelled' | 'invalid' | 'failed';

export interface SweepProgress {
  cellsDone: number;
  cellsTotal: number;
  casesDone: number;
  casesTotal: number;
  /** Estimated time left, ms (null until a rate exists). */
  remainingMs: number | null;
  elapsedMs: number;
}

export interface SweepUiState {
  /** The Sweep tab of the study workspace is shown. */
  open: boolean;
  /** The setup as typed (null until the tab is first opened: then made from the scenario). */
  form: SweepForm | null;
  phase: SweepPhase;
  workersUsed: number;
  progress: SweepProgress | null;
  info: SweepInfo | null;
  /** Finished cells in cell order. */
  cells: SweepCell[];
  /** The scenario snapshot the results belong to. */
  scenario: unknown;
  errors: Issue[];
  warnings: Issue[];
  message: string;
  /** `${cell}:${controllerId}` being opened as a run. */
  opening: string | null;
}

export interface SweepSessionOptions {
  app: StudyAppHandles;
  /** The study session whose open-a-case path opens a cell's worst case. */
  study: StudySession;
  spawn: () => SweepWorkerLike;
  cores?: number;
  maxWorkers?: number;
  publishMs?: number;
  hardStopMs?: number;
  sharedCancel?: boolean;
}

export interface SweepSession {
  readonly store: Store<SweepUiState>;
  setOpen(open: boolean): void;
  /** Replace the form (made from the current scenario when null). */
  setForm(form: SweepForm): void;
  /** The form now (the one offered for the current scenario until the tab is first opened). */
  form(): SweepForm;
  /** The form's check against the current scenario, plus the document's own problems. */
  check(): SweepFormCheck;
  start(): Promise<void>;
  cancel(): void;
  /** The result of the finished cells with the boundary at `level` (0 < level < 1), or null before any cell. */
  resultAt(level: number): SweepResult | null;
  openCell(cellIndex: number, controllerId: string): Promise<void>;
  exportCells(level: number): Promise<void>;
  exportJson(level: number): Promise<void>;
  dispose(): void;
}

const INITIAL: SweepUiState = {
  open: false,
  form: null,
  phase: 'idle',
  workersUsed: 0,
  progress: null,
  info: null,
  cells: [],
  scenario: null,
  errors: [],
  warnings: [],
  message: '',
  opening: null,
};

const active = (p: SweepPhase) => p === 'starting' || p === 'running' || p === 'cancelling';

function slug(name: unknown): string {
  const base = typeof name === 'string' && name.trim() ? name : 'slewsmith';
  return (
    base
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 80) || 'slewsmith'
  );
}

interface Running {
  workers: SweepWorkerLike[];
  busy: (number | null)[];
  next: number;
  total: number;
  stopped: boolean;
  flag: Int32Array | null;
  cells: SweepCell[];
  casesDone: number;
  t0: number;
  eta: TimeLeftEstimator;
  timer: ReturnType<typeof setTimeout> | null;
  hardStop: ReturnType<typeof setTimeout> | null;
  failure: { errors: Issue[]; message: string } | null;
  finish: () => void;
}

export function createSweepSession(o: SweepSessionOptions): SweepSession {
  const app = o.app;
  const store = createStore<SweepUiState>({ ...INITIAL });
  const maxWorkers = Math.max(1, o.maxWorkers ?? 4);
  const publishMs = o.publishMs ?? 250;
  const hardStopMs = o.hardStopMs ?? 1500;
  let running: Running | null = null;
  let disposed = false;

  /** The form, or (before the tab is first opened) the one offered for the current scenario; no state change. */
  function form(): SweepForm {
    return store.getState().form ?? defaultSweepForm(app.store.getState().scenario);
  }

  function check(): SweepFormCheck {
    const s = app.store.getState();
    const c = checkSweepForm(form(), s.scenario);
    const doc = [...s.validation.errors, ...(s.pipeline.status === 'invalid' ? s.pipeline.errors : [])];
    if (!doc.length) return c;
    const seen = new Set<string>();
    const extra = doc.filter((i) => {
      const k = `${i.path}|${i.rule}`;
      return !seen.has(k) && (seen.add(k), true);
    });
    return { def: null, issues: [...c.issues, ...extra], cells: c.cells };
  }

  function publish(r: Running) {
    r.timer = null;
    if (running !== r) return;
    const now = performance.now();
    store.setState({
      cells: [...r.cells].sort((a, b) => a.index - b.index),
      progress: {
        cellsDone: r.cells.length,
        cellsTotal: r.total,
        casesDone: r.casesDone,
        casesTotal: r.eta.total,
        remainingMs: r.eta.remainingMs(now),
        elapsedMs: now - r.t0,
      },
    });
  }

  const schedule = (r: Running) => {
    if (r.timer === null) r.timer = setTimeout(() => publish(r), publishMs);
  };

  function give(r: Running, k: number) {
    r.busy[k] = null;
    if (!r.stopped && r.failure === null && r.next < r.total) {
      const index = r.next++;
      r.busy[k] = index;
      r.workers[k]!.postMessage({ type: 'run', index });
      return;
    }
    if (r.busy.every((b) => b === null)) r.finish();
  }

  async function start(): Promise<void> {
    if (disposed || running) return;
    const c = check();
    const scenario = app.store.getState().scenario;
    if (!c.def) {
      store.setState({ phase: 'invalid', errors: c.issues, warnings: [], message: 'Fix the listed problems to run the sweep' });
      return;
    }
    const def: SweepDefinition = c.def;
    const total = c.cells ?? 1;
    const cores = Math.max(1, Math.floor(o.cores ?? 2));
    const n = Math.max(1, Math.min(maxWorkers, cores, total));
    const shared =
      (o.sharedCancel ?? (typeof crossOriginIsolated !== 'undefined' && crossOriginIsolated)) && typeof SharedArrayBuffer !== 'undefined';
    const sab = shared ? new SharedArrayBuffer(4) : null;
    let resolveDone: () => void = () => {};
    const done = new Promise<void>((res) => (resolveDone = res));
    const r: Running = {
      workers: [],
      busy: [],
      next: 0,
      total,
      stopped: false,
      flag: sab ? new Int32Array(sab) : null,
      cells: [],
      casesDone: 0,
      t0: performance.now(),
      eta: new TimeLeftEstimator(total * def.runs),
      timer: null,
      hardStop: null,
      failure: null,
      finish: () => resolveDone(),
    };
    running = r;
    store.setState({
      phase: 'starting',
      workersUsed: n,
      progress: { cellsDone: 0, cellsTotal: total, casesDone: 0, casesTotal: total * def.runs, remainingMs: null, elapsedMs: 0 },
      info: null,
      cells: [],
      scenario,
      errors: [],
      warnings: [],
      message: '',
    });
    const fail = (errors: Issue[], message: string) => {
      if (r.failure === null) r.failure = { errors, message };
      r.stopped = true;
      if (r.flag) Atomics.store(r.flag, 0, 1);
      if (r.busy.every((b) => b === null)) r.finish();
    };
    try {
      for (let k = 0; k < n; k++) {
        const w = o.spawn();
        r.workers.push(w);
        r.busy.push(null);
        w.onerror = (ev) => {
          ev.preventDefault?.();
          r.busy[k] = null;
          fail([], `A sweep worker stopped unexpectedly: ${ev.message || 'no message'}`);
        };
        w.postMessage({ type: 'init', json: scenario, def, cancelFlag: sab });
      }
    } catch (e) {
      for (const w of r.workers) w.terminate();
      running = null;
      store.setState({ phase: 'failed', message: `Could not start the sweep workers: ${(e as Error).message}` });
      return;
    }
    r.workers.forEach((w, k) => {
      w.onmessage = (ev: MessageEvent<FromSweepWorker>) => {
        const m = ev.data;
        if (running !== r || !m) return;
        if (m.type === 'info') {
          r.busy[k] = null;
          if (!m.result.ok) {
            fail(m.result.errors, 'The engine refused the sweep');
            store.setState({ warnings: m.result.warnings });
            return;
          }
          store.setState({ info: m.result.value, warnings: m.result.warnings, phase: r.stopped ? 'cancelling' : 'running' });
          r.workers.forEach((_, j) => give(r, j));
        } else if (m.type === 'case') {
          r.casesDone++;
          r.eta.add({ worker: k, t: performance.now() });
          schedule(r);
        } else if (m.type === 'cell') {
          r.cells.push(m.cell);
          schedule(r);
          give(r, k);
        } else if (m.type === 'stopped') {
          give(r, k);
        } else if (m.type === 'error') {
          r.busy[k] = null;
          fail(m.errors, `Grid cell ${m.index} was refused by the engine`);
        } else if (m.type === 'crash') {
          r.busy[k] = null;
          fail([], `A sweep worker failed: ${m.message}`);
        }
      };
    });
    r.busy[0] = -1; // the info request
    r.workers[0]!.postMessage({ type: 'info' });
    await done;
    if (r.timer !== null) clearTimeout(r.timer);
    if (r.hardStop !== null) clearTimeout(r.hardStop);
    for (const w of r.workers) w.terminate();
    if (running !== r) return;
    running = null;
    const cells = [...r.cells].sort((a, b) => a.index - b.index);
    const now = performance.now();
    const progress: SweepProgress = {
      cellsDone: cells.length,
      cellsTotal: total,
      casesDone: cells.length * def.runs,
      casesTotal: total * def.runs,
      remainingMs: cells.length === total ? 0 : null,
      elapsedMs: now - r.t0,
    };
    if (r.failure) {
      const refused = r.failure.errors.length > 0;
      store.setState({
        phase: refused ? 'invalid' : 'failed',
        errors: r.failure.errors,
        message: r.failure.message,
        cells,
        progress,
      });
      return;
    }
    store.setState({ phase: r.stopped && cells.length < total ? 'cancelled' : 'done', cells, progress, errors: [], message: '' });
  }

  function cancel() {
    const r = running;
    if (!r || r.stopped) return;
    r.stopped = true;
    if (r.flag) Atomics.store(r.flag, 0, 1);
    store.setState({ phase: 'cancelling' });
    if (r.busy.every((b) => b === null)) {
      r.finish();
      return;
    }
    r.hardStop = setTimeout(() => {
      r.hardStop = null;
      if (running !== r) return;
      r.workers.forEach((w, k) => {
        if (r.busy[k] === null) return;
        w.terminate();
        r.busy[k] = null;
      });
      r.finish();
    }, hardStopMs);
  }

  function resultAt(level: number): SweepResult | null {
    const s = store.getState();
    if (!s.info || s.cells.length === 0) return null;
    const lv = level > 0 && level < 1 ? level : s.info.def.level;
    return sweepResultOf({ ...s.info, def: { ...s.info.def, level: lv } }, s.cells);
  }

  async function openCell(cellIndex: number, controllerId: string): Promise<void> {
    const s = store.getState();
    if (s.opening || !s.info || active(s.phase)) return;
    const cell = s.cells.find((c) => c.index === cellIndex);
    const worst = cell?.controllers.find((c) => c.controllerId === controllerId)?.worstCase ?? null;
    if (!cell || worst === null) {
      app.notify(`Cell ${cellIndex} has no flown case for ${controllerId} to open`, 'error');
      return;
    }
    store.setState({ opening: `${cellIndex}:${controllerId}` });
    try {
      const json = sweepCellJson(s.scenario, s.info.def, cellIndex);
      const stem = `${slug(s.info.scenarioName)}-sweep-cell-${cellIndex}-case-${worst}`;
      await o.study.openCaseOf(json, worst, controllerId, stem, `sweep cell ${cellIndex}'s worst case (${worst})`);
    } finally {
      store.setState({ opening: null });
    }
  }

  async function exportText(kind: 'cells' | 'json', level: number): Promise<void> {
    const r = resultAt(level);
    if (!r) {
      app.notify('Run a sweep first', 'error');
      return;
    }
    const stem = slug(r.info.scenarioName);
    const content = kind === 'cells' ? sweepCellsCsv(r) : sweepJson(r, CAUTION_TEXT);
    const suggestedName = kind === 'cells' ? `${stem}-sweep-cells.csv` : `${stem}-sweep.json`;
    const x = await app.bridge.exportFile({ suggestedName, content });
    if (x.status === 'exported') app.notify(`Exported ${x.file.name}`);
    else if (x.status === 'failed') app.notify(x.message, 'error');
    else if (x.status === 'invalid') app.notify(x.errors.map((e) => e.message).join('; '), 'error');
  }

  return {
    store,
    setOpen: (open) => store.setState(open && !store.getState().form ? { open, form: form() } : { open }),
    setForm: (f) => store.setState({ form: f }),
    form,
    check,
    start,
    cancel,
    resultAt,
    openCell,
    exportCells: (level) => exportText('cells', level),
    exportJson: (level) => exportText('json', level),
    dispose() {
      disposed = true;
      const r = running;
      running = null;
      if (r) {
        if (r.timer !== null) clearTimeout(r.timer);
        if (r.hardStop !== null) clearTimeout(r.hardStop);
        for (const w of r.workers) w.terminate();
      }
    },
  };
}
