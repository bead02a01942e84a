/**
 * Vertices, polygon faces and an outward triangulation of a 3D zonotope
 * Z = {Σ λ_i v_i : |λ_i| ≤ 1} (the wheel envelopes of Markley, Reynolds, Liu & Lebsock,
 * JGCD 33(5), 2010).
 *
 * Combinatorics from the facet normals (standard zonotope structure; e.g. Ziegler, Lectures on
 * Polytopes, Springer 1995, §7.3):
 * - generators are merged into classes of parallel (or opposite) directions — parallel segments
 *   add up to one longer segment, the set is unchanged;
 * - every facet normal is ± the normalised cross product of two classes; the facet with outward
 *   normal c is the translate Σ_{a∉P} sign(v_aᵀc) v_a of the 2D zonotope (zonogon) of the classes
 *   P lying in the plane ⊥ c: a parallelogram for two classes, a 2m-gon for m coplanar ones;
 * - each vertex is identified by its sign pattern, so vertices shared by facets merge exactly;
 *   its position is Σ_i σ_i v_i over the ORIGINAL generators, so every vertex is exactly a point
 *   of Z, and each facet offset is the exact support value Σ_i |v_iᵀc|.
 * Parallel and coplanar are decided with tolerances. Near-degenerate inputs (axes parallel or
 * coplanar to within ~1e-9) can make those decisions inconsistent between facets, so every result
 * is checked to be a closed, consistently oriented surface (each directed edge once, its reverse
 * once, V − E + F = 2) and rebuilt with the next tolerance pair of a fixed schedule until it is.
 */

export interface Zonotope {
  kind: 'torque' | 'momentum' | 'custom';
  /** Generator (wheel) count. */
  n: number;
  /** 3n: generator i = limit_i · g_i at [3i .. 3i+2]. */
  generators: Float64Array;
  /** 3V vertex coordinates; vertex v = Σ_i vertexSigns[v·n + i] · generator_i. */
  vertices: Float64Array;
  /** V·n sign patterns (±1; 0 for a zero-length generator). */
  vertexSigns: Int8Array;
  /** Each facet's vertex indices, counter-clockwise seen from outside. */
  faces: number[][];
  /** 3T: fan triangulation of the faces, counter-clockwise seen from outside. */
  triangles: Uint32Array;
  /** 3F: unit outward facet normals. */
  faceNormals: Float64Array;
  /** F: facet planes n·x = offset (the support value in direction n). */
  faceOffsets: Float64Array;
  /** Number of edges (Σ facet sizes / 2). */
  edgeCount: number;
  /**
   * True when the faces form a closed, consistently oriented surface (always, short of a
   * pathological input defeating every tolerance pair). A flat set (generators not spanning 3D)
   * is consistent with no faces.
   */
  consistent: boolean;
  /**
   * The tolerances the accepted structure was built with (see the file header). Axes closer than
   * `parallelRad` to parallel act as parallel, and as coplanar within `planeRad`; faces, vertices
   * and capacities are exact up to errors of that relative size (plain rounding otherwise).
   */
  tolerance: { parallelRad: number; planeRad: number };
}

/** (parallel tolerance on |u × w|, plane tolerance on |u·c|), unit vectors; tried in order. */
const TOLERANCES: ReadonlyArray<readonly [number, number]> = [
  [1e-8, 1e-11],
  [1e-10, 1e-13],
  [1e-6, 1e-9],
  [1e-12, 1e-14],
  [1e-4, 1e-7],
  [1e-3, 1e-6],
];
/** Keeps sign-pattern keys exact integers (2^48 < 2^53). */
const MAX_CLASSES = 48;

interface Structure {
  /** Wheel-level sign patterns, one Int8Array(n) per vertex. */
  patterns: Int8Array[];
  faces: number[][];
  /** 3 per face. */
  normals: number[];
}

/**
 * Build the zonotope of `n` generators (3n, any lengths). Generators that do not span 3D give a
 * flat set: no faces, and capacity 0 in every direction. Allocates; call once per array.
 */
export function makeZonotope(generators: Float64Array, n: number, kind: Zonotope['kind'] = 'custom'): Zonotope {
  let chosen: Structure | null = null;
  let first: Structure | null = null;
  let tolerance = { parallelRad: TOLERANCES[0]![0], planeRad: TOLERANCES[0]![1] };
  for (const [parTol, planeTol] of TOLERANCES) {
    const st = buildStructure(generators, n, parTol, planeTol);
    first ??= st;
    if (isClosedSurface(st)) {
      chosen = st;
      tolerance = { parallelRad: parTol, planeRad: planeTol };
      break;
    }
  }
  const consistent = chosen !== null;
  const st = chosen ?? (first as Structure);
  const V = st.patterns.length;
  const vertices = new Float64Array(3 * V);
  const vertexSigns = new Int8Array(V * n);
  for (let v = 0; v < V; v++) {
    const p = st.patterns[v]!;
    let x = 0,
      y = 0,
      z = 0;
    for (let i = 0; i < n; i++) {
      x += p[i]! * generators[3 * i]!;
      y += p[i]! * generators[3 * i + 1]!;
      z += p[i]! * generators[3 * i + 2]!;
      vertexSigns[v * n + i] = p[i]!;
    }
    vertices[3 * v] = x;
    vertices[3 * v + 1] = y;
    vertices[3 * v + 2] = z;
  }
  const F = st.faces.length;
  const faceNormals = Float64Array.from(st.normals);
  const faceOffsets = new Float64Array(F);
  let triCount = 0,
    edgeTwice = 0;
  for (let f = 0; f < F; f++) {
    const nx = faceNormals[3 * f]!,
      ny = faceNormals[3 * f + 1]!,
      nz = faceNormals[3 * f + 2]!;
    let s = 0;
    for (let i = 0; i < n; i++) s += Math.abs(generators[3 * i]! * nx + generators[3 * i + 1]! * ny + generators[3 * i + 2]! * nz);
    faceOffsets[f] = s;
    triCount += st.faces[f]!.length - 2;
    edgeTwice += st.faces[f]!.length;
  }
  const triangles = new Uint32Array(3 * triCount);
  let t = 0;
  for (const face of st.faces) {
    for (let j = 1; j + 1 < face.length; j++) {
      triangles[t++] = face[0]!;
      triangles[t++] = face[j]!;
      triangles[t++] = face[j + 1]!;
    }
  }
  return {
    kind,
    n,
    generators: Float64Array.from(generators.subarray(0, 3 * n)),
    vertices,
    vertexSigns,
    faces: st.faces,
    triangles,
    faceNormals,
    faceOffsets,
    edgeCount: edgeTwice / 2,
    consistent,
    tolerance,
  };
}

/** Each directed edge exactly once with its reverse present, and V − E + F = 2 (or no faces). */
function isClosedSurface(st: Structure): boolean {
  const F = st.faces.length;
  if (F === 0) return true;
  const V = st.patterns.length;
  const seen = new Set<number>();
  for (const f of st.faces) {
    if (f.length < 3) return false;
    for (let j = 0; j < f.length; j++) {
      const u = f[j]!,
        v = f[(j + 1) % f.length]!;
      const key = u * V + v;
      if (u === v || seen.has(key)) return false;
      seen.add(key);
    }
  }
  for (const key of seen) {
    const u = Math.floor(key / V),
      v = key % V;
    if (!seen.has(v * V + u)) return false;
  }
  return V - seen.size / 2 + F === 2;
}

function buildStructure(gen: Float64Array, n: number, parTol: number, planeTol: number): Structure {
  const b = new StructureBuilder(parallelClasses(gen, n, parTol), n);
  b.addFacetPairs(planeTol);
  return { patterns: b.patterns, faces: b.faces, normals: b.normals };
}

/** Generators merged into classes of parallel (or opposite) directions. */
interface GeneratorClasses {
  /** Class of each generator (−1: zero length or beyond MAX_CLASSES). */
  classOf: Int32Array;
  /** g_i = classSign · |g_i| · classDir. */
  classSign: Int8Array;
  /** 3 per class: its unit direction (the first member's). */
  dir: number[];
}

function parallelClasses(gen: Float64Array, n: number, parTol: number): GeneratorClasses {
  const classOf = new Int32Array(n).fill(-1);
  const classSign = new Int8Array(n);
  const dir: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = gen[3 * i]!,
      y = gen[3 * i + 1]!,
      z = gen[3 * i + 2]!;
    const L = Math.hypot(x, y, z);
    if (!(L > 0) || !Number.isFinite(L)) continue;
    const ux = x / L,
      uy = y / L,
      uz = z / L;
    let found = -1;
    for (let a = 0; a < dir.length / 3; a++) {
      const dx = dir[3 * a]!,
        dy = dir[3 * a + 1]!,
        dz = dir[3 * a + 2]!;
      if (Math.hypot(uy * dz - uz * dy, uz * dx - ux * dz, ux * dy - uy * dx) <= parTol) {
        found = a;
        break;
      }
    }
    if (found < 0) {
      if (dir.length / 3 >= MAX_CLASSES) continue;
      found = dir.length / 3;
      dir.push(ux, uy, uz);
    }
    classOf[i] = found;
    classSign[i] = ux * dir[3 * found]! + uy * dir[3 * found + 1]! + uz * dir[3 * found + 2]! >= 0 ? 1 : -1;
  }
  return { classOf, classSign, dir };
}

/** The facets of one tolerance pair, built plane by plane; vertices merged by their sign pattern. */
class StructureBuilder {
  readonly patterns: Int8Array[] = [];
  readonly faces: number[][] = [];
  readonly normals: number[] = [];
  private readonly index = new Map<number, number>();
  private readonly m: number;
  /** Class-level sign pattern of the vertex being walked. */
  private readonly pattern: Int8Array;
  /** Classes in the current facet's plane, and a flag per class. */
  private readonly inPlane: number[] = [];
  private readonly isIn: Uint8Array;

  constructor(
    private readonly cls: GeneratorClasses,
    private readonly n: number,
  ) {
    this.m = cls.dir.length / 3;
    this.pattern = new Int8Array(this.m);
    this.isIn = new Uint8Array(this.m);
  }

  /** For every plane spanned by two classes, the facet pair ±c (unless every class lies in it). */
  addFacetPairs(planeTol: number): void {
    const { dir } = this.cls;
    const { m, inPlane, isIn } = this;
    for (let a = 0; a < m; a++) {
      for (let b = a + 1; b < m; b++) {
        const cx = dir[3 * a + 1]! * dir[3 * b + 2]! - dir[3 * a + 2]! * dir[3 * b + 1]!;
        const cy = dir[3 * a + 2]! * dir[3 * b]! - dir[3 * a]! * dir[3 * b + 2]!;
        const cz = dir[3 * a]! * dir[3 * b + 1]! - dir[3 * a + 1]! * dir[3 * b]!;
        const cn = Math.hypot(cx, cy, cz);
        const nx = cx / cn,
          ny = cy / cn,
          nz = cz / cn;
        inPlane.length = 0;
        isIn.fill(0);
        for (let e = 0; e < m; e++) {
          const d = Math.abs(dir[3 * e]! * nx + dir[3 * e + 1]! * ny + dir[3 * e + 2]! * nz);
          if (e === a || e === b || d <= planeTol) {
            inPlane.push(e);
            isIn[e] = 1;
          }
        }
        // One facet pair per plane, produced by the plane's two lowest-numbered classes.
        if (inPlane[0] !== a || inPlane[1] !== b) continue;
        if (inPlane.length === m) continue; // everything coplanar: a flat set has no facets
        this.addFacet(nx, ny, nz);
        this.addFacet(-nx, -ny, -nz);
      }
    }
  }

  /** The vertex of the current class-level pattern (created on first sight). */
  private vertexOf(): number {
    const { classOf, classSign } = this.cls;
    const { m, n, pattern } = this;
    let key = 0;
    for (let a = 0, w = 1; a < m; a++, w *= 2) if (pattern[a]! > 0) key += w;
    let idx = this.index.get(key);
    if (idx === undefined) {
      idx = this.patterns.length;
      this.index.set(key, idx);
      const p = new Int8Array(n);
      for (let i = 0; i < n; i++) p[i] = classOf[i]! >= 0 ? pattern[classOf[i]!]! * classSign[i]! : 0;
      this.patterns.push(p);
    }
    return idx;
  }

  /** The facet with outward normal (nx, ny, nz): the zonogon of the in-plane classes, translated by the others' signs. */
  private addFacet(nx: number, ny: number, nz: number): void {
    const { dir } = this.cls;
    const { m, pattern, isIn } = this;
    for (let a = 0; a < m; a++) {
      if (isIn[a]) continue;
      pattern[a] = dir[3 * a]! * nx + dir[3 * a + 1]! * ny + dir[3 * a + 2]! * nz > 0 ? 1 : -1;
    }
    const order = this.zonogonOrder(nx, ny, nz);
    // Start with every in-plane class at −, switch them to + one by one, then back to − one by one.
    const mm = order.length;
    const face: number[] = [];
    for (const o of order) pattern[o.a] = -o.flip;
    face.push(this.vertexOf());
    for (let s = 0; s < 2 * mm - 1; s++) {
      const o = order[s % mm]!;
      pattern[o.a] = s < mm ? o.flip : -o.flip;
      face.push(this.vertexOf());
    }
    this.faces.push(face);
    this.normals.push(nx, ny, nz);
  }

  /**
   * The in-plane classes oriented into angles [0, π) about the normal and sorted, so that the
   * zonogon walk turns monotonically, counter-clockwise seen from outside.
   */
  private zonogonOrder(nx: number, ny: number, nz: number): { a: number; flip: number; ang: number }[] {
    const { dir } = this.cls;
    // In-plane basis e1 (first in-plane class, projected), e2 = n × e1: (e1, e2, n) right-handed,
    // so increasing angle in (e1, e2) is counter-clockwise seen from outside.
    const a0 = this.inPlane[0]!;
    let e1x = dir[3 * a0]!,
      e1y = dir[3 * a0 + 1]!,
      e1z = dir[3 * a0 + 2]!;
    const p0 = e1x * nx + e1y * ny + e1z * nz;
    e1x -= p0 * nx;
    e1y -= p0 * ny;
    e1z -= p0 * nz;
    const e1n = Math.hypot(e1x, e1y, e1z);
    e1x /= e1n;
    e1y /= e1n;
    e1z /= e1n;
    const e2x = ny * e1z - nz * e1y,
      e2y = nz * e1x - nx * e1z,
      e2z = nx * e1y - ny * e1x;
    const order = this.inPlane.map((a) => {
      const u = dir[3 * a]! * e1x + dir[3 * a + 1]! * e1y + dir[3 * a + 2]! * e1z;
      const v = dir[3 * a]! * e2x + dir[3 * a + 1]! * e2y + dir[3 * a + 2]! * e2z;
      let ang = Math.atan2(v, u);
      let flip = 1;
      if (ang < 0 || ang >= Math.PI) {
        flip = -1;
        ang = ang < 0 ? ang + Math.PI : ang - Math.PI;
      }
      return { a, flip, ang };
    });
    order.sort((p, q) => p.ang - q.ang);
    return order;
  }
}
