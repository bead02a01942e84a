/**
 * The wheel momentum envelope in the inset: the engine's zonotope mesh drawn as given (vertices
 * copied, triangles kept, only a uniform display scale), plus how close the total momentum is to
 * its boundary.
 */
import {
  BufferAttribute,
  BufferGeometry,
  DoubleSide,
  EdgesGeometry,
  Group,
  LineBasicMaterial,
  LineSegments,
  Mesh,
  MeshBasicMaterial,
} from 'three';
import type { MomentumEnvelopeMesh } from './types';
import { COLORS, SIZES } from './style';

/** Scene units per N·m·s so that the farthest envelope vertex sits at `radius`. */
export function envelopeDisplayScale(env: MomentumEnvelopeMesh, radius: number = SIZES.insetEnvelopeRadius): number {
  let r2 = 0;
  const v = env.vertices;
  for (let i = 0; i + 2 < v.length; i += 3) r2 = Math.max(r2, v[i]! * v[i]! + v[i + 1]! * v[i + 1]! + v[i + 2]! * v[i + 2]!);
  return r2 > 0 && Number.isFinite(r2) ? radius / Math.sqrt(r2) : 1;
}

/**
 * Envelope geometry in N·m·s (body axes): positions are the input vertices, the index is the
 * input triangles. The display scale is applied by the Mesh's `scale`, not baked in, so the
 * drawn surface is exactly the engine's.
 */
function envelopeGeometry(env: MomentumEnvelopeMesh): BufferGeometry {
  const g = new BufferGeometry();
  g.setAttribute('position', new BufferAttribute(Float32Array.from(env.vertices), 3));
  g.setIndex(new BufferAttribute(Uint32Array.from(env.triangles), 1));
  g.computeVertexNormals();
  g.computeBoundingSphere();
  return g;
}

export interface EnvelopeObject {
  group: Group;
  mesh: Mesh;
  edges: LineSegments;
}

/**
 * Translucent faces plus the zonotope's edges (EdgesGeometry with a 1° crease threshold drops the
 * diagonals that split each planar parallelogram face into triangles).
 */
export function buildEnvelopeObject(env: MomentumEnvelopeMesh, scale: number): EnvelopeObject {
  const geom = envelopeGeometry(env);
  const mesh = new Mesh(
    geom,
    new MeshBasicMaterial({ color: COLORS.envelope, transparent: true, opacity: 0.13, depthWrite: false, side: DoubleSide }),
  );
  mesh.name = 'momentum-envelope';
  const edges = new LineSegments(
    new EdgesGeometry(geom, 1),
    new LineBasicMaterial({ color: COLORS.envelopeEdge, transparent: true, opacity: 0.45, depthWrite: false }),
  );
  edges.name = 'momentum-envelope-edges';
  const group = new Group();
  group.scale.setScalar(scale);
  group.add(mesh, edges);
  return { group, mesh, edges };
}

/**
 * Fraction of the envelope used by the total momentum H (body axes, N·m·s):
 * f = |H| / capacity(H/|H|). 0 when H = 0; +∞ when H ≠ 0 and the capacity is not a positive
 * finite number (no margin can be claimed). `dirScratch` receives H/|H|.
 */
export function momentumFraction(H: ArrayLike<number>, capacity: (dirBody: Float64Array) => number, dirScratch: Float64Array): number {
  const n = Math.hypot(H[0]!, H[1]!, H[2]!);
  if (!(n > 0)) return 0;
  dirScratch[0] = H[0]! / n;
  dirScratch[1] = H[1]! / n;
  dirScratch[2] = H[2]! / n;
  const cap = capacity(dirScratch);
  return cap > 0 && Number.isFinite(cap) ? n / cap : Number.POSITIVE_INFINITY;
}
