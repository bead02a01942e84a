/**
 * Whole-attitude search when cones sit on several body axes: A* over a lattice of attitudes
 * (grid direction of the primary axis b, roll bin about b), every edge an eigenaxis rotation
 * checked exactly against every cone on every axis (edge.ts; no sampling, so no resolution to
 * choose for the edge test).
 *
 * Method family: discretised constrained attitude pathfinding (Kjellberg & Lightsey, JGCD
 * 36(5):1301–1309, 2013, and JGCD 39(3):713–718, 2016 — the latter searches a discretised
 * attitude space), here as the sphere grid crossed with roll bins; A* (Hart, Nilsson & Raphael, 1968).
 *
 * Lattice: node (i, r) is the attitude Q_i ⊗ rot(b, r Δψ), Δψ = 2π / rollBins, where Q_i =
 * shortestArc(u0 → d_i) ⊗ q0 carries the start's b direction u0 to grid direction d_i. Edges:
 * - roll: (i, r) → (i, r ± 1), a rotation by Δψ about b (b stays on d_i);
 * - move: (i, r) → (j, r'), j a grid neighbour: the great-circle turn d_i → d_j would leave the
 *   roll at r Δψ + δ_ij (δ_ij from the grids' frames), so r' is the nearest bin and the edge is
 *   the eigenaxis rotation between the two lattice attitudes (b then deviates from the arc by
 *   at most half a roll bin's worth of coupling);
 * - the start joins (j, r ∈ {−1, 0, 1}) for grid nodes j within two spacings of u0, the goal is
 *   joined from every lattice attitude whose b lies within two spacings of the goal's b.
 * Cost = rotation angle of each edge; heuristic = rotation angle to the goal attitude (a metric
 * on SO(3), so admissible and consistent). The found chain of attitudes is shortened greedily
 * (from each kept attitude, the farthest later one whose eigenaxis rotation is clear).
 */
import { qMultiply } from '../math/rotation';
import type { PlanningCone } from './cone';
import { rotationAngle, rotationEdgeClear, rotateInto, shortcutChain, shortestArc } from './edge';
import { type GeodesicGrid, nodesWithin } from './geodesic';
import { MinHeap } from './heap';

export interface LatticeProblem {
  q0: Float64Array;
  q1: Float64Array;
  /** Distinct unit body axes the cones sit on. */
  axes: readonly Float64Array[];
  /** Index in `axes` of the primary axis b (the one on the grid). */
  primary: number;
  cones: readonly PlanningCone[];
  grid: GeodesicGrid;
  rollBins: number;
}

export type LatticeResult = { found: true; attitudes: Float64Array[]; expanded: number } | { found: false; expanded: number };

export const DEFAULT_LATTICE_LEVEL = 3;
export const DEFAULT_ROLL_BINS = 36;

export function searchLattice(p: LatticeProblem): LatticeResult {
  const { grid, rollBins: R, axes, cones } = p;
  const b = axes[p.primary]!;
  const N = grid.n,
    M = N * R,
    S = M,
    G = M + 1;
  const u0 = new Float64Array(3),
    u1 = new Float64Array(3);
  rotateInto(u0, 0, p.q0, b);
  rotateInto(u1, 0, p.q1, b);
  const frames = nodeFrames(grid, u0, p.q0);
  const dpsi = (2 * Math.PI) / R;
  const rolls = new Float64Array(4 * R);
  for (let r = 0; r < R; r++) {
    const s = Math.sin(0.5 * r * dpsi);
    rolls.set([b[0]! * s, b[1]! * s, b[2]! * s, Math.cos(0.5 * r * dpsi)], 4 * r);
  }
  const qa = new Float64Array(4),
    qb = new Float64Array(4);
  const attitude = (out: Float64Array, id: number): Float64Array => {
    if (id === S) return (out.set(p.q0), out);
    if (id === G) return (out.set(p.q1), out);
    const i = (id / R) | 0,
      r = id - i * R;
    return qMultiply(out, frames.subarray(4 * i, 4 * i + 4), rolls.subarray(4 * r, 4 * r + 4));
  };
  const reach = 2 * grid.maxSpacingRad;
  const nearGoal = new Uint8Array(N);
  for (const i of nodesWithin(grid, u1, reach)) nearGoal[i] = 1;
  const offsets = new Float64Array(grid.nbr.length).fill(NaN);
  const g = new Float64Array(M + 2).fill(Infinity),
    parent = new Int32Array(M + 2).fill(-1),
    closed = new Uint8Array(M + 2);
  const heap = new MinHeap(4096);
  const tryEdge = (u: number, v: number) => {
    if (closed[v]) return;
    attitude(qb, v);
    const w = rotationAngle(qa, qb);
    if (g[u]! + w >= g[v]! || !rotationEdgeClear(qa, qb, axes, cones)) return;
    g[v] = g[u]! + w;
    parent[v] = u;
    heap.push(g[v]! + rotationAngle(qb, p.q1), v);
  };
  g[S] = 0;
  attitude(qa, S);
  for (const j of nodesWithin(grid, u0, reach)) for (const r of [R - 1, 0, 1]) tryEdge(S, j * R + (r % R));
  let expanded = 0;
  for (let u = heap.pop(); u >= 0; u = heap.pop()) {
    if (closed[u]) continue;
    closed[u] = 1;
    if (u === G) break;
    expanded++;
    attitude(qa, u);
    const i = (u / R) | 0,
      r = u - i * R;
    if (nearGoal[i]) tryEdge(u, G);
    tryEdge(u, i * R + ((r + 1) % R));
    tryEdge(u, i * R + ((r + R - 1) % R));
    for (let e = grid.start[i]!; e < grid.start[i + 1]!; e++) {
      const j = grid.nbr[e]!;
      if (Number.isNaN(offsets[e]!)) offsets[e] = rollOffset(grid, frames, b, i, j);
      const rj = (((r + Math.round(offsets[e]! / dpsi)) % R) + R) % R;
      tryEdge(u, j * R + rj);
    }
  }
  if (!closed[G]) return { found: false, expanded };
  const chain: Float64Array[] = [];
  for (let v = G; v >= 0; v = parent[v]!) chain.push(attitude(new Float64Array(4), v));
  chain.reverse();
  return { found: true, attitudes: shortcutChain(chain, axes, cones), expanded };
}

/** Q_i = shortestArc(u0 → d_i) ⊗ q0 for every grid node, 4 numbers each. */
function nodeFrames(grid: GeodesicGrid, u0: Float64Array, q0: Float64Array): Float64Array {
  const out = new Float64Array(4 * grid.n),
    arc = new Float64Array(4),
    q = new Float64Array(4);
  for (let i = 0; i < grid.n; i++) {
    shortestArc(arc, u0, grid.xyz.subarray(3 * i, 3 * i + 3));
    out.set(qMultiply(q, arc, q0), 4 * i);
  }
  return out;
}

/** δ_ij: the roll about b, relative to Q_j, left after turning Q_i along the arc d_i → d_j. */
function rollOffset(grid: GeodesicGrid, frames: Float64Array, b: Float64Array, i: number, j: number): number {
  const arc = shortestArc(new Float64Array(4), grid.xyz.subarray(3 * i, 3 * i + 3), grid.xyz.subarray(3 * j, 3 * j + 3));
  const moved = qMultiply(new Float64Array(4), arc, frames.subarray(4 * i, 4 * i + 4));
  // p = Q_j* ⊗ moved is a rotation about b: angle 2 atan2(p_v · b, p_w).
  const qj = frames.subarray(4 * j, 4 * j + 4);
  const conj = Float64Array.of(-qj[0]!, -qj[1]!, -qj[2]!, qj[3]!);
  const pq = qMultiply(new Float64Array(4), conj, moved);
  return 2 * Math.atan2(pq[0]! * b[0]! + pq[1]! * b[1]! + pq[2]! * b[2]!, pq[3]!);
}
