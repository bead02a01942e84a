/**
 * 3D view: script time of one scene update (setTime, no rendering) on synthetic 10,000-sample runs.
 * WebGL cannot run in Node, so this measures the renderer-free AttitudeScene, which is exactly
 * what setTime does in the browser too; drawing is measured later in Chromium (e2e).
 * Target: median ≤ 2 ms per setTime. Figures only, no assertions.
 *
 * Run: `npm run bench -- view3d`, or `node --import tsx test/bench/view3d.ts`.
 */
import { Session } from 'node:inspector/promises';
import { qFromAxisAngle } from '../../app/engine/math/rotation';
import { makeRng } from '../../app/engine/math/prng';
import { AttitudeScene } from '../../app/view3d/attitudeScene';
import type { ViewLayout } from '../../app/view3d/types';
import type { SyntheticRunSpec } from '../unit/view3d-fixtures';
import { syntheticViewRun } from '../unit/view3d-fixtures';

function quantile(sorted: Float64Array, p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
}

interface SamplingNode {
  selfSize: number;
  children: SamplingNode[];
}

/**
 * Bytes allocated per call of `f`, estimated with V8's sampling heap profiler (a sample about
 * every 128 allocated bytes). Heap-used differences are too noisy for this.
 */
async function allocatedBytesPerCall(f: (k: number) => void, calls: number): Promise<number> {
  const ses = new Session();
  ses.connect();
  await ses.post('HeapProfiler.startSampling', { samplingInterval: 128 });
  for (let k = 0; k < calls; k++) f(k);
  const { profile } = (await ses.post('HeapProfiler.stopSampling')) as { profile: { head: SamplingNode } };
  ses.disconnect();
  let total = 0;
  const walk = (nd: SamplingNode) => {
    total += nd.selfSize;
    nd.children.forEach(walk);
  };
  walk(profile.head);
  return total / calls;
}

export async function benchView3d(): Promise<void> {
  const n = 10_000;
  const jumps = Array.from({ length: 40 }, (_, k) => 200 + k * 240);
  const spec: SyntheticRunSpec = {
    n,
    dt: 0.1,
    q0: qFromAxisAngle(new Float64Array(4), [1, 2, 2], 0.7),
    omegaBody: [0.01, -0.015, 0.02],
    jumpSamples: jumps,
    logicKind: 'sign',
  };
  const tEnd = (n - 1) * spec.dt;
  const rng = makeRng(9, 0);
  const keepOut = [{ label: 'Sun', dirInertial: [1, 0.2, 0.1], halfAngleRad: 0.5 }];

  for (const [layout, nRuns] of [
    ['single', 1],
    ['overlay', 2],
    ['side-by-side', 2],
  ] as [ViewLayout, number][]) {
    const runs = Array.from({ length: nRuns }, (_, k) => syntheticViewRun(spec, `run ${k + 1}`));
    const scene = new AttitudeScene({ options: { keepOut } });
    const tb = performance.now();
    scene.setRuns(runs, layout);
    const buildMs = performance.now() - tb;

    // Warm-up, then two access patterns: playback (small forward steps) and random scrubbing.
    for (let k = 0; k < 2000; k++) scene.setTime(rng.next() * tEnd);
    const m = 5000;
    const play = new Float64Array(m),
      scrub = new Float64Array(m);
    for (let k = 0; k < m; k++) {
      scene.setTime((k * 0.0167 * 10) % tEnd);
      play[k] = scene.stats.lastUpdateMs;
    }
    for (let k = 0; k < m; k++) {
      scene.setTime(rng.next() * tEnd);
      scrub[k] = scene.stats.lastUpdateMs;
    }
    play.sort();
    scrub.sort();

    // The no-allocation rule, as a figure (includes the profiler's own few kB, spread over the calls).
    const calls = 100_000;
    const bytes = await allocatedBytesPerCall((k) => scene.setTime((k * 0.05) % tEnd), calls);
    const perCall = `${bytes.toFixed(2)} B/call allocated (sampled over ${calls} calls)`;
    console.log(
      `   ${layout.padEnd(12)} ${nRuns} run(s) × ${n} samples: build ${buildMs.toFixed(1)} ms; ` +
        `setTime median ${quantile(play, 0.5).toFixed(4)} ms (playback), ${quantile(scrub, 0.5).toFixed(4)} ms (scrub), ` +
        `p99 ${quantile(scrub, 0.99).toFixed(4)} ms; heap ${perCall}   [target median ≤ 2 ms]`,
    );
    scene.dispose();
  }
}

// Direct run: node --import tsx test/bench/view3d.ts
if (process.argv[1] && /view3d\.ts$/.test(process.argv[1])) await benchView3d();
