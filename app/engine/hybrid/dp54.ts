/**
 * Dormand–Prince 5(4) with dense output.
 *
 * Method: Dormand & Prince, "A family of embedded Runge–Kutta formulae", J. Comput. Appl. Math.
 * 6(1):19–26, 1980 — seven stages, first-same-as-last (the last stage is f at the new point),
 * the fifth-order solution propagated, the embedded fourth-order one used for the error.
 * Error control as in Hairer, Nørsett & Wanner, Solving Ordinary Differential Equations I,
 * 2nd ed., Springer 1993, §II.4: err = sqrt(mean_i (e_i / (atol_i + rtol·max(|y0_i|, |y1_i|)))²),
 * accept when err ≤ 1; new step h·clamp(0.9·err^(−α)·errPrev^β, 0.2, 10) with the stabilised
 * (PI) exponents α = 0.2 − 0.75β, β = 0.04 (HNW I §II.4 and the step-size-control discussion
 * in HNW II §IV.2); no increase right after a rejection; the starting step by the algorithm of
 * HNW I §II.4. Dense output: the fourth-order continuous extension of the method (HNW I §II.6,
 * after Dormand & Prince 1986 / Shampine 1986), a quartic in θ fixed by y0, y1, h·f0, h·f1 and one
 * further combination of the stages.
 *
 * A trial step whose error is not finite (overflow, NaN from the flow map) counts as rejected
 * and shrinks the step; if the step then falls below the minimum the stepper reports
 * non-finite rather than underflow. Nothing allocates after construction.
 */
import type { Result } from '../errors';
import { fail, issue, ok } from '../errors';
import { allFinite } from '../math/arrays';
import type { Dp54Options } from './dp54Options';
import { validateDp54Options } from './dp54Options';
import type { FlowFn, Stepper, StepStatus } from './types';
import { STEP_NON_FINITE, STEP_OK, STEP_UNDERFLOW } from './types';

// Butcher tableau (Dormand & Prince 1980, Table 2 "RK5(4)7M").
const C2 = 1 / 5,
  C3 = 3 / 10,
  C4 = 4 / 5,
  C5 = 8 / 9;
const A21 = 1 / 5;
const A31 = 3 / 40,
  A32 = 9 / 40;
const A41 = 44 / 45,
  A42 = -56 / 15,
  A43 = 32 / 9;
const A51 = 19372 / 6561,
  A52 = -25360 / 2187,
  A53 = 64448 / 6561,
  A54 = -212 / 729;
const A61 = 9017 / 3168,
  A62 = -355 / 33,
  A63 = 46732 / 5247,
  A64 = 49 / 176,
  A65 = -5103 / 18656;
const B1 = 35 / 384,
  B3 = 500 / 1113,
  B4 = 125 / 192,
  B5 = -2187 / 6784,
  B6 = 11 / 84;
// e = b(5th) − b*(4th), with b* = (5179/57600, 0, 7571/16695, 393/640, −92097/339200, 187/2100, 1/40).
const E1 = 71 / 57600,
  E3 = -71 / 16695,
  E4 = 71 / 1920,
  E5 = -17253 / 339200,
  E6 = 22 / 525,
  E7 = -1 / 40;
// Continuous extension (HNW I §II.6, dense output of DOPRI5).
const D1 = -12715105075 / 11282082432,
  D3 = 87487479700 / 32700410799,
  D4 = -10690763975 / 1880347072,
  D5 = 701980252875 / 199316789632,
  D6 = -1453857185 / 822651844,
  D7 = 69997945 / 29380423;

const SAFETY = 0.9;
const FAC_MIN = 0.2;
const FAC_MAX = 10;
const BETA = 0.04;
const EXPO = 0.2 - 0.75 * BETA;
const EPS = 2.220446049250313e-16;

/** Validated construction. */
export function makeDormandPrince(n: number, f: FlowFn, opts: Dp54Options): Result<DormandPrince> {
  const errs = validateDp54Options(opts as unknown as Record<string, unknown>, n);
  if (!Number.isInteger(n) || n < 1) errs.push(issue('n', 'integer', `n must be an integer ≥ 1 (got ${n})`));
  if (typeof f !== 'function') errs.push(issue('f', 'required', 'f must be a function'));
  return errs.length ? fail(errs) : ok(new DormandPrince(n, f, opts));
}

/** Dormand–Prince 5(4) stepper (see file header). Construct through makeDormandPrince for checks. */
export class DormandPrince implements Stepper {
  readonly n: number;
  readonly f: FlowFn;
  readonly rtol: number;
  readonly atol: Float64Array;
  readonly hMin: number;
  readonly hMax: number;
  readonly hInit: number;
  t = 0;
  x: Float64Array;
  tOld = 0;
  xOld: Float64Array;
  evaluations = 0;
  accepted = 0;
  rejected = 0;
  /** Step the error control proposes next (NaN before the first step). */
  hNext = NaN;
  private errPrev = 1e-4;
  private fsal = false;
  private k1: Float64Array;
  private k2: Float64Array;
  private k3: Float64Array;
  private k4: Float64Array;
  private k5: Float64Array;
  private k6: Float64Array;
  private k7: Float64Array;
  private y: Float64Array;
  private xNew: Float64Array;
  private r1: Float64Array;
  private r2: Float64Array;
  private r3: Float64Array;
  private r4: Float64Array;
  private r5: Float64Array;
  private denseReady = false;
  private hLast = 0;

  constructor(n: number, f: FlowFn, opts: Dp54Options) {
    this.n = n;
    this.f = f;
    this.rtol = opts.rtol;
    this.atol = new Float64Array(n);
    if (typeof opts.atol === 'number') this.atol.fill(opts.atol);
    else this.atol.set(opts.atol);
    this.hMin = opts.hMin ?? 0;
    this.hMax = opts.hMax ?? Infinity;
    this.hInit = opts.hInit ?? NaN;
    const mk = () => new Float64Array(n);
    this.x = mk();
    this.xOld = mk();
    this.k1 = mk();
    this.k2 = mk();
    this.k3 = mk();
    this.k4 = mk();
    this.k5 = mk();
    this.k6 = mk();
    this.k7 = mk();
    this.y = mk();
    this.xNew = mk();
    this.r1 = mk();
    this.r2 = mk();
    this.r3 = mk();
    this.r4 = mk();
    this.r5 = mk();
  }

  reset(t: number, x: ArrayLike<number>): void {
    this.t = t;
    const d = this.x;
    for (let i = 0; i < this.n; i++) d[i] = x[i]!;
    this.fsal = false;
  }

  adopt(t: number, buf: Float64Array): Float64Array {
    const old = this.x;
    this.x = buf;
    this.t = t;
    this.fsal = false;
    return old;
  }

  invalidate(): void {
    this.fsal = false;
  }

  /** Starting step, HNW I §II.4 (uses k2 and y as scratch; k1 must hold f(t, x)). */
  private initialStep(span: number): number {
    const n = this.n,
      x = this.x,
      k1 = this.k1;
    let d0 = 0,
      d1 = 0;
    for (let i = 0; i < n; i++) {
      const sc = this.atol[i]! + this.rtol * Math.abs(x[i]!);
      d0 += (x[i]! / sc) ** 2;
      d1 += (k1[i]! / sc) ** 2;
    }
    d0 = Math.sqrt(d0 / n);
    d1 = Math.sqrt(d1 / n);
    let h0 = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : 0.01 * (d0 / d1);
    h0 = Math.min(h0, this.hMax, span);
    for (let i = 0; i < n; i++) this.y[i] = x[i]! + h0 * k1[i]!;
    this.f(this.t + h0, this.y, this.k2);
    this.evaluations++;
    let d2 = 0;
    for (let i = 0; i < n; i++) {
      const sc = this.atol[i]! + this.rtol * Math.abs(x[i]!);
      d2 += ((this.k2[i]! - k1[i]!) / sc) ** 2;
    }
    d2 = Math.sqrt(d2 / n) / h0;
    const dm = Math.max(d1, d2);
    const h1 = !(dm > 1e-15) ? Math.max(1e-6, h0 * 1e-3) : Math.pow(0.01 / dm, 0.2);
    const h = Math.min(100 * h0, h1, this.hMax);
    return Number.isFinite(h) && h > 0 ? h : h0;
  }

  advance(tStop: number): StepStatus {
    const n = this.n,
      f = this.f;
    const x = this.x;
    if (!this.fsal) {
      f(this.t, x, this.k1);
      this.evaluations++;
      if (!allFinite(this.k1)) return STEP_NON_FINITE;
      this.fsal = true;
    }
    const k1 = this.k1,
      k2 = this.k2,
      k3 = this.k3,
      k4 = this.k4,
      k5 = this.k5,
      k6 = this.k6,
      k7 = this.k7;
    const y = this.y,
      xNew = this.xNew;
    if (Number.isNaN(this.hNext)) this.hNext = this.hInit > 0 ? this.hInit : this.initialStep(tStop - this.t);
    let rejectedNow = false;
    let sawNonFinite = false;
    for (;;) {
      const t = this.t;
      const span = tStop - t;
      let h = Math.min(this.hNext, this.hMax);
      let landing = false;
      if (h >= span) {
        h = span;
        landing = true;
      }
      const hMinEff = Math.max(this.hMin, 16 * EPS * Math.abs(t));
      if (!landing && h < hMinEff) return sawNonFinite ? STEP_NON_FINITE : STEP_UNDERFLOW;
      const tEnd = landing ? tStop : t + h;
      for (let i = 0; i < n; i++) y[i] = x[i]! + h * A21 * k1[i]!;
      f(t + C2 * h, y, k2);
      for (let i = 0; i < n; i++) y[i] = x[i]! + h * (A31 * k1[i]! + A32 * k2[i]!);
      f(t + C3 * h, y, k3);
      for (let i = 0; i < n; i++) y[i] = x[i]! + h * (A41 * k1[i]! + A42 * k2[i]! + A43 * k3[i]!);
      f(t + C4 * h, y, k4);
      for (let i = 0; i < n; i++) y[i] = x[i]! + h * (A51 * k1[i]! + A52 * k2[i]! + A53 * k3[i]! + A54 * k4[i]!);
      f(t + C5 * h, y, k5);
      for (let i = 0; i < n; i++) y[i] = x[i]! + h * (A61 * k1[i]! + A62 * k2[i]! + A63 * k3[i]! + A64 * k4[i]! + A65 * k5[i]!);
      f(tEnd, y, k6);
      for (let i = 0; i < n; i++) xNew[i] = x[i]! + h * (B1 * k1[i]! + B3 * k3[i]! + B4 * k4[i]! + B5 * k5[i]! + B6 * k6[i]!);
      f(tEnd, xNew, k7);
      this.evaluations += 6;
      let err = 0;
      for (let i = 0; i < n; i++) {
        const e = h * (E1 * k1[i]! + E3 * k3[i]! + E4 * k4[i]! + E5 * k5[i]! + E6 * k6[i]! + E7 * k7[i]!);
        const sc = this.atol[i]! + this.rtol * Math.max(Math.abs(x[i]!), Math.abs(xNew[i]!));
        const r = e / sc;
        err += r * r;
        if (!Number.isFinite(xNew[i])) err = NaN;
      }
      err = Math.sqrt(err / n);
      if (err <= 1) {
        let fac = err === 0 ? FAC_MAX : SAFETY * Math.pow(err, -EXPO) * Math.pow(this.errPrev, BETA);
        fac = Math.min(FAC_MAX, Math.max(FAC_MIN, fac));
        if (rejectedNow) fac = Math.min(fac, 1);
        const hProp = h * fac;
        // A step cut short to land on a stop says little about the step the solution allows.
        this.hNext = landing && !rejectedNow ? Math.max(hProp, this.hNext) : hProp;
        this.errPrev = Math.max(err, 1e-4);
        // Rotate: x ← xNew, xOld ← x, k1 ← k7 (FSAL); the old k1 stays in k7 for dense output.
        this.xOld = x;
        this.x = xNew;
        this.xNew = x;
        this.k1 = k7;
        this.k7 = k1;
        this.tOld = t;
        this.t = tEnd;
        this.hLast = h;
        this.accepted++;
        this.denseReady = false;
        return STEP_OK;
      }
      this.rejected++;
      rejectedNow = true;
      if (!Number.isFinite(err)) {
        sawNonFinite = true;
        this.hNext = h * FAC_MIN;
      } else {
        this.hNext = h * Math.max(FAC_MIN, SAFETY * Math.pow(err, -EXPO));
      }
    }
  }

  /** Advance to tEnd (exactly) with at most maxSteps attempts; for standalone use. */
  integrateTo(tEnd: number, maxSteps = 1_000_000): StepStatus | 'max-steps' {
    const start = this.accepted + this.rejected;
    while (this.t < tEnd) {
      if (this.accepted + this.rejected - start >= maxSteps) return 'max-steps';
      const st = this.advance(tEnd);
      if (st !== STEP_OK) return st;
    }
    return STEP_OK;
  }

  private prepareDense(): void {
    // After accept: k7 holds the step's first stage, k1 its last (f at the new point).
    const n = this.n,
      h = this.hLast;
    const y0 = this.xOld,
      y1 = this.x;
    const f0 = this.k7,
      f1 = this.k1,
      k3 = this.k3,
      k4 = this.k4,
      k5 = this.k5,
      k6 = this.k6;
    for (let i = 0; i < n; i++) {
      const d = y1[i]! - y0[i]!;
      const b = h * f0[i]! - d;
      this.r1[i] = y0[i]!;
      this.r2[i] = d;
      this.r3[i] = b;
      this.r4[i] = d - h * f1[i]! - b;
      this.r5[i] = h * (D1 * f0[i]! + D3 * k3[i]! + D4 * k4[i]! + D5 * k5[i]! + D6 * k6[i]! + D7 * f1[i]!);
    }
    this.denseReady = true;
  }

  dense(out: Float64Array, tq: number): Float64Array {
    if (!this.denseReady) this.prepareDense();
    const th = this.hLast > 0 ? (tq - this.tOld) / this.hLast : 1;
    const th1 = 1 - th;
    for (let i = 0; i < this.n; i++) {
      out[i] = this.r1[i]! + th * (this.r2[i]! + th1 * (this.r3[i]! + th * (this.r4[i]! + th1 * this.r5[i]!)));
    }
    return out;
  }

  truncate(tq: number): void {
    if (tq === this.t) return;
    if (!this.denseReady) this.prepareDense();
    this.dense(this.x, tq);
    this.t = tq;
    this.fsal = false;
  }
}
