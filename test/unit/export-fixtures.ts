/**
 * Synthetic RunTraces for the export tests: a constant-body-rate rotation propagated exactly
 * (q_(k+1) = q_k ⊗ exp(½ ω dt)), segment changes at chosen times, optional logic jumps recorded
 * as a repeated instant, and smooth made-up torques and wheel momenta. Not a simulation: only
 * the shape and the numbers the writers must carry.
 */
import { qPropagateBodyRate } from '../../app/engine/math/rotation';
import type { RunTrace } from '../../app/engine/sim/types';

export interface TraceSpec {
  n: number;
  dt: number;
  nWheels: number;
  q0: ArrayLike<number>;
  omega: ArrayLike<number>;
  /** Segment index changes at these times (segment k from segmentStarts[k-1]). */
  segmentStarts?: number[];
  /** Sample indices after which a logic jump is recorded (the same instant, j + 1). */
  jumpsAfter?: number[];
  t0?: number;
}

export function makeTrace(spec: TraceSpec): RunTrace {
  const jumps = new Set(spec.jumpsAfter ?? []);
  const total = spec.n + jumps.size;
  const nW = spec.nWheels;
  const tr: RunTrace = {
    n: total,
    nWheels: nW,
    t: new Float64Array(total),
    j: new Int32Array(total),
    segment: new Int32Array(total),
    q: new Float64Array(4 * total),
    omega: new Float64Array(3 * total),
    hWheel: new Float64Array(nW * total),
    qRef: new Float64Array(4 * total),
    omegaRef: new Float64Array(3 * total),
    torqueCmdBody: new Float64Array(3 * total),
    torqueBody: new Float64Array(3 * total),
    wheelTorqueCmd: new Float64Array(nW * total),
    wheelTorque: new Float64Array(nW * total),
    wheelTorqueNet: new Float64Array(nW * total),
    logic: new Float64Array(total),
    errorAngle: new Float64Array(total),
    potential: new Float64Array(total),
    potentialMin: new Float64Array(total),
    gap: new Float64Array(total),
    lyapunov: new Float64Array(total),
  };
  const q = Float64Array.from(spec.q0);
  const starts = spec.segmentStarts ?? [];
  let j = 0;
  let logic = 1;
  let m = 0;
  const put = (i: number, t: number) => {
    tr.t[m] = t;
    tr.j[m] = j;
    tr.segment[m] = starts.filter((s) => t >= s - 1e-12).length;
    tr.q.set(q, 4 * m);
    tr.qRef.set(q, 4 * m);
    for (let c = 0; c < 3; c++) {
      tr.omega[3 * m + c] = spec.omega[c]!;
      tr.omegaRef[3 * m + c] = spec.omega[c]!;
      tr.torqueCmdBody[3 * m + c] = 1e-3 * Math.sin(0.3 * t + c);
      tr.torqueBody[3 * m + c] = 0.9e-3 * Math.sin(0.3 * t + c);
    }
    for (let w = 0; w < nW; w++) {
      tr.wheelTorqueCmd[nW * m + w] = 1e-3 * Math.cos(0.2 * t + w);
      tr.wheelTorque[nW * m + w] = 0.95e-3 * Math.cos(0.2 * t + w);
      tr.wheelTorqueNet[nW * m + w] = 0.9e-3 * Math.cos(0.2 * t + w);
      tr.hWheel[nW * m + w] = 2e-3 * Math.sin(0.05 * t + w) + (i === 0 && w === 0 ? -0 : 0);
    }
    tr.logic[m] = logic;
    tr.errorAngle[m] = 0.5 * Math.exp(-0.02 * t);
    tr.potential[m] = Math.exp(-0.02 * t);
    tr.potentialMin[m] = 0.9 * Math.exp(-0.02 * t);
    tr.gap[m] = 0.1 * Math.exp(-0.02 * t);
    tr.lyapunov[m] = 2 * Math.exp(-0.04 * t);
    m++;
  };
  for (let i = 0; i < spec.n; i++) {
    const t = (spec.t0 ?? 0) + i * spec.dt;
    if (i > 0) qPropagateBodyRate(q, q, spec.omega, spec.dt);
    put(i, t);
    if (jumps.has(i)) {
      j++;
      logic = -logic;
      put(i, t);
    }
  }
  return tr;
}

export const META = {
  toolName: 'Slewsmith',
  toolVersion: '0.1.0-test',
  controllerLabel: 'Hysteretic (delta 0.2)',
  controllerId: 'hysteretic',
};
