/**
 * Scalar rest-to-rest profiles about a fixed axis: bang-bang, or bang-coast-bang under a rate cap.
 *
 * Standard rest-to-rest kinematics (e.g. B. Wie, Space Vehicle Dynamics and Control, 2nd ed.,
 * AIAA 2008; Wie, Bailey & Heiberg, JGCD 25(1), 2002 — page numbers from memory): with
 * acceleration a and rate cap w, θ* = w²/a;
 *   θ ≤ θ*: bang-bang, t_a = √(θ/a), T = 2√(θ/a), peak rate √(θ a);
 *   θ > θ*: bang-coast-bang, t_a = w/a, coast θ/w − w/a, T = θ/w + w/a.
 */
import type { RestToRestProfile } from './types';

/**
 * Profile for angle θ ≥ 0, acceleration a > 0 and rate cap w > 0 (Infinity for none). The caller
 * guarantees finite positive a and w (or w = Infinity).
 */
export function restToRestProfile(angleRad: number, accelRadPerS2: number, rateCapRadPerS: number): RestToRestProfile {
  const th = angleRad,
    a = accelRadPerS2,
    w = rateCapRadPerS;
  if (!(th > 0)) {
    return { kind: 'rest', angleRad: 0, accelRadPerS2: 0, peakRateRadPerS: 0, accelTimeS: 0, coastTimeS: 0, durationS: 0 };
  }
  const tBang = Math.sqrt(th / a);
  // Compare rates rather than θ with w²/a, so w = Infinity needs no special case.
  if (a * tBang <= w) {
    return {
      kind: 'bang-bang',
      angleRad: th,
      accelRadPerS2: a,
      peakRateRadPerS: a * tBang,
      accelTimeS: tBang,
      coastTimeS: 0,
      durationS: 2 * tBang,
    };
  }
  const tA = w / a;
  const tC = th / w - tA;
  return {
    kind: 'bang-coast-bang',
    angleRad: th,
    accelRadPerS2: a,
    peakRateRadPerS: w,
    accelTimeS: tA,
    coastTimeS: tC,
    durationS: tA + tC + tA,
  };
}

/** Switch times from the segment start. */
export function profileSwitchTimes(p: RestToRestProfile): number[] {
  if (p.kind === 'rest') return [];
  if (p.kind === 'bang-bang') return [p.accelTimeS];
  return [p.accelTimeS, p.accelTimeS + p.coastTimeS];
}

/**
 * Angle, rate and acceleration at time s from the segment start, written to out[0..2] =
 * (φ, ω, α). Right-continuous at switches (α takes the value of the phase that starts there);
 * before 0 (or NaN) at rest at φ = 0, from the end on at rest at φ = θ.
 */
export function profileAt(out: Float64Array, p: RestToRestProfile, s: number): Float64Array {
  return profileStateAt(out, p.angleRad, p.accelRadPerS2, p.peakRateRadPerS, p.accelTimeS, p.coastTimeS, s);
}

/**
 * profileAt over bare numbers (the reference table stores profiles flat). The last phase is
 * written from the end, φ = θ − ½ a (T − s)², so that φ(T) = θ exactly; a zero angle with zero
 * times is the rest profile.
 */
export function profileStateAt(
  out: Float64Array,
  angleRad: number,
  accel: number,
  peakRate: number,
  accelTimeS: number,
  coastTimeS: number,
  s: number,
): Float64Array {
  const tA = accelTimeS,
    tDec = tA + coastTimeS,
    T = tDec + tA;
  if (!(s >= 0)) {
    out[0] = 0;
    out[1] = 0;
    out[2] = 0;
  } else if (s >= T) {
    out[0] = angleRad;
    out[1] = 0;
    out[2] = 0;
  } else if (s < tA) {
    out[0] = 0.5 * accel * s * s;
    out[1] = accel * s;
    out[2] = accel;
  } else if (s < tDec) {
    out[0] = 0.5 * accel * tA * tA + peakRate * (s - tA);
    out[1] = peakRate;
    out[2] = 0;
  } else {
    const r = T - s;
    out[0] = angleRad - 0.5 * accel * r * r;
    out[1] = accel * r;
    out[2] = -accel;
  }
  return out;
}
