/**
 * The sampled loop's inner integrator: classical RK4 (Kutta 1901; Hairer, Nørsett & Wanner,
 * Solving ODEs I, 2nd ed., §II.1) on the gyrostat equations (body/gyrostat.ts, methods §6) with
 * the wheel motor torques held over the flow (zero-order hold between two stops) and no external
 * torque — written for that one system so the inner loop calls no function through an interface.
 *
 * Bit for bit the same as hybrid/rk4.ts rk4Step over body/gyrostat.ts gyrostatDerivative with a
 * zero external torque: every sum is formed in the same order. The one thing done once per flow
 * instead of once per derivative is the body reaction b = −Σ g_i τ_i of held motor torques when
 * the bearings have no friction (τ_i does not depend on the state then): the same operations on
 * the same values give the same bits. With friction the per-wheel torque depends on the state
 * and is formed in every derivative as gyrostatDerivative forms it.
 */
import type { Gyrostat } from '../body/gyrostat';

export class HeldGyrostatRk4 {
  private readonly k1: Float64Array;
  private readonly k2: Float64Array;
  private readonly k3: Float64Array;
  private readonly k4: Float64Array;
  private readonly tmp: Float64Array;
  /** Held motor torque per wheel, N·m. */
  private readonly tau: Float64Array;
  /** −Σ g_i τ_i for the held torques (frictionless bearings only), N·m, body axes. */
  private readonly b = new Float64Array(3);
  private readonly dim: number;

  constructor(private readonly g: Gyrostat) {
    this.dim = 7 + g.n;
    this.k1 = new Float64Array(this.dim);
    this.k2 = new Float64Array(this.dim);
    this.k3 = new Float64Array(this.dim);
    this.k4 = new Float64Array(this.dim);
    this.tmp = new Float64Array(this.dim);
    this.tau = new Float64Array(g.n);
  }

  /** Hold the wheel motor torques (n values, N·m) for the steps that follow. */
  hold(wheelMotorTorque: ArrayLike<number>): void {
    const g = this.g,
      ax = g.axes,
      tau = this.tau;
    let bx = 0,
      by = 0,
      bz = 0;
    for (let i = 0; i < g.n; i++) {
      const t = wheelMotorTorque[i]!;
      tau[i] = t;
      bx -= ax[3 * i]! * t;
      by -= ax[3 * i + 1]! * t;
      bz -= ax[3 * i + 2]! * t;
    }
    this.b[0] = bx;
    this.b[1] = by;
    this.b[2] = bz;
  }

  /**
   * out = one RK4 step of length h from x (out must not alias x). Returns false when a value of
   * out is not finite (the caller keeps x).
   */
  step(out: Float64Array, x: Float64Array, h: number): boolean {
    const n = this.dim;
    const { k1, k2, k3, k4, tmp } = this;
    this.deriv(k1, x);
    const h2 = 0.5 * h;
    for (let i = 0; i < n; i++) tmp[i] = x[i]! + h2 * k1[i]!;
    this.deriv(k2, tmp);
    for (let i = 0; i < n; i++) tmp[i] = x[i]! + h2 * k2[i]!;
    this.deriv(k3, tmp);
    for (let i = 0; i < n; i++) tmp[i] = x[i]! + h * k3[i]!;
    this.deriv(k4, tmp);
    const h6 = h / 6;
    let finite = true;
    for (let i = 0; i < n; i++) {
      const v = x[i]! + h6 * (k1[i]! + 2 * (k2[i]! + k3[i]!) + k4[i]!);
      out[i] = v;
      if (!Number.isFinite(v)) finite = false;
    }
    return finite;
  }

  /** dx = f(x), the gyrostat equations with the held torques (order of operations as gyrostatDerivative). */
  private deriv(dx: Float64Array, x: Float64Array): void {
    const g = this.g;
    const qx = x[0]!,
      qy = x[1]!,
      qz = x[2]!,
      qw = x[3]!;
    const wx = x[4]!,
      wy = x[5]!,
      wz = x[6]!;
    dx[0] = 0.5 * (qw * wx + qy * wz - qz * wy);
    dx[1] = 0.5 * (qw * wy + qz * wx - qx * wz);
    dx[2] = 0.5 * (qw * wz + qx * wy - qy * wx);
    dx[3] = -0.5 * (qx * wx + qy * wy + qz * wz);
    const P = g.Jperp;
    let Hx = P[0]! * wx + P[3]! * wy + P[6]! * wz;
    let Hy = P[1]! * wx + P[4]! * wy + P[7]! * wz;
    let Hz = P[2]! * wx + P[5]! * wy + P[8]! * wz;
    const ax = g.axes,
      n = g.n,
      tau = this.tau;
    let bx: number, by: number, bz: number;
    const fr = g.friction;
    if (!fr.active) {
      for (let i = 0; i < n; i++) {
        const h = x[7 + i]!;
        Hx += ax[3 * i]! * h;
        Hy += ax[3 * i + 1]! * h;
        Hz += ax[3 * i + 2]! * h;
        dx[7 + i] = tau[i]!;
      }
      bx = this.b[0]!;
      by = this.b[1]!;
      bz = this.b[2]!;
    } else {
      bx = 0;
      by = 0;
      bz = 0;
      const visc = fr.viscousNmsPerRad,
        coul = fr.coulombNm,
        js = g.JsInv,
        smooth = fr.coulombSmoothingRadPerS;
      for (let i = 0; i < n; i++) {
        const gx = ax[3 * i]!,
          gy = ax[3 * i + 1]!,
          gz = ax[3 * i + 2]!;
        const h = x[7 + i]!;
        Hx += gx * h;
        Hy += gy * h;
        Hz += gz * h;
        const rel = h * js[i]! - (gx * wx + gy * wy + gz * wz);
        const t = tau[i]! - (visc[i]! * rel + coul[i]! * Math.tanh(rel / smooth));
        dx[7 + i] = t;
        bx -= gx * t;
        by -= gy * t;
        bz -= gz * t;
      }
    }
    // rhs = −ω × H + b
    const rx = bx - (wy * Hz - wz * Hy);
    const ry = by - (wz * Hx - wx * Hz);
    const rz = bz - (wx * Hy - wy * Hx);
    const M = g.JperpInv;
    dx[4] = M[0]! * rx + M[3]! * ry + M[6]! * rz;
    dx[5] = M[1]! * rx + M[4]! * ry + M[7]! * rz;
    dx[6] = M[2]! * rx + M[5]! * ry + M[8]! * rz;
  }
}
