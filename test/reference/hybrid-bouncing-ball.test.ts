/**
 * The bouncing ball of Goebel, Sanfelice & Teel, "Hybrid dynamical systems", IEEE Control
 * Systems Magazine 29(2), 2009 (their running example): flow ẋ1 = x2, ẋ2 = −γ on C, jump
 * x⁺ = (0, −e x2) from D = {x1 = 0, x2 ≤ 0}. Closed form (elementary kinematics): from rest at
 * height h0 the first impact is at t1 = √(2h0/γ) with speed γt1; each bounce scales the speed by
 * e, so impact k is at t_k = t1 + 2t1·e(1 − e^(k−1))/(1 − e) and the impacts accumulate at the
 * Zeno time t∞ = t1(1 + e)/(1 − e). The simulator must locate the impacts and, instead of
 * hanging, stop with outcome 'zeno' near t∞.
 */
import { describe, expect, it } from 'vitest';
import { simulateHybrid } from '../../app/engine/hybrid/index';
import type { HybridArc, HybridSystem, IntegratorOptions } from '../../app/engine/hybrid/index';

const GAMMA = 9.81;

function ball(e: number, withFlowSet: boolean): HybridSystem {
  const sys: HybridSystem = {
    dim: 2,
    flow: (_t, x, d) => {
      d[0] = x[1]!;
      d[1] = -GAMMA;
    },
    // D = {x1 ≤ 0 and x2 ≤ 0} = {g ≥ 0}; on C ∩ {x1 ≥ 0} it is the paper's D = {x1 = 0, x2 ≤ 0}.
    jumpGuard: (_t, x) => Math.min(-x[0]!, -x[1]!),
    jump: (_t, x, xp) => {
      xp[0] = 0;
      xp[1] = -e * x[1]!;
      return { what: 'impact', from: x[1]!, to: xp[1]!, why: 'x1 ≤ 0 and x2 ≤ 0' };
    },
  };
  if (withFlowSet) sys.inFlowSet = (_t, x) => x[0]! >= 0;
  return sys;
}

function impactTime(k: number, t1: number, e: number): number {
  return t1 + (2 * t1 * e * (1 - e ** (k - 1))) / (1 - e);
}

function expectHybridTimeDomain(arc: HybridArc): void {
  // GST 2009: E is a union of [t_j, t_{j+1}] × {j}; t and j never decrease, j grows only at a jump instant.
  for (let k = 1; k < arc.count; k++) {
    expect(arc.t[k]).toBeGreaterThanOrEqual(arc.t[k - 1]!);
    expect(arc.j[k]).toBeGreaterThanOrEqual(arc.j[k - 1]!);
    if (arc.j[k] !== arc.j[k - 1]) {
      expect(arc.j[k]).toBe(arc.j[k - 1]! + 1);
      expect(arc.t[k]).toBe(arc.t[k - 1]);
    }
  }
  for (const v of arc.x) expect(Number.isFinite(v)).toBe(true);
}

const integrators: [string, IntegratorOptions][] = [
  ['dp54', { kind: 'dp54', rtol: 1e-10, atol: 1e-12 }],
  ['rk4', { kind: 'rk4', dt: 0.01 }],
];

describe('bouncing ball (Goebel, Sanfelice & Teel 2009)', () => {
  for (const [name, integrator] of integrators) {
    for (const withFlowSet of [false, true]) {
      it(`${name}${withFlowSet ? ', C = {x1 ≥ 0}' : ''}: impact times match the closed form; Zeno reported near t∞`, () => {
        const e = 0.5,
          h0 = 1;
        const t1 = Math.sqrt((2 * h0) / GAMMA);
        const tInf = (t1 * (1 + e)) / (1 - e);
        const r = simulateHybrid(ball(e, withFlowSet), [h0, 0], { tEnd: 5, integrator, record: 'step' });
        expect(r.ok).toBe(true);
        if (!r.ok) return;
        const arc = r.value;
        expect(arc.outcome.status).toBe('zeno');
        expect(arc.outcome.message).toMatch(/more than 50 jumps/);
        expect(Math.abs(arc.outcome.t - tInf)).toBeLessThan(1e-6);
        expect(arc.outcome.t).toBeLessThan(5);
        expect(arc.events.length).toBeGreaterThan(50);
        for (let k = 1; k <= 20; k++) {
          const ev = arc.events[k - 1]!;
          expect(ev.j).toBe(k);
          expect(Math.abs(ev.t - impactTime(k, t1, e))).toBeLessThan(1e-9);
          // impact speed γ t1 e^(k−1)
          expect(ev.from).toBeCloseTo(-GAMMA * t1 * e ** (k - 1), 7);
        }
        expect(arc.stats.steps).toBeLessThan(5000);
        expectHybridTimeDomain(arc);
      });
    }
  }

  it('e = 0.8 (slow accumulation) is also stopped as Zeno, near t∞ = 9 t1', () => {
    const e = 0.8;
    const t1 = Math.sqrt(2 / GAMMA);
    const r = simulateHybrid(ball(e, false), [1, 0], { tEnd: 20, integrator: { kind: 'dp54', rtol: 1e-10, atol: 1e-12 }, record: 'none' });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.outcome.status).toBe('zeno');
    expect(Math.abs(r.value.outcome.t - (t1 * 1.8) / 0.2)).toBeLessThan(1e-5);
    expect(Math.abs(r.value.events[9]!.t - impactTime(10, t1, e))).toBeLessThan(1e-9);
  });

  it('with jMax the run completes after that many impacts instead', () => {
    const t1 = Math.sqrt(2 / GAMMA);
    const r = simulateHybrid(ball(0.5, false), [1, 0], {
      tEnd: 5,
      jMax: 3,
      integrator: { kind: 'dp54', rtol: 1e-10, atol: 1e-12 },
      record: 'none',
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.outcome).toMatchObject({ status: 'completed', j: 3 });
    expect(r.value.outcome.message).toMatch(/jMax = 3/);
    expect(r.value.outcome.t).toBeCloseTo(impactTime(3, t1, 0.5), 9);
    // arc: start, then (pre, post) for each of the 3 impacts; the end equals the last post-jump point
    expect(Array.from(r.value.j)).toEqual([0, 0, 1, 1, 2, 2, 3]);
  });
});
