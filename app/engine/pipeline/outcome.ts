/**
 * What a run's files must say about how it ended. A run that stopped before its planned end (step
 * cap, cancelled) is "truncated"; one stopped by a non-finite value, chattering logic or a step
 * underflow is "failed". Either way every export of it carries one sentence saying so in its
 * header (export/types.ts ExportMeta.incomplete), so a partial timeline is never read as complete.
 */
import type { RunOutcome } from '../sim/types';
import type { ControllerRun } from './types';

/** How a run ended, for the exit status and the headers: complete, truncated (cut short) or failed. */
export type RunEnd = 'complete' | 'truncated' | 'failed';

export function runEnd(o: RunOutcome): RunEnd {
  if (o.status === 'completed') return 'complete';
  if (o.status === 'max-steps' || o.status === 'cancelled') return 'truncated';
  return 'failed';
}

/** The header sentence for an export of `run`, or undefined when the run reached its planned end. */
export function runEndNote(run: Pick<ControllerRun, 'outcome'>): string | undefined {
  const o = run.outcome;
  const end = runEnd(o);
  if (end === 'complete') return undefined;
  const upTo = o.plannedEndS !== undefined ? ` at t = ${o.t} s of a planned ${o.plannedEndS} s` : ` at t = ${o.t} s`;
  const head = end === 'truncated' ? 'RUN TRUNCATED' : 'RUN FAILED';
  return `${head}${upTo} (${o.status}): ${o.message.replace(/\s+/g, ' ')}; this file holds only the samples before that point.`;
}
