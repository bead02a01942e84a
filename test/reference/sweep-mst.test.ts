/**
 * The published robustness check of hysteretic quaternion feedback, through the closed loop and
 * through the sweep runner.
 *
 * Source: Mayhew, Sanfelice & Teel, "Quaternion-based hybrid control for robust global attitude
 * tracking", IEEE TAC 56(11):2555–2566, 2011 (MST 2011): a memoryless sign choice h = sgn(η) is
 * held at η ≈ 0 (180° from the target) by a worst-case measurement noise of any size ē that
 * reflects the measured η whenever |η| < ē, while the hysteretic law with δ > ē is robust to it
 * (it switches only when h·η ≤ −δ); with δ < ē the same noise can switch it back and forth. In the
 * (ē, δ) plane the line between converging and held is therefore ē = δ (theory line).
 *
 * Setting (MST 2011): J = 10·diag(1, 2, 3)/√14 kg·m², u = −h·q_v − ω, start at rest 180° from the
 * target (about v = (1, 2, 3)/√14, our choice of axis), RK4 at 1 ms, 70 s. The closed loop here
 * actuates through three tiny-rotor wheels (closedloop-hysteretic.test.ts: 1.3 ms shift of the
 * first jump in the published example against the rigid body).
 */
import { describe, expect, it } from 'vitest';
import type { SensorModel } from '../../app/engine/sim/sensors';
import { fly, law, triadVehicle } from './closedloop-fixtures';
import { DEG_PER_RAD } from '../../app/engine/units';
import { MST_AXIS, mstScenario } from './sweep-fixtures';
import { validateSweep } from '../../app/engine/study/sweep';
import { runSweep } from '../../app/engine/study/sweepRun';
import { sweepJson } from '../../app/engine/study/sweepExport';

const s14 = Math.sqrt(14);
const veh = triadVehicle([10 / s14, 20 / s14, 30 / s14]);
const q0 = [MST_AXIS[0]!, MST_AXIS[1]!, MST_AXIS[2]!, 0];
const worstCase = (ebar: number): SensorModel => ({
  attitudeSigmaRad: 0,
  rateSigmaRadPerS: 0,
  rateBiasRadPerS: [0, 0, 0],
  adversarialEta: ebar,
});
const gains = { kp: 1, kd: 1 };

function run(spec: Record<string, unknown>, ebar: number) {
  // sampled at 1 kHz with one RK4 step per sample: RK4 at 1 ms
  return fly({
    vehicle: veh,
    controller: law(spec, veh),
    q0,
    tEnd: 70,
    controlRateHz: 1000,
    rk4StepsPerSample: 1,
    sensors: worstCase(ebar),
  });
}

/** Smallest time after which the error angle stays below `deg` (null: never). */
function staysBelowFrom(r: ReturnType<typeof run>, deg: number): number | null {
  let last = -1;
  for (let k = 0; k < r.trace.n; k++) if (r.trace.errorAngle[k]! * DEG_PER_RAD >= deg) last = k;
  return last + 1 < r.trace.n ? r.trace.t[last + 1]! : null;
}

describe('MST 2011 setting under worst-case noise, closed loop', () => {
  for (const ebar of [0.01, 0.05]) {
    it(`ē = ${ebar}: the sign law (δ = 0) stays at 180° for the whole 70 s`, () => {
      const r = run({ kind: 'sign-switch', gains }, ebar);
      expect(r.outcome.status).toBe('completed');
      expect(r.trace.t[r.trace.n - 1]).toBeCloseTo(70, 6);
      let minDeg = Infinity;
      for (let k = 0; k < r.trace.n; k++) minDeg = Math.min(minDeg, r.trace.errorAngle[k]! * DEG_PER_RAD);
      // held inside the band |η| < ē, i.e. error above 2·arccos ē (178.85° at ē = 0.01)
      expect(minDeg).toBeGreaterThan(2 * Math.acos(ebar) * DEG_PER_RAD);
      // measured: 179.96° at least (|η| ≤ 3e-4)
      expect(minDeg).toBeGreaterThan(179.9);
    });

    it(`ē = ${ebar}: the hysteretic law with δ = 0.4 > ē converges, within 10° from about 43 s on`, () => {
      const r = run({ kind: 'hysteretic', gains, hysteresis: 0.4, initialLogic: 1 }, ebar);
      expect(r.jumps.length).toBe(0); // never fooled into a switch
      const t10 = staysBelowFrom(r, 10);
      // "about 43 s" is the issue's own recomputation of the published setting (criterion not stated);
      // measured here: the error stays below 10° from 42.25 s, below 2° from 68.1 s.
      expect(t10).not.toBeNull();
      expect(t10!).toBeGreaterThan(40);
      expect(t10!).toBeLessThan(46);
      expect(r.trace.errorAngle[r.trace.n - 1]! * DEG_PER_RAD).toBeLessThan(2);
    });
  }
});

describe('(ē, δ) sweep of the hysteretic law: the boundary lies on ē = δ (MST 2011)', () => {
  // Worst-case noise for the hysteretic law: vehicle.sensors.boundedNoiseMode "band-edge" (measured
  // η = −sgn(η)·ē inside |η| < ē). The plain reflection (ε, −η) is the sign law's worst case but lets a
  // hysteretic law with δ < ē escape when its swing overshoots the band: measured on this grid it held
  // only the cell (ē, δ) = (0.35, 0.1). With the band-edge flip a law with δ < ē switches at every
  // crossing of η = 0, one with δ > ē never (hη_meas ≥ −ē > −δ).
  // 100 Hz control with 10 RK4 steps per sample (RK4 at 1 ms), 70 s, two cases per cell: starts within 1°
  // of the 180° error on either hemisphere. "Settled": within 10° and 1°/s until the end (the converging
  // runs stay within 10° from about 43 s on; the held ones never leave 180°).
  const base = mstScenario({ controlRateHz: 100, rk4StepsPerSample: 10, durationS: 70, hysteresis: 0.4, noiseMode: 'band-edge' });
  const json = {
    ...base,
    simulation: { ...base.simulation, settleAngleDeg: 10, settleRateDegPerS: 1 },
    study: { ...base.study, runs: 2, dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 1 } } },
  };
  const E = [0.05, 0.15, 0.25, 0.35];
  const D = [0.1, 0.2, 0.3];
  const def = validateSweep({
    axes: [
      { parameter: 'worst-case-eta', values: E },
      { parameter: 'hysteresis', lo: 0.1, hi: 0.3, steps: 3 },
    ],
    runs: 2,
    seed: 11,
    controllers: ['hyst'],
    level: 0.5,
  });
  if (!def.ok) throw new Error(JSON.stringify(def.errors));
  const r = runSweep(json, def.value);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  const res = r.value;

  it('every cell ran; settles where δ > ē, held where δ < ē', () => {
    expect(res.complete).toBe(true);
    expect(res.cells.length).toBe(12);
    for (const c of res.cells) {
      const [e, d] = c.values as [number, number];
      const h = c.controllers[0]!;
      expect(h.settled.share).toBe(d > e ? 1 : 0);
      if (d < e) expect(h.stalled.share).toBe(1);
    }
  });

  it('each grid line crosses the 50 % level once, within one grid step of ē = δ', () => {
    const b = res.boundaries[0]!;
    const rows = b.points.filter((p) => p.along === 0); // along ē at fixed δ
    const cols = b.points.filter((p) => p.along === 1); // along δ at fixed ē
    expect(rows.length).toBe(D.length);
    // a column crosses only where its ē lies inside the δ range (0.05: settles throughout; 0.35: held throughout)
    expect(cols.length).toBe(E.filter((e) => e > D[0]! && e < D[D.length - 1]!).length);
    for (const p of rows) {
      expect(p.direction).toBe('falls');
      expect(Math.abs(p.value - p.fixedValue!)).toBeLessThanOrEqual(0.1 + 1e-12);
    }
    for (const p of cols) {
      expect(p.direction).toBe('rises');
      expect(Math.abs(p.value - p.fixedValue!)).toBeLessThanOrEqual(0.1 + 1e-12);
    }
  });

  it('carries the theory line ē = δ (MST 2011) for the hysteretic law, clipped to the grid, and the measured boundary lies on it', () => {
    expect(res.theory.length).toBe(1);
    const t = res.theory[0]!;
    expect(t.controllerId).toBe('hyst');
    expect(t.source).toMatch(/Mayhew, Sanfelice & Teel 2011/);
    // the overlap of ē ∈ [0.05, 0.35] and δ ∈ [0.1, 0.3]
    expect(t.points).toEqual([
      { a0: 0.1, a1: 0.1 },
      { a0: 0.3, a1: 0.3 },
    ]);
    // every measured crossing at fixed δ lies within one grid step of the line's ē at that δ
    for (const p of res.boundaries[0]!.points.filter((q) => q.along === 0)) {
      expect(Math.abs(p.value - p.fixedValue!)).toBeLessThanOrEqual(0.1 + 1e-12);
    }
    expect(JSON.parse(sweepJson(res, 'c')).theory).toEqual(res.theory);
  });

  it('the JSON is a pure function of the result (same bytes twice)', () => {
    expect(sweepJson(res, 'c')).toBe(sweepJson(res, 'c'));
  });
});
