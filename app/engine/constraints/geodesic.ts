/**
 * Geodesic grid on the unit sphere: a regular icosahedron whose triangles are split into four,
 * level times, with every new vertex pushed out to the sphere (class I geodesic polyhedron of
 * frequency 2^level: V = 10·4^L + 2 vertices, E = 30·4^L edges, F = 20·4^L faces).
 *
 * Spacing (mean edge angle, measured on the built grids; the grid reports min, mean and max):
 * level 2 ≈ 17.2°, 3 ≈ 8.6°, 4 ≈ 4.3°, 5 ≈ 2.16°, 6 ≈ 1.08° — about 69° / 2^L (level 0 is the
 * icosahedron's 63.4°; subdivided edges near its vertices come out shorter, near face centres longer).
 * DEFAULT_GRID_LEVEL = 5 (10,242 nodes, mean spacing ≈ 2.2°) is the single-axis planner's default.
 *
 * Grids are built once per level and kept (a pure cache); the arrays must not be modified.
 */

export interface GeodesicGrid {
  level: number;
  /** Number of nodes. */
  n: number;
  /** Unit node directions, 3 per node. */
  xyz: Float64Array;
  /** Compressed adjacency: the neighbours of node i are nbr[start[i] .. start[i+1]). */
  start: Int32Array;
  nbr: Int32Array;
  /** Great-circle angle of each adjacency entry (rad). */
  edgeAngle: Float64Array;
  minSpacingRad: number;
  meanSpacingRad: number;
  maxSpacingRad: number;
}

export const DEFAULT_GRID_LEVEL = 5;
export const MAX_GRID_LEVEL = 7;

const cache = new Map<number, GeodesicGrid>();

/** The grid of a level in [0, MAX_GRID_LEVEL] (an integer; the caller validates). */
export function geodesicGrid(level: number): GeodesicGrid {
  let g = cache.get(level);
  if (!g) {
    g = buildGrid(level);
    cache.set(level, g);
  }
  return g;
}

/** The 12 icosahedron vertices (0, ±1, ±φ) cyclically permuted, and its 20 faces found as the
 * vertex triples that are pairwise one edge (length 2) apart, wound outward. */
function icosahedron(): { v: number[]; f: number[] } {
  const p = (1 + Math.sqrt(5)) / 2;
  const v: number[] = [];
  for (const a of [-1, 1]) for (const b of [-p, p]) v.push(0, a, b, a, b, 0, b, 0, a);
  const n = 12;
  const d2 = (i: number, j: number) =>
    (v[3 * i]! - v[3 * j]!) ** 2 + (v[3 * i + 1]! - v[3 * j + 1]!) ** 2 + (v[3 * i + 2]! - v[3 * j + 2]!) ** 2;
  const edge = (i: number, j: number) => Math.abs(d2(i, j) - 4) < 1e-9;
  const f: number[] = [];
  for (let i = 0; i < n; i++)
    for (let j = i + 1; j < n; j++)
      for (let k = j + 1; k < n; k++) {
        if (!edge(i, j) || !edge(j, k) || !edge(i, k)) continue;
        // Outward winding: (vj − vi) × (vk − vi) points away from the centre.
        const ax = v[3 * j]! - v[3 * i]!,
          ay = v[3 * j + 1]! - v[3 * i + 1]!,
          az = v[3 * j + 2]! - v[3 * i + 2]!;
        const bx = v[3 * k]! - v[3 * i]!,
          by = v[3 * k + 1]! - v[3 * i + 1]!,
          bz = v[3 * k + 2]! - v[3 * i + 2]!;
        const out = (ay * bz - az * by) * v[3 * i]! + (az * bx - ax * bz) * v[3 * i + 1]! + (ax * by - ay * bx) * v[3 * i + 2]!;
        if (out > 0) f.push(i, j, k);
        else f.push(i, k, j);
      }
  for (let i = 0; i < v.length; i += 3) {
    const r = Math.hypot(v[i]!, v[i + 1]!, v[i + 2]!);
    v[i]! /= r;
    v[i + 1]! /= r;
    v[i + 2]! /= r;
  }
  return { v, f };
}

function buildGrid(level: number): GeodesicGrid {
  const { v, f: faces0 } = icosahedron();
  let faces = faces0;
  for (let l = 0; l < level; l++) {
    const mid = new Map<number, number>();
    const midpoint = (a: number, b: number): number => {
      const key = a < b ? a * 1_000_003 + b : b * 1_000_003 + a;
      let m = mid.get(key);
      if (m === undefined) {
        const x = v[3 * a]! + v[3 * b]!,
          y = v[3 * a + 1]! + v[3 * b + 1]!,
          z = v[3 * a + 2]! + v[3 * b + 2]!;
        const r = Math.hypot(x, y, z);
        m = v.length / 3;
        v.push(x / r, y / r, z / r);
        mid.set(key, m);
      }
      return m;
    };
    const next: number[] = [];
    for (let t = 0; t < faces.length; t += 3) {
      const a = faces[t]!,
        b = faces[t + 1]!,
        c = faces[t + 2]!;
      const ab = midpoint(a, b),
        bc = midpoint(b, c),
        ca = midpoint(c, a);
      next.push(a, ab, ca, b, bc, ab, c, ca, bc, ab, bc, ca);
    }
    faces = next;
  }
  return adjacency(level, Float64Array.from(v), faces);
}

function adjacency(level: number, xyz: Float64Array, faces: number[]): GeodesicGrid {
  const n = xyz.length / 3;
  const lists: number[][] = Array.from({ length: n }, () => []);
  const link = (a: number, b: number) => {
    if (!lists[a]!.includes(b)) {
      lists[a]!.push(b);
      lists[b]!.push(a);
    }
  };
  for (let t = 0; t < faces.length; t += 3) {
    link(faces[t]!, faces[t + 1]!);
    link(faces[t + 1]!, faces[t + 2]!);
    link(faces[t + 2]!, faces[t]!);
  }
  const start = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) start[i + 1] = start[i]! + lists[i]!.length;
  const nbr = new Int32Array(start[n]!),
    edgeAngle = new Float64Array(start[n]!);
  let lo = Infinity,
    hi = 0,
    sum = 0;
  for (let i = 0; i < n; i++) {
    lists[i]!.forEach((j, k) => {
      const e = start[i]! + k;
      nbr[e] = j;
      const ang = angleOf(xyz, i, j);
      edgeAngle[e] = ang;
      lo = Math.min(lo, ang);
      hi = Math.max(hi, ang);
      sum += ang;
    });
  }
  return { level, n, xyz, start, nbr, edgeAngle, minSpacingRad: lo, meanSpacingRad: sum / nbr.length, maxSpacingRad: hi };
}

function angleOf(xyz: Float64Array, i: number, j: number): number {
  const ax = xyz[3 * i]!,
    ay = xyz[3 * i + 1]!,
    az = xyz[3 * i + 2]!,
    bx = xyz[3 * j]!,
    by = xyz[3 * j + 1]!,
    bz = xyz[3 * j + 2]!;
  return Math.atan2(Math.hypot(ay * bz - az * by, az * bx - ax * bz, ax * by - ay * bx), ax * bx + ay * by + az * bz);
}

/** Nodes within `radiusRad` of the unit direction d (brute force over the grid). */
export function nodesWithin(grid: GeodesicGrid, d: ArrayLike<number>, radiusRad: number): number[] {
  const out: number[] = [];
  const c = Math.cos(radiusRad),
    x = grid.xyz;
  for (let i = 0; i < grid.n; i++) if (x[3 * i]! * d[0]! + x[3 * i + 1]! * d[1]! + x[3 * i + 2]! * d[2]! >= c) out.push(i);
  return out;
}
