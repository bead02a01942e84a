/**
 * Messages of the renderer's study workers (app/ui/worker/study.worker.ts): the engine's study
 * protocol (engine/study/parallel.ts ToWorker / FromWorker) unchanged, plus one request of our
 * own, "write case k as a scenario file", so that the case builder (which rebuilds the study
 * context, about a second with a synergistic certificate) never blocks the UI thread.
 */
import type { Result } from '../../engine/errors';
import type { FromWorker, StudyOverrides, ToWorker } from '../../engine/study';

export interface CaseScenarioRequest {
  type: 'case-scenario';
  id: number;
  json: unknown;
  overrides: StudyOverrides;
  index: number;
}

export interface CaseScenarioReply {
  type: 'case-scenario';
  id: number;
  result: Result<Record<string, unknown>>;
}

export type ToStudyWorker = ToWorker | CaseScenarioRequest;
export type FromStudyWorker = FromWorker | CaseScenarioReply | { type: 'case-scenario-crash'; id: number; message: string };

/** What the session needs of a Web Worker (a real one, or an in-thread stand-in in tests). */
export interface StudyWorkerLike {
  postMessage(message: ToStudyWorker): void;
  terminate(): void;
  onmessage: ((ev: MessageEvent<FromStudyWorker>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
}
