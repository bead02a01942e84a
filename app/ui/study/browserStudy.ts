/**
 * Running a study from the renderer: Web Workers wrapped as the engine's StudyWorkerPort, the
 * engine's coordinator (startStudyParallel) on top. Cancelling inside a running case needs a
 * SharedArrayBuffer, which browsers give only to cross-origin-isolated pages; elsewhere a cancel
 * takes effect after the cases already handed out.
 */
import type { FromWorker, ParallelStudy, StudyWorkerPort, ToWorker } from '../../engine/study/parallel';
import { startStudyParallel } from '../../engine/study/parallel';
import type { StudyOverrides } from '../../engine/study/context';
import type { StudyProgress } from '../../engine/study/runner';

/** What the runner needs of a Web Worker (a real one, or a test double). */
export interface StudyWorkerLike {
  postMessage(msg: ToWorker): void;
  terminate(): void;
  onmessage: ((ev: { data: FromWorker }) => void) | null;
  onerror: ((ev: { message?: string; preventDefault?: () => void }) => void) | null;
}

export function webWorkerPort(w: StudyWorkerLike): StudyWorkerPort {
  return {
    post: (m) => w.postMessage(m),
    listen: (onMessage, onError) => {
      w.onmessage = (ev) => onMessage(ev.data);
      w.onerror = (ev) => {
        ev.preventDefault?.();
        onError(ev.message || 'study worker stopped');
      };
    },
  };
}

export interface BrowserStudyOptions {
  spawn: () => StudyWorkerLike;
  workers: number;
  overrides?: StudyOverrides;
  onProgress?: (p: StudyProgress) => void;
}

export function startBrowserStudy(json: unknown, o: BrowserStudyOptions): ParallelStudy & { dispose(): void } {
  const n = Math.max(1, Math.min(16, Math.floor(o.workers)));
  const workers = Array.from({ length: n }, () => o.spawn());
  const canShare = typeof SharedArrayBuffer !== 'undefined' && (globalThis as { crossOriginIsolated?: boolean }).crossOriginIsolated !== false;
  const study = startStudyParallel(json, workers.map(webWorkerPort), {
    overrides: o.overrides,
    cancelFlag: canShare ? new SharedArrayBuffer(4) : undefined,
    onProgress: o.onProgress,
  });
  const dispose = () => workers.forEach((w) => w.terminate());
  void study.result.then(dispose, dispose);
  return { ...study, dispose };
}

/** The default worker: the bundled study.worker.ts (Vite resolves the URL at build time). */
export function spawnStudyWorker(): StudyWorkerLike {
  return new Worker(new URL('./study.worker.ts', import.meta.url), { type: 'module', name: 'study' }) as unknown as StudyWorkerLike;
}
