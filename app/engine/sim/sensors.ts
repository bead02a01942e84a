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
 * - Worst-case bounded on pointing-only targets (control/sphere/noise.ts applyAntipodalStall):
 *   whenever the pointed body axis is within ē of the antipode of its direction, the measured
 *   attitude is turned by at most ē so that the law sees the axis exactly at the antipode — the
 *   S² analogue of the reflection, which holds a smooth pointing law on its undesired equilibrium.
 *
 * Every draw comes from the seeded PRNG (prng.ts), so a run is reproducible from its seed.
 */
import type { Rng } from '../math/prng';
import { qConjMultiply, qFromRotationVector, qMultiply, qNormalize } from '../math/rotation';
import { applyAntipodalStall } from '../control/sphere/noise';
import type { SensorNoiseTape } from './noiseTape';

export interface SensorModel {
  /** 1σ attitude noise per body axis, rad. */
  attitudeSigmaRad: number;
  /** 1σ white rate noise per axis and sample, rad/s. */
  rateSigmaRadPerS: number;
  /** Constant rate bias in body axes, rad/s. */
  rateBiasRadPerS: ArrayLike<number>;
  /** Worst-case bounded noise level ē on the error quaternion's scalar part (0 = off). */
  adversarialEta: number;
  /**
   * Inside |η| < ē: 'reflect' (default) measures (ε, −η); 'band-edge' measures η = −sgn(η)·ē with
   * the vector part rescaled to keep a unit quaternion (η = 0 counts as positive).
   */
  adversarialMode?: 'reflect' | 'band-edge';
  /** Worst-case bounded noise ē on pointing-only segments, rad (absent or 0 = off). */
  antipodalNoiseRad?: number;
}

export const PERFECT_SENSORS: SensorModel = {
  attitudeSigmaRad: 0,
  rateSigmaRadPerS: 0,
  rateBiasRadPerS: [0, 0, 0],
  adversarialEta: 0,
};

const dtheta = new Float64Array(3);
const rateNoise = new Float64Array(3);
const dq = new Float64Array(4);
const qe = new Float64Array(4);

/**
 * Write the measured attitude and rate. `qRef` is the controller's current reference, used only
 * by the worst-case models (they need the error the law will form); `pointingAxis` is the pointed
 * body axis of a pointing-only segment (zeros or absent otherwise).
 */
export function measure(
  qOut: Float64Array,
  omegaOut: Float64Array,
  model: SensorModel,
  rng: Rng,
  qTrue: ArrayLike<number>,
  omegaTrue: ArrayLike<number>,
  qRef: ArrayLike<number>,
  pointingAxis?: ArrayLike<number>,
): void {
  const sa = model.attitudeSigmaRad;
  if (sa > 0) {
    // three draws in one call (the values of three normal() calls, in order)
    rng.normals(dtheta, 3);
    dtheta[0] = sa * dtheta[0]!;
    dtheta[1] = sa * dtheta[1]!;
    dtheta[2] = sa * dtheta[2]!;
    qFromRotationVector(dq, dtheta);
    qMultiply(qOut, qTrue, dq);
  } else {
    qOut[0] = qTrue[0]!;
    qOut[1] = qTrue[1]!;
    qOut[2] = qTrue[2]!;
    qOut[3] = qTrue[3]!;
  }
  boundedNoise(qOut, model, qTrue, qRef, pointingAxis);
  const sw = model.rateSigmaRadPerS;
  const b = model.rateBiasRadPerS;
  // The rate's three draws come after the attitude's, as three normal() calls in axis order would.
  if (sw > 0) {
    rng.normals(rateNoise, 3);
    for (let i = 0; i < 3; i++) omegaOut[i] = omegaTrue[i]! + b[i]! + sw * rateNoise[i]!;
  } else for (let i = 0; i < 3; i++) omegaOut[i] = omegaTrue[i]! + b[i]! + 0;
}

/**
 * measure with the random parts read from a tape (noiseTape.ts) at sample k instead of drawn:
 * the same measured state, bit for bit, when the tape was begun with the run's seed, stream and
 * σs and k is the run's sample index (the tape forms dq and σ_ω n as measure does).
 */
export function measureFromTape(
  qOut: Float64Array,
  omegaOut: Float64Array,
  model: SensorModel,
  tape: SensorNoiseTape,
  k: number,
  qTrue: ArrayLike<number>,
  omegaTrue: ArrayLike<number>,
  qRef: ArrayLike<number>,
  pointingAxis?: ArrayLike<number>,
): void {
  tape.at(k);
  if (model.attitudeSigmaRad > 0) qMultiply(qOut, qTrue, tape.dqNow);
  else {
    qOut[0] = qTrue[0]!;
    qOut[1] = qTrue[1]!;
    qOut[2] = qTrue[2]!;
    qOut[3] = qTrue[3]!;
  }
  boundedNoise(qOut, model, qTrue, qRef, pointingAxis);
  const b = model.rateBiasRadPerS;
  if (model.rateSigmaRadPerS > 0) {
    const r = tape.rateNow;
    for (let i = 0; i < 3; i++) omegaOut[i] = omegaTrue[i]! + b[i]! + r[i]!;
  } else for (let i = 0; i < 3; i++) omegaOut[i] = omegaTrue[i]! + b[i]! + 0;
}

/** The worst-case bounded models on the measured attitude (after the random rotation). */
function boundedNoise(
  qOut: Float64Array,
  model: SensorModel,
  qTrue: ArrayLike<number>,
  qRef: ArrayLike<number>,
  pointingAxis: ArrayLike<number> | undefined,
): void {
  const ebar = model.adversarialEta;
  if (ebar > 0) {
    qConjMultiply(qe, qRef, qOut);
    if (Math.abs(qe[3]!) < ebar) {
      if (model.adversarialMode === 'band-edge') {
        // Sign flipped at the bound's edge: a hysteretic law with δ < ē then switches at every
        // crossing of η = 0, one with δ > ē never (Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011).
        const eta = qe[3]! >= 0 ? -ebar : ebar;
        const nv = Math.hypot(qe[0]!, qe[1]!, qe[2]!);
        const f = nv > 0 ? Math.sqrt(1 - ebar * ebar) / nv : 0;
        qe[0] = qe[0]! * f;
        qe[1] = qe[1]! * f;
        qe[2] = qe[2]! * f;
        qe[3] = eta;
      } else qe[3] = -qe[3]!;
      qMultiply(qOut, qRef, qe);
      qNormalize(qOut, qOut);
    }
  }
  const stall = model.antipodalNoiseRad ?? 0;
  if (stall > 0 && pointingAxis && (pointingAxis[0] !== 0 || pointingAxis[1] !== 0 || pointingAxis[2] !== 0))
    applyAntipodalStall(qOut, qOut, qTrue, qRef, pointingAxis, stall);
}
