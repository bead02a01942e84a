/**
 * The bundled pointing-only example (assets/petrel16-pointing.scenario.json, invented vehicle and
 * directions) through the whole pipeline and the CLI: the point of issue 15.
 *
 * Theory: every continuous feedback on S² has an undesired equilibrium; for V = 1 − bᵀy it is the
 * antipode, and bounded noise that shows the law the axis exactly there holds a smooth law on it
 * (Mayhew & Teel, Automatica 2013, reduced attitude [venue from memory]; the S² analogue of the
 * obstruction of Bhat & Bernstein, Systems & Control Letters 39(1), 2000). Synergistic hybrid
 * feedback with a gap δ* > δ and δ above what the noise can move the gap by converges from there
 * (same paper). The S² gap of three members 120° apart with warp gain k is δ* = 1.5 sin²θ*,
 * θ* − k(1 + cos θ*) = 0 (closed form derived in sphere-certificate.test.ts).
 *
 * References: pointing errors recomputed from the trace with the npm `quaternion` package (outside
 * library); the angle of two unit vectors is atan2(|a × b|, a·b) (standard, no source).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { gapShownDown } from '../../app/engine/control/sphere/shownGap';
import { runInProcess } from '../unit/cli-harness';
import { RAD_PER_DEG } from '../../app/engine/units';

const file = path.resolve(__dirname, '../../assets/petrel16-pointing.scenario.json');
const json = JSON.parse(readFileSync(file, 'utf8'));
const unit = (v: readonly number[]) => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};
const ang = (a: readonly number[], b: readonly number[]) =>
  Math.atan2(
    Math.hypot(a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!),
    a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!,
  );
const pointingError = (q: ArrayLike<number>, b: readonly number[], r: readonly number[]) =>
  ang(new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!).rotateVector([b[0]!, b[1]!, b[2]!]) as number[], r);

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

describe('Petrel-16: smooth pointing law stalled at the antipode by worst-case noise, synergistic one converging', () => {
  const out = runPipeline(json);
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  const t0 = json.targets[0].attitude.pointing;
  const b = unit(t0.bodyAxis),
    r = unit(t0.inertialDirection);
  const ebar = json.vehicle.sensors.antipodalNoiseDeg * RAD_PER_DEG;
  const run = (id: string) => out.value.runs.find((x) => x.controllerId === id)!;

  it('the smooth law stays within ē of the antipode for the whole first segment (npm quaternion), and does not settle', () => {
    const tr = run('smooth').trace;
    let n = 0;
    for (let k = 0; k < tr.n; k++) {
      if (tr.segment[k] !== 0) continue;
      expect(Math.PI - pointingError(tr.q.subarray(4 * k, 4 * k + 4), b, r)).toBeLessThan(ebar);
      n++;
    }
    expect(n).toBeGreaterThan(2000); // 226 s at 10 Hz
    expect(run('smooth').verdict.kind).toBe('unsettled');
    expect(run('smooth').metrics.segments[0]!.settleTimeS).toBeNull();
  });

  it('the synergistic law jumps, reaches the direction (< 0.1°) in the first segment and settles every segment', () => {
    const s = run('synergistic');
    expect(s.jumps.length).toBeGreaterThanOrEqual(1);
    expect(s.verdict.kind).toBe('settled');
    const tr = s.trace;
    let last = -1;
    for (let k = 0; k < tr.n; k++) if (tr.segment[k] === 0) last = k;
    expect(pointingError(tr.q.subarray(4 * last, 4 * last + 4), b, r)).toBeLessThan(0.1 * RAD_PER_DEG);
  });

  it('the monitor: W never rises on a flow and every jump drops it by at least k_p δ, for both laws', () => {
    for (const id of ['smooth', 'synergistic']) expect(run(id).monitor, id).toEqual([]);
  });

  it('the plan reports the roll-free saving of the antenna slew (held roll is longer and slower)', () => {
    const seg = out.value.plan.segments[1]!.rollFree!;
    expect(seg.heldRollAngleRad).toBeGreaterThan(seg.angleRad);
    expect(seg.timeSavedS!).toBeGreaterThan(0);
  });

  it('certify prints the S² gap rounded down, below the closed form 1.5 sin²θ* and within 1e-6 of it', async () => {
    const c = await runInProcess(['certify', file]);
    expect(c.code).toBe(0);
    const m = /δ\* ≥ (\d\.\d{6})/.exec(c.stdout);
    expect(m).not.toBeNull();
    const shown = Number(m![1]);
    const exact = 1.5 * Math.sin(thetaStar(0.5)) ** 2;
    expect(shown).toBeLessThanOrEqual(exact);
    expect(exact - shown).toBeLessThan(1e-6);
    expect(c.stdout).toMatch(/pointing family on the sphere S²/);
    expect(c.stdout.match(/^ {4}p=\d/gm)?.length).toBe(3);
  });

  it('certify refuses a family whose members share their undesired point (1), naming the file field', async () => {
    const bad = structuredClone(json);
    bad.controllers[1].warpAzimuthsDeg = [0, 360];
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const f = path.join(mkdtempSync(path.join(tmpdir(), 'slewsmith-sphere-')), 'bad.json');
    writeFileSync(f, JSON.stringify(bad));
    const c = await runInProcess(['certify', f]);
    expect(c.code).toBe(1);
    expect(c.stderr).toMatch(/controllers\[1\]\.warpAzimuthsDeg: .*share their undesired critical point/);
  });
});

describe('gap shown rounded down', () => {
  it('floor((δ* − tol)·10^d)/10^d (hand values)', () => {
    expect(gapShownDown(0.8249219597527906, 4.4e-15, 6)).toBe('0.824921');
    expect(gapShownDown(0.5, 0, 6)).toBe('0.500000');
    expect(gapShownDown(0.5, 1e-12, 6)).toBe('0.499999');
    expect(gapShownDown(0.03125, 0, 4)).toBe('0.0312');
    expect(gapShownDown(1e-9, 1e-8, 6)).toBe('0.000000');
  });
});
