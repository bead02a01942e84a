/**
 * Sky view per-frame cost (printed, never asserted), min and median of repeated runs: `skyNow`
 * (app/ui/orbit/skyPlayback.ts) on the bundled orbit-day example flown with its PD law, with Sun,
 * Moon and Earth-limb cones on the chosen axis: the axis marker, three moving cones (180-point
 * circles cut for the chart) and the Sun and Moon at a playback time. Goal (our own, common
 * practice, no source): ≤ 1 ms, a small part of a 16 ms frame (the canvas drawing comes on top).
 * Run: `node --import tsx test/bench/skyPlayback.ts`.
 */
import { readFileSync } from 'node:fs';
import { runPipeline } from '../../app/engine/pipeline/run';
import { skyNow } from '../../app/ui/orbit/skyPlayback';

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

const json = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as Record<
  string,
  unknown
>;
json.constraints = [
  { name: 'sun', kind: 'keep-out', bodyAxis: [1, 0, 0], halfAngleDeg: 30, direction: { kind: 'sun' } },
  { name: 'moon', kind: 'keep-out', bodyAxis: [1, 0, 0], halfAngleDeg: 15, direction: { kind: 'moon' } },
  { name: 'limb', kind: 'keep-out', bodyAxis: [1, 0, 0], halfAngleDeg: 10, direction: { kind: 'earth-limb' } },
];
const r = runPipeline(json, { controllers: ['pd'], modes: ['follow-plan'] });
if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
const out = r.value;
const run = out.runs[0]!;
const tEnd = run.trace.t[run.trace.n - 1]!;
const N = 2000;
const times: number[] = [];
for (let rep = 0; rep < 5; rep++) {
  const t0 = performance.now();
  let cones = 0;
  for (let i = 0; i < N; i++) cones += skyNow(out, run.key, [1, 0, 0], (i * 3.37) % tEnd).cones.length;
  times.push((performance.now() - t0) / N);
  if (cones !== 3 * N) throw new Error(`expected 3 cones per frame, got ${cones / N}`);
}
console.log(
  `skyNow (marker, 3 moving cones, Sun, Moon; trace of ${run.trace.n} samples): min ${(1000 * Math.min(...times)).toFixed(1)} µs, median ${(1000 * median(times)).toFixed(1)} µs per frame (goal ≤ 1000 µs)`,
);
