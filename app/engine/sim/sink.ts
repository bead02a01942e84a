/**
 * A sample sink: what the closed loop hands each recorded sample to INSTEAD of the trace, when a
 * caller needs only what can be computed as the run goes (a study case's metrics,
 * metrics/online.ts) and not the run's history. With a sink the loop allocates no trace (the
 * result's trace is empty); the samples, their order and the run itself are unchanged.
 */
import type { PackedSample } from './trace';

export interface SampleSink {
  /**
   * Take one sample (the loop's own buffers: read, do not keep). Contract, as
   * TraceBuilder.pushPackedIfFinite: when any value of the sample is non-finite, take nothing and
   * return false (the loop then ends the run at the last finite sample); true otherwise.
   */
  push(s: PackedSample): boolean;
  /** Samples taken so far. */
  readonly count: number;
  /** Time of the last sample taken, s (meaningless while count is 0). */
  readonly lastT: number;
}

/**
 * 0 when every value of the sample is finite, NaN otherwise (Σ v·0: IEEE 754-2019 §6.1–6.2, as
 * trace.ts pushPackedIfFinite checks the same channels).
 */
export function packedNonFiniteSum(s: PackedSample): number {
  let z = 0;
  const x = s.scalars;
  for (let i = 0; i < x.length; i++) z += x[i]! * 0;
  z += sum0(s.q) + sum0(s.qRef) + sum0(s.omega) + sum0(s.omegaRef) + sum0(s.torqueCmdBody) + sum0(s.torqueBody);
  z += sum0(s.hWheel) + sum0(s.wheelTorqueCmd) + sum0(s.wheelTorque) + sum0(s.wheelTorqueNet);
  return z;
}

function sum0(a: Float64Array): number {
  let z = 0;
  for (let i = 0; i < a.length; i++) z += a[i]! * 0;
  return z;
}
