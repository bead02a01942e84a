/**
 * `slewsmith sweep slurm <scenario> --param … --runs N --shards K --out DIR`: a campaign folder for
 * a robustness sweep on a Slurm cluster, the sweep counterpart of `study slurm`
 * (study-campaign.ts). Array task i runs `sweep scenario.json … --shard i/K --out shards` (the
 * contiguous cell range of app/engine/study/sweepShard.ts); the merge job, after every task has
 * succeeded, runs `sweep merge shards --out .`, which writes cells.csv and sweep.json byte for byte
 * as one process running the whole sweep with the same options.
 *
 * Folder: scenario.json (the file's text as given), shards/, logs/, slurm/shards.sbatch,
 * slurm/merge.sbatch, slurm/submit.sh, README.txt. The sweep options the user gave (grid, runs,
 * seed, level, controllers) are passed on to every task as given, so the shards define the same
 * sweep as the one-process run. With --submit, sbatch is called (array, then the merge with
 * afterok) and the job ids printed. Exit 0, 2 invalid input (naming the option), 1 a failed write
 * or a refused sbatch.
 */
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ParsedArgs } from './args';
import { printIssues, printWarnings, type CliIo } from './io';
import { makeCampaignFolders, writeCampaign } from './campaignWrite';
import { prepareOutputFolder } from './output';
import { arrayJobScript, mergeJobScript, shellQuote, type CampaignSlurmSpec } from './slurm';
import { sweepDefinitionOf, sweepOptionParts } from './sweep';
import { CAUTION_TEXT } from '../../app/engine/caution';
import { cellCount } from '../../app/engine/study/sweep';
import { sweepInfo } from '../../app/engine/study/sweepRun';
import { sweepShardCells, SWEEP_SHARD_EXTENSION } from '../../app/engine/study/sweepShard';
import { CAMPAIGN_SCENARIO, CAMPAIGN_SHARDS } from '../../app/engine/study/campaignFolder';

const BIN = fileURLToPath(new URL('../../bin/slewsmith.mjs', import.meta.url));

/** Whole-number options of the campaign writer: [name, lowest, highest, default] (the same ranges as `study slurm`). */
const RESOURCE_OPTIONS = [
  ['shards', 1, 4_000_000, undefined],
  ['cpus-per-task', 1, 256, 1],
  ['mem-mb', 64, 1 << 22, 1024],
  ['time-min', 1, 366 * 1440, 60],
] as const;

/** Letters, digits, ".", "_", "-": what the scripts write unquoted in #SBATCH lines. */
const SLURM_NAME = /^[A-Za-z0-9._-]{1,64}$/;

/** The sweep options a task is given, as the user gave them (the merge checks that every shard has the same sweep). */
export function sweepTaskArgs(a: ParsedArgs): string[] {
  const out: string[] = [];
  for (const name of ['param', 'param2', 'runs', 'seed', 'level'] as const) {
    const v = a.values[name];
    if (v !== undefined) out.push(`--${name}`, v);
  }
  if (a.lists.controller) out.push('--controller', a.lists.controller.join(','));
  return out;
}

export interface SweepCampaignText {
  scenarioName: string;
  cells: number;
  runs: number;
  seed: number;
  controllers: string[];
  grid: string;
  shards: number;
  /** Cells per shard: the smallest and the largest shard. */
  cellsPerShard: [number, number];
  /** The shard command with `i` for the shard index, quoted for a shell. */
  shardCommand: string;
  mergeCommand: string;
  cpusPerTask: number;
  memoryMB: number;
  timeLimitMin: number;
}

/** README.txt of a sweep campaign folder. */
export function sweepCampaignReadme(d: SweepCampaignText): string {
  const k = d.shards;
  const [lo, hi] = d.cellsPerShard;
  return [
    `Slewsmith campaign: robustness sweep of "${d.scenarioName}"`,
    '',
    `${d.cells} grid cells (${d.grid}) × ${d.runs} cases per cell (seed ${d.seed}) × ${d.controllers.length} controllers (${d.controllers.join(', ')}),`,
    `in ${k} shards of ${lo === hi ? lo : `${lo} to ${hi}`} cells (shard i holds a contiguous range of cells).`,
    "A cell depends only on the scenario, the sweep and the cell's index, so the merged cells.csv and",
    'sweep.json are the same, byte for byte, as one machine running the whole sweep with the same options.',
    '',
    `CAUTION: ${CAUTION_TEXT}`,
    '',
    'Files',
    `  ${CAMPAIGN_SCENARIO}            the scenario as given`,
    `  ${CAMPAIGN_SHARDS}/                  one sweep shard file per shard, written by the array tasks`,
    '  logs/                    scheduler output',
    '  slurm/shards.sbatch      Slurm job array: task i runs shard i (SLURM_ARRAY_TASK_ID)',
    '  slurm/merge.sbatch       Slurm merge job, to run once every shard has succeeded',
    '  slurm/submit.sh          submits both, the merge with --dependency=afterok on the array',
    '  cells.csv, sweep.json    the merged results (after the merge)',
    '',
    `Resources per array task: ${d.cpusPerTask} CPU${d.cpusPerTask === 1 ? '' : 's'}, ${d.memoryMB} MiB, ${d.timeLimitMin} min (edit the #SBATCH lines to suit the site).`,
    '',
    'On Slurm (from this folder):',
    '  bash slurm/submit.sh',
    '  squeue --me                      # watch the array and the merge',
    '',
    `On any other array scheduler or a shell loop: run, for every i from 0 to ${k - 1}, with this folder as working directory,`,
    `  ${d.shardCommand}`,
    'then once all have finished:',
    `  ${d.mergeCommand}`,
    'A shard that failed or was stopped leaves no file: run it again (it writes the same bytes). The merge',
    'refuses shards of another scenario, sweep or program version, duplicates, and names the missing shards and cells.',
    '',
  ].join('\n');
}

export async function runSweepSlurm(doc: { json: unknown; text: string }, a: ParsedArgs, io: CliIo): Promise<number> {
  const parts = sweepOptionParts(a);
  const bad = [...parts.messages];
  const res: Record<string, number | undefined> = {};
  for (const [name, lo, hi, dflt] of RESOURCE_OPTIONS) {
    const v = a.values[name];
    if (v === undefined) res[name] = dflt;
    else if (!/^\d+$/.test(v.trim()) || !Number.isSafeInteger(Number(v)) || Number(v) < lo || Number(v) > hi)
      bad.push(`--${name} must be a whole number from ${lo} to ${hi} (got "${v}")`);
    else res[name] = Number(v);
  }
  if (a.values.shards === undefined) bad.push('--shards K is needed (the number of array tasks)');
  if (a.values.out === undefined) bad.push('--out DIR is needed (the campaign folder)');
  if (a.values.shard !== undefined)
    bad.push('--shard is set by the campaign for each array task; give the number of tasks with --shards K');
  if (a.values.workers !== undefined) bad.push('--workers: each array task runs --cpus-per-task worker threads; set that instead');
  for (const name of ['partition', 'account'] as const) {
    const v = a.values[name];
    if (v !== undefined && !SLURM_NAME.test(v)) bad.push(`--${name} must be 1–64 letters, digits, ".", "_" or "-" (got "${v}")`);
  }
  if (bad.length) {
    for (const b of bad) io.err(`error: ${b}`);
    return 2;
  }
  const d = sweepDefinitionOf(a, parts);
  if (!d.ok) {
    for (const m of d.messages) io.err(`error: ${m}`);
    return 2;
  }
  const def = d.def;
  const inf = sweepInfo(doc.json, def);
  if (!inf.ok) {
    const named = inf.errors.map((e) => (e.path.startsWith('study.controllers') ? { ...e, message: `--controller: ${e.message}` } : e));
    printIssues(io, 'the sweep cannot run', named);
    return 2;
  }
  printWarnings(io, inf.warnings);
  const info = inf.value;
  const total = cellCount(def);
  const shards = res.shards!;
  const cpus = res['cpus-per-task']!;
  const mem = res['mem-mb']!;
  const minutes = res['time-min']!;
  if (shards > total) {
    io.err(`error: --shards ${shards} for a grid of ${total} cells would leave shards empty; use at most ${total}`);
    return 2;
  }
  const dir = path.resolve(a.values.out!);
  const ready = await prepareOutputFolder(dir, '--out');
  if (!ready.ok) {
    io.err(`error: ${ready.message}`);
    return 2;
  }
  const node = process.execPath;
  const taskArgs = sweepTaskArgs(a);
  const shardArgv = [node, BIN, 'sweep', CAMPAIGN_SCENARIO, ...taskArgs, '--shard', '{shard}/{shards}', '--out', CAMPAIGN_SHARDS];
  const mergeArgv = [node, BIN, 'sweep', 'merge', CAMPAIGN_SHARDS, '--out', '.'];
  const slug =
    info.scenarioName
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 40) || 'scenario';
  const spec: CampaignSlurmSpec = {
    jobName: `slewsmith-sweep-${slug}`.slice(0, 64),
    campaignDir: dir,
    shards,
    shard: { cpusPerTask: cpus, memoryMB: mem, timeLimitMin: minutes, command: [...shardArgv, '--workers', String(cpus)] },
    merge: { cpusPerTask: 1, memoryMB: Math.max(mem, 1024), timeLimitMin: minutes, command: mergeArgv },
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
  const sizes = Array.from({ length: shards }, (_, i) => {
    const r = sweepShardCells(i, shards, total);
    return r.end - r.first;
  });
  const shell = (argv: string[]) => argv.map((x) => (/^[A-Za-z0-9._/=:,+-]+$/.test(x) ? x : shellQuote(x))).join(' ');
  const readme = sweepCampaignReadme({
    scenarioName: info.scenarioName,
    cells: total,
    runs: def.runs,
    seed: def.seed,
    controllers: info.controllers.map((c) => c.id),
    grid: def.axes.map((x) => `${x.parameter} ${x.values.length}`).join(' × '),
    shards,
    cellsPerShard: [Math.min(...sizes), Math.max(...sizes)],
    shardCommand: shell([...shardArgv.map((x) => (x === '{shard}/{shards}' ? `i/${shards}` : x)), '--workers', String(cpus)]),
    mergeCommand: shell(mergeArgv),
    cpusPerTask: cpus,
    memoryMB: mem,
    timeLimitMin: minutes,
  });
  if (!(await makeCampaignFolders(dir, io))) return 1;
  // The merge reads every shard file in shards/: files of an earlier campaign there would be refused with these.
  const old = (await readdir(path.join(dir, CAMPAIGN_SHARDS)).catch(() => [] as string[])).filter((f) => f.endsWith(SWEEP_SHARD_EXTENSION));
  if (old.length)
    io.err(
      `warning: ${path.join(dir, CAMPAIGN_SHARDS)} already holds ${old.length} shard file${old.length === 1 ? '' : 's'} of an earlier run; the merge reads every one there, so remove them before submitting unless they are this campaign's`,
    );
  const texts = { scenario: doc.text, readme, arrayScript: arrayText.value, mergeScript: mergeText.value };
  return writeCampaign(
    dir,
    texts,
    `sweep campaign: ${total} cells × ${def.runs} cases × ${info.controllers.length} controllers in ${shards} shards; per array task ${cpus} CPU, ${mem} MiB, ${minutes} min`,
    spec,
    a.flags.has('submit'),
    io,
  );
}
