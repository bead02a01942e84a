/**
 * setTime: locating the bracketing samples and interpolating between them.
 *
 * Reference: a constant body-rate run has the closed form q(t) = q0 ⊗ exp(½ ω t) (the same form
 * references.md §1.6 gives for the CCSDS check), and slerp between two points of a constant-axis,
 * constant-rate rotation is exactly that rotation at intermediate times (Shoemake, SIGGRAPH 1985).
 * Index lookups are checked against a brute-force linear scan.
 */
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../app/engine/math/prng';
import { AttitudeScene } from '../../app/view3d/attitudeScene';
import { activeTargetIndex } from '../../app/view3d/runContent';
import { countUpTo, createCursor, lerpChannel, locateSample } from '../../app/view3d/sampling';
import type { SyntheticRunSpec } from './view3d-fixtures';
import { syntheticAttitude, syntheticViewRun } from './view3d-fixtures';

const rng = makeRng(77, 3);

const sameAttitude = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  const s = a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]! < 0 ? -1 : 1;
  return Math.max(...[0, 1, 2, 3].map((i) => Math.abs(a[i]! - s * b[i]!)));
};

function bruteLocate(t: ArrayLike<number>, n: number, time: number): number {
  if (!(time >= t[0]!)) return 0;
  let i = 0;
  for (let k = 0; k < n; k++) if (t[k]! <= time) i = k;
  return i;
}

describe('locateSample', () => {
  it('finds the last sample with t_i ≤ time, with and without a useful hint (random times, duplicates)', () => {
    // Irregular times with two duplicated instants (a located jump stores two samples at one t).
    const t = Float64Array.from([0, 0.1, 0.2, 0.2, 0.35, 0.5, 0.5, 0.9, 1.4, 2.0]);
    const n = t.length;
    const c = createCursor();
    for (let k = 0; k < 2000; k++) {
      const time = -0.5 + 3 * rng.next();
      if (k % 3 === 0) c.i = Math.floor(rng.next() * n); // arbitrary stale hint
      locateSample(t, n, time, c);
      expect(c.i).toBe(bruteLocate(t, n, time));
      expect(c.alpha).toBeGreaterThanOrEqual(0);
      expect(c.alpha).toBeLessThan(1);
      if (c.i1 !== c.i) expect(t[c.i1]).toBeGreaterThan(time);
    }
  });

  it('at a jump instant picks the post-jump sample; clamps before the start, after the end, and NaN', () => {
    const t = Float64Array.from([0, 1, 2, 2, 3]);
    const c = createCursor();
    expect(locateSample(t, 5, 2, c).i).toBe(3);
    expect(c.alpha).toBe(0);
    expect(locateSample(t, 5, -4, c)).toMatchObject({ i: 0, alpha: 0 });
    expect(locateSample(t, 5, 99, c)).toMatchObject({ i: 4, i1: 4, alpha: 0 });
    expect(locateSample(t, 5, Number.NaN, c)).toMatchObject({ i: 0, alpha: 0 });
    expect(locateSample(t, 0, 1, c).i).toBe(-1);
    expect(locateSample(t, 5, 2.5, c)).toMatchObject({ i: 3, i1: 4, alpha: 0.5 });
  });

  it('lerpChannel and countUpTo', () => {
    const a = Float64Array.from([0, 10, 1, 20, 2, 40]);
    const c = locateSample(Float64Array.from([0, 1, 2]), 3, 1.25, createCursor());
    const out = new Float64Array(2);
    lerpChannel(out, 0, a, 2, c);
    expect(out[0]).toBeCloseTo(1.25, 15);
    expect(out[1]).toBeCloseTo(25, 13);
    const times = Float64Array.from([1, 2, 2, 5]);
    expect([0.5, 1, 2, 4.9, 5, 9].map((x) => countUpTo(times, 4, x))).toEqual([0, 1, 3, 3, 4, 4]);
  });
});

describe('AttitudeScene.setTime poses the body by slerp between samples', () => {
  const spec: SyntheticRunSpec = {
    n: 400,
    dt: 0.5,
    q0: Float64Array.from([0.1142993, 0.2285985, 0.2285985, 0.9393727]).map((x, _i, arr) => x / Math.hypot(...arr)),
    omegaBody: [0.02, -0.03, 0.05],
    jumpSamples: [50, 220],
    logicKind: 'sign',
  };

  for (const alternateSign of [false, true]) {
    it(`matches the closed-form attitude at random times (stored signs ${alternateSign ? 'alternating' : 'continuous'})`, () => {
      const scene = new AttitudeScene();
      scene.setRuns([syntheticViewRun({ ...spec, alternateSign })], 'single');
      const rc = scene.viewports[0]!.runs[0]!;
      const exact = new Float64Array(4);
      let worst = 0;
      for (let k = 0; k < 500; k++) {
        const t = rng.next() * (spec.n - 1) * spec.dt;
        scene.setTime(t);
        syntheticAttitude(exact, spec, t);
        const bq = rc.body.quaternion;
        worst = Math.max(worst, sameAttitude([bq.x, bq.y, bq.z, bq.w], exact), sameAttitude(rc.qNow, exact));
      }
      expect(worst).toBeLessThan(1e-12);
      scene.dispose();
    });
  }

  it('interpolates wheel momentum linearly and the reference ghost by slerp', () => {
    const scene = new AttitudeScene();
    const run = syntheticViewRun(spec);
    scene.setRuns([run], 'single');
    const rc = scene.viewports[0]!.runs[0]!;
    const tr = run.trace;
    const t = 10.3 * spec.dt; // 30 % of the way from sample 10 to 11
    scene.setTime(t);
    for (let c = 0; c < 3; c++) {
      const h = 0.7 * tr.hWheel[3 * 10 + c]! + 0.3 * tr.hWheel[3 * 11 + c]!;
      // Triad wheels: H equals the wheel momenta component-wise.
      expect(rc.momentum.H[c]).toBeCloseTo(h, 15);
    }
    // Reference ghost: rotation about Z_I at 0.01 rad/s from q0 (fixture), exact under slerp.
    const rq = rc.referenceGhost!.quaternion;
    const half = 0.005 * t;
    const qz = [0, 0, Math.sin(half), Math.cos(half)];
    const q0 = spec.q0;
    const expected = [
      qz[3]! * q0[0]! + qz[0]! * q0[3]! + qz[1]! * q0[2]! - qz[2]! * q0[1]!,
      qz[3]! * q0[1]! - qz[0]! * q0[2]! + qz[1]! * q0[3]! + qz[2]! * q0[0]!,
      qz[3]! * q0[2]! + qz[0]! * q0[1]! - qz[1]! * q0[0]! + qz[2]! * q0[3]!,
      qz[3]! * q0[3]! - qz[0]! * q0[0]! - qz[1]! * q0[1]! - qz[2]! * q0[2]!,
    ];
    expect(sameAttitude([rq.x, rq.y, rq.z, rq.w], expected)).toBeLessThan(1e-12);
    scene.dispose();
  });

  it('shows only the active segment’s target ghost, posed at its target attitude', () => {
    const scene = new AttitudeScene();
    const run = syntheticViewRun(spec);
    scene.setRuns([run], 'single');
    const rc = scene.viewports[0]!.runs[0]!;
    const tEnd = run.trace.t[run.trace.n - 1]!;
    scene.setTime(0.25 * tEnd);
    expect(rc.targetGhosts.map((g) => g.visible)).toEqual([true, false]);
    scene.setTime(0.75 * tEnd);
    expect(rc.targetGhosts.map((g) => g.visible)).toEqual([false, true]);
    const g = rc.targetGhosts[1]!.quaternion;
    expect(sameAttitude([g.x, g.y, g.z, g.w], run.targets[1]!.q)).toBe(0);
    scene.setOptions({ showTarget: false });
    expect(rc.targets.visible).toBe(false);
    scene.dispose();
  });

  it('activeTargetIndex: gaps, before the first, after the last', () => {
    const s = Float64Array.from([0, 10, 30]);
    const e = Float64Array.from([10, 20, 40]);
    expect([-1, 0, 9.9, 10, 25, 30, 45].map((t) => activeTargetIndex(s, e, t))).toEqual([-1, 0, 0, 1, -1, 2, 2]);
  });

  it('records the update time', () => {
    const scene = new AttitudeScene();
    scene.setRuns([syntheticViewRun(spec)], 'single');
    scene.stats.lastUpdateMs = -1;
    scene.setTime(3);
    expect(scene.stats.lastUpdateMs).toBeGreaterThanOrEqual(0);
    scene.dispose();
  });
});
