/**
 * Constructed cases for the comparison metrics, each flown through the whole pipeline
 * (runPipeline on an invented scenario), so the figures are the ones the table shows.
 *
 * - A clean tracked slew scores chatter 0 and raises no Lyapunov-monitor violation: with no noise
 *   and a feasible plan, W of a tracking law decreases along flows (the monitor's premise; Lyapunov
 *   analysis of quaternion feedback, Wen & Kreutz-Delgado, IEEE TAC 36(10), 1991) apart from the
 *   planned acceleration steps, which the monitor lists apart.
 * - A gain set sampled too slowly raises monitor violations: the zero-order-hold discretisation of
 *   a PD loop with natural frequency ω_n and period T loses stability once ω_n·T is of order 1
 *   (sampled-data control, e.g. Franklin, Powell & Workman, Digital Control of Dynamic Systems,
 *   3rd ed., ch. 4 — from memory), so W, which the continuous design makes non-increasing,
 *   rises along flows.
 * - A saturated PD from the far hemisphere unwinds (Bhat & Bernstein 2000: continuous quaternion
 *   feedback with the fixed lift η > 0 drives the body the long way when it starts with η < 0),
 *   does not settle within a run too short for it, and never gets a best mark.
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { loadExample } from '../unit/scenario-fixtures';

const quiet = { attitudeNoiseArcsec: 0, rateNoiseDegPerS: 0, rateBiasDegPerS: [0, 0, 0] };

function base(): any {
  const s = loadExample('lumen6-imaging');
  s.vehicle.sensors = { ...quiet };
  s.vehicle.wheelFriction = undefined;
  delete s.vehicle.wheelFriction;
  s.initial = { attitude: { quaternion: [0, 0, 0, 1] }, bodyRateDegPerS: [0, 0, 0], wheelMomentumMNms: [0, 0, 0, 0] };
  s.targets = [{ label: 'Ninety about Y', attitude: { relative: { axis: [0, 1, 0], angleDeg: 90 } }, holdS: 60 }];
  delete s.keepOut;
  return s;
}

function run(s: unknown) {
  const out = runPipeline(s);
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  return out.value;
}

describe('constructed comparison cases', () => {
  it('a clean tracked slew: settled, chatter 0, no monitor violation', () => {
    const s = base();
    s.simulation = { ...s.simulation, mode: 'follow-plan' };
    const out = run(s);
    for (const r of out.runs) {
      expect(r.verdict.kind, r.label).toBe('settled');
      expect(r.metrics.chatterPerS, r.label).toBe(0);
      expect(
        r.monitor.filter((f) => f.kind !== 'reference-step'),
        r.label,
      ).toEqual([]);
    }
  });

  it('a gain set sampled too slowly raises Lyapunov-monitor violations', () => {
    const s = base();
    // ω_n = 2 rad/s at 1 Hz: ω_n T = 2, far outside what the continuous design assumes.
    s.vehicle.controlRateHz = 1;
    s.vehicle.wheels.maxTorqueMNm = 200;
    s.vehicle.wheels.maxMomentumMNms = 600;
    s.controllers = [
      { id: 'pd', label: 'Fast PD, slow sampling', law: 'quaternion-pd', gains: { bandwidthRadPerS: 2, dampingRatio: 0.7 } },
    ];
    s.simulation = { ...s.simulation, mode: 'step-target' };
    const out = run(s);
    const r = out.runs[0]!;
    expect(r.monitor.filter((f) => f.kind === 'flow-rise').length).toBeGreaterThan(0);
    expect(out.comparison[0]!.monitorViolations).toBeGreaterThan(0);
    // The same gains at 50 Hz (ω_n T = 0.04) raise none.
    s.vehicle.controlRateHz = 50;
    const fine = run(s).runs[0]!;
    expect(fine.monitor.filter((f) => f.kind !== 'reference-step')).toEqual([]);
  });

  it('a saturated PD from the far hemisphere: unwound, not settled, no best mark', () => {
    const s = base();
    // Start 160° from the target about a fixed axis, with the target written so that η < 0 for the
    // fixed lift: the PD law (lift η > 0) then takes the 200° way.
    s.targets = [
      { label: 'Far side', attitude: { quaternion: [0, -Math.sin((160 * Math.PI) / 360), 0, -Math.cos((160 * Math.PI) / 360)] }, holdS: 5 },
    ];
    s.vehicle.wheels.maxTorqueMNm = 0.5; // weak wheels: saturated throughout
    s.controllers = [
      { id: 'pd', label: 'PD', law: 'quaternion-pd', gains: { bandwidthRadPerS: 0.3, dampingRatio: 0.9 } },
      { id: 'hyst', label: 'Hysteretic', law: 'hysteretic', gains: { bandwidthRadPerS: 0.3, dampingRatio: 0.9 }, hysteresis: 0.2 },
    ];
    // A minimum-time plan (full margins, no practical rate cap) leaves no time for the long way.
    s.planning = { ...s.planning, torqueMargin: 1, momentumMargin: 1, slewRateLimitDegPerS: 100 };
    s.simulation = { ...s.simulation, mode: 'step-target', tailS: 0 };
    const out = run(s);
    const pd = out.runs.find((r) => r.controllerId === 'pd')!;
    const row = out.comparison.find((r) => r.key === pd.key)!;
    expect(pd.metrics.unwound).toBe(true);
    expect(pd.verdict.kind).toBe('unsettled');
    expect(row.unwound).toBe(true);
    for (const winner of Object.values(out.best)) expect(winner).not.toBe(pd.key);
  });
});
