/**
 * Types of the hybrid-system simulator (see simulate.ts for the semantics).
 *
 * Model H = (C, F, D, G) in the sense of Goebel, Sanfelice & Teel, "Hybrid dynamical systems",
 * IEEE Control Systems Magazine 29(2):28–93, 2009, and their book "Hybrid Dynamical Systems:
 * Modeling, Stability, and Robustness", Princeton University Press, 2012: flow ẋ = F(x) on the
 * flow set C, jump x⁺ = G(x) from the jump set D, solutions on hybrid time (t, j).
 */

/** Flow map: write ẋ = F(t, x) into `dxdt`. Must not keep or modify `x`. */
export type FlowFn = (t: number, x: Float64Array, dxdt: Float64Array) => void;

/** Why the simulator asks for a jump. */
export type JumpCause = 'guard' | 'scheduled';

/** What a jump changed, for the event list (the simulator adds t and j). */
export interface JumpRecord {
  what: string;
  from: number;
  to: number;
  why: string;
  lyapunovBefore?: number;
  lyapunovAfter?: number;
}

export interface HybridSystem {
  /** State length. */
  dim: number;
  /** Flow map F (zero-order-hold inputs live in the state or in the system's closure). */
  flow: FlowFn;
  /**
   * Jump set D = { x : jumpGuard(t, x) ≥ 0 } (closed). Unless `inFlowSet` is given, the flow set
   * is C = { jumpGuard ≤ 0 }; the two overlap on the boundary, as the hybrid basic conditions ask.
   */
  jumpGuard?(t: number, x: Float64Array): number;
  /** Flow set C, when it is not simply { jumpGuard ≤ 0 }. Checked at accepted step ends. */
  inFlowSet?(t: number, x: Float64Array): boolean;
  /**
   * Jump map G. `xPlus` arrives holding a copy of x: write the components that change. Return a
   * record of what changed — the jump counter j then increments and the event is logged — or
   * null when there is nothing to report: x⁺ is still applied (a timer reset or a new held input
   * at a sample instant) but j stays, which keeps j counting logic jumps only (RunTrace.j).
   * A null answer to a `guard` jump means the jump map declines; the guard is then disarmed until
   * it is seen negative again, and the solution flows on if x ∈ C.
   */
  jump(t: number, x: Float64Array, xPlus: Float64Array, cause: JumpCause): JumpRecord | null;
  /**
   * Timers (sampled data, zero-order hold): the time of the next scheduled jump, ≥ t, or
   * Infinity. The integrator lands exactly on it (t is set to the returned value, so k·Ts stays
   * k·Ts); no root finding. Asked again after every jump.
   */
  nextScheduledJump?(t: number, x: Float64Array): number;
  /**
   * Called after each accepted step, e.g. to renormalise a quaternion block against integration
   * drift (jump maps are exact, so x⁺ is used as the jump map wrote it). Return true when x was
   * changed, so the integrator re-evaluates the derivative instead of reusing the last stage
   * (first-same-as-last); false/undefined when nothing changed.
   */
  project?(x: Float64Array): boolean | void;
  /** Rule when x ∈ C ∩ D: 'jump' (default, as methods §7) or 'flow'. */
  both?: 'jump' | 'flow';
  /**
   * Asked after every jump and after every flow segment (each accepted step; with the RK4 fast
   * path, each stretch between scheduled jumps): true ends the run with status 'cancelled'.
   */
  stop?(): boolean;
}

/** How a hybrid solution ended; 'blocked': x left C ∪ D and no jump was possible (the maximal solution ends there). */
export type HybridStatus = 'completed' | 'zeno' | 'step-underflow' | 'non-finite' | 'max-steps' | 'cancelled' | 'blocked';

/** One reported jump of a hybrid arc (the closed loop reports logic jumps with these). */
export interface JumpEvent {
  t: number;
  /** Jump counter after the jump. */
  j: number;
  /** What jumped: 'logic' (controller logic variable), 'sample' is not recorded as an event. */
  what: string;
  from: number;
  to: number;
  /** Why, e.g. `h·η = -0.41 ≤ -δ` or `synergy gap 0.31 ≥ δ = 0.2`. */
  why: string;
  /** Lyapunov value W just before and just after the jump, at the same instant (when known). */
  lyapunovBefore?: number;
  lyapunovAfter?: number;
}

export interface HybridOutcome {
  status: HybridStatus;
  message: string;
  /** Hybrid time where the arc ends. */
  t: number;
  j: number;
}

export interface HybridStats {
  /** Step attempts (accepted + rejected). */
  steps: number;
  accepted: number;
  rejected: number;
  /** Flow-map evaluations. */
  evaluations: number;
  /** Jump-map calls that were applied (reported and silent). */
  jumps: number;
  /** Of those, jumps that returned null (timer resets, declined guards). */
  silentJumps: number;
  /** Guard evaluations spent locating crossings. */
  rootIterations: number;
}

/** A hybrid arc: points (t, j, x) sample-major, the jump events and how the run ended. */
export interface HybridArc {
  dim: number;
  /** Stored points. */
  count: number;
  t: Float64Array;
  j: Int32Array;
  /** count × dim, point k at [k·dim .. k·dim + dim − 1]. */
  x: Float64Array;
  events: JumpEvent[];
  outcome: HybridOutcome;
  /** State at the end of the arc (always finite), a copy. */
  finalState: Float64Array;
  stats: HybridStats;
}

/** Result codes of one integrator step. */
export const STEP_OK = 0;
export const STEP_UNDERFLOW = 1;
export const STEP_NON_FINITE = 2;
export type StepStatus = typeof STEP_OK | typeof STEP_UNDERFLOW | typeof STEP_NON_FINITE;

/**
 * One-step integrator with dense output, as the simulator drives it. `x` and `xOld` are the
 * integrator's own buffers (they may be swapped between steps: read them afresh).
 */
export interface Stepper {
  readonly n: number;
  t: number;
  x: Float64Array;
  tOld: number;
  xOld: Float64Array;
  evaluations: number;
  accepted: number;
  rejected: number;
  /** Start again from (t, x): after a jump the derivative is unknown. Copies x. */
  reset(t: number, x: ArrayLike<number>): void;
  /**
   * Like reset, but takes `buf` (length n) as the new state without copying and hands back the
   * previous state buffer for the caller to reuse.
   */
  adopt(t: number, buf: Float64Array): Float64Array;
  /**
   * Take one accepted step toward tStop, never past it; lands exactly on tStop (t = tStop) when
   * it reaches it. On failure t and x are unchanged.
   */
  advance(tStop: number): StepStatus;
  /** State on the last accepted step [tOld, t] by the method's continuous extension. */
  dense(out: Float64Array, tq: number): Float64Array;
  /** Cut the last step at tq ∈ [tOld, t] (an event): x becomes the dense value there. */
  truncate(tq: number): void;
  /** x was modified in place (projection): the cached end derivative is stale. */
  invalidate(): void;
}
