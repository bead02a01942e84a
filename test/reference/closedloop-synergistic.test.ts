/**
 * Global convergence of the synergistic hybrid law through the real closed loop.
 *
 * Theory: Mayhew & Teel, "Synergistic hybrid feedback for global rigid-body attitude tracking on
 * SO(3)", IEEE TAC 58(11):2730–2742, 2013 (family by angular warping: Berkane & Tayebi, IEEE TAC
 * 62(1):495–501, 2017; methods §4): with a synergistic family and 0 < δ < δ*, {R_e = I, ω_e = 0}
 * is globally asymptotically stable, W = k_R V_q + ½ω_eᵀJ⊥ω_e never rises on a flow and drops by at
 * least k_R δ at each jump; the result is robust to small measurement noise.
 *
 * What is simulated (invented vehicle): J = diag(1, 1.2, 0.8) kg·m², 4-wheel pyramid with 5 N·m
 * and 50 N·m·s per wheel (far above any request here, so the torque is delivered exactly — a
 * scaled command would void the Lyapunov argument), the certified family of methods §4.3
 * (A = diag(1,2,3), warp gain 0.15 about A's eigenvectors, δ = 0.2 < δ* = 0.249989), bandwidth
 * gains ω_n = 1 rad/s, ζ = 0.9. Starts at rest from
 *  - 1000 attitudes drawn uniformly on SO(3) (Shoemake, "Uniform random rotations", Graphics
 *    Gems III, 1992: qRandomUniform, seeded), and
 *  - every undesired critical point of every V_q from the certificate's criticalPoints, with the
 *    logic set to that member (an equilibrium of the flow: only the jump gets it out).
 * Runs: up to 40 s, stopped early once the error stays under 0.5° and 1 mrad/s for 2 s.
 *  (a) ideal continuous mode (no noise; 10 Hz output, one RK4 step per sample, logic jumps
 *      located on the guard): every run settles; lyapunovMonitor flags no rise of W on any flow
 *      and no jump short of k_R δ;
 *  (b) sampled 10 Hz with noise (attitude 1 mrad per axis, rate 0.1 mrad/s white, bias
 *      (0.05, −0.03, 0.02) mrad/s): every run ends within 1° of the target.
 */
import { describe, expect, it } from 'vitest';
import type { AttitudeController } from '../../app/engine/control/types';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform } from '../../app/engine/math/rotation';
import { lyapunovMonitor } from '../../app/engine/metrics/monitor';
import type { SensorModel } from '../../app/engine/sim/sensors';
import { fly, law, pyramidVehicle } from './closedloop-fixtures';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';
import { SettleWatch } from '../../app/engine/metrics/settle';

const veh = pyramidVehicle(
  [
    [1, 0, 0],
    [0, 1.2, 0],
    [0, 0, 0.8],
  ],
  5,
  50,
);
const spec = (initialLogic: number | 'auto') => ({
  kind: 'synergistic',
  gains: { omegaN: 1, zeta: 0.9 },
  potential: { eigenvalues: [1, 2, 3] },
  warpGain: 0.15,
  hysteresis: 0.2,
  initialLogic,
});
const auto = law(spec('auto'), veh);
const byMember = [1, 2, 3].map((m) => law(spec(m), veh));
const cert = auto.certificate!;
const critical = cert.criticalPoints.filter((p) => p.target !== 0);

const starts: { q: number[]; ctrl: AttitudeController; critical: boolean }[] = [];
{
  const rng = makeRng(20250601, 0);
  const q = new Float64Array(4);
  for (let i = 0; i < 1000; i++) starts.push({ q: Array.from(qRandomUniform(q, rng)), ctrl: auto, critical: false });
  for (const p of critical) starts.push({ q: [...p.attitude], ctrl: byMember[p.member - 1]!, critical: true });
}

const NOISE: SensorModel = { attitudeSigmaRad: 1e-3, rateSigmaRadPerS: 1e-4, rateBiasRadPerS: [5e-5, -3e-5, 2e-5], adversarialEta: 0 };
/** Shared run settings; each run gets its own stop rule (it keeps state): settled 2 s within the thresholds. */
const common = (angleRad = 0.5 * RAD_PER_DEG, rateRadPerS = 1e-3) => ({
  tEnd: 40,
  controlRateHz: 10,
  rk4StepsPerSample: 1,
  stopRule: new SettleWatch(angleRad, rateRadPerS, 2),
});

describe('synergistic law: global convergence from 1000 uniform attitudes and every undesired critical point', () => {
  it('the certificate is the one of methods §4.3 and lists 9 undesired critical points, each with gap > δ', () => {
    expect(cert.admissible).toBe(true);
    expect(cert.deltaStar).toBeCloseTo(0.249989, 5);
    expect(critical.length).toBe(9);
    for (const p of critical) expect(p.gap).toBeGreaterThan(0.2);
  });

  it('ideal continuous mode, no noise: every run settles, W never rises on a flow, every jump drops W by ≥ k_R δ', () => {
    let flags = 0,
      jumps = 0,
      worstDeg = 0,
      longest = 0;
    for (const s of starts) {
      const r = fly({ vehicle: veh, controller: s.ctrl, q0: s.q, timing: 'continuous-ideal', ...common() });
      const tr = r.trace;
      expect(r.outcome.status).toBe('completed');
      worstDeg = Math.max(worstDeg, tr.errorAngle[tr.n - 1]! * DEG_PER_RAD);
      longest = Math.max(longest, tr.t[tr.n - 1]!);
      // W values are O(1) here; a rise above 1e-6 of the run's largest W would be a real rise, not rounding
      flags += lyapunovMonitor(tr, r.jumps, { jumpDecrease: s.ctrl.jumpDecrease, relTol: 1e-6, absTol: 1e-12 }).length;
      jumps += r.jumps.length;
      if (s.critical) {
        // an equilibrium of the flow: the law must jump at once, to the member the certificate names
        expect(r.jumps.length).toBeGreaterThanOrEqual(1);
        expect(r.jumps[0]!.t).toBe(0);
      }
    }
    expect(worstDeg).toBeLessThan(0.5);
    expect(longest).toBeLessThan(40); // every run stopped early: settled well before the end
    expect(flags).toBe(0);
    expect(jumps).toBeGreaterThanOrEqual(critical.length);
  });

  it('critical-point starts jump to the member the certificate names', () => {
    for (const p of critical) {
      const r = fly({
        vehicle: veh,
        controller: byMember[p.member - 1]!,
        q0: p.attitude,
        timing: 'continuous-ideal',
        ...common(),
        tEnd: 0.5,
      });
      expect(r.jumps[0]!.from).toBe(p.member);
      expect(r.jumps[0]!.to).toBe(p.jumpTo);
      expect(r.jumps[0]!.lyapunovBefore! - r.jumps[0]!.lyapunovAfter!).toBeCloseTo((auto.jumpDecrease / 0.2) * p.gap, 9);
    }
  });

  it('sampled 10 Hz with sensor noise: every run ends within 1° of the target', () => {
    let worstDeg = 0;
    starts.forEach((s, i) => {
      const r = fly({
        vehicle: veh,
        controller: s.ctrl,
        q0: s.q,
        timing: 'sampled',
        sensors: NOISE,
        seed: 99,
        stream: i,
        ...common(1 * RAD_PER_DEG, 2e-3),
      });
      expect(r.outcome.status).toBe('completed');
      worstDeg = Math.max(worstDeg, r.trace.errorAngle[r.trace.n - 1]! * DEG_PER_RAD);
    });
    expect(worstDeg).toBeLessThan(1);
  });
});
