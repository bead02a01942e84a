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
 * and is formed in every stage as gyrostatDerivative forms it (sim/heldRk4Friction.ts). Both
 * steps keep their four stages in local variables (same operations, same order).
 */
import type { Gyrostat } from '../body/gyrostat';
import { heldRk4FrictionStep } from './heldRk4Friction';

export class HeldGyrostatRk4 {
  /** Held motor torque per wheel, N·m. */
  private readonly tau: Float64Array;
  /** −Σ g_i τ_i for the held torques (frictionless bearings only), N·m, body axes. */
  private readonly b = new Float64Array(3);
  /** Friction step: the wheel parts of the four stage derivatives (4n values). */
  private readonly kw: Float64Array;
  /** Frictionless step: the wheel momenta of stages 2–3 and of stage 4. */
  private readonly hMid: Float64Array;
  private readonly hEnd: Float64Array;
  private readonly hStep = new Float64Array(1);

  constructor(private readonly g: Gyrostat) {
    this.kw = new Float64Array(4 * g.n);
    this.tau = new Float64Array(g.n);
    this.hMid = new Float64Array(g.n);
    this.hEnd = new Float64Array(g.n);
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
    // h through a typed-array slot, not as an argument: a double passed to a call that is not
    // inlined is boxed, once per step.
    this.hStep[0] = h;
    if (!this.g.friction.active) return this.stepFrictionless(out, x);
    return heldRk4FrictionStep(out, x, this.g, this.tau, this.kw, this.hStep);
  }

  /**
   * The step above without bearing friction, the four stages in local variables instead of the
   * k1…k4 and tmp arrays; every value is formed by the same operations in the same order, so the
   * bits are those of the array form. Without friction ḣ = τ in every stage, so the stage states'
   * wheel momenta are x_h (stage 1), x_h + (h/2)τ (stages 2 and 3: k1 and k2 hold the same τ) and
   * x_h + hτ (stage 4), each formed once per step.
   */
  private stepFrictionless(out: Float64Array, x: Float64Array): boolean {
    const h = this.hStep[0]!;
    const n = this.g.n,
      tau = this.tau,
      hMid = this.hMid,
      hEnd = this.hEnd;
    const h2 = 0.5 * h;
    for (let i = 0; i < n; i++) {
      const xi = x[7 + i]!,
        t = tau[i]!;
      hMid[i] = xi + h2 * t;
      hEnd[i] = xi + h * t;
    }
    const qx = x[0]!,
      qy = x[1]!,
      qz = x[2]!,
      qw = x[3]!,
      wx = x[4]!,
      wy = x[5]!,
      wz = x[6]!;
    // Each stage's ω̇ written out in this function (order of operations as gyrostatDerivative),
    // J⊥, J⊥⁻¹ and b read once per step: a call per stage measured ≈ 15 % slower (doubles passed
    // to a call that is not inlined are boxed, heap numbers).
    const g = this.g,
      P = g.Jperp,
      M = g.JperpInv,
      ax = g.axes,
      b = this.b;
    const p0 = P[0]!,
      p1 = P[1]!,
      p2 = P[2]!,
      p3 = P[3]!,
      p4 = P[4]!,
      p5 = P[5]!,
      p6 = P[6]!,
      p7 = P[7]!,
      p8 = P[8]!;
    const m0 = M[0]!,
      m1 = M[1]!,
      m2 = M[2]!,
      m3 = M[3]!,
      m4 = M[4]!,
      m5 = M[5]!,
      m6 = M[6]!,
      m7 = M[7]!,
      m8 = M[8]!;
    const bx = b[0]!,
      by = b[1]!,
      bz = b[2]!;
    let W0: number, W1: number, W2: number;
    // Stage 1 at x.
    const a0 = 0.5 * (qw * wx + qy * wz - qz * wy);
    const a1 = 0.5 * (qw * wy + qz * wx - qx * wz);
    const a2 = 0.5 * (qw * wz + qx * wy - qy * wx);
    const a3 = -0.5 * (qx * wx + qy * wy + qz * wz);
    {
      let Hx = p0 * wx + p3 * wy + p6 * wz;
      let Hy = p1 * wx + p4 * wy + p7 * wz;
      let Hz = p2 * wx + p5 * wy + p8 * wz;
      for (let i = 0; i < n; i++) {
        const hi = x[7 + i]!;
        Hx += ax[3 * i]! * hi;
        Hy += ax[3 * i + 1]! * hi;
        Hz += ax[3 * i + 2]! * hi;
      }
      const rx = bx - (wy * Hz - wz * Hy);
      const ry = by - (wz * Hx - wx * Hz);
      const rz = bz - (wx * Hy - wy * Hx);
      W0 = m0 * rx + m3 * ry + m6 * rz;
      W1 = m1 * rx + m4 * ry + m7 * rz;
      W2 = m2 * rx + m5 * ry + m8 * rz;
    }
    const a4 = W0,
      a5 = W1,
      a6 = W2;
    // Stage 2 at x + (h/2)k1.
    let sx = qx + h2 * a0,
      sy = qy + h2 * a1,
      sz = qz + h2 * a2,
      sw = qw + h2 * a3,
      ux = wx + h2 * a4,
      uy = wy + h2 * a5,
      uz = wz + h2 * a6;
    const b0 = 0.5 * (sw * ux + sy * uz - sz * uy);
    const b1 = 0.5 * (sw * uy + sz * ux - sx * uz);
    const b2 = 0.5 * (sw * uz + sx * uy - sy * ux);
    const b3 = -0.5 * (sx * ux + sy * uy + sz * uz);
    {
      let Hx = p0 * ux + p3 * uy + p6 * uz;
      let Hy = p1 * ux + p4 * uy + p7 * uz;
      let Hz = p2 * ux + p5 * uy + p8 * uz;
      for (let i = 0; i < n; i++) {
        const hi = hMid[0 + i]!;
        Hx += ax[3 * i]! * hi;
        Hy += ax[3 * i + 1]! * hi;
        Hz += ax[3 * i + 2]! * hi;
      }
      const rx = bx - (uy * Hz - uz * Hy);
      const ry = by - (uz * Hx - ux * Hz);
      const rz = bz - (ux * Hy - uy * Hx);
      W0 = m0 * rx + m3 * ry + m6 * rz;
      W1 = m1 * rx + m4 * ry + m7 * rz;
      W2 = m2 * rx + m5 * ry + m8 * rz;
    }
    const b4 = W0,
      b5 = W1,
      b6 = W2;
    // Stage 3 at x + (h/2)k2.
    sx = qx + h2 * b0;
    sy = qy + h2 * b1;
    sz = qz + h2 * b2;
    sw = qw + h2 * b3;
    ux = wx + h2 * b4;
    uy = wy + h2 * b5;
    uz = wz + h2 * b6;
    const c0 = 0.5 * (sw * ux + sy * uz - sz * uy);
    const c1 = 0.5 * (sw * uy + sz * ux - sx * uz);
    const c2 = 0.5 * (sw * uz + sx * uy - sy * ux);
    const c3 = -0.5 * (sx * ux + sy * uy + sz * uz);
    {
      let Hx = p0 * ux + p3 * uy + p6 * uz;
      let Hy = p1 * ux + p4 * uy + p7 * uz;
      let Hz = p2 * ux + p5 * uy + p8 * uz;
      for (let i = 0; i < n; i++) {
        const hi = hMid[0 + i]!;
        Hx += ax[3 * i]! * hi;
        Hy += ax[3 * i + 1]! * hi;
        Hz += ax[3 * i + 2]! * hi;
      }
      const rx = bx - (uy * Hz - uz * Hy);
      const ry = by - (uz * Hx - ux * Hz);
      const rz = bz - (ux * Hy - uy * Hx);
      W0 = m0 * rx + m3 * ry + m6 * rz;
      W1 = m1 * rx + m4 * ry + m7 * rz;
      W2 = m2 * rx + m5 * ry + m8 * rz;
    }
    const c4 = W0,
      c5 = W1,
      c6 = W2;
    // Stage 4 at x + h k3.
    sx = qx + h * c0;
    sy = qy + h * c1;
    sz = qz + h * c2;
    sw = qw + h * c3;
    ux = wx + h * c4;
    uy = wy + h * c5;
    uz = wz + h * c6;
    const d0 = 0.5 * (sw * ux + sy * uz - sz * uy);
    const d1 = 0.5 * (sw * uy + sz * ux - sx * uz);
    const d2 = 0.5 * (sw * uz + sx * uy - sy * ux);
    const d3 = -0.5 * (sx * ux + sy * uy + sz * uz);
    {
      let Hx = p0 * ux + p3 * uy + p6 * uz;
      let Hy = p1 * ux + p4 * uy + p7 * uz;
      let Hz = p2 * ux + p5 * uy + p8 * uz;
      for (let i = 0; i < n; i++) {
        const hi = hEnd[0 + i]!;
        Hx += ax[3 * i]! * hi;
        Hy += ax[3 * i + 1]! * hi;
        Hz += ax[3 * i + 2]! * hi;
      }
      const rx = bx - (uy * Hz - uz * Hy);
      const ry = by - (uz * Hx - ux * Hz);
      const rz = bz - (ux * Hy - uy * Hx);
      W0 = m0 * rx + m3 * ry + m6 * rz;
      W1 = m1 * rx + m4 * ry + m7 * rz;
      W2 = m2 * rx + m5 * ry + m8 * rz;
    }
    const d4 = W0,
      d5 = W1,
      d6 = W2;
    const h6 = h / 6;
    const o0 = qx + h6 * (a0 + 2 * (b0 + c0) + d0),
      o1 = qy + h6 * (a1 + 2 * (b1 + c1) + d1),
      o2 = qz + h6 * (a2 + 2 * (b2 + c2) + d2),
      o3 = qw + h6 * (a3 + 2 * (b3 + c3) + d3),
      o4 = wx + h6 * (a4 + 2 * (b4 + c4) + d4),
      o5 = wy + h6 * (a5 + 2 * (b5 + c5) + d5),
      o6 = wz + h6 * (a6 + 2 * (b6 + c6) + d6);
    out[0] = o0;
    out[1] = o1;
    out[2] = o2;
    out[3] = o3;
    out[4] = o4;
    out[5] = o5;
    out[6] = o6;
    // Σ v·0 is 0 for finite values and NaN otherwise (IEEE 754-2019 §6.1–6.2).
    let z = o0 * 0 + o1 * 0 + o2 * 0 + o3 * 0 + o4 * 0 + o5 * 0 + o6 * 0;
    for (let i = 0; i < n; i++) {
      const t = tau[i]!;
      const v = x[7 + i]! + h6 * (t + 2 * (t + t) + t);
      out[7 + i] = v;
      z += v * 0;
    }
    return z === 0;
  }
}
