/**
 * Pointing-only studies through the pipeline (study/runner.ts → the same build, plan, fly and
 * metrics as `slewsmith compare`), on the bundled Petrel-16 example (invented vehicle):
 *  - uniform starts (the pointed axis uniform on S², study-pointing-sampling.test.ts checks the
 *    distribution) with random sensor noise: the synergistic law settles in every case;
 *  - near-antipode starts (within 1° of −r) under the worst-case bounded noise ē = 2°: the smooth
 *    law settles in no case, the synergistic one in every case;
 *  - every undesired critical point y_q* of every member, with the logic on that member (an
 *    equilibrium of its flow), without and with random sensor noise: the law jumps at t = 0 to
 *    another member and settles. y_q* = R(−θ*, u_q)(−b) with θ* − k(1 + cos θ*) = 0 (closed form
 *    derived in sphere-certificate.test.ts), rotated with the npm `quaternion` package.
 * Theory: Mayhew & Teel, Automatica 2013 (synergistic hybrid feedback on S², global and robust to
 * small noise; venue from memory); the smooth law's antipode is an equilibrium of every continuous
 * feedback on S² (same paper; Bhat & Bernstein, Systems & Control Letters 39(1), 2000, on the
 * obstruction), and the noise shows it the antipode exactly (control/sphere/noise.ts).
 * Case counts are kept small for the shared test machine (40 and 30 cases, 2 laws each); the
 * 1,000-start check through the closed loop itself is sphere-closedloop.test.ts.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { runStudy, type StudyResult } from '../../app/engine/study/runner';
import { flyAndSummarise, prepareResolved } from '../../app/engine/pipeline/run';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { validateScenario } from '../../app/engine/scenario/validate';
import { RAD_PER_DEG } from '../../app/engine/units';

const json = JSON.parse(readFileSync(path.resolve(__dirname, '../../assets/petrel16-pointing.scenario.json'), 'utf8'));

function study(block: Record<string, unknown>): StudyResult {
  const s = structuredClone(json);
  s.study = { ...s.study, ...block };
  const r = runStudy(s);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
  return r.value;
}

const settledShare = (res: StudyResult, id: string) => {
  const ci = res.info.controllers.findIndex((c) => c.id === id);
  return res.records.filter((r) => r.runs[ci]!.status === 'settled').length / res.records.length;
};

describe('pointing-only study cases', () => {
  it('uniform starts with random sensor noise: the synergistic law settles in every one of 40 cases', () => {
    const res = study({
      runs: 40,
      seed: 7,
      controllers: ['synergistic'],
      durationS: 400,
      dispersions: { initialAttitude: { mode: 'uniform' }, sensors: { attitudeNoiseScale: [1, 3] } },
    });
    expect(res.records.length).toBe(40);
    expect(settledShare(res, 'synergistic')).toBe(1);
  });

  it('near-antipode starts under worst-case noise: smooth 0 of 30 settle, synergistic 30 of 30', () => {
    const res = study({ runs: 30, seed: 11, durationS: 300 });
    expect(res.records.length).toBe(30);
    expect(settledShare(res, 'smooth')).toBe(0);
    expect(settledShare(res, 'synergistic')).toBe(1);
  });
});

/** θ* of the warped family: θ − k(1 + cos θ) = 0 by bisection. */
function thetaStar(k: number): number {
  let lo = 0,
    hi = 2 * k;
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (lo + hi);
    if (m - k * (1 + Math.cos(m)) < 0) lo = m;
    else hi = m;
  }
  return 0.5 * (lo + hi);
}

describe('from every undesired critical point of every member, through the pipeline', () => {
  const syn = json.controllers[1];
  const th = thetaStar(syn.warpGain);
  const t0 = json.targets[0].attitude.pointing;
  const n = Math.hypot(...(t0.inertialDirection as number[]));
  const r = (t0.inertialDirection as number[]).map((x) => x / n) as [number, number, number];
  for (const noisy of [false, true])
    for (let q = 1; q <= syn.warpAzimuthsDeg.length; q++)
      it(`member ${q}${noisy ? ', with random sensor noise' : ', no noise'}: jumps at t = 0 and settles`, () => {
        const a = syn.warpAzimuthsDeg[q - 1] * RAD_PER_DEG;
        const ystar = Quaternion.fromAxisAngle([Math.cos(a), Math.sin(a), 0], -th).rotateVector([0, 0, -1]) as [number, number, number];
        const q0 = Quaternion.fromVectors(ystar, r); // R(q0) y* = r: the law sees y = R(q0)ᵀ r = y*
        const file = structuredClone(json);
        file.initial.attitude = { quaternion: [q0.x, q0.y, q0.z, q0.w] };
        file.targets = [file.targets[0]];
        file.vehicle.sensors = noisy
          ? { attitudeNoiseArcsec: 30, rateNoiseDegPerS: 0.005, rateBiasDegPerS: [0.001, -0.001, 0.0005] }
          : { attitudeNoiseArcsec: 0, rateNoiseDegPerS: 0, rateBiasDegPerS: [0, 0, 0] };
        const v = validateScenario(file);
        if (!v.ok) throw new Error(JSON.stringify(v.errors));
        const s = resolveScenario(v.value);
        s.controllers[1]!.initialLogic = q;
        const p = prepareResolved(s, v.value, ['synergistic']);
        if (!p.ok) throw new Error(JSON.stringify(p.errors));
        const run = flyAndSummarise(p.value, p.value.controllers[0]!, 'step-target');
        expect(run.jumps.length).toBeGreaterThanOrEqual(1);
        expect(run.jumps[0]!.t).toBe(0);
        expect(run.jumps[0]!.from).toBe(q);
        expect(run.jumps[0]!.to).not.toBe(q);
        // the start is member q's undesired point: V_q = 2 there, and the gap is the closed form
        // 1.5 sin²θ* of three members 120° apart (sphere-certificate.test.ts), so the first sample
        // (recorded after the jump to the argmin) has potential 2 − 1.5 sin²θ* and zero gap
        if (!noisy) {
          expect(Math.abs(run.trace.potential[0]! - (2 - 1.5 * Math.sin(th) ** 2))).toBeLessThan(1e-9);
          expect(Math.abs(run.trace.gap[0]!)).toBeLessThan(1e-12);
        }
        expect(run.verdict.kind).toBe('settled');
        expect(run.monitor).toEqual([]);
      });
});
