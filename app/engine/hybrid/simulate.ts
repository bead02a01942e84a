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
 * per step on any path; per jump only the event record.
 */
import type { Result } from '../errors';
import { fail, ok } from '../errors';
import { allFinite } from '../math/arrays';
import { ArcBuffer } from './arc';
import { DormandPrince } from './dp54';
import type { HybridOptions } from './options';
import { validateHybridOptions, validateHybridSystem } from './options';
import { Rk4Stepper } from './rk4';
import { locateCrossing, locateExit } from './roots';
import type { HybridArc, HybridStatus, HybridSystem, JumpCause, JumpEvent, Stepper } from './types';
import { STEP_NON_FINITE, STEP_OK, STEP_UNDERFLOW } from './types';

function fmt(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(12))) : String(v);
}

export function simulateHybrid(sys: HybridSystem, x0: ArrayLike<number>, options: HybridOptions): Result<HybridArc> {
  const sysIssues = validateHybridSystem(sys, x0);
  const dimOk = Number.isInteger(sys?.dim) && sys.dim >= 1;
  const optR = validateHybridOptions(options, dimOk ? sys.dim : 1);
  if (sysIssues.length || !optR.ok) return fail([...sysIssues, ...(optR.ok ? [] : optR.errors)]);
  const o = optR.value;
  const n = sys.dim;
  const integ = o.integrator;
  const stepper: Stepper = integ.kind === 'rk4' ? new Rk4Stepper(n, sys.flow, integ.dt) : new DormandPrince(n, sys.flow, integ);
  const rk4 = stepper instanceof Rk4Stepper ? stepper : null;

  const hasGuard = typeof sys.jumpGuard === 'function';
  const hasFlowSet = typeof sys.inFlowSet === 'function';
  const hasSched = typeof sys.nextScheduledJump === 'function';
  const preferJump = sys.both !== 'flow';
  const hasProject = typeof sys.project === 'function';
  const project = hasProject ? sys.project!.bind(sys) : undefined;
  const rec = o.record;
  const hasStop = typeof sys.stop === 'function';
  const fastPath = rk4 !== null && !hasGuard && !hasFlowSet && (rec.every === 'scheduled' || rec.every === 'none');

  const arc = new ArcBuffer(n);
  const events: JumpEvent[] = [];
  let xPlus: Float64Array = new Float64Array(n);
  const scratch = new Float64Array(n);
  const ring = new Float64Array(o.maxJumpsPerInstant);
  let ringCount = 0,
    ringIdx = 0;
  let rootIterations = 0,
    jumps = 0,
    silentJumps = 0;

  let t = o.t0;
  let j = 0;
  stepper.reset(t, x0);
  let status: HybridStatus | null = null;
  let message = '';
  let cancelled = false;
  let recordedCurrent = false;

  const record = (tr: number, jr: number, xr: Float64Array, current: boolean): void => {
    if (rec.store) arc.push(tr, jr, xr);
    if (current) recordedCurrent = true;
    if (rec.onRecord && rec.onRecord(tr, jr, xr) === false) cancelled = true;
  };
  const stop = (s: HybridStatus, m: string): void => {
    status = s;
    message = m;
  };
  const inC = (tq: number, xq: Float64Array, gq: number): boolean => (hasFlowSet ? sys.inFlowSet!(tq, xq) : hasGuard ? gq <= 0 : true);
  const guardAt = (tq: number): number => {
    rootIterations++;
    return sys.jumpGuard!(tq, stepper.dense(scratch, tq));
  };
  const inCAt = (tq: number): boolean => {
    rootIterations++;
    stepper.dense(scratch, tq);
    return inC(tq, scratch, hasGuard ? sys.jumpGuard!(tq, scratch) : -1);
  };

  let g = hasGuard ? sys.jumpGuard!(t, stepper.x) : -Infinity;
  let armed = true;
  let tSched = hasSched ? sys.nextScheduledJump!(t, stepper.x) : Infinity;
  let nextRecK = 1;
  let tRec = rec.every === 'interval' ? o.t0 + rec.dt : Infinity;

  record(t, j, stepper.x, true);
  if (hasGuard && Number.isNaN(g)) stop('non-finite', `jumpGuard returned NaN at the initial state (t = ${fmt(t)})`);
  if (Number.isNaN(tSched)) stop('non-finite', `nextScheduledJump returned NaN at t = ${fmt(t)}`);

  outer: while (status === null && !cancelled) {
    // ---- 1. jumps due at this instant
    while (t < o.tEnd) {
      let cause: JumpCause | null = null;
      if (tSched <= t) cause = 'scheduled';
      else if (hasGuard && armed && g >= 0 && (preferJump || !inC(t, stepper.x, g))) cause = 'guard';
      if (cause === null) break;
      const M = o.maxJumpsPerInstant;
      if (ringCount >= M && t - ring[ringIdx]! <= o.zenoWindow) {
        stop(
          'zeno',
          `more than ${M} jumps within ${fmt(o.zenoWindow)} s up to t = ${fmt(t)} s (j = ${j}): ` +
            `Zeno-like accumulation of jumps; the run stops here`,
        );
        break outer;
      }
      ring[ringIdx] = t;
      if (++ringIdx === M) ringIdx = 0;
      ringCount++;
      const x = stepper.x;
      for (let i = 0; i < n; i++) xPlus[i] = x[i]!;
      const r = sys.jump(t, x, xPlus, cause);
      if (!allFinite(xPlus)) {
        stop(
          'non-finite',
          `the jump map (${cause}) gave a non-finite state at t = ${fmt(t)} s (j = ${j}); ` +
            `the arc ends at the last finite state, before that jump`,
        );
        break outer;
      }
      jumps++;
      if (r) {
        if (!recordedCurrent) record(t, j, x, true);
        j++;
        const ev: JumpEvent = { t, j, what: r.what, from: r.from, to: r.to, why: r.why };
        if (r.lyapunovBefore !== undefined) ev.lyapunovBefore = r.lyapunovBefore;
        if (r.lyapunovAfter !== undefined) ev.lyapunovAfter = r.lyapunovAfter;
        events.push(ev);
      } else {
        silentJumps++;
        if (cause === 'guard') armed = false;
      }
      xPlus = stepper.adopt(t, xPlus);
      recordedCurrent = false;
      if (r || (cause === 'scheduled' && rec.every === 'scheduled')) record(t, j, stepper.x, true);
      if (cancelled) break outer;
      if (hasGuard) {
        g = sys.jumpGuard!(t, stepper.x);
        if (Number.isNaN(g)) {
          stop('non-finite', `jumpGuard returned NaN after the jump at t = ${fmt(t)} s (j = ${j})`);
          break outer;
        }
        if (g < 0) armed = true;
      }
      if (hasSched) {
        tSched = sys.nextScheduledJump!(t, stepper.x);
        if (Number.isNaN(tSched)) {
          stop('non-finite', `nextScheduledJump returned NaN at t = ${fmt(t)} s (j = ${j})`);
          break outer;
        }
      }
      if (hasStop && sys.stop!() === true) {
        stop('cancelled', `the system asked to stop after the jump at t = ${fmt(t)} s (j = ${j})`);
        break outer;
      }
      if (r && j >= o.jMax) {
        stop('completed', `reached jMax = ${o.jMax} jumps at t = ${fmt(t)} s`);
        break outer;
      }
    }
    if (t >= o.tEnd) {
      stop('completed', `reached tEnd = ${fmt(o.tEnd)} s with ${j} jump${j === 1 ? '' : 's'}`);
      break;
    }
    // ---- 2. can the solution flow?
    if ((hasFlowSet || g > 0) && !inC(t, stepper.x, g)) {
      stop(
        'blocked',
        `the state left the flow set at t = ${fmt(t)} s (j = ${j}) without a jump being possible ` +
          `(${hasGuard && g >= 0 ? 'the jump map declined' : 'not in the jump set'}); the solution ends here`,
      );
      break;
    }
    // ---- 3. flow
    const tStop = Math.min(tSched, o.tEnd);
    const attempts = stepper.accepted + stepper.rejected;
    if (attempts >= o.maxSteps) {
      stop('max-steps', `used maxSteps = ${o.maxSteps} step attempts by t = ${fmt(t)} s (j = ${j})`);
      break;
    }
    if (fastPath) {
      const res = rk4!.runTo(tStop, o.maxSteps - attempts, project);
      t = stepper.t;
      recordedCurrent = false;
      if (res.status !== STEP_OK) {
        stop(
          'non-finite',
          `the flow gave a non-finite state in the RK4 step from t = ${fmt(t)} s (j = ${j}); ` + `the arc ends at the last finite state`,
        );
        break;
      }
      if (t < tStop) {
        stop('max-steps', `used maxSteps = ${o.maxSteps} step attempts by t = ${fmt(t)} s (j = ${j})`);
        break;
      }
      if (hasStop && sys.stop!() === true) stop('cancelled', `the system asked to stop at t = ${fmt(t)} s (j = ${j})`);
      continue;
    }
    const tPrev = stepper.t;
    const st = stepper.advance(tStop);
    if (st !== STEP_OK) {
      if (st === STEP_UNDERFLOW) {
        stop(
          'step-underflow',
          `the step size the error control asks for fell below the minimum at t = ${fmt(t)} s ` + `(j = ${j}); the arc ends there`,
        );
      } else if (st === STEP_NON_FINITE) {
        stop(
          'non-finite',
          `the flow map gave a non-finite value in the step from t = ${fmt(t)} s (j = ${j}); ` + `the arc ends at the last finite state`,
        );
      }
      break;
    }
    const tNew = stepper.t;
    let g1 = -Infinity;
    let tEvent = NaN;
    let gEvent = NaN;
    let kind = 0; // 0 none, 1 guard crossing, 2 exit from C
    if (hasGuard) {
      g1 = sys.jumpGuard!(tNew, stepper.x);
      if (Number.isNaN(g1)) {
        stop('non-finite', `jumpGuard returned NaN at t = ${fmt(tNew)} s (j = ${j})`);
        t = tNew;
        recordedCurrent = false;
        break;
      }
      if (armed && g < 0) {
        let a = tPrev,
          ga = g,
          b = NaN,
          gb = NaN;
        for (let s = 1; s <= o.eventScan; s++) {
          const ts = tPrev + (s / (o.eventScan + 1)) * (tNew - tPrev);
          const gs = guardAt(ts);
          if (gs >= 0) {
            b = ts;
            gb = gs;
            break;
          }
          a = ts;
          ga = gs;
        }
        if (Number.isNaN(b) && g1 >= 0) {
          b = tNew;
          gb = g1;
        }
        if (!Number.isNaN(b)) {
          const rr = locateCrossing(guardAt, a, ga, b, gb, o.eventTimeTol);
          if (Number.isNaN(rr.t)) {
            stop('non-finite', `jumpGuard was not finite on the dense output between t = ${fmt(a)} and ${fmt(b)} s (j = ${j})`);
            t = tNew;
            recordedCurrent = false;
            break;
          }
          tEvent = rr.t;
          gEvent = rr.g;
          kind = 1;
        }
      }
    }
    if (kind === 0 && (hasFlowSet || (hasGuard && g >= 0))) {
      if (!inC(tNew, stepper.x, g1)) {
        tEvent = locateExit(inCAt, tPrev, tNew, o.eventTimeTol).t;
        kind = 2;
      }
    }
    const tUpTo = kind ? tEvent : tNew;
    let recordEnd = rec.every === 'step';
    while (tRec <= tUpTo) {
      // A grid time on the step end is recorded below as the current point (after projection).
      if (tRec === tUpTo) recordEnd = true;
      else record(tRec, j, stepper.dense(scratch, tRec), false);
      nextRecK++;
      tRec = o.t0 + nextRecK * rec.dt;
    }
    if (kind) stepper.truncate(tEvent);
    t = stepper.t;
    recordedCurrent = false;
    let changed = false;
    if (hasProject && sys.project!(stepper.x)) {
      stepper.invalidate();
      changed = true;
    }
    if (hasGuard) {
      if (kind === 1 && !changed) g = gEvent;
      else if (kind === 0 && !changed) g = g1;
      else g = sys.jumpGuard!(t, stepper.x);
      if (g < 0) armed = true;
    }
    if (recordEnd) record(t, j, stepper.x, true);
    if (hasStop && sys.stop!() === true) stop('cancelled', `the system asked to stop at t = ${fmt(t)} s (j = ${j})`);
  }

  if (status === null) stop('cancelled', `onRecord asked to stop at t = ${fmt(t)} s (j = ${j})`);
  if (!recordedCurrent) {
    if (cancelled) {
      if (rec.store) arc.push(t, j, stepper.x);
    } else record(t, j, stepper.x, true);
  }
  const v = arc.views();
  return ok({
    dim: n,
    count: arc.count,
    t: v.t,
    j: v.j,
    x: v.x,
    events,
    outcome: { status: status as unknown as HybridStatus, message, t, j },
    finalState: new Float64Array(stepper.x),
    stats: {
      steps: stepper.accepted + stepper.rejected,
      accepted: stepper.accepted,
      rejected: stepper.rejected,
      evaluations: stepper.evaluations,
      jumps,
      silentJumps,
      rootIterations,
    },
  });
}
