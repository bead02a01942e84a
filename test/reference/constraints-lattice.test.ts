/**
 * Cones on several body axes: the planned legs are re-sampled here with the npm `quaternion`
 * package (2.2.0: its own Hamilton product, fromAxisAngle and rotateVector), independently of the
 * engine's rotation code, and every margin is computed from those samples (margin definition:
 * types.ts header, the brief's formulas).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { searchAxisPath } from '../../app/engine/constraints/axisSearch';
import { makeCone } from '../../app/engine/constraints/cone';
import { geodesicGrid } from '../../app/engine/constraints/geodesic';
import { chainFromWaypoints } from '../../app/engine/constraints/legs';
import { planConstrainedSlew, type ConstrainedSlewPlan } from '../../app/engine/constraints/slew';
import type { AttitudeConstraint } from '../../app/engine/constraints/types';
import { cubeCapacity } from '../../app/engine/plan/limits';
import type { PlanLimits } from '../../app/engine/plan/types';

const D = Math.PI / 180;
const limits: PlanLimits = {
  torqueCapacity: cubeCapacity(0.002),
  momentumCapacity: cubeCapacity(0.006),
  torqueMargin: 0.8,
  momentumMargin: 0.8,
};
const J = [0.11, 0.002, 0, 0.002, 0.12, 0, 0, 0, 0.08];
type V3 = [number, number, number];
const lib = (q: ArrayLike<number>) => new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!);
const xyzw = (q: Quaternion) => [q.x, q.y, q.z, q.w];
const unit = (v: ArrayLike<number>): V3 => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};
const angle = (a: V3, b: V3) => Math.acos(Math.max(-1, Math.min(1, a[0] * b[0] + a[1] * b[1] + a[2] * b[2])));

/** Independent margin of attitude q (library object) against a fixed-direction constraint. */
function margin(q: Quaternion, c: AttitudeConstraint): number {
  const v = unit(q.rotateVector(unit(c.bodyAxis)) as number[]);
  const th = angle(v, unit((c.source as { direction: number[] } & typeof c.source).direction));
  return c.kind === 'keep-out' ? th - c.halfAngleRad - c.marginRad : c.halfAngleRad - c.marginRad - th;
}

/** Smallest margin of each constraint along attitudes q_k ⊗ exp(½ φ e), 400 samples per rotation. */
function sampledMargins(
  rotations: { q0: ArrayLike<number>; axis: ArrayLike<number>; angle: number }[],
  cs: AttitudeConstraint[],
): number[] {
  const out = cs.map(() => Infinity);
  for (const r of rotations) {
    for (let i = 0; i <= 400; i++) {
      const q = lib(r.q0).mul(Quaternion.fromAxisAngle(unit(r.axis), (r.angle * i) / 400));
      cs.forEach((c, k) => (out[k] = Math.min(out[k]!, margin(q, c))));
    }
  }
  return out;
}
const legRotations = (p: ConstrainedSlewPlan) => p.legs.map((l) => ({ q0: l.plan.qStart, axis: l.plan.axisBody, angle: l.plan.angleRad }));

/** Eigenaxis rotations between consecutive attitudes of a chain (body-frame axis of qa* ⊗ qb). */
function chainRotations(chain: ArrayLike<number>[]) {
  const out = [];
  for (let k = 0; k + 1 < chain.length; k++) {
    let rel = lib(chain[k]!)
      .conjugate()
      .mul(lib(chain[k + 1]!));
    if (rel.w < 0) rel = rel.neg();
    const s = Math.hypot(rel.x, rel.y, rel.z);
    if (s > 1e-12) out.push({ q0: chain[k]!, axis: [rel.x / s, rel.y / s, rel.z / s], angle: 2 * Math.atan2(s, rel.w) });
  }
  return out;
}

function planned(r: ReturnType<typeof planConstrainedSlew>): ConstrainedSlewPlan {
  if (!r.ok || r.value.status !== 'planned') throw new Error(JSON.stringify(r.ok ? r.value : r.errors));
  return r.value;
}

describe('cones on two body axes', () => {
  it('tracker (+Z) out of the Sun and antenna (+X) inside a station cone: every leg keeps both (independent sampling)', () => {
    const cs: AttitudeConstraint[] = [
      {
        name: 'tracker Sun',
        kind: 'keep-out',
        bodyAxis: [0, 0, 1],
        halfAngleRad: 35 * D,
        marginRad: 2 * D,
        source: { kind: 'fixed', direction: [1, 0, 0] },
      },
      {
        name: 'antenna station',
        kind: 'keep-in',
        bodyAxis: [1, 0, 0],
        halfAngleRad: 75 * D,
        marginRad: 1 * D,
        source: { kind: 'fixed', direction: [0, 0, -1] },
      },
    ];
    // Start: +Z at azimuth −70° in the XY plane, +X pointing down (−Z); target: +Z at +70°, the same roll.
    const start = Quaternion.fromAxisAngle([0, 0, 1], -70 * D).mul(Quaternion.fromAxisAngle([0, 1, 0], 90 * D));
    const target = Quaternion.fromAxisAngle([0, 0, 1], 70 * D).mul(Quaternion.fromAxisAngle([0, 1, 0], 90 * D));
    const p = planned(
      planConstrainedSlew(
        { qStart: xyzw(start), qTarget: xyzw(target), inertia: J, wheelMomentumBody: [0, 0, 0], constraints: cs },
        limits,
      ),
    );
    expect(p.search).not.toBe('direct');
    // The shortest slew (about inertial Z) sweeps +Z across the Sun: the reason for the detour.
    const direct = sampledMargins(chainRotations([xyzw(start), xyzw(target)]), cs);
    expect(direct[0]!).toBeLessThan(0);
    const m = sampledMargins(legRotations(p), cs);
    expect(Math.min(...m)).toBeGreaterThanOrEqual(-1e-9);
    // The library's own sampled check agrees with the independent one to the sampling resolution.
    expect(Math.abs(p.minimumMarginRad - Math.min(...m))).toBeLessThan(2e-3);
  });

  it('a path fine for the tracker alone crosses the radiator cone on +Y; the lattice path keeps both', () => {
    const d = 60 * D,
      rho = 30 * D;
    const start = Quaternion.fromAxisAngle([0, 0, 1], -d).mul(Quaternion.fromAxisAngle([0, 1, 0], 90 * D));
    const target = Quaternion.fromAxisAngle([0, 0, 1], d).mul(Quaternion.fromAxisAngle([0, 1, 0], 90 * D));
    const q0 = Float64Array.from(xyzw(start)),
      q1 = Float64Array.from(xyzw(target));
    // The single-axis (tracker-only) path, as the planner would build it.
    const s2 = searchAxisPath(
      unit(start.rotateVector([0, 0, 1]) as number[]) as unknown as Float64Array,
      unit(target.rotateVector([0, 0, 1]) as number[]) as unknown as Float64Array,
      [makeCone(true, [1, 0, 0], 0, rho + 1e-6)],
      geodesicGrid(5),
    );
    if (!s2.found) throw new Error('no tracker path');
    const chain = chainFromWaypoints(
      q0,
      q1,
      s2.waypoints.map((w) => Float64Array.from(w)),
    );
    // Put the radiator's keep-out where +Y passes farthest from its start and end directions.
    const yStart = unit(start.rotateVector([0, 1, 0]) as number[]),
      yEnd = unit(target.rotateVector([0, 1, 0]) as number[]);
    let best = -1,
      centre: V3 = [0, 0, 1];
    for (const r of chainRotations(chain)) {
      for (let i = 0; i <= 200; i++) {
        const y = unit(
          lib(r.q0)
            .mul(Quaternion.fromAxisAngle(unit(r.axis), (r.angle * i) / 200))
            .rotateVector([0, 1, 0]) as number[],
        );
        const away = Math.min(angle(y, yStart), angle(y, yEnd));
        if (away > best) {
          best = away;
          centre = y;
        }
      }
    }
    const cs: AttitudeConstraint[] = [
      {
        name: 'tracker Sun',
        kind: 'keep-out',
        bodyAxis: [0, 0, 1],
        halfAngleRad: rho,
        marginRad: 0,
        source: { kind: 'fixed', direction: [1, 0, 0] },
      },
      {
        name: 'radiator',
        kind: 'keep-out',
        bodyAxis: [0, 1, 0],
        halfAngleRad: 0.6 * best,
        marginRad: 0,
        source: { kind: 'fixed', direction: centre },
      },
    ];
    expect(best).toBeGreaterThan(10 * D);
    const trackerOnly = sampledMargins(chainRotations(chain), cs);
    expect(trackerOnly[0]!).toBeGreaterThanOrEqual(-1e-9);
    expect(trackerOnly[1]!).toBeLessThan(-0.3 * best);
    const p = planned(planConstrainedSlew({ qStart: q0, qTarget: q1, inertia: J, wheelMomentumBody: [0, 0, 0], constraints: cs }, limits));
    expect(p.search).toBe('lattice');
    expect(p.notes.join(' ')).toContain('crosses a cone on another axis');
    const m = sampledMargins(legRotations(p), cs);
    expect(Math.min(...m)).toBeGreaterThanOrEqual(-1e-9);
    expect(p.minimumMarginRad).toBeGreaterThanOrEqual(0);
    expect(p.rollBins).toBe(36);
    // Asked for the single-axis path only, the planner says why it has none.
    const only = planConstrainedSlew(
      { qStart: q0, qTarget: q1, inertia: J, wheelMomentumBody: [0, 0, 0], constraints: cs, search: 'axis' },
      limits,
    );
    expect(only.ok && only.value.status === 'no-path' && only.value.message).toContain('another body axis');
  });
});
