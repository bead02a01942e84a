/**
 * The boresight trail from a synthetic RunTrace: positions, logic colouring, jump markers,
 * revealed range, great-circle comparison arc and keep-out entries.
 *
 * References: positions against the engine's qRotate and against the closed form of a constant
 * rotation about Z_I (direction (cos ωt, sin ωt, 0) for X_B); great-circle geometry against
 * spherical trigonometry (arc length = angle between the ends, every point in the ends' plane);
 * cone entry against the closed-form crossing time. Colours against three's Color conversion
 * of the style's hex values.
 */
import { describe, expect, it } from 'vitest';
import { Color, Matrix4, Vector3 } from 'three';
import { qFromAxisAngle, qRotate } from '../../app/engine/math/rotation';
import { AttitudeScene } from '../../app/view3d/attitudeScene';
import { LOGIC_INDEX, LOGIC_SIGN_NEG, LOGIC_SIGN_POS, SIZES } from '../../app/view3d/style';
import { greatCircleArc, keepOutEntries } from '../../app/view3d/trailMath';
import type { ViewRun } from '../../app/view3d/types';
import type { SyntheticRunSpec } from './view3d-fixtures';
import { syntheticAttitude, syntheticViewRun } from './view3d-fixtures';

const R = SIZES.sphereRadius;

const spec: SyntheticRunSpec = {
  n: 600,
  dt: 0.1,
  q0: qFromAxisAngle(new Float64Array(4), [1, 1, 0], 0.4),
  omegaBody: [0.05, 0.2, -0.1],
  jumpSamples: [100, 300, 450],
  logicKind: 'sign',
};

function build(run: ViewRun, opts = {}) {
  const scene = new AttitudeScene({ options: opts });
  scene.setRuns([run], 'single');
  return { scene, rc: scene.viewports[0]!.runs[0]! };
}

const rgb = (hex: number) => {
  const c = new Color().setHex(hex);
  return [c.r, c.g, c.b];
};

describe('trail geometry', () => {
  it('vertex k is the boresight R(q_k) b on the unit sphere (Float32, 1e-6), drawn at the sphere radius', () => {
    const run = syntheticViewRun(spec);
    for (const b of [
      [0, 0, 1],
      [1, 0, 0],
      [0.3, -0.5, 0.8],
    ]) {
      const { scene, rc } = build(run, { boresightBody: b });
      const nb = Math.hypot(b[0]!, b[1]!, b[2]!);
      const bu = b.map((x) => x / nb);
      const e = new Float64Array(3);
      for (let k = 0; k < run.trace.n; k += 7) {
        qRotate(e, run.trace.q.subarray(4 * k, 4 * k + 4), bu);
        for (let c = 0; c < 3; c++) expect(Math.abs(rc.trail.path[3 * k + c]! - e[c]!)).toBeLessThan(1e-6);
      }
      expect(rc.trail.line.scale.x).toBe(R);
      scene.dispose();
    }
  });

  it('changing the boresight axis rewrites the same preallocated buffer', () => {
    const { scene, rc } = build(syntheticViewRun(spec));
    const buf = rc.trail.path;
    const before = rc.trail.path[3 * 50];
    scene.setOptions({ boresightBody: [1, 0, 0] });
    expect(rc.trail.path).toBe(buf);
    expect(rc.trail.path[3 * 50]).not.toBe(before);
    // A zero axis is ignored: the previous axis stays.
    scene.setOptions({ boresightBody: [0, 0, 0] });
    expect(Array.from(rc.trail.axis)).toEqual([1, 0, 0]);
    scene.dispose();
  });

  it('setTime reveals samples 0..i by drawRange and the head reaches the interpolated direction', () => {
    const run = syntheticViewRun(spec);
    const { scene, rc } = build(run);
    const q = new Float64Array(4),
      e = new Float64Array(3);
    const tt = run.trace.t;
    for (const t of [0, 3.14159, 25.05, 59.85, tt[spec.n - 1]!, 1e9]) {
      scene.setTime(t);
      const tc = Math.min(t, tt[spec.n - 1]!);
      let i = 0;
      while (i + 1 < spec.n && tt[i + 1]! <= tc) i++;
      expect(rc.trail.line.geometry.drawRange).toMatchObject({ start: 0, count: i + 1 });
      const hp = rc.trail.head.geometry.getAttribute('position');
      qRotate(e, syntheticAttitude(q, spec, tc), [0, 0, 1]);
      expect(Math.abs(hp.getX(1) - e[0]!) + Math.abs(hp.getY(1) - e[1]!) + Math.abs(hp.getZ(1) - e[2]!)).toBeLessThan(3e-6);
      expect(hp.getX(0)).toBe(rc.trail.path[3 * i]);
    }
    scene.dispose();
  });
});

describe('trail colouring by the logic value', () => {
  it('sign logic: h = +1 before the first jump, −1 after it, back to +1 after the second', () => {
    const { scene, rc } = build(syntheticViewRun(spec));
    const pos = rgb(LOGIC_SIGN_POS),
      neg = rgb(LOGIC_SIGN_NEG);
    const col = (k: number) => Array.from(rc.trail.colors.subarray(3 * k, 3 * k + 3));
    const close = (a: number[], b: number[]) => a.every((x, i) => Math.abs(x - b[i]!) < 1e-7);
    expect(close(col(0), pos)).toBe(true);
    expect(close(col(99), pos)).toBe(true);
    expect(close(col(100), neg)).toBe(true);
    expect(close(col(299), neg)).toBe(true);
    expect(close(col(300), pos)).toBe(true);
    expect(close(col(450), neg)).toBe(true);
    expect(close(col(599), neg)).toBe(true);
    scene.dispose();
  });

  it('index logic: a palette colour per index value q = 1, 2, 3', () => {
    const run = syntheticViewRun({ ...spec, logicKind: 'index' });
    const { scene, rc } = build(run);
    for (const k of [0, 150, 350, 500]) {
      const q = run.trace.logic[k]!;
      const want = rgb(LOGIC_INDEX[q - 1]!);
      for (let c = 0; c < 3; c++) expect(rc.trail.colors[3 * k + c]).toBeCloseTo(want[c]!, 6);
    }
    expect(new Set([0, 150, 350, 500].map((k) => run.trace.logic[k])).size).toBe(3);
    scene.dispose();
  });
});

describe('jump markers', () => {
  it('sit at the boresight direction at each jump, and appear once their time has passed', () => {
    const run = syntheticViewRun(spec);
    const { scene, rc } = build(run);
    const m = new Matrix4(),
      p = new Vector3(),
      e = new Float64Array(3);
    expect(rc.trail.jumpMarkers.instanceMatrix.count).toBe(3);
    run.jumps.forEach((_jp, k) => {
      rc.trail.jumpMarkers.getMatrixAt(k, m);
      p.setFromMatrixPosition(m).divideScalar(R);
      const ks = spec.jumpSamples[k]!;
      qRotate(e, run.trace.q.subarray(4 * ks, 4 * ks + 4), [0, 0, 1]);
      expect(Math.abs(p.x - e[0]!) + Math.abs(p.y - e[1]!) + Math.abs(p.z - e[2]!)).toBeLessThan(1e-6);
    });
    const counts = [5, 10, 10.05, 30, 44.99, 45, 59].map((t) => {
      scene.setTime(t);
      return rc.trail.jumpMarkers.count;
    });
    expect(counts).toEqual([0, 1, 1, 2, 2, 3, 3]);
    scene.dispose();
  });

  it('a jump between samples is placed on the interpolated attitude (closed form)', () => {
    const run = syntheticViewRun(spec);
    run.jumps = [{ t: 12.34, j: 1, from: 1, to: -1 }];
    const { scene, rc } = build(run);
    const m = new Matrix4(),
      p = new Vector3(),
      e = new Float64Array(3);
    rc.trail.jumpMarkers.getMatrixAt(0, m);
    p.setFromMatrixPosition(m).divideScalar(R);
    qRotate(e, syntheticAttitude(new Float64Array(4), spec, 12.34), [0, 0, 1]);
    expect(Math.abs(p.x - e[0]!) + Math.abs(p.y - e[1]!) + Math.abs(p.z - e[2]!)).toBeLessThan(1e-6);
    scene.dispose();
  });
});

describe('great-circle comparison arc', () => {
  it('runs from the start to the end along the shorter great circle', () => {
    const a = [1, 0, 0],
      b = [0, Math.cos(0.3), Math.sin(0.3)];
    const N = 33;
    const pts = new Float64Array(3 * N);
    const th = greatCircleArc(pts, 0, a, b, N);
    expect(th).toBeCloseTo(Math.PI / 2, 14);
    const n = [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
    let len = 0;
    for (let m = 0; m < N; m++) {
      const x = pts[3 * m]!,
        y = pts[3 * m + 1]!,
        z = pts[3 * m + 2]!;
      expect(Math.hypot(x, y, z)).toBeCloseTo(1, 14);
      expect(x * n[0]! + y * n[1]! + z * n[2]!).toBeCloseTo(0, 14);
      if (m > 0) len += 2 * Math.asin(0.5 * Math.hypot(x - pts[3 * m - 3]!, y - pts[3 * m - 2]!, z - pts[3 * m - 1]!));
    }
    expect(len).toBeCloseTo(th, 12);
    expect(pts[3 * (N - 1)]).toBeCloseTo(b[0]!, 14);
    expect(pts[3 * (N - 1) + 1]).toBeCloseTo(b[1]!, 14);
    expect(pts[3 * (N - 1) + 2]).toBeCloseTo(b[2]!, 14);
  });

  it('antipodal ends give a half circle of unit points', () => {
    const pts = new Float64Array(3 * 9);
    expect(greatCircleArc(pts, 0, [0, 0, 1], [0, 0, -1], 9)).toBeCloseTo(Math.PI, 14);
    for (let m = 0; m < 9; m++) expect(Math.hypot(pts[3 * m]!, pts[3 * m + 1]!, pts[3 * m + 2]!)).toBeCloseTo(1, 14);
    expect(pts[3 * 4 + 2]).toBeCloseTo(0, 14);
  });

  it('in the scene: one arc per target from the segment’s first boresight to the target boresight; only the active one shows', () => {
    // Unwinding picture: the body turns 300° about Z_I (the long way) to a target 60° away.
    const s2: SyntheticRunSpec = {
      n: 301,
      dt: 1,
      q0: [0, 0, 0, 1],
      omegaBody: [0, 0, (300 * Math.PI) / 180 / 300],
      jumpSamples: [],
      logicKind: 'none',
    };
    const run = syntheticViewRun(s2, 'unwinding', [
      { tStart: 0, tEnd: 300, q: qFromAxisAngle(new Float64Array(4), [0, 0, 1], (-60 * Math.PI) / 180), label: 'goal' },
    ]);
    const { scene, rc } = build(run, { boresightBody: [1, 0, 0] });
    const arc = rc.trail.arcs[0]!;
    const pos = arc.geometry.getAttribute('position');
    expect(pos.getX(0)).toBeCloseTo(1, 6);
    expect(pos.getY(0)).toBeCloseTo(0, 6);
    const last = pos.count - 1;
    expect(pos.getX(last)).toBeCloseTo(Math.cos(-Math.PI / 3), 6);
    expect(pos.getY(last)).toBeCloseTo(Math.sin(-Math.PI / 3), 6);
    // The arc is the 60° way; the trail travelled 300°.
    let arcLen = 0,
      trailLen = 0;
    for (let m = 1; m <= last; m++)
      arcLen += Math.hypot(pos.getX(m) - pos.getX(m - 1), pos.getY(m) - pos.getY(m - 1), pos.getZ(m) - pos.getZ(m - 1));
    const p = rc.trail.path;
    for (let k = 1; k < run.trace.n; k++)
      trailLen += Math.hypot(p[3 * k]! - p[3 * k - 3]!, p[3 * k + 1]! - p[3 * k - 2]!, p[3 * k + 2]! - p[3 * k - 1]!);
    expect(arcLen).toBeCloseTo(Math.PI / 3, 3);
    expect(trailLen).toBeCloseTo((300 * Math.PI) / 180, 3);
    scene.setTime(10);
    expect(arc.visible).toBe(true);
    scene.setOptions({ showGreatCircle: false });
    expect(arc.parent!.visible).toBe(false);
    scene.dispose();
  });
});

describe('keep-out cones', () => {
  // X_B swept about Z_I at ω: direction (cos ωt, sin ωt, 0). A cone about +Y_I with half angle α
  // is entered when ωt first exceeds π/2 − α, i.e. at the first sample k with k·ω·dt > π/2 − α.
  const w = 0.01,
    dt = 1;
  const s3: SyntheticRunSpec = { n: 700, dt, q0: [0, 0, 0, 1], omegaBody: [0, 0, w], jumpSamples: [], logicKind: 'none' };
  const alpha = 0.25;
  const kEnter = Math.floor((Math.PI / 2 - alpha) / (w * dt)) + 1;
  // Leaves at π/2 + α, re-enters a cone about −X_I (α) at π − α.
  const kEnter2 = Math.floor((Math.PI - alpha) / (w * dt)) + 1;

  it('keepOutEntries finds the closed-form entry sample', () => {
    const run = syntheticViewRun(s3);
    const { scene, rc } = build(run, { boresightBody: [1, 0, 0] });
    expect(keepOutEntries(rc.trail.path, run.trace.n, [0, 1, 0], alpha)).toEqual([kEnter]);
    scene.dispose();
  });

  it('entry markers are placed on the trail at the entry samples and revealed with time', () => {
    const run = syntheticViewRun(s3);
    const { scene, rc } = build(run, {
      boresightBody: [1, 0, 0],
      keepOut: [
        { label: 'Sun', dirInertial: [0, 2, 0], halfAngleRad: alpha },
        { label: 'Moon', dirInertial: [-1, 0, 0], halfAngleRad: alpha },
      ],
    });
    expect(Array.from(rc.trail.entrySamples)).toEqual([kEnter, kEnter2]);
    const m = new Matrix4(),
      p = new Vector3();
    rc.trail.entryMarkers!.getMatrixAt(0, m);
    p.setFromMatrixPosition(m).divideScalar(R);
    expect(p.x).toBeCloseTo(Math.cos(w * kEnter * dt), 6);
    expect(p.y).toBeCloseTo(Math.sin(w * kEnter * dt), 6);
    scene.setTime((kEnter - 1) * dt);
    expect(rc.trail.entryMarkers!.count).toBe(0);
    scene.setTime(kEnter * dt);
    expect(rc.trail.entryMarkers!.count).toBe(1);
    scene.setTime(kEnter2 * dt + 0.5);
    expect(rc.trail.entryMarkers!.count).toBe(2);
    // The cones are drawn in the shared content, one surface + rim (+ label when labels exist) each.
    expect(scene.viewports[0]!.common.keepOut.children.length).toBe(4);
    scene.setOptions({ showKeepOut: false });
    expect(rc.trail.entrySamples.length).toBe(0);
    scene.dispose();
  });

  it('a path that starts inside a cone is marked at sample 0', () => {
    const path = Float64Array.from([0, 1, 0, 1, 0, 0, 0, 1, 0]);
    expect(keepOutEntries(path, 3, [0, 1, 0], 0.1)).toEqual([0, 2]);
  });
});
