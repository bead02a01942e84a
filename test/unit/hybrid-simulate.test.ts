/**
 * simulateHybrid semantics (our design, after Goebel, Sanfelice & Teel, IEEE CSM 29(2), 2009,
 * and methods §7). Expected values are closed forms of trivial flows (ẋ = 1 → x = t, ẋ = x → eᵗ)
 * or exact arithmetic (sample instants k·Ts); no stored results.
 */
import { describe, expect, it } from 'vitest';
import { simulateHybrid } from '../../app/engine/hybrid/index';
import type { HybridArc, HybridOptions, HybridSystem, IntegratorOptions } from '../../app/engine/hybrid/index';

const RK4: IntegratorOptions = { kind: 'rk4', dt: 0.03 };
const DP: IntegratorOptions = { kind: 'dp54', rtol: 1e-9, atol: 1e-12 };

function sim(sys: HybridSystem, x0: number[], opts: Partial<HybridOptions>): HybridArc {
  const r = simulateHybrid(sys, x0, { tEnd: 1, integrator: DP, ...opts } as HybridOptions);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  for (const v of r.value.x) expect(Number.isFinite(v)).toBe(true);
  for (const v of r.value.finalState) expect(Number.isFinite(v)).toBe(true);
  return r.value;
}

/** ẋ = x, a sampled counter in x[1]: every sample adds 1; every 5th sample is a reported 'logic' jump. */
function sampled(Ts: number, report = true): HybridSystem & { sampleTimes: number[] } {
  let nextK = 0;
  const sampleTimes: number[] = [];
  return {
    dim: 2,
    sampleTimes,
    flow: (_t, x, d) => {
      d[0] = x[0]!;
      d[1] = 0;
    },
    nextScheduledJump: () => nextK * Ts,
    jump: (t, x, xp, cause) => {
      expect(cause).toBe('scheduled');
      sampleTimes.push(t);
      xp[1] = x[1]! + 1;
      nextK++;
      return report && xp[1]! % 5 === 0 ? { what: 'logic', from: x[1]!, to: xp[1]!, why: 'every fifth sample' } : null;
    },
  };
}

describe('sampled-data timer (scheduled jumps)', () => {
  for (const integrator of [RK4, DP, { kind: 'rk4', dt: 0.1 } as IntegratorOptions]) {
    it(`${integrator.kind}${'dt' in integrator ? ' dt ' + integrator.dt : ''}: jumps land exactly on k·Ts and never at tEnd`, () => {
      const Ts = 0.1;
      const sys = sampled(Ts);
      const arc = sim(sys, [1, 0], { tEnd: 2, integrator, record: 'scheduled' });
      expect(arc.outcome.status).toBe('completed');
      // samples at 0, 0.1, …, 1.9; the one due at tEnd = 2 is not taken
      expect(sys.sampleTimes).toEqual(Array.from({ length: 20 }, (_, k) => k * Ts));
      expect(arc.events.map((e) => e.t)).toEqual([4, 9, 14, 19].map((k) => k * Ts));
      expect(arc.events.map((e) => e.j)).toEqual([1, 2, 3, 4]);
      expect(arc.outcome.j).toBe(4);
      expect(arc.stats.silentJumps).toBe(16);
      // the flow between samples is still eᵗ
      const tol = integrator.kind === 'dp54' ? 1e-8 : 'dt' in integrator && integrator.dt > 0.05 ? 1e-5 : 1e-6;
      expect(Math.abs(arc.finalState[0]! - Math.exp(2))).toBeLessThan(tol * Math.exp(2));
      expect(arc.finalState[1]).toBe(20);
      // every stored sample point sits at an exact multiple of Ts
      for (let k = 0; k < arc.count; k++) {
        const m = Math.round(arc.t[k]! / Ts);
        expect(arc.t[k]).toBe(m * Ts);
      }
    });
  }

  it('the RK4 fast path takes equal steps between samples: 0.1/0.03 → 4 steps per sample', () => {
    const arc = sim(sampled(0.1, false), [1, 0], { tEnd: 1, integrator: RK4, record: 'none' });
    expect(arc.stats.accepted).toBe(40);
    expect(arc.stats.evaluations).toBe(160);
    // 'none' keeps only the start and the end when no jump is reported
    expect(arc.count).toBe(2);
    expect(Array.from(arc.t)).toEqual([0, 1]);
  });
});

describe('guard jumps', () => {
  /** ẋ = 1; jump set {x ≥ level}; jump x⁺ = x − 1 and count in x[1]. */
  const sawtooth = (level: number): HybridSystem => ({
    dim: 2,
    flow: (_t, _x, d) => {
      d[0] = 1;
      d[1] = 0;
    },
    jumpGuard: (_t, x) => x[0]! - level,
    jump: (_t, x, xp) => {
      xp[0] = x[0]! - 1;
      xp[1] = x[1]! + 1;
      return { what: 'reset', from: x[1]!, to: xp[1]!, why: `x ≥ ${level}` };
    },
  });

  it('crossings are located to eventTimeTol with both integrators (x = t − k hits 0.75 at t = 0.75 + k)', () => {
    for (const integrator of [RK4, DP]) {
      const arc = sim(sawtooth(0.75), [0, 0], { tEnd: 4, integrator, eventTimeTol: 1e-12 });
      expect(arc.events.map((e) => e.t).map((t) => Math.round(t * 1e10) / 1e10)).toEqual([0.75, 1.75, 2.75, 3.75]);
      for (const e of arc.events) expect(Math.abs(e.t - Math.round(e.t - 0.75) - 0.75)).toBeLessThan(1e-11);
      expect(arc.finalState[0]).toBeCloseTo(4 - 4, 9);
    }
  });

  it('several jumps at one instant are allowed; more than maxJumpsPerInstant is Zeno', () => {
    // D = {x ≥ 1 and c ≤ 2.5}: at x = 1 (t = 0.5) the counter c jumps 0 → 1 → 2 → 3 at one instant
    const sys: HybridSystem = {
      dim: 2,
      flow: (_t, _x, d) => {
        d[0] = 1;
        d[1] = 0;
      },
      jumpGuard: (_t, x) => Math.min(x[0]! - 1, 2.5 - x[1]!),
      jump: (_t, x, xp) => {
        xp[1] = x[1]! + 1;
        return { what: 'count', from: x[1]!, to: xp[1]!, why: 'x ≥ 1' };
      },
    };
    const arc = sim(sys, [0.5, 0], { tEnd: 0.6, integrator: DP });
    expect(arc.events.length).toBe(3);
    expect(new Set(arc.events.map((e) => e.t)).size).toBe(1);
    expect(arc.events[0]!.t).toBeCloseTo(0.5, 11);
    expect(arc.outcome.status).toBe('completed');
    const z = sim(sys, [0.5, 0], { tEnd: 0.6, integrator: DP, maxJumpsPerInstant: 2 });
    expect(z.outcome.status).toBe('zeno');
    expect(z.events.length).toBe(2);
  });

  it('a guard that never turns negative again is reported as Zeno, not a hang', () => {
    const sys: HybridSystem = {
      dim: 1,
      flow: (_t, _x, d) => {
        d[0] = 1;
      },
      jumpGuard: (_t, x) => x[0]! - 0.3,
      jump: (_t, x, xp) => ({ what: 'stuck', from: x[0]!, to: xp[0]!, why: 'x⁺ = x' }),
    };
    const arc = sim(sys, [0], { tEnd: 1 });
    expect(arc.outcome.status).toBe('zeno');
    expect(arc.outcome.t).toBeCloseTo(0.3, 10);
    expect(arc.events.length).toBe(50);
  });

  it("x ∈ C ∩ D: 'jump' (default) jumps at once, 'flow' flows until x leaves C", () => {
    const base = (both?: 'jump' | 'flow'): HybridSystem => ({
      dim: 1,
      both,
      flow: (_t, _x, d) => {
        d[0] = 1;
      },
      jumpGuard: (_t, x) => x[0]!, // C = {x ≤ 0}, D = {x ≥ 0}; x0 = 0 is in both
      jump: (_t, x, xp) => {
        xp[0] = -1;
        return { what: 'back', from: x[0]!, to: -1, why: 'x ≥ 0' };
      },
    });
    const a = sim(base(), [0], { tEnd: 0.5, jMax: 1 });
    expect(a.events[0]!.t).toBe(0);
    const b = sim(base('flow'), [0], { tEnd: 0.5, jMax: 1 });
    // flows in C ∩ D = {0} only for an instant, then leaves C: the jump is located there
    expect(b.events[0]!.t).toBeGreaterThan(0);
    expect(b.events[0]!.t).toBeLessThan(1e-9);
    expect(b.events[0]!.from).toBeGreaterThan(0);
  });

  it('eventScan finds a guard that rises and falls within one step', () => {
    // ẋ = 1, D = {|x − 0.5| ≤ 0.01}; one RK4 step covers [0, 1], both ends outside D
    const sys: HybridSystem = {
      dim: 1,
      flow: (_t, _x, d) => {
        d[0] = 1;
      },
      jumpGuard: (_t, x) => 1e-4 - (x[0]! - 0.5) ** 2,
      jump: (_t, x, xp) => {
        xp[0] = x[0]! + 10;
        return { what: 'hit', from: x[0]!, to: xp[0]!, why: 'in the window' };
      },
    };
    const miss = sim(sys, [0], { tEnd: 1, integrator: { kind: 'rk4', dt: 1 } });
    expect(miss.events.length).toBe(0);
    const hit = sim(sys, [0], { tEnd: 1, integrator: { kind: 'rk4', dt: 1 }, eventScan: 3 });
    expect(hit.events.length).toBe(1);
    expect(hit.events[0]!.t).toBeCloseTo(0.49, 10);
  });

  it('a declined guard jump (null) disarms the guard; leaving C then blocks the solution', () => {
    let calls = 0;
    const sys: HybridSystem = {
      dim: 1,
      flow: (_t, _x, d) => {
        d[0] = 1;
      },
      jumpGuard: (_t, x) => x[0]! - 0.2,
      inFlowSet: (_t, x) => x[0]! <= 0.6,
      jump: () => {
        calls++;
        return null;
      },
    };
    const arc = sim(sys, [0], { tEnd: 1 });
    expect(calls).toBe(1);
    expect(arc.outcome.status).toBe('blocked');
    expect(arc.outcome.t).toBeCloseTo(0.6, 10);
    expect(arc.finalState[0]).toBeGreaterThan(0.6);
  });

  it('leaving an explicit flow set without reaching D ends the run as blocked at the exit time', () => {
    for (const integrator of [RK4, DP]) {
      const sys: HybridSystem = {
        dim: 1,
        flow: (_t, _x, d) => {
          d[0] = 2;
        },
        inFlowSet: (_t, x) => x[0]! <= 1,
        jump: () => null,
      };
      const arc = sim(sys, [0], { tEnd: 3, integrator });
      expect(arc.outcome.status).toBe('blocked');
      expect(arc.outcome.t).toBeCloseTo(0.5, 10);
      // an initial state outside C ∪ D is blocked at once
      expect(sim(sys, [2], { tEnd: 3, integrator }).outcome).toMatchObject({ status: 'blocked', t: 0 });
    }
  });
});

describe('outcomes other than completed', () => {
  it('non-finite flow: stops at the last finite state, before the bad time', () => {
    for (const integrator of [RK4, DP, { kind: 'rk4', dt: 0.1 } as IntegratorOptions]) {
      const sys: HybridSystem = {
        dim: 1,
        flow: (t, x, d) => {
          d[0] = t > 0.5 ? NaN : x[0]!;
        },
        jump: () => null,
      };
      const arc = sim(sys, [1], { tEnd: 1, integrator, record: 'none' });
      expect(arc.outcome.status).toBe('non-finite');
      expect(arc.outcome.t).toBeLessThanOrEqual(0.5);
      expect(arc.outcome.t).toBeGreaterThan(0.35);
      expect(arc.finalState[0]).toBeCloseTo(Math.exp(arc.outcome.t), 5);
      expect(arc.outcome.message).toMatch(/non-finite/);
    }
  });

  it('non-finite jump map: the arc ends before that jump', () => {
    const sys: HybridSystem = {
      dim: 1,
      flow: (_t, _x, d) => {
        d[0] = 1;
      },
      jumpGuard: (_t, x) => x[0]! - 0.4,
      jump: (_t, _x, xp) => {
        xp[0] = Infinity;
        return { what: 'bad', from: 0, to: 0, why: '' };
      },
    };
    const arc = sim(sys, [0], { tEnd: 1 });
    expect(arc.outcome).toMatchObject({ status: 'non-finite', j: 0 });
    expect(arc.finalState[0]).toBeCloseTo(0.4, 10);
    expect(arc.events.length).toBe(0);
  });

  it('a guard returning NaN is reported', () => {
    const sys: HybridSystem = {
      dim: 1,
      flow: (_t, _x, d) => {
        d[0] = 1;
      },
      jumpGuard: (_t, x) => (x[0]! > 0.3 ? NaN : -1),
      jump: () => null,
    };
    expect(sim(sys, [0], { tEnd: 1 }).outcome.status).toBe('non-finite');
  });

  it('step-underflow when the error control needs steps below hMin', () => {
    // stiff: ẋ = −1e6 (x − cos t); explicit DP54 must take steps ~ 3e-6 for stability
    const sys: HybridSystem = {
      dim: 1,
      flow: (t, x, d) => {
        d[0] = -1e6 * (x[0]! - Math.cos(t));
      },
      jump: () => null,
    };
    const arc = sim(sys, [0], { tEnd: 1, integrator: { kind: 'dp54', rtol: 1e-6, atol: 1e-9, hMin: 1e-3, hInit: 1e-3 } });
    expect(arc.outcome.status).toBe('step-underflow');
    expect(arc.outcome.t).toBeLessThan(1);
  });

  it('max-steps on both paths', () => {
    expect(sim(sampled(0.1, false), [1, 0], { integrator: RK4, maxSteps: 10, record: 'none' }).outcome).toMatchObject({
      status: 'max-steps',
    });
    const a = sim(
      {
        dim: 1,
        flow: (_t, x, d) => {
          d[0] = x[0]!;
        },
        jump: () => null,
      },
      [1],
      { integrator: { kind: 'rk4', dt: 0.01 }, maxSteps: 10 },
    );
    expect(a.outcome.status).toBe('max-steps');
    expect(a.outcome.t).toBeCloseTo(0.1, 12);
  });

  it('cancellation by onRecord returning false and by system.stop()', () => {
    const a = sim(sampled(0.1, false), [1, 0], { integrator: RK4, record: { every: 'scheduled', onRecord: (t) => t < 0.45 } });
    expect(a.outcome).toMatchObject({ status: 'cancelled' });
    expect(a.outcome.t).toBeCloseTo(0.5, 12);
    let n = 0;
    const b = sim({ ...sampled(0.1, false), stop: () => ++n > 7 }, [1, 0], { integrator: DP, record: 'none' });
    expect(b.outcome.status).toBe('cancelled');
    expect(b.outcome.message).toMatch(/asked to stop/);
  });
});

describe('recording', () => {
  const expo: HybridSystem = {
    dim: 1,
    flow: (_t, x, d) => {
      d[0] = x[0]!;
    },
    jump: () => null,
  };

  it("'interval' samples t0 + k·dt from the dense output (eᵗ to the integrator's accuracy)", () => {
    for (const integrator of [RK4, DP]) {
      const arc = sim(expo, [1], { t0: 0.5, tEnd: 1.5, integrator, record: { every: 'interval', dt: 0.1 } });
      expect(arc.count).toBe(11);
      for (let k = 0; k < 11; k++) {
        expect(arc.t[k]).toBeCloseTo(0.5 + 0.1 * k, 14);
        expect(Math.abs(arc.x[k]! - Math.exp(arc.t[k]! - 0.5))).toBeLessThan(integrator.kind === 'rk4' ? 1e-7 : 1e-8);
      }
    }
  });

  it("'step' stores every accepted step; store: false streams points to onRecord only", () => {
    const arc = sim(expo, [1], { integrator: { kind: 'rk4', dt: 0.1 }, record: 'step' });
    expect(arc.count).toBe(11);
    const seen: number[] = [];
    const s = sim(expo, [1], {
      integrator: { kind: 'rk4', dt: 0.1 },
      record: {
        every: 'step',
        store: false,
        onRecord: (t) => {
          seen.push(t);
        },
      },
    });
    expect(s.count).toBe(0);
    expect(seen.length).toBe(11);
    expect(seen[10]).toBe(1);
  });
});

describe('validation: every bad option a named issue, all at once', () => {
  const ok: HybridSystem = {
    dim: 2,
    flow: (_t, _x, d) => {
      d[0] = 0;
      d[1] = 0;
    },
    jump: () => null,
  };

  it('top-level and integrator options', () => {
    const r = simulateHybrid(ok, [0, 0], {
      t0: NaN,
      tEnd: -1,
      jMax: 0,
      integrator: { kind: 'dp54', rtol: 2, atol: -1, hMax: 0 },
      maxJumpsPerInstant: 0.5,
      eventTimeTol: 0,
      zenoWindow: -1,
      eventScan: 100,
      maxSteps: 0,
      record: { every: 'sometimes' as never, dt: 1, store: 'yes' as never },
      extra: 1,
    } as unknown as HybridOptions);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
      'extra:unknown-option',
      't0:finite',
      'jMax:integer',
      'integrator.rtol:range',
      'integrator.atol:non-negative',
      'integrator.hMax:positive',
      'maxJumpsPerInstant:integer',
      'eventTimeTol:positive',
      'zenoWindow:positive',
      'eventScan:integer',
      'maxSteps:integer',
      'record.every:one-of',
      'record.dt:unused',
      'record.store:boolean',
    ]);
  });

  it('rk4 options, tEnd order, record interval without dt, unknown integrator', () => {
    const a = simulateHybrid(ok, [0, 0], { tEnd: 1, integrator: { kind: 'rk4', dt: 0, rtol: 1 } as never, record: { every: 'interval' } });
    expect(a.ok ? [] : a.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
      'integrator.rtol:unknown-option',
      'integrator.dt:positive',
      'record.dt:positive',
    ]);
    const b = simulateHybrid(ok, [0, 0], { t0: 2, tEnd: 1, integrator: { kind: 'euler' } as never });
    expect(b.ok ? [] : b.errors.map((e) => `${e.path}:${e.rule}`)).toEqual(['tEnd:order', 'integrator.kind:one-of']);
    const c = simulateHybrid(ok, [0, 0], undefined as never);
    expect(c.ok ? [] : c.errors.map((e) => `${e.path}:${e.rule}`)).toEqual(['options:required']);
  });

  it('system and initial state', () => {
    const r = simulateHybrid({ dim: 2, flow: 3, jump: undefined, jumpGuard: 'x', both: 'maybe' } as never, [0, NaN, 1] as never, {
      tEnd: 1,
      integrator: RK4,
    });
    expect(r.ok ? [] : r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
      'system.flow:function',
      'system.jump:function',
      'system.jumpGuard:function',
      'system.both:one-of',
      'x0:shape',
      'x0[1]:finite',
    ]);
  });
});
