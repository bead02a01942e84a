/**
 * What an eigenaxis slew asks of the wheels: body torque and stored momentum along the profile,
 * and how much of the envelopes that is.
 *
 * Physics (rigid body with wheels, methods §6): total momentum H = Jω + h_w is fixed in inertial
 * axes; in body axes Ḣ_B = −ω × H_B. During an eigenaxis slew ω = ω_s e with e fixed in body and
 * inertial axes and q(t) = q0 ⊗ exp(½ φ e), so (starting at rest with wheel momentum h0)
 *   H_B(φ) = R_a(φ, e)ᵀ h0 = h0 cos φ − sin φ (e × h0) + (1 − cos φ)(e·h0) e,
 *   h_w   = H_B − ω_s J e,
 *   τ     = J e α + ω × (Jω + h_w) = J e α + ω_s e × H_B      (torque the wheels put on the body).
 * With H = 0 the gyroscopic part vanishes and τ = J e α points along Je, not e (references §2).
 * Here J is the inertia of J ω̇ = τ − ω × H with H = Jω + h_w (J_⊥ with absolute wheel momentum).
 */
import type { Mat3, Vec3 } from '../math/mat3';
import { m3MulVec, v3Cross, v3Dot } from '../math/mat3';
import { profileStateAt } from './profile';
import type { PlanLimits, RestToRestProfile } from './types';
import { hypot3 } from '../math/hypot';

/** Per-segment constants of the load formulas. */
export interface SlewGeometry {
  J: Mat3;
  e: Vec3;
  Je: Vec3;
  h0: Vec3;
  eXh0: Vec3;
  eDotH0: number;
  angleRad: number;
}

export function makeSlewGeometry(J: Mat3, e: ArrayLike<number>, h0: ArrayLike<number>, angleRad: number): SlewGeometry {
  const ev = Float64Array.from([e[0], e[1], e[2]]);
  const hv = Float64Array.from([h0[0], h0[1], h0[2]]);
  return {
    J,
    e: ev,
    Je: m3MulVec(new Float64Array(3), J, ev),
    h0: hv,
    eXh0: v3Cross(new Float64Array(3), ev, hv),
    eDotH0: v3Dot(ev, hv),
    angleRad,
  };
}

/**
 * Body torque τ and wheel momentum h_w at angle φ, rate ω_s and acceleration α (formulas in the
 * header). Allocation-free; outTau and outH must not alias each other.
 */
function slewLoadsAt(outTau: Vec3, outH: Vec3, g: SlewGeometry, phi: number, omega: number, alpha: number): void {
  const c = Math.cos(phi),
    s = Math.sin(phi),
    k = (1 - c) * g.eDotH0;
  const e = g.e,
    h0 = g.h0,
    x = g.eXh0,
    Je = g.Je,
    d = g.eDotH0;
  for (let i = 0; i < 3; i++) {
    const hb = h0[i]! * c - s * x[i]! + k * e[i]!;
    // e × H_B = cos φ (e × h0) + sin φ (h0 − (e·h0) e)
    const eXhb = c * x[i]! + s * (h0[i]! - d * e[i]!);
    outTau[i] = Je[i]! * alpha + omega * eXhb;
    outH[i] = hb - omega * Je[i]!;
  }
}

/** H_B after a rotation φ about e (the wheel momentum at rest at that attitude). */
export function storedMomentumAt(out: Vec3, g: SlewGeometry, phi: number): Vec3 {
  const c = Math.cos(phi),
    s = Math.sin(phi),
    k = (1 - c) * g.eDotH0;
  for (let i = 0; i < 3; i++) out[i] = g.h0[i]! * c - s * g.eXh0[i]! + k * g.e[i]!;
  return out;
}

const dir = new Float64Array(3);

/**
 * |v| / capacity(v̂): the fraction of the (unmargined) envelope a vector uses along its own
 * direction. 0 for a zero vector; Infinity when the capacity is zero, negative or not finite,
 * which every caller treats as a violation.
 */
export function envelopeFraction(v: ArrayLike<number>, capacity: (d: Vec3) => number): number {
  const n = hypot3(v[0]!, v[1]!, v[2]!);
  if (n === 0) return 0;
  dir[0] = v[0]! / n;
  dir[1] = v[1]! / n;
  dir[2] = v[2]! / n;
  const c = capacity(dir);
  return c > 0 && Number.isFinite(c) ? n / c : Infinity;
}

/** Capacity along ±u (min of the two; zonotopes are symmetric but the interface does not say so). */
export function symmetricCapacity(u: ArrayLike<number>, capacity: (d: Vec3) => number): number {
  const n = hypot3(u[0]!, u[1]!, u[2]!);
  if (!(n > 0)) return 0;
  dir[0] = u[0]! / n;
  dir[1] = u[1]! / n;
  dir[2] = u[2]! / n;
  const cp = capacity(dir);
  dir[0] = -dir[0];
  dir[1] = -dir[1];
  dir[2] = -dir[2];
  const cm = capacity(dir);
  const c = Math.min(cp, cm);
  return c > 0 && Number.isFinite(c) ? c : 0;
}

export interface EnvelopeUse {
  /** max |τ| / torqueCapacity(τ̂) over the samples. */
  torque: number;
  /** max |h_w| / momentumCapacity(ĥ_w) over the samples. */
  momentum: number;
}

const tauS = new Float64Array(3);
const hS = new Float64Array(3);
const st = new Float64Array(3);

/**
 * How densely to sample: per phase, enough points that the rotation between samples is at most
 * stepRad, at least 8 and at most maxPerPhase. Only the rotation bends the loads within a phase
 * (τ and h_w are affine in ω for a fixed attitude, and their peaks at the phase ends are
 * sampled), so a missed peak is second order in stepRad.
 */
export interface Sampling {
  stepRad: number;
  maxPerPhase: number;
}

/**
 * Sample the profile phase by phase (both ends of each phase included, each with that phase's
 * acceleration, so the one-sided values at a switch are both seen) and record the peak envelope
 * fractions. Stops early, with the value that crossed, once a fraction exceeds its stop level
 * (for feasibility tests). Peaks between samples can be missed: the search keeps a guard band
 * for that (search.ts).
 */
export function scanEnvelopeUse(
  out: EnvelopeUse,
  g: SlewGeometry,
  p: RestToRestProfile,
  limits: PlanLimits,
  sampling: Sampling,
  torqueStop = Infinity,
  momentumStop = Infinity,
): EnvelopeUse {
  out.torque = 0;
  out.momentum = 0;
  const tA = p.accelTimeS,
    tC = p.coastTimeS;
  const a = p.accelRadPerS2;
  const bangAngle = 0.5 * a * tA * tA,
    coastAngle = p.peakRateRadPerS * tC;
  // Phase boundaries and accelerations: [0, tA] +a, [tA, tA + tC] 0, [tA + tC, T] −a.
  for (let ph = 0; ph < 3; ph++) {
    if (ph === 1 && !(tC > 0)) continue;
    if (p.kind === 'rest' && ph !== 0) continue;
    const t0 = ph === 0 ? 0 : ph === 1 ? tA : tA + tC;
    const t1 = ph === 0 ? tA : ph === 1 ? tA + tC : tA + tC + tA;
    const alpha = p.kind === 'rest' ? 0 : ph === 0 ? a : ph === 1 ? 0 : -a;
    const span = ph === 1 ? coastAngle : bangAngle;
    const n = Math.min(sampling.maxPerPhase, Math.max(8, Math.ceil(span / sampling.stepRad)));
    for (let j = 0; j <= n; j++) {
      const t = j === n ? t1 : t0 + ((t1 - t0) * j) / n;
      profileStateAt(st, p.angleRad, a, p.peakRateRadPerS, tA, tC, t);
      // φ and ω are continuous; α is this phase's value, also at its end points.
      slewLoadsAt(tauS, hS, g, st[0]!, st[1]!, alpha);
      const ft = envelopeFraction(tauS, limits.torqueCapacity);
      const fh = envelopeFraction(hS, limits.momentumCapacity);
      if (ft > out.torque) out.torque = ft;
      if (fh > out.momentum) out.momentum = fh;
      if (out.torque > torqueStop || out.momentum > momentumStop) return out;
    }
  }
  return out;
}
