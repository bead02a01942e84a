/**
 * `slewsmith study merge DIR...` and `slewsmith study slurm SCENARIO --shards K --out DIR`.
 *
 * merge: combines shard files (folders are searched for *.slewsmith-shard) into cases.csv and
 * summary.json in --out (default: the first folder given), byte for byte what one process
 * running the whole study writes. Exit 0 merged, 2 unusable input (every refusal names the files).
 *
 * slurm: makes a campaign folder (app/engine/study/campaignFolder.ts: scenario, job-array and
 * merge scripts, submit.sh, README.txt); with --submit it also calls sbatch (array, then the
 * merge with afterok) and prints the job ids. Exit 0, 2 invalid input, 1 sbatch refused.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ParsedArgs } from './args';
import { printIssues, type CliIo } from './io';
import { makeCampaignFolders, writeCampaign } from './campaignWrite';
import { prepareOutputFolder } from './output';
import { findShardFiles, mergeShards } from './campaign';
import { arrayJobScript, mergeJobScript, type CampaignSlurmSpec } from './slurm';
import { makeStudyContext, type StudyOverrides } from '../../app/engine/study/context';
import { CAMPAIGN_SCENARIO, CAMPAIGN_SHARDS, campaignReadme } from '../../app/engine/study/campaignFolder';
import { numberOptions, STUDY_LIMITS } from './options';
import { shareCell } from './study';

const BIN = fileURLToPath(new URL('../../bin/slewsmith.mjs', import.meta.url));

export async function runStudyMerge(a: ParsedArgs, io: CliIo, tool: string): Promise<number> {
  const dirs = a.positional.slice(1);
  if (dirs.length === 0) {
    io.err('error: give the folders (or files) holding the shard files: slewsmith study merge DIR... [--out DIR]');
    return 2;
  }
  const found = await findShardFiles(dirs);
  if (!found.ok) {
    printIssues(io, 'nothing to merge', found.errors);
    return 2;
  }
  const outDir = a.values.out ?? dirs[0]!;
  const ready = await prepareOutputFolder(outDir, '--out');
  if (!ready.ok) {
    io.err(`error: ${ready.message}`);
    return 2;
  }
  const t0 = Date.now();
  const m = await mergeShards(found.value, outDir, tool);
  if (!m.ok) {
    const write = m.errors.some((e) => e.rule === 'write');
    printIssues(io, write ? 'the merge could not be written' : 'the shards cannot be merged', m.errors);
    return write ? 1 : 2;
  }
  const s = m.value.summary;
  io.err(
    `merged ${m.value.shards} shard${m.value.shards === 1 ? '' : 's'}: ${s.casesDone} cases in ${((Date.now() - t0) / 1000).toFixed(1)} s`,
  );
  for (const f of m.value.files) io.err(`wrote ${f}`);
  for (const c of s.controllers)
    io.out(
      `${c.label} [${c.controllerId}]: ${c.flyable} runs; settled ${shareCell(c.shares.settled)}, unwound ${shareCell(c.shares.unwound)}, chatter ${shareCell(c.shares.chattered)}`,
    );
  io.out('shares with their 95 % Wilson score interval; [≤x]: no event, rule-of-three upper bound 3/n');
  return 0;
}

function intOption(a: ParsedArgs, name: string, lo: number, hi: number, dflt: number | undefined, bad: string[]): number | undefined {
  const v = a.values[name];
  if (v === undefined) return dflt;
  const n = Number(v);
  if (!/^\d+$/.test(v.trim()) || !Number.isSafeInteger(n) || n < lo || n > hi) {
    bad.push(`--${name} must be a whole number from ${lo} to ${hi} (got "${v}")`);
    return undefined;
  }
  return n;
}

export async function runStudySlurm(json: unknown, a: ParsedArgs, io: CliIo): Promise<number> {
  const n = numberOptions(a.values, STUDY_LIMITS);
  const bad: string[] = n.ok ? [] : [...n.messages];
  const shards = intOption(a, 'shards', 1, 4_000_000, undefined, bad);
  const cpus = intOption(a, 'cpus-per-task', 1, 256, 1, bad);
  const mem = intOption(a, 'mem-mb', 64, 1 << 22, 1024, bad);
  const minutes = intOption(a, 'time-min', 1, 366 * 1440, 60, bad);
  if (shards === undefined && !bad.some((b) => b.startsWith('--shards'))) bad.push('--shards K is needed (the number of array tasks)');
  const outDir = a.values.out;
  if (outDir === undefined) bad.push('--out DIR is needed (the campaign folder)');
  if (bad.length || !n.ok || shards === undefined || outDir === undefined) {
    for (const b of bad) io.err(`error: ${b}`);
    return 2;
  }
  const overrides: StudyOverrides = {};
  if (n.values.runs !== undefined) overrides.runs = n.values.runs;
  if (n.values.seed !== undefined) overrides.seed = n.values.seed;
  if (a.lists.controller) overrides.controllers = a.lists.controller;
  const ctx = makeStudyContext(json, overrides);
  if (!ctx.ok) {
    printIssues(io, 'the study cannot run', ctx.errors);
    return 2;
  }
  const def = ctx.value.def;
  if (shards > def.runs) {
    io.err(`error: --shards ${shards} for ${def.runs} cases would leave shards empty; use at most ${def.runs}`);
    return 2;
  }
  const dir = path.resolve(outDir);
  const ready = await prepareOutputFolder(dir, '--out');
  if (!ready.ok) {
    io.err(`error: ${ready.message}`);
    return 2;
  }
  // The scenario as run: the overrides are written into its study block, so the shards need none.
  const scenario = { ...ctx.value.json, study: { ...(ctx.value.json.study as object), runs: def.runs, seed: def.seed } };
  const controllers = ctx.value.controllers.map((c) => c.id);
  (scenario.study as Record<string, unknown>).controllers = controllers;
  const node = process.execPath;
  const slug =
    ctx.value.prepared.scenario.name
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 40) || 'study';
  const spec: CampaignSlurmSpec = {
    jobName: `slewsmith-${slug}`.slice(0, 64),
    campaignDir: dir,
    shards,
    shard: {
      cpusPerTask: cpus!,
      memoryMB: mem!,
      timeLimitMin: minutes!,
      command: [node, BIN, 'study', CAMPAIGN_SCENARIO, '--shard', '{shard}/{shards}', '--out', CAMPAIGN_SHARDS, '--workers', String(cpus)],
    },
    merge: {
      cpusPerTask: 1,
      memoryMB: Math.max(mem!, 1024),
      timeLimitMin: minutes!,
      command: [node, BIN, 'study', 'merge', CAMPAIGN_SHARDS, '--out', '.'],
    },
  };
  if (a.values.partition) spec.partition = a.values.partition;
  if (a.values.account) spec.account = a.values.account;
  const arrayText = arrayJobScript(spec);
  const mergeText = mergeJobScript(spec, null);
  if (!arrayText.ok || !mergeText.ok) {
    printIssues(io, 'the job scripts cannot be written', [
      ...(arrayText.ok ? [] : arrayText.errors),
      ...(mergeText.ok ? [] : mergeText.errors),
    ]);
    return 2;
  }
  const readme = campaignReadme({
    scenarioName: ctx.value.prepared.scenario.name,
    seed: def.seed,
    runs: def.runs,
    controllers,
    shards,
    command: `${node} ${BIN}`,
    cpusPerTask: cpus!,
    memoryMB: mem!,
    timeLimitMin: minutes!,
  });
  if (!(await makeCampaignFolders(dir, io))) return 1;
  const texts = { scenario: JSON.stringify(scenario, null, 2) + '\n', readme, arrayScript: arrayText.value, mergeScript: mergeText.value };
  return writeCampaign(
    dir,
    texts,
    `campaign: ${def.runs} cases × ${controllers.length} controllers in ${shards} shards; per array task ${cpus} CPU, ${mem} MiB, ${minutes} min`,
    spec,
    a.flags.has('submit'),
    io,
  );
}
