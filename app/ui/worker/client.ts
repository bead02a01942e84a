/**
 * Debounced, latest-wins pipeline runs in a worker.
 *
 * Every edit calls `schedule`; after `debounceMs` of quiet the newest scenario is sent. While the
 * worker is busy, only the newest request waits (older waiting ones are dropped), and a reply
 * whose id is not the newest requested is discarded as stale. A worker stuck on a stale job for
 * longer than `staleKillMs` is terminated and replaced, so the newest edit is not held up by a
 * long run nobody wants any more.
 *
 * With `workers` > 1 a pass is shared: worker i flies every `workers`-th run from run i
 * (runPipeline's runSlice) and the parts are merged (mergeRunSlices) when the last one replies, so
 * the engine time of an edit is divided by the cores the machine gives us.
 *
 * With one worker and `partialAfterRuns`, the worker also posts the pass's first runs as soon as
 * they have flown ('partial' reply), so the plots can change before the whole pass is done.
 */
import type { Result } from '../../engine/errors';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { mergeRunSlices } from '../../engine/pipeline/slices';
import type { RunReply, WorkerMessage } from './protocol';
import { passMessage, replayEarly, samePass, type PrestartedPass } from './prestart';

export interface WorkerLike {
  postMessage(message: WorkerMessage): void;
  terminate(): void;
  onmessage: ((ev: MessageEvent<RunReply>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
}

export interface PipelineRunnerOptions {
  spawn: () => WorkerLike;
  /** Workers sharing each pass (default 1). */
  workers?: number;
  /** Joins the parts of a shared pass (default mergeRunSlices). */
  merge?: (parts: PipelineOutput[]) => PipelineOutput;
  debounceMs?: number;
  /**
   * Leading edge: an edit that comes after `debounceMs` of quiet while no pass is in flight or
   * waiting is sent at once, inside the edit's own event (before the UI renders it), instead of
   * after the timer; edits that follow within `debounceMs` are debounced as usual.
   */
  leadingEdge?: boolean;
  staleKillMs?: number;
  onStart?: (id: number) => void;
  /** `tag` is whatever the caller passed with the request (e.g. the document it came from). */
  onResult: (result: Result<PipelineOutput>, scenario: unknown, id: number, tag: unknown) => void;
  /**
   * Ask the worker for an early output after this many runs (one worker only: a shared pass is
   * already divided); it comes to `onPartial` when its pass is still the newest requested, always
   * before that pass's `onResult`. `total` is the number of runs of the whole pass.
   */
  partialAfterRuns?: number;
  /**
   * No early output for the first pass the runner sends (the app's cold start: nothing is painted
   * before it anyway, and the early output would fly its first run twice, measured 2.1 → 2.6 s to
   * the complete first pass in test/bench/browser.ts).
   */
  partialSkipsFirstPass?: boolean;
  onPartial?: (output: PipelineOutput, total: number, scenario: unknown, id: number, tag: unknown) => void;
  /**
   * Calls back once the partial output has been painted; the worker flies the rest of the pass only
   * then (it would otherwise compete with the renderer for the cores). Default: the next animation
   * frame, then a task (the worker goes on by itself after a short wait if no frame comes).
   */
  afterPaint?: (fn: () => void) => void;
  onCrash: (message: string, id: number) => void;
  /**
   * Workers already flying a pass posted before the runner existed (prestart.ts): they become the
   * runner's workers, and its first pass adopts that pass instead of posting it again when it
   * would post the same messages.
   */
  prestarted?: PrestartedPass | null;
  now?: () => number;
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (h: unknown) => void;
}

export interface PipelineRunner {
  schedule(scenario: unknown, options?: Record<string, unknown>, tag?: unknown): void;
  /** Send now, skipping the debounce. */
  runNow(scenario: unknown, options?: Record<string, unknown>, tag?: unknown): void;
  /** Forget the newest request (e.g. the scenario became invalid): its reply will be discarded. */
  cancel(): void;
  dispose(): void;
  readonly busy: boolean;
}

interface Job {
  id: number;
  scenario: unknown;
  options: Record<string, unknown>;
  tag: unknown;
  sentAt: number;
  /** Replies so far, by worker slot (a shared pass waits for all of them). */
  parts: (Result<PipelineOutput> | undefined)[];
}

export function createPipelineRunner(o: PipelineRunnerOptions): PipelineRunner {
  const debounceMs = o.debounceMs ?? 150;
  const staleKillMs = o.staleKillMs ?? 2000;
  const slots = Math.max(1, Math.floor(o.workers ?? 1));
  const merge = o.merge ?? mergeRunSlices;
  const now = o.now ?? (() => performance.now());
  const setTimer = o.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
  const clearTimer = o.clearTimer ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));
  const afterPaint =
    o.afterPaint ??
    ((fn: () => void) => (typeof requestAnimationFrame === 'function' ? requestAnimationFrame(() => setTimer(fn, 0)) : setTimer(fn, 0)));

  const workers: (WorkerLike | null)[] = Array.from({ length: slots }, () => null);
  let nextId = 1;
  let wantedId = 0;
  let inFlight: Job | null = null;
  let waiting: Job | null = null;
  let timer: unknown = null;
  let disposed = false;
  let passesSent = 0;
  let lastScheduleAt = -Infinity;
  let prestarted = o.prestarted && o.prestarted.workers.length === slots ? o.prestarted : null;
  if (prestarted) prestarted.workers.forEach((w, i) => attach(i, w));
  else o.prestarted?.workers.forEach((w) => w.terminate());

  function ensureWorker(slot: number): WorkerLike {
    const existing = workers[slot];
    if (existing) return existing;
    return attach(slot, o.spawn());
  }

  function attach(slot: number, w: WorkerLike): WorkerLike {
    w.onmessage = (ev) => onReply(slot, ev.data);
    w.onerror = (ev) => {
      ev.preventDefault?.();
      const id = inFlight?.id ?? 0;
      // A worker is unusable after an uncaught error; start fresh ones for the next job.
      dropWorkers();
      if (id === wantedId) o.onCrash(ev.message || 'The pipeline worker stopped unexpectedly.', id);
      pump();
    };
    workers[slot] = w;
    return w;
  }

  function dropWorkers() {
    workers.forEach((w, i) => {
      w?.terminate();
      workers[i] = null;
    });
    inFlight = null;
  }

  function send(job: Job) {
    job.sentAt = now();
    inFlight = job;
    o.onStart?.(job.id);
    const wantsEarly = slots === 1 && o.partialAfterRuns !== undefined && o.onPartial && !(o.partialSkipsFirstPass && passesSent === 0);
    const early = wantsEarly ? { partialAfterRuns: o.partialAfterRuns, partialWait: true } : {};
    passesSent++;
    const messages = Array.from({ length: slots }, (_, i) => passMessage(job.id, job.scenario, job.options, i, slots, early));
    const adopt = prestarted;
    prestarted = null;
    if (adopt && adopt.workers.every((w, i) => workers[i] === w) && samePass(adopt.messages, messages)) {
      // The early pass is this pass: take its replies under its id.
      job.id = wantedId = adopt.messages[0]!.id;
      adopt.workers.forEach((_, i) => replayEarly(adopt, i, true));
      return;
    }
    messages.forEach((m, i) => ensureWorker(i).postMessage(m));
    adopt?.workers.forEach((_, i) => replayEarly(adopt, i, false));
  }

  function pump() {
    if (disposed || inFlight || !waiting) return;
    const job = waiting;
    waiting = null;
    send(job);
  }

  /** The pass's result once every part replied: the first failure, or the merged output. */
  function joined(parts: Result<PipelineOutput>[]): Result<PipelineOutput> {
    const bad = parts.find((p) => !p.ok);
    if (bad || parts.length === 1) return bad ?? parts[0]!;
    const values = parts.flatMap((p) => (p.ok ? [p.value] : []));
    return { ok: true, value: merge(values), warnings: parts[0]!.warnings };
  }

  function onReply(slot: number, reply: RunReply) {
    const job = inFlight;
    if (!job || reply.id !== job.id) return;
    if (reply.type === 'partial') {
      const worker = workers[slot];
      const answer = (go: boolean) => worker?.postMessage({ type: 'continue', id: reply.id, go });
      if (reply.id !== wantedId) return answer(false); // a newer edit came: drop the rest of this pass
      o.onPartial?.(reply.output, reply.total, job.scenario, reply.id, job.tag);
      afterPaint(() => answer(reply.id === wantedId));
      return;
    }
    if (reply.type === 'crash') {
      inFlight = null;
      if (reply.id === wantedId) o.onCrash(reply.message, reply.id);
      pump();
      return;
    }
    job.parts[slot] = reply.result;
    const parts = job.parts.filter((p): p is Result<PipelineOutput> => p !== undefined);
    if (parts.length < slots) return;
    inFlight = null;
    if (reply.id === wantedId) o.onResult(joined(parts), job.scenario, reply.id, job.tag);
    pump();
  }

  function enqueue(scenario: unknown, options: Record<string, unknown>, tag: unknown) {
    const job: Job = { id: nextId++, scenario, options, tag, sentAt: 0, parts: [] };
    wantedId = job.id;
    waiting = job;
    if (inFlight && now() - inFlight.sentAt > staleKillMs) dropWorkers();
    pump();
  }

  return {
    schedule(scenario, options = {}, tag) {
      if (disposed) return;
      const t = now();
      const quiet = o.leadingEdge && timer === null && !inFlight && !waiting && t - lastScheduleAt >= debounceMs;
      lastScheduleAt = t;
      if (quiet) return enqueue(scenario, options, tag);
      if (timer !== null) clearTimer(timer);
      timer = setTimer(() => {
        timer = null;
        enqueue(scenario, options, tag);
      }, debounceMs);
    },
    runNow(scenario, options = {}, tag) {
      if (disposed) return;
      if (timer !== null) clearTimer(timer);
      timer = null;
      enqueue(scenario, options, tag);
    },
    cancel() {
      if (timer !== null) clearTimer(timer);
      timer = null;
      waiting = null;
      wantedId = nextId++;
    },
    dispose() {
      disposed = true;
      if (timer !== null) clearTimer(timer);
      dropWorkers();
    },
    get busy() {
      return inFlight !== null || waiting !== null || timer !== null;
    },
  };
}
