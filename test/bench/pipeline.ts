/**
 * Pipeline speed figures (printed, never asserted), on the invented Lumen-6 demo
 * (assets/lumen6-imaging.scenario.json: 4-wheel pyramid, three controllers, 10 Hz sampled control,
 * the scenario's RK4 steps per sample, sensor noise on):
 *  - runPipeline on the demo: validate + plan + certify + 3 controllers × (follow-plan, step-target);
 *    also split into prepareScenario and the six runOne calls, with µs per trace sample;
 *  - one 600 s closed-loop run of the demo vehicle (hysteretic law, step-target reference, 10 Hz,
 *    1 RK4 step per sample, noise on): median time and cost per sample;
 *  - garbage-collector time during those runs (perf_hooks 'gc' entries) and JS-heap bytes
 *    allocated per sample, estimated with V8's sampling heap profiler INCLUDING objects already
 *    collected (without those flags the profiler only sees what is still alive and under-reports;
 *    typed-array backing stores are allocated outside the JS heap and never appear).
 *
 * Run: `node --import tsx test/bench/pipeline.ts` or `npm run bench pipeline`.
 */
import { readFileSync } from 'node:fs';
import { Session } from 'node:inspector/promises';
import { PerformanceObserver } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { flyAndSummarise, preparePipeline, runPipeline, type Prepared } from '../../app/engine/pipeline/run';
import { stepTargetReference } from '../../app/engine/sim/reference';
import { runClosedLoop, type ClosedLoopConfig } from '../../app/engine/sim/closedLoop';

const DEMO = new URL('../../assets/lumen6-imaging.scenario.json', import.meta.url);

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

/**
 * Wall time of `f` and the GC pause time (ms) inside it. Node delivers 'gc' performance entries
 * asynchronously, so the observer is drained after a macrotask.
 */
async function withGcTime<T>(f: () => T): Promise<{ value: T; gcMs: number; ms: number }> {
  let gcMs = 0;
  let t0 = 0,
    t1 = 0;
  const obs = new PerformanceObserver((list) => {
    for (const e of list.getEntries()) if (e.startTime >= t0 && e.startTime <= t1) gcMs += e.duration;
  });
  obs.observe({ entryTypes: ['gc'] });
  t0 = performance.now();
  const value = f();
  t1 = performance.now();
  await new Promise((r) => setTimeout(r, 5));
  obs.disconnect();
  return { value, gcMs, ms: t1 - t0 };
}

interface SamplingNode {
  selfSize: number;
  children: SamplingNode[];
}

/** Bytes allocated while `f` runs (sampled every 256 B, collected objects included). */
async function allocatedBytes(f: () => void): Promise<number> {
  const ses = new Session();
  ses.connect();
  await ses.post('HeapProfiler.enable');
  await ses.post('HeapProfiler.startSampling', {
    samplingInterval: 256,
    includeObjectsCollectedByMajorGC: true,
    includeObjectsCollectedByMinorGC: true,
  });
  f();
  const { profile } = (await ses.post('HeapProfiler.stopSampling')) as { profile: { head: SamplingNode } };
  await ses.post('HeapProfiler.disable');
  ses.disconnect();
  const sum = (n: SamplingNode): number => n.selfSize + n.children.reduce((s, c) => s + sum(c), 0);
  return sum(profile.head);
}

/** The 600 s run: demo vehicle, its hysteretic law, step-target reference, 10 Hz, one RK4 step per sample. */
function longRunConfig(p: Prepared): ClosedLoopConfig {
  const s = p.scenario;
  const c = p.controllers.find((x) => x.law === 'hysteretic') ?? p.controllers[0]!;
  return {
    plant: p.vehicle.plant,
    wheels: p.vehicle.wheels,
    controller: c.controller,
    reference: stepTargetReference(p.plan, p.targets, s.initial.qInertialFromBody),
    q0: s.initial.qInertialFromBody,
    omega0: s.initial.omegaBody,
    hWheel0: s.initial.hWheelNms,
    tEnd: 600,
    timing: 'sampled',
    controlRateHz: 10,
    rk4StepsPerSample: 1,
    sensors: {
      attitudeSigmaRad: s.vehicle.sensors.attitudeNoiseRad,
      rateSigmaRadPerS: s.vehicle.sensors.rateNoiseRadPerS,
      rateBiasRadPerS: s.vehicle.sensors.rateBiasRadPerS,
      adversarialEta: 0,
    },
    seed: s.simulation.seed,
    actuation: { mode: 'hold' },
    allocation: 'min-max',
  };
}

export async function benchPipeline(): Promise<void> {
  const json = JSON.parse(readFileSync(DEMO, 'utf8')) as unknown;
  const prep = preparePipeline(json);
  if (!prep.ok) throw new Error(`demo does not load: ${prep.errors.map((e) => e.message).join('; ')}`);
  const p = prep.value;

  // Warm-up: let the JIT settle before anything is timed.
  for (let i = 0; i < 3; i++) runPipeline(json);

  const REPS = 9;
  const pipe: number[] = [],
    pipeGc: number[] = [],
    prepMs: number[] = [];
  let samples = 0;
  for (let i = 0; i < REPS; i++) {
    const r = await withGcTime(() => runPipeline(json));
    if (!r.value.ok) throw new Error('demo pipeline failed');
    samples = r.value.value.runs.reduce((s, x) => s + x.trace.n, 0);
    pipe.push(r.ms);
    pipeGc.push(r.gcMs);
    const t0 = performance.now();
    preparePipeline(json);
    prepMs.push(performance.now() - t0);
  }
  console.log(
    `   runPipeline(demo), 3 controllers × (follow-plan, step-target): median ${median(pipe).toFixed(1)} ms over ${REPS} ` +
      `(GC ${median(pipeGc).toFixed(1)} ms); preparePipeline alone ${median(prepMs).toFixed(1)} ms; ${samples} trace samples in all`,
  );

  for (const c of p.controllers) {
    for (const mode of ['follow-plan', 'step-target'] as const) {
      const ts: number[] = [];
      let n = 0;
      for (let i = 0; i < REPS; i++) {
        const t0 = performance.now();
        n = flyAndSummarise(p, c, mode).trace.n;
        ts.push(performance.now() - t0);
      }
      const m = median(ts);
      console.log(
        `   fly+summarise ${`${c.id}:${mode}`.padEnd(22)} ${m.toFixed(1).padStart(6)} ms  ${((1000 * m) / n).toFixed(2).padStart(6)} µs/sample (${n} samples, ${p.scenario.simulation.rk4StepsPerSample} RK4 step(s) each)`,
      );
    }
  }

  const cfg = longRunConfig(p);
  for (let i = 0; i < 2; i++) runClosedLoop(cfg);
  const long: number[] = [],
    longGc: number[] = [];
  let nLong = 0;
  for (let i = 0; i < REPS; i++) {
    const r = await withGcTime(() => runClosedLoop(cfg));
    if (r.value.outcome.status !== 'completed') throw new Error(`600 s run ended ${r.value.outcome.status}`);
    nLong = r.value.trace.n;
    long.push(r.ms);
    longGc.push(r.gcMs);
  }
  const mLong = median(long);
  const bytes = await allocatedBytes(() => runClosedLoop(cfg));
  console.log(
    `   600 s closed loop (10 Hz, 1 RK4 step per sample, hysteretic, noise on): median ${mLong.toFixed(1)} ms ` +
      `(GC ${median(longGc).toFixed(2)} ms), ${((1000 * mLong) / nLong).toFixed(2)} µs per sample, ` +
      `~${(bytes / nLong).toFixed(0)} B of JS heap allocated per sample (${(bytes / 1e6).toFixed(2)} MB per run; the trace's ` +
      `typed-array storage lives outside the JS heap and is not counted)`,
  );
}

if (import.meta.url === pathToFileURL(process.argv[1]!).href) await benchPipeline();
