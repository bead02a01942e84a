/**
 * The constraint-margin overlay (app/ui/plots/constraintPlot.ts) from a real pipeline run of a cut
 * Lumen-6 scenario with two constraints: each series is the margin of that run and constraint in
 * degrees, checked sample by sample against a hand computation — the body axis rotated into
 * inertial axes by the npm `quaternion` package (its own rotateVector), the angle to the direction
 * by acos of the normalised dot product, then keep-out: angle − half-angle − margin, keep-in:
 * half-angle − margin − angle (the definitions in scenario/constraintSchema.ts) — gaps outside the
 * window, a zero line, and the engine's violation stretches shaded in the run's colour.
 */
import { readFileSync } from 'node:fs';
import Quaternion from 'quaternion';
import { beforeAll, describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { DEG_PER_RAD } from '../../app/engine/units';
import { CONSTRAINT_DASHES, constraintMarginPlot, marginDegrees } from '../../app/ui/plots/constraintPlot';
import { LIMIT_COLOR, runColor, type Series } from '../../app/ui/plots/base';
import { asset } from './cli-harness';
import { constraintCones, sampleAt } from '../../app/ui/view/viewRuns';

type Json = Record<string, unknown>;

/** The initial −Z pointing direction of Lumen-6 (assets/lumen6-imaging.scenario.json). */
const START_DIR = [0.9922, -0.1148, -0.0488];
const CONSTRAINTS = [
  {
    name: 'Start cone',
    kind: 'keep-out',
    bodyAxis: [0, 0, -1],
    halfAngleDeg: 5,
    marginDeg: 1,
    direction: { kind: 'fixed', inertialDirection: START_DIR },
  },
  {
    name: 'Stay near',
    kind: 'keep-in',
    bodyAxis: [0, 0, -1],
    halfAngleDeg: 60,
    marginDeg: 2,
    window: { startS: 2, endS: 20 },
    direction: { kind: 'fixed', inertialDirection: START_DIR },
  },
];

function scenario(): Json {
  const s = JSON.parse(readFileSync(asset('lumen6-imaging.scenario.json'), 'utf8')) as Json;
  s.targets = [{ ...(s.targets as Json[])[0]!, holdS: 5 }];
  s.controllers = (s.controllers as Json[]).filter((c) => c.id === 'pd' || c.id === 'synergistic');
  (s.simulation as Json).tailS = 5;
  (s.simulation as Json).mode = 'follow-plan';
  delete s.keepOut;
  return { ...s, constraints: CONSTRAINTS };
}

function inertialAxis(q: ArrayLike<number>, b: readonly number[]): number[] {
  return new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!).rotateVector([b[0]!, b[1]!, b[2]!]) as number[];
}

function angleDeg(a: readonly number[], b: readonly number[]): number {
  const c = (a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!) / (Math.hypot(a[0]!, a[1]!, a[2]!) * Math.hypot(b[0]!, b[1]!, b[2]!));
  return Math.acos(Math.min(1, Math.max(-1, c))) * DEG_PER_RAD;
}

/** Union-of-times join with gaps, the contract of uPlot.join, for any number of series per table. */
function join(tables: Series[][]): Series[] {
  const xs = [...new Set(tables.flatMap((t) => Array.from(t[0] as ArrayLike<number>)))].sort((a, b) => a - b);
  const out: Series[] = [xs];
  for (const t of tables) {
    const x = t[0] as ArrayLike<number>;
    for (let s = 1; s < t.length; s++) {
      const map = new Map<number, number | null>();
      for (let i = 0; i < x.length; i++) map.set(x[i]!, t[s]![i]!);
      out.push(xs.map((v) => (map.has(v) ? map.get(v)! : null)));
    }
  }
  return out;
}

describe('constraint margin plot', () => {
  let out: PipelineOutput;
  beforeAll(() => {
    const r = runPipeline(scenario(), { modes: ['follow-plan'] });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    out = r.value;
  });

  it('is absent without constraints and empty without a ticked run', () => {
    expect(constraintMarginPlot({ ...out, constraints: [] }, out.runs, join)).toBeNull();
    expect(constraintMarginPlot(out, [], join)?.empty).toMatch(/Tick a run/);
  });

  it('each series is the hand-computed margin of its run and constraint, gaps outside the window', () => {
    const runs = out.runs;
    expect(runs.length).toBe(2);
    const spec = constraintMarginPlot(out, runs, join)!;
    expect(spec.series).toHaveLength(runs.length * CONSTRAINTS.length + 1);
    let checked = 0;
    let gaps = 0;
    runs.forEach((r, i) => {
      CONSTRAINTS.forEach((c, j) => {
        const s = 1 + i * CONSTRAINTS.length + j;
        expect(spec.series[s - 1]!.color).toBe(runColor(out, r.key));
        expect(spec.series[s - 1]!.dash).toEqual(CONSTRAINT_DASHES[j]);
        const x = spec.data[0]!;
        const y = spec.data[s]!;
        const tk = new Map<number, number>();
        for (let k = 0; k < r.trace.n; k++) tk.set(r.trace.t[k]!, k);
        for (let m = 0; m < x.length; m++) {
          const k = tk.get(x[m] as number);
          if (k === undefined) continue;
          const t = r.trace.t[k]!;
          const angle = angleDeg(inertialAxis(r.trace.q.subarray(4 * k, 4 * k + 4), c.bodyAxis), c.direction.inertialDirection);
          const expected = c.kind === 'keep-out' ? angle - c.halfAngleDeg - c.marginDeg : c.halfAngleDeg - c.marginDeg - angle;
          if (c.window && (t < c.window.startS || t > c.window.endS)) {
            expect(y[m], `t=${t}`).toBeNull();
            gaps++;
          } else if (y[m] !== null) {
            // 1e-6 deg: float64 rounding through two different rotation codes (acos near 0 loses digits).
            expect(Math.abs((y[m] as number) - expected), `${r.key} ${c.name} t=${t}`).toBeLessThan(1e-6);
            checked++;
          }
        }
      });
    });
    expect(checked).toBeGreaterThan(100);
    expect(gaps).toBeGreaterThan(10);
    const zero = spec.data[spec.data.length - 1]!;
    expect(spec.series[spec.series.length - 1]!.color).toBe(LIMIT_COLOR);
    expect(Array.from(zero as ArrayLike<number>).every((v) => v === 0)).toBe(true);
  });

  it('shades the engine’s violation stretches per run, and they hold negative hand-computed margins', () => {
    const spec = constraintMarginPlot(out, out.runs.slice(0, 1), join)!;
    const r = out.runs[0]!;
    const start = r.constraints!.constraints.find((c) => c.name === 'Start cone')!;
    // The run starts pointing −Z along the cone's own axis: angle ≈ 0, margin ≈ −6°.
    expect(start.intervals.length).toBeGreaterThan(0);
    expect(start.intervals[0]!.startS).toBe(0);
    expect(spec.intervals!.length).toBe(r.constraints!.constraints.reduce((n, c) => n + c.intervals.length, 0));
    expect(spec.intervals![0]!.label).toMatch(/violates Start cone/);
    expect(spec.note).toMatch(/^Shaded: /);
    const y = spec.data[1]!;
    const k0 = 0;
    expect(y[k0] as number).toBeLessThan(-5);
  });

  it('degrees from radians with NaN as gaps', () => {
    expect(marginDegrees(Float64Array.of(Math.PI / 2, Number.NaN, -Math.PI), 3)).toEqual([90, null, -180]);
  });

  it('3D cones: fixed-direction constraints drawn, coloured by the sign of the hand-computed margin at the time', () => {
    const r = out.runs[0]!;
    const start = CONSTRAINTS[0]!;
    const ends = r.constraints!.constraints[0]!.intervals[0]!.endS;
    let flips = 0;
    for (const time of [0, ends / 2, ends + 0.5, r.trace.t[r.trace.n - 1]!]) {
      const cones = constraintCones(out, r, time);
      expect(cones.map((c) => c.label)).toEqual(['Start cone', 'Stay near (keep-in)']);
      expect(cones[0]!.halfAngleRad).toBeCloseTo(5 / DEG_PER_RAD, 12);
      const k = sampleAt(r.trace.t, r.trace.n, time);
      const angle = angleDeg(inertialAxis(r.trace.q.subarray(4 * k, 4 * k + 4), start.bodyAxis), START_DIR);
      const handViolated = angle - start.halfAngleDeg - start.marginDeg < 0;
      expect(cones[0]!.violated, `t=${time}`).toBe(handViolated);
      if (!handViolated) flips++;
    }
    expect(flips).toBe(2);
    expect(constraintCones(out, null, 0)[0]!.violated).toBeUndefined();
  });

  it('sampleAt finds the last sample at or before the time', () => {
    const t = Float64Array.of(0, 0.1, 0.2, 0.3);
    expect([-1, 0, 0.05, 0.1, 0.25, 0.3, 9].map((x) => sampleAt(t, 4, x))).toEqual([0, 0, 0, 1, 2, 3, 3]);
  });
});
