/**
 * The study view's controller, outside React (like appController.ts for the main window): the
 * state of the robustness study being run or last run, and the commands on it.
 *
 * - `start` runs the current document's "study" block split across Web Workers through the
 *   engine's coordinator (startStudyParallel). Each case depends only on (seed, index) and the
 *   engine sorts by index, so the results are the same for any number of workers.
 * - Finished cases are gathered as they arrive, and the live summary (histograms, map, shares) is
 *   recomputed a few times a second, so the results fill in while the study runs.
 * - `cancel` stops handing out cases and keeps the finished ones. Without a shared cancel flag
 *   (the page is not cross-origin isolated) a running case finishes first; a worker still busy
 *   after `hardStopMs` is terminated (its unfinished cases are dropped, the finished ones kept).
 * - `openCase` writes one case as a plain scenario (engine studyCaseScenario, in a worker) and
 *   loads it into the document store as a new untitled scenario with that controller ticked, so
 *   the normal plots and 3D view show it.
 * - Exports go through the bridge's exportFile (the browser fallback downloads).
 */
import type { Issue } from '../../engine/errors';
import {
  casesCsv,
  defaultStudySpec,
  outcomeMap,
  startStudyParallel,
  summarizeStudy,
  summaryJson,
  type CaseRecord,
  type FromWorker,
  type MapPoint,
  type ParallelStudy,
  type StudyInfo,
  type StudyProgress,
  type StudySummary,
  type StudyWorkerPort,
} from '../../engine/study';
import { readStudySummary } from '../../engine/study/summaryRead';
import { makeStudyContext } from '../../engine/study/context';
import { campaignBundleScript, suggestedShards } from '../../engine/study/campaignFolder';
import type { SlewsmithBridge } from '../../bridge/api';
import type { AppStore } from '../store/document';
import type { PlaybackClock } from '../playback/clock';
import { createStore, type Store } from '../store/createStore';
import type { CaseScenarioReply, FromStudyWorker, StudyWorkerLike } from './protocol';
import { TimeLeftEstimator } from './timeLeft';

export type StudyPhase = 'idle' | 'starting' | 'running' | 'cancelling' | 'done' | 'cancelled' | 'invalid' | 'failed';

export type WorkerChoice = 'auto' | 1 | 2 | 3 | 4;

export interface StudyUiState {
  /** The study view replaces the centre of the window while open. */
  open: boolean;
  phase: StudyPhase;
  workerChoice: WorkerChoice;
  /** Workers of the study running or last run. */
  workersUsed: number;
  progress: StudyProgress | null;
  info: StudyInfo | null;
  /** Finished cases in case order (live while running). */
  records: CaseRecord[];
  summary: StudySummary | null;
  map: MapPoint[];
  /** Why the study cannot run or was refused (each with its field path). */
  errors: Issue[];
  warnings: Issue[];
  /** A crash or worker failure, in words. */
  message: string;
  /** The scenario snapshot the results belong to (null before the first study). */
  scenario: unknown;
  /** `${index}:${controllerId}` of a case being opened as a run. */
  opening: string | null;
  /** The setup column is shown (hide it to widen the results). */
  setupOpen: boolean;
  /** The file the results were opened from (a merged campaign's summary.json), or null for a study run here. */
  loadedFrom: string | null;
}

export interface StudyAppHandles {
  store: AppStore;
  clock: PlaybackClock;
  bridge: SlewsmithBridge;
  notify(text: string, kind?: 'info' | 'error'): void;
}

export interface StudySessionOptions {
  app: StudyAppHandles;
  spawn: () => StudyWorkerLike;
  /** Logical cores (navigator.hardwareConcurrency); default 2. */
  cores?: number;
  /** Most workers a study uses (default 4). */
  maxWorkers?: number;
  /** Cases per chunk handed to a worker (default 2: cancel waits for at most two cases). */
  chunkSize?: number;
  /** How often the live results are recomputed while running, ms (default 250). */
  publishMs?: number;
  /** After Cancel, terminate workers still busy after this long, ms (default 1500). */
  hardStopMs?: number;
  /** Use a SharedArrayBuffer cancel flag when the page allows one (default: when cross-origin isolated). */
  sharedCancel?: boolean;
}

export interface StudySession {
  readonly store: Store<StudyUiState>;
  setOpen(open: boolean): void;
  setSetupOpen(open: boolean): void;
  setWorkerChoice(choice: WorkerChoice): void;
  /** Workers a study of `runs` cases would use now. */
  workerCount(runs: number): number;
  /** Reasons the current document's study cannot start (empty when it can). */
  blockers(): Issue[];
  start(): Promise<void>;
  cancel(): void;
  /** Add the default study block to a scenario that has none (one undo step). */
  addDefaultStudy(): void;
  openCase(index: number, controllerId: string): Promise<void>;
  /**
   * Open case `index` of the study in `json` (any scenario with a study block, e.g. a sweep cell's) as a
   * normal run with `controllerId` ticked; `fileStem` names the untitled document, `what` the notice.
   */
  openCaseOf(json: unknown, index: number, controllerId: string, fileStem: string, what: string): Promise<void>;
  /** Save the current study as a campaign (one script that writes the campaign folder on the cluster). */
  saveCampaign(): Promise<void>;
  /** Show the results of a summary.json (a merged campaign): true when it was opened, else a notice says why. */
  openResults(text: string, fileName: string): boolean;
  exportCases(): Promise<void>;
  exportSummary(): Promise<void>;
  dispose(): void;
}

type Obj = Record<string, unknown>;

const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

/** The block offered when a scenario has none: the engine's default plus starts from any attitude. */
export function defaultStudyBlock(scenario: unknown): Obj {
  const sim = isObj(scenario) ? scenario.simulation : undefined;
  const seed = isObj(sim) && typeof sim.seed === 'number' && Number.isInteger(sim.seed) && sim.seed >= 0 ? sim.seed : 1;
  const base = defaultStudySpec({ simulation: { seed } as never });
  return { ...base, dispersions: { initialAttitude: { mode: 'uniform' } } };
}

/** File-name stem from a scenario name. */
function studySlug(name: unknown): string {
  const base = typeof name === 'string' && name.trim() ? name : 'slewsmith';
  return (
    base
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 80) || 'slewsmith'
  );
}

const HARD_STOP_MESSAGE = 'stopped by Cancel';

const INITIAL: StudyUiState = {
  open: false,
  phase: 'idle',
  workerChoice: 'auto',
  workersUsed: 0,
  progress: null,
  info: null,
  records: [],
  summary: null,
  map: [],
  errors: [],
  warnings: [],
  message: '',
  scenario: null,
  opening: null,
  setupOpen: true,
  loadedFrom: null,
};

interface Running {
  id: number;
  study: ParallelStudy;
  workers: StudyWorkerLike[];
  /** Per worker: the chunk it is running, or null. */
  busy: (number | null)[];
  /** Per worker: the engine's error handler (to report a worker we terminate). */
  onError: ((message: string) => void)[];
  live: CaseRecord[];
  info: StudyInfo | null;
  progress: StudyProgress | null;
  /** Time left from each worker's steady rate (timeLeft.ts). */
  eta: TimeLeftEstimator | null;
  timer: ReturnType<typeof setTimeout> | null;
  hardStop: ReturnType<typeof setTimeout> | null;
}

function isEngineMessage(m: FromStudyWorker): m is FromWorker {
  return m.type === 'ready' || m.type === 'invalid' || m.type === 'case' || m.type === 'chunk-done' || m.type === 'crash';
}

export function createStudySession(o: StudySessionOptions): StudySession {
  const app = o.app;
  const store = createStore<StudyUiState>({ ...INITIAL });
  const maxWorkers = Math.max(1, o.maxWorkers ?? 4);
  const chunkSize = Math.max(1, o.chunkSize ?? 2);
  const publishMs = o.publishMs ?? 250;
  const hardStopMs = o.hardStopMs ?? 1500;
  let seq = 0;
  let running: Running | null = null;
  let disposed = false;

  function workerCount(runs: number): number {
    const choice = store.getState().workerChoice;
    const cores = Math.max(1, Math.floor(o.cores ?? 2));
    const want = choice === 'auto' ? Math.min(maxWorkers, cores) : choice;
    return Math.max(1, Math.min(want, Math.max(1, Math.floor(runs) || 1)));
  }

  function blockers(): Issue[] {
    const s = app.store.getState();
    const out: Issue[] = [];
    const sc = s.scenario;
    if (!isObj(sc) || sc.study === undefined) {
      out.push({ path: 'study', rule: 'required', message: 'This scenario has no study block: add one to set up a study' });
    }
    out.push(...s.validation.errors);
    if (s.pipeline.status === 'invalid') {
      const seen = new Set(out.map((i) => `${i.path}|${i.rule}`));
      for (const i of s.pipeline.errors) if (!seen.has(`${i.path}|${i.rule}`)) out.push(i);
    }
    return out;
  }

  function portFor(r: Running, k: number, w: StudyWorkerLike, onCase: (rec: CaseRecord, worker: number) => void): StudyWorkerPort {
    return {
      post(m) {
        if (m.type === 'close') {
          w.terminate();
          return;
        }
        if (m.type === 'run') r.busy[k] = m.chunk;
        w.postMessage(m);
      },
      listen(onMessage, onError) {
        r.onError[k] = onError;
        w.onmessage = (ev) => {
          const m = ev.data;
          if (!m || !isEngineMessage(m)) return;
          if (m.type === 'case') onCase(m.record, k);
          if (m.type === 'chunk-done') r.busy[k] = null;
          onMessage(m);
        };
        w.onerror = (ev) => {
          ev.preventDefault?.();
          r.busy[k] = null;
          onError(ev.message || 'the study worker stopped unexpectedly');
        };
      },
    };
  }

  function publish(r: Running) {
    r.timer = null;
    if (running !== r) return;
    const info = r.info;
    store.setState({
      progress: r.progress && r.eta ? { ...r.progress, remainingMs: r.eta.remainingMs(performance.now()) } : r.progress,
      records: r.live.slice().sort((a, b) => a.draw.index - b.draw.index),
      summary: info ? summarizeStudy(info, r.live) : null,
      map: outcomeMap(r.live),
    });
  }

  function schedulePublish(r: Running) {
    if (r.timer === null) r.timer = setTimeout(() => publish(r), publishMs);
  }

  function stopTimers(r: Running) {
    if (r.timer !== null) clearTimeout(r.timer);
    if (r.hardStop !== null) clearTimeout(r.hardStop);
    r.timer = r.hardStop = null;
  }

  async function start(): Promise<void> {
    if (disposed || running) return;
    const b = blockers();
    const scenario = app.store.getState().scenario;
    if (b.length) {
      store.setState({ phase: 'invalid', errors: b, warnings: [], message: 'Fix the listed problems to run the study' });
      return;
    }
    const runs = Number(((scenario as Obj).study as Obj).runs);
    const n = workerCount(runs);
    const shared =
      (o.sharedCancel ?? (typeof crossOriginIsolated !== 'undefined' && crossOriginIsolated)) && typeof SharedArrayBuffer !== 'undefined';
    const r: Running = {
      id: ++seq,
      study: null as unknown as ParallelStudy,
      workers: [],
      busy: [],
      onError: [],
      live: [],
      info: null,
      progress: null,
      eta: Number.isFinite(runs) && runs > 0 ? new TimeLeftEstimator(runs) : null,
      timer: null,
      hardStop: null,
    };
    running = r;
    store.setState({
      phase: 'starting',
      workersUsed: n,
      progress: null,
      info: null,
      records: [],
      summary: null,
      map: [],
      errors: [],
      warnings: [],
      message: '',
      scenario,
      loadedFrom: null,
    });
    const onCase = (rec: CaseRecord, worker: number) => {
      r.live.push(rec);
      r.eta?.add({ worker, t: performance.now() });
      schedulePublish(r);
    };
    let ports: StudyWorkerPort[];
    try {
      r.workers = Array.from({ length: n }, () => o.spawn());
      r.busy = r.workers.map(() => null);
      ports = r.workers.map((w, k) => portFor(r, k, w, onCase));
    } catch (e) {
      for (const w of r.workers) w.terminate();
      running = null;
      store.setState({ phase: 'failed', message: `Could not start the study workers: ${(e as Error).message}` });
      return;
    }
    r.study = startStudyParallel(scenario, ports, {
      chunkSize,
      cancelFlag: shared ? new SharedArrayBuffer(4) : undefined,
      onReady: (info, warnings) => {
        r.info = info;
        if (running === r) store.setState({ phase: store.getState().phase === 'cancelling' ? 'cancelling' : 'running', info, warnings });
      },
      onProgress: (p) => {
        r.progress = p;
        schedulePublish(r);
      },
    });
    const result = await r.study.result;
    stopTimers(r);
    for (const w of r.workers) w.terminate();
    if (running !== r) return;
    running = null;
    if (!result.ok) {
      const failedWorkers = result.errors.some((e) => e.path === 'workers');
      store.setState({
        phase: failedWorkers ? 'failed' : 'invalid',
        errors: result.errors,
        warnings: result.warnings,
        message: failedWorkers ? 'The study workers stopped before the study finished' : 'The engine refused the study',
        records: [],
        summary: null,
        map: [],
      });
      return;
    }
    const v = result.value;
    const warnings = v.warnings.filter((w) => !(w.path === 'workers' && w.message.includes(HARD_STOP_MESSAGE)));
    store.setState({
      phase: v.cancelled ? 'cancelled' : 'done',
      info: v.info,
      summary: v.summary,
      records: v.records,
      map: outcomeMap(v.records),
      warnings,
      progress: r.progress ? { ...r.progress, done: v.records.length, remainingMs: v.cancelled ? null : 0 } : r.progress,
      errors: [],
      message: '',
    });
  }

  function cancel() {
    const r = running;
    if (!r || store.getState().phase === 'cancelling') return;
    store.setState({ phase: 'cancelling' });
    r.study.cancel();
    r.hardStop = setTimeout(() => {
      r.hardStop = null;
      if (running !== r) return;
      r.workers.forEach((w, k) => {
        if (r.busy[k] === null) return;
        w.terminate();
        r.busy[k] = null;
        r.onError[k]?.(HARD_STOP_MESSAGE);
      });
    }, hardStopMs);
  }

  function caseScenario(json: unknown, index: number): Promise<CaseScenarioReply['result']> {
    return new Promise((resolve) => {
      let w: StudyWorkerLike;
      try {
        w = o.spawn();
      } catch (e) {
        resolve({ ok: false, errors: [{ path: 'workers', rule: 'spawn', message: (e as Error).message }], warnings: [] });
        return;
      }
      const id = ++seq;
      const done = (r: CaseScenarioReply['result']) => {
        w.terminate();
        resolve(r);
      };
      w.onmessage = (ev) => {
        const m = ev.data;
        if (m.type === 'case-scenario' && m.id === id) done(m.result);
        else if (m.type === 'case-scenario-crash' && m.id === id)
          done({ ok: false, errors: [{ path: 'workers', rule: 'crashed', message: m.message }], warnings: [] });
      };
      w.onerror = (ev) => {
        ev.preventDefault?.();
        done({ ok: false, errors: [{ path: 'workers', rule: 'crashed', message: ev.message || 'the worker stopped' }], warnings: [] });
      };
      w.postMessage({ type: 'case-scenario', id, json, overrides: {}, index });
    });
  }

  async function openCase(index: number, controllerId: string): Promise<void> {
    const s = store.getState();
    if (s.opening || !s.scenario) return;
    const name = isObj(s.scenario) ? s.scenario.name : undefined;
    await openCaseOf(s.scenario, index, controllerId, `${studySlug(name)}-case-${index}`, `study case ${index}`);
  }

  async function openCaseOf(scenario: unknown, index: number, controllerId: string, fileStem: string, what: string): Promise<void> {
    if (store.getState().opening) return;
    store.setState({ opening: `${index}:${controllerId}` });
    try {
      const r = await caseScenario(scenario, index);
      if (!r.ok) {
        app.notify(`Case ${index} cannot be opened: ${r.errors.map((e) => e.message).join('; ')}`, 'error');
        return;
      }
      // Like File › New: the shell asks about unsaved changes and forgets the current path.
      const n = await app.bridge.newScenario();
      if (n.status !== 'created') return;
      const json = r.value;
      const ids = Array.isArray(json.controllers)
        ? (json.controllers as Obj[]).map((c) => c.id).filter((id): id is string => typeof id === 'string')
        : [];
      app.store.load(json, `${fileStem}.scenario.json`, true);
      app.store.setExcluded(ids.filter((id) => id !== controllerId));
      app.clock.pause();
      app.clock.setTime(0);
      store.setState({ open: false });
      app.notify(`Opened ${what} as a new untitled scenario with ${controllerId} ticked`);
    } finally {
      store.setState({ opening: null });
    }
  }

  async function exportText(kind: 'cases' | 'summary'): Promise<void> {
    const s = store.getState();
    if (!s.info || !s.summary) {
      app.notify('Run a study first', 'error');
      return;
    }
    const slug = studySlug(s.info.scenarioName);
    const content = kind === 'cases' ? casesCsv(s.info, s.records, s.summary) : summaryJson(s.info, s.summary, s.map);
    const suggestedName = kind === 'cases' ? `${slug}-study-cases.csv` : `${slug}-study-summary.json`;
    const r = await app.bridge.exportFile({ suggestedName, content });
    if (r.status === 'exported') app.notify(`Exported ${r.file.name}`);
    else if (r.status === 'failed') app.notify(r.message, 'error');
    else if (r.status === 'invalid') app.notify(r.errors.map((e) => e.message).join('; '), 'error');
  }

  return {
    store,
    setOpen: (open) => store.setState({ open }),
    setSetupOpen: (setupOpen) => store.setState({ setupOpen }),
    setWorkerChoice: (workerChoice) => store.setState({ workerChoice }),
    workerCount,
    blockers,
    start,
    cancel,
    addDefaultStudy() {
      const sc = app.store.getState().scenario;
      if (!isObj(sc) || sc.study !== undefined) return;
      app.store.edit('study', defaultStudyBlock(sc), { label: 'Add study block', coalesceKey: null });
    },
    openCase,
    openCaseOf,
    async saveCampaign() {
      const b = blockers();
      if (b.length) {
        app.notify(b[0]!.message, 'error');
        return;
      }
      const ctx = makeStudyContext(app.store.getState().scenario);
      if (!ctx.ok) {
        app.notify(ctx.errors.map((e) => e.message).join('; '), 'error');
        return;
      }
      const c = ctx.value;
      const controllers = c.controllers.map((x) => x.id);
      const scenario = { ...c.json, study: { ...(c.json.study as Obj), runs: c.def.runs, seed: c.def.seed, controllers } };
      const name = c.prepared.scenario.name;
      const slug = studySlug(name);
      const text = campaignBundleScript(
        {
          scenarioName: name,
          seed: c.def.seed,
          runs: c.def.runs,
          controllers,
          shards: suggestedShards(c.def.runs),
          command: 'slewsmith',
          cpusPerTask: 1,
          memoryMB: 1024,
          timeLimitMin: 60,
        },
        scenario,
        slug,
      );
      const r = await app.bridge.exportFile({ suggestedName: `${slug}-campaign.sh`, content: text });
      if (r.status === 'exported') app.notify(`Saved ${r.file.name}: run "bash ${r.file.name}" on the cluster to make the campaign folder`);
      else if (r.status === 'failed') app.notify(r.message, 'error');
      else if (r.status === 'invalid') app.notify(r.errors.map((e) => e.message).join('; '), 'error');
    },
    openResults(text, fileName) {
      if (running) {
        app.notify('Cancel the running study before opening results', 'error');
        return false;
      }
      let parsed: unknown;
      try {
        parsed = JSON.parse(text);
      } catch {
        app.notify(`${fileName} is not JSON: open the summary.json a study or a campaign merge wrote`, 'error');
        return false;
      }
      const r = readStudySummary(parsed);
      if (!r.ok) {
        app.notify(
          `${fileName} cannot be opened: ${r.errors
            .slice(0, 3)
            .map((e) => e.message)
            .join('; ')}`,
          'error',
        );
        return false;
      }
      const v = r.value;
      store.setState({
        open: true,
        phase: v.summary.incomplete ? 'cancelled' : 'done',
        info: v.info,
        summary: v.summary,
        map: v.map,
        records: [],
        errors: [],
        warnings: [],
        message: '',
        scenario: v.scenario,
        progress: null,
        loadedFrom: fileName,
      });
      app.notify(`Opened the results of ${v.summary.casesDone.toLocaleString('en')} cases from ${fileName}`);
      return true;
    },
    exportCases: () => exportText('cases'),
    exportSummary: () => exportText('summary'),
    dispose() {
      disposed = true;
      const r = running;
      running = null;
      if (r) {
        stopTimers(r);
        for (const w of r.workers) w.terminate();
      }
    },
  };
}
