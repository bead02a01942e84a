/**
 * The modified trace potential and its angular-warping family (construction: Berkane & Tayebi,
 * IEEE TAC 62(1):495–501, 2017; methods §1.2, §4.2).
 * - Quaternion shortcuts Φ = 4εᵀĀε, ψ(AR) = 2ηĀε + ε × Aε against the matrix definitions
 *   Φ = tr(A(I − R)), ψ(M) = vee((M − Mᵀ)/2), with R from the npm `quaternion` package and the
 *   algebra in mathjs (independent libraries).
 * - b_q against central finite differences of V_q along Ṙ = Rω^× (methods §4.2).
 * - The unit-test point of methods §4.3 (values derived for this project in double precision).
 */
import * as math from 'mathjs';
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import {
  argminMember,
  evaluateFamily,
  makeFamilyWorkspace,
  makeWarpFamily,
  memberGradient,
  phiMax,
  phiQuat,
  psiAQuat,
  warpJacobianDet,
} from '../../app/engine/control/potential';
import { makeRng } from '../../app/engine/math/prng';
import { qCreate, qFromAxisAngle, qFromRotationVector, qMultiply, qRandomUniform } from '../../app/engine/math/rotation';

const I3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];
const diag123 = [1, 0, 0, 0, 2, 0, 0, 0, 3];

function rotRows(q: ArrayLike<number>): number[][] {
  return new Quaternion(q[3], q[0], q[1], q[2]).toMatrix(true) as number[][];
}
function rows(A: ArrayLike<number>): number[][] {
  return [0, 1, 2].map((r) => [0, 1, 2].map((c) => A[3 * c + r]!));
}
function psiMat(M: number[][]): number[] {
  return [0.5 * (M[2]![1]! - M[1]![2]!), 0.5 * (M[0]![2]! - M[2]![0]!), 0.5 * (M[1]![0]! - M[0]![1]!)];
}
function randomSpd(seed: number): Float64Array {
  const rng = makeRng(seed, 1);
  const B = [0, 1, 2].map(() => [0, 1, 2].map(() => rng.next() - 0.5));
  const A = math.multiply(B, math.transpose(B)) as number[][];
  const out = new Float64Array(9);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out[3 * c + r] = A[r]![c]! + (r === c ? 0.5 : 0);
  return out;
}

describe('trace potential on quaternions', () => {
  it('Φ and ψ(AR) match the matrix definitions (mathjs, npm quaternion)', () => {
    const rng = makeRng(11, 0);
    const q = qCreate();
    for (let s = 0; s < 40; s++) {
      const A = randomSpd(100 + s);
      const fam = makeWarpFamily(A, 0.1, [1, 0, 0]);
      qRandomUniform(q, rng);
      const R = rotRows(q);
      const AR = math.multiply(rows(A), R) as number[][];
      const phiRef = math.trace(math.multiply(rows(A), math.subtract(math.identity(3), R) as unknown as number[][]) as number[][]);
      expect(phiQuat(fam, q)).toBeCloseTo(phiRef as number, 12);
      const psi = psiAQuat(new Float64Array(3), fam, q);
      const psiRef = psiMat(AR);
      for (let i = 0; i < 3; i++) expect(psi[i]).toBeCloseTo(psiRef[i]!, 12);
      // even in q: ±q give the same values
      const mq = q.map((v) => -v);
      expect(phiQuat(fam, mq)).toBeCloseTo(phiRef as number, 12);
    }
  });

  it('closed forms of methods §1.2: Φ(R_a(θ,u)) = 2(1 − cos θ)uᵀĀu, critical values 2(trA − λ_i), max 2(trA − λ₁)', () => {
    const fam = makeWarpFamily(diag123, 0.1, [1, 0, 0]);
    const u = [1 / 3, 2 / 3, 2 / 3];
    const Abar = [2.5, 2, 1.5];
    const uAu = Abar[0]! * u[0]! ** 2 + Abar[1]! * u[1]! ** 2 + Abar[2]! * u[2]! ** 2;
    for (const th of [0.3, 1.2, 2.9]) expect(phiQuat(fam, qFromAxisAngle(qCreate(), u, th))).toBeCloseTo(2 * (1 - Math.cos(th)) * uAu, 12);
    const b = new Float64Array(3);
    for (let i = 0; i < 3; i++) {
      const e = [0, 0, 0];
      e[i] = 1;
      const q = qFromAxisAngle(qCreate(), e, Math.PI);
      expect(phiQuat(fam, q)).toBeCloseTo(2 * (6 - (i + 1)), 12); // 10, 8, 6
      psiAQuat(b, fam, q);
      expect(Math.hypot(b[0]!, b[1]!, b[2]!)).toBeLessThan(1e-15);
    }
    expect(phiMax(fam)).toBe(10);
  });
});

describe('warped family, methods §4.3 test point', () => {
  const fam = makeWarpFamily(diag123, 0.15, I3);
  const ws = makeFamilyWorkspace(fam);

  it('R₀ = R_a(2.0, (1,1,1)/√3): Φ, 2ψ(AR₀), V and b_q', () => {
    const q0 = qFromAxisAngle(qCreate(), [1, 1, 1], 2.0);
    expect(q0[3]).toBeCloseTo(0.540302, 6);
    expect(q0[0]).toBeCloseTo(0.485823, 6);
    evaluateFamily(ws, fam, q0);
    expect(ws.phi).toBeCloseTo(5.664587, 6);
    const psi = psiAQuat(new Float64Array(3), fam, q0);
    [3.096965, 1.155835, 2.046998].forEach((v, i) => expect(2 * psi[i]!).toBeCloseTo(v, 6));
    [8.085611, 6.608683, 7.259019].forEach((v, i) => expect(ws.V[i]).toBeCloseTo(v, 6));
    const expected = [
      [3.301967, -0.004922, 2.180998],
      [2.552913, 1.092469, 0.068354],
      [2.998476, 1.152724, 1.931067],
    ];
    const b = new Float64Array(3);
    for (let p = 0; p < 3; p++) {
      memberGradient(b, fam, ws, p);
      expected[p]!.forEach((v, i) => expect(b[i]).toBeCloseTo(v, 6));
    }
  });

  it('R_a(π/2, e₁): Φ = 5, V = (8.408194, 5.268311, 5.268311), tie broken to the lowest index', () => {
    evaluateFamily(ws, fam, qFromAxisAngle(qCreate(), [1, 0, 0], Math.PI / 2));
    expect(ws.phi).toBeCloseTo(5, 12);
    [8.408194, 5.268311, 5.268311].forEach((v, i) => expect(ws.V[i]).toBeCloseTo(v, 6));
    expect(ws.minIndex).toBe(1); // member 2 (0-based 1), not 3
    // the tie rule itself: a few ulps either way still picks the lowest index
    expect(argminMember([3, 2 + 4e-16, 2], 3)).toBe(1);
    expect(argminMember([3, 2, 2 + 4e-16], 3)).toBe(1);
    expect(argminMember([3, 2.001, 2], 3)).toBe(2);
  });
});

describe('body-frame gradient b_q = 2Θ_qᵀψ(AΓ_q)', () => {
  it('equals finite differences of V_q along Ṙ = Rω^× (random A, directions, attitudes)', () => {
    const rng = makeRng(5, 0);
    const q = qCreate(),
      qp = qCreate(),
      qm = qCreate(),
      dq = qCreate();
    const b = new Float64Array(3);
    const h = 1e-6;
    let worst = 0;
    for (let s = 0; s < 60; s++) {
      const A = s < 20 ? Float64Array.from(diag123) : randomSpd(200 + s);
      const dirs: number[] = [];
      for (let p = 0; p < 3; p++) {
        const v = [rng.normal(), rng.normal(), rng.normal()];
        const n = Math.hypot(...v);
        dirs.push(...v.map((x) => x / n));
      }
      const fam = makeWarpFamily(A, 0.08, dirs);
      const ws = makeFamilyWorkspace(fam);
      qRandomUniform(q, rng);
      const w = [rng.normal(), rng.normal(), rng.normal()];
      const Vat = (qq: Float64Array, p: number) => evaluateFamily(ws, fam, qq).V[p]!;
      for (let p = 0; p < 3; p++) {
        qMultiply(
          qp,
          q,
          qFromRotationVector(
            dq,
            w.map((x) => x * h),
          ),
        );
        qMultiply(
          qm,
          q,
          qFromRotationVector(
            dq,
            w.map((x) => -x * h),
          ),
        );
        const fd = (Vat(qp, p) - Vat(qm, p)) / (2 * h);
        evaluateFamily(ws, fam, q);
        memberGradient(b, fam, ws, p);
        const an = b[0]! * w[0]! + b[1]! * w[1]! + b[2]! * w[2]!;
        worst = Math.max(worst, Math.abs(fd - an) / (1 + Math.abs(an)));
      }
    }
    expect(worst).toBeLessThan(1e-7);
  });

  it('det Θ_q = 1 + g_qᵀu_q matches the determinant of R_a(θ,u)ᵀ + u gᵀ (mathjs)', () => {
    const fam = makeWarpFamily(diag123, 0.15, I3);
    const rng = makeRng(9, 0);
    const q = qCreate();
    for (let s = 0; s < 20; s++) {
      qRandomUniform(q, rng);
      const theta = 0.15 * phiQuat(fam, q);
      const psi = psiAQuat(new Float64Array(3), fam, q);
      const g = Array.from(psi, (v) => 2 * 0.15 * v);
      for (let p = 0; p < 3; p++) {
        const u = [0, 0, 0];
        u[p] = 1;
        const Ra = rotRows(qFromAxisAngle(qCreate(), u, theta));
        const Theta = math.add(math.transpose(Ra), math.multiply(math.reshape(u, [3, 1]), math.reshape(g, [1, 3]))) as number[][];
        expect(warpJacobianDet(fam, q, p)).toBeCloseTo(math.det(Theta), 12);
      }
    }
  });
});
