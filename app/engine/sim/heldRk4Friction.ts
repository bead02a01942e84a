/**
 * HeldGyrostatRk4's step WITH bearing friction (viscous + tanh-smoothed Coulomb per wheel), its
 * four stages in local variables instead of the k1…k4 and tmp arrays of the general form: the
 * quaternion and body-rate parts of each stage are locals, the wheel parts of the four stage
 * derivatives go to one preallocated array (the per-wheel friction torque depends on the stage
 * state, so they cannot be formed once per step as in the frictionless step). Every value is
 * formed by the same operations in the same order as hybrid/rk4.ts rk4Step over
 * body/gyrostat.ts gyrostatDerivative with the held torques and a zero external torque, so the
 * bits are the same (test/unit/loopfriction-path.test.ts). Classical RK4: Kutta 1901; Hairer,
 * Nørsett & Wanner, Solving ODEs I, 2nd ed., §II.1.
 */
import type { Gyrostat } from '../body/gyrostat';

/**
 * out = one RK4 step of length hStep[0] from x (out must not alias x), the motor torques `tau`
 * held. `kw` (4n values) receives the wheel parts of the stage derivatives. Returns false when a
 * value of out is not finite. h comes through a typed-array slot: a double passed to a call that
 * is not inlined is boxed, a heap number per step.
 */
export function heldRk4FrictionStep(
  out: Float64Array,
  x: Float64Array,
  g: Gyrostat,
  tau: Float64Array,
  kw: Float64Array,
  hStep: Float64Array,
): boolean {
  const h = hStep[0]!;
  const n = g.n,
    P = g.Jperp,
    M = g.JperpInv,
    ax = g.axes,
    js = g.JsInv,
    fr = g.friction,
    visc = fr.viscousNmsPerRad,
    coul = fr.coulombNm,
    smooth = fr.coulombSmoothingRadPerS;
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
  const qx = x[0]!,
    qy = x[1]!,
    qz = x[2]!,
    qw = x[3]!,
    wx = x[4]!,
    wy = x[5]!,
    wz = x[6]!;
  const h2 = 0.5 * h;
  let W0: number, W1: number, W2: number;
  let sx: number, sy: number, sz: number, sw: number, ux: number, uy: number, uz: number;
  // Stage 1 at x.
  sx = qx;
  sy = qy;
  sz = qz;
  sw = qw;
  ux = wx;
  uy = wy;
  uz = wz;
  const a0 = 0.5 * (sw * ux + sy * uz - sz * uy);
  const a1 = 0.5 * (sw * uy + sz * ux - sx * uz);
  const a2 = 0.5 * (sw * uz + sx * uy - sy * ux);
  const a3 = -0.5 * (sx * ux + sy * uy + sz * uz);
  {
    let Hx = p0 * ux + p3 * uy + p6 * uz;
    let Hy = p1 * ux + p4 * uy + p7 * uz;
    let Hz = p2 * ux + p5 * uy + p8 * uz;
    let bx = 0,
      by = 0,
      bz = 0;
    for (let i = 0; i < n; i++) {
      const gx = ax[3 * i]!,
        gy = ax[3 * i + 1]!,
        gz = ax[3 * i + 2]!;
      const hi = x[7 + i]!;
      Hx += gx * hi;
      Hy += gy * hi;
      Hz += gz * hi;
      const rel = hi * js[i]! - (gx * ux + gy * uy + gz * uz);
      const t = tau[i]! - (visc[i]! * rel + coul[i]! * Math.tanh(rel / smooth));
      kw[i] = t;
      bx -= gx * t;
      by -= gy * t;
      bz -= gz * t;
    }
    const rx = bx - (uy * Hz - uz * Hy);
    const ry = by - (uz * Hx - ux * Hz);
    const rz = bz - (ux * Hy - uy * Hx);
    W0 = m0 * rx + m3 * ry + m6 * rz;
    W1 = m1 * rx + m4 * ry + m7 * rz;
    W2 = m2 * rx + m5 * ry + m8 * rz;
  }
  const a4 = W0,
    a5 = W1,
    a6 = W2;
  // Stage 2 at x + (h/2)k1.
  sx = qx + h2 * a0;
  sy = qy + h2 * a1;
  sz = qz + h2 * a2;
  sw = qw + h2 * a3;
  ux = wx + h2 * a4;
  uy = wy + h2 * a5;
  uz = wz + h2 * a6;
  const b0 = 0.5 * (sw * ux + sy * uz - sz * uy);
  const b1 = 0.5 * (sw * uy + sz * ux - sx * uz);
  const b2 = 0.5 * (sw * uz + sx * uy - sy * ux);
  const b3 = -0.5 * (sx * ux + sy * uy + sz * uz);
  {
    let Hx = p0 * ux + p3 * uy + p6 * uz;
    let Hy = p1 * ux + p4 * uy + p7 * uz;
    let Hz = p2 * ux + p5 * uy + p8 * uz;
    let bx = 0,
      by = 0,
      bz = 0;
    for (let i = 0; i < n; i++) {
      const gx = ax[3 * i]!,
        gy = ax[3 * i + 1]!,
        gz = ax[3 * i + 2]!;
      const hi = x[7 + i]! + h2 * kw[i]!;
      Hx += gx * hi;
      Hy += gy * hi;
      Hz += gz * hi;
      const rel = hi * js[i]! - (gx * ux + gy * uy + gz * uz);
      const t = tau[i]! - (visc[i]! * rel + coul[i]! * Math.tanh(rel / smooth));
      kw[n + i] = t;
      bx -= gx * t;
      by -= gy * t;
      bz -= gz * t;
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
    let bx = 0,
      by = 0,
      bz = 0;
    for (let i = 0; i < n; i++) {
      const gx = ax[3 * i]!,
        gy = ax[3 * i + 1]!,
        gz = ax[3 * i + 2]!;
      const hi = x[7 + i]! + h2 * kw[n + i]!;
      Hx += gx * hi;
      Hy += gy * hi;
      Hz += gz * hi;
      const rel = hi * js[i]! - (gx * ux + gy * uy + gz * uz);
      const t = tau[i]! - (visc[i]! * rel + coul[i]! * Math.tanh(rel / smooth));
      kw[2 * n + i] = t;
      bx -= gx * t;
      by -= gy * t;
      bz -= gz * t;
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
    let bx = 0,
      by = 0,
      bz = 0;
    for (let i = 0; i < n; i++) {
      const gx = ax[3 * i]!,
        gy = ax[3 * i + 1]!,
        gz = ax[3 * i + 2]!;
      const hi = x[7 + i]! + h * kw[2 * n + i]!;
      Hx += gx * hi;
      Hy += gy * hi;
      Hz += gz * hi;
      const rel = hi * js[i]! - (gx * ux + gy * uy + gz * uz);
      const t = tau[i]! - (visc[i]! * rel + coul[i]! * Math.tanh(rel / smooth));
      kw[3 * n + i] = t;
      bx -= gx * t;
      by -= gy * t;
      bz -= gz * t;
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
    const v = x[7 + i]! + h6 * (kw[i]! + 2 * (kw[n + i]! + kw[2 * n + i]!) + kw[3 * n + i]!);
    out[7 + i] = v;
    z += v * 0;
  }
  return z === 0;
}
