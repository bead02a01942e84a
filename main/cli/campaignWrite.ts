/**
 * The steps `study slurm` and `sweep slurm` share once their scripts are written: the campaign
 * folder's sub-folders, its files (the scripts executable), the one-line summary, and either where
 * to submit from or the submission itself (`--submit`).
 */
import { chmod, mkdir } from 'node:fs/promises';
import path from 'node:path';
import { CAMPAIGN_SCENARIO, CAMPAIGN_SHARDS, campaignSubmitScript } from '../../app/engine/study/campaignFolder';
import { writeFileAtomicNode } from './fs';
import { printIssues, type CliIo } from './io';
import { submitCampaign, type CampaignSlurmSpec } from './slurm';

/** slurm/, logs/ and the shards folder inside `dir`; false (with the message printed) when that fails. */
export async function makeCampaignFolders(dir: string, io: CliIo): Promise<boolean> {
  try {
    for (const sub of ['slurm', 'logs', CAMPAIGN_SHARDS]) await mkdir(path.join(dir, sub), { recursive: true });
    return true;
  } catch (e) {
    io.err(`error: could not create folders in ${dir}: ${(e as Error).message}`);
    return false;
  }
}

export interface CampaignTexts {
  scenario: string;
  readme: string;
  arrayScript: string;
  mergeScript: string;
}

/** Writes the folder's files, prints `summary`, then submits (`submit`) or says how to; the exit status. */
export async function writeCampaign(
  dir: string,
  t: CampaignTexts,
  summary: string,
  spec: CampaignSlurmSpec,
  submit: boolean,
  io: CliIo,
): Promise<number> {
  const files: [string, string, boolean][] = [
    [path.join(dir, CAMPAIGN_SCENARIO), t.scenario, false],
    [path.join(dir, 'README.txt'), t.readme, false],
    [path.join(dir, 'slurm', 'shards.sbatch'), t.arrayScript, true],
    [path.join(dir, 'slurm', 'merge.sbatch'), t.mergeScript, true],
    [path.join(dir, 'slurm', 'submit.sh'), campaignSubmitScript(), true],
  ];
  for (const [file, text, exec] of files) {
    const w = await writeFileAtomicNode(file, text);
    if (!w.ok) {
      io.err(`error: could not write ${file}: ${w.message}`);
      return 1;
    }
    if (exec) await chmod(file, 0o755);
    io.err(`wrote ${file}`);
  }
  io.err(summary);
  if (!submit) {
    io.out(`campaign folder ${dir}: submit with "bash ${path.join(dir, 'slurm', 'submit.sh')}" (README.txt: other schedulers)`);
    return 0;
  }
  const sub = await submitCampaign(spec);
  if (!sub.ok) {
    printIssues(io, 'the campaign was not submitted', sub.errors);
    return 1;
  }
  io.out(`shard array job: ${sub.value.arrayJobId}`);
  io.out(`merge job: ${sub.value.mergeJobId}`);
  return 0;
}
