/**
 * A campaign folder: everything a cluster needs to run one study as K shards and merge them,
 * written by `slewsmith study slurm` and by the app ("Save as campaign"). Layout (names fixed
 * here so that the CLI, the app and the instructions agree):
 *   scenario.json            the scenario as run (study block with runs, seed and controllers)
 *   shards/                  shard files, one per array task (shard-00003-of-00020.slewsmith-shard)
 *   logs/                    scheduler logs
 *   slurm/shards.sbatch      the job array: task i runs shard i
 *   slurm/merge.sbatch       the merge, after every shard succeeded
 *   slurm/submit.sh          submits both with the dependency
 *   README.txt               what is here and how to run it, on Slurm or any array scheduler
 *   cases.csv, summary.json  written by the merge; open summary.json in the app's study view
 */
import { CAUTION_TEXT } from '../caution';

export const CAMPAIGN_SCENARIO = 'scenario.json';
export const CAMPAIGN_SHARDS = 'shards';

/**
 * Studies above this many case-runs (cases × controllers) are offered as a campaign folder
 * rather than run in the app: at the bundled examples' ~2–20 ms per run, 200,000 runs keep a
 * desktop busy for minutes to over an hour (common practice, no source: a judgement call).
 */
export const DESKTOP_RUNS_LIMIT = 200_000;

export interface CampaignDescription {
  scenarioName: string;
  seed: number;
  runs: number;
  controllers: string[];
  shards: number;
  /** How the program is started on the cluster, e.g. "slewsmith" or "node /opt/slewsmith/bin/slewsmith.mjs". */
  command: string;
  cpusPerTask: number;
  memoryMB: number;
  timeLimitMin: number;
}

/** The README.txt of a campaign folder. */
export function campaignReadme(d: CampaignDescription): string {
  const k = d.shards;
  const perShard = Math.ceil(d.runs / k);
  return [
    `Slewsmith campaign: robustness study of "${d.scenarioName}"`,
    '',
    `${d.runs} cases (seed ${d.seed}) × ${d.controllers.length} controllers (${d.controllers.join(', ')}), in ${k} shards of about ${perShard} cases.`,
    'A case depends only on (seed, case index), so the merged result is the same, byte for byte, as one',
    'machine running the whole study, whatever the number of shards and whichever machine runs which.',
    '',
    `CAUTION: ${CAUTION_TEXT}`,
    '',
    'Files',
    `  ${CAMPAIGN_SCENARIO}            the scenario as run (its "study" block fixes runs, seed and controllers)`,
    `  ${CAMPAIGN_SHARDS}/                  one shard file per shard, written by the array tasks`,
    '  logs/                    scheduler output',
    '  slurm/shards.sbatch      Slurm job array: task i runs shard i (SLURM_ARRAY_TASK_ID)',
    '  slurm/merge.sbatch       Slurm merge job, to run once every shard has succeeded',
    '  slurm/submit.sh          submits both, the merge with --dependency=afterok on the array',
    '  cases.csv, summary.json  the merged results (after the merge)',
    '',
    `Resources per array task: ${d.cpusPerTask} CPU${d.cpusPerTask === 1 ? '' : 's'}, ${d.memoryMB} MiB, ${d.timeLimitMin} min (edit the #SBATCH lines to suit the site).`,
    '',
    'On Slurm (from this folder):',
    '  bash slurm/submit.sh',
    '  squeue --me                      # watch the array and the merge',
    '',
    'On any other array scheduler (PBS/Torque job arrays, LSF job arrays, HTCondor queue N, a',
    'shell loop, GNU parallel): run, for every i from 0 to ' + (k - 1) + ', with this folder as working directory,',
    `  ${d.command} study ${CAMPAIGN_SCENARIO} --shard i/${k} --out ${CAMPAIGN_SHARDS} --workers ${d.cpusPerTask}`,
    '(the array index is i: $PBS_ARRAYID or $PBS_ARRAY_INDEX, $LSB_JOBINDEX − 1, $(Process) in HTCondor), then once all have finished:',
    `  ${d.command} study merge ${CAMPAIGN_SHARDS} --out .`,
    'A shard that failed or was stopped leaves no file: run it again (it writes the same bytes). The',
    'merge refuses shards of another scenario, seed or program version, duplicates, and lists the missing shards.',
    '',
    'Then open summary.json in the Slewsmith app (Study → Open results): the map, histograms and worst cases',
    'are shown, and a worst case opens as a normal run.',
    '',
  ].join('\n');
}

/** slurm/submit.sh: the array, then the merge depending on it; prints both job ids. */
export function campaignSubmitScript(): string {
  return [
    '#!/bin/bash',
    '# Submit the shard array, then the merge job that runs once every shard has succeeded.',
    'set -euo pipefail',
    'cd "$(dirname "$0")/.."',
    'mkdir -p logs shards',
    'ARRAY=$(sbatch --parsable slurm/shards.sbatch)',
    'ARRAY=${ARRAY%%;*}',
    'MERGE=$(sbatch --parsable --dependency=afterok:"$ARRAY" --kill-on-invalid-dep=yes slurm/merge.sbatch)',
    'echo "shard array job: $ARRAY"',
    'echo "merge job: ${MERGE%%;*}"',
    '',
  ].join('\n');
}

/** Shards for a campaign saved from the app: about 5,000 cases each, at most 1,000. */
export function suggestedShards(runs: number): number {
  return Math.max(1, Math.min(1000, runs, Math.ceil(runs / 5000)));
}

const sbatchHead = (name: string, d: CampaignDescription, log: string) => [
  '#!/bin/bash',
  `#SBATCH --job-name=${name}`,
  '#SBATCH --ntasks=1',
  `#SBATCH --cpus-per-task=${d.cpusPerTask}`,
  `#SBATCH --mem=${d.memoryMB}M`,
  `#SBATCH --time=${String(Math.floor(d.timeLimitMin / 60)).padStart(2, '0')}:${String(d.timeLimitMin % 60).padStart(2, '0')}:00`,
  `#SBATCH --output=logs/${log}.out`,
  `#SBATCH --error=logs/${log}.err`,
];

/**
 * The campaign folder as one bash script (what the app saves: a browser page cannot make a
 * folder). `bash <file> [FOLDER]` writes the folder of the layout above; its Slurm scripts start
 * the program as $SLEWSMITH (default `slewsmith`), from the folder (submit.sh submits from there).
 */
export function campaignBundleScript(d: CampaignDescription, scenarioJson: unknown, slug: string): string {
  const k = d.shards;
  const name = `slewsmith-${slug}`.replace(/[^A-Za-z0-9._-]/g, '-').slice(0, 64);
  const shards = [
    ...sbatchHead(name, d, 'shard-%a.%A'),
    `#SBATCH --array=0-${k - 1}`,
    '# One array task per shard: SLURM_ARRAY_TASK_ID is the shard index. Edit the resources above to suit the site.',
    'set -euo pipefail',
    `exec \${SLEWSMITH:-slewsmith} study ${CAMPAIGN_SCENARIO} --shard "\${SLURM_ARRAY_TASK_ID}/${k}" --out ${CAMPAIGN_SHARDS} --workers ${d.cpusPerTask}`,
    '',
  ].join('\n');
  const merge = [
    ...sbatchHead(`${name}-merge`, { ...d, cpusPerTask: 1 }, 'merge.%j'),
    '# Submitted by submit.sh with --dependency=afterok on the shard array.',
    'set -euo pipefail',
    `exec \${SLEWSMITH:-slewsmith} study merge ${CAMPAIGN_SHARDS} --out .`,
    '',
  ].join('\n');
  const file = (path: string, text: string, tag: string) => [`cat > ${path} <<'${tag}'`, text.replace(/\n$/, ''), tag];
  return [
    '#!/bin/bash',
    `# Slewsmith campaign for "${d.scenarioName.replace(/[\r\n]/g, ' ')}": ${d.runs} cases in ${k} shards.`,
    `# Usage: bash ${slug}-campaign.sh [FOLDER]   writes the campaign folder (default ./${slug}-campaign); then read FOLDER/README.txt.`,
    'set -euo pipefail',
    `DIR="\${1:-${slug}-campaign}"`,
    'mkdir -p "$DIR/slurm" "$DIR/logs" "$DIR/shards"',
    'cd "$DIR"',
    ...file(CAMPAIGN_SCENARIO, JSON.stringify(scenarioJson, null, 2), 'SLEWSMITH_SCENARIO_END'),
    ...file('README.txt', campaignReadme(d), 'SLEWSMITH_README_END'),
    ...file('slurm/shards.sbatch', shards, 'SLEWSMITH_SHARDS_END'),
    ...file('slurm/merge.sbatch', merge, 'SLEWSMITH_MERGE_END'),
    ...file('slurm/submit.sh', campaignSubmitScript(), 'SLEWSMITH_SUBMIT_END'),
    'chmod +x slurm/*.sbatch slurm/submit.sh',
    'echo "campaign folder: $PWD (submit on Slurm: bash slurm/submit.sh; other schedulers: README.txt)"',
    '',
  ].join('\n');
}
