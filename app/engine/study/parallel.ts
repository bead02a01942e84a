/**
 * A study split across workers, independent of what a worker is: the CLI uses Node worker
 * threads, the renderer Web Workers; both wrap their worker in a `StudyWorkerPort` and run the
 * same two halves written here.
 *
 * - Worker half (`createStudyWorker`): builds the study context once, then runs the chunks of
 *   case indices it is sent and posts every finished case.
 * - Coordinator half (`startStudyParallel`): hands out small chunks from one queue (a free worker
 *   takes the next), adds every finished case to the mergeable study state (accumulate.ts) and
 *   summarises that. Each case depends only on (seed, index) and the state does not depend on the
 *   order of arrival, so the result is the same for any number of workers. It runs the whole study
 *   or one range of case indices (a shard of a campaign); `keepRecords: false` keeps no case in
 *   memory (the caller streams them from `onCase`), so a study of any size runs in bounded memory.
 *
 * Cancellation: `cancel()` stops handing out chunks; with a SharedArrayBuffer flag the workers
 * also abandon the case they are in (checked at every control sample). Finished cases are kept.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { StudyContext, StudyOverrides } from './context';
import { makeStudyContext } from './context';
import type { CaseRecord } from './runCase';
import type { StudyProgress, StudyResult } from './runner';
import { ProgressCounter, runStudyChunk, studyInfo } from './runner';
import type { StudyInfo } from './summary';
import { studySummaryOf } from './summary';
import type { StudyAccumulator } from './accumulate';
import { accumulateCase, createStudyAccumulator } from './accumulate';
import { pairwiseHas } from '../math/stats';
import type { StudyContextSeed } from './contextSeed';
import { plantStudyContextSeed } from './contextSeed';

export type ToWorker =
  | { type: 'init'; json: unknown; overrides: StudyOverrides; cancelFlag?: SharedArrayBuffer; seed?: StudyContextSeed }
  | { type: 'run'; chunk: number; indices: number[] }
  | { type: 'close' };

export type FromWorker =
  | { type: 'ready'; info: StudyInfo; warnings: Issue[] }
  | { type: 'invalid'; errors: Issue[]; warnings: Issue[] }
  | { type: 'case'; record: CaseRecord }
  | { type: 'chunk-done'; chunk: number; count: number }
  | { type: 'crash'; message: string };

/** The worker side: feed it every message the worker receives; it answers through `post`. */
export function createStudyWorker(post: (msg: FromWorker) => void): (msg: ToWorker) => void {
  let ctx: StudyContext | null = null;
  let flag: Int32Array | null = null;
  const stop = () => flag !== null && Atomics.load(flag, 0) !== 0;
  return (msg) => {
    try {
      if (msg.type === 'init') {
        flag = msg.cancelFlag ? new Int32Array(msg.cancelFlag) : null;
        if (msg.seed) plantStudyContextSeed(msg.seed);
        const c = makeStudyContext(msg.json, msg.overrides);
        if (!c.ok) {
          post({ type: 'invalid', errors: c.errors, warnings: c.warnings });
          return;
        }
        ctx = c.value;
        post({ type: 'ready', info: studyInfo(ctx), warnings: ctx.warnings });
      } else if (msg.type === 'run') {
        if (!ctx) throw new Error('study worker got cases before a valid init');
        const count = runStudyChunk(ctx, msg.indices, (record) => post({ type: 'case', record }), stop);
        post({ type: 'chunk-done', chunk: msg.chunk, count });
      }
    } catch (e) {
      post({ type: 'crash', message: (e as Error)?.stack ?? String(e) });
    }
  };
}

/** What the coordinator needs of one worker. */
export interface StudyWorkerPort {
  post(msg: ToWorker): void;
  /** Register the handlers once; `onError` for a worker that died. */
  listen(onMessage: (msg: FromWorker) => void, onError: (message: string) => void): void;
}

export interface ParallelOptions {
  overrides?: StudyOverrides;
  /** Cases per chunk (default 4): small enough to balance the load, large enough to keep messages few. */
  chunkSize?: number;
  /** Shared flag (Int32 at 0, non-zero = stop) so cancel() also interrupts running cases. */
  cancelFlag?: SharedArrayBuffer;
  onReady?: (info: StudyInfo, warnings: Issue[]) => void;
  onProgress?: (p: StudyProgress) => void;
  /**
   * Run only the case indices [first, end) (a shard); default: the whole study. A function is
   * asked once the study is known (its runs come from the file and the overrides).
   */
  cases?: { first: number; end: number } | ((info: StudyInfo) => Result<{ first: number; end: number }>);
  /**
   * The study's certificates computed once by the caller (contextSeed.ts `studyContextSeed`), sent
   * with every worker's init so no worker computes them again. Results do not depend on it.
   */
  contextSeed?: StudyContextSeed;
  /** Keep every finished case for the result's `records` (default true; false for large studies). */
  keepRecords?: boolean;
  /** Every finished case as it arrives (any order), after it was added to the summary state. */
  onCase?: (r: CaseRecord) => void;
}

export interface ParallelOutcome extends StudyResult {
  cancelled: boolean;
}

export interface ParallelStudy {
  result: Promise<Result<ParallelOutcome>>;
  cancel(): void;
}

export function startStudyParallel(json: unknown, ports: readonly StudyWorkerPort[], opts: ParallelOptions = {}): ParallelStudy {
  const chunkSize = Math.max(1, Math.floor(opts.chunkSize ?? 4));
  const flag = opts.cancelFlag ? new Int32Array(opts.cancelFlag) : null;
  let cancelled = false;
  let settle: ((r: Result<ParallelOutcome>) => void) | null = null;
  const result = new Promise<Result<ParallelOutcome>>((resolve) => (settle = resolve));
  const finish = (r: Result<ParallelOutcome>) => {
    const s = settle;
    settle = null;
    for (const p of ports) p.post({ type: 'close' });
    s?.(r);
  };

  if (ports.length === 0) {
    finish(fail([{ path: 'workers', rule: 'min', message: 'a parallel study needs at least one worker' }]));
    return { result, cancel() {} };
  }

  let info: StudyInfo | null = null;
  let warnings: Issue[] = [];
  const alive = ports.map(() => true);
  const busy: (number | null)[] = ports.map(() => null);
  const records: CaseRecord[] = [];
  const keep = opts.keepRecords ?? true;
  let acc: StudyAccumulator | null = null;
  let queue: number[][] = [];
  const chunks: number[][] = [];
  let progress: ProgressCounter | null = null;

  const done = () => {
    if (!info || !settle || !acc) return;
    const s = studySummaryOf(info, acc);
    records.sort((a, b) => a.draw.index - b.draw.index);
    finish(ok({ info, summary: s, map: acc.map, accumulator: acc, records, warnings, cancelled }, warnings));
  };

  const dispatch = () => {
    ports.forEach((p, w) => {
      if (!alive[w] || busy[w] !== null || cancelled || queue.length === 0) return;
      const chunk = chunks.indexOf(queue[0]!);
      queue = queue.slice(1);
      busy[w] = chunk;
      p.post({ type: 'run', chunk, indices: chunks[chunk]! });
    });
    if (busy.every((b) => b === null) && (queue.length === 0 || cancelled || !alive.some(Boolean))) {
      if (!alive.some(Boolean) && queue.length > 0 && !cancelled) {
        const s = settle;
        settle = null;
        s?.(fail([{ path: 'workers', rule: 'crashed', message: 'every study worker stopped before the study finished' }], warnings));
        return;
      }
      done();
    }
  };

  ports.forEach((p, w) => {
    p.listen(
      (msg) => {
        if (!settle) return;
        if (msg.type === 'invalid') {
          finish(fail(msg.errors, msg.warnings));
        } else if (msg.type === 'ready') {
          if (!info) {
            const asked = typeof opts.cases === 'function' ? opts.cases(msg.info) : ok(opts.cases);
            const range = asked.ok ? caseRange(msg.info.def.runs, asked.value) : asked;
            if (!range.ok) {
              finish(fail(range.errors, msg.warnings));
              return;
            }
            info = msg.info;
            warnings = msg.warnings;
            acc = createStudyAccumulator(info);
            const { first, end } = range.value;
            progress = new ProgressCounter(end - first);
            // The last cases (one chunk per worker's worth) go out one by one, so the workers
            // finish within about one case of each other instead of one chunk.
            const tail = Math.max(first, end - ports.length * chunkSize);
            for (let s = first; s < tail; s += chunkSize)
              chunks.push(Array.from({ length: Math.min(chunkSize, tail - s) }, (_, k) => s + k));
            for (let s = tail; s < end; s++) chunks.push([s]);
            queue = [...chunks];
            opts.onReady?.(info, warnings);
          }
          dispatch();
        } else if (msg.type === 'case') {
          if (!acc || !accumulateCase(acc, msg.record).ok) return; // a case reported twice is counted once
          if (keep) records.push(msg.record);
          progress?.add(msg.record);
          opts.onCase?.(msg.record);
          if (progress) opts.onProgress?.(progress.snapshot());
        } else if (msg.type === 'chunk-done') {
          busy[w] = null;
          dispatch();
        } else if (msg.type === 'crash') {
          onDead(w, msg.message);
        }
      },
      (message) => onDead(w, message),
    );
  });

  function onDead(w: number, message: string) {
    if (!alive[w]) return;
    alive[w] = false;
    warnings = [...warnings, { path: 'workers', rule: 'crashed', message: `study worker ${w + 1} stopped: ${message.split('\n')[0]}` }];
    const lost = busy[w]!;
    busy[w] = null;
    if (lost !== null) {
      // Re-run the unfinished part of its chunk elsewhere (finished cases of it are kept).
      const rest = chunks[lost]!.filter((i) => !acc || !pairwiseHas(acc.coverage, i));
      if (rest.length) {
        chunks.push(rest);
        queue = [rest, ...queue];
      }
    }
    dispatch();
  }

  for (const p of ports)
    p.post({
      type: 'init',
      json,
      overrides: opts.overrides ?? {},
      cancelFlag: opts.cancelFlag,
      ...(opts.contextSeed ? { seed: opts.contextSeed } : {}),
    });

  return {
    result,
    cancel() {
      cancelled = true;
      if (flag) Atomics.store(flag, 0, 1);
      dispatch();
    },
  };
}

/** The case indices to run: [0, runs) or the given range within it. */
function caseRange(runs: number, cases: { first: number; end: number } | undefined): Result<{ first: number; end: number }> {
  if (!cases) return ok({ first: 0, end: runs });
  const { first, end } = cases;
  if (!Number.isSafeInteger(first) || !Number.isSafeInteger(end) || first < 0 || end > runs || first >= end)
    return fail([
      {
        path: 'cases',
        rule: 'range',
        message: `the case range must be whole numbers with 0 ≤ first < end ≤ ${runs} (the study's runs); got [${first}, ${end})`,
      },
    ]);
  return ok({ first, end });
}

/** A worker port that runs the worker half in this thread (tests; environments without workers). */
export function inThreadPort(): StudyWorkerPort {
  let onMsg: ((m: FromWorker) => void) | null = null;
  const handle = createStudyWorker((m) => onMsg?.(m));
  return {
    post: (m) => {
      if (m.type === 'close') return;
      // Defer like a real worker would, so the coordinator's bookkeeping sees messages in order.
      void Promise.resolve().then(() => handle(m));
    },
    listen: (m) => {
      onMsg = m;
    },
  };
}
