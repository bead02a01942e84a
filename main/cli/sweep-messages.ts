/** Messages between `slewsmith sweep` and its worker threads (sweep.ts, sweep-worker.ts). */
import type { Issue } from '../../app/engine/errors';
import type { SweepDefinition } from '../../app/engine/study/sweep';
import type { SweepCell } from '../../app/engine/study/sweepRun';

export type SweepToWorker =
  { type: 'init'; json: unknown; def: SweepDefinition; cancelFlag: SharedArrayBuffer } | { type: 'run'; index: number } | { type: 'close' };

export type SweepFromWorker =
  | { type: 'case' }
  | { type: 'cell'; cell: SweepCell }
  | { type: 'stopped'; index: number }
  | { type: 'error'; index: number; errors: Issue[] };
