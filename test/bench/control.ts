/**
 * Controller speed figures (no assertions): the 10⁶-sample synergistic flow-set check (target
 * ≤ 1 s), the full certificate, and the cost of one torque evaluation per law. Run through
 * run.ts (`npm run bench control`) or directly: node --import tsx test/bench/control.ts.
 */
import { certifySynergistic, clearCertificateCache } from '../../app/engine/control/certificate';
import { flowSetGradientCheck } from '../../app/engine/control/flowset';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import { makeWarpFamily } from '../../app/engine/control/potential';
import type { ControlInput, PlantModel } from '../../app/engine/control/types';
import { makeRng } from '../../app/engine/math/prng';
import { qRandomUniform } from '../../app/engine/math/rotation';

function best(n: number, f: () => void): number {
  let b = Infinity;
  for (let i = 0; i < n; i++) {
    const t0 = performance.now();
    f();
    b = Math.min(b, performance.now() - t0);
  }
  return b;
}

export async function benchControl(): Promise<void> {
  // methods §4.3 family, recommended δ = 0.2
  const fam = makeWarpFamily([1, 0, 0, 0, 2, 0, 0, 0, 3], 0.15, [1, 0, 0, 0, 1, 0, 0, 0, 1]);
  let last = flowSetGradientCheck(fam, 0.2, { samples: 50_000, refine: false }); // warm-up
  const sampling = best(3, () => (last = flowSetGradientCheck(fam, 0.2, { samples: 1_000_000, seed: 1, refine: false })));
  console.log(`   flow-set check, 10⁶ uniform attitudes (sampling only): ${sampling.toFixed(0)} ms (target ≤ 1000 ms)`);
  const refined = best(3, () => (last = flowSetGradientCheck(fam, 0.2, { samples: 1_000_000, seed: 1 })));
  console.log(`   same with the local refinement of each member's minimum: ${refined.toFixed(0)} ms`);
  console.log(
    `     min ‖b_q‖ sampled / refined: ${last.perMember.map((m) => `q${m.member} ${m.minGradientNorm.toFixed(4)} / ${m.refinedMinGradientNorm?.toFixed(4) ?? 'n/a'}`).join(', ')}`,
  );
  let cert = certifySynergistic({ family: fam, delta: 0.2 });
  const tc = best(3, () => {
    clearCertificateCache(); // time the computation, not the cache
    cert = certifySynergistic({ family: fam, delta: 0.2 });
  });
  console.log(
    `   certificate (diffeomorphism, critical points, 450-start completeness, 20 000-sample flow set): ${tc.toFixed(0)} ms; δ* = ${cert.deltaStar.toFixed(6)}`,
  );

  const plant: PlantModel = {
    Jperp: Float64Array.of(0.11, 0.002, -0.001, 0.002, 0.12, 0.0015, -0.001, 0.0015, 0.08),
    nWheels: 4,
    axes: new Float64Array(12),
  };
  // pyramid, elevation β with sin β = 1/√3 (methods §6)
  const cb = Math.sqrt(2 / 3),
    sb = 1 / Math.sqrt(3);
  plant.axes.set([cb, 0, sb, 0, cb, sb, -cb, 0, sb, 0, -cb, sb]);
  const specs: Record<string, unknown>[] = [
    { kind: 'quaternion-pd', gains: { omegaN: 0.1, zeta: 0.9 } },
    { kind: 'sign-switch', gains: { omegaN: 0.1, zeta: 0.9 } },
    { kind: 'eigenaxis', gains: { omegaN: 0.1, zeta: 0.9 }, maxRateRadPerS: 0.03 },
    { kind: 'hysteretic', gains: { omegaN: 0.1, zeta: 0.9 }, hysteresis: 0.2 },
    { kind: 'synergistic', gains: { omegaN: 0.1, zeta: 0.9 }, potential: { eigenvalues: [1, 2, 3] }, warpGain: 0.15, hysteresis: 0.2 },
  ];
  const rng = makeRng(3, 0);
  const N = 200_000;
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
  const parts: string[] = [];
  for (const spec of specs) {
    const r = makeController(spec, plant);
    if (!r.ok) continue;
    const c = r.value;
    const logic = c.initialLogic(inp);
    const ms = best(3, () => {
      for (let i = 0; i < N; i++) {
        const o = 4 * (i & 255);
        inp.q[0] = qs[o]!;
        inp.q[1] = qs[o + 1]!;
        inp.q[2] = qs[o + 2]!;
        inp.q[3] = qs[o + 3]!;
        c.torque(tau, inp, logic);
      }
    });
    parts.push(`${c.kind} ${((ms * 1e6) / N).toFixed(0)} ns`);
  }
  console.log(`   one torque evaluation (tracking form, 4 wheels): ${parts.join(', ')}`);
}

// Direct run: node --import tsx test/bench/control.ts
if (import.meta.url === `file://${process.argv[1]}`) await benchControl();
