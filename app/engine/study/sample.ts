/**
 * Drawing one dispersed case: every random number a case uses comes from (study seed, case index).
 *
 * Independence rule: each dispersion has its own random stream makeRng(seed, 16·index + slot)
 * (slots below). Turning a dispersion on or off, or a rejected inertia sample being redrawn, never
 * changes what another dispersion draws, so cases stay comparable when a study is edited; and a
 * case never depends on which worker ran it or on the cases before it.
 *
 * Samplers:
 * - uniform attitude: Haar measure on SO(3) (Shoemake, Graphics Gems III, 1992; qRandomUniform);
 * - cone / near-reversal: the Haar measure restricted to a set of rotation angles. Under Haar the
 *   rotation angle θ has density (1 − cos θ)/π on [0, π] and the axis is uniform and independent
 *   (R. E. Miles, "On random rotations in R³", Biometrika 52(3/4), 1965), so θ is drawn by
 *   inverting F(θ) = θ − sin θ between the bounds and the axis uniformly on the sphere;
 * - inertia: principal moments J_i(1 + σ n_i), principal axes turned by a small rotation with
 *   rotation vector σ_a n (n standard normal); samples that are not a physical inertia (positive
 *   definite, triangle inequality; body/inertia.ts) are redrawn and counted.
 */
import type { Rng } from '../math/prng';
import { makeRng } from '../math/prng';
import { m3Create, symmetricEigen3 } from '../math/mat3';
import { qConjMultiply, qFromAxisAngle, qMultiply, qNormalize, qRandomUniform, qToMat3 } from '../math/rotation';
import { validateInertia } from '../body/inertia';
import type { ActuationMode, StudyDefinition } from '../scenario/study';
import type { PointingOnlyTarget } from '../scenario/pointingOnly';
import { reducedTargetAttitude } from '../control/sphere/slew';
import { drawNearAntipode } from './pointingCase';

/** Random-stream slot of each dispersion within a case (stream = 16·index + slot). */
export const SLOT = {
  attitude: 0,
  rate: 1,
  inertia: 2,
  wheels: 3,
  sensors: 4,
  controlRate: 5,
  actuation: 6,
  noiseSeed: 7,
} as const;

/** Largest case index the stream layout supports (16·index + 15 must fit in 32 bits). */
export const MAX_CASE_INDEX = 0x0fffffff;

/** Redraws of an unphysical inertia before the case is declared unflyable. */
export const MAX_INERTIA_ATTEMPTS = 1000;

/** What the sampler needs of the nominal scenario (SI). */
export interface NominalCase {
  qInitial: ArrayLike<number>;
  qTarget: ArrayLike<number>;
  omega0: ArrayLike<number>;
  /** Nominal inertia, column-major. */
  inertia: ArrayLike<number>;
  nWheels: number;
  attitudeNoiseRad: number;
  rateBiasRadPerS: ArrayLike<number>;
  controlRateHz: number;
  actuation: ActuationMode;
  /** The first target's axis and direction when it is roll free (pointingCase.ts). */
  pointing?: PointingOnlyTarget;
}

/** One dispersed case, as plain data (it crosses worker boundaries and goes into exports). */
export interface CaseDraw {
  index: number;
  /** Initial attitude qInertialFromBody [x, y, z, w] (its sign is the one flown). */
  q0: number[];
  omega0RadPerS: number[];
  /** True inertia rows, kg·m² (null when no physical sample was found). */
  inertiaRows: number[][] | null;
  inertiaRejections: number;
  /** Remaining fraction of each nominal wheel's torque and momentum limit. */
  wheelTorqueFactor: number[];
  wheelMomentumFactor: number[];
  /** Index of the lost wheel, −1 for none. */
  failedWheel: number;
  attitudeNoiseRad: number;
  rateBiasRadPerS: number[];
  adversarialEta: number;
  /** Worst-case bounded noise ē on pointing-only targets, rad (absent: 0). */
  antipodalNoiseRad?: number;
  controlRateHz: number;
  actuation: ActuationMode;
  /** Seed of the case's sensor-noise generator (stream 0), the same for every controller. */
  noiseSeed: number;
  /** Initial error q_e = q_target* ⊗ q0: unit rotation axis (target axes), angle in [0, π], scalar part. */
  errorAxis: number[];
  errorAngleRad: number;
  errorEta: number;
}

function stream(def: StudyDefinition, index: number, slot: number): Rng {
  return makeRng(def.seed, 16 * index + slot);
}

/** Uniform unit vector (Marsaglia's z/φ form: z uniform in [−1, 1], φ uniform). */
function unitVector(out: number[], rng: Rng): number[] {
  const z = 2 * rng.next() - 1;
  const phi = 2 * Math.PI * rng.next();
  const r = Math.sqrt(Math.max(0, 1 - z * z));
  out[0] = r * Math.cos(phi);
  out[1] = r * Math.sin(phi);
  out[2] = z;
  return out;
}

/**
 * Rotation angle in [lo, hi] ⊂ [0, π] with density ∝ 1 − cos θ (Haar restricted to the angle
 * band): invert F(θ) = θ − sin θ by bisection (F is increasing; 60 halvings reach 1 ulp of π).
 */
export function haarAngleBetween(rng: Rng, lo: number, hi: number): number {
  const F = (t: number) => t - Math.sin(t);
  const target = F(lo) + rng.next() * (F(hi) - F(lo));
  let a = lo,
    b = hi;
  for (let k = 0; k < 60 && b - a > 0; k++) {
    const m = 0.5 * (a + b);
    if (F(m) < target) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

const tmpQ = new Float64Array(4);
const tmpQ2 = new Float64Array(4);
const tmpAxis = [0, 0, 0];

function drawAttitude(out: Float64Array, def: StudyDefinition, nom: NominalCase, index: number): void {
  const a = def.attitude;
  const rng = stream(def, index, SLOT.attitude);
  if (a.mode === 'nominal') {
    for (let i = 0; i < 4; i++) out[i] = nom.qInitial[i]!;
  } else if (a.mode === 'uniform') {
    qRandomUniform(out, rng);
  } else if (a.mode === 'cone') {
    const th = haarAngleBetween(rng, 0, a.maxAngleRad);
    qFromAxisAngle(tmpQ, unitVector(tmpAxis, rng), th);
    qMultiply(out, nom.qInitial, tmpQ);
  } else if (a.mode === 'near-antipode') {
    // resolveStudy refuses the mode unless the first target is roll free
    drawNearAntipode(out, rng, nom.pointing!, a.withinRad, nom.qInitial);
  } else {
    // Error q_e with angle in [π − w, π] about a uniform axis; q0 = ±q_target ⊗ q_e.
    const th = haarAngleBetween(rng, Math.PI - a.withinRad, Math.PI);
    qFromAxisAngle(tmpQ, unitVector(tmpAxis, rng), th);
    const sign = rng.next() < 0.5 ? -1 : 1;
    qMultiply(out, nom.qTarget, tmpQ);
    for (let i = 0; i < 4; i++) out[i]! *= sign;
  }
  qNormalize(out, out);
}

/** Perturbed inertia rows, or null after MAX_INERTIA_ATTEMPTS unphysical samples. */
function drawInertia(def: StudyDefinition, nom: NominalCase, index: number): { rows: number[][] | null; rejections: number } {
  const { momentSigmaFraction: sm, axisMisalignmentSigmaRad: sa } = def.inertia;
  const J = nom.inertia;
  const rowsOf = (M: ArrayLike<number>) => [0, 1, 2].map((r) => [0, 1, 2].map((c) => 0.5 * (M[3 * c + r]! + M[3 * r + c]!)));
  if (sm === 0 && sa === 0) return { rows: rowsOf(J), rejections: 0 };
  const rng = stream(def, index, SLOT.inertia);
  const eig = symmetricEigen3(J);
  const V = eig.vectors;
  const R = m3Create();
  const W = m3Create(); // W = R V (rotated principal axes as columns)
  const out = m3Create();
  const phi = [0, 0, 0];
  let rejections = 0;
  for (let attempt = 0; attempt < MAX_INERTIA_ATTEMPTS; attempt++) {
    const m = [0, 1, 2].map((i) => eig.values[i]! * (1 + sm * rng.normal()));
    for (let i = 0; i < 3; i++) phi[i] = sa * rng.normal();
    const ang = Math.hypot(phi[0]!, phi[1]!, phi[2]!);
    if (ang > 0) qFromAxisAngle(tmpQ2, [phi[0]! / ang, phi[1]! / ang, phi[2]! / ang], ang);
    else tmpQ2.set([0, 0, 0, 1]);
    qToMat3(R, tmpQ2);
    for (let c = 0; c < 3; c++)
      for (let r = 0; r < 3; r++) W[3 * c + r] = R[r]! * V[3 * c]! + R[3 + r]! * V[3 * c + 1]! + R[6 + r]! * V[3 * c + 2]!;
    // J' = W diag(m) Wᵀ
    for (let c = 0; c < 3; c++)
      for (let r = 0; r < 3; r++) out[3 * c + r] = W[r]! * m[0]! * W[c]! + W[3 + r]! * m[1]! * W[3 + c]! + W[6 + r]! * m[2]! * W[6 + c]!;
    const rows = rowsOf(out);
    if (validateInertia(rows, 'inertia').ok) return { rows, rejections };
    rejections++;
  }
  return { rows: null, rejections };
}

/** Draw case `index` of a study. Pure: the same (definition, nominal, index) gives the same case. */
export function drawCase(def: StudyDefinition, nom: NominalCase, index: number): CaseDraw {
  const q0 = new Float64Array(4);
  drawAttitude(q0, def, nom, index);

  const rateRng = stream(def, index, SLOT.rate);
  const s = def.rateSigmaRadPerS;
  const omega0 = [0, 1, 2].map((i) => nom.omega0[i]! + (s > 0 ? s * rateRng.normal() : 0));

  const inertia = drawInertia(def, nom, index);

  const N = nom.nWheels;
  const wr = stream(def, index, SLOT.wheels);
  const w = def.wheels;
  const wheelTorqueFactor: number[] = [];
  const wheelMomentumFactor: number[] = [];
  for (let i = 0; i < N; i++) {
    wheelTorqueFactor.push(1 - w.torqueDegradationMax * wr.next());
    wheelMomentumFactor.push(1 - w.momentumDegradationMax * wr.next());
  }
  const fails = wr.next() < w.failOneWheelProbability;
  const which = Math.min(N - 1, Math.floor(wr.next() * N));
  const failedWheel = fails ? which : -1;

  const sr = stream(def, index, SLOT.sensors);
  const [lo, hi] = def.sensors.attitudeNoiseScale;
  const noiseScale = lo + (hi - lo) * sr.next();
  const bs = def.sensors.rateBiasSigmaRadPerS;
  const rateBiasRadPerS = [0, 1, 2].map((i) => nom.rateBiasRadPerS[i]! + (bs > 0 ? bs * sr.normal() : 0));

  const rates = def.controlRateHz;
  const controlRateHz = rates
    ? rates[Math.min(rates.length - 1, Math.floor(stream(def, index, SLOT.controlRate).next() * rates.length))]!
    : nom.controlRateHz;
  const acts = def.actuation;
  const actuation = acts
    ? acts[Math.min(acts.length - 1, Math.floor(stream(def, index, SLOT.actuation).next() * acts.length))]!
    : nom.actuation;
  const noiseSeed = Math.floor(stream(def, index, SLOT.noiseSeed).next() * 4294967296);

  // Initial error in the target frame: its axis and angle place the case on the outcome map. For a
  // roll-free target the case's target is the reduced one from q0: the error is the swing rotation.
  const red = nom.pointing ? reducedTargetAttitude(q0, nom.pointing.bodyAxis, nom.pointing.inertialDirection) : null;
  qConjMultiply(tmpQ, red?.ok ? red.value.q : nom.qTarget, q0);
  const sn = Math.hypot(tmpQ[0]!, tmpQ[1]!, tmpQ[2]!);
  const errorAxis = sn > 1e-15 ? [tmpQ[0]! / sn, tmpQ[1]! / sn, tmpQ[2]! / sn] : [1, 0, 0];
  const errorAngleRad = 2 * Math.atan2(sn, Math.abs(tmpQ[3]!));
  if (tmpQ[3]! < 0) for (let i = 0; i < 3; i++) errorAxis[i] = -errorAxis[i]!;

  return {
    index,
    q0: Array.from(q0),
    omega0RadPerS: omega0,
    inertiaRows: inertia.rows,
    inertiaRejections: inertia.rejections,
    wheelTorqueFactor,
    wheelMomentumFactor,
    failedWheel,
    attitudeNoiseRad: nom.attitudeNoiseRad * noiseScale,
    rateBiasRadPerS,
    adversarialEta: def.sensors.adversarialEta,
    antipodalNoiseRad: def.sensors.antipodalNoiseRad ?? 0,
    controlRateHz,
    actuation,
    noiseSeed,
    errorAxis,
    errorAngleRad,
    errorEta: tmpQ[3]!,
  };
}
