/**
 * Pointing-law speed figures (no assertions): the S² certificate (default options, cold cache),
 * one torque evaluation per pointing law against the full quaternion PD, and one closed-loop run.
 * Run directly: node --import tsx test/bench/sphere.ts (not registered in run.ts).
 */
import { controllerFromSpec as makeController } from '../support/controller-spec';
import {
  certifySphereFamily,
  clearSphereCertificateCache,
  evenWarpDirections,
  makeReducedPd,
  makeReducedSynergistic,
  makeSphereFamily,
} from '../../app/engine/control/sphere/index';
import type { AttitudeController, ControlInput } from '../../app/engine/control/types';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform } from '../../app/engine/math/rotation';
import { fly, pyramidVehicle } from '../reference/closedloop-fixtures';

function best(n: number, f: () => void): number {
  let b = Infinity;
  for (let i = 0; i < n; i++) {
    const t0 = performance.now();
    f();
    b = Math.min(b, performance.now() - t0);
  }
  return b;
}

export function benchSphere(): void {
  const b = [0.6, 0, 0.8];
  for (const m of [2, 3, 4]) {
    const fam = makeSphereFamily(b, 0.5, evenWarpDirections(b, m));
    let cert = certifySphereFamily({ family: fam, delta: 0.3 });
    const ms = best(3, () => {
      clearSphereCertificateCache();
      cert = certifySphereFamily({ family: fam, delta: 0.3 });
    });
    const cached = best(5, () => certifySphereFamily({ family: fam, delta: 0.3 }));
    console.log(
      `   S² certificate, M = ${m} (10⁵-sample gradient scan, ${cert.completeness!.starts} zero searches): ${ms.toFixed(0)} ms cold, ${cached.toFixed(2)} ms cached; δ* = ${cert.deltaStar.toFixed(6)}`,
    );
  }

  const veh = pyramidVehicle(
    [
      [0.11, 0.002, -0.001],
      [0.002, 0.12, 0.0015],
      [-0.001, 0.0015, 0.08],
    ],
    2e-3,
    6e-3,
  );
  const laws: [string, AttitudeController][] = [];
  const pd = makeReducedPd({ axis: b, kp: 1.2e-3, Kd: 2.2e-2 }, veh.model);
  const syn = makeReducedSynergistic({ axis: b, kp: 1.2e-3, Kd: 2.2e-2, warpGain: 0.5, members: 3, hysteresis: 0.4 }, veh.model);
  const full = makeController({ kind: 'quaternion-pd', gains: { omegaN: 0.1, zeta: 0.9 } }, veh.model);
  if (full.ok) laws.push(['quaternion PD (full attitude)', full.value]);
  if (pd.ok) laws.push(['reduced PD', pd.value]);
  if (syn.ok) laws.push(['reduced synergistic (M = 3)', syn.value]);
  const rng = makeRng(3, 0);
  const qs = new Float64Array(4 * 256);
  const q = new Float64Array(4);
  for (let i = 0; i < 256; i++) qs.set(qRandomUniform(q, rng), 4 * i);
  const inp: ControlInput = {
    q: new Float64Array(4),
    omega: Float64Array.of(0.01, -0.02, 0.005),
    hWheel: Float64Array.of(0.001, -0.002, 0.0005, 0),
    qRef: Float64Array.of(0, 0, 0, 1),
    omegaRef: Float64Array.of(0, 0.001, 0),
    omegaDotRef: new Float64Array(3),
  };
  const tau = new Float64Array(3);
  const N = 200_000;
  for (const [name, c] of laws) {
    const logic = c.initialLogic(inp);
    const ms = best(3, () => {
      for (let i = 0; i < N; i++) {
        (inp.q as Float64Array).set(qs.subarray(4 * (i & 255), 4 * (i & 255) + 4));
        c.torque(tau, inp, logic);
      }
    });
    console.log(`   torque, ${name}: ${((ms * 1e6) / N).toFixed(0)} ns per call`);
  }
  if (syn.ok) {
    const q0 = [0.3, -0.5, 0.7, 0.4].map((v) => v / Math.hypot(0.3, -0.5, 0.7, 0.4));
    for (const timing of ['sampled', 'continuous-ideal'] as const) {
      const ms = best(3, () => fly({ vehicle: veh, controller: syn.value, q0, tEnd: 600, timing }));
      console.log(`   closed loop, reduced synergistic, 600 s at 10 Hz (${timing}): ${ms.toFixed(0)} ms`);
    }
  }
}

benchSphere();
