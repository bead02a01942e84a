/**
 * Slurm job scripts (main/cli/slurm.ts). Outside references: bash itself (`bash -n` parses the
 * scripts; running a script's body shows what argv the task really gets, however odd the paths),
 * and the sbatch option syntax of the Slurm manual page sbatch(1) (--array=0-N%M,
 * --dependency=afterok:ID, --kill-on-invalid-dep, --time=[D-]HH:MM:SS, "%%" for a literal % in
 * file-name patterns). Submission runs against stand-in sbatch programs here (the real one is in
 * test/integration/slurm.test.ts).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync, chmodSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { arrayJobScript, mergeJobScript, shellQuote, slurmTime, submitCampaign, type CampaignSlurmSpec } from '../../main/cli/slurm';

const tmp = mkdtempSync(path.join(os.tmpdir(), 'slewsmith-slurm-unit-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

// Prints its arguments as JSON: the argv a task really receives.
const ECHO_ARGV = [process.execPath, '-e', 'console.log(JSON.stringify(process.argv.slice(1)))', '--'];

function spec(over: Partial<CampaignSlurmSpec> = {}): CampaignSlurmSpec {
  return {
    jobName: 'lumen-6.campaign',
    campaignDir: path.join(tmp, "odd dir 100% it's $HOME `id`"),
    shards: 20,
    shard: {
      cpusPerTask: 1,
      memoryMB: 1500,
      timeLimitMin: 90,
      command: [...ECHO_ARGV, 'study', 'a b.json', '--shard', '{shard}/{shards}'],
    },
    merge: { cpusPerTask: 2, memoryMB: 4000, timeLimitMin: 2 * 1440 + 5, command: [...ECHO_ARGV, 'merge', '{shards}'] },
    ...over,
  };
}

function value<T>(r: { ok: true; value: T } | { ok: false; errors: { message: string }[] }): T {
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  return r.value;
}

function runScript(text: string, env: Record<string, string>): { status: number | null; stdout: string; stderr: string } {
  const file = path.join(tmp, `s-${Math.random().toString(36).slice(2)}.sh`);
  writeFileSync(file, text);
  const r = spawnSync('bash', [file], { env: { PATH: process.env.PATH ?? '', ...env }, encoding: 'utf8' });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('job array script', () => {
  it('states the resources as #SBATCH lines (sbatch(1) syntax)', () => {
    const s = spec({ maxRunning: 4, partition: 'batch', account: 'gnc' });
    const text = value(arrayJobScript(s));
    const dir = s.campaignDir;
    const logs = `${dir.replace('%', '%%')}/logs`;
    expect(text.split('\n').filter((l) => l.startsWith('#SBATCH'))).toEqual([
      '#SBATCH --job-name=lumen-6.campaign',
      '#SBATCH --array=0-19%4',
      '#SBATCH --ntasks=1',
      '#SBATCH --cpus-per-task=1',
      '#SBATCH --mem=1500M',
      '#SBATCH --time=01:30:00',
      `#SBATCH --chdir="${dir}"`,
      `#SBATCH --output="${logs}/shard-%a.%A.out"`,
      `#SBATCH --error="${logs}/shard-%a.%A.err"`,
      '#SBATCH --partition=batch',
      '#SBATCH --account=gnc',
    ]);
    expect(text.startsWith('#!/bin/bash\n')).toBe(true);
    expect(spawnSync('bash', ['-n'], { input: text }).status).toBe(0);
  });

  it('task i runs shard i with every argument intact (bash runs the body)', () => {
    const nasty = ["it's", '$HOME', '`id`', '"q"', 'a\\b', 'line\nbreak', '', '{shards}x{shard}y{shard}', '*'];
    const s = spec({ shard: { ...spec().shard, command: [...ECHO_ARGV, ...nasty, '{shard}/{shards}'] } });
    const text = value(arrayJobScript(s));
    for (const task of [0, 7, 19]) {
      const r = runScript(text, { SLURM_ARRAY_TASK_ID: String(task) });
      expect(r.status).toBe(0);
      expect(JSON.parse(r.stdout)).toEqual([...nasty.slice(0, 7), `20x${task}y${task}`, '*', `${task}/20`]);
    }
  });

  it('refuses to run outside an array task or for a task beyond the shards', () => {
    const text = value(arrayJobScript(spec()));
    const none = runScript(text, {});
    expect(none.status).toBe(2);
    expect(none.stderr).toMatch(/SLURM_ARRAY_TASK_ID is not set/);
    const beyond = runScript(text, { SLURM_ARRAY_TASK_ID: '20' });
    expect(beyond.status).toBe(2);
    expect(beyond.stderr).toMatch(/not a shard of 0-19/);
  });

  it('lists every problem with its field', () => {
    const r = arrayJobScript(
      spec({
        jobName: 'bad name',
        campaignDir: 'relative/"dir"',
        shards: 0,
        maxRunning: 1.5,
        partition: 'a;b',
        shard: { cpusPerTask: 0, memoryMB: 1, timeLimitMin: 0, command: ['node', 'run.mjs'] },
        merge: { cpusPerTask: 1, memoryMB: 1, timeLimitMin: 1, command: [] },
      }),
    );
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
        'jobName:name',
        'campaignDir:absolute',
        'campaignDir:sbatch-path',
        'shards:range',
        'maxRunning:range',
        'partition:name',
        'shard.cpusPerTask:range',
        'shard.timeLimitMin:range',
        'shard.command:shard-placeholder',
        'merge.command:argv',
      ]);
  });
});

describe('merge job script', () => {
  it('depends on the whole array succeeding and is cancelled if a shard fails', () => {
    const s = spec();
    const text = value(mergeJobScript(s, '4711'));
    const lines = text.split('\n').filter((l) => l.startsWith('#SBATCH'));
    expect(lines.slice(0, 7)).toEqual([
      '#SBATCH --job-name=lumen-6.campaign-merge',
      '#SBATCH --dependency=afterok:4711',
      '#SBATCH --kill-on-invalid-dep=yes',
      '#SBATCH --ntasks=1',
      '#SBATCH --cpus-per-task=2',
      '#SBATCH --mem=4000M',
      '#SBATCH --time=2-00:05:00',
    ]);
    expect(lines[8]).toBe(`#SBATCH --output="${s.campaignDir.replace('%', '%%')}/logs/merge.%j.out"`);
    const r = runScript(text, {});
    expect(JSON.parse(r.stdout)).toEqual(['merge', '20']);
    expect(mergeJobScript(s, '12; rm -rf /').ok).toBe(false);
  });

  it('time limits and quoting helpers', () => {
    expect([1, 59, 60, 1439, 1440, 1441 + 60].map(slurmTime)).toEqual([
      '00:01:00',
      '00:59:00',
      '01:00:00',
      '23:59:00',
      '1-00:00:00',
      '1-01:01:00',
    ]);
    expect(shellQuote("a'b")).toBe(`'a'\\''b'`);
  });
});

describe('submitCampaign', () => {
  /** A stand-in sbatch: logs its arguments, prints the next id (or fails on the n-th call). */
  function fakeSbatch(failOnCall: number | null, output = (n: number) => `${4700 + n};cluster`): string {
    const file = path.join(tmp, `sbatch-${Math.random().toString(36).slice(2)}`);
    const counter = `${file}.count`;
    writeFileSync(counter, '0');
    writeFileSync(
      file,
      [
        '#!/bin/bash',
        `n=$(( $(cat ${shellQuote(counter)}) + 1 )); echo $n > ${shellQuote(counter)}`,
        `echo "$@" >> ${shellQuote(`${file}.log`)}`,
        `if [[ $n == ${failOnCall ?? 0} ]]; then echo "sbatch: error: Batch job submission failed: Invalid account" >&2; exit 1; fi`,
        ...[1, 2].map((n) => `if [[ $n == ${n} ]]; then echo ${shellQuote(output(n))}; fi`),
      ].join('\n'),
    );
    chmodSync(file, 0o755);
    return file;
  }

  it('writes both scripts, makes logs/, submits the array then the merge, returns the job ids', async () => {
    const s = spec({ campaignDir: path.join(tmp, 'campaign one') });
    const sbatch = fakeSbatch(null);
    const r = value(await submitCampaign(s, { sbatch }));
    expect(r).toEqual({
      arrayJobId: '4701',
      mergeJobId: '4702',
      arrayScript: path.join(s.campaignDir, 'slurm/shards.sbatch'),
      mergeScript: path.join(s.campaignDir, 'slurm/merge.sbatch'),
    });
    expect(statSync(path.join(s.campaignDir, 'logs')).isDirectory()).toBe(true);
    expect(readFileSync(r.mergeScript, 'utf8')).toContain('#SBATCH --dependency=afterok:4701');
    expect(readFileSync(`${sbatch}.log`, 'utf8').trim().split('\n')).toEqual([
      `--parsable ${r.arrayScript}`,
      `--parsable ${r.mergeScript}`,
    ]);
  });

  it('clear messages: no sbatch, sbatch refusing, a refused merge job, no job id', async () => {
    const s = spec({ campaignDir: path.join(tmp, 'campaign two') });
    const missing = await submitCampaign(s, { sbatch: path.join(tmp, 'no-such-sbatch') });
    expect(missing.ok).toBe(false);
    if (!missing.ok) expect(missing.errors[0]!.message).toMatch(/was not found.*slurm-client/);

    const refused = await submitCampaign(s, { sbatch: fakeSbatch(1) });
    if (refused.ok) throw new Error('expected a refusal');
    expect(refused.errors[0]!.message).toBe('sbatch refused shards.sbatch: sbatch: error: Batch job submission failed: Invalid account');

    const mergeRefused = await submitCampaign(s, { sbatch: fakeSbatch(2) });
    if (mergeRefused.ok) throw new Error('expected a refusal');
    expect(mergeRefused.errors[0]!.message).toMatch(/refused merge\.sbatch.*array job 4701 is submitted.*scancel 4701/);

    const garbled = await submitCampaign(s, { sbatch: fakeSbatch(null, () => 'Submitted batch job') });
    if (garbled.ok) throw new Error('expected a refusal');
    expect(garbled.errors[0]!.rule).toBe('job-id');

    const invalid = await submitCampaign(spec({ shards: -1 }));
    expect(invalid.ok).toBe(false);
  });
});
