/**
 * Plot contents (app/ui/plots/series.ts) from a real pipeline run of the demo: every series is
 * the engine's channel in display units (deg, deg/s, mN·m, mN·m·s; conversion factors exact by
 * definition), per-wheel channels de-interleaved, ± limit lines at the engine's limits, jump
 * markers at the engine's jump times, overlays of every ticked run (|ω| and momentum use recomputed
 * here from the trace), segment markers on every axis, and smooth laws' hybrid plots hidden with one note.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import fs from 'node:fs';
import {
  alignRuns,
  buildDetail,
  buildPlots,
  channel,
  detailPlots,
  plotSources,
  plotSourcesOnly,
  type Series,
} from '../../app/ui/plots/series';
import { segmentMarkers } from '../../app/ui/plots/markers';
import { windowBands } from '../../app/ui/plots/windowBands';
import { boresightChoices, defaultBoresight, type OverlayOptions } from '../../app/ui/plots/overlays';
import { runName } from '../../app/ui/modeNames';
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

  const opts = (logError: boolean): OverlayOptions => ({ logError, boresight: defaultBoresight(out) });

  it('builds the overlays over every ticked run and the per-run plots of the first, in display units', () => {
    const set = buildPlots(out, ['synergistic:follow-plan', 'pd:follow-plan'], opts(false), join);
    // The demo declares a keep-out cone, so the constraint-margin overlay follows the four others.
    expect(set.overlays.map((p) => p.id)).toEqual(['error-angle', 'boresight', 'rate-magnitude', 'momentum-use', 'constraint-margin']);
    expect(set.detailPlots.map((p) => p.id)).toEqual([
      'body-rate',
      'wheel-momentum',
      'wheel-torque',
      'logic',
      'potential',
      'lyapunov',
      'hybrid-time',
    ]);
    expect(set.hiddenNote).toBeNull();
    const syn = out.runs.find((r) => r.key === 'synergistic:follow-plan')!;
    const pd = out.runs.find((r) => r.key === 'pd:follow-plan')!;
    expect(set.detail).toBe(syn);
    const n = syn.trace.n;
    const plots = [...set.overlays, ...set.detailPlots];
    const byId = Object.fromEntries(plots.map((p) => [p.id, p]));
    for (const p of plots) {
      expect(p.empty, p.id).toBeUndefined();
      expect(p.data.length, p.id).toBe(p.series.length + 1);
      for (const d of p.data) expect(d.length, p.id).toBeGreaterThan(0);
      // Segment starts on every time axis, at the engine's plan times.
      expect(
        p.markers?.filter((m) => m.kind === 'segment').map((m) => m.t),
        p.id,
      ).toEqual(out.plan.segments.map((s) => s.tStart));
    }
    // Error angle: both runs, rad → deg.
    const ea = byId['error-angle']!;
    expect(ea.series.map((s) => s.label)).toEqual([runName(syn), runName(pd)]);
    const k = Math.floor(n / 3);
    const tk = syn.trace.t[k]!;
    const row = Array.from(ea.data[0] as ArrayLike<number>).indexOf(tk);
    expect(ea.data[1]![row]).toBeCloseTo(syn.trace.errorAngle[k]! * DEG_PER_RAD, 12);
    // |ω| overlay: Euclidean norm of the three components, rad/s → deg/s (both runs).
    const w = syn.trace.omega;
    expect(byId['rate-magnitude']!.data[1]![row]).toBeCloseTo(Math.hypot(w[3 * k]!, w[3 * k + 1]!, w[3 * k + 2]!) * DEG_PER_RAD, 12);
    expect(byId['rate-magnitude']!.series.map((s) => s.label)).toContain('slew-rate cap');
    // Momentum use: max over wheels of |h_i| / h_max,i in %, recomputed here from the trace.
    const N = syn.trace.nWheels;
    let use = 0;
    for (let i = 0; i < N; i++) use = Math.max(use, Math.abs(syn.trace.hWheel[N * k + i]!) / out.vehicle.maxMomentumNms[i]!);
    expect(byId['momentum-use']!.data[1]![row]).toBeCloseTo(100 * use, 12);
    // Body rate: ω_y of sample k, rad/s → deg/s.
    expect(byId['body-rate']!.data[2]![k]).toBeCloseTo(syn.trace.omega[3 * k + 1]! * DEG_PER_RAD, 12);
    // Wheel momentum: wheel 3 of sample k, N·m·s → mN·m·s; then the ± limit lines.
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

  it('hides the logic, potential and hybrid-time plots of a smooth law, saying why once', () => {
    const set = buildPlots(out, ['pd:follow-plan'], opts(true), join);
    const ids = set.detailPlots.map((p) => p.id);
    expect(ids).toEqual(['body-rate', 'wheel-momentum', 'wheel-torque', 'lyapunov']);
    expect(set.hiddenNote).toMatch(/smooth law/);
    const ea = set.overlays.find((p) => p.id === 'error-angle')!;
    expect(ea.log).toBe(true);
    // Log axis: non-positive samples become gaps, never NaN.
    for (const v of Array.from(ea.data[1]!)) expect(v === null || (v as number) > 0).toBe(true);
  });

  it('aligns runs with different sample times on the union of times', () => {
    const a = out.runs[0]!,
      b = out.runs[1]!;
    const shifted = { ...b, trace: { ...b.trace, t: b.trace.t.map((x) => x + 0.05) } };
    const data = alignRuns([a, shifted], (r) => r.trace.errorAngle.subarray(0, r.trace.n), join);
    expect(data[0]!.length).toBe(a.trace.n + b.trace.n);
    expect(Array.from(data[1]!).filter((v) => v === null).length).toBe(b.trace.n);
  });

  it('shows only empty overlays, saying so, when no run is ticked', () => {
    const set = buildPlots(out, [], opts(false), join);
    expect(set.detail).toBeNull();
    expect(set.detailPlots).toHaveLength(0);
    for (const p of set.overlays) expect(p.empty).toMatch(/Tick a run/);
  });
});

/**
 * PlotsPanel reuses its plot specs while every part plotSources lists is the same object
 * (store/shareOutput.ts keeps unchanged parts): so buildPlots, windowBands and boresightChoices
 * must read nothing else. Built from those parts alone, the plots must equal the full output's
 * (the demo, and the orbit example with its windows, eclipses and constraints).
 */
describe('plots read only what plotSources lists', () => {
  const cases: [string, unknown][] = [
    ['demo', demo],
    ['tern12 (orbit)', JSON.parse(fs.readFileSync(new URL('../../assets/tern12-reversal.scenario.json', import.meta.url), 'utf8'))],
  ];
  for (const [name, json] of cases)
    it(name, () => {
      const first = (json as { controllers: { id: string }[] }).controllers[0]!.id;
      const r = runPipeline(json, name === 'demo' ? { modes: ['follow-plan'] } : { modes: ['follow-plan'], controllers: [first] });
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      const full = r.value;
      const only = plotSourcesOnly(full);
      const keys = full.runs.map((x) => x.key);
      expect(plotSources(only)).toEqual(plotSources(full));
      const choices = boresightChoices(full);
      expect(boresightChoices(only)).toEqual(choices);
      expect(windowBands(only)).toEqual(windowBands(full));
      for (const c of [choices[0]!, choices[choices.length - 1]!])
        for (const logError of [false, true]) {
          const o = { logError, boresight: c };
          expect(buildPlots(only, keys, o, join)).toEqual(buildPlots(full, keys, o, join));
        }
      // The per-run plots (and their markers) read the run, the plan and the vehicle only.
      const planVehicle = { plan: full.plan, vehicle: full.vehicle } as PipelineOutput;
      for (const run of full.runs) expect(detailPlots(run, planVehicle)).toEqual(detailPlots(run, full));
      expect(buildDetail({ ...planVehicle, runs: full.runs }, keys)).toEqual(buildDetail(full, keys));
      expect(segmentMarkers(planVehicle)).toEqual(segmentMarkers(full));
    });
});
