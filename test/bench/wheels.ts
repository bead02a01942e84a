/**
 * Wheel-module speed figures (no assertions): per-call cost of allocation and limiting (what a
 * 10 Hz controller pays per sample) and of building envelopes (once per array). Run:
 * node --import tsx test/bench/wheels.ts, or through run.ts once it lists
 * { file: './wheels.ts', fn: 'benchWheels' }.
 */
import {
  allocateMinMax,
  allocateMinNorm,
  limitWheelTorque,
  makeWheelArray,
  momentumEnvelope,
  envelopeCapacity,
  orthogonalTriad,
  pyramid,
  createLimitInfo,
} from '../../app/engine/wheels';
import type { WheelArray, WheelSpec } from '../../app/engine/wheels';
import { makeRng } from '../../app/engine/math/prng';

const LIM = { maxTorqueNm: 0.002, maxMomentumNms: 0.006, rotorInertiaKgm2: 2e-5 };

function build(specs: WheelSpec[]): WheelArray {
  const r = makeWheelArray(specs);
  if (!r.ok) throw new Error('bad bench array');
  return r.value;
}

function perCall(label: string, calls: number, fn: (k: number) => void): void {
  for (let k = 0; k < Math.min(calls, 2000); k++) fn(k); // warm-up
  const t0 = performance.now();
  for (let k = 0; k < calls; k++) fn(k);
  const us = ((performance.now() - t0) * 1000) / calls;
  console.log(`   ${label}: ${us.toFixed(2)} µs per call (${calls} calls)`);
}

export async function benchWheels(): Promise<void> {
  const rng = makeRng(7, 0);
  const arrays: [string, WheelArray][] = [
    ['triad', build(orthogonalTriad(LIM))],
    ['4-pyramid', build(pyramid({ ...LIM, cantAngleRad: Math.acos(1 / Math.sqrt(3)), azimuthOffsetRad: Math.PI / 4 }))],
    ['6-pyramid', build(pyramid({ ...LIM, count: 6, cantAngleRad: 0.9 }))],
    ['12-pyramid', build(pyramid({ ...LIM, count: 12, cantAngleRad: 0.9 }))],
  ];
  const N = 4096;
  for (const [name, arr] of arrays) {
    const n = arr.n;
    const tau = Array.from({ length: N }, () => [rng.normal() * 0.002, rng.normal() * 0.002, rng.normal() * 0.002]);
    // Momenta with about a third of the wheels at or past their limit, so the LP path runs.
    const h = Array.from({ length: N }, () =>
      Array.from({ length: n }, () => (rng.next() < 0.3 ? 1.05 : rng.next()) * 0.006 * (rng.next() < 0.5 ? -1 : 1)),
    );
    const out = new Float64Array(n),
      cmd = new Float64Array(n);
    const info = createLimitInfo();
    console.log(` ${name} (${n} wheels)`);
    perCall('allocateMinNorm', 200_000, (k) => allocateMinNorm(out, arr, tau[k % N]!));
    perCall('allocateMinMax', 50_000, (k) => allocateMinMax(out, arr, tau[k % N]!));
    let nullSpace = 0,
      scaled = 0;
    perCall('limitWheelTorque (instantaneous, saturated wheels)', 20_000, (k) => {
      allocateMinMax(cmd, arr, tau[k % N]!);
      limitWheelTorque(out, arr, cmd, h[k % N]!, info);
      if (info.reason === 'momentum-null-space') nullSpace++;
      if (info.reason === 'momentum') scaled++;
    });
    console.log(`     (of those calls: ${nullSpace} fixed in the null space, ${scaled} scaled for momentum)`);
    perCall('limitWheelTorque (predictive, dt = 0.1 s)', 20_000, (k) => {
      allocateMinMax(cmd, arr, tau[k % N]!);
      limitWheelTorque(out, arr, cmd, h[k % N]!, 0.1, info);
    });
    const t0 = performance.now();
    const z = momentumEnvelope(arr);
    const tBuild = performance.now() - t0;
    console.log(`   momentumEnvelope: ${tBuild.toFixed(2)} ms (V ${z.vertices.length / 3}, F ${z.faces.length})`);
    perCall('envelopeCapacity', 100_000, (k) => envelopeCapacity(z, tau[k % N]!));
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await benchWheels();
