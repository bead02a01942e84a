/**
 * simulateHybrid: solutions of a hybrid system H = (C, F, D, G) on hybrid time (t, j).
 *
 * Framework: Goebel, Sanfelice & Teel, "Hybrid dynamical systems", IEEE Control Systems Magazine
 * 29(2):28–93, 2009; Hybrid Dynamical Systems: Modeling, Stability, and Robustness, Princeton
 * University Press, 2012. Procedure of methods note §7, in our own design:
 *
 *  1. At the current point, jump while a jump is due: first a scheduled one (timer, t has reached
 *     nextScheduledJump), else a guard one (x ∈ D = {jumpGuard ≥ 0} and either x ∉ C or the rule
 *     for C ∩ D is 'jump'). Several jumps at one instant are allowed; more than
 *     maxJumpsPerInstant within zenoWindow stops the run as 'zeno' instead of hanging.
 *  2. If x ∉ C and no jump is possible, the maximal solution ends: 'blocked'.
 *  3. Flow to the next stop (the next scheduled jump or tEnd, landed on exactly) with RK4 or
 *     DP54. After each accepted step, a crossing of the guard from < 0 to ≥ 0 is located on the
 *     step's dense output (Illinois regula falsi, roots.ts) to eventTimeTol, and the step is cut
 *     there at the point inside D; leaving C (when flowing in C ∩ D, or with an explicit
 *     inFlowSet) is located by bisection. Then back to 1; the integrator restarts after a jump
 *     (derivatives are discontinuous there).
 *
 * Arc: the start, every jump on both sides ((t, j) and (t, j+1)), the end, plus what
 * `record.every` asks for. j counts reported jumps (non-null records); a jump map answering null
 * still applies x⁺ (timer resets, new held inputs) but does not advance j. Results are data:
 * options are validated up front (Result), and the run ends with an outcome
 * ('completed' | 'zeno' | 'step-underflow' | 'non-finite' | 'max-steps' | 'blocked' | 'cancelled'),
 * never NaN in the arc: on a non-finite value it stops at the last finite state and says where.
 *
 * Fast path: fixed-step RK4 with no guard, no explicit flow set and no per-step recording runs
 * the equal steps between scheduled jumps in a tight loop (Rk4Stepper.runTo). Nothing allocates
 * per step on any path; per jump only the event record. The run itself is a HybridRun (run.ts).
 */
import type { Result } from '../errors';
import { fail, ok } from '../errors';
import type { HybridOptions } from './options';
import { validateHybridOptions, validateHybridSystem } from './options';
import { HybridRun } from './run';
import type { HybridArc, HybridSystem } from './types';

export function simulateHybrid(sys: HybridSystem, x0: ArrayLike<number>, options: HybridOptions): Result<HybridArc> {
  const sysIssues = validateHybridSystem(sys, x0);
  const dimOk = Number.isInteger(sys?.dim) && sys.dim >= 1;
  const optR = validateHybridOptions(options, dimOk ? sys.dim : 1);
  if (sysIssues.length || !optR.ok) return fail([...sysIssues, ...(optR.ok ? [] : optR.errors)]);
  return ok(new HybridRun(sys, x0, optR.value).run());
}
