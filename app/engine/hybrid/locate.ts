/**
 * Event location on one accepted flow step of simulateHybrid (methods §7 step 3): a crossing of
 * the guard from < 0 to ≥ 0 is bracketed (optionally by eventScan interior samples) and located on
 * the step's dense output by Illinois regula falsi (roots.ts) to eventTimeTol, returning the point
 * inside D; leaving the flow set C (when flowing in C ∩ D, or with an explicit inFlowSet) is
 * located by bisection. The root-finder callbacks are made once per run, the scratch state once:
 * nothing allocates per step.
 */
import { locateCrossing, locateExit } from './roots';
import type { HybridSystem, Stepper } from './types';

/** What the step ran into: nothing, a guard crossing into D, or an exit from C. */
export const EVENT_NONE = 0;
export const EVENT_GUARD = 1;
const EVENT_EXIT = 2;

/** Outcome of `locate`: fine, the guard was NaN at the step's end, or not finite inside the step. */
export const LOCATE_OK = 0;
export const LOCATE_GUARD_NAN = 1;
const LOCATE_NOT_FINITE = 2;

export class EventLocator {
  /** The event found by the last `locate` (EVENT_*), its time and the guard there. */
  kind = EVENT_NONE;
  tEvent = NaN;
  gEvent = NaN;
  /** The guard at the step's end (−∞ without a guard). */
  gEnd = -Infinity;
  /** With LOCATE_NOT_FINITE: the bracket [a, b] on which the guard was not finite. */
  a = NaN;
  b = NaN;
  /** Guard (or flow-set) evaluations spent locating events. */
  rootIterations = 0;
  readonly hasGuard: boolean;
  readonly hasFlowSet: boolean;
  private readonly scratch: Float64Array;

  constructor(
    private readonly sys: HybridSystem,
    private readonly stepper: Stepper,
    private readonly eventScan: number,
    private readonly tol: number,
  ) {
    this.hasGuard = typeof sys.jumpGuard === 'function';
    this.hasFlowSet = typeof sys.inFlowSet === 'function';
    this.scratch = new Float64Array(sys.dim);
  }

  /** x ∈ C: the explicit flow set, else { guard ≤ 0 } (gq is the guard at x), else everywhere. */
  inC(tq: number, xq: Float64Array, gq: number): boolean {
    return this.hasFlowSet ? this.sys.inFlowSet!(tq, xq) : this.hasGuard ? gq <= 0 : true;
  }

  private readonly guardAt = (tq: number): number => {
    this.rootIterations++;
    return this.sys.jumpGuard!(tq, this.stepper.dense(this.scratch, tq));
  };

  private readonly inCAt = (tq: number): boolean => {
    this.rootIterations++;
    this.stepper.dense(this.scratch, tq);
    return this.inC(tq, this.scratch, this.hasGuard ? this.sys.jumpGuard!(tq, this.scratch) : -1);
  };

  /**
   * The first event on the step [tPrev, tNew] just taken; g is the guard at tPrev, `armed` whether a
   * crossing may fire. Sets kind, tEvent, gEvent and gEnd; returns LOCATE_*.
   */
  locate(tPrev: number, tNew: number, g: number, armed: boolean): number {
    this.gEnd = -Infinity;
    this.tEvent = NaN;
    this.gEvent = NaN;
    this.kind = EVENT_NONE;
    if (this.hasGuard) {
      const g1 = (this.gEnd = this.sys.jumpGuard!(tNew, this.stepper.x));
      if (Number.isNaN(g1)) return LOCATE_GUARD_NAN;
      if (armed && g < 0 && !this.guardCrossing(tPrev, g, tNew, g1)) return LOCATE_NOT_FINITE;
    }
    if (this.kind === EVENT_NONE && (this.hasFlowSet || (this.hasGuard && g >= 0))) {
      if (!this.inC(tNew, this.stepper.x, this.gEnd)) {
        this.tEvent = locateExit(this.inCAt, tPrev, tNew, this.tol).t;
        this.kind = EVENT_EXIT;
      }
    }
    return LOCATE_OK;
  }

  /** A guard crossing on the step, if any; false when the guard was not finite on the dense output. */
  private guardCrossing(tPrev: number, g: number, tNew: number, g1: number): boolean {
    const scan = this.eventScan;
    let a = tPrev,
      ga = g,
      b = NaN,
      gb = NaN;
    for (let s = 1; s <= scan; s++) {
      const ts = tPrev + (s / (scan + 1)) * (tNew - tPrev);
      const gs = this.guardAt(ts);
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
    if (Number.isNaN(b)) return true;
    const rr = locateCrossing(this.guardAt, a, ga, b, gb, this.tol);
    if (Number.isNaN(rr.t)) {
      this.a = a;
      this.b = b;
      return false;
    }
    this.tEvent = rr.t;
    this.gEvent = rr.g;
    this.kind = EVENT_GUARD;
    return true;
  }
}
