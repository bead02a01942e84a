/**
 * The AEM quaternion mapping, proved against CCSDS 504.0-B-2 (Attitude Data Messages, Blue Book
 * Issue 2, January 2024), Annex F2:
 * - the standard's coordinate transform X_B = M_BA(Q) X_A, with M_BA written out below from the
 *   Annex F2 matrix (A = REF_FRAME_A = inertial, B = REF_FRAME_B = body);
 * - its own example: B = A turned +90° about Z ⇒ (Q1, Q2, Q3, QC) = (0, 0, 0.7071, 0.7071),
 *   M_BA = [[0, 1, 0], [−1, 0, 0], [0, 0, 1]], X_A = (1, 0, 0) ⇒ X_B = (0, −1, 0);
 * - constant body rate: q_AB(t) = q_AB(0) ⊗ exp(½ ω_B t); q0 = axis (1,2,2)/3, angle 0.7 rad,
 *   ω_B = (0.02, −0.03, 0.05) rad/s, t = 12 s ⇒ (0.3239846166, 0.0411789922, 0.4416515247,
 *   0.8356328079); the wrong product order gives (0.1094995, 0.0545843, 0.5354888, 0.8356328)
 *   (values computed for the project with two independent tools, references.md §1.6).
 * Our q = qInertialFromBody is written unchanged; these tests would fail for the conjugate.
 */
import { describe, expect, it } from 'vitest';
import { aemQuaternionFromAttitude, writeAem } from '../../app/engine/export/aem-write';
import { parseAem } from '../../app/engine/export/aem-read';
import { qConjugate, qFromAxisAngle, qRandomUniform, qRotateInverse, qCreate } from '../../app/engine/math/rotation';
import { makeRng } from '../../app/engine/math/prng';
import { exampleSummary } from '../unit/scenario-fixtures';
import { META, makeTrace } from '../unit/export-fixtures';

/** M_BA of CCSDS 504.0-B-2 Annex F2, rows, from (Q1, Q2, Q3, QC). */
function mBA(q: ArrayLike<number>): number[][] {
  const [q1, q2, q3, qc] = [q[0]!, q[1]!, q[2]!, q[3]!];
  return [
    [q1 * q1 - q2 * q2 - q3 * q3 + qc * qc, 2 * (q1 * q2 + q3 * qc), 2 * (q1 * q3 - q2 * qc)],
    [2 * (q1 * q2 - q3 * qc), -q1 * q1 + q2 * q2 - q3 * q3 + qc * qc, 2 * (q2 * q3 + q1 * qc)],
    [2 * (q1 * q3 + q2 * qc), 2 * (q2 * q3 - q1 * qc), -q1 * q1 - q2 * q2 + q3 * q3 + qc * qc],
  ];
}
const mul = (m: number[][], v: number[]) => m.map((r) => r[0]! * v[0]! + r[1]! * v[1]! + r[2]! * v[2]!);

function tern() {
  const r = { ok: true as const, value: exampleSummary('tern12-reversal') };
  if (!r.ok) throw new Error('fixture');
  return r.value;
}

describe('AEM quaternion = qInertialFromBody (CCSDS 504.0-B-2 Annex F2)', () => {
  it('Annex F example: +90° about Z', () => {
    // Body = inertial turned +90° about Z: our attitude quaternion is the rotation that carries
    // inertial axes onto body axes, (0, 0, sin 45°, cos 45°).
    const q = qFromAxisAngle(qCreate(), [0, 0, 1], Math.PI / 2);
    const Q = aemQuaternionFromAttitude(new Float64Array(4), q);
    expect(Array.from(Q).map((x) => +x.toFixed(4))).toEqual([0, 0, 0.7071, 0.7071]);
    const M = mBA(Q).map((r) => r.map((x) => Math.round(x * 1e12) / 1e12 + 0));
    expect(M).toEqual([
      [0, 1, 0],
      [-1, 0, 0],
      [0, 0, 1],
    ]);
    expect(mul(mBA(Q), [1, 0, 0]).map((x) => Math.round(x * 1e12) / 1e12 + 0)).toEqual([0, -1, 0]);
  });

  it('M_BA(Q) X_A equals our inertial→body transform for random attitudes; the conjugate does not', () => {
    const rng = makeRng(504, 2);
    const q = qCreate();
    const out = new Float64Array(3);
    for (let i = 0; i < 200; i++) {
      qRandomUniform(q, rng);
      const x = [rng.normal(), rng.normal(), rng.normal()];
      const ours = Array.from(qRotateInverse(out, q, x));
      const theirs = mul(mBA(aemQuaternionFromAttitude(new Float64Array(4), q)), x);
      for (let c = 0; c < 3; c++) expect(theirs[c]).toBeCloseTo(ours[c]!, 13);
    }
    qRandomUniform(q, rng);
    const conj = qConjugate(qCreate(), q);
    const x = [0.3, -0.4, 0.5];
    const wrong = mul(mBA(conj), x);
    const right = Array.from(qRotateInverse(out, q, x));
    expect(Math.max(...wrong.map((w, c) => Math.abs(w - right[c]!)))).toBeGreaterThan(1e-3);
  });

  it('the written AEM reproduces the Annex F2 propagation vector, not the wrong-order one', () => {
    const s = 0.7 / 2;
    const q0 = [Math.sin(s) / 3, (2 * Math.sin(s)) / 3, (2 * Math.sin(s)) / 3, Math.cos(s)];
    expect(q0.map((v) => +v.toFixed(7))).toEqual([0.1142993, 0.2285985, 0.2285985, 0.9393727]);
    const omega = [0.02, -0.03, 0.05];
    const tr = makeTrace({ n: 121, dt: 0.1, nWheels: 3, q0, omega });
    const r = writeAem(tr, tern(), META, { creationDateUtc: '2030-03-13T08:00:00Z' });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const doc = parseAem(r.value);
    if (!doc.ok) throw new Error(JSON.stringify(doc.errors));
    const last = doc.value.segments[0]!.lines.at(-1)!;
    const expected = [0.3239846166, 0.0411789922, 0.4416515247, 0.8356328079];
    for (let i = 0; i < 4; i++) expect(Math.abs(last.values[i]! - expected[i]!)).toBeLessThan(2e-10);
    const wrongOrder = [0.1094995, 0.0545843, 0.5354888, 0.8356328];
    expect(Math.abs(last.values[0]! - wrongOrder[0]!)).toBeGreaterThan(0.1);
    // ANGVEL: B relative to A in B axes, deg/s (§4.2.4.6).
    for (let i = 0; i < 3; i++) expect(last.values[4 + i]).toBeCloseTo((omega[i]! * 180) / Math.PI, 10);
    // The epoch: scenario epoch 2031-06-02T04:30:00Z + 12 s.
    expect(last.epoch).toBe('2031-06-02T04:30:12.000');
  });
});
