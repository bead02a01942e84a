/**
 * planConstrainedSlew: a rest-to-rest slew from qStart to qTarget that keeps every keep-out and
 * keep-in cone, as a short chain of eigenaxis legs each timed within the wheel envelopes by the
 * existing segment planner (plan/segment.ts, unchanged).
 *
 * Steps:
 * 1. Constraints whose window has not ended by the slew start are in force for the whole slew;
 *    moving directions (Sun, station …) are FROZEN at the slew start for the search (the final
 *    check below, and the lead's re-check of flown runs, use the moving directions).
 * 2. Start or target inside a cone (margin < 0, frozen directions): verdict, no search.
 * 3. The shortest eigenaxis slew clear of every cone (exact closed-form test): returned as the
 *    one leg, unchanged.
 * 4. Two searches (search: 'auto'), the faster-flying result kept:
 *    - single axis: the primary axis's path on the sphere (axisSearch.ts), legs along its arcs and
 *      a final roll about the axis (legs.ts), or that chain with legs merged where the exact test
 *      allows; with no path at gridLevel the grid is refined up to maxGridLevel first. With cones
 *      on other axes too it is kept only if every leg clears every cone on every axis;
 *    - whole attitude: the (direction, roll) lattice (lattice.ts), every edge tested against every
 *      cone on every axis.
 * 5. Legs timed by planCheckedSegment; the legs are sampled (no step turns the body more than
 *    CHECK_STEP, see checkStepRad) and checked by check.ts, giving minimumMarginRad.
 * Search cones carry a clearance of PLAN_CLEARANCE_RAD beyond their margin, so that rounding in
 * the final check cannot show a path that touches a cone as violating it.
 */
import { fail, type Issue, IssueList, ok, type Result } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import type { Quat } from '../math/rotation';
import type { InfeasibleSegment, PlanLimits } from '../plan/types';
import { checkLimits, readInertia, readQuat, readVec3 } from '../plan/validate';
import { DEG_PER_RAD, RAD_PER_DEG } from '../units';
import { searchAxisPath } from './axisSearch';
import { checkPreparedHistory } from './check';
import { makeCone, type PlanningCone } from './cone';
import { MAX_AXES, rotationEdgeClear, shortcutChain } from './edge';
import { DEFAULT_GRID_LEVEL, geodesicGrid, MAX_GRID_LEVEL } from './geodesic';
import { DEFAULT_LATTICE_LEVEL, DEFAULT_ROLL_BINS, searchLattice } from './lattice';
import { axisDirection, axisTravel, chainFromWaypoints, pruneChain, sampleLegs, timeChain, type TimedLeg } from './legs';
import { sourceAt, thresholdAngle } from './source';
import type { AttitudeConstraint, HistoryCheck, PreparedConstraint } from './types';
import { attitudeViolations, prepareConstraints } from './validate';

/** Extra clearance of every search cone beyond its margin (rad): 1e-6 rad ≈ 0.2″. */
export const PLAN_CLEARANCE_RAD = 1e-6;

export interface ConstrainedSlewInput {
  /** Start attitude qInertialFromBody [x, y, z, w], at rest. */
  qStart: ArrayLike<number>;
  /** Target attitude, at rest. */
  qTarget: ArrayLike<number>;
  /** Inertia J, 9 numbers column-major (kg·m²). */
  inertia: ArrayLike<number>;
  /** Wheel momentum in body axes at the start (N·m·s). */
  wheelMomentumBody: ArrayLike<number>;
  constraints: readonly AttitudeConstraint[];
  /** Plan time of the slew start (s): directions are frozen here; default 0. */
  startTimeS?: number;
  /** Grid level of the single-axis search (0 … 7), default 5 (≈ 2.2° mean spacing). */
  gridLevel?: number;
  /**
   * Finest level the single-axis search refines to when it finds no path (gridLevel … 7);
   * default gridLevel + 1 (6, ≈ 1.1°, by default).
   */
  maxGridLevel?: number;
  /** Grid level of the lattice search (0 … 5), default 3 (≈ 8.6°). */
  latticeGridLevel?: number;
  /**
   * Single-axis smoothing: 'fewest-legs' (default) keeps the fewest corners (each leg is a
   * rest-to-rest stop); 'grid-resolved' also splits every corner turning by more than two grid
   * spacings, so the axis path approaches the true shortest path as the grid is refined. With
   * search 'auto' the faster of that path and the lattice path is still the one returned.
   */
  smoothing?: 'fewest-legs' | 'grid-resolved';
  /** Roll bins of the lattice (4 … 360), default 36 (10°). */
  rollBins?: number;
  /** The lattice's primary axis (body, non-zero); default the axis of the first constraint in force. */
  primaryAxisBody?: ArrayLike<number>;
  /**
   * 'auto' (default): both searches, the faster-flying path kept; 'axis': the single-axis path
   * only (legs along its arcs, then the roll); 'lattice': the whole-attitude lattice only.
   */
  search?: 'auto' | 'axis' | 'lattice';
}

export interface ConstrainedSlewPlan {
  status: 'planned';
  /** 'direct': the shortest slew was clear; 'axis': single-axis path; 'lattice': whole-attitude search. */
  search: 'direct' | 'axis' | 'lattice';
  legs: TimedLeg[];
  /** Attitudes at the leg ends: qStart, …, qTarget (sign as the legs fly them). */
  attitudes: Float64Array[];
  /** Inertial direction of the primary axis at each of those attitudes. */
  waypoints: Float64Array[];
  primaryAxisBody: Float64Array;
  totalTimeS: number;
  /** Time of the unconstrained shortest slew (NaN when the wheels cannot fly it). */
  unconstrainedTimeS: number;
  extraTimeS: number;
  /** Angle the primary axis travels on the sphere along the legs (rad). */
  pathAngleRad: number;
  unconstrainedPathAngleRad: number;
  /** Sum of the legs' rotation angles (rad) and the unconstrained slew's angle. */
  rotationAngleRad: number;
  unconstrainedRotationAngleRad: number;
  /** Smallest margin over the sampled legs with moving directions and windows (check.ts). */
  minimumMarginRad: number;
  check: HistoryCheck;
  frozenAtS: number;
  gridLevel: number;
  gridSpacingRad: number;
  rollBins?: number;
  notes: string[];
}

export type ConstrainedSlewVerdict =
  | ConstrainedSlewPlan
  | { status: 'endpoint-violation'; which: 'start' | 'target'; violations: Issue[]; message: string }
  | { status: 'no-path'; search: 'axis' | 'lattice'; gridLevel: number; gridSpacingRad: number; expanded: number; message: string }
  | { status: 'leg-infeasible'; leg: number; verdict: InfeasibleSegment; message: string };

interface Setup {
  q0: Quat;
  q1: Quat;
  J: Mat3;
  h0: Vec3;
  active: PreparedConstraint[];
  all: PreparedConstraint[];
  t0: number;
  axes: Float64Array[];
  primary: number;
  cones: PlanningCone[];
}

export function planConstrainedSlew(input: ConstrainedSlewInput, limits: PlanLimits): Result<ConstrainedSlewVerdict> {
  const set = readInput(input, limits);
  if (!set.ok) return set;
  const s = set.value;
  for (const [which, q] of [
    ['start', s.q0],
    ['target', s.q1],
  ] as const) {
    const v = attitudeViolations(q, s.active.map(openWindow), s.t0, which === 'start' ? 'qStart' : 'qTarget');
    if (v.length) {
      return ok({
        status: 'endpoint-violation',
        which,
        violations: v,
        message: `The ${which} attitude itself violates ${v.length} constraint(s) (directions frozen at t = ${s.t0} s).`,
      });
    }
  }
  const notes: string[] = [];
  if (rotationEdgeClear(s.q0, s.q1, s.axes, s.cones))
    return ok(finish(s, [s.q0, s.q1], 'direct', limits, input.gridLevel ?? DEFAULT_GRID_LEVEL, undefined, notes));
  const mode = input.search ?? 'auto';
  const axis = mode === 'lattice' ? null : axisCandidate(input, s, limits, notes);
  if (axis && !axis.found && axis.verdict) return ok(axis.verdict);
  if (axis && !axis.found && mode === 'axis') {
    const v = noPath('axis', axis.level, axis.expanded);
    if (v.status === 'no-path')
      v.message = "The single-axis path crosses a cone on another body axis; search 'auto' or 'lattice' plans the whole attitude.";
    return ok(v);
  }
  const lattice = mode === 'axis' ? null : latticeCandidate(input, s);
  const fromAxis = axis?.found ? axis : null;
  if (!fromAxis && !lattice?.found) {
    const l = lattice!;
    return ok(noPath('lattice', l.level, l.expanded, l.rollBins));
  }
  // Both found: fly the faster (rest-to-rest legs pay a stop each).
  if (fromAxis && lattice?.found) {
    const ta = timeChain(fromAxis.chain, s.J, s.h0, limits),
      tl = timeChain(lattice.chain, s.J, s.h0, limits);
    if (tl.ok && (!ta.ok || tl.totalS < ta.totalS)) {
      notes.push(
        `The whole-attitude lattice path (${lattice.chain.length - 1} legs) flies faster than the single-axis path (${fromAxis.chain.length - 1} legs, ${ta.ok ? ta.totalS.toFixed(1) + ' s' : 'infeasible'}).`,
      );
      return ok(finish(s, lattice.chain, 'lattice', limits, lattice.level, lattice.rollBins, notes));
    }
    return ok(finish(s, fromAxis.chain, 'axis', limits, fromAxis.level, undefined, notes));
  }
  if (fromAxis) return ok(finish(s, fromAxis.chain, 'axis', limits, fromAxis.level, undefined, notes));
  const l = lattice as { chain: Float64Array[]; level: number; rollBins: number };
  return ok(finish(s, l.chain, 'lattice', limits, l.level, l.rollBins, notes));
}

type AxisCandidate =
  | { found: true; chain: Float64Array[]; level: number }
  | { found: false; level: number; expanded: number; verdict?: ConstrainedSlewVerdict };

/**
 * The single-axis path of the primary axis (refining the grid up to maxGridLevel when it finds
 * none), as an attitude chain kept only if every leg clears every cone on every axis. `verdict`
 * is set when no other search can help (a blocked endpoint, or cones on one axis only).
 */
function axisCandidate(input: ConstrainedSlewInput, s: Setup, limits: PlanLimits, notes: string[]): AxisCandidate {
  const b = s.axes[s.primary]!;
  const mine = s.cones.filter((c) => c.axis === s.primary);
  let level = input.gridLevel ?? DEFAULT_GRID_LEVEL;
  const resolved = input.smoothing === 'grid-resolved';
  let r = searchAxisPath(axisDirection(s.q0, b), axisDirection(s.q1, b), mine, geodesicGrid(level), resolved);
  const top = input.maxGridLevel ?? Math.min(MAX_GRID_LEVEL, level + 1);
  while (!r.found && r.reason === 'no-path' && level < top) {
    level++;
    r = searchAxisPath(axisDirection(s.q0, b), axisDirection(s.q1, b), mine, geodesicGrid(level), resolved);
  }
  if (!r.found) {
    const final = s.axes.length === 1 || r.reason !== 'no-path';
    const v = noPath('axis', level, r.expanded);
    if (r.reason !== 'no-path' && v.status === 'no-path') {
      const which = r.reason === 'start-blocked' ? 'start' : 'target';
      v.message = `The ${which} direction of the primary axis lies within the planner's clearance (${PLAN_CLEARANCE_RAD} rad) of a cone's edge: no path can leave or reach it.`;
    }
    return { found: false, level, expanded: r.expanded, ...(final ? { verdict: v } : {}) };
  }
  const c = chainFromWaypoints(s.q0, s.q1, r.waypoints);
  if (!chainClear(c, s)) {
    notes.push('The single-axis path of the primary axis crosses a cone on another axis.');
    return { found: false, level, expanded: r.expanded };
  }
  return { found: true, chain: resolved ? c : faster([c, shortcutChain(c, s.axes, s.cones)], s, limits, notes), level };
}

function latticeCandidate(input: ConstrainedSlewInput, s: Setup) {
  const level = input.latticeGridLevel ?? DEFAULT_LATTICE_LEVEL;
  const rollBins = input.rollBins ?? DEFAULT_ROLL_BINS;
  const r = searchLattice({ q0: s.q0, q1: s.q1, axes: s.axes, primary: s.primary, cones: s.cones, grid: geodesicGrid(level), rollBins });
  return r.found
    ? { found: true as const, chain: pruneChain(r.attitudes), level, rollBins }
    : { found: false as const, level, rollBins, expanded: r.expanded };
}

function noPath(search: 'axis' | 'lattice', level: number, expanded: number, rollBins?: number): ConstrainedSlewVerdict {
  const g = geodesicGrid(level);
  const res = `grid level ${level} (mean spacing ${(g.meanSpacingRad * DEG_PER_RAD).toFixed(2)}°${rollBins ? `, ${rollBins} roll bins` : ''})`;
  return {
    status: 'no-path',
    search,
    gridLevel: level,
    gridSpacingRad: g.meanSpacingRad,
    expanded,
    message: `No path clear of the cones at this grid resolution: ${res}. A corridor narrower than about one spacing can be missed; a finer level may find one.`,
  };
}

/** The constraint with its window opened to the whole slew (constraints in force throughout). */
function openWindow(c: PreparedConstraint): PreparedConstraint {
  return { ...c, windowStartS: -Infinity, windowEndS: Infinity };
}

/**
 * The faster of the waypoint chain (arcs, then the roll about b) and its shortcut (legs merged
 * where the exact test allows, e.g. the roll folded into the last arc): rest-to-rest legs pay a
 * stop each, so fewer legs usually fly faster even when the axis travels a little further.
 */
function faster(chains: Float64Array[][], s: Setup, limits: PlanLimits, notes: string[]): Float64Array[] {
  const arc = chains[0]!,
    cut = chains[1]!;
  if (cut.length >= arc.length) return arc;
  const ta = timeChain(arc, s.J, s.h0, limits),
    tc = timeChain(cut, s.J, s.h0, limits);
  if (tc.ok && (!ta.ok || tc.totalS < ta.totalS)) {
    notes.push(
      `Legs merged where every cone stays clear: ${cut.length - 1} legs instead of ${arc.length - 1} (arcs and a final roll), faster to fly.`,
    );
    return cut;
  }
  return arc;
}

function chainClear(chain: readonly Float64Array[], s: Setup): boolean {
  for (let k = 0; k + 1 < chain.length; k++) if (!rotationEdgeClear(chain[k]!, chain[k + 1]!, s.axes, s.cones)) return false;
  return true;
}

/** Sampling step of the final check: min(0.25°, smallest cone threshold / 20). */
function checkStepRad(cs: readonly PlanningCone[]): number {
  let step = 0.25 * RAD_PER_DEG;
  for (const c of cs) if (c.thresholdRad > 0) step = Math.min(step, c.thresholdRad / 20);
  return step;
}

function finish(
  s: Setup,
  chain: Float64Array[],
  search: ConstrainedSlewPlan['search'],
  limits: PlanLimits,
  level: number,
  rollBins: number | undefined,
  notes: string[],
): ConstrainedSlewVerdict {
  const timed = timeChain(chain, s.J, s.h0, limits);
  if (!timed.ok) {
    return {
      status: 'leg-infeasible',
      leg: timed.leg,
      verdict: timed.verdict,
      message: `Leg ${timed.leg + 1} cannot be flown within the wheel envelopes.`,
    };
  }
  const direct = timeChain([s.q0, s.q1], s.J, s.h0, limits);
  const b = s.axes[s.primary]!;
  const legs = timed.legs;
  const history = sampleLegs(legs, s.t0, checkStepRad(s.cones));
  const check = checkPreparedHistory(history.t, history.q, s.all);
  if (!check.clear)
    notes.push('The sampled legs violate a constraint with the moving directions or windows (the search froze them at the slew start).');
  notes.push(`Directions frozen at t = ${s.t0} s for the search; the margin check uses them moving.`);
  const attitudes = [legs[0]!.plan.qStart, ...legs.map((l) => l.plan.qEnd)];
  const uTime = direct.ok ? direct.totalS : NaN;
  const uPlan = direct.ok ? direct.legs[0]!.plan : null;
  if (!uPlan) notes.push('The unconstrained shortest slew is itself infeasible for the wheels: no time to compare.');
  return {
    status: 'planned',
    search,
    legs,
    attitudes,
    waypoints: attitudes.map((q) => axisDirection(q, b)),
    primaryAxisBody: Float64Array.from(b),
    totalTimeS: timed.totalS,
    unconstrainedTimeS: uTime,
    extraTimeS: timed.totalS - uTime,
    pathAngleRad: legs.reduce((a, l) => a + axisTravel(l.plan, b), 0),
    unconstrainedPathAngleRad: uPlan ? axisTravel(uPlan, b) : NaN,
    rotationAngleRad: legs.reduce((a, l) => a + l.plan.angleRad, 0),
    unconstrainedRotationAngleRad: uPlan ? uPlan.angleRad : NaN,
    minimumMarginRad: check.minimumMarginRad,
    check,
    frozenAtS: s.t0,
    gridLevel: level,
    gridSpacingRad: geodesicGrid(level).meanSpacingRad,
    ...(rollBins !== undefined ? { rollBins } : {}),
    notes,
  };
}

function readInput(input: ConstrainedSlewInput, limits: PlanLimits): Result<Setup> {
  const list = new IssueList();
  const q0 = readQuat(list, 'qStart', input?.qStart);
  const q1 = readQuat(list, 'qTarget', input?.qTarget);
  const J = readInertia(list, 'inertia', input?.inertia);
  const h0 = readVec3(list, 'wheelMomentumBody', input?.wheelMomentumBody);
  const limitsOk = checkLimits(list, 'limits', limits);
  const prep = prepareConstraints(input?.constraints);
  if (!prep.ok) list.items.push(...prep.errors);
  const t0 = input?.startTimeS ?? 0;
  list.finite('startTimeS', t0);
  intOption(list, 'gridLevel', input?.gridLevel, 0, MAX_GRID_LEVEL);
  intOption(list, 'maxGridLevel', input?.maxGridLevel, input?.gridLevel ?? DEFAULT_GRID_LEVEL, MAX_GRID_LEVEL);
  intOption(list, 'latticeGridLevel', input?.latticeGridLevel, 0, 5);
  intOption(list, 'rollBins', input?.rollBins, 4, 360);
  if (input?.smoothing !== undefined && input.smoothing !== 'fewest-legs' && input.smoothing !== 'grid-resolved') {
    list.add('smoothing', 'enum', "smoothing must be 'fewest-legs' or 'grid-resolved'");
  }
  if (input?.search !== undefined && !['auto', 'axis', 'lattice'].includes(input.search)) {
    list.add('search', 'enum', "search must be 'auto', 'axis' or 'lattice'");
  }
  let primaryAxis: Float64Array | null = null;
  if (input?.primaryAxisBody !== undefined) {
    const v = readVec3(list, 'primaryAxisBody', input.primaryAxisBody);
    const n = v ? Math.hypot(v[0]!, v[1]!, v[2]!) : 0;
    if (v && !(n > 1e-12)) list.add('primaryAxisBody', 'non-zero', 'primaryAxisBody is a zero vector');
    else if (v) primaryAxis = Float64Array.of(v[0]! / n, v[1]! / n, v[2]! / n);
  }
  if (!list.empty || !q0 || !q1 || !J || !h0 || !limitsOk || !prep.ok) return fail(list.items);
  const all = prep.value;
  const active = all.filter((c) => c.windowEndS >= t0);
  const axes: Float64Array[] = [];
  const axisOf = (a: Float64Array) => {
    let k = axes.findIndex((x) => Math.abs(x[0]! - a[0]!) + Math.abs(x[1]! - a[1]!) + Math.abs(x[2]! - a[2]!) < 1e-12);
    if (k < 0) k = axes.push(a) - 1;
    return k;
  };
  const primary = primaryAxis ? axisOf(primaryAxis) : active.length ? axisOf(active[0]!.axisBody) : axisOf(Float64Array.of(0, 0, 1));
  const cones = active.map((c) => {
    const centre = new Float64Array(3);
    const r = sourceAt(centre, c.source, t0);
    const thr = thresholdAngle(c, r) + (c.kind === 'keep-out' ? PLAN_CLEARANCE_RAD : -PLAN_CLEARANCE_RAD);
    return makeCone(c.kind === 'keep-out', centre, axisOf(c.axisBody), thr);
  });
  if (axes.length > MAX_AXES)
    return fail([{ path: 'constraints', rule: 'axes', message: `At most ${MAX_AXES} distinct body axes (got ${axes.length})` }]);
  return ok({ q0, q1, J, h0, active, all, t0, axes, primary, cones });
}

function intOption(list: IssueList, path: string, v: unknown, lo: number, hi: number): void {
  if (v === undefined) return;
  if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi)
    list.add(path, 'integer-range', `${path} must be an integer from ${lo} to ${hi} (got ${String(v)})`);
}
