/**
 * Campaign statistics speed figures (no assertions): the cost of adding one value to each
 * mergeable statistic (app/engine/math/stats.ts), and merging 1,000 shard files of a synthetic
 * 10⁶-case campaign (test/integration/campaign-fixture.ts: 5 controllers × 7 quantities with exact
 * moments and a histogram each, plus a settled count and a 20-case worst list per controller).
 * The shard files are generated first in a temporary folder (not timed as merging: that is the
 * cost of summarising the cases, printed separately); the merge — read each file from disk, parse
 * and check it, merge it into the running state, then write the report — runs in a fresh child
 * process five times, which prints its wall time, its peak heap (sampled after every file) and its
 * peak resident memory. The folder is removed at the end.
 * Run: node --import tsx test/bench/campaign.ts, or npm run bench -- campaign.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeRng } from '../../app/engine/math/prng';
import {
  exactMomentsAdd,
  exactMomentsEmpty,
  histogramAdd,
  histogramCreate,
  momentsAdd,
  momentsEmpty,
  topKAdd,
  topKCreate,
  uniformEdges,
} from '../../app/engine/math/stats';
import {
  campaignReport,
  campaignState,
  mergeStates,
  shardIndices,
  stateFromJson,
  stateToJson,
  type CampaignShape,
  type CampaignState,
} from '../integration/campaign-fixture';

const here = fileURLToPath(import.meta.url);
const repo = path.resolve(path.dirname(here), '../..');
const SHARDS = 1000;
const SHAPE: CampaignShape = { seed: 4242, cases: 1_000_000, controllers: 5, worst: 20 };
const RUNS = 5;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const mb = (bytes: number) => `${(bytes / 2 ** 20).toFixed(0)} MB`;

/** The merge, as the child process runs it. */
function mergeFolder(dir: string): { ms: number; peakHeap: number; maxRss: number; report: string } {
  const t0 = performance.now();
  let peakHeap = process.memoryUsage().heapUsed;
  let state: CampaignState | null = null;
  const files = readdirSync(dir)
    .filter((f) => f.endsWith('.json'))
    .sort();
  for (const f of files) {
    const s = stateFromJson(readFileSync(path.join(dir, f), 'utf8'));
    state = state ? mergeStates(state, s) : s;
    peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
  }
  const report = campaignReport(state!);
  writeFileSync(path.join(dir, 'report.out'), report);
  const ms = performance.now() - t0;
  return { ms, peakHeap, maxRss: process.resourceUsage().maxRSS * 1024, report };
}

function perValue(label: string, n: number, fn: (xs: number[]) => void, xs: number[]): void {
  const times: number[] = [];
  for (let k = 0; k < RUNS; k++) {
    const t = performance.now();
    fn(xs.slice(0, n));
    times.push(performance.now() - t);
  }
  const us = (ms: number) => `${((1e3 * ms) / n).toFixed(3)} µs`;
  console.log(`   ${label}: ${us(Math.min(...times))} min, ${us(median(times))} median per value (${n} values, ${RUNS} runs)`);
}

export async function benchCampaign(): Promise<void> {
  console.log(`   machine: ${os.cpus().length} cores, 1-min load average ${os.loadavg()[0]!.toFixed(1)} at start`);

  // 1. One value into each statistic (lognormal data spanning several decades).
  const rng = makeRng(1, 1);
  const xs = Array.from({ length: 200_000 }, () => 0.01 * Math.exp(2 * rng.normal()));
  perValue('ExactMoments add (exact Σx, Σx²)', 200_000, (v) => v.reduce(exactMomentsAdd, exactMomentsEmpty()), xs);
  perValue('Moments add (Welford, for comparison)', 200_000, (v) => v.reduce(momentsAdd, momentsEmpty()), xs);
  perValue(
    'Histogram add (20 bins, binary search)',
    200_000,
    (v) => {
      const h = histogramCreate(uniformEdges(0, 1, 20));
      if (h.ok) for (const x of v) histogramAdd(h.value, x);
    },
    xs,
  );
  perValue(
    'TopK add (k = 20)',
    200_000,
    (v) => {
      const t = topKCreate<null>(20);
      v.forEach((x, i) => topKAdd(t, { key: i, score: x, payload: null }));
    },
    xs,
  );

  // 2. The shard files.
  const dir = mkdtempSync(path.join(os.tmpdir(), 'slewsmith-campaign-bench-'));
  try {
    const tGen = performance.now();
    let bytes = 0;
    for (let i = 0; i < SHARDS; i++) {
      const text = stateToJson(campaignState(SHAPE, shardIndices(i, SHARDS, SHAPE.cases)));
      writeFileSync(path.join(dir, `shard-${String(i).padStart(4, '0')}.json`), text);
      bytes += text.length;
    }
    const genS = (performance.now() - tGen) / 1e3;
    console.log(
      `   generated ${SHARDS} shard files of a ${SHAPE.cases.toLocaleString('en')}-case campaign (${SHAPE.controllers} controllers × 7 quantities) in ${genS.toFixed(1)} s = ${((1e6 * genS) / SHAPE.cases).toFixed(1)} µs per case summarised; ${mb(bytes)} on disk (${(bytes / SHARDS / 1024).toFixed(1)} kB per file)`,
    );

    // 3. The merge, in fresh processes.
    const runs: { ms: number; peakHeap: number; maxRss: number }[] = [];
    for (let k = 0; k < RUNS; k++) {
      const out = execFileSync(process.execPath, ['--import', 'tsx', here, '--merge', dir], { encoding: 'utf8', cwd: repo });
      runs.push(JSON.parse(out.trim().split('\n').pop()!));
    }
    const ms = runs.map((r) => r.ms);
    console.log(
      `   merge ${SHARDS} shard files (read + parse + check + merge + report): ${(Math.min(...ms) / 1e3).toFixed(2)} s min, ${(median(ms) / 1e3).toFixed(2)} s median of ${RUNS} (goal ≤ 10 s; files in the page cache)`,
    );
    console.log(
      `   peak heap during the merge: ${mb(Math.max(...runs.map((r) => r.peakHeap)))} (goal ≤ 300 MB); peak resident memory of the merging process: ${mb(Math.max(...runs.map((r) => r.maxRss)))}`,
    );
    const report = readFileSync(path.join(dir, 'report.out'), 'utf8');
    const r = JSON.parse(report);
    console.log(
      `   merged report: ${r.cases.toLocaleString('en')} cases; settled share per controller ${r.controllers.map((c: { settled: { share: number } }) => `${(100 * c.settled.share).toFixed(2)} %`).join(', ')}; report ${(statSync(path.join(dir, 'report.out')).size / 1024).toFixed(0)} kB`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === '--merge') {
  const r = mergeFolder(process.argv[3]!);
  console.log(JSON.stringify({ ms: r.ms, peakHeap: r.peakHeap, maxRss: r.maxRss }));
} else if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) await benchCampaign();
