/**
 * Time-axis markers and wheel at-limit shading (app/ui/plots/markers.ts) and the comparison's wheel
 * peak cells (app/ui/comparisonCells.ts), on real demo runs: segment starts and planned arrivals at
 * the plan's times; at-limit intervals recomputed here from the trace by a plain scan with the
 * engine's threshold (0.999 of the limit, metrics/wheels.ts) and matching the engine's saturation
 * summary (first time and total time per wheel); the peak cell names the wheel and time the
 * engine's WheelPeak gives, recomputed here as the arg-max of |x_i|/limit_i over the trace.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { ControllerRun, PipelineOutput } from '../../app/engine/pipeline/types';
import { momentumLimitIntervals, segmentMarkers, torqueLimitIntervals } from '../../app/ui/plots/markers';
import { peakText } from '../../app/ui/comparisonCells';
import { limitText } from '../../app/ui/plots/series';
import demo from '../../assets/lumen6-imaging.scenario.json';

let out: PipelineOutput;
beforeAll(() => {
  const r = runPipeline(demo, { controllers: ['pd', 'hysteretic'] });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  out = r.value;
});

/** Per wheel: [first time at the limit, total time of the sample intervals that start there]. */
function scan(run: ControllerRun, data: Float64Array, limits: ArrayLike<number>): Map<number, [number, number]> {
  const tr = run.trace;
  const N = tr.nWheels;
  const m = new Map<number, [number, number]>();
  for (let i = 0; i < N; i++)
    for (let k = 0; k < tr.n; k++) {
      if (Math.abs(data[N * k + i]!) < 0.999 * limits[i]!) continue;
      const e = m.get(i + 1) ?? [tr.t[k]!, 0];
      if (k + 1 < tr.n) e[1] += tr.t[k + 1]! - tr.t[k]!;
      m.set(i + 1, e);
    }
  return m;
}

describe('time markers and wheel limits', () => {
  it('marks each segment start and planned arrival at the plan times', () => {
    const m = segmentMarkers(out);
    expect(m.filter((x) => x.kind === 'segment').map((x) => [x.t, x.number, x.label])).toEqual(
      out.plan.segments.map((s) => [s.tStart, s.index + 1, s.label]),
    );
    for (const s of out.plan.segments)
      if (s.slewTimeS > 0) expect(m.some((x) => x.kind === 'arrival' && x.t === s.tStart + s.slewTimeS)).toBe(true);
  });

  it('shades the intervals where each wheel is at its torque or momentum limit, as the engine counts them', () => {
    let shaded = 0;
    for (const run of out.runs) {
      for (const [kind, data, limits, iv] of [
        ['torque', run.trace.wheelTorque, out.vehicle.maxTorqueNm, torqueLimitIntervals(run, out)],
        ['momentum', run.trace.hWheel, out.vehicle.maxMomentumNms, momentumLimitIntervals(run, out)],
      ] as const) {
        const ref = scan(run, data, limits);
        const got = new Map<number, [number, number]>();
        for (const x of iv) {
          const e = got.get(x.wheel) ?? [x.t0, 0];
          e[0] = Math.min(e[0], x.t0);
          e[1] += x.t1 - x.t0;
          got.set(x.wheel, e);
        }
        expect([...got.keys()].sort(), `${run.key} ${kind}`).toEqual([...ref.keys()].sort());
        for (const [w, [first, total]] of ref) {
          expect(got.get(w)![0]).toBe(first);
          expect(got.get(w)![1]).toBeCloseTo(total, 9);
          const eng = run.metrics.saturation.find((s) => s.kind === kind && s.wheel === w)!;
          expect(eng.firstS).toBe(first);
          expect(eng.totalS).toBeCloseTo(total, 9);
        }
        shaded += iv.length;
        if (iv.length) expect(limitText(iv, kind)).toMatch(/^At the .* limit \(shaded\): wheel \d+ from/);
      }
    }
    // The demo's target-at-once runs drive wheels to their torque limit.
    expect(shaded).toBeGreaterThan(0);
  });

  it('names the wheel and the time of each peak in the comparison cell', () => {
    for (const run of out.runs) {
      const tr = run.trace;
      const N = tr.nWheels;
      let best = { f: 0, w: 0, t: 0 };
      for (let k = 0; k < tr.n; k++)
        for (let i = 0; i < N; i++) {
          const f = Math.abs(tr.wheelTorque[N * k + i]!) / out.vehicle.maxTorqueNm[i]!;
          if (f > best.f) best = { f, w: i + 1, t: tr.t[k]! };
        }
      const text = peakText(run.metrics.peakTorque);
      const m = text.match(/^(\d+(?:\.\d)?) % \(wheel (\d+), ([\d.e+-]+) s\)$/);
      expect(m, text).not.toBeNull();
      expect(Number(m![2])).toBe(best.w);
      expect(Number(m![3])).toBeCloseTo(best.t, 1);
      expect(Number(m![1])).toBeCloseTo(best.f * 100, 0);
    }
  });
});
