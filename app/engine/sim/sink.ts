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
  // Every channel's loop written out in this one function (no helper call per channel: this runs
  // at every sample of every study run). Only whether the sum is 0 or NaN matters, not its sign.
  let z = 0;
  const x = s.scalars,
    q = s.q,
    r = s.qRef,
    w = s.omega,
    wr = s.omegaRef,
    tc = s.torqueCmdBody,
    tb = s.torqueBody,
    h = s.hWheel,
    c = s.wheelTorqueCmd,
    u = s.wheelTorque,
    n = s.wheelTorqueNet;
  for (let i = 0; i < x.length; i++) z += x[i]! * 0;
  for (let i = 0; i < q.length; i++) z += q[i]! * 0;
  for (let i = 0; i < r.length; i++) z += r[i]! * 0;
  for (let i = 0; i < w.length; i++) z += w[i]! * 0;
  for (let i = 0; i < wr.length; i++) z += wr[i]! * 0;
  for (let i = 0; i < tc.length; i++) z += tc[i]! * 0;
  for (let i = 0; i < tb.length; i++) z += tb[i]! * 0;
  for (let i = 0; i < h.length; i++) z += h[i]! * 0;
  for (let i = 0; i < c.length; i++) z += c[i]! * 0;
  for (let i = 0; i < u.length; i++) z += u[i]! * 0;
  for (let i = 0; i < n.length; i++) z += n[i]! * 0;
  return z;
}
