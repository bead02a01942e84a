/**
 * Property: whatever the planner returns as planned keeps every cone — checked on legs re-sampled
 * with the npm `quaternion` package (2.2.0: its own product, fromAxisAngle and rotateVector), not
 * with the engine's rotation code — over seeded random starts, targets and cones on one or two
 * body axes. Verdicts other than 'planned' are allowed (no path, endpoint inside a cone).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { planConstrainedSlew } from '../../app/engine/constraints/slew';
import type { AttitudeConstraint } from '../../app/engine/constraints/types';
import { makeRng } from '../../app/engine/math/prng';
import { cubeCapacity } from '../../app/engine/plan/limits';
import type { PlanLimits } from '../../app/engine/plan/types';

const D = Math.PI / 180;
const limits: PlanLimits = {
  torqueCapacity: cubeCapacity(0.002),
  momentumCapacity: cubeCapacity(0.006),
  torqueMargin: 0.8,
  momentumMargin: 0.8,
};
type V3 = [number, number, number];
const unit = (v: ArrayLike<number>): V3 => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};

function margin(q: Quaternion, c: AttitudeConstraint): number {
  const v = unit(q.rotateVector(unit(c.bodyAxis)) as number[]);
  const s = unit((c.source as { direction: number[] } & typeof c.source).direction);
  const th = Math.acos(Math.max(-1, Math.min(1, v[0] * s[0] + v[1] * s[1] + v[2] * s[2])));
  return c.kind === 'keep-out' ? th - c.halfAngleRad - c.marginRad : c.halfAngleRad - c.marginRad - th;
}

describe('planned constrained slews keep every cone (independent re-sampling)', () => {
  it('40 seeded random problems', () => {
    const rng = makeRng(2026, 12);
    const dir = (): number[] => [rng.normal(), rng.normal(), rng.normal()];
    const quat = (): number[] => {
      const q = new Quaternion(rng.normal(), rng.normal(), rng.normal(), rng.normal()).normalize();
      return [q.x, q.y, q.z, q.w];
    };
    const counts = { planned: 0, searched: 0 };
    const angle = (a: V3, b: V3) => Math.acos(Math.max(-1, Math.min(1, a[0] * b[0] + a[1] * b[1] + a[2] * b[2])));
    for (let k = 0; k < 40; k++) {
      // Start and target 40°+ apart for +Z; a keep-out cone sits on the shortest slew's midpoint.
      let q0: number[], q1: number[], u0: V3, u1: V3;
      do {
        q0 = quat();
        q1 = quat();
        u0 = unit(new Quaternion(q0[3]!, q0[0]!, q0[1]!, q0[2]!).rotateVector([0, 0, 1]) as number[]);
        u1 = unit(new Quaternion(q1[3]!, q1[0]!, q1[1]!, q1[2]!).rotateVector([0, 0, 1]) as number[]);
      } while (angle(u0, u1) < 40 * D);
      const l0 = new Quaternion(q0[3]!, q0[0]!, q0[1]!, q0[2]!),
        l1 = new Quaternion(q1[3]!, q1[0]!, q1[1]!, q1[2]!);
      const mid = unit(l0.slerp(l1)(0.5).rotateVector([0, 0, 1]) as number[]);
      const room = Math.min(angle(mid, u0), angle(mid, u1));
      const cs: AttitudeConstraint[] = [
        {
          name: 'blocker',
          kind: 'keep-out',
          bodyAxis: [0, 0, 1],
          halfAngleRad: (0.3 + 0.5 * rng.next()) * room,
          marginRad: 0,
          source: { kind: 'fixed', direction: mid },
        },
        {
          name: 'second',
          kind: 'keep-out',
          bodyAxis: k % 2 ? [1, 0, 0] : [0, 0, 1],
          halfAngleRad: (5 + 20 * rng.next()) * D,
          marginRad: D * rng.next(),
          source: { kind: 'fixed', direction: dir() },
        },
      ];
      if (k % 3 === 0)
        cs.push({
          name: 'keep-in',
          kind: 'keep-in',
          bodyAxis: [0, 1, 0],
          halfAngleRad: 110 * D,
          marginRad: 0,
          source: { kind: 'fixed', direction: dir() },
        });
      const r = planConstrainedSlew(
        { qStart: q0, qTarget: q1, inertia: [0.11, 0, 0, 0, 0.12, 0, 0, 0, 0.08], wheelMomentumBody: [0, 0, 0], constraints: cs },
        limits,
      );
      expect(r.ok).toBe(true);
      if (!r.ok || r.value.status !== 'planned') continue;
      counts.planned++;
      if (r.value.search !== 'direct') counts.searched++;
      let worst = Infinity;
      for (const l of r.value.legs) {
        const p = l.plan;
        const q0 = new Quaternion(p.qStart[3]!, p.qStart[0]!, p.qStart[1]!, p.qStart[2]!);
        for (let i = 0; i <= 300; i++) {
          const q = q0.mul(Quaternion.fromAxisAngle(unit(p.axisBody), (p.angleRad * i) / 300));
          for (const c of cs) worst = Math.min(worst, margin(q, c));
        }
      }
      expect(worst).toBeGreaterThanOrEqual(-1e-9);
      expect(r.value.minimumMarginRad).toBeGreaterThanOrEqual(0);
    }
    // Most seeds need a search (so the property is not vacuous).
    expect(counts.searched).toBeGreaterThan(15);
  });
});
