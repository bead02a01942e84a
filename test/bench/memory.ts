/**
 * Day-long runs and memory (printed, never asserted): the demo (Lumen-6, 10 Hz sampled control)
 * stretched to 24 h of simulated time with its tail, flown through runPipeline in a fresh child
 * process per case so that each peak resident set (process.resourceUsage().maxRSS) is its own:
 *  - one controller in two modes, and three controllers in one mode,
 *  - three controllers × two modes (issue 12's figure),
 * with the trace memory per sample at full rate (pipeline/budget.ts traceBytesPerSample), the bytes
 * each run keeps (a day-long run keeps a display trace, pipeline/displayTrace.ts: measured from its
 * arrays, and the budget's estimate beside it) and the wall time. A pass holds one full trace in
 * flight plus the display traces. Before display traces (commit c114375, same machine, shared):
 * 1 × 2 peaked at 743 MB, 3 × 1 at 1033 MB, and 3 × 2 was refused by the budget (1.82 GB of traces).
 * Goal (issue 12): 24 h at 10 Hz, three controllers × two modes, peak ≤ 500 MB.
 *
 * Run: `node --import tsx test/bench/memory.ts` or `npm run bench memory`.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = path.dirname(fileURLToPath(import.meta.url));
const DAY_S = 86_400;

/** Child: fly the 24 h demo with the given controllers and modes; print one JSON line. */
async function child(controllers: string[], modes: string[]): Promise<void> {
  const { runPipeline } = await import('../../app/engine/pipeline/run');
  const { traceBytesPerSample, estimateBudget } = await import('../../app/engine/pipeline/budget');
  const { preparePipeline } = await import('../../app/engine/pipeline/run');
  const { TRACE_CHANNELS } = await import('../../app/engine/sim/trace');
  const json = JSON.parse(readFileSync(path.join(here, '../../assets/lumen6-imaging.scenario.json'), 'utf8'));
  json.simulation.durationS = DAY_S;
  const t0 = performance.now();
  const r = runPipeline(json, { controllers, modes: modes as never });
  const ms = performance.now() - t0;
  const rssMB = process.resourceUsage().maxRSS / 1024;
  if (!r.ok) {
    console.log(JSON.stringify({ refused: r.errors.map((e) => e.message).join(' | '), rssMB, ms }));
    return;
  }
  const runs = r.value.runs;
  const samples = runs.reduce((s, x) => s + (x.display?.fullSamples ?? x.trace.n), 0);
  const kept = runs.reduce((s, x) => s + x.trace.n, 0);
  const tr = runs[0]!.trace;
  let keptBytes = tr.j.byteLength + tr.segment.byteLength;
  for (const c of TRACE_CHANNELS) keptBytes += tr[c].byteLength;
  const p = preparePipeline(json, controllers);
  const e = p.ok ? estimateBudget(p.value.scenario, p.value.plan, controllers.length, modes as never) : null;
  console.log(
    JSON.stringify({
      samples,
      kept,
      kinds: [...new Set(runs.map((x) => x.traceKind ?? 'full'))].join('/'),
      runs: runs.length,
      bytesPerSample: traceBytesPerSample(tr.nWheels),
      keptBytesPerRun: keptBytes,
      estKeptBytesPerRun: e?.keptBytesPerRun,
      estTraceBytes: e?.traceBytes,
      rssMB,
      ms,
    }),
  );
}

export async function benchMemory(): Promise<void> {
  const cases: [string, string[], string[]][] = [
    ['1 controller × 2 modes', ['hysteretic'], ['follow-plan', 'step-target']],
    ['3 controllers × 1 mode', ['pd', 'hysteretic', 'synergistic'], ['follow-plan']],
    ['3 controllers × 2 modes', ['pd', 'hysteretic', 'synergistic'], ['follow-plan', 'step-target']],
  ];
  for (const [name, ctl, modes] of cases) {
    const res = spawnSync(
      process.execPath,
      ['--import', 'tsx', fileURLToPath(import.meta.url), '--child', ctl.join(','), modes.join(',')],
      {
        encoding: 'utf8',
        cwd: path.join(here, '../..'),
      },
    );
    const line = res.stdout.trim().split('\n').pop() ?? '';
    let v: Record<string, any>;
    try {
      v = JSON.parse(line);
    } catch {
      console.log(`   24 h, ${name}: child failed (${(res.stderr || line).trim().split('\n').pop()})`);
      continue;
    }
    const peak = `peak RSS ${v.rssMB.toFixed(0)} MB`;
    if (v.refused) console.log(`   24 h at 10 Hz, ${name}: refused by the resource budget before flying (${peak}): ${v.refused}`);
    else
      console.log(
        `   24 h at 10 Hz, ${name}: ${v.runs} runs, ${v.samples} samples flown at ${v.bytesPerSample} B of trace per sample, ` +
          `${v.kept} kept (${v.kinds} traces; ${(v.keptBytesPerRun / 1e6).toFixed(2)} MB kept by the first run, budget estimate ` +
          `${(v.estKeptBytesPerRun / 1e6).toFixed(2)} MB per run, ${(v.estTraceBytes / 1e6).toFixed(0)} MB at the peak of the pass), ` +
          `${peak}, ${(v.ms / 1000).toFixed(1)} s${name === '3 controllers × 2 modes' ? ' (goal ≤ 500 MB)' : ''}`,
      );
  }
  console.log('   goal (issue 12): 24 h at 10 Hz, three controllers × two modes, peak ≤ 500 MB');
}

if (import.meta.url === pathToFileURL(process.argv[1]!).href) {
  const i = process.argv.indexOf('--child');
  if (i > 0) await child(process.argv[i + 1]!.split(','), process.argv[i + 2]!.split(','));
  else await benchMemory();
}
