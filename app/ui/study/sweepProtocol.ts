/**
 * Messages of the renderer's sweep workers (app/ui/worker/sweep.worker.ts). A worker is given the
 * scenario and the sweep definition once, then grid cells one at a time; it answers each cell
 * with the cell's result (engine runSweepCell), "stopped" when the shared cancel flag stopped it
 * inside the cell, or the engine's issues. One worker is also asked for the sweep's info first
 * (sweepInfo: builds cell 0's study context and checks the sweep against the scenario), so that
 * work never blocks the UI thread.
 */
import type { Issue, Result } from '../../engine/errors';
import type { SweepCell, SweepDefinition, SweepInfo } from '../../engine/study';

export type ToSweepWorker =
  | { type: 'init'; json: unknown; def: SweepDefinition; cancelFlag: SharedArrayBuffer | null }
  | { type: 'info' }
  | { type: 'run'; index: number }
  | { type: 'close' };

export type FromSweepWorker =
  | { type: 'info'; result: Result<SweepInfo> }
  | { type: 'case'; index: number }
  | { type: 'cell'; cell: SweepCell }
  | { type: 'stopped'; index: number }
  | { type: 'error'; index: number; errors: Issue[] }
  | { type: 'crash'; message: string };

/** What the sweep session needs of a Web Worker (a real one, or an in-thread stand-in in tests). */
export interface SweepWorkerLike {
  postMessage(message: ToSweepWorker): void;
  terminate(): void;
  onmessage: ((ev: MessageEvent<FromSweepWorker>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
}
