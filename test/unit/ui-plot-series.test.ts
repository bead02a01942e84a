/**
 * Plot contents (app/ui/plots/series.ts) from a real pipeline run of the demo: every series is
 * the engine's channel in display units (deg, deg/s, mN·m, mN·m·s; conversion factors exact by
 * definition), per-wheel channels de-interleaved, ± limit lines at the engine's limits, jump
 * markers at the engine's jump times, and smooth laws say why their hybrid plots are empty.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { alignRuns, buildPlots, channel, type Series } from '../../app/ui/plots/series';
import demo from '../../assets/lumen6-imaging.scenario.json';
import { DEG_PER_RAD } from '../../app/engine/units';

// A stand-in for uPlot.join with the same contract (union of x, null where a table has no sample).
function join(tables: Series[][]): Series[] {
  const xs = [...new Set(tables.flatMap((t) => Array.from(t[0] as ArrayLike<number>)))].sort((a, b) => a - b);
  const out: Series[] = [xs];
  for (const t of tables) {
    const map = new Map<number, number | null>();
    const x = t[0] as ArrayLike<number>;
    for (let i = 0; i < x.length; i++) map.set(x[i]!, t[1]![i]!);
    out.push(xs.map((v) => (map.has(v) ? map.get(v)! : null)));
  }
  return out;
}

describe('plot series from a demo run', () => {
  let out: PipelineOutput;
  beforeAll(() => {
    const r = runPipeline(demo, { controllers: ['pd', 'synergistic'], modes: ['follow-plan'] });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    out = r.value;
  });

  it('de-interleaves sample-major channels', () => {
    const src = Float64Array.of(1, 2, 3, 4, 5, 6);
    expect([...channel(src, 2, 3, 1, 10)]).toEqual([20, 50]);
  });

  it('builds the eight plots for the detailed run, in display units', () => {
    const plots = buildPlots(out, ['synergistic:follow-plan', 'pd:follow-plan'], { logError: false }, join);
    expect(plots.map((p) => p.id)).toEqual([
      'error-angle',
      'body-rate',
      'wheel-momentum',
      'wheel-torque',
      'logic',
      'potential',
      'lyapunov',
      'hybrid-time',
    ]);
    const syn = out.runs.find((r) => r.key === 'synergistic:follow-plan')!;
    const pd = out.runs.find((r) => r.key === 'pd:follow-plan')!;
    const n = syn.trace.n;
    const byId = Object.fromEntries(plots.map((p) => [p.id, p]));
    for (const p of plots) {
      expect(p.empty, p.id).toBeUndefined();
      expect(p.data.length, p.id).toBe(p.series.length + 1);
      for (const d of p.data) expect(d.length, p.id).toBeGreaterThan(0);
    }
    // Error angle: both runs, rad → deg.
    const ea = byId['error-angle']!;
    expect(ea.series.map((s) => s.label)).toEqual([`${syn.label} (follow-plan)`, `${pd.label} (follow-plan)`]);
    const k = Math.floor(n / 3);
    const tk = syn.trace.t[k]!;
    const row = Array.from(ea.data[0] as ArrayLike<number>).indexOf(tk);
    expect(ea.data[1]![row]).toBeCloseTo(syn.trace.errorAngle[k]! * DEG_PER_RAD, 12);
    // Body rate: ω_y of sample k, rad/s → deg/s.
    expect(byId['body-rate']!.data[2]![k]).toBeCloseTo(syn.trace.omega[3 * k + 1]! * DEG_PER_RAD, 12);
    // Wheel momentum: wheel 3 of sample k, N·m·s → mN·m·s; then the ± limit lines.
    const N = syn.trace.nWheels;
    const wm = byId['wheel-momentum']!;
    expect(wm.data[3]![k]).toBeCloseTo(syn.trace.hWheel[N * k + 2]! * 1e3, 12);
    const hMax = out.vehicle.maxMomentumNms[0]! * 1e3;
    expect(wm.series.slice(N).map((s) => s.label)).toEqual(['+h max', '−h max']);
    expect(wm.data[N + 1]![0]).toBeCloseTo(hMax, 12);
    expect(wm.data[N + 2]![n - 1]).toBeCloseTo(-hMax, 12);
    // Torque: delivered wheel torque, N·m → mN·m.
    expect(byId['wheel-torque']!.data[1]![k]).toBeCloseTo(syn.trace.wheelTorque[N * k]! * 1e3, 12);
    // Logic, potential and W: the trace values as they are, with the engine's jump times.
    expect(byId.logic!.series[0]!.stepped).toBe(true);
    expect(byId.logic!.jumpTimes).toEqual(syn.jumps.map((j) => j.t));
    expect(byId.potential!.data[1]![k]).toBe(syn.trace.potential[k]);
    expect(byId.potential!.data[2]![k]).toBe(syn.trace.potentialMin[k]);
    expect(byId.potential!.bands).toEqual([{ upper: 1, lower: 2, color: expect.any(String) }]);
    expect(byId.lyapunov!.intervals).toHaveLength(syn.monitor.length);
    // Hybrid time: j as a stepped series on its own axis.
    const ht = byId['hybrid-time']!;
    expect(ht.series[1]).toMatchObject({ label: 'j', stepped: true, scale: 'j' });
    expect(ht.data[2]![n - 1]).toBe(syn.trace.j[n - 1]);
  });

  it('says why a smooth law has no logic, potential or hybrid-time plot', () => {
    const plots = buildPlots(out, ['pd:follow-plan'], { logError: true }, join);
    const byId = Object.fromEntries(plots.map((p) => [p.id, p]));
    expect(byId.logic!.empty).toMatch(/smooth law/);
    expect(byId.potential!.empty).toMatch(/no potential family/);
    expect(byId['hybrid-time']!.empty).toMatch(/no jumps/);
    expect(byId['error-angle']!.log).toBe(true);
    // Log axis: non-positive samples become gaps, never NaN.
    for (const v of Array.from(byId['error-angle']!.data[1]!)) expect(v === null || (v as number) > 0).toBe(true);
  });

  it('aligns runs with different sample times on the union of times', () => {
    const a = out.runs[0]!,
      b = out.runs[1]!;
    const shifted = { ...b, trace: { ...b.trace, t: b.trace.t.map((x) => x + 0.05) } };
    const data = alignRuns([a, shifted], (r) => r.trace.errorAngle.subarray(0, r.trace.n), join);
    expect(data[0]!.length).toBe(a.trace.n + b.trace.n);
    expect(Array.from(data[1]!).filter((v) => v === null).length).toBe(b.trace.n);
  });

  it('shows only the error plot, saying so, when no run is selected', () => {
    const plots = buildPlots(out, [], { logError: false }, join);
    expect(plots).toHaveLength(1);
    expect(plots[0]!.empty).toBe('No run selected');
  });
});
