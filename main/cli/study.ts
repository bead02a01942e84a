/**
 * `slewsmith study <scenario>`: the scenario's robustness study in worker threads.
 *
 * Progress (cases done, runs not settled, time left) goes to stderr; the summary table (or the
 * summary JSON with --json) to stdout; --out DIR writes cases.csv and summary.json. Ctrl-C stops
 * handing out cases, abandons the ones running, writes what is finished and exits with 130.
 * `--case N` writes case N as a normal scenario file instead (re-run it with fly/compare).
 * Exit codes: 0 done, 2 invalid input, 1 workers failed, 130 interrupted.
 */
import { Worker } from 'node:worker_threads';
import os from 'node:os';
import path from 'node:path';
import type { ParsedArgs } from './args';
import { printIssues, printWarnings, type CliIo } from './io';
import { table } from './format';
import { writeFileAtomicNode } from './fs';
import { numberOptions, STUDY_LIMITS } from './options';
import { prepareOutputFolder } from './output';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { StudyOverrides } from '../../app/engine/study/context';
import { createStudyWorker, startStudyParallel, type FromWorker, type StudyWorkerPort } from '../../app/engine/study/parallel';
import type { StudyProgress } from '../../app/engine/study/runner';
import type { ControllerSummary, StudyInfo, StudySummary } from '../../app/engine/study/summary';
import { summaryJson } from '../../app/engine/study/export';
import type { ShareReport } from '../../app/engine/math/stats';
import type { StudyAccumulator } from '../../app/engine/study/accumulate';
import { shardRange, shardSpecIssues } from '../../app/engine/study/shard';
import { fail, ok } from '../../app/engine/errors';
import { ShardStream, StudyTableStream, shardFileName } from './campaign';
import { CHATTER_THRESHOLD_PER_S } from '../../app/engine/study/runCase';
import { studyCaseScenario } from '../../app/engine/study/caseScenario';
import { DEG_PER_RAD } from '../../app/engine/units';
import { studyContextSeed, type StudyContextSeed } from '../../app/engine/study/contextSeed';

const WORKER_URL = new URL('./study-worker.mjs', import.meta.url);

/** What bin/study-prestart.mjs leaves: workers started from `url` before the CLI was loaded. */
interface Prestarted {
  url: string;
  workers: Worker[];
}
const PRESTARTED = Symbol.for('slewsmith.prestartedStudyWorkers');

/** A worker the launcher started from this CLI's own worker file, if one is left (ref'd again). */
function adoptPrestarted(): Worker | null {
  const p = (globalThis as Record<symbol, Prestarted | undefined>)[PRESTARTED];
  if (!p || p.url !== WORKER_URL.href) return null;
  const w = p.workers.shift() ?? null;
  w?.ref();
  return w;
}

/** End the launcher's workers that no study adopted (wrong count, one worker, an early error). */
export function endPrestartedWorkers(): void {
  const p = (globalThis as Record<symbol, Prestarted | undefined>)[PRESTARTED];
  if (!p) return;
  for (const w of p.workers.splice(0)) void w.terminate();
}

/** A worker thread as the coordinator's port (one the launcher started, else a new one). */
export function threadPort(): { port: StudyWorkerPort; worker: Worker } {
  const worker = adoptPrestarted() ?? new Worker(WORKER_URL);
  let dead = false;
  const port: StudyWorkerPort = {
    post: (msg) => {
      if (!dead) worker.postMessage(msg);
    },
    listen: (onMessage, onError) => {
      worker.on('message', (m: FromWorker) => onMessage(m));
      worker.on('error', (e) => {
        dead = true;
        onError(e.stack ?? String(e));
      });
      worker.on('exit', (code) => {
        dead = true;
        if (code !== 0) onError(`worker exited with code ${code}`);
      });
    },
  };
  return { port, worker };
}

/** The worker half on this thread: each message handled in its own macrotask (setImmediate). */
export function mainThreadPort(): { port: StudyWorkerPort; worker: null } {
  let onMsg: ((m: FromWorker) => void) | null = null;
  const handle = createStudyWorker((m) => onMsg?.(m));
  return {
    worker: null,
    port: {
      post: (m) => {
        if (m.type !== 'close') setImmediate(() => handle(m));
      },
      listen: (m) => {
        onMsg = m;
      },
    },
  };
}

const pct = (x: number) => `${(100 * x).toFixed(1)}%`;
const sec = (x: number | null, durationS: number) => (x === null ? `>${durationS}` : x.toFixed(1));
const frac = (x: number | null) => (x === null ? '-' : pct(x));
/** A share and its 95 % interval: "1.2% [0.6–2.4]" (Wilson score); at zero events "0.0% [≤3.0]" (rule of three). */
export function shareCell(r: ShareReport): string {
  if (r.of === 0) return '-';
  const p = (x: number) => (100 * x).toFixed(1);
  return r.ruleOfThreeHigh !== null ? `${pct(r.share)} [≤${p(r.ruleOfThreeHigh)}]` : `${pct(r.share)} [${p(r.low)}–${p(r.high)}]`;
}

/** One line per controller: the share of cases that violated an attitude constraint, with its 95 % interval. */
function constraintShareLines(s: StudySummary): string {
  const lines = s.controllers.flatMap((c) => {
    const v = c.constraintViolatedShare;
    return v
      ? [
          `  ${c.label} [${c.controllerId}]: ${c.constraintViolated} of ${c.flyable} (${pct(v.share)}, 95 % interval ${pct(v.low)} to ${pct(v.high)}, ${v.method})`,
        ]
      : [];
  });
  return lines.length ? `\n\nCases that violated an attitude constraint:\n${lines.join('\n')}` : '';
}

function studyTable(s: StudySummary): string {
  const rows = s.controllers.map((c: ControllerSummary) => [
    `${c.label} [${c.controllerId}]`,
    String(c.flyable),
    shareCell(c.shares.settled),
    shareCell(c.shares.unwound),
    shareCell(c.shares.longWay),
    shareCell(c.shares.chattered),
    sec(c.spreads.settleTimeS.median, s.durationS),
    sec(c.spreads.settleTimeS.p95, s.durationS),
    c.spreads.jumps.median === null ? '-' : String(c.spreads.jumps.median),
    c.spreads.chatterPerS.median === null ? '-' : c.spreads.chatterPerS.median.toFixed(2),
    frac(c.spreads.peakWheelMomentumFraction.p95),
    frac(c.spreads.peakWheelTorqueFraction.p95),
    c.worst.map((w) => String(w.index)).join(' '),
  ]);
  return table(
    [
      'controller',
      'runs',
      'settled',
      'unwound',
      'long way',
      'chatter',
      'settle med s',
      'settle p95 s',
      'jumps med',
      'chatter med /s',
      'peak h p95',
      'peak τ p95',
      'worst cases',
    ],
    rows,
  );
}

function describeStudy(info: StudyInfo, s: StudySummary): string {
  const d = info.def;
  const parts: string[] = [];
  const a = d.attitude;
  parts.push(
    a.mode === 'nominal'
      ? 'nominal start'
      : a.mode === 'uniform'
        ? 'start uniform over SO(3)'
        : a.mode === 'cone'
          ? `start within ${(a.maxAngleRad * DEG_PER_RAD).toFixed(1)}° of nominal`
          : a.mode === 'near-antipode'
            ? `pointed axis within ${(a.withinRad * DEG_PER_RAD).toFixed(1)}° of the antipode of its direction, uniform roll`
            : `start within ${(a.withinRad * DEG_PER_RAD).toFixed(1)}° of a 180° error, both hemispheres`,
  );
  if (d.rateSigmaRadPerS > 0) parts.push(`rate 1σ ${(d.rateSigmaRadPerS * DEG_PER_RAD).toPrecision(3)}°/s`);
  if (d.inertia.momentSigmaFraction > 0 || d.inertia.axisMisalignmentSigmaRad > 0)
    parts.push(
      `inertia 1σ ${pct(d.inertia.momentSigmaFraction)}, axes 1σ ${(d.inertia.axisMisalignmentSigmaRad * DEG_PER_RAD).toPrecision(3)}°`,
    );
  const w = d.wheels;
  if (w.torqueDegradationMax > 0 || w.momentumDegradationMax > 0)
    parts.push(`wheels lose up to ${pct(w.torqueDegradationMax)} torque, ${pct(w.momentumDegradationMax)} momentum`);
  if (w.failOneWheelProbability > 0) parts.push(`one wheel lost with p = ${w.failOneWheelProbability}`);
  const [lo, hi] = d.sensors.attitudeNoiseScale;
  if (lo !== 1 || hi !== 1) parts.push(`attitude noise ×[${lo}, ${hi}]`);
  if (d.sensors.rateBiasSigmaRadPerS > 0)
    parts.push(`extra rate bias 1σ ${(d.sensors.rateBiasSigmaRadPerS * DEG_PER_RAD).toPrecision(3)}°/s`);
  if (d.sensors.adversarialEta > 0) parts.push(`worst-case noise ē = ${d.sensors.adversarialEta}`);
  if ((d.sensors.antipodalNoiseRad ?? 0) > 0)
    parts.push(`worst-case pointing noise ${(d.sensors.antipodalNoiseRad! * DEG_PER_RAD).toPrecision(3)}° near the antipode`);
  if (d.controlRateHz) parts.push(`rate from {${d.controlRateHz.join(', ')}} Hz`);
  if (d.actuation) parts.push(`actuation from {${d.actuation.join(', ')}}`);
  const head = `Robustness study of "${info.scenarioName}": ${s.casesDone} of ${s.runsRequested} cases, seed ${s.seed}, ${s.mode} mode, ${s.durationS} s per case`;
  const extra = [`inertia samples redrawn: ${s.inertiaRejections}`, `unflyable cases: ${s.unflyableCases}`];
  return `${head}\nDispersions: ${parts.join('; ')}.\n${extra.join('; ')}.`;
}

function progressLine(p: StudyProgress): string {
  const left = p.remainingMs === null ? '' : `, ~${(p.remainingMs / 1000).toFixed(1)} s left`;
  return `study: ${p.done}/${p.total} cases (${((100 * p.done) / Math.max(1, p.total)).toFixed(0)}%), ${p.notSettled} run${p.notSettled === 1 ? '' : 's'} not settled, ${p.unflyable} unflyable, ${(p.elapsedMs / 1000).toFixed(1)} s${left}`;
}

/** `--shard i/K`: the two whole numbers, or a message. */
export function parseShardSpec(text: string): { index: number; count: number } | string {
  const m = /^(\d{1,9})\/(\d{1,9})$/.exec(text.trim());
  if (!m) return `--shard must be i/K, shard i (0 to K−1) of K (got "${text}")`;
  const index = Number(m[1]),
    count = Number(m[2]);
  if (count < 1) return `--shard ${text}: K must be at least 1`;
  if (index >= count) return `--shard ${text}: the shard index must be below the shard count (0 to ${count - 1})`;
  return { index, count };
}

export async function runStudyCli(json: unknown, a: ParsedArgs, io: CliIo, tool = 'Slewsmith'): Promise<number> {
  const n = numberOptions(a.values, STUDY_LIMITS);
  if (!n.ok) {
    for (const b of n.messages) io.err(`error: ${b}`);
    return 2;
  }
  const { runs, seed, workers: workersAsked } = n.values;
  const cores = typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length;
  const overrides: StudyOverrides = {};
  if (runs !== undefined) overrides.runs = runs;
  if (seed !== undefined) overrides.seed = seed;
  if (a.lists.controller) overrides.controllers = a.lists.controller;
  // Make and probe the output folder before any work: a bad --out fails at once.
  const outDir = a.values.out;
  if (outDir !== undefined) {
    const ready = await prepareOutputFolder(outDir, '--out');
    if (!ready.ok) {
      io.err(`error: ${ready.message}`);
      return 2;
    }
  }
  if (n.values.case !== undefined) return writeCase(json, overrides, n.values.case, outDir, io);
  const shardText = a.values.shard;
  const shard = shardText === undefined ? null : parseShardSpec(shardText);
  if (typeof shard === 'string') {
    io.err(`error: ${shard}`);
    return 2;
  }
  if (shard && outDir === undefined) {
    io.err('error: --shard needs --out DIR (the folder the shard file is written to)');
    return 2;
  }
  if (shard && a.flags.has('json')) {
    io.err('error: --shard writes a shard file, not a summary: leave out --json (merge the shards for the summary)');
    return 2;
  }
  // The table (or the shard file) is written while the study runs, case by case.
  const out: { table: StudyTableStream | null; shard: ShardStream | null } = { table: null, shard: null };

  // Never more workers than cases (the file's runs are known only after validation: cap later).
  const nWorkers = Math.max(1, Math.min(workersAsked ?? cores, runs ?? Infinity));
  // One worker: run the cases on this thread (the engine is loaded here already; a worker thread
  // would load it again, the largest part of a shard's start-up), yielding between chunks so that
  // progress and Ctrl-C are still handled.
  const threads = nWorkers === 1 ? [mainThreadPort()] : Array.from({ length: nWorkers }, () => threadPort());
  endPrestartedWorkers();
  // With worker threads: build the study's context (its certificates) once here while they start,
  // and hand the certificates to them instead of each computing them again.
  const contextSeed: StudyContextSeed | undefined = nWorkers === 1 ? undefined : studyContextSeed(json, overrides);
  const cancelFlag = new SharedArrayBuffer(4);
  let lastPrint = 0;
  const study = startStudyParallel(
    json,
    threads.map((t) => t.port),
    {
      overrides,
      cancelFlag,
      keepRecords: false,
      ...(contextSeed ? { contextSeed } : {}),
      cases: (i) => {
        if (!shard) return ok({ first: 0, end: i.def.runs });
        const bad = shardSpecIssues(shard.index, shard.count, i.def.runs);
        return bad.length ? fail(bad) : ok(shardRange(shard.index, shard.count, i.def.runs));
      },
      onReady: (i, warnings) => {
        printWarnings(io, warnings);
        if (shard && outDir) {
          out.shard = new ShardStream(path.join(outDir, shardFileName(shard.index, shard.count)), i, tool, shard.index, shard.count);
          const c = out.shard.header.cases;
          io.err(
            `study: shard ${shard.index} of ${shard.count}: cases ${c.first}–${c.end - 1} of ${i.def.runs} × ${i.controllers.length} controllers on ${nWorkers} worker thread${nWorkers === 1 ? '' : 's'}`,
          );
          return;
        }
        if (outDir) out.table = new StudyTableStream(path.join(outDir, 'cases.csv'), i);
        io.err(`study: ${i.def.runs} cases × ${i.controllers.length} controllers on ${nWorkers} worker thread${nWorkers === 1 ? '' : 's'}`);
      },
      onCase: (rec) => (out.shard ?? out.table)?.add(rec),
      onProgress: (p) => {
        const now = Date.now();
        if (now - lastPrint >= 1000 || p.done === p.total) {
          lastPrint = now;
          io.err(progressLine(p));
        }
      },
    },
  );
  let interrupted = false;
  const onSigint = () => {
    if (interrupted) return;
    interrupted = true;
    io.err('study: interrupted — finishing up and writing the cases done so far (Ctrl-C again to abort without writing)');
    process.once('SIGINT', () => process.exit(130));
    study.cancel();
  };
  process.once('SIGINT', onSigint);
  let r;
  try {
    r = await study.result;
  } finally {
    process.removeListener('SIGINT', onSigint);
    await Promise.all(threads.map((t) => t.worker?.terminate()));
  }
  if (!r.ok) {
    await (out.shard ?? out.table)?.abort();
    const invalid = !r.errors.some((e) => e.path === 'workers');
    printIssues(io, invalid ? 'the study cannot run' : 'the study failed', r.errors);
    return invalid ? 2 : 1;
  }
  const o = r.value;
  for (const w of o.warnings) if (w.path === 'workers') io.err(`warning: ${w.message}`);
  if (out.shard) return finishShard(out.shard, o.accumulator, o.cancelled || interrupted, io);

  if (a.flags.has('json')) io.out(summaryJson(o.info, o.summary, o.map).trimEnd());
  else {
    io.out(`${describeStudy(o.info, o.summary)}\n\n${studyTable(o.summary)}${constraintShareLines(o.summary)}\n`);
    io.out(
      `settled: within the scenario's settle thresholds until the end of the case (early stop after ${o.info.def.stopAfterSettledForS} s settled); unwound: driven to the far quaternion lift or an extra full turn; long way: ended on the far lift (through the 180° attitude, any law); chatter: ≥ ${CHATTER_THRESHOLD_PER_S} logic jumps or torque reversals per second in the busiest 10 s; peak h / τ: 95th percentile of the peak wheel momentum / torque fraction; worst cases: case indices, worst first (write one as a scenario with --case INDEX).`,
    );
    io.out(`\n${CAUTION_TEXT}`);
  }
  if (outDir) {
    if (out.table) {
      const t = await out.table.close(o.summary);
      if (!t.ok) {
        io.err(`error: ${t.errors[0]!.message}`);
        return 1;
      }
      io.err(`wrote ${path.join(outDir, 'cases.csv')}`);
    }
    const files: [string, string][] = [[path.join(outDir, 'summary.json'), summaryJson(o.info, o.summary, o.map)]];
    for (const [file, text] of files) {
      const w = await writeFileAtomicNode(file, text);
      if (!w.ok) {
        io.err(`error: could not write ${file}: ${w.message}`);
        return 1;
      }
      io.err(`wrote ${file}`);
    }
  }
  if (o.cancelled || interrupted) {
    io.err(`study: stopped early; ${o.summary.casesDone} of ${o.summary.runsRequested} cases finished${outDir ? ' and written' : ''}`);
    return 130;
  }
  return 0;
}

/** A shard that ran every case gets its trailer; one stopped early leaves no file (run it again). */
async function finishShard(out: ShardStream, state: StudyAccumulator, stopped: boolean, io: CliIo): Promise<number> {
  if (stopped) {
    await out.abort();
    io.err(`study: shard stopped early; no shard file written (run it again: a shard is all or nothing)`);
    return 130;
  }
  const w = await out.close(state);
  if (!w.ok) {
    io.err(`error: ${w.errors[0]!.message}`);
    return 1;
  }
  io.err(`wrote ${out.file} (${out.rows} rows)`);
  return 0;
}

/** `--case N`: one case as a normal scenario file. */
async function writeCase(json: unknown, overrides: StudyOverrides, index: number, outDir: string | undefined, io: CliIo): Promise<number> {
  const r = studyCaseScenario(json, overrides, index);
  if (!r.ok) {
    printIssues(io, `case ${index} cannot be written`, r.errors);
    return 2;
  }
  const text = JSON.stringify(r.value, null, 2) + '\n';
  if (!outDir) {
    io.out(text.trimEnd());
    return 0;
  }
  const file = path.join(outDir, `study-case-${index}.scenario.json`);
  const w = await writeFileAtomicNode(file, text);
  if (!w.ok) {
    io.err(`error: could not write ${file}: ${w.message}`);
    return 1;
  }
  io.err(`wrote ${file} (run it with: slewsmith compare ${file})`);
  return 0;
}
