/**
 * Classical fourth-order Runge–Kutta (Kutta, Z. Math. Phys. 46, 1901; Hairer, Nørsett & Wanner,
 * Solving Ordinary Differential Equations I, 2nd ed., §II.1), fixed step, with a cubic Hermite
 * continuous extension (third order, from the end values and end derivatives) for event
 * location and recording between steps.
 *
 * Step policy: between two stops (a scheduled jump, the end time) the stepper takes
 * m = ⌈(t_stop − t)/dt⌉ EQUAL steps, so it lands exactly on every stop without a sliver step.
 * Nothing here allocates after construction.
 */
import { allFinite } from '../math/arrays';
import type { FlowFn, Stepper, StepStatus } from './types';
import { STEP_NON_FINITE, STEP_OK } from './types';

export interface Rk4Work {
  k1: Float64Array;
  k2: Float64Array;
  k3: Float64Array;
  k4: Float64Array;
  tmp: Float64Array;
}

export function makeRk4Work(n: number): Rk4Work {
  return {
    k1: new Float64Array(n),
    k2: new Float64Array(n),
    k3: new Float64Array(n),
    k4: new Float64Array(n),
    tmp: new Float64Array(n),
  };
}

/**
 * out = one RK4 step of length h from (t, x). `work.k1` must hold f(t, x) when `k1Known`;
 * otherwise it is evaluated (and left there). `out` must not alias `x`. Returns out.
 */
export function rk4Step(out: Float64Array, f: FlowFn, t: number, x: Float64Array, h: number, work: Rk4Work, k1Known = false): Float64Array {
  const n = x.length;
  const { k1, k2, k3, k4, tmp } = work;
  if (!k1Known) f(t, x, k1);
  const h2 = 0.5 * h;
  for (let i = 0; i < n; i++) tmp[i] = x[i]! + h2 * k1[i]!;
  f(t + h2, tmp, k2);
  for (let i = 0; i < n; i++) tmp[i] = x[i]! + h2 * k2[i]!;
  f(t + h2, tmp, k3);
  for (let i = 0; i < n; i++) tmp[i] = x[i]! + h * k3[i]!;
  f(t + h, tmp, k4);
  const h6 = h / 6;
  for (let i = 0; i < n; i++) out[i] = x[i]! + h6 * (k1[i]! + 2 * (k2[i]! + k3[i]!) + k4[i]!);
  return out;
}

/**
 * Cubic Hermite interpolation on a step of length h at θ ∈ [0, 1] from the end values x0, x1
 * and end derivatives f0, f1 (per component). Exact for cubics.
 */
export function hermiteInterpolate(
  out: Float64Array,
  theta: number,
  h: number,
  x0: ArrayLike<number>,
  f0: ArrayLike<number>,
  x1: ArrayLike<number>,
  f1: ArrayLike<number>,
): Float64Array {
  const t2 = theta * theta,
    t3 = t2 * theta;
  const a0 = 2 * t3 - 3 * t2 + 1;
  const b0 = (t3 - 2 * t2 + theta) * h;
  const a1 = -2 * t3 + 3 * t2;
  const b1 = (t3 - t2) * h;
  for (let i = 0; i < out.length; i++) out[i] = a0 * x0[i]! + b0 * f0[i]! + a1 * x1[i]! + b1 * f1[i]!;
  return out;
}

/** Number of equal steps of at most dt that cover `span` (≥ 1). */
export function equalStepCount(span: number, dt: number): number {
  return Math.max(1, Math.ceil(span / dt - 1e-9));
}

/** RK4 as a Stepper (see types.ts), with the equal-step policy and a Hermite dense output. */
export class Rk4Stepper implements Stepper {
  readonly n: number;
  readonly f: FlowFn;
  readonly dt: number;
  t = 0;
  x: Float64Array;
  tOld = 0;
  xOld: Float64Array;
  evaluations = 0;
  accepted = 0;
  rejected = 0;
  private xNew: Float64Array;
  /** End of the last full step (differs from x after a truncation). */
  private xEnd: Float64Array;
  private endBuf: Float64Array;
  private fOld: Float64Array;
  private fEnd: Float64Array;
  private fEndValid = false;
  /** x is still the end of the last full step (so fEnd, once computed, is f at x). */
  private atEnd = false;
  private kValid = false;
  private hLast = 0;
  private readonly work: Rk4Work;

  constructor(n: number, f: FlowFn, dt: number) {
    this.n = n;
    this.f = f;
    this.dt = dt;
    this.x = new Float64Array(n);
    this.xOld = new Float64Array(n);
    this.xNew = new Float64Array(n);
    this.endBuf = new Float64Array(n);
    this.xEnd = this.x;
    this.fOld = new Float64Array(n);
    this.fEnd = new Float64Array(n);
    this.work = makeRk4Work(n);
  }

  reset(t: number, x: ArrayLike<number>): void {
    this.t = t;
    const d = this.x;
    for (let i = 0; i < this.n; i++) d[i] = x[i]!;
    this.kValid = false;
    this.atEnd = false;
    this.fEndValid = false;
  }

  adopt(t: number, buf: Float64Array): Float64Array {
    const old = this.x;
    this.xEnd = buf;
    this.x = buf;
    this.t = t;
    this.kValid = false;
    this.atEnd = false;
    this.fEndValid = false;
    return old;
  }

  invalidate(): void {
    this.kValid = false;
    this.atEnd = false;
  }

  advance(tStop: number): StepStatus {
    const span = tStop - this.t;
    const m = equalStepCount(span, this.dt);
    const h = span / m;
    const w = this.work;
    if (!this.kValid) {
      this.f(this.t, this.x, w.k1);
      this.evaluations++;
    }
    rk4Step(this.xNew, this.f, this.t, this.x, h, w, true);
    this.evaluations += 3;
    if (!allFinite(this.xNew)) {
      this.kValid = true; // k1 still holds f(t, x)
      return STEP_NON_FINITE;
    }
    this.commit(m === 1 ? tStop : this.t + h, h);
    return STEP_OK;
  }

  /** Rotate buffers after a step from (t, x) to (tNew, xNew); work.k1 holds f at the start. */
  private commit(tNew: number, h: number): void {
    const old = this.xOld;
    this.xOld = this.x;
    this.x = this.xNew;
    this.xNew = old;
    this.xEnd = this.x;
    const fo = this.fOld;
    this.fOld = this.work.k1;
    this.work.k1 = fo;
    this.tOld = this.t;
    this.t = tNew;
    this.hLast = h;
    this.accepted++;
    this.kValid = false;
    this.fEndValid = false;
    this.atEnd = true;
  }

  dense(out: Float64Array, tq: number): Float64Array {
    if (!this.fEndValid) {
      this.f(this.tOld + this.hLast, this.xEnd, this.fEnd);
      this.evaluations++;
      this.fEndValid = true;
      if (this.atEnd) {
        // First-same-as-last: the end derivative is the next step's k1.
        this.work.k1.set(this.fEnd);
        this.kValid = true;
      }
    }
    const theta = this.hLast > 0 ? (tq - this.tOld) / this.hLast : 1;
    return hermiteInterpolate(out, theta, this.hLast, this.xOld, this.fOld, this.xEnd, this.fEnd);
  }

  truncate(tq: number): void {
    if (tq === this.t) return;
    if (this.xEnd === this.x) {
      // keep the step's end for the interpolant before x is overwritten
      this.endBuf.set(this.x);
      this.xEnd = this.endBuf;
    }
    this.dense(this.x, tq);
    this.t = tq;
    this.atEnd = false;
    this.kValid = false;
  }

  /**
   * Fast path for sampled-data loops: take the equal steps from t to tStop (at most `budget`)
   * with no bookkeeping but a finiteness check, calling `project` after each. On a non-finite
   * result the step is not taken: the stepper stays at the last finite state. Returns the number
   * of steps taken; `this.t === tStop` on full success.
   */
  runTo(tStop: number, budget: number, project?: (x: Float64Array) => boolean | void): { steps: number; status: StepStatus } {
    const t0 = this.t;
    const span = tStop - t0;
    const m = equalStepCount(span, this.dt);
    const steps = Math.min(m, budget);
    const h = span / m;
    const w = this.work;
    const f = this.f;
    const res = this.runResult;
    for (let i = 0; i < steps; i++) {
      const ti = t0 + i * h;
      if (!this.kValid) {
        f(ti, this.x, w.k1);
        this.evaluations++;
      }
      rk4Step(this.xNew, f, ti, this.x, h, w, true);
      this.evaluations += 3;
      if (!allFinite(this.xNew)) {
        this.kValid = true;
        res.steps = i;
        res.status = STEP_NON_FINITE;
        return res;
      }
      this.commit(i === m - 1 ? tStop : t0 + (i + 1) * h, h);
      if (project && project(this.x)) this.atEnd = false;
    }
    res.steps = steps;
    res.status = STEP_OK;
    return res;
  }
  private readonly runResult: { steps: number; status: StepStatus } = { steps: 0, status: STEP_OK };
}
