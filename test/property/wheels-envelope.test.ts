/**
 * Properties of the zonotope envelopes (fast-check, ≥ 1,000 cases each).
 *
 * Sources:
 * - Zonotope geometry: Z = {Σ λ_i v_i, |λ_i| ≤ 1}, support h_Z(d) = Σ |v_iᵀd|, vertices are the
 *   points Σ σ_i v_i whose sign pattern σ = sign(Vᵀd) for some d (Markley, Reynolds, Liu & Lebsock,
 *   JGCD 33(5), 2010, for wheel envelopes; Ziegler, Lectures on Polytopes, Springer 1995, §7.3,
 *   from memory).
 * - Euler's polyhedron formula V − E + F = 2 for the boundary of a 3-polytope.
 * - Volume of a 3D zonotope: 8 Σ_{i<j<k} |det(v_i, v_j, v_k)| (Shephard, "Combinatorial properties
 *   of associated zonotopes", Canad. J. Math. 26, 1974; from memory), compared with the volume
 *   enclosed by the returned triangles (divergence theorem), which checks the outward orientation.
 * - Lattice arrays (axes from the 13 directions of the cubic lattice, so parallel and coplanar
 *   axes are common): the number of facet planes counted with exact integer cross products here;
 *   each plane with m directions gives 2 facets of 2m edges, so F = 2·planes, E = 2 Σ m, and by
 *   Euler V = 2 + Σ 2(m − 1).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  envelopeBindingFace,
  envelopeCapacity,
  envelopeContains,
  envelopeSupport,
  makeWheelArray,
  momentumEnvelope,
  torqueEnvelope,
} from '../../app/engine/wheels';
import type { WheelArray, Zonotope } from '../../app/engine/wheels';

const RUNS = 1000;
const unit = fc.double({ min: -1, max: 1, noNaN: true });
const limit = fc.double({ min: 0.2, max: 2, noNaN: true });
const axisArb = fc
  .tuple(unit, unit, unit)
  .filter(([x, y, z]) => Math.hypot(x, y, z) > 0.2)
  .map(([x, y, z]) => {
    const L = Math.hypot(x, y, z);
    return [x / L, y / L, z / L];
  });
const specArb = fc.record({ axis: axisArb, maxTorqueNm: limit, maxMomentumNms: limit, rotorInertiaKgm2: fc.constant(1e-4) });
const randomArray = fc
  .array(specArb, { minLength: 3, maxLength: 8 })
  .map((s) => makeWheelArray(s))
  .filter((r) => r.ok)
  .map((r) => (r as { value: WheelArray }).value);

const LATTICE = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
  [1, 1, 0],
  [1, -1, 0],
  [1, 0, 1],
  [1, 0, -1],
  [0, 1, 1],
  [0, 1, -1],
  [1, 1, 1],
  [1, 1, -1],
  [1, -1, 1],
  [-1, 1, 1],
];
const latticeWheel = fc.record({ d: fc.integer({ min: 0, max: 12 }), sign: fc.constantFrom(1, -1), l: limit });
const latticeArray = fc
  .array(latticeWheel, { minLength: 3, maxLength: 9 })
  .map((ws) => ({
    ws,
    r: makeWheelArray(
      ws.map(({ d, sign, l }) => {
        const v = LATTICE[d]!;
        const L = Math.hypot(v[0]!, v[1]!, v[2]!);
        return { axis: v.map((x) => (sign * x) / L), maxTorqueNm: l, maxMomentumNms: l, rotorInertiaKgm2: 1e-4 };
      }),
    ),
  }))
  .filter(({ r }) => r.ok)
  .map(({ ws, r }) => ({ dirs: [...new Set(ws.map((w) => w.d))], arr: (r as { value: WheelArray }).value }));

const dot = (a: ArrayLike<number>, b: ArrayLike<number>) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
const at = (a: Float64Array, i: number): [number, number, number] => [a[3 * i]!, a[3 * i + 1]!, a[3 * i + 2]!];
const scaleOf = (z: Zonotope) => {
  let s = 0;
  for (let i = 0; i < z.n; i++) s += Math.hypot(...at(z.generators, i));
  return s;
};

/** Throws with a message (plain checks: thousands per case would be slow through expect()). */
function check(cond: boolean, what: string): void {
  if (!cond) throw new Error(what);
}

/** Checks every structural property; shared by the random and the lattice arrays. */
function checkStructure(z: Zonotope): void {
  const V = z.vertices.length / 3,
    F = z.faces.length,
    E = z.edgeCount;
  check(z.consistent, 'surface not closed/consistent');
  check(V - E + F === 2, `Euler: V ${V} − E ${E} + F ${F} ≠ 2`);
  const S = scaleOf(z);
  // Geometric slack: the accepted merge tolerance (zonotope.ts) times the envelope size.
  const G = 10 * z.tolerance.parallelRad * S + 1e-12 * S;
  const faceOf: number[][] = Array.from({ length: V }, () => []);
  z.faces.forEach((f, k) => {
    check(f.length % 2 === 0 && f.length >= 4, `face ${k} has ${f.length} vertices (zonotope faces are centrally symmetric)`);
    const nrm = at(z.faceNormals, k);
    check(Math.abs(Math.hypot(...nrm) - 1) < 1e-12, `face ${k} normal not unit`);
    check(Math.abs(z.faceOffsets[k]! - envelopeSupport(z, nrm)) <= 1e-12 * S, `face ${k} offset ≠ support`);
    for (const v of f) {
      faceOf[v]!.push(k);
      check(Math.abs(dot(nrm, at(z.vertices, v)) - z.faceOffsets[k]!) <= G, `vertex ${v} off the plane of face ${k}`);
    }
  });
  // Vertices: exact zonotope points with a support-attaining sign pattern.
  for (let v = 0; v < V; v++) {
    const p = [0, 0, 0];
    for (let i = 0; i < z.n; i++) {
      const s = z.vertexSigns[v * z.n + i]!;
      check(Math.abs(s) === 1, `vertex ${v} sign ${s}`);
      for (let c = 0; c < 3; c++) p[c]! += s * z.generators[3 * i + c]!;
    }
    const q = at(z.vertices, v);
    for (let c = 0; c < 3; c++) check(Math.abs(q[c]! - p[c]!) <= 1e-12 * S, `vertex ${v} is not Σ σ_i v_i`);
    check(faceOf[v]!.length >= 3, `vertex ${v} on ${faceOf[v]!.length} faces`);
    // d = sum of the adjacent facet normals lies inside the vertex's normal cone.
    const d = [0, 0, 0];
    for (const k of faceOf[v]!) for (let c = 0; c < 3; c++) d[c]! += z.faceNormals[3 * k + c]!;
    const dn = Math.hypot(...d);
    check(dot(d, q) >= envelopeSupport(z, d) - G * dn, `vertex ${v} does not attain the support`);
    for (let i = 0; i < z.n; i++) {
      const gd = dot(at(z.generators, i), d);
      if (Math.abs(gd) > 1e-6 * dn * Math.hypot(...at(z.generators, i))) {
        check(Math.sign(gd) === z.vertexSigns[v * z.n + i], `vertex ${v} sign of wheel ${i} ≠ sign(g·d)`);
      }
    }
  }
  // Outward triangles: each normal agrees with its facet, and the enclosed volume is Shephard's.
  let vol = 0;
  const triFace: number[] = [];
  z.faces.forEach((f, k) => {
    for (let j = 1; j + 1 < f.length; j++) triFace.push(k);
  });
  for (let t = 0; t < z.triangles.length / 3; t++) {
    const a = at(z.vertices, z.triangles[3 * t]!),
      b = at(z.vertices, z.triangles[3 * t + 1]!),
      c = at(z.vertices, z.triangles[3 * t + 2]!);
    const ab = [b[0]! - a[0]!, b[1]! - a[1]!, b[2]! - a[2]!],
      ac = [c[0]! - a[0]!, c[1]! - a[1]!, c[2]! - a[2]!];
    const cr = [ab[1]! * ac[2]! - ab[2]! * ac[1]!, ab[2]! * ac[0]! - ab[0]! * ac[2]!, ab[0]! * ac[1]! - ab[1]! * ac[0]!];
    check(dot(cr, at(z.faceNormals, triFace[t]!)) >= -G * S, `triangle ${t} faces inwards`);
    vol += dot(a, [b[1]! * c[2]! - b[2]! * c[1]!, b[2]! * c[0]! - b[0]! * c[2]!, b[0]! * c[1]! - b[1]! * c[0]!]) / 6;
  }
  let shephard = 0;
  for (let i = 0; i < z.n; i++)
    for (let j = i + 1; j < z.n; j++)
      for (let k = j + 1; k < z.n; k++) {
        const gi = at(z.generators, i),
          gj = at(z.generators, j),
          gk = at(z.generators, k);
        shephard += Math.abs(
          dot(gi, [gj[1]! * gk[2]! - gj[2]! * gk[1]!, gj[2]! * gk[0]! - gj[0]! * gk[2]!, gj[0]! * gk[1]! - gj[1]! * gk[0]!]),
        );
      }
  // Relative 1e-10, plus the merge tolerance on the scale S³ (a nearly flat set has a tiny volume).
  const volTol = 1e-10 * 8 * shephard + 10 * z.n * z.tolerance.parallelRad * S * S * S;
  check(Math.abs(vol - 8 * shephard) <= volTol, `volume ${vol} ≠ Shephard ${8 * shephard}`);
}

describe('zonotope structure', () => {
  it('random arrays: Euler, exact vertices with support-attaining signs, outward triangles, Shephard volume', () => {
    fc.assert(
      fc.property(randomArray, fc.boolean(), (arr, torque) => checkStructure(torque ? torqueEnvelope(arr) : momentumEnvelope(arr))),
      { numRuns: RUNS },
    );
  });

  it('lattice arrays (parallel and coplanar axes): F, E, V from exact integer plane counts', () => {
    fc.assert(
      fc.property(latticeArray, ({ dirs, arr }) => {
        const z = momentumEnvelope(arr);
        checkStructure(z);
        const planes = new Map<string, number>();
        for (let a = 0; a < dirs.length; a++)
          for (let b = a + 1; b < dirs.length; b++) {
            const u = LATTICE[dirs[a]!]!,
              w = LATTICE[dirs[b]!]!;
            let c = [u[1]! * w[2]! - u[2]! * w[1]!, u[2]! * w[0]! - u[0]! * w[2]!, u[0]! * w[1]! - u[1]! * w[0]!];
            const g = c.reduce((x, y) => gcd(x, Math.abs(y)), 0);
            c = c.map((x) => x / g);
            if (c.find((x) => x !== 0)! < 0) c = c.map((x) => -x);
            const m = dirs.filter((d) => dot(LATTICE[d]!, c) === 0).length;
            planes.set(c.join(','), m);
          }
        const ms = [...planes.values()];
        expect(z.faces.length).toBe(2 * ms.length);
        expect(z.edgeCount).toBe(2 * ms.reduce((s, m) => s + m, 0));
        expect(z.vertices.length / 3).toBe(2 + ms.reduce((s, m) => s + 2 * (m - 1), 0));
      }),
      { numRuns: RUNS },
    );
  });
});

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

describe('capacity', () => {
  it('capacity·d̂ lies on the boundary: on its binding facet, inside within rounding, outside after a 1e-9 step', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          randomArray,
          latticeArray.map((x) => x.arr),
        ),
        fc.tuple(unit, unit, unit),
        (arr, d) => {
          const dn = Math.hypot(...d);
          fc.pre(dn > 1e-3);
          const z = momentumEnvelope(arr);
          const S = scaleOf(z);
          const r = envelopeCapacity(z, d);
          expect(r).toBeGreaterThan(0);
          const p = d.map((x) => (x / dn) * r);
          expect(envelopeContains(z, p, 1e-12 * S)).toBe(true);
          expect(
            envelopeContains(
              z,
              p.map((x) => x * (1 + 1e-9)),
            ),
          ).toBe(false);
          const f = envelopeBindingFace(z, d);
          const nf = at(z.faceNormals, f);
          expect(dot(nf, p)).toBeCloseTo(envelopeSupport(z, nf), 10);
          // Support in the direction itself is at least the capacity (p ∈ Z), with equality
          // exactly when d̂ is a facet normal.
          expect(
            envelopeSupport(
              z,
              d.map((x) => x / dn),
            ),
          ).toBeGreaterThanOrEqual(r - 10 * z.tolerance.parallelRad * S);
        },
      ),
      { numRuns: RUNS },
    );
  });
});
