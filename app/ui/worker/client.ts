/**
 * Debounced, latest-wins pipeline runs in a worker.
 *
 * Every edit calls `schedule`; after `debounceMs` of quiet the newest scenario is sent. While the
 * worker is busy, only the newest request waits (older waiting ones are dropped), and a reply
 * whose id is not the newest requested is discarded as stale. A worker stuck on a stale job for
 * longer than `staleKillMs` is terminated and replaced, so the newest edit is not held up by a
 * long run nobody wants any more.
 */
import type { Result } from '../../engine/errors';
import type { PipelineOutput } from '../../engine/pipeline/types';
import type { RunReply, RunRequest } from './protocol';

export interface WorkerLike {
  postMessage(message: RunRequest): void;
  terminate(): void;
  onmessage: ((ev: MessageEvent<RunReply>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
}

export interface PipelineRunnerOptions {
  spawn: () => WorkerLike;
  debounceMs?: number;
  staleKillMs?: number;
  onStart?: (id: number) => void;
  /** `tag` is whatever the caller passed with the request (e.g. the document it came from). */
  onResult: (result: Result<PipelineOutput>, scenario: unknown, id: number, tag: unknown) => void;
  onCrash: (message: string, id: number) => void;
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
}

export function createPipelineRunner(o: PipelineRunnerOptions): PipelineRunner {
  const debounceMs = o.debounceMs ?? 150;
  const staleKillMs = o.staleKillMs ?? 2000;
  const now = o.now ?? (() => performance.now());
  const setTimer = o.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
  const clearTimer = o.clearTimer ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));

  let worker: WorkerLike | null = null;
  let nextId = 1;
  let wantedId = 0;
  let inFlight: Job | null = null;
  let waiting: Job | null = null;
  let timer: unknown = null;
  let disposed = false;

  function ensureWorker(): WorkerLike {
    if (worker) return worker;
    const w = o.spawn();
    w.onmessage = (ev) => onReply(ev.data);
    w.onerror = (ev) => {
      ev.preventDefault?.();
      const id = inFlight?.id ?? 0;
      // The worker is unusable after an uncaught error; start a fresh one for the next job.
      dropWorker();
      if (id === wantedId) o.onCrash(ev.message || 'The pipeline worker stopped unexpectedly.', id);
      pump();
    };
    worker = w;
    return w;
  }

  function dropWorker() {
    worker?.terminate();
    worker = null;
    inFlight = null;
  }

  function send(job: Job) {
    const w = ensureWorker();
    job.sentAt = now();
    inFlight = job;
    o.onStart?.(job.id);
    w.postMessage({ type: 'run', id: job.id, scenario: job.scenario, options: job.options });
  }

  function pump() {
    if (disposed || inFlight || !waiting) return;
    const job = waiting;
    waiting = null;
    send(job);
  }

  function onReply(reply: RunReply) {
    const job = inFlight;
    if (!job || reply.id !== job.id) return;
    inFlight = null;
    if (reply.id === wantedId) {
      if (reply.type === 'result') o.onResult(reply.result, job.scenario, reply.id, job.tag);
      else o.onCrash(reply.message, reply.id);
    }
    pump();
  }

  function enqueue(scenario: unknown, options: Record<string, unknown>, tag: unknown) {
    const job: Job = { id: nextId++, scenario, options, tag, sentAt: 0 };
    wantedId = job.id;
    waiting = job;
    if (inFlight && now() - inFlight.sentAt > staleKillMs) dropWorker();
    pump();
  }

  return {
    schedule(scenario, options = {}, tag) {
      if (disposed) return;
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
      dropWorker();
    },
    get busy() {
      return inFlight !== null || waiting !== null || timer !== null;
    },
  };
}
