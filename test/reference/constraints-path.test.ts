/**
 * Constrained paths on the sphere against outside references:
 * - grid counts of a class I geodesic polyhedron (V = 10·4^L + 2, E = 30·4^L, F = 20·4^L) and
 *   Euler's polyhedron formula V − E + F = 2 (from memory; standard);
 * - the closed-form cone test against dense sampling of Rodrigues' rotation done with the npm
 *   `quaternion` package (2.2.0) — an independent rotation;
 * - the shortest boresight path around one keep-out cone of half-angle ρ between two directions
 *   at angle d on opposite sides of its centre (tangent great-circle arcs plus the cone's small
 *   circle; right spherical triangles: cos d = cos ρ cos ℓ, cos A = tan ρ / tan d — derived for
 *   this project, the formula of the brief):
 *     L = 2 acos(cos d / cos ρ) + sin ρ (π − 2 acos(tan ρ / tan d)),
 *   L(60°, 30°) = 128.942°, L(45°, 20°) = 96.988° (values stated in the brief);
 * - a corridor between two keep-out cones inside a keep-in cone, closed and then opened by 2°
 *   (plane geometry of the construction below).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { geodesicGrid } from '../../app/engine/constraints/geodesic';
import { makeCone, rotationClear } from '../../app/engine/constraints/cone';
import { searchAxisPath } from '../../app/engine/constraints/axisSearch';
import { planConstrainedSlew, type ConstrainedSlewPlan, type ConstrainedSlewVerdict } from '../../app/engine/constraints/slew';
import type { AttitudeConstraint } from '../../app/engine/constraints/types';
import { cubeCapacity } from '../../app/engine/plan/limits';
import { planSegment } from '../../app/engine/plan/segment';
import type { PlanLimits } from '../../app/engine/plan/types';
import { makeRng } from '../../app/engine/math/prng';
import type { Result } from '../../app/engine/errors';

const D = Math.PI / 180;
const limits: PlanLimits = {
  torqueCapacity: cubeCapacity(0.002),
  momentumCapacity: cubeCapacity(0.006),
  torqueMargin: 0.8,
  momentumMargin: 0.8,
};
const J = [0.11, 0, 0, 0, 0.12, 0, 0, 0, 0.08];

function planned(r: Result<ConstrainedSlewVerdict>): ConstrainedSlewPlan {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  if (r.value.status !== 'planned') throw new Error(JSON.stringify(r.value));
  return r.value;
}
/** [x, y, z, w] of the library quaternion. */
const xyzw = (q: Quaternion) => [q.x, q.y, q.z, q.w];
/** Attitude with body +Z on inertial (cos a, sin a, 0): +Z turned about −Y by 90°, then about Z by a (npm quaternion). */
const boresightAt = (a: number) => xyzw(Quaternion.fromAxisAngle([0, 0, 1], a).mul(Quaternion.fromAxisAngle([0, 1, 0], Math.PI / 2)));

describe('geodesic grid', () => {
  it('has the class I counts and satisfies Euler’s formula at levels 0 … 5', () => {
    for (let L = 0; L <= 5; L++) {
      const g = geodesicGrid(L);
      const E = g.nbr.length / 2;
      const F = 20 * 4 ** L;
      expect(g.n).toBe(10 * 4 ** L + 2);
      expect(E).toBe(30 * 4 ** L);
      expect(g.n - E + F).toBe(2);
      for (let i = 0; i < g.n; i++) expect(Math.hypot(g.xyz[3 * i]!, g.xyz[3 * i + 1]!, g.xyz[3 * i + 2]!)).toBeCloseTo(1, 14);
      // Level 0 is the regular icosahedron: every edge atan(2) = 63.43° (common practice, no source).
      if (L === 0) expect(g.maxSpacingRad).toBeCloseTo(Math.atan(2), 12);
      // Each level halves the spacing, to within the grid's own unevenness.
      if (L > 0) expect(g.meanSpacingRad / geodesicGrid(L - 1).meanSpacingRad).toBeGreaterThan(0.45);
      if (L > 0) expect(g.meanSpacingRad / geodesicGrid(L - 1).meanSpacingRad).toBeLessThan(0.55);
    }
  });
});

describe('closed-form cone test vs sampled Rodrigues rotation (npm quaternion)', () => {
  it('agrees with 2,000 samples of the rotation on 300 random cases (away from grazing)', () => {
    const rng = makeRng(11, 3);
    const unit = (): [number, number, number] => {
      const v = [rng.normal(), rng.normal(), rng.normal()];
      const n = Math.hypot(v[0]!, v[1]!, v[2]!);
      return [v[0]! / n, v[1]! / n, v[2]! / n];
    };
    let checked = 0;
    for (let k = 0; k < 300; k++) {
      const u = unit(),
        e = unit(),
        c = unit(),
        th = Math.PI * rng.next(),
        thr = Math.PI * rng.next();
      let lo = Infinity,
        hi = -Infinity;
      for (let i = 0; i <= 2000; i++) {
        const v = Quaternion.fromAxisAngle(e, (th * i) / 2000).rotateVector(u) as number[];
        const ang = Math.acos(Math.max(-1, Math.min(1, v[0]! * c[0]! + v[1]! * c[1]! + v[2]! * c[2]!)));
        lo = Math.min(lo, ang);
        hi = Math.max(hi, ang);
      }
      // Sampling resolves extremes to ~(θ/2000)²; skip cases within 1e-4 rad of the threshold.
      if (Math.abs(lo - thr) < 1e-4 || Math.abs(hi - thr) < 1e-4) continue;
      checked++;
      const out = makeCone(true, c, 0, thr),
        inn = makeCone(false, c, 0, thr);
      expect(rotationClear(out, u[0]!, u[1]!, u[2]!, e[0]!, e[1]!, e[2]!, Math.cos(th), Math.sin(th))).toBe(lo >= thr);
      expect(rotationClear(inn, u[0]!, u[1]!, u[2]!, e[0]!, e[1]!, e[2]!, Math.cos(th), Math.sin(th))).toBe(hi <= thr);
    }
    expect(checked).toBeGreaterThan(280);
  });
});

/** The brief's formula, computed here. */
const shortestAround = (d: number, rho: number) =>
  2 * Math.acos(Math.cos(d) / Math.cos(rho)) + Math.sin(rho) * (Math.PI - 2 * Math.acos(Math.tan(rho) / Math.tan(d)));

describe('shortest boresight path around one keep-out cone', () => {
  for (const [dDeg, rhoDeg, stated] of [
    [60, 30, 128.942],
    [45, 20, 96.988],
  ] as const) {
    const d = dDeg * D,
      rho = rhoDeg * D,
      L = shortestAround(d, rho);
    const sun: AttitudeConstraint = {
      name: 'tracker Sun',
      kind: 'keep-out',
      bodyAxis: [0, 0, 1],
      halfAngleRad: rho,
      marginRad: 0,
      source: { kind: 'fixed', direction: [1, 0, 0] },
    };
    const input = (gridLevel?: number) => ({
      qStart: boresightAt(-d),
      qTarget: boresightAt(d),
      inertia: J,
      wheelMomentumBody: [0, 0, 0],
      constraints: [sun],
      search: 'axis' as const,
      ...(gridLevel !== undefined ? { gridLevel } : {}),
    });
    it(`d = ${dDeg}°, ρ = ${rhoDeg}°: L = ${stated}° (formula), path never shorter and within 1 % at the default grid`, () => {
      expect(L / D).toBeCloseTo(stated, 3); // the brief's stated value
      const p = planned(planConstrainedSlew(input(), limits));
      expect(p.search).toBe('axis');
      expect(p.gridLevel).toBe(5);
      expect(p.unconstrainedPathAngleRad).toBeCloseTo(2 * d, 12);
      expect(p.pathAngleRad).toBeGreaterThanOrEqual(L);
      expect(p.pathAngleRad).toBeLessThanOrEqual(1.01 * L);
      expect(p.minimumMarginRad).toBeGreaterThanOrEqual(0);
      expect(p.totalTimeS).toBeGreaterThan(p.unconstrainedTimeS);
      expect(p.extraTimeS).toBeCloseTo(p.totalTimeS - p.unconstrainedTimeS, 12);
    });
    it(`d = ${dDeg}°, ρ = ${rhoDeg}°: with grid-resolved smoothing the planner's path converges toward L over levels 3, 4, 5`, () => {
      const errs: number[] = [];
      for (const level of [3, 4, 5]) {
        const p = planned(planConstrainedSlew({ ...input(level), smoothing: 'grid-resolved' }, limits));
        expect(p.search).toBe('axis');
        expect(p.pathAngleRad).toBeGreaterThanOrEqual(L);
        expect(p.minimumMarginRad).toBeGreaterThanOrEqual(0);
        errs.push(p.pathAngleRad / L - 1);
      }
      expect(errs[0]!).toBeLessThan(0.01);
      // Each level halves the spacing; the excess falls by more than half each time.
      expect(errs[1]!).toBeLessThan(0.5 * errs[0]!);
      expect(errs[2]!).toBeLessThan(0.5 * errs[1]!);
      expect(errs[2]!).toBeLessThan(1e-4);
    });
    it(`d = ${dDeg}°, ρ = ${rhoDeg}°: at levels 3, 4 and 5 the path is the shortest one-corner path L1, L < L1 < 1.01 L`, () => {
      // One corner P on the symmetry plane at angle β from the cone centre, both arcs tangent to
      // the cone (derived here): distance from c to the great circle S–P equals ρ gives
      // tan β = sin ρ sin d / √(sin² d − sin² ρ), and L1 = 2 acos(cos d cos β).
      const beta = Math.atan((Math.sin(rho) * Math.sin(d)) / Math.sqrt(Math.sin(d) ** 2 - Math.sin(rho) ** 2));
      const L1 = 2 * Math.acos(Math.cos(d) * Math.cos(beta));
      expect(L1).toBeGreaterThan(L);
      expect(L1).toBeLessThan(1.01 * L);
      const cone = [makeCone(true, [1, 0, 0], 0, rho + 1e-6)];
      const s = Float64Array.of(Math.cos(d), -Math.sin(d), 0),
        g = Float64Array.of(Math.cos(d), Math.sin(d), 0);
      for (const level of [3, 4, 5]) {
        const r = searchAxisPath(s, g, cone, geodesicGrid(level));
        if (!r.found) throw new Error('no path');
        expect(r.waypoints).toHaveLength(3);
        expect(r.pathAngleRad).toBeGreaterThanOrEqual(L);
        // Within 1e-5 rad of L1 (the search cone is 1e-6 rad wider than ρ).
        expect(Math.abs(r.pathAngleRad - L1)).toBeLessThan(1e-5);
        expect(r.pathAngleRad).toBeLessThanOrEqual(r.gridPathAngleRad);
      }
    });
  }
});

/**
 * Corridor: the axis must stay within 60° of +Z (keep-in) and out of two keep-out cones of
 * half-angle ρ centred 40° from +Z at azimuths ±90°; their edges meet over +Z when ρ = 40°
 * (80° apart) and leave a 2° gap at ρ = 39°. Start and goal at 45° from +Z, azimuths 200° and
 * 340°, on the two sides of that wall (their direct arc crosses the cone at −90°).
 */
describe('corridor between two cones', () => {
  const dir = (colat: number, azim: number) => [
    Math.sin(colat * D) * Math.cos(azim * D),
    Math.sin(colat * D) * Math.sin(azim * D),
    Math.cos(colat * D),
  ];
  const q = (colat: number, azim: number) => xyzw(Quaternion.fromVectors([0, 0, 1], dir(colat, azim) as [number, number, number]));
  const run = (rho: number) =>
    planConstrainedSlew(
      {
        qStart: q(45, 200),
        qTarget: q(45, 340),
        inertia: J,
        wheelMomentumBody: [0, 0, 0],
        constraints: [
          {
            name: 'keep-in',
            kind: 'keep-in',
            bodyAxis: [0, 0, 1],
            halfAngleRad: 60 * D,
            marginRad: 0,
            source: { kind: 'fixed', direction: [0, 0, 1] },
          },
          {
            name: 'wall +Y',
            kind: 'keep-out',
            bodyAxis: [0, 0, 1],
            halfAngleRad: rho * D,
            marginRad: 0,
            source: { kind: 'fixed', direction: dir(40, 90) },
          },
          {
            name: 'wall −Y',
            kind: 'keep-out',
            bodyAxis: [0, 0, 1],
            halfAngleRad: rho * D,
            marginRad: 0,
            source: { kind: 'fixed', direction: dir(40, -90) },
          },
        ],
      },
      limits,
    );
  it('closed (ρ = 40°): no path at the grid resolution, said plainly', () => {
    const r = run(40);
    if (!r.ok || r.value.status !== 'no-path') throw new Error(JSON.stringify(r));
    expect(r.value.gridLevel).toBe(6);
    expect(r.value.message).toContain('at this grid resolution');
  });
  it('opened by 2° (ρ = 39°): a path through the gap, every margin ≥ 0', () => {
    const p = planned(run(39));
    expect(p.minimumMarginRad).toBeGreaterThanOrEqual(0);
    // The path goes over +Z: some waypoint within a degree of it.
    expect(Math.max(...p.waypoints.map((w) => w[2]!))).toBeGreaterThan(Math.cos(5 * D));
  });
});

describe('verdicts', () => {
  it('returns the shortest slew unchanged as one leg when it violates nothing', () => {
    const p = planned(
      planConstrainedSlew(
        {
          qStart: boresightAt(-0.5),
          qTarget: boresightAt(0.5),
          inertia: J,
          wheelMomentumBody: [0, 0, 0],
          constraints: [
            {
              name: 'far',
              kind: 'keep-out',
              bodyAxis: [0, 0, 1],
              halfAngleRad: 0.2,
              marginRad: 0,
              source: { kind: 'fixed', direction: [-1, 0, 0] },
            },
          ],
        },
        limits,
      ),
    );
    const direct = planSegment({ qStart: boresightAt(-0.5), qTarget: boresightAt(0.5), inertia: J, wheelMomentumBody: [0, 0, 0] }, limits);
    if (!direct.ok || !direct.value.feasible) throw new Error('direct');
    expect(p.search).toBe('direct');
    expect(p.legs).toHaveLength(1);
    expect(p.totalTimeS).toBe(direct.value.durationS);
    expect(p.extraTimeS).toBe(0);
  });
  it('refuses a target inside a keep-out cone', () => {
    const r = planConstrainedSlew(
      {
        qStart: boresightAt(-1),
        qTarget: boresightAt(0.1),
        inertia: J,
        wheelMomentumBody: [0, 0, 0],
        constraints: [
          {
            name: 'Sun',
            kind: 'keep-out',
            bodyAxis: [0, 0, 1],
            halfAngleRad: 0.3,
            marginRad: 0,
            source: { kind: 'fixed', direction: [1, 0, 0] },
          },
        ],
      },
      limits,
    );
    expect(r.ok && r.value.status).toBe('endpoint-violation');
    expect(r.ok && r.value.status === 'endpoint-violation' && r.value.which).toBe('target');
  });
  it('freezes moving directions at the slew start for the search; the final check uses them moving', () => {
    // A Sun moving along the equator from azimuth 90° at −4°/s (invented, sampled every 5 s): at
    // t = 0 it is 30° from the nearest point of the direct slew's path (azimuths −60° … 60°), so
    // the frozen search keeps the direct slew, but by mid-slew it sits on the path (hand geometry).
    const times: number[] = [],
      dirs: number[] = [];
    for (let k = 0; k <= 40; k++) {
      times.push(5 * k);
      dirs.push(Math.cos((90 - 20 * k) * D), Math.sin((90 - 20 * k) * D), 0);
    }
    const p = planned(
      planConstrainedSlew(
        {
          qStart: boresightAt(-60 * D),
          qTarget: boresightAt(60 * D),
          inertia: J,
          wheelMomentumBody: [0, 0, 0],
          constraints: [
            {
              name: 'moving Sun',
              kind: 'keep-out',
              bodyAxis: [0, 0, 1],
              halfAngleRad: 20 * D,
              marginRad: 0,
              source: { kind: 'sampled', timesS: times, directions: dirs, interpolation: 'great-circle' },
            },
          ],
        },
        limits,
      ),
    );
    expect(p.search).toBe('direct');
    expect(p.frozenAtS).toBe(0);
    expect(p.check.clear).toBe(false);
    expect(p.minimumMarginRad).toBeLessThan(0);
    expect(p.notes.join(' ')).toContain('moving directions');
  });
  it('says so when the start is clear but within the planner clearance of a cone edge', () => {
    const rho = 0.3;
    const r = planConstrainedSlew(
      {
        qStart: boresightAt(-(rho + 5e-7)),
        qTarget: boresightAt(1),
        inertia: J,
        wheelMomentumBody: [0, 0, 0],
        constraints: [
          {
            name: 'Sun',
            kind: 'keep-out',
            bodyAxis: [0, 0, 1],
            halfAngleRad: rho,
            marginRad: 0,
            source: { kind: 'fixed', direction: [1, 0, 0] },
          },
        ],
      },
      limits,
    );
    if (!r.ok || r.value.status !== 'no-path') throw new Error(JSON.stringify(r));
    expect(r.value.message).toContain('start direction');
  });
  it('lists bad options with the other input errors', () => {
    const r = planConstrainedSlew(
      {
        qStart: [0, 0, 0, 2],
        qTarget: [0, 0, 0, 1],
        inertia: J,
        wheelMomentumBody: [0, 0, 0],
        constraints: [],
        gridLevel: 9,
        rollBins: 2.5,
      },
      limits,
    );
    expect(r.ok ? [] : r.errors.map((e) => e.path)).toEqual(['qStart', 'gridLevel', 'rollBins']);
  });
});
