/**
 * Sensor models for the sampled controller: what the control law sees instead of the true state.
 *
 * - Random: attitude measured as q ⊗ exp(½ δθ) with δθ ~ N(0, σ²I) per body axis (a small
 *   random rotation, as a star tracker's cross-axis error is usually quoted per axis); rate
 *   measured as ω + b + n with a constant bias b and white noise n ~ N(0, σ_ω²I) per sample.
 * - Worst-case bounded (the adversarial mechanism of Mayhew, Sanfelice & Teel, "Quaternion-based
 *   hybrid control for robust global attitude tracking", IEEE TAC 56(11), 2011, and "On
 *   path-lifting mechanisms and unwinding in quaternion-based attitude control", IEEE TAC 58(5),
 *   2013): whenever the true error's scalar part satisfies |η| < ē, the measured error is
 *   reflected to (ε, −η). The reflection moves the error quaternion by 2|η| < 2ē, so it is noise
 *   of size below 2ē in S³ (an attitude error below about 2ē rad), chosen to mislead every
 *   memoryless sign decision.
 *
 * Every draw comes from the seeded PRNG (prng.ts), so a run is reproducible from its seed.
 */
import type { Rng } from '../math/prng';
import { qConjMultiply, qFromRotationVector, qMultiply, qNormalize } from '../math/rotation';

export interface SensorModel {
  /** 1σ attitude noise per body axis, rad. */
  attitudeSigmaRad: number;
  /** 1σ white rate noise per axis and sample, rad/s. */
  rateSigmaRadPerS: number;
  /** Constant rate bias in body axes, rad/s. */
  rateBiasRadPerS: ArrayLike<number>;
  /** Worst-case bounded noise level ē on the error quaternion's scalar part (0 = off). */
  adversarialEta: number;
}

export const PERFECT_SENSORS: SensorModel = {
  attitudeSigmaRad: 0,
  rateSigmaRadPerS: 0,
  rateBiasRadPerS: [0, 0, 0],
  adversarialEta: 0,
};

const dtheta = new Float64Array(3);
const dq = new Float64Array(4);
const qe = new Float64Array(4);

/**
 * Write the measured attitude and rate. `qRef` is the controller's current reference, used only
 * by the worst-case model (it needs the error the law will form).
 */
export function measure(
  qOut: Float64Array,
  omegaOut: Float64Array,
  model: SensorModel,
  rng: Rng,
  qTrue: ArrayLike<number>,
  omegaTrue: ArrayLike<number>,
  qRef: ArrayLike<number>,
): void {
  const sa = model.attitudeSigmaRad;
  if (sa > 0) {
    dtheta[0] = sa * rng.normal();
    dtheta[1] = sa * rng.normal();
    dtheta[2] = sa * rng.normal();
    qFromRotationVector(dq, dtheta);
    qMultiply(qOut, qTrue, dq);
  } else {
    qOut[0] = qTrue[0]!;
    qOut[1] = qTrue[1]!;
    qOut[2] = qTrue[2]!;
    qOut[3] = qTrue[3]!;
  }
  const ebar = model.adversarialEta;
  if (ebar > 0) {
    qConjMultiply(qe, qRef, qOut);
    if (Math.abs(qe[3]!) < ebar) {
      qe[3] = -qe[3]!;
      qMultiply(qOut, qRef, qe);
      qNormalize(qOut, qOut);
    }
  }
  const sw = model.rateSigmaRadPerS;
  const b = model.rateBiasRadPerS;
  for (let i = 0; i < 3; i++) omegaOut[i] = omegaTrue[i]! + b[i]! + (sw > 0 ? sw * rng.normal() : 0);
}
