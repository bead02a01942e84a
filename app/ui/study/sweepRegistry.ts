/**
 * One sweep session per app controller (like registry.ts for the study), with Web Workers built by
 * Vite from app/ui/worker/sweep.worker.ts; a cell's worst case opens through the study session.
 */
import { useApp } from '../context';
import type { AppController } from '../appController';
import { useStoreSlice } from '../store/hooks';
import { studySessionOf } from './registry';
import type { SweepWorkerLike } from './sweepProtocol';
import { createSweepSession, type SweepSession, type SweepUiState } from './sweepSession';

const sessions = new WeakMap<AppController, SweepSession>();

function spawnSweepWorker(): SweepWorkerLike {
  return new Worker(new URL('../worker/sweep.worker.ts', import.meta.url), { type: 'module', name: 'sweep' }) as unknown as SweepWorkerLike;
}

export function sweepSessionOf(app: AppController): SweepSession {
  let s = sessions.get(app);
  if (!s) {
    s = createSweepSession({
      app,
      study: studySessionOf(app),
      spawn: spawnSweepWorker,
      cores: typeof navigator !== 'undefined' ? navigator.hardwareConcurrency || 2 : 2,
    });
    sessions.set(app, s);
    // For the end-to-end tests and the console, as registry.ts exposes the study session.
    if (typeof window !== 'undefined') (window as unknown as { __slewsmithSweep?: SweepSession }).__slewsmithSweep = s;
  }
  return s;
}

export function useSweepSession(): SweepSession {
  return sweepSessionOf(useApp());
}

export function useSweepState<T>(select: (s: SweepUiState) => T): T {
  return useStoreSlice(useSweepSession().store, select);
}
