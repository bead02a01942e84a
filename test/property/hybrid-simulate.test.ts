/**
 * Property: whatever the flow does (blow-up, NaN), whatever the jump map returns, the simulator
 * returns an arc with only finite numbers, hybrid time that never runs backwards, and an outcome
 * from the documented list with a message (the engine's "results, not exceptions; never NaN"
 * rule). The flows are invented: ẋ = a·x² + b (finite-time blow-up for some a, b), an optional
 * poisoned region, a guard level and a jump map that may itself produce non-finite values.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { simulateHybrid } from '../../app/engine/hybrid/index';
import type { HybridSystem, IntegratorOptions } from '../../app/engine/hybrid/index';

const STATUSES = ['completed', 'zeno', 'step-underflow', 'non-finite', 'max-steps', 'blocked', 'cancelled'];

describe('simulateHybrid never returns NaN (fast-check)', () => {
  it('random blow-up flows, poisoned regions and bad jump maps', () => {
    fc.assert(
      fc.property(
        fc.record({
          a: fc.double({ min: -5, max: 5, noNaN: true }),
          b: fc.double({ min: -2, max: 2, noNaN: true }),
          x0: fc.double({ min: -3, max: 3, noNaN: true }),
          poison: fc.option(fc.double({ min: -10, max: 10, noNaN: true })),
          level: fc.option(fc.double({ min: -5, max: 5, noNaN: true })),
          reset: fc.oneof(fc.double({ min: -5, max: 5 }), fc.constantFrom(NaN, Infinity)),
          report: fc.boolean(),
          rk4: fc.boolean(),
          Ts: fc.option(fc.double({ min: 0.01, max: 0.5, noNaN: true })),
        }),
        ({ a, b, x0, poison, level, reset, report, rk4, Ts }) => {
          let k = 0;
          const sys: HybridSystem = {
            dim: 1,
            flow: (_t, x, d) => {
              d[0] = poison !== null && x[0]! > poison ? NaN : a * x[0]! * x[0]! + b;
            },
            jump: (_t, x, xp) => {
              xp[0] = reset;
              k++;
              return report ? { what: 'reset', from: x[0]!, to: reset, why: 'test' } : null;
            },
          };
          if (level !== null) sys.jumpGuard = (_t, x) => x[0]! - level;
          if (Ts !== null) sys.nextScheduledJump = () => k * Ts;
          const integrator: IntegratorOptions = rk4 ? { kind: 'rk4', dt: 0.05 } : { kind: 'dp54', rtol: 1e-6, atol: 1e-9 };
          const r = simulateHybrid(sys, [x0], { tEnd: 3, integrator, maxSteps: 20000 });
          expect(r.ok).toBe(true);
          if (!r.ok) return;
          const arc = r.value;
          for (const v of arc.x) expect(Number.isFinite(v)).toBe(true);
          expect(Number.isFinite(arc.finalState[0])).toBe(true);
          for (let i = 1; i < arc.count; i++) {
            expect(arc.t[i]).toBeGreaterThanOrEqual(arc.t[i - 1]!);
            expect(arc.j[i]).toBeGreaterThanOrEqual(arc.j[i - 1]!);
          }
          expect(STATUSES).toContain(arc.outcome.status);
          expect(arc.outcome.message.length).toBeGreaterThan(10);
          expect(arc.outcome.t).toBeLessThanOrEqual(3);
          expect(arc.outcome.j).toBe(arc.events.length);
        },
      ),
      { numRuns: 400 },
    );
  });
});
