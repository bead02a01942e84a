/**
 * What the hybrid laws promise, checked as shares over seeded studies that start within a few
 * degrees of a 180° attitude error (both quaternion hemispheres).
 *
 * Expected behaviour and its sources:
 * - Continuous quaternion PD drives q_e to the lift +1 whatever the hemisphere it starts in, so a
 *   start with η₀ < 0 turns the long way round (unwinding; Bhat & Bernstein, "A topological
 *   obstruction to continuous global stabilization of rotational motion and the unwinding
 *   phenomenon", Systems & Control Letters 39(1):63–70, 2000). The hysteretic law keeps the lift
 *   h = sgn(η₀) until h·η ≤ −δ, and the synergistic law is defined on SO(3), so neither does
 *   (Mayhew, Sanfelice & Teel, "Quaternion-based hybrid control for robust global attitude
 *   tracking", IEEE TAC 56(11):2555–2566, 2011; methods §3, §4).
 * - A memoryless sign switch s = sgn(η) can be held near η = 0 (a 180° error) by arbitrarily
 *   small bounded noise that misleads its sign decision; with hysteresis δ larger than the noise
 *   the hybrid law cannot be (Mayhew, Sanfelice & Teel 2011, robustness of hybrid feedback; the
 *   same mechanism is analysed in their "On path-lifting mechanisms and unwinding in
 *   quaternion-based attitude control", IEEE TAC 58(5):1179–1191, 2013). With the worst-case
 *   noise model of sim/sensors.ts at ē = 0.05 < δ, the sign switch chatters while the hysteretic
 *   (δ = 0.2) and synergistic laws do not.
 * The vehicle is invented for these tests (study-fixtures.ts: a small body with a fast triad, so
 * cases settle within a minute and the test stays quick). Shares, not pictures.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runStudy } from '../../app/engine/study/runner';
import type { StudyResult } from '../../app/engine/study/runner';
import { testVehicleScenario } from '../unit/study-fixtures';

function run(study: Record<string, unknown>): StudyResult {
  const r = runStudy(testVehicleScenario(study));
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
  return r.value;
}

describe('near-reversal starts with random sensor noise: who unwinds (Bhat & Bernstein 2000; MST 2011)', () => {
  let res: StudyResult;
  let far: StudyResult['records'];
  let near: StudyResult['records'];
  const ci = (id: string) => res.info.controllers.findIndex((c) => c.id === id);
  beforeAll(() => {
    res = run({
      runs: 40,
      seed: 2011,
      durationS: 300,
      stopAfterSettledForS: 10,
      dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 5 }, sensors: { attitudeNoiseScale: [1, 3] } },
    });
    far = res.records.filter((r) => r.draw.errorEta < 0);
    near = res.records.filter((r) => r.draw.errorEta > 0);
  });

  it('the draw covers both hemispheres', () => {
    // The sign is a fair coin per case: fewer than 6 of 40 on one side has probability ≈ 1.4e-6.
    expect(far.length).toBeGreaterThan(5);
    expect(near.length).toBeGreaterThan(5);
    for (const r of res.records) expect(180 - (r.draw.errorAngleRad * 180) / Math.PI).toBeLessThanOrEqual(5 + 1e-9);
  });

  it('continuous PD unwinds in every far-hemisphere case with a clearly shorter way, and in no near-hemisphere case', () => {
    const k = ci('pd');
    // "Clearly shorter" (metrics/segments.ts): the long way 2π − θ₀ is at least 2° longer, θ₀ ≤ 179°.
    const clear = far.filter((r) => r.draw.errorAngleRad <= (179 * Math.PI) / 180);
    expect(clear.length).toBeGreaterThan(5);
    expect(clear.filter((r) => r.runs[k]!.unwound).length).toBe(clear.length);
    // Every far start goes the long way; within 1° of 180° that is not called unwinding.
    expect(far.every((r) => r.runs[k]!.longWay)).toBe(true);
    expect(near.filter((r) => r.runs[k]!.unwound).length).toBe(0);
    // It ends at η = +1 from η₀ < 0: it turned 360° − θ₀, i.e. more than the shortest rotation.
    for (const r of far) expect(r.runs[k]!.finalEta).toBeGreaterThan(0.5);
  });

  it('the hysteretic and synergistic laws do not unwind (≤ 5 %) and settle in every case', () => {
    for (const id of ['hyst', 'syn']) {
      const k = ci(id);
      const c = res.summary.controllers[k]!;
      expect(c.shares.unwound.share).toBeLessThanOrEqual(0.05);
      expect(c.shares.settled.share).toBe(1);
    }
    // The hysteretic law ends on the lift it started nearest to: η_end has the sign of η₀.
    const k = ci('hyst');
    for (const r of res.records) expect(Math.sign(r.runs[k]!.finalEta)).toBe(Math.sign(r.draw.errorEta));
    // The SO(3) law never adds a big detour: extra rotation stays far below a turn.
    expect(res.summary.controllers[ci('syn')]!.spreads.extraRotationDeg.max!).toBeLessThan(60);
  });
});

describe('near-reversal starts with worst-case bounded noise ē = 0.05 < δ: who chatters (MST 2011, 2013)', () => {
  let res: StudyResult;
  const byId = (id: string) => res.summary.controllers.find((c) => c.controllerId === id)!;
  beforeAll(() => {
    res = run({
      runs: 24,
      seed: 2013,
      durationS: 300,
      stopAfterSettledForS: 10,
      controllers: ['sign', 'hyst', 'syn'],
      dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 4 }, sensors: { adversarialEta: 0.05 } },
    });
  });

  it('the sign-switch law chatters in a clear share of the cases (≥ 50 %) and is held near 180° for long', () => {
    const s = byId('sign');
    expect(s.shares.chattered.share).toBeGreaterThanOrEqual(0.5);
    // Held near the reversal: its median settle time is well beyond the hybrid laws'.
    const hyst = byId('hyst');
    expect(s.spreads.settleTimeS.median === null || s.spreads.settleTimeS.median > 1.5 * hyst.spreads.settleTimeS.median!).toBe(true);
  });

  it('the hysteretic and synergistic laws do not chatter (≤ 5 %) and all settle', () => {
    for (const id of ['hyst', 'syn']) {
      const c = byId(id);
      expect(c.shares.chattered.share).toBeLessThanOrEqual(0.05);
      expect(c.shares.settled.share).toBe(1);
    }
  });
});
