/**
 * Torque and momentum envelopes of a wheel array as 3D zonotopes.
 *
 * Markley, Reynolds, Liu & Lebsock, "Maximum torque and momentum envelopes for reaction-wheel
 * arrays", JGCD 33(5), 2010: the set of body torques (momenta) the array can produce is the
 * N-cube of wheel limits mapped through G, Z = {Σ λ_i v_i : |λ_i| ≤ 1} with generators
 * v_i = l_i g_i. (The torque envelope is symmetric, so the reaction sign τ_c = −Gτ_w does not
 * change it.)
 *
 * Exact combinatorics, from the facet normals:
 * - generators are first merged into classes of parallel (or opposite) directions — parallel
 *   segments add up to one longer segment, the set is unchanged;
 * - every facet normal is ± the normalised cross product of two classes; a facet with normal c is
 *   the translate Σ_{a∉P} sign(v_aᵀc) v_a of the 2D zonotope (zonogon) of the classes P lying in
 *   the plane ⊥ c — a parallelogram for two classes, a 2m-gon for m coplanar ones;
 * - each vertex is identified by its sign pattern over the classes, so vertices shared by facets
 *   merge exactly (no distance tolerance).
 * Faces list their vertices counter-clockwise seen from outside; `triangles` fans them with the
 * same (outward) orientation for a 3D view.
 */
import type { WheelArray } from './array';

export interface Zonotope {
  kind: 'torque' | 'momentum' | 'custom';
  /** Generator (wheel) count. */
  n: number;
  /** 3n: generator i = limit_i · g_i at [3i .. 3i+2]. */
  generators: Float64Array;
  /** 3V vertex coordinates. */
  vertices: Float64Array;
  /** V·n: vertex v = Σ_i vertexSigns[v·n + i] · generator_i (each ±1; 0 for a zero generator). */
  vertexSigns: Int8Array;
  /** Each facet's vertex indices, counter-clockwise seen from outside. */
  faces: number[][];
  /** 3T: fan triangulation of the faces, counter-clockwise seen from outside. */
  triangles: Uint32Array;
  /** 3F: unit outward facet normals. */
  faceNormals: Float64Array;
  /** F: facet planes n·x = offset (= support(n) > 0). */
  faceOffsets: Float64Array;
  /** Number of edges (Σ facet sizes / 2). */
  edgeCount: number;
}

/** Torque envelope: generators τ_max,i g_i (N·m). */
export function torqueEnvelope(arr: WheelArray): Zonotope {
  return makeZonotope(scaled(arr, arr.maxTorqueNm), arr.n, 'torque');
}

/** Momentum envelope: generators h_max,i g_i (N·m·s), the momentum the wheels can store in body axes. */
export function momentumEnvelope(arr: WheelArray): Zonotope {
  return makeZonotope(scaled(arr, arr.maxMomentumNms), arr.n, 'momentum');
}

function scaled(arr: WheelArray, lim: Float64Array): Float64Array {
  const g = new Float64Array(3 * arr.n);
  for (let i = 0; i < arr.n; i++) for (let c = 0; c < 3; c++) g[3 * i + c] = lim[i] * arr.axes[3 * i + c];
  return g;
}

/** |u × w| below this (unit vectors) counts as parallel. */
const PARALLEL_TOL = 1e-9;
/** |u·c| below this (unit vectors) puts a class in the facet plane ⊥ c. */
const PLANE_TOL = 1e-9;
/** Keeps sign-pattern keys exact integers. */
const MAX_CLASSES = 48;

/**
 * Build the zonotope of `n` generators (3n, any lengths). Generators that do not span 3D give a
 * flat set: no facets, and capacity 0 in every direction. Allocates; call once per array.
 */
export function makeZonotope(generators: Float64Array, n: number, kind: Zonotope['kind'] = 'custom'): Zonotope {
  // --- classes of parallel generators ---------------------------------------------------------
  const classOf = new Int32Array(n).fill(-1);
  const classSign = new Int8Array(n); // generator i = classSign · (its length) · classDir
  const dir: number[] = []; // unit class directions, 3 per class
  const len: number[] = []; // summed lengths
  for (let i = 0; i < n; i++) {
    const x = generators[3 * i], y = generators[3 * i + 1], z = generators[3 * i + 2];
    const L = Math.hypot(x, y, z);
    if (!(L > 0) || !Number.isFinite(L)) continue;
    const ux = x / L, uy = y / L, uz = z / L;
    let found = -1;
    for (let a = 0; a < len.length; a++) {
      const dx = dir[3 * a], dy = dir[3 * a + 1], dz = dir[3 * a + 2];
      if (Math.hypot(uy * dz - uz * dy, uz * dx - ux * dz, ux * dy - uy * dx) <= PARALLEL_TOL) {
        found = a;
        break;
      }
    }
    if (found < 0) {
      found = len.length;
      dir.push(ux, uy, uz);
      len.push(0);
    }
    const s = ux * dir[3 * found] + uy * dir[3 * found + 1] + uz * dir[3 * found + 2] >= 0 ? 1 : -1;
    classOf[i] = found;
    classSign[i] = s;
    len[found] += L;
  }
  const m = Math.min(len.length, MAX_CLASSES);
  const cv = new Float64Array(3 * m); // class generator vectors
  for (let a = 0; a < m; a++) for (let c = 0; c < 3; c++) cv[3 * a + c] = len[a] * dir[3 * a + c];

  // --- facets -------------------------------------------------------------------------------
  const vertexIndex = new Map<number, number>();
  const vertexPatterns: Int8Array[] = []; // class-level sign patterns
  const faces: number[][] = [];
  const normals: number[] = [];
  const offsets: number[] = [];
  const pattern = new Int8Array(m);
  const inPlane: number[] = [];
  const c3 = new Float64Array(3);

  const vertexOf = (p: Int8Array): number => {
    let key = 0;
    for (let a = 0, w = 1; a < m; a++, w *= 2) if (p[a] > 0) key += w;
    let idx = vertexIndex.get(key);
    if (idx === undefined) {
      idx = vertexPatterns.length;
      vertexIndex.set(key, idx);
      vertexPatterns.push(Int8Array.from(p));
    }
    return idx;
  };

  const addFacet = (nx: number, ny: number, nz: number): void => {
    // Out-of-plane classes sit at the sign that maximises n·x; in-plane ones form the zonogon.
    let offset = 0;
    for (let a = 0; a < m; a++) {
      const d = dir[3 * a] * nx + dir[3 * a + 1] * ny + dir[3 * a + 2] * nz;
      if (inPlane.includes(a)) continue;
      pattern[a] = d > 0 ? 1 : -1;
      offset += Math.abs(d) * len[a];
    }
    // In-plane basis e1 (first in-plane class), e2 = n × e1, so (e1, e2, n) is right-handed.
    const a0 = inPlane[0];
    let e1x = dir[3 * a0], e1y = dir[3 * a0 + 1], e1z = dir[3 * a0 + 2];
    const p0 = e1x * nx + e1y * ny + e1z * nz;
    e1x -= p0 * nx;
    e1y -= p0 * ny;
    e1z -= p0 * nz;
    const e1n = Math.hypot(e1x, e1y, e1z);
    e1x /= e1n;
    e1y /= e1n;
    e1z /= e1n;
    const e2x = ny * e1z - nz * e1y, e2y = nz * e1x - nx * e1z, e2z = nx * e1y - ny * e1x;
    // Orient each in-plane class into the angle range [0, π) and sort by angle.
    const order = inPlane.map((a) => {
      const u = dir[3 * a] * e1x + dir[3 * a + 1] * e1y + dir[3 * a + 2] * e1z;
      const v = dir[3 * a] * e2x + dir[3 * a + 1] * e2y + dir[3 * a + 2] * e2z;
      let ang = Math.atan2(v, u);
      let flip = 1;
      if (ang < 0 || ang >= Math.PI - 1e-15) {
        flip = -1;
        ang = ang < 0 ? ang + Math.PI : ang - Math.PI;
      }
      return { a, flip, ang };
    });
    order.sort((p, q) => p.ang - q.ang);
    // Walk the zonogon counter-clockwise: all at −, flip to + one by one, then back to − one by one.
    const mm = order.length;
    const face: number[] = [];
    for (const o of order) pattern[o.a] = -o.flip;
    face.push(vertexOf(pattern));
    for (let s = 0; s < 2 * mm - 1; s++) {
      const o = order[s % mm];
      pattern[o.a] = s < mm ? o.flip : -o.flip;
      face.push(vertexOf(pattern));
    }
    faces.push(face);
    normals.push(nx, ny, nz);
    offsets.push(offset);
  };

  for (let a = 0; a < m; a++) {
    for (let b = a + 1; b < m; b++) {
      c3[0] = dir[3 * a + 1] * dir[3 * b + 2] - dir[3 * a + 2] * dir[3 * b + 1];
      c3[1] = dir[3 * a + 2] * dir[3 * b] - dir[3 * a] * dir[3 * b + 2];
      c3[2] = dir[3 * a] * dir[3 * b + 1] - dir[3 * a + 1] * dir[3 * b];
      const cn = Math.hypot(c3[0], c3[1], c3[2]);
      const nx = c3[0] / cn, ny = c3[1] / cn, nz = c3[2] / cn;
      inPlane.length = 0;
      let outOfPlane = 0;
      for (let e = 0; e < m; e++) {
        const d = Math.abs(dir[3 * e] * nx + dir[3 * e + 1] * ny + dir[3 * e + 2] * nz);
        if (e === a || e === b || d <= PLANE_TOL) inPlane.push(e);
        else outOfPlane++;
      }
      // One facet pair per plane: let the plane's two lowest-numbered classes produce it.
      if (inPlane[0] !== a || inPlane[1] !== b) continue;
      if (outOfPlane === 0) continue; // everything coplanar: flat set, no facets
      addFacet(nx, ny, nz);
      addFacet(-nx, -ny, -nz);
    }
  }

  // --- assemble -------------------------------------------------------------------------------
  const V = vertexPatterns.length;
  const vertices = new Float64Array(3 * V);
  const vertexSigns = new Int8Array(V * n);
  for (let v = 0; v < V; v++) {
    const p = vertexPatterns[v];
    let x = 0, y = 0, z = 0;
    for (let a = 0; a < m; a++) {
      x += p[a] * cv[3 * a];
      y += p[a] * cv[3 * a + 1];
      z += p[a] * cv[3 * a + 2];
    }
    vertices[3 * v] = x;
    vertices[3 * v + 1] = y;
    vertices[3 * v + 2] = z;
    for (let i = 0; i < n; i++) vertexSigns[v * n + i] = classOf[i] >= 0 && classOf[i] < m ? p[classOf[i]] * classSign[i] : 0;
  }
  let triCount = 0;
  let edgeTwice = 0;
  for (const f of faces) {
    triCount += f.length - 2;
    edgeTwice += f.length;
  }
  const triangles = new Uint32Array(3 * triCount);
  let t = 0;
  for (const f of faces) {
    for (let j = 1; j + 1 < f.length; j++) {
      triangles[t++] = f[0];
      triangles[t++] = f[j];
      triangles[t++] = f[j + 1];
    }
  }
  return {
    kind,
    n,
    generators: Float64Array.from(generators.subarray(0, 3 * n)),
    vertices,
    vertexSigns,
    faces,
    triangles,
    faceNormals: Float64Array.from(normals),
    faceOffsets: Float64Array.from(offsets),
    edgeCount: edgeTwice / 2,
  };
}

/** Support function h_Z(d) = max_{x∈Z} dᵀx = Σ_i |v_iᵀ d| (d need not be unit). */
export function envelopeSupport(z: Zonotope, d: ArrayLike<number>): number {
  const g = z.generators;
  const dx = d[0], dy = d[1], dz = d[2];
  let s = 0;
  for (let i = 0; i < z.n; i++) s += Math.abs(g[3 * i] * dx + g[3 * i + 1] * dy + g[3 * i + 2] * dz);
  return s;
}

/**
 * Largest r with r·d/|d| in the envelope: min over facets with nᵀd > 0 of offset / (nᵀd/|d|).
 * 0 for a zero or non-finite d, or a flat zonotope.
 */
export function envelopeCapacity(z: Zonotope, d: ArrayLike<number>): number {
  const f = envelopeBindingFace(z, d);
  if (f < 0) return 0;
  const dn = Math.hypot(d[0], d[1], d[2]);
  const nd = (z.faceNormals[3 * f] * d[0] + z.faceNormals[3 * f + 1] * d[1] + z.faceNormals[3 * f + 2] * d[2]) / dn;
  return z.faceOffsets[f] / nd;
}

/** Index of the facet the ray along d leaves through (−1 when undefined, see envelopeCapacity). */
export function envelopeBindingFace(z: Zonotope, d: ArrayLike<number>): number {
  const dn = Math.hypot(d[0], d[1], d[2]);
  if (!(dn > 0) || !Number.isFinite(dn)) return -1;
  const ux = d[0] / dn, uy = d[1] / dn, uz = d[2] / dn;
  const N = z.faceOffsets.length;
  let best = Infinity;
  let face = -1;
  for (let f = 0; f < N; f++) {
    const nd = z.faceNormals[3 * f] * ux + z.faceNormals[3 * f + 1] * uy + z.faceNormals[3 * f + 2] * uz;
    if (nd <= 1e-15) continue;
    const r = z.faceOffsets[f] / nd;
    if (r < best) {
      best = r;
      face = f;
    }
  }
  return face;
}

/** True when p is inside the envelope or within `tol` (absolute) outside every facet plane. */
export function envelopeContains(z: Zonotope, p: ArrayLike<number>, tol = 0): boolean {
  if (z.faceOffsets.length === 0) return false;
  for (let f = 0; f < z.faceOffsets.length; f++) {
    const d = z.faceNormals[3 * f] * p[0] + z.faceNormals[3 * f + 1] * p[1] + z.faceNormals[3 * f + 2] * p[2];
    if (d > z.faceOffsets[f] + tol) return false;
  }
  return true;
}
