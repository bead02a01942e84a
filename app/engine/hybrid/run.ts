/**
 * One run of simulateHybrid (simulate.ts states the semantics): the run's state and its phases —
 * the jumps due at the current instant, one flow step (or one RK4 fast-path stretch) cut at the
 * first event on it (located by locate.ts), and the recording of arc points. Made once per run
 * from validated options; nothing allocates per step (per reported jump only the event record).
 */
import { allFinite } from '../math/arrays';
import { ArcBuffer } from './arc';
import { DormandPrince } from './dp54';
import type { ResolvedOptions } from './options';
import { Rk4Stepper } from './rk4';
import { EVENT_GUARD, EVENT_NONE, EventLocator, LOCATE_GUARD_NAN, LOCATE_OK } from './locate';
import type { HybridArc, HybridStatus, HybridSystem, JumpCause, JumpEvent, JumpRecord, Stepper, StepStatus } from './types';
import { STEP_NON_FINITE, STEP_OK, STEP_UNDERFLOW } from './types';
import { JumpWindow } from './zeno';

function fmt(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(12))) : String(v);
}

/** State and phases of one hybrid run: `new HybridRun(sys, x0, validatedOptions).run()`. */
export class HybridRun {
  private readonly sys: HybridSystem;
  private readonly o: ResolvedOptions;
  private readonly rec: ResolvedOptions['record'];
  private readonly n: number;
  private readonly stepper: Stepper;
  private readonly rk4: Rk4Stepper | null;
  private readonly hasGuard: boolean;
  private readonly hasFlowSet: boolean;
  private readonly locator: EventLocator;
  private readonly zeno: JumpWindow;
  private readonly hasSched: boolean;
  private readonly preferJump: boolean;
  private readonly hasProject: boolean;
  private readonly project: ((x: Float64Array) => boolean | void) | undefined;
  private readonly hasStop: boolean;
  /** Fixed-step RK4 with no guard, no flow set and no per-step recording: Rk4Stepper.runTo. */
  private readonly fastPath: boolean;

  private readonly arc: ArcBuffer;
  private readonly events: JumpEvent[] = [];
  private xPlus: Float64Array;
  private readonly scratch: Float64Array;
  private jumps = 0;
  private silentJumps = 0;

  private t: number;
  private j = 0;
  private status: HybridStatus | null = null;
  private message = '';
  private cancelled = false;
  /** The current point (t, j, x) is in the arc already. */
  private recordedCurrent = false;
  /** Guard value at the current point (−∞ without a guard). */
  private g: number;
  /** A guard crossing may fire; a declined guard jump disarms it until the guard is seen < 0. */
  private armed = true;
  private tSched: number;
  /** Next 'interval' recording time t0 + nextRecK·dt (∞ for other recording modes). */
  private nextRecK = 1;
  private tRec: number;

  constructor(sys: HybridSystem, x0: ArrayLike<number>, o: ResolvedOptions) {
    this.sys = sys;
    this.o = o;
    this.rec = o.record;
    const n = (this.n = sys.dim);
    const integ = o.integrator;
    this.stepper = integ.kind === 'rk4' ? new Rk4Stepper(n, sys.flow, integ.dt) : new DormandPrince(n, sys.flow, integ);
    this.rk4 = this.stepper instanceof Rk4Stepper ? this.stepper : null;
    this.locator = new EventLocator(sys, this.stepper, o.eventScan, o.eventTimeTol);
    this.zeno = new JumpWindow(o.maxJumpsPerInstant, o.zenoWindow);
    this.hasGuard = this.locator.hasGuard;
    this.hasFlowSet = this.locator.hasFlowSet;
    this.hasSched = typeof sys.nextScheduledJump === 'function';
    this.preferJump = sys.both !== 'flow';
    this.hasProject = typeof sys.project === 'function';
    this.project = this.hasProject ? sys.project!.bind(sys) : undefined;
    this.hasStop = typeof sys.stop === 'function';
    this.fastPath =
      this.rk4 !== null && !this.hasGuard && !this.hasFlowSet && (this.rec.every === 'scheduled' || this.rec.every === 'none');

    this.arc = new ArcBuffer(n);
    this.xPlus = new Float64Array(n);
    this.scratch = new Float64Array(n);
    this.t = o.t0;
    this.stepper.reset(this.t, x0);
    this.g = this.hasGuard ? sys.jumpGuard!(this.t, this.stepper.x) : -Infinity;
    this.tSched = this.hasSched ? sys.nextScheduledJump!(this.t, this.stepper.x) : Infinity;
    this.tRec = this.rec.every === 'interval' ? o.t0 + this.rec.dt : Infinity;
  }

  /** Jump and flow until an outcome is reached; the arc with its outcome and statistics. */
  run(): HybridArc {
    const t = this.t;
    this.record(t, this.j, this.stepper.x, true);
    if (this.hasGuard && Number.isNaN(this.g)) this.stop('non-finite', `jumpGuard returned NaN at the initial state (t = ${fmt(t)})`);
    if (Number.isNaN(this.tSched)) this.stop('non-finite', `nextScheduledJump returned NaN at t = ${fmt(t)}`);
    // Every phase that ends the run sets a status or the cancelled flag.
    while (this.status === null && !this.cancelled) {
      this.jumpWhileDue();
      if (this.status !== null || this.cancelled) break;
      this.flow();
    }
    return this.finish();
  }

  // ---- recording and stopping

  private record(tr: number, jr: number, xr: Float64Array, current: boolean): void {
    if (this.rec.store) this.arc.push(tr, jr, xr);
    if (current) this.recordedCurrent = true;
    if (this.rec.onRecord && this.rec.onRecord(tr, jr, xr) === false) this.cancelled = true;
  }

  private stop(s: HybridStatus, m: string): void {
    this.status = s;
    this.message = m;
  }

  /** After a flow segment: the system's own stop rule. */
  private askStop(): void {
    if (this.hasStop && this.sys.stop!() === true)
      this.stop('cancelled', `the system asked to stop at t = ${fmt(this.t)} s (j = ${this.j})`);
  }

  // ---- 1. jumps due at this instant

  private jumpWhileDue(): void {
    while (this.t < this.o.tEnd) {
      const cause = this.dueJump();
      if (cause === null || this.zenoStop() || !this.jump(cause)) return;
    }
  }

  /** A scheduled jump first (the timer has run out), else a guard jump when x ∈ D and the rules allow it. */
  private dueJump(): JumpCause | null {
    if (this.tSched <= this.t) return 'scheduled';
    if (this.hasGuard && this.armed && this.g >= 0 && (this.preferJump || !this.locator.inC(this.t, this.stepper.x, this.g)))
      return 'guard';
    return null;
  }

  /** Count one more jump in the Zeno window; true (and the run stopped) when there are too many. */
  private zenoStop(): boolean {
    if (this.zeno.admit(this.t)) return false;
    this.stop(
      'zeno',
      `more than ${this.zeno.max} jumps within ${fmt(this.zeno.window)} s up to t = ${fmt(this.t)} s (j = ${this.j}): ` +
        `Zeno-like accumulation of jumps; the run stops here`,
    );
    return true;
  }

  /** Apply the jump map once; false when the run ends here (status set or cancelled). */
  private jump(cause: JumpCause): boolean {
    const t = this.t;
    const x = this.stepper.x;
    const xPlus = this.xPlus;
    for (let i = 0; i < this.n; i++) xPlus[i] = x[i]!;
    const r = this.sys.jump(t, x, xPlus, cause);
    if (!allFinite(xPlus)) {
      this.stop(
        'non-finite',
        `the jump map (${cause}) gave a non-finite state at t = ${fmt(t)} s (j = ${this.j}); ` +
          `the arc ends at the last finite state, before that jump`,
      );
      return false;
    }
    this.jumps++;
    if (r) {
      if (!this.recordedCurrent) this.record(t, this.j, x, true);
      this.j++;
      this.logEvent(t, r);
    } else {
      this.silentJumps++;
      if (cause === 'guard') this.armed = false;
    }
    this.xPlus = this.stepper.adopt(t, xPlus);
    this.recordedCurrent = false;
    if (r || (cause === 'scheduled' && this.rec.every === 'scheduled')) this.record(t, this.j, this.stepper.x, true);
    if (this.cancelled) return false;
    return this.afterJump(r ? true : false);
  }

  private logEvent(t: number, r: JumpRecord): void {
    const ev: JumpEvent = { t, j: this.j, what: r.what, from: r.from, to: r.to, why: r.why };
    if (r.lyapunovBefore !== undefined) ev.lyapunovBefore = r.lyapunovBefore;
    if (r.lyapunovAfter !== undefined) ev.lyapunovAfter = r.lyapunovAfter;
    this.events.push(ev);
  }

  /** Guard and timer afresh after a jump, then the stop rules; false when the run ends here. */
  private afterJump(reported: boolean): boolean {
    const sys = this.sys;
    const t = this.t;
    if (this.hasGuard) {
      this.g = sys.jumpGuard!(t, this.stepper.x);
      if (Number.isNaN(this.g)) {
        this.stop('non-finite', `jumpGuard returned NaN after the jump at t = ${fmt(t)} s (j = ${this.j})`);
        return false;
      }
      if (this.g < 0) this.armed = true;
    }
    if (this.hasSched) {
      this.tSched = sys.nextScheduledJump!(t, this.stepper.x);
      if (Number.isNaN(this.tSched)) {
        this.stop('non-finite', `nextScheduledJump returned NaN at t = ${fmt(t)} s (j = ${this.j})`);
        return false;
      }
    }
    if (this.hasStop && sys.stop!() === true) {
      this.stop('cancelled', `the system asked to stop after the jump at t = ${fmt(t)} s (j = ${this.j})`);
      return false;
    }
    if (reported && this.j >= this.o.jMax) {
      this.stop('completed', `reached jMax = ${this.o.jMax} jumps at t = ${fmt(t)} s`);
      return false;
    }
    return true;
  }

  // ---- 2. may the solution flow? 3. flow

  private flow(): void {
    const o = this.o;
    const t = this.t;
    const j = this.j;
    if (t >= o.tEnd) {
      this.stop('completed', `reached tEnd = ${fmt(o.tEnd)} s with ${j} jump${j === 1 ? '' : 's'}`);
      return;
    }
    if ((this.hasFlowSet || this.g > 0) && !this.locator.inC(t, this.stepper.x, this.g)) {
      this.stop(
        'blocked',
        `the state left the flow set at t = ${fmt(t)} s (j = ${j}) without a jump being possible ` +
          `(${this.hasGuard && this.g >= 0 ? 'the jump map declined' : 'not in the jump set'}); the solution ends here`,
      );
      return;
    }
    const tStop = Math.min(this.tSched, o.tEnd);
    const attempts = this.stepper.accepted + this.stepper.rejected;
    if (attempts >= o.maxSteps) {
      this.stop('max-steps', `used maxSteps = ${o.maxSteps} step attempts by t = ${fmt(t)} s (j = ${j})`);
      return;
    }
    if (this.fastPath) this.flowFast(tStop, attempts);
    else this.flowStep(tStop);
  }

  /** The equal RK4 steps up to the next stop in one tight loop (no guard, no flow set to watch). */
  private flowFast(tStop: number, attempts: number): void {
    const o = this.o;
    const res = this.rk4!.runTo(tStop, o.maxSteps - attempts, this.project);
    this.t = this.stepper.t;
    this.recordedCurrent = false;
    if (res.status !== STEP_OK) {
      this.stop(
        'non-finite',
        `the flow gave a non-finite state in the RK4 step from t = ${fmt(this.t)} s (j = ${this.j}); ` +
          `the arc ends at the last finite state`,
      );
      return;
    }
    if (this.t < tStop) {
      this.stop('max-steps', `used maxSteps = ${o.maxSteps} step attempts by t = ${fmt(this.t)} s (j = ${this.j})`);
      return;
    }
    this.askStop();
  }

  /** One accepted step toward tStop, cut at the first event on it, recorded and projected. */
  private flowStep(tStop: number): void {
    const stepper = this.stepper;
    const tPrev = stepper.t;
    const st = stepper.advance(tStop);
    if (st !== STEP_OK) {
      this.stopOnStepFailure(st);
      return;
    }
    const tNew = stepper.t;
    const ev = this.locator;
    const found = ev.locate(tPrev, tNew, this.g, this.armed);
    if (found !== LOCATE_OK) {
      this.stopOnLocateFailure(found, tNew);
      this.t = tNew;
      this.recordedCurrent = false;
      return;
    }
    const kind = ev.kind;
    const recordEnd = this.recordGrid(kind ? ev.tEvent : tNew);
    if (kind) stepper.truncate(ev.tEvent);
    this.t = stepper.t;
    this.recordedCurrent = false;
    let changed = false;
    if (this.hasProject && this.sys.project!(stepper.x)) {
      stepper.invalidate();
      changed = true;
    }
    if (this.hasGuard) {
      if (kind === EVENT_GUARD && !changed) this.g = ev.gEvent;
      else if (kind === EVENT_NONE && !changed) this.g = ev.gEnd;
      else this.g = this.sys.jumpGuard!(this.t, stepper.x);
      if (this.g < 0) this.armed = true;
    }
    if (recordEnd) this.record(this.t, this.j, stepper.x, true);
    this.askStop();
  }

  private stopOnStepFailure(st: StepStatus): void {
    if (st === STEP_UNDERFLOW) {
      this.stop(
        'step-underflow',
        `the step size the error control asks for fell below the minimum at t = ${fmt(this.t)} s ` + `(j = ${this.j}); the arc ends there`,
      );
    } else if (st === STEP_NON_FINITE) {
      this.stop(
        'non-finite',
        `the flow map gave a non-finite value in the step from t = ${fmt(this.t)} s (j = ${this.j}); ` +
          `the arc ends at the last finite state`,
      );
    }
  }

  private stopOnLocateFailure(found: number, tNew: number): void {
    if (found === LOCATE_GUARD_NAN) this.stop('non-finite', `jumpGuard returned NaN at t = ${fmt(tNew)} s (j = ${this.j})`);
    else {
      const { a, b } = this.locator;
      this.stop('non-finite', `jumpGuard was not finite on the dense output between t = ${fmt(a)} and ${fmt(b)} s (j = ${this.j})`);
    }
  }

  /**
   * Record the 'interval' grid times up to tUpTo from the step's dense output. True when the step's
   * end is to be recorded as the current point ('step' mode, or a grid time on the end itself,
   * recorded after projection).
   */
  private recordGrid(tUpTo: number): boolean {
    let recordEnd = this.rec.every === 'step';
    while (this.tRec <= tUpTo) {
      if (this.tRec === tUpTo) recordEnd = true;
      else this.record(this.tRec, this.j, this.stepper.dense(this.scratch, this.tRec), false);
      this.nextRecK++;
      this.tRec = this.o.t0 + this.nextRecK * this.rec.dt;
    }
    return recordEnd;
  }

  // ---- the end

  private finish(): HybridArc {
    const stepper = this.stepper;
    if (this.status === null) this.stop('cancelled', `onRecord asked to stop at t = ${fmt(this.t)} s (j = ${this.j})`);
    if (!this.recordedCurrent) {
      if (this.cancelled) {
        if (this.rec.store) this.arc.push(this.t, this.j, stepper.x);
      } else this.record(this.t, this.j, stepper.x, true);
    }
    const v = this.arc.views();
    return {
      dim: this.n,
      count: this.arc.count,
      t: v.t,
      j: v.j,
      x: v.x,
      events: this.events,
      outcome: { status: this.status as HybridStatus, message: this.message, t: this.t, j: this.j },
      finalState: new Float64Array(stepper.x),
      stats: {
        steps: stepper.accepted + stepper.rejected,
        accepted: stepper.accepted,
        rejected: stepper.rejected,
        evaluations: stepper.evaluations,
        jumps: this.jumps,
        silentJumps: this.silentJumps,
        rootIterations: this.locator.rootIterations,
      },
    };
  }
}
