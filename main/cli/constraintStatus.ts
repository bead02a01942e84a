/**
 * The CLI's exit status for attitude constraints: 3 when a command did all its work but the plan
 * or a flown run violated an attitude constraint of the scenario. 0, 1 and 2 keep their meanings
 * (ok; infeasible, refused or failed; invalid input), and 1 and 2 win over 3.
 */
import type { ConstraintReport } from '../../app/engine/pipeline/constraints';
import { violationText } from '../../app/engine/pipeline/constraints';

export const CONSTRAINT_VIOLATED = 3;

/** `status` unless it is 0 and something violated a constraint. */
export function withConstraintStatus(status: number, violated: boolean): number {
  return status === 0 && violated ? CONSTRAINT_VIOLATED : status;
}

/** One line per violated constraint of a report, prefixed with what was checked. */
export function violationLines(what: string, r: ConstraintReport | null | undefined): string[] {
  if (!r || r.clear) return [];
  return r.constraints.filter((c) => c.intervals.length > 0).map((c) => `${what}: ${violationText(c)}`);
}
