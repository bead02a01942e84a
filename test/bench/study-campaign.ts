/**
 * Study campaign speed figures (no assertions), in the real shard format (app/engine/study/shard.ts):
 * 1. Merging 1,000 shard files of a 10⁶-case campaign (one controller): synthetic cases (drawn
 *    from a seeded generator, not flown) are written as shard files by the CLI's ShardStream —
 *    header, one cases.csv row per case, trailer with the mergeable state — then
 *    `mergeShards` (what `slewsmith study merge` runs) reads every header and trailer, checks and
 *    merges the states and streams the rows into cases.csv, in a fresh child process that prints
 *    its wall time, peak heap (sampled every 50 ms) and peak resident memory. Goals: ≤ 10 s, ≤ 300 MB.
 * 2. Per-shard overhead: `slewsmith study <example> --shard i/K` with one case per shard, start to
 *    exit (the process start, the TypeScript loader, the worker thread and one case). Goal ≤ 0.5 s.
 * Min and median of a few runs each. Run: node --import tsx test/bench/study-campaign.ts.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeRng } from '../../app/engine/math/prng';
import { makeStudyContext } from '../../app/engine/study/context';
import { studyInfo } from '../../app/engine/study/runner';
import type { CaseRecord, CaseStatus } from '../../app/engine/study/runCase';
import type { StudyInfo } from '../../app/engine/study/summary';
import { accumulateCase, createStudyAccumulator } from '../../app/engine/study/accumulate';
import { shardFileName, shardRange } from '../../app/engine/study/shard';
import { ShardStream, mergeShards } from '../../main/cli/campaign';

const here = fileURLToPath(import.meta.url);
const repo = path.resolve(path.dirname(here), '../..');
const EXAMPLE = path.join(repo, 'assets/tern12-reversal.scenario.json');
const BIN = path.join(repo, 'bin/slewsmith.mjs');
const TOOL = 'Slewsmith 0.1.0';
const CASES = 1_000_000;
const SHARDS = 1000;
const MERGE_RUNS = 3;
const OVERHEAD_RUNS = 5;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const mb = (bytes: number) => `${(bytes / 2 ** 20).toFixed(0)} MB`;

function info(): StudyInfo {
  const json = JSON.parse(readFileSync(EXAMPLE, 'utf8')) as unknown;
  const c = makeStudyContext(json, { runs: CASES, controllers: ['pd'] });
  if (!c.ok) throw new Error(c.errors.map((e) => e.message).join('; '));
  return studyInfo(c.value);
}

/** A made-up case (plausible values, seeded by its index): what the merge reads, not a flight. */
function syntheticCase(index: number): CaseRecord {
  const r = makeRng(7, index);
  const u = () => r.next();
  const angle = Math.PI * u();
  const status: CaseStatus = u() < 0.97 ? 'settled' : u() < 0.8 ? 'unsettled' : 'failed';
  const settle = 20 + 200 * u();
  const shortest = (angle * 180) / Math.PI;
  const extra = u() < 0.02 ? 360 * u() : 0;
  return {
    draw: {
      index,
      q0: [0.1 * u(), 0.2 * u(), 0.3 * u(), 0.9],
      omega0RadPerS: [1e-3 * u(), 1e-3 * u(), 1e-3 * u()],
      inertiaRows: null,
      inertiaRejections: u() < 0.01 ? 1 : 0,
      wheelTorqueFactor: [1, 1, 1],
      wheelMomentumFactor: [1, 1, 1],
      failedWheel: -1,
      attitudeNoiseRad: 5e-5 * u(),
      rateBiasRadPerS: [0, 0, 0],
      adversarialEta: 0,
      controlRateHz: 10,
      actuation: 'hold',
      noiseSeed: Math.floor(2 ** 31 * u()),
      errorAxis: [0.6, 0.8, 0],
      errorAngleRad: angle,
      errorEta: Math.cos(angle / 2),
    },
    runs: [
      {
        controllerId: 'pd',
        status,
        reason: status === 'failed' ? 'synthetic failure' : '',
        settleTimeS: status === 'settled' ? settle : null,
        rotationTravelledDeg: shortest + extra,
        shortestRotationDeg: shortest,
        extraRotationDeg: extra,
        unwound: extra > 0,
        longWay: extra > 180,
        jumps: Math.floor(3 * u()),
        chatterPerS: 0.3 * u(),
        chattered: false,
        peakWheelTorqueFraction: u(),
        peakWheelMomentumFraction: u(),
        finalErrorDeg: status === 'settled' ? 0.05 * u() : 10 * u(),
        finalEta: 1,
        endS: 600,
        errorTraceDeg: new Float32Array(0),
        traceCount: 0,
      },
    ],
  };
}

async function writeShards(dir: string, i: StudyInfo): Promise<void> {
  for (let k = 0; k < SHARDS; k++) {
    const s = new ShardStream(path.join(dir, shardFileName(k, SHARDS)), i, TOOL, k, SHARDS);
    const acc = createStudyAccumulator(i);
    const { first, end } = shardRange(k, SHARDS, CASES);
    for (let c = first; c < end; c++) {
      const rec = syntheticCase(c);
      accumulateCase(acc, rec);
      s.add(rec);
    }
    const w = await s.close(acc);
    if (!w.ok) throw new Error(w.errors[0]!.message);
  }
}

/** The merge, in this (child) process. */
async function mergeHere(dir: string, out: string): Promise<void> {
  let peakHeap = process.memoryUsage().heapUsed;
  const timer = setInterval(() => (peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed)), 50);
  const files = readdirSync(dir)
    .filter((f) => f.endsWith('.slewsmith-shard'))
    .map((f) => path.join(dir, f));
  const t0 = performance.now();
  const r = await mergeShards(files, out, TOOL);
  const ms = performance.now() - t0;
  clearInterval(timer);
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('\n'));
  peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
  console.log(JSON.stringify({ ms, peakHeap, maxRss: process.resourceUsage().maxRSS * 1024, cases: r.value.summary.casesDone }));
}

export async function benchStudyCampaign(): Promise<void> {
  console.log(`   machine: ${os.cpus().length} cores, 1-min load average ${os.loadavg()[0]!.toFixed(1)} at start`);
  const dir = mkdtempSync(path.join(os.tmpdir(), 'slewsmith-study-campaign-bench-'));
  try {
    const shardDir = path.join(dir, 'shards');
    const outDir = path.join(dir, 'merged');
    execFileSync('mkdir', ['-p', shardDir, outDir]);
    const tGen = performance.now();
    await writeShards(shardDir, info());
    const bytes = readdirSync(shardDir).reduce((s, f) => s + statSync(path.join(shardDir, f)).size, 0);
    console.log(
      `   wrote ${SHARDS} shard files of a ${CASES.toLocaleString('en')}-case synthetic campaign (1 controller) in ${((performance.now() - tGen) / 1e3).toFixed(1)} s; ${mb(bytes)} on disk`,
    );
    const runs: { ms: number; peakHeap: number; maxRss: number; cases: number }[] = [];
    for (let k = 0; k < MERGE_RUNS; k++) {
      const out = execFileSync(process.execPath, ['--import', 'tsx', here, '--merge', shardDir, outDir], { encoding: 'utf8', cwd: repo });
      runs.push(JSON.parse(out.trim().split('\n').pop()!));
    }
    const ms = runs.map((r) => r.ms);
    console.log(
      `   study merge of ${SHARDS} shard files (${runs[0]!.cases.toLocaleString('en')} cases; headers, trailers, checks, state merge, cases.csv streamed, summary.json): ${(Math.min(...ms) / 1e3).toFixed(2)} s min, ${(median(ms) / 1e3).toFixed(2)} s median of ${MERGE_RUNS} (goal ≤ 10 s)`,
    );
    console.log(
      `   peak heap ${mb(Math.max(...runs.map((r) => r.peakHeap)))}, peak resident memory ${mb(Math.max(...runs.map((r) => r.maxRss)))} of the merging process (goal ≤ 300 MB); cases.csv ${mb(statSync(path.join(outDir, 'cases.csv')).size)}`,
    );

    // Per-shard overhead: one case per shard, start to exit.
    const times: number[] = [];
    for (let k = 0; k < OVERHEAD_RUNS; k++) {
      const t = performance.now();
      execFileSync(
        process.execPath,
        [
          BIN,
          'study',
          EXAMPLE,
          '--runs',
          '1000',
          '--controller',
          'pd',
          '--shard',
          `${k}/1000`,
          '--workers',
          '1',
          '--out',
          path.join(dir, 'one'),
        ],
        { cwd: repo, stdio: 'ignore' },
      );
      times.push(performance.now() - t);
    }
    console.log(
      `   one shard of one case, process start to exit (start-up + 1 case + shard file): ${(Math.min(...times) / 1e3).toFixed(2)} s min, ${(median(times) / 1e3).toFixed(2)} s median of ${OVERHEAD_RUNS} (goal ≤ 0.5 s)`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === '--merge') await mergeHere(process.argv[3]!, process.argv[4]!);
else if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) await benchStudyCampaign();
