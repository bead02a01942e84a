/**
 * What the integration test's Slurm jobs run (through campaign-task.mjs):
 *   shard I/K --cases N --seed S --out DIR   write DIR/shard-I.json: the shard's cases summarised
 *   merge --shards K --dir DIR --out FILE    merge DIR/shard-0…K−1.json in index order, write the
 *                                            report to FILE and the merged state to FILE.state
 * The summaries are the synthetic campaign of campaign-fixture.ts (mergeable statistics of
 * app/engine/math/stats.ts). Files are written to a temporary name and renamed into place.
 */
import { readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import {
  campaignReport,
  campaignState,
  mergeStates,
  shardIndices,
  stateFromJson,
  stateToJson,
  type CampaignState,
} from '../campaign-fixture';

function option(args: string[], name: string): string {
  const i = args.indexOf(`--${name}`);
  const v = i >= 0 ? args[i + 1] : undefined;
  if (v === undefined) throw new Error(`missing --${name}`);
  return v;
}

function writeAtomic(file: string, text: string): void {
  const tmp = `${file}.tmp-${process.pid}`;
  writeFileSync(tmp, text);
  renameSync(tmp, file);
}

const [cmd, ...args] = process.argv.slice(2);
if (cmd === 'shard') {
  const m = /^(\d+)\/(\d+)$/.exec(args[0] ?? '');
  if (!m) throw new Error(`shard wants I/K (got ${args[0]})`);
  const [i, k] = [Number(m[1]), Number(m[2])];
  const shape = { seed: Number(option(args, 'seed')), cases: Number(option(args, 'cases')), controllers: 1, worst: 10 };
  const state = campaignState(shape, shardIndices(i, k, shape.cases));
  writeAtomic(path.join(option(args, 'out'), `shard-${i}.json`), stateToJson(state));
  console.log(
    `shard ${i}/${k}: ${state.casesDone} cases on ${process.env.SLURMD_NODENAME ?? '?'} (task ${process.env.SLURM_ARRAY_TASK_ID ?? '?'})`,
  );
} else if (cmd === 'merge') {
  const k = Number(option(args, 'shards'));
  const dir = option(args, 'dir');
  let state: CampaignState | null = null;
  for (let i = 0; i < k; i++) {
    const s = stateFromJson(readFileSync(path.join(dir, `shard-${i}.json`), 'utf8'));
    state = state ? mergeStates(state, s) : s;
  }
  writeAtomic(option(args, 'out'), campaignReport(state!));
  writeAtomic(`${option(args, 'out')}.state`, stateToJson(state!));
  console.log(`merged ${k} shards: ${state!.casesDone} cases`);
} else {
  console.error('usage: campaign-task shard I/K --cases N --seed S --out DIR | merge --shards K --dir DIR --out FILE');
  process.exitCode = 2;
}
