/**
 * Synthetic runs and test zonotopes for the view3d tests and benchmark (not a test file itself).
 *
 * The synthetic attitude is a constant body-rate rotation q(t) = q0 ⊗ exp(½ ω t) (exact for a
 * constant ω: references.md §1.6 states the same closed form for CCSDS AEM checks), so slerp
 * between samples must reproduce q(t) exactly at any intermediate time.
 */
import type { RunTrace } from '../../app/engine/sim/types';
import { qFromAxisAngle, qFromRotationVector, qMultiply } from '../../app/engine/math/rotation';
import type { MomentumEnvelopeMesh, ViewJump, ViewRun, ViewTarget, LogicKind } from '../../app/view3d/types';

export interface SyntheticRunSpec {
  n: number;
  dt: number;
  /** Initial attitude [x, y, z, w]. */
  q0: ArrayLike<number>;
  /** Constant body rate, rad/s. */
  omegaBody: [number, number, number];
  /** Sample indices where the logic value flips (sign logic) or steps (index logic). */
  jumpSamples: number[];
  logicKind: LogicKind;
  /** Flip the stored sign of q at every odd sample (q and −q are the same attitude). */
  alternateSign?: boolean;
}

/** Exact attitude of the synthetic run at time t. */
export function syntheticAttitude(out: Float64Array, spec: SyntheticRunSpec, t: number): Float64Array {
  const phi = new Float64Array([spec.omegaBody[0] * t, spec.omegaBody[1] * t, spec.omegaBody[2] * t]);
  const dq = qFromRotationVector(new Float64Array(4), phi);
  return qMultiply(out, spec.q0, dq);
}

export function syntheticTrace(spec: SyntheticRunSpec, nWheels = 3): RunTrace {
  const { n, dt } = spec;
  const f = (k: number) => new Float64Array(k * n);
  const tr: RunTrace = {
    n,
    nWheels,
    t: f(1),
    j: new Int32Array(n),
    segment: new Int32Array(n),
    q: f(4),
    omega: f(3),
    hWheel: f(nWheels),
    qRef: f(4),
    omegaRef: f(3),
    torqueCmdBody: f(3),
    torqueBody: f(3),
    wheelTorqueCmd: f(nWheels),
    wheelTorque: f(nWheels),
    wheelTorqueNet: f(nWheels),
    logic: f(1),
    errorAngle: f(1),
    potential: f(1),
    potentialMin: f(1),
    gap: f(1),
    lyapunov: f(1),
  };
  const q = new Float64Array(4);
  const qr = new Float64Array(4);
  let logic = spec.logicKind === 'sign' ? 1 : spec.logicKind === 'index' ? 1 : 0;
  let j = 0;
  for (let k = 0; k < n; k++) {
    const t = k * dt;
    tr.t[k] = t;
    if (spec.jumpSamples.includes(k)) {
      j++;
      logic = spec.logicKind === 'sign' ? -logic : spec.logicKind === 'index' ? (logic % 3) + 1 : 0;
    }
    tr.j[k] = j;
    tr.logic[k] = logic;
    tr.segment[k] = k < n / 2 ? 0 : 1;
    syntheticAttitude(q, spec, t);
    const s = spec.alternateSign && k % 2 === 1 ? -1 : 1;
    for (let i = 0; i < 4; i++) tr.q[4 * k + i] = s * q[i]!;
    // Reference: a slower rotation about Z_I from the same start.
    qMultiply(qr, qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.01 * t), spec.q0);
    tr.qRef.set(qr, 4 * k);
    tr.omega.set(spec.omegaBody, 3 * k);
    for (let w = 0; w < nWheels; w++) tr.hWheel[nWheels * k + w] = 0.004 * Math.sin(0.01 * t + w);
  }
  return tr;
}

export function syntheticJumps(spec: SyntheticRunSpec, tr: RunTrace): ViewJump[] {
  return spec.jumpSamples.map((k) => ({ t: tr.t[k]!, j: tr.j[k]!, from: tr.logic[k - 1]!, to: tr.logic[k]! }));
}

// ---------------------------------------------------------------------------------------------
// Test zonotopes, built here independently of the engine: Z = { Σ h_i a_i : |h_i| ≤ hmax_i }.

/**
 * Zonotope faces for generators in general position (no three coplanar): for each pair (i, j)
 * with normal n = a_i × a_j, the two faces ±n are the parallelograms c ± hmax_i a_i ± hmax_j a_j,
 * c = ±Σ_{k≠i,j} sign(n·a_k) hmax_k a_k (the standard zonotope face structure; e.g. Markley,
 * Reynolds, Liu, Lebsock, JGCD 33(5), 2010, for wheel envelopes). Each face → 2 triangles,
 * counter-clockwise seen from outside; vertices are not shared between faces.
 */
export function testZonotope(axes: ArrayLike<number>, hmax: ArrayLike<number>): MomentumEnvelopeMesh {
  const nW = hmax.length;
  const a = (i: number) => [axes[3 * i], axes[3 * i + 1], axes[3 * i + 2]];
  const verts: number[] = [];
  const tris: number[] = [];
  for (let i = 0; i < nW; i++)
    for (let j = i + 1; j < nW; j++) {
      const ai = a(i),
        aj = a(j);
      const nrm = [ai[1]! * aj[2]! - ai[2]! * aj[1]!, ai[2]! * aj[0]! - ai[0]! * aj[2]!, ai[0]! * aj[1]! - ai[1]! * aj[0]!];
      for (const s of [1, -1]) {
        const c = [0, 0, 0];
        for (let k = 0; k < nW; k++) {
          if (k === i || k === j) continue;
          const ak = a(k);
          const sg = Math.sign(s * (nrm[0]! * ak[0]! + nrm[1]! * ak[1]! + nrm[2]! * ak[2]!));
          for (let r = 0; r < 3; r++) c[r]! += sg * hmax[k]! * ak[r]!;
        }
        const corner = (si: number, sj: number) => [0, 1, 2].map((r) => c[r]! + si * hmax[i]! * ai[r]! + sj * hmax[j]! * aj[r]!);
        const quad = [corner(-1, -1), corner(1, -1), corner(1, 1), corner(-1, 1)];
        const base = verts.length / 3;
        for (const p of quad) verts.push(...p);
        // Orientation: (p1−p0)×(p2−p0) must point along s·n.
        const e1 = [0, 1, 2].map((r) => quad[1]![r]! - quad[0]![r]!);
        const e2 = [0, 1, 2].map((r) => quad[2]![r]! - quad[0]![r]!);
        const cr = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
        const out = s * (cr[0]! * nrm[0]! + cr[1]! * nrm[1]! + cr[2]! * nrm[2]!) > 0;
        if (out) tris.push(base, base + 1, base + 2, base, base + 2, base + 3);
        else tris.push(base, base + 2, base + 1, base, base + 3, base + 2);
      }
    }
  return { vertices: Float64Array.from(verts), triangles: Uint32Array.from(tris) };
}

/**
 * Capacity of a zonotope along unit d from its facets: r(d) = min over facets with n·d > 0 of
 * support(n) / (n·d), support(n) = Σ hmax_k |a_k·n| (support function of a zonotope).
 */
export function testZonotopeCapacity(axes: ArrayLike<number>, hmax: ArrayLike<number>): (d: Float64Array) => number {
  const nW = hmax.length;
  const normals: number[][] = [];
  for (let i = 0; i < nW; i++)
    for (let j = i + 1; j < nW; j++) {
      const ai = [axes[3 * i], axes[3 * i + 1], axes[3 * i + 2]],
        aj = [axes[3 * j], axes[3 * j + 1], axes[3 * j + 2]];
      const nr = [ai[1]! * aj[2]! - ai[2]! * aj[1]!, ai[2]! * aj[0]! - ai[0]! * aj[2]!, ai[0]! * aj[1]! - ai[1]! * aj[0]!];
      normals.push(
        nr,
        nr.map((x) => -x),
      );
    }
  return (d) => {
    let best = Infinity;
    for (const nr of normals) {
      const nd = nr[0]! * d[0]! + nr[1]! * d[1]! + nr[2]! * d[2]!;
      if (nd <= 1e-15) continue;
      let sup = 0;
      for (let k = 0; k < nW; k++)
        sup += hmax[k]! * Math.abs(nr[0]! * axes[3 * k]! + nr[1]! * axes[3 * k + 1]! + nr[2]! * axes[3 * k + 2]!);
      best = Math.min(best, sup / nd);
    }
    return best;
  };
}

export const TRIAD_AXES = Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1);

/** Pyramid, cant β = arccos(1/√3) from +Z, azimuths 45° + k·90° (references.md §3 layout). */
export function pyramidAxes(): Float64Array {
  const beta = Math.acos(1 / Math.sqrt(3));
  const out = new Float64Array(12);
  for (let k = 0; k < 4; k++) {
    const phi = Math.PI / 4 + (k * Math.PI) / 2;
    out[3 * k] = Math.sin(beta) * Math.cos(phi);
    out[3 * k + 1] = Math.sin(beta) * Math.sin(phi);
    out[3 * k + 2] = Math.cos(beta);
  }
  return out;
}

export function syntheticViewRun(spec: SyntheticRunSpec, label = 'run A', targets?: ViewTarget[]): ViewRun {
  const trace = syntheticTrace(spec, 3);
  const hmax = Float64Array.of(0.006, 0.006, 0.006);
  const tEnd = trace.t[trace.n - 1]!;
  const tg: ViewTarget[] = targets ?? [
    { tStart: 0, tEnd: tEnd / 2, q: syntheticAttitude(new Float64Array(4), spec, tEnd / 2), label: 'first' },
    { tStart: tEnd / 2, tEnd, q: syntheticAttitude(new Float64Array(4), spec, tEnd), label: 'second' },
  ];
  return {
    label,
    trace,
    jumps: syntheticJumps(spec, trace),
    targets: tg,
    hasReference: true,
    wheelAxes: TRIAD_AXES,
    maxMomentumNms: hmax,
    momentumEnvelope: testZonotope(TRIAD_AXES, hmax),
    momentumCapacity: testZonotopeCapacity(TRIAD_AXES, hmax),
    logicKind: spec.logicKind,
  };
}
