/**
 * Slurm job scripts for a sharded campaign: a job array with one task per shard, and a merge job
 * that runs once every shard has succeeded (`--dependency=afterok:<array job id>`; with
 * `--kill-on-invalid-dep=yes` a failed shard cancels the merge instead of leaving it pending).
 *
 * `arrayJobScript` and `mergeJobScript` are pure (spec in, script text out, every problem listed);
 * `submitCampaign` writes both into <campaign>/slurm/, makes <campaign>/logs/ and calls
 * `sbatch --parsable` for each, returning the job ids. The commands are argument lists: every
 * argument is single-quoted for bash, and the placeholders `{shard}` (the task's shard index, from
 * SLURM_ARRAY_TASK_ID) and `{shards}` (K) may appear inside any argument, e.g.
 *   ['node', '/repo/bin/slewsmith.mjs', 'study', 'scenario.json', '--shard', '{shard}/{shards}', '--out', dir].
 * Paths in #SBATCH lines are double-quoted (sbatch reads those lines itself, not bash), so they
 * may hold spaces but not `"`, `\` or line breaks; `%` is doubled there (Slurm's file-name patterns).
 */
import { execFile } from 'node:child_process';
import { chmod, mkdir } from 'node:fs/promises';
import path from 'node:path';
import type { Issue, Result } from '../../app/engine/errors';
import { fail, ok } from '../../app/engine/errors';
import { writeFileAtomicNode } from './fs';

export interface TaskResources {
  /** CPUs for the task (--cpus-per-task). */
  cpusPerTask: number;
  /** Memory for the task in MiB (--mem, per node; each task runs on one node). */
  memoryMB: number;
  /** Wall-clock limit in minutes (--time). */
  timeLimitMin: number;
  /** The program and its arguments. */
  command: string[];
}

export interface CampaignSlurmSpec {
  /** Job name: letters, digits, `.`, `_`, `-` (the merge job gets `-merge` appended). */
  jobName: string;
  /** Absolute path of the campaign folder (working directory; logs/ and slurm/ go inside). */
  campaignDir: string;
  /** K: shards 0…K−1, one array task each. */
  shards: number;
  /** At most this many shards at once (the `%N` of --array); omitted: as many as the cluster allows. */
  maxRunning?: number;
  partition?: string;
  account?: string;
  /** One shard; its command must use `{shard}`. */
  shard: TaskResources;
  merge: TaskResources;
}

const NAME = /^[A-Za-z0-9._-]{1,64}$/;
/** Slurm's own ceiling for array indices (MaxArraySize ≤ 4000001); a site's limit may be lower. */
const MAX_SHARDS = 4_000_000;

/** Single-quote for bash: safe for every character but NUL. */
export function shellQuote(s: string): string {
  return `'${s.replace(/'/g, `'\\''`)}'`;
}

/** One argument with `{shard}` / `{shards}` expanded at run time / now. */
function quoteArg(arg: string, shards: number): string {
  const parts = arg.split(/(\{shards?\})/).filter((p) => p !== '');
  if (parts.length === 0) return "''";
  return parts.map((p) => (p === '{shard}' ? '"${SHARD}"' : p === '{shards}' ? String(shards) : shellQuote(p))).join('');
}

/** --time value: [D-]HH:MM:00. */
export function slurmTime(minutes: number): string {
  const d = Math.floor(minutes / 1440),
    h = Math.floor((minutes % 1440) / 60),
    m = minutes % 60;
  const hm = `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}:00`;
  return d > 0 ? `${d}-${hm}` : hm;
}

function checkInt(issues: Issue[], p: string, v: unknown, lo: number, hi: number): void {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi)
    issues.push({ path: p, rule: 'range', message: `${p} must be a whole number from ${lo} to ${hi} (got ${String(v)})` });
}

/** A path for a double-quoted #SBATCH value. */
function checkSbatchPath(issues: Issue[], p: string, v: string): void {
  if (!path.isAbsolute(v)) issues.push({ path: p, rule: 'absolute', message: `${p} must be an absolute path (got "${v}")` });
  if (/["\\\r\n\0]/.test(v))
    issues.push({
      path: p,
      rule: 'sbatch-path',
      message: `${p} must not contain a double quote, a backslash or a line break (#SBATCH lines cannot quote them)`,
    });
}

function checkTask(issues: Issue[], p: string, t: TaskResources, needsShard: boolean): void {
  checkInt(issues, `${p}.cpusPerTask`, t.cpusPerTask, 1, 4096);
  checkInt(issues, `${p}.memoryMB`, t.memoryMB, 1, 1 << 30);
  checkInt(issues, `${p}.timeLimitMin`, t.timeLimitMin, 1, 366 * 1440);
  if (!Array.isArray(t.command) || t.command.length === 0 || t.command.some((a) => typeof a !== 'string'))
    issues.push({ path: `${p}.command`, rule: 'argv', message: `${p}.command must be a non-empty list of arguments` });
  else {
    if (t.command.some((a) => a.includes('\0')))
      issues.push({ path: `${p}.command`, rule: 'nul', message: `${p}.command must not contain NUL characters` });
    if (needsShard && !t.command.some((a) => a.includes('{shard}')))
      issues.push({
        path: `${p}.command`,
        rule: 'shard-placeholder',
        message: `${p}.command must pass the shard index: put {shard} in an argument`,
      });
  }
}

function checkSpec(s: CampaignSlurmSpec): Issue[] {
  const issues: Issue[] = [];
  if (!NAME.test(s.jobName))
    issues.push({ path: 'jobName', rule: 'name', message: `jobName must be 1–64 letters, digits, ".", "_" or "-" (got "${s.jobName}")` });
  checkSbatchPath(issues, 'campaignDir', s.campaignDir);
  checkInt(issues, 'shards', s.shards, 1, MAX_SHARDS);
  if (s.maxRunning !== undefined) checkInt(issues, 'maxRunning', s.maxRunning, 1, MAX_SHARDS);
  for (const k of ['partition', 'account'] as const) {
    const v = s[k];
    if (v !== undefined && !NAME.test(v))
      issues.push({ path: k, rule: 'name', message: `${k} must be letters, digits, ".", "_" or "-" (got "${v}")` });
  }
  checkTask(issues, 'shard', s.shard, true);
  checkTask(issues, 'merge', s.merge, false);
  return issues;
}

/** Slurm file-name pattern of a literal path: `%` doubled. */
const pattern = (p: string) => p.replace(/%/g, '%%');

function header(s: CampaignSlurmSpec, name: string, t: TaskResources, logBase: string): string[] {
  const lines = [
    '#!/bin/bash',
    `#SBATCH --job-name=${name}`,
    '#SBATCH --ntasks=1',
    `#SBATCH --cpus-per-task=${t.cpusPerTask}`,
    `#SBATCH --mem=${t.memoryMB}M`,
    `#SBATCH --time=${slurmTime(t.timeLimitMin)}`,
    `#SBATCH --chdir="${s.campaignDir}"`,
    `#SBATCH --output="${pattern(path.join(s.campaignDir, 'logs'))}/${logBase}.out"`,
    `#SBATCH --error="${pattern(path.join(s.campaignDir, 'logs'))}/${logBase}.err"`,
  ];
  if (s.partition) lines.push(`#SBATCH --partition=${s.partition}`);
  if (s.account) lines.push(`#SBATCH --account=${s.account}`);
  return lines;
}

/** (i) The job array: task i runs shard i of K. */
export function arrayJobScript(s: CampaignSlurmSpec): Result<string> {
  const issues = checkSpec(s);
  if (issues.length) return fail(issues);
  const k = s.shards;
  const lines = header(s, s.jobName, s.shard, 'shard-%a.%A');
  lines.splice(2, 0, `#SBATCH --array=0-${k - 1}${s.maxRunning ? `%${s.maxRunning}` : ''}`);
  lines.push(
    '',
    `# Slewsmith campaign "${s.jobName}": ${k} shard${k === 1 ? '' : 's'}, one array task each (written by slewsmith; the`,
    '# resources above may be edited). Task i runs shard i: SLURM_ARRAY_TASK_ID is the shard index.',
    'set -euo pipefail',
    'if [[ -z "${SLURM_ARRAY_TASK_ID:-}" ]]; then',
    '  echo "this script runs as a Slurm array task (sbatch it); SLURM_ARRAY_TASK_ID is not set" >&2',
    '  exit 2',
    'fi',
    'SHARD="${SLURM_ARRAY_TASK_ID}"',
    `if ! [[ "$SHARD" =~ ^[0-9]+$ ]] || (( 10#$SHARD >= ${k} )); then`,
    `  echo "array task $SHARD is not a shard of 0-${k - 1}" >&2`,
    '  exit 2',
    'fi',
    `exec ${s.shard.command.map((a) => quoteArg(a, k)).join(' ')}`,
    '',
  );
  return ok(lines.join('\n'));
}

/**
 * (ii) The merge job, run after every task of array job `arrayJobId` has succeeded. With
 * `arrayJobId` null the script has no dependency line: it is submitted with
 * `sbatch --dependency=afterok:<id> --kill-on-invalid-dep=yes` (campaign folders' submit.sh).
 */
export function mergeJobScript(s: CampaignSlurmSpec, arrayJobId: string | null): Result<string> {
  const issues = checkSpec(s);
  if (arrayJobId !== null && !/^\d+$/.test(arrayJobId))
    issues.push({ path: 'arrayJobId', rule: 'job-id', message: `the array job id must be a number (got "${arrayJobId}")` });
  if (issues.length) return fail(issues);
  const lines = header(s, `${s.jobName}-merge`, s.merge, 'merge.%j');
  if (arrayJobId !== null) lines.splice(2, 0, `#SBATCH --dependency=afterok:${arrayJobId}`, '#SBATCH --kill-on-invalid-dep=yes');
  lines.push(
    '',
    `# Slewsmith campaign "${s.jobName}": merge the ${s.shards} shard results once ${arrayJobId !== null ? `array job ${arrayJobId}` : 'the shard array job'} has succeeded`,
    '# (a failed shard cancels this job).',
    'set -euo pipefail',
    `exec ${s.merge.command.map((a) => quoteArg(a, s.shards)).join(' ')}`,
    '',
  );
  return ok(lines.join('\n'));
}

export interface SubmittedCampaign {
  arrayJobId: string;
  mergeJobId: string;
  arrayScript: string;
  mergeScript: string;
}

export interface SubmitOptions {
  /** The sbatch program (default: `sbatch` on PATH). */
  sbatch?: string;
  /** Environment for sbatch (default: this process's). */
  env?: NodeJS.ProcessEnv;
}

function sbatch(program: string, script: string, cwd: string, env: NodeJS.ProcessEnv | undefined): Promise<Result<string>> {
  return new Promise((resolve) => {
    execFile(program, ['--parsable', script], { cwd, env, encoding: 'utf8', timeout: 120_000 }, (err, stdout, stderr) => {
      const what = path.basename(script);
      if (err && (err as NodeJS.ErrnoException).code === 'ENOENT') {
        resolve(
          fail([
            {
              path: 'sbatch',
              rule: 'not-found',
              message: `"${program}" was not found: submit from a machine with Slurm's client commands (Debian package slurm-client)`,
            },
          ]),
        );
        return;
      }
      const said = (stderr || stdout || (err ? err.message : '')).trim().split('\n').slice(0, 5).join(' / ');
      if (err) {
        resolve(fail([{ path: 'sbatch', rule: 'refused', message: `sbatch refused ${what}${said ? `: ${said}` : ''}` }]));
        return;
      }
      // --parsable prints "jobid" or "jobid;cluster".
      const id = /^(\d+)(?:;\S*)?$/.exec(stdout.trim())?.[1];
      resolve(
        id
          ? ok(id)
          : fail([{ path: 'sbatch', rule: 'job-id', message: `sbatch accepted ${what} but printed no job id (got "${stdout.trim()}")` }]),
      );
    });
  });
}

async function writeScript(file: string, text: string): Promise<Result<string>> {
  const w = await writeFileAtomicNode(file, text);
  if (!w.ok) return fail([{ path: file, rule: 'write', message: `could not write ${file}: ${w.message}` }]);
  await chmod(file, 0o755);
  return ok(file);
}

/**
 * Write both scripts into <campaignDir>/slurm/ (shards.sbatch, merge.sbatch), create
 * <campaignDir>/logs/, submit the array, then the merge job depending on it. If the merge job
 * is refused, the array job is left running and the message says how to finish by hand.
 */
export async function submitCampaign(s: CampaignSlurmSpec, opts: SubmitOptions = {}): Promise<Result<SubmittedCampaign>> {
  const arrayText = arrayJobScript(s);
  if (!arrayText.ok) return fail(arrayText.errors);
  const program = opts.sbatch ?? 'sbatch';
  const slurmDir = path.join(s.campaignDir, 'slurm');
  try {
    await mkdir(path.join(s.campaignDir, 'logs'), { recursive: true });
    await mkdir(slurmDir, { recursive: true });
  } catch (e) {
    return fail([{ path: 'campaignDir', rule: 'write', message: `could not create folders in ${s.campaignDir}: ${(e as Error).message}` }]);
  }
  const arrayScript = await writeScript(path.join(slurmDir, 'shards.sbatch'), arrayText.value);
  if (!arrayScript.ok) return fail(arrayScript.errors);
  const arrayJob = await sbatch(program, arrayScript.value, s.campaignDir, opts.env);
  if (!arrayJob.ok) return fail(arrayJob.errors);
  const mergeText = mergeJobScript(s, arrayJob.value);
  if (!mergeText.ok) return fail(mergeText.errors);
  const mergeFile = path.join(slurmDir, 'merge.sbatch');
  const mergeScript = await writeScript(mergeFile, mergeText.value);
  const mergeJob = mergeScript.ok ? await sbatch(program, mergeFile, s.campaignDir, opts.env) : mergeScript;
  if (!mergeJob.ok) {
    const hint = `the shard array job ${arrayJob.value} is submitted; submit the merge by hand with "sbatch ${mergeFile}" or cancel the shards with "scancel ${arrayJob.value}"`;
    return fail(mergeJob.errors.map((e) => ({ ...e, message: `${e.message} (${hint})` })));
  }
  return ok({ arrayJobId: arrayJob.value, mergeJobId: mergeJob.value, arrayScript: arrayScript.value, mergeScript: mergeFile });
}
