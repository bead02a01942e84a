/**
 * Robustness-study speed figures (no assertions): 10,000 dispersed 600 s slews (2,000 cases of
 * the Tern-12 example study × its five laws) on two worker threads, against the single-run
 * figure (one pipeline flight of a 600 s case) and the in-thread cost per case, with the
 * parallel efficiency and where a case's time goes. Cheapest honest settings: RK4 with one step
 * per 10 Hz control period (rk4StepsPerSample 1) and the study's early stop (20 s settled).
 * Run: node --import tsx test/bench/study.ts, or npm run bench -- study.
 */
import { readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { flyAndSummarise, preparePipeline } from '../../app/engine/pipeline/run';
import { makeStudyContext } from '../../app/engine/study/context';
import { prepareCase, runCase } from '../../app/engine/study/runCase';
import { fly, scenarioFlight } from '../../app/engine/pipeline/fly';
import { startStudyParallel } from '../../app/engine/study/parallel';
import { threadPort } from '../../main/cli/study';

const here = path.dirname(fileURLToPath(import.meta.url));

function scenario(runs: number): Record<string, any> {
  const json = JSON.parse(readFileSync(path.join(here, '../../assets/tern12-reversal.scenario.json'), 'utf8'));
  json.simulation.rk4StepsPerSample = 1;
  json.study.runs = runs;
  json.study.durationS = 600;
  return json;
}

const ms = (x: number) => `${x.toFixed(x < 10 ? 2 : 1)} ms`;

export async function benchStudy(): Promise<void> {
  const SLEWS = 10_000;
  const json = scenario(2_000);
  const nLaws = json.study.controllers.length;
  const cases = SLEWS / nLaws;

  const load = () => os.loadavg()[0]!.toFixed(1);
  console.log(
    `   machine: ${os.cpus().length} cores, 1-min load average ${load()} at start (other jobs on the machine inflate every figure)`,
  );

  // 1. Single-run figure: one normal 600 s run through the pipeline (no early stop), median of 9.
  const single = JSON.parse(JSON.stringify(json));
  single.simulation.mode = 'step-target';
  single.simulation.durationS = 600;
  const p = preparePipeline(single, ['hyst']);
  if (!p.ok) throw new Error('scenario refused');
  flyAndSummarise(p.value, p.value.controllers[0]!, 'step-target');
  const singles: number[] = [];
  let samples = 0;
  for (let k = 0; k < 9; k++) {
    const t = performance.now();
    samples = flyAndSummarise(p.value, p.value.controllers[0]!, 'step-target').trace.n;
    singles.push(performance.now() - t);
  }
  const singleMs = median(singles);
  console.log(
    `   single run (pipeline flight, hysteretic, ${samples} samples = 600 s at 10 Hz, no early stop): ${ms(singleMs)} (median of 9)`,
  );

  // 2. In-thread cost per case over every 20th case of the study (a fair sample of its mix).
  const c = makeStudyContext(json);
  if (!c.ok) throw new Error('study refused');
  const ctx = c.value;
  const probe = Array.from({ length: 100 }, (_, k) => 20 * k);
  for (let i = 0; i < 3; i++) runCase(ctx, probe[i]!); // warm up
  const t0 = performance.now();
  for (const i of probe) runCase(ctx, i);
  const perCase = (performance.now() - t0) / probe.length;
  let tDraw = 0,
    tFly = 0,
    tMetrics = 0,
    simS = 0,
    nRuns = 0,
    nSamples = 0;
  for (const i of probe.slice(0, 30)) {
    let a = performance.now();
    const pc = prepareCase(ctx, i);
    tDraw += performance.now() - a;
    if (!pc.ok) continue;
    const pr = pc.prepared;
    for (const bc of pr.controllers) {
      a = performance.now();
      const res = fly(scenarioFlight(pr.scenario, pr.vehicle, pr.plan, pr.targets, bc, ctx.def.mode));
      tFly += performance.now() - a;
      a = performance.now();
      flyAndSummarise(pr, bc, ctx.def.mode, { monitor: false });
      tMetrics += performance.now() - a - tFly / (nRuns + 1);
      simS += res.trace.t[res.trace.n - 1]!;
      nSamples += res.trace.n;
      nRuns++;
    }
  }
  const perSlew = perCase / nLaws;
  console.log(
    `   in one thread: ${ms(perCase)} per case (${nLaws} laws) = ${ms(perSlew)} per slew; early stop leaves ${(simS / nRuns).toFixed(0)} of 600 simulated s per slew on average`,
  );
  const flyPer = tFly / nRuns,
    metPer = tMetrics / nRuns;
  const samplesPer = nSamples / nRuns; // the study draws 5 or 10 Hz per case
  console.log(
    `   per slew: closed loop ${ms(flyPer)} (≈ ${((1e3 * flyPer) / samplesPer).toFixed(1)} µs per control sample), metrics ≈ ${ms(Math.max(0, metPer))}, draw + case scenario + build + plan ${ms(tDraw / 30 / nLaws)}`,
  );

  // 3. Two worker threads, 10,000 slews.
  const threads = [threadPort(), threadPort()];
  const cpu0 = process.cpuUsage();
  const tStart = performance.now();
  let tReady = 0;
  const study = startStudyParallel(
    json,
    threads.map((t) => t.port),
    {
      chunkSize: 8,
      onReady: () => {
        if (!tReady) tReady = performance.now();
      },
    },
  );
  const r = await study.result;
  const wall = performance.now() - tStart;
  const cpu = process.cpuUsage(cpu0);
  await Promise.all(threads.map((t) => t.worker.terminate()));
  if (!r.ok) throw new Error('parallel study refused');
  const compute = wall - (tReady - tStart);
  const ideal = (perCase * cases) / 2;
  console.log(
    `   2 worker threads, ${cases} cases × ${nLaws} laws = ${SLEWS} slews: ${(wall / 1e3).toFixed(1)} s wall (target ≤ 10 s), of which ${((tReady - tStart) / 1e3).toFixed(1)} s worker start-up (tsx + study context)`,
  );
  console.log(
    `   parallel efficiency = in-thread estimate / 2 / parallel compute time = ${(ideal / 1e3).toFixed(1)} s / ${(compute / 1e3).toFixed(1)} s = ${((100 * ideal) / compute).toFixed(0)} %; CPU used ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s of ${((2 * wall) / 1e3).toFixed(1)} s available on 2 cores; load average ${load()} at the end`,
  );
  const cpuS = (cpu.user + cpu.system) / 1e6;
  console.log(
    `   CPU per slew in the parallel run: ${((1e3 * cpuS) / SLEWS).toFixed(2)} ms → on 2 otherwise idle cores about ${(cpuS / 2 + (tReady - tStart) / 1e3).toFixed(1)} s for the ${SLEWS} slews (CPU / 2 + start-up)`,
  );
  console.log(
    `   single 600 s run / study slew (early stop): ${(singleMs / perSlew).toFixed(1)}×; ${(compute / SLEWS).toFixed(2)} ms wall per slew in the parallel run`,
  );
  const sm = r.value.summary;
  console.log(
    `   study outcome: ${sm.casesDone} cases; settled share per law: ${sm.controllers.map((x) => `${x.controllerId} ${(100 * x.shares.settled.share).toFixed(1)} %`).join(', ')}`,
  );
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) await benchStudy();
