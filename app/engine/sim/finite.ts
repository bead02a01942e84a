/**
 * The closed loop's check that no non-finite number enters a trace: every value of a sample is
 * checked as it is appended (trace.ts pushPackedIfFinite, from loop.ts LoopCore.record), and a
 * sample holding a bad one is not kept. The first bad value is named
 * by its channel, in words, so a run that stops on it says which quantity went wrong: the
 * controller's torque request, a wheel command, the state, a diagnostic.
 */
import {
  PACKED_ERROR_ANGLE,
  PACKED_GAP,
  PACKED_LOGIC,
  PACKED_LYAPUNOV,
  PACKED_POTENTIAL,
  PACKED_POTENTIAL_MIN,
  PACKED_T,
  type PackedSample,
} from './trace';

type VectorChannel = Exclude<keyof PackedSample, 'j' | 'segment' | 'scalars'>;

/** The vector channels in the order they are checked, with what each holds. */
const VECTORS: readonly [VectorChannel, string][] = [
  ['torqueCmdBody', "the controller's body torque request (torqueCmdBody)"],
  ['wheelTorqueCmd', 'the allocated wheel torque commands (wheelTorqueCmd)'],
  ['wheelTorque', 'the delivered wheel motor torques (wheelTorque)'],
  ['wheelTorqueNet', 'the net rotor torques (wheelTorqueNet)'],
  ['torqueBody', 'the delivered body torque (torqueBody)'],
  ['q', 'the attitude quaternion (q)'],
  ['omega', 'the body rate (omega)'],
  ['hWheel', 'the wheel momenta (hWheel)'],
  ['qRef', 'the reference attitude (qRef)'],
  ['omegaRef', 'the reference body rate (omegaRef)'],
];

const SCALARS: readonly [number, string][] = [
  [PACKED_T, 'the sample time (t)'],
  [PACKED_LOGIC, "the controller's logic value (logic)"],
  [PACKED_ERROR_ANGLE, 'the error angle (errorAngle)'],
  [PACKED_POTENTIAL, 'the active potential (potential)'],
  [PACKED_POTENTIAL_MIN, 'the smallest potential of the family (potentialMin)'],
  [PACKED_GAP, 'the synergy gap (gap)'],
  [PACKED_LYAPUNOV, 'the Lyapunov value (lyapunov)'],
];

function show(v: number): string {
  return Number.isNaN(v) ? 'NaN' : String(v);
}

/**
 * A sentence naming the first non-finite value of the sample, or null when all are finite.
 * Called once per recorded sample: plain index loops, nothing allocated unless a value is bad.
 */
export function firstNonFinite(s: PackedSample): string | null {
  for (let c = 0; c < VECTORS.length; c++) {
    const a = s[VECTORS[c]![0]];
    for (let i = 0; i < a.length; i++) {
      const v = a[i]!;
      if (!Number.isFinite(v)) return `${VECTORS[c]![1]} became ${show(v)} (component ${i + 1} of ${a.length})`;
    }
  }
  const x = s.scalars;
  for (let c = 0; c < SCALARS.length; c++) {
    const v = x[SCALARS[c]![0]]!;
    if (!Number.isFinite(v)) return `${SCALARS[c]![1]} became ${show(v)}`;
  }
  return null;
}
