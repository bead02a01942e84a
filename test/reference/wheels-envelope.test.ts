/**
 * Wheel-array envelopes (zonotopes) against published geometry and an independent LP.
 *
 * Sources:
 * - Markley, Reynolds, Liu & Lebsock, "Maximum torque and momentum envelopes for reaction-wheel
 *   arrays", JGCD 33(5), 2010: the envelope is the cube of wheel limits mapped through G. The
 *   pyramid numbers below (cube-diagonal pyramid: 4/√3 h along body axes, 2 h along a wheel axis,
 *   4/√6 h worst, rhombic dodecahedron) and the general-β pyramid formulas are values computed by
 *   linear programming and checked against the support function for the project's reference
 *   notes; the rhombic dodecahedron's 14 vertices / 24 edges / 12 rhombic faces are standard solid
 *   geometry (common practice, no source).
 * - Orthogonal triad: the envelope is a cube (1, √2, √3 along an axis, face diagonal, body
 *   diagonal) — elementary geometry.
 * - Independent LP: max r with Gλ = r d̂, |λ_i| ≤ l_i, solved here by enumerating every basic
 *   solution (two free wheels and r basic, all other wheels at ±l_i) with mathjs 15.2.0
 *   `lusolve` — a different method and different code from the facet formula under test.
 */
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import {
  envelopeBindingFace,
  envelopeCapacity,
  envelopeContains,
  envelopeSupport,
  makeWheelArray,
  momentumEnvelope,
  orthogonalTriad,
  pyramid,
  torqueEnvelope,
} from '../../app/engine/wheels';
import type { WheelArray, WheelSpec } from '../../app/engine/wheels';
import { makeRng } from '../../app/engine/math/prng';

const H = 0.006; // Lumen-6 wheel momentum, N·m·s (design.md; invented vehicle)
const TAU = 0.002; // N·m
const LIM = { maxTorqueNm: TAU, maxMomentumNms: H, rotorInertiaKgm2: 2e-5 };
const CUBE_DIAG_CANT = Math.acos(1 / Math.sqrt(3));

function build(specs: WheelSpec[]): WheelArray {
  const r = makeWheelArray(specs);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const cubePyramid = build(pyramid({ ...LIM, cantAngleRad: CUBE_DIAG_CANT, azimuthOffsetRad: Math.PI / 4 }));

/** Independent capacity: basic-solution enumeration of the LP, 3×3 solves by mathjs. */
function lpCapacity(arr: WheelArray, limits: Float64Array, d: number[]): number {
  const n = arr.n;
  const dn = Math.hypot(d[0]!, d[1]!, d[2]!);
  const u = d.map((x) => x / dn);
  const g = (i: number) => [arr.axes[3 * i], arr.axes[3 * i + 1], arr.axes[3 * i + 2]];
  let best = -Infinity;
  for (let a = 0; a < n; a++) {
    for (let b = a + 1; b < n; b++) {
      const others = [...Array(n).keys()].filter((i) => i !== a && i !== b);
      const M = [0, 1, 2].map((r) => [g(a)[r]!, g(b)[r]!, -u[r]!]);
      if (Math.abs(math.det(M)) < 1e-12) continue;
      for (let mask = 0; mask < 1 << others.length; mask++) {
        const rhs = [0, 0, 0];
        others.forEach((i, k) => {
          const s = mask & (1 << k) ? 1 : -1;
          for (let r = 0; r < 3; r++) rhs[r]! -= s * limits[i]! * g(i)[r]!;
        });
        const sol = (math.lusolve(M, rhs) as number[][]).map((row) => row[0]);
        if (Math.abs(sol[0]!) <= limits[a]! * (1 + 1e-9) && Math.abs(sol[1]!) <= limits[b]! * (1 + 1e-9)) {
          best = Math.max(best, sol[2]!);
        }
      }
    }
  }
  return best;
}

describe('cube-diagonal pyramid (cant arccos(1/√3) from +Z, azimuth offset 45°)', () => {
  const zt = torqueEnvelope(cubePyramid);
  const zh = momentumEnvelope(cubePyramid);
  const s3 = 1 / Math.sqrt(3);

  it('is a rhombic dodecahedron: 14 vertices, 24 edges, 12 rhombic faces', () => {
    // Standard solid geometry (common practice, no source); zonotope of 4 generators in general position.
    expect(zh.vertices.length / 3).toBe(14);
    expect(zh.edgeCount).toBe(24);
    expect(zh.faces.length).toBe(12);
    for (const f of zh.faces) expect(f.length).toBe(4);
    expect(zh.triangles.length).toBe(3 * 24);
  });

  it('momentum capacity 4/√3 h = 2.3094 h along each body axis', () => {
    // Markley et al. JGCD 2010 geometry; value as computed by LP for the reference notes.
    for (const d of [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
      [-1, 0, 0],
      [0, 0, -1],
    ]) {
      expect(envelopeCapacity(zh, d) / H).toBeCloseTo(4 / Math.sqrt(3), 12);
      expect(envelopeCapacity(zh, d) / H).toBeCloseTo(2.3094, 4);
    }
  });

  it('capacity 2.0 h along a wheel axis', () => {
    for (const w of [
      [1, 1, 1],
      [-1, 1, 1],
      [-1, -1, 1],
      [1, -1, 1],
    ]) {
      expect(
        envelopeCapacity(
          zh,
          w.map((x) => x * s3),
        ) / H,
      ).toBeCloseTo(2, 12);
    }
  });

  it('worst capacity 4/√6 h = 1.6330 h on face normals such as (1,1,0)/√2; every facet is at that distance', () => {
    for (const d of [
      [1, 1, 0],
      [1, 0, 1],
      [0, 1, -1],
      [-1, 1, 0],
    ]) {
      expect(envelopeCapacity(zh, d) / H).toBeCloseTo(4 / Math.sqrt(6), 12);
      expect(envelopeCapacity(zh, d) / H).toBeCloseTo(1.633, 4);
    }
    for (let f = 0; f < zh.faceOffsets.length; f++) expect(zh.faceOffsets[f]! / H).toBeCloseTo(4 / Math.sqrt(6), 12);
  });

  it('the minimum capacity over 20,000 random directions is ≥ the worst-face value and approaches it', () => {
    const rng = makeRng(6, 1);
    let min = Infinity;
    for (let k = 0; k < 20_000; k++) {
      const d = [rng.normal(), rng.normal(), rng.normal()];
      min = Math.min(min, envelopeCapacity(zh, d) / H);
    }
    expect(min).toBeGreaterThanOrEqual(4 / Math.sqrt(6) - 1e-12);
    expect(min).toBeLessThan(4 / Math.sqrt(6) + 0.01);
  });

  it('torque envelope has the same shape scaled by τ_max (Markley et al.: same geometry)', () => {
    expect(envelopeCapacity(zt, [0, 0, 1]) / TAU).toBeCloseTo(4 / Math.sqrt(3), 12);
    expect(envelopeCapacity(zt, [1, 1, 0]) / TAU).toBeCloseTo(4 / Math.sqrt(6), 12);
  });

  it('support along z is Σ h |g_iᵀz| = 4h/√3', () => {
    // Each cube-diagonal wheel has g_iᵀz = 1/√3, so h_Z(z) = 4 h /√3.
    expect(envelopeSupport(zh, [0, 0, 1]) / H).toBeCloseTo(4 / Math.sqrt(3), 13);
  });
});

describe('pyramid formulas for a general cant angle β (values computed by LP for the reference notes)', () => {
  for (const betaDeg of [20, 35, 70, 80]) {
    const b = (betaDeg * Math.PI) / 180;
    it(`β = ${betaDeg}°, azimuth offset 45°: 4h cosβ along z, 2√2 h sinβ along x, 2h sinβ along (1,1,0)/√2`, () => {
      const z = momentumEnvelope(build(pyramid({ ...LIM, cantAngleRad: b, azimuthOffsetRad: Math.PI / 4 })));
      expect(envelopeCapacity(z, [0, 0, 1])).toBeCloseTo(4 * H * Math.cos(b), 14);
      expect(envelopeCapacity(z, [1, 0, 0])).toBeCloseTo(2 * Math.SQRT2 * H * Math.sin(b), 14);
      expect(envelopeCapacity(z, [1, 1, 0])).toBeCloseTo(2 * H * Math.sin(b), 14);
    });
    it(`β = ${betaDeg}°, azimuth offset 0: the x and (1,1,0) values swap`, () => {
      const z = momentumEnvelope(build(pyramid({ ...LIM, cantAngleRad: b, azimuthOffsetRad: 0 })));
      expect(envelopeCapacity(z, [1, 0, 0])).toBeCloseTo(2 * H * Math.sin(b), 14);
      expect(envelopeCapacity(z, [1, 1, 0])).toBeCloseTo(2 * Math.SQRT2 * H * Math.sin(b), 14);
    });
  }
});

describe('orthogonal triad: the envelope is a cube', () => {
  const z = momentumEnvelope(build(orthogonalTriad(LIM)));
  it('8 vertices, 12 edges, 6 square faces', () => {
    expect(z.vertices.length / 3).toBe(8);
    expect(z.edgeCount).toBe(12);
    expect(z.faces.length).toBe(6);
  });
  it('capacities 1, 1.4142, 1.7321 h along an axis, a face diagonal, the body diagonal', () => {
    expect(envelopeCapacity(z, [0, 1, 0]) / H).toBeCloseTo(1, 14);
    expect(envelopeCapacity(z, [1, 1, 0]) / H).toBeCloseTo(Math.SQRT2, 14);
    expect(envelopeCapacity(z, [1, 1, 1]) / H).toBeCloseTo(Math.sqrt(3), 14);
    expect(envelopeCapacity(z, [1, 1, 1]) / H).toBeCloseTo(1.7321, 4);
  });
  it('degenerate directions give 0 rather than NaN', () => {
    expect(envelopeCapacity(z, [0, 0, 0])).toBe(0);
    expect(envelopeCapacity(z, [NaN, 1, 0])).toBe(0);
    expect(envelopeBindingFace(z, [0, 0, 0])).toBe(-1);
  });
});

describe('capacity against an independent LP (basic-solution enumeration with mathjs lusolve)', () => {
  const rng = makeRng(2010, 3);
  const randomArray = (n: number): WheelArray => {
    for (;;) {
      const specs: WheelSpec[] = [];
      for (let i = 0; i < n; i++) {
        const v = [rng.normal(), rng.normal(), rng.normal()];
        const L = Math.hypot(v[0]!, v[1]!, v[2]!);
        specs.push({
          axis: v.map((x) => x / L),
          maxTorqueNm: 0.5 + rng.next(),
          maxMomentumNms: 0.2 + 2 * rng.next(),
          rotorInertiaKgm2: 1e-4,
        });
      }
      const r = makeWheelArray(specs);
      if (r.ok && r.value.singularValues[2]! > 0.1 * r.value.singularValues[0]!) return r.value;
    }
  };
  for (const n of [3, 4, 5, 6]) {
    it(`${n} random wheels, unequal limits, 12 random directions each`, () => {
      for (let rep = 0; rep < 3; rep++) {
        const arr = randomArray(n);
        const z = momentumEnvelope(arr);
        for (let k = 0; k < 4; k++) {
          const d = [rng.normal(), rng.normal(), rng.normal()];
          const ref = lpCapacity(arr, arr.maxMomentumNms, d);
          expect(envelopeCapacity(z, d)).toBeCloseTo(ref, 10);
          // The capacity point lies on the boundary: inside with tolerance, outside after a 1e-9 step.
          const dn = Math.hypot(d[0]!, d[1]!, d[2]!);
          const p = d.map((x) => (x / dn) * ref);
          expect(envelopeContains(z, p, 1e-12)).toBe(true);
          expect(
            envelopeContains(
              z,
              p.map((x) => x * (1 + 1e-9)),
            ),
          ).toBe(false);
        }
      }
    });
  }
});
