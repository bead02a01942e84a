/**
 * The online metrics recorder (metrics/online.ts, fed by the closed loop through sim/sink.ts)
 * against the trace path (metrics/metrics.ts computeMetrics on the finished trace): the same
 * RunMetrics, verdict and study row, equal EXACTLY (Object.is on every number), on seeded sets of
 * dispersed study cases of the two bundled examples with a study (every law the registry has:
 * tern12 flies quaternion-pd, sign-switch, eigenaxis, hysteretic and synergistic; petrel16 the two
 * pointing laws) and on the bundled scenarios' own flights (several segments, follow-plan and
 * step-target, an orbit plan with moving targets, wheel saturation).
 *
 * Reference: the trace path is the definition (each of its measures is checked against its own
 * sources in metrics tests); this file checks that the bookkeeping of the online path changes no
 * bit. A synthetic run checks the online path against hand-worked values as well
 * (trapezoidal rule: Abramowitz & Stegun, Handbook of Mathematical Functions, 25.4.2).
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { differences } from '../unit/exact-differences';
import { makeStudyContext } from '../../app/engine/study/context';
import { caseErrorGrid, caseRunOf, caseRunOnline, prepareCase, runCase } from '../../app/engine/study/runCase';
import { flyAndSummarise, preparePipeline } from '../../app/engine/pipeline/run';
import { flyOnline, onlineFlightPossible } from '../../app/engine/pipeline/flyOnline';
import { makeRng } from '../../app/engine/math/prng';
import { OnlineMetrics } from '../../app/engine/metrics/online';
import { PACKED_ERROR_ANGLE, PACKED_SCALARS, PACKED_T, type PackedSample } from '../../app/engine/sim/trace';

const root = path.resolve(__dirname, '../..');
const asset = (name: string): unknown => JSON.parse(fs.readFileSync(path.join(root, 'assets', name), 'utf8'));

/** Seeded case indices: `count` distinct draws below `below` (xoshiro128**, app/engine/math/prng.ts). */
function caseIndices(seed: number, count: number, below: number): number[] {
  const rng = makeRng(seed, 0);
  const s = new Set<number>();
  while (s.size < count) s.add(Math.floor(rng.next() * below));
  return [...s];
}

describe('online metrics equal the trace path on dispersed study cases', () => {
  for (const [file, seed, count] of [
    ['tern12-reversal.scenario.json', 11, 14],
    ['petrel16-pointing.scenario.json', 5, 10],
  ] as const) {
    it(`${file}: every law, ${count} seeded cases, metrics, verdict and row bit for bit`, () => {
      const c = makeStudyContext(asset(file), { runs: 100_000, seed });
      expect(c.ok).toBe(true);
      if (!c.ok) return;
      const ctx = c.value;
      const laws = new Set<string>();
      let settled = 0,
        notSettled = 0;
      const seen = { reversals: 0, saturated: 0, jumped: 0 };
      for (const index of caseIndices(seed, count, 100_000)) {
        const pc = prepareCase(ctx, index);
        if (!pc.ok) continue;
        expect(onlineFlightPossible(pc.prepared)).toBe(true);
        for (const ctrl of pc.prepared.controllers) {
          laws.add(ctrl.law);
          const viaTrace = flyAndSummarise(pc.prepared, ctrl, ctx.def.mode, { monitor: false, constraintSeries: false });
          const online = flyOnline(pc.prepared, ctrl, ctx.def.mode, caseErrorGrid(ctx));
          const where = `${file} case ${index} ${ctrl.id}`;
          expect(differences(online.metrics, viaTrace.metrics), where).toEqual([]);
          expect(online.verdict, where).toEqual(viaTrace.verdict);
          expect(differences(online.outcome, viaTrace.outcome), where).toEqual([]);
          expect(online.recorder.count, where).toBe(viaTrace.trace.n);
          seen.reversals += viaTrace.metrics.torqueReversals > 0 ? 1 : 0;
          seen.saturated += viaTrace.metrics.saturation.length > 0 ? 1 : 0;
          seen.jumped += viaTrace.metrics.jumps > 0 ? 1 : 0;
          expect(differences(caseRunOnline(ctx, pc.draw, online), caseRunOf(ctx, pc.draw, viaTrace)), where).toEqual([]);
          if (viaTrace.verdict.kind === 'settled') settled++;
          else notSettled++;
        }
      }
      expect(laws.size).toBe(ctx.controllers.length);
      // the set holds settled runs (and, for tern12's 175° reversal, some that are not)
      expect(settled).toBeGreaterThan(0);
      if (file.startsWith('tern12')) expect(settled + notSettled).toBe(5 * count);
      // the set exercises the look-ahead parts: torque reversals (chatter) and time at a wheel limit
      expect(seen.reversals).toBeGreaterThan(0);
      if (file.startsWith('tern12')) expect(seen.saturated).toBeGreaterThan(0);
    });
  }

  it('runCase: the online rows equal the trace rows (tern12, 4 cases)', () => {
    const c = makeStudyContext(asset('tern12-reversal.scenario.json'), { runs: 50, seed: 11 });
    if (!c.ok) throw new Error('tern12 study context');
    for (const i of [0, 7, 19, 42]) {
      const a = runCase(c.value, i);
      const b = runCase(c.value, i, undefined, { online: false });
      expect(differences(a, b), `case ${i}`).toEqual([]);
    }
  });
});

describe('online metrics equal the trace path on the bundled scenarios’ own flights', () => {
  for (const file of ['lumen6-imaging.scenario.json', 'kestrel60-momentum.scenario.json', 'lumen6-orbit-day.scenario.json']) {
    it(`${file}: every controller and mode`, () => {
      const p = preparePipeline(asset(file));
      expect(p.ok).toBe(true);
      if (!p.ok) return;
      for (const ctrl of p.value.controllers)
        for (const mode of p.value.scenario.simulation.modes) {
          const viaTrace = flyAndSummarise(p.value, ctrl, mode, { monitor: false, constraintSeries: false });
          const online = flyOnline(p.value, ctrl, mode, null);
          const where = `${file} ${ctrl.id} ${mode}`;
          expect(differences(online.metrics, viaTrace.metrics), where).toEqual([]);
          expect(online.verdict, where).toEqual(viaTrace.verdict);
        }
    });
  }
});

/** A hand-made sample (one wheel), the loop's packed layout. */
function sample(t: number, w: [number, number, number], tauCmd: [number, number, number], err: number, seg = 0): PackedSample {
  const scalars = new Float64Array(PACKED_SCALARS);
  scalars[PACKED_T] = t;
  scalars[PACKED_ERROR_ANGLE] = err;
  const half = err / 2;
  return {
    j: 0,
    segment: seg,
    scalars,
    q: Float64Array.of(Math.sin(half), 0, 0, Math.cos(half)),
    omega: Float64Array.from(w),
    hWheel: Float64Array.of(0.5),
    qRef: Float64Array.of(0, 0, 0, 1),
    omegaRef: new Float64Array(3),
    torqueCmdBody: Float64Array.from(tauCmd),
    torqueBody: Float64Array.of(0.001, 0, 0),
    wheelTorqueCmd: Float64Array.of(0),
    wheelTorque: Float64Array.of(0.002),
    wheelTorqueNet: Float64Array.of(0),
  };
}

describe('online metrics on a hand-worked run', () => {
  it('settle time, rotation travelled, chatter, wheel peaks and effort', () => {
    const rec = new OnlineMetrics(1, {
      settleAngleRad: 0.01,
      settleRateRadPerS: 0.05,
      chatterWindowS: 10,
      maxTorqueNm: [0.004],
      maxMomentumNms: [1],
      segmentTargets: Float64Array.of(0, 0, 0, 1),
      plannedSwitchTimes: [],
    });
    // 0.1 rad/s about x for t = 0..4 s, then at rest; error angle 0.5 rad falling to 0 at t = 5 s.
    // Torque request alternates in sign every second up to t = 3 s, then zero.
    for (let k = 0; k <= 10; k++) {
      const t = k;
      const w: [number, number, number] = t <= 4 ? [0.1, 0, 0] : [0, 0, 0];
      const tau: [number, number, number] = t <= 3 ? [k % 2 === 0 ? 0.001 : -0.001, 0, 0] : [0, 0, 0];
      expect(rec.push(sample(t, w, tau, t < 5 ? 0.5 * (1 - t / 5) : 0))).toBe(true);
    }
    // a non-finite sample is refused and changes nothing (sim/sink.ts contract)
    expect(rec.push(sample(11, [NaN, 0, 0], [0, 0, 0], 0))).toBe(false);
    const m = rec.metrics([]);
    // Trapezoidal rule (A&S 25.4.2) on |ω|: 0.1 rad/s for 4 s, then a ramp to 0 over [4, 5] s: 0.4 + 0.05.
    expect(m.rotationTravelledRad).toBeCloseTo(0.45, 15);
    // Settle (segments.ts definition): the first sample after the last one outside 0.01 rad and
    // 0.05 rad/s is t = 5 s (t = 4 s still moves at 0.1 rad/s), measured from t = 0.
    expect(m.settleTimeS).toBe(5);
    // Shortest: the error at the first sample, 0.5 rad (the attitude is a rotation of 0.5 rad about x).
    expect(m.shortestRotationRad).toBeCloseTo(0.5, 14);
    // Chatter (chatter.ts definition): reversals at t = 1, 2, 3 s, all in one 10 s window → 3/10 per s.
    expect(m.torqueReversals).toBe(3);
    expect(m.chatterPerS).toBeCloseTo(0.3, 15);
    // Wheel peaks: |0.002| / 0.004 = 0.5 of the torque limit; 0.5 / 1 of the momentum limit.
    expect(m.peakWheelTorqueFraction).toBe(0.5);
    expect(m.peakWheelMomentumFraction).toBe(0.5);
    expect(m.saturation).toEqual([]);
    // Effort ∫|τ_body| dt over 10 s at 0.001 N·m = 0.01 N·m·s.
    expect(m.controlEffortNms).toBeCloseTo(0.01, 15);
    expect(rec.count).toBe(11);
    expect(rec.lastT).toBe(10);
  });
});
