/**
 * Orbit view speed figures (printed, never asserted), min and median of repeated runs:
 *  - orbitViewSamples: the once-per-run-set sampling for the 3D orbit view over the bundled
 *    example's ephemeris (2 h horizon, 10 s spacing) and over one day (capped at 5000 samples);
 *  - orbitViewAt: the per-frame interpolation (position, Sun/Moon directions, conical shadow,
 *    Earth orientation); goal (our own): ≤ 2 µs, well inside a 16 ms frame;
 *  - OrbitScene.setTime: the renderer-free scene update per frame (no labels in Node).
 * Run: `node --import tsx test/bench/orbitView.ts`.
 */
import { readFileSync } from 'node:fs';
import { buildEphemeris } from '../../app/engine/orbit/ephemeris';
import { orbitFromTle } from '../../app/engine/orbit/tle';
import { createOrbitViewPoint, orbitViewAt, orbitViewSamples } from '../../app/engine/orbit/viewSamples';
import { preparePipeline } from '../../app/engine/pipeline/run';
import { OrbitScene } from '../../app/view3d/orbitScene';

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}
function timed(runs: number, fn: () => void): { min: number; median: number } {
  const t: number[] = [];
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    fn();
    t.push(performance.now() - t0);
  }
  return { min: Math.min(...t), median: median(t) };
}

const json = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as {
  orbit: { tle: string[] };
};
const prep = preparePipeline(json);
if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
const eph = prep.value.orbit!.ephemeris;
let samples = orbitViewSamples(eph)!;
const a = timed(5, () => (samples = orbitViewSamples(eph)!));
console.log(
  `orbitViewSamples, example (${samples.n} samples at ${samples.stepS} s): min ${a.min.toFixed(1)} ms, median ${a.median.toFixed(1)} ms`,
);

const orbit = orbitFromTle(json.orbit.tle.join('\n'), 'orbit.tle');
if (!orbit.ok) throw new Error('tle');
const day = buildEphemeris(orbit.value, eph.epochTaiS, 0, 86_400);
if (!day.ok) throw new Error('ephemeris');
let daySamples = orbitViewSamples(day.value)!;
const b = timed(3, () => (daySamples = orbitViewSamples(day.value)!));
console.log(
  `orbitViewSamples, one day (${daySamples.n} samples at ${daySamples.stepS.toFixed(2)} s): min ${b.min.toFixed(1)} ms, median ${b.median.toFixed(1)} ms`,
);

const p = createOrbitViewPoint();
const N = 200_000;
const c = timed(5, () => {
  for (let i = 0; i < N; i++) orbitViewAt(p, samples, (i * 7.31) % samples.endS);
});
console.log(
  `orbitViewAt: min ${((1000 * c.min) / N).toFixed(3)} µs, median ${((1000 * c.median) / N).toFixed(3)} µs per call (goal ≤ 2 µs)`,
);

const scene = new OrbitScene(null);
scene.setData({ samples, sites: [], links: [], vehicleName: 'x' });
const M = 50_000;
const d = timed(5, () => {
  for (let i = 0; i < M; i++) scene.setTime((i * 3.7) % samples.endS);
});
console.log(`OrbitScene.setTime: min ${((1000 * d.min) / M).toFixed(3)} µs, median ${((1000 * d.median) / M).toFixed(3)} µs per frame`);
scene.dispose();
