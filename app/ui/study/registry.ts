/**
 * One study session per app controller, created on first use with Web Workers built by Vite from
 * app/ui/worker/study.worker.ts (worker-src 'self' in the CSP). main.tsx needs no change: the
 * session hangs off the controller it belongs to.
 */
import { useApp } from '../context';
import type { AppController } from '../appController';
import { useStoreSlice } from '../store/hooks';
import type { StudyWorkerLike } from './protocol';
import { createStudySession, type StudySession, type StudyUiState } from './session';

const sessions = new WeakMap<AppController, StudySession>();

function spawnStudyWorker(): StudyWorkerLike {
  return new Worker(new URL('../worker/study.worker.ts', import.meta.url), { type: 'module', name: 'study' }) as unknown as StudyWorkerLike;
}

export function studySessionOf(app: AppController): StudySession {
  let s = sessions.get(app);
  if (!s) {
    s = createStudySession({
      app,
      spawn: spawnStudyWorker,
      cores: typeof navigator !== 'undefined' ? navigator.hardwareConcurrency || 2 : 2,
    });
    sessions.set(app, s);
    // For the end-to-end tests and the console, as main.tsx exposes the store and clock.
    if (typeof window !== 'undefined') (window as unknown as { __slewsmithStudy?: StudySession }).__slewsmithStudy = s;
  }
  return s;
}

export function useStudySession(): StudySession {
  return studySessionOf(useApp());
}

export function useStudyState<T>(select: (s: StudyUiState) => T): T {
  return useStoreSlice(useStudySession().store, select);
}
