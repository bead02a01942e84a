/**
 * A sharded campaign on a real Slurm cluster (one node on localhost; slurm-cluster.ts): the job
 * array and merge job of main/cli/slurm.ts are submitted with sbatch; 20 array tasks each summarise
 * their shard of a synthetic 20,000-case data set with the mergeable statistics of
 * app/engine/math/stats.ts (slurm-tasks/campaign-task.ts), the merge job runs after them
 * (afterok) and merges the shard files. Reference: the same summary computed in this process from
 * all cases at once; the merged files must equal it byte for byte.
 *
 * Needs the Debian packages slurmctld, slurmd, slurm-client and munge, and root. Outside CI,
 * SLEWSMITH_SKIP_SLURM=1 skips it (and says so); without the packages and without that variable it
 * fails, naming them. It runs in the serial group of vitest.config.ts, after the parallel tests.
 *
 * The real campaign: `slewsmith study slurm` writes the campaign folder of a 2,000-case study of
 * the bundled tern12-reversal example and submits it (--submit: sbatch for the 20-task array and
 * the afterok merge job); the merged cases.csv and summary.json must equal, byte for byte, those
 * of `slewsmith study` run in one process with the same seed.
 *
 * The sweep campaign: `slewsmith sweep slurm --submit` for an 8-cell robustness sweep in 3 array
 * tasks and the afterok merge job; the merged cells.csv and sweep.json must equal, byte for byte,
 * those of `slewsmith sweep` run in one process with the same options.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { spawn } from 'node:child_process';
import {
  checkSlurmInstalled,
  cleanupLeftovers,
  pidsWithConf,
  startSlurmCluster,
  type InstallProbe,
  type SlurmCluster,
} from './slurm-cluster';
import { submitCampaign, type CampaignSlurmSpec } from '../../main/cli/slurm';
import { campaignReport, campaignState, stateToJson } from './campaign-fixture';
import { mstScenario } from '../reference/sweep-fixtures';

const here = path.dirname(fileURLToPath(import.meta.url));
const TASK = path.join(here, 'slurm-tasks/campaign-task.mjs');
const SHARDS = 20;
const CASES = 20_000;
const SEED = 60613;

/** The real study: a bundled example (its PD controller only: the fastest law), one shard per array task. */
const BIN = path.join(here, '../../bin/slewsmith.mjs');
const EXAMPLE = path.join(here, '../../assets/tern12-reversal.scenario.json');
const REAL = { runs: 2000, shards: 20, seed: 60614 };
/** The sweep campaign: the invented MST-setting vehicle of test/reference/sweep-fixtures.ts, 4 × 2 cells in 3 array tasks. */
const SWEEP = { cells: 8, shards: 3 };

/** Run node with these arguments; its exit code and output. */
function node(args: string[], env: NodeJS.ProcessEnv): Promise<{ code: number; out: string; err: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout!.on('data', (d) => (out += d));
    child.stderr!.on('data', (d) => (err += d));
    child.once('exit', (code) => resolve({ code: code ?? 1, out, err }));
  });
}

const inCi = Boolean(process.env.CI);
const skip = process.env.SLEWSMITH_SKIP_SLURM === '1' && !inCi;
if (skip) console.warn('Slurm integration test SKIPPED: SLEWSMITH_SKIP_SLURM=1 is set (never honoured in CI)');
else if (process.env.SLEWSMITH_SKIP_SLURM === '1') console.warn('SLEWSMITH_SKIP_SLURM=1 is ignored in CI: running the Slurm test');

/** Is `pid` still a process of the cluster in `dir`? */
const runsIn = (pid: number, dir: string) => existsSync(`/proc/${pid}`) && readFileSync(`/proc/${pid}/cmdline`, 'utf8').includes(dir);

describe('installation check', () => {
  it('names the missing Debian packages and the command that installs them', () => {
    const probe: InstallProbe = {
      executable: (f) => !/slurmd$|sbatch|scontrol|sinfo|scancel/.test(f),
      exists: () => true,
      hasUser: () => true,
      isRoot: () => true,
    };
    const c = checkSlurmInstalled(probe);
    expect(c.ok).toBe(false);
    expect(c.missingPackages).toEqual(['slurmd', 'slurm-client']);
    expect(c.message).toMatch(
      /needs the Debian packages slurmctld, slurmd, slurm-client, munge\. \/usr\/sbin\/slurmd is missing \(Debian package slurmd\)/,
    );
    expect(c.message).toMatch(/Install with: apt-get install -y slurmd slurm-client$/);
    const notRoot = checkSlurmInstalled({ ...probe, executable: () => true, isRoot: () => false });
    expect(notRoot.missingPackages).toEqual([]);
    expect(notRoot.message).toMatch(/must be started as root/);
    const noKey = checkSlurmInstalled({ ...probe, executable: () => true, exists: () => false });
    expect(noKey.missingPackages).toEqual(['munge']);
  });
});

describe.skipIf(skip)('Slurm job arrays on a one-node cluster', () => {
  let cluster: SlurmCluster | null = null;
  let work = '';

  beforeAll(async () => {
    const check = checkSlurmInstalled();
    if (!check.ok) throw new Error(check.message);
    cluster = await startSlurmCluster();
    // A space and a quote in the campaign path: the scripts must quote it.
    work = mkdtempSync(path.join(os.tmpdir(), "slewsmith campaign 'test' "));
  }, 60_000);

  afterAll(async () => {
    const c = cluster;
    cluster = null;
    if (c) {
      await c.stop();
      // Every daemon and job process this cluster started is gone.
      for (const [name, pid] of Object.entries(c.pids)) expect(runsIn(pid, c.dir), name).toBe(false);
      expect(pidsWithConf(c.conf)).toEqual([]);
    }
    if (work) rmSync(work, { recursive: true, force: true });
  }, 60_000);

  it('the harness runs a plain batch job', async () => {
    const c = cluster!;
    const out = path.join(work, 'hello.txt');
    const script = path.join(work, 'hello.sh');
    writeFileSync(
      script,
      `#!/bin/bash\n#SBATCH --job-name=hello\n#SBATCH --output=/dev/null\necho "hello from $SLURMD_NODENAME" > '${out.replace(/'/g, `'\\''`)}'\n`,
    );
    const id = await c.submit(script);
    const jobs = (await c.waitFor([id], 30_000)).get(id)!;
    expect(jobs.map((j) => [j.state, j.exitCode])).toEqual([['COMPLETED', '0:0']]);
    expect(readFileSync(out, 'utf8')).toBe(`hello from ${c.node}\n`);
  }, 45_000);

  it(`a ${SHARDS}-task array and its merge job give the single-process summary byte for byte`, async () => {
    const c = cluster!;
    const report = path.join(work, 'merged-report.json');
    const spec: CampaignSlurmSpec = {
      jobName: 'slewsmith-test-campaign',
      campaignDir: work,
      shards: SHARDS,
      shard: {
        cpusPerTask: 1,
        memoryMB: 300,
        timeLimitMin: 5,
        command: [process.execPath, TASK, 'shard', '{shard}/{shards}', '--cases', String(CASES), '--seed', String(SEED), '--out', work],
      },
      merge: {
        cpusPerTask: 1,
        memoryMB: 300,
        timeLimitMin: 5,
        command: [process.execPath, TASK, 'merge', '--shards', '{shards}', '--dir', work, '--out', report],
      },
    };
    const sub = await submitCampaign(spec, { sbatch: '/usr/bin/sbatch', env: c.env });
    if (!sub.ok) throw new Error(sub.errors.map((e) => e.message).join('\n'));
    const { arrayJobId, mergeJobId } = sub.value;

    const jobs = await c.waitFor([arrayJobId, mergeJobId], 100_000);
    const tasks = jobs.get(arrayJobId)!;
    const logs = () =>
      readdirSync(path.join(work, 'logs'))
        .map((f) => `--- ${f}\n${readFileSync(path.join(work, 'logs', f), 'utf8')}`)
        .join('\n');
    const states = tasks.map((t) => `${t.arrayTaskId}:${t.state}:${t.exitCode}`).sort();
    const want = Array.from({ length: SHARDS }, (_, i) => `${i}:COMPLETED:0:0`).sort();
    if (JSON.stringify(states) !== JSON.stringify(want)) throw new Error(`shard tasks: ${states.join(', ')}\n${logs()}`);
    expect(jobs.get(mergeJobId)!.map((j) => j.state)).toEqual(['COMPLETED']);

    // Each task wrote its own shard and its own log, named after its array index.
    for (let i = 0; i < SHARDS; i++) {
      expect(existsSync(path.join(work, `shard-${i}.json`))).toBe(true);
      expect(readFileSync(path.join(work, 'logs', `shard-${i}.${arrayJobId}.out`), 'utf8')).toMatch(
        new RegExp(`^shard ${i}/${SHARDS}: \\d+ cases on ${c.node} \\(task ${i}\\)`),
      );
    }

    // The reference: one process, all cases.
    const all = campaignState(
      { seed: SEED, cases: CASES, controllers: 1, worst: 10 },
      Array.from({ length: CASES }, (_, i) => i),
    );
    expect(readFileSync(`${report}.state`, 'utf8')).toBe(stateToJson(all));
    expect(readFileSync(report, 'utf8')).toBe(campaignReport(all));
  }, 120_000);

  it(`a real study: ${REAL.shards} array tasks of a ${REAL.runs}-case study of a bundled example and the merge job give the single-process files byte for byte`, async () => {
    const c = cluster!;
    const campaign = path.join(work, 'real campaign');
    const refDir = path.join(work, 'single process');
    const study = ['--runs', String(REAL.runs), '--seed', String(REAL.seed), '--controller', 'pd'];
    // The campaign folder and its submission, through the CLI as a user runs it (sbatch finds the
    // test cluster through SLURM_CONF in c.env).
    const sub = await node(
      [
        BIN,
        'study',
        'slurm',
        EXAMPLE,
        ...study,
        '--shards',
        String(REAL.shards),
        '--out',
        campaign,
        '--mem-mb',
        '400',
        '--time-min',
        '15',
        '--submit',
      ],
      c.env,
    );
    expect(sub.code, sub.err).toBe(0);
    const arrayJobId = /shard array job: (\d+)/.exec(sub.out)?.[1];
    const mergeJobId = /merge job: (\d+)/.exec(sub.out)?.[1];
    expect(arrayJobId && mergeJobId, sub.out).toBeTruthy();
    const script = readFileSync(path.join(campaign, 'slurm', 'shards.sbatch'), 'utf8');
    expect(script).toContain(`#SBATCH --array=0-${REAL.shards - 1}`);
    expect(script).toMatch(/#SBATCH --cpus-per-task=1\n#SBATCH --mem=400M\n#SBATCH --time=00:15:00/);
    expect(readFileSync(path.join(campaign, 'slurm', 'merge.sbatch'), 'utf8')).toContain(`#SBATCH --dependency=afterok:${arrayJobId}`);

    // The reference runs meanwhile: one process, the whole study, same seed.
    const [jobs, ref] = await Promise.all([
      c.waitFor([arrayJobId!, mergeJobId!], 600_000),
      node([BIN, 'study', EXAMPLE, ...study, '--workers', '1', '--out', refDir], process.env),
    ]);
    expect(ref.code, ref.err).toBe(0);
    const logs = () =>
      readdirSync(path.join(campaign, 'logs'))
        .map((f) => `--- ${f}\n${readFileSync(path.join(campaign, 'logs', f), 'utf8')}`)
        .join('\n');
    const states = jobs
      .get(arrayJobId!)!
      .map((t) => `${t.arrayTaskId}:${t.state}:${t.exitCode}`)
      .sort();
    const want = Array.from({ length: REAL.shards }, (_, i) => `${i}:COMPLETED:0:0`).sort();
    if (JSON.stringify(states) !== JSON.stringify(want)) throw new Error(`shard tasks: ${states.join(', ')}\n${logs()}`);
    expect(
      jobs.get(mergeJobId!)!.map((j) => j.state),
      logs(),
    ).toEqual(['COMPLETED']);
    const shardFiles = readdirSync(path.join(campaign, 'shards')).filter((f) => f.endsWith('.slewsmith-shard'));
    expect(shardFiles).toHaveLength(REAL.shards);

    for (const f of ['cases.csv', 'summary.json']) {
      const merged = readFileSync(path.join(campaign, f), 'utf8');
      const single = readFileSync(path.join(refDir, f), 'utf8');
      expect(merged.length, f).toBe(single.length);
      expect(merged === single, `${f} differs from the single-process file`).toBe(true);
    }
    const summary = JSON.parse(readFileSync(path.join(campaign, 'summary.json'), 'utf8'));
    expect(summary.summary.casesDone).toBe(REAL.runs);
    expect(summary.summary.controllers[0].shares.unwound.of).toBe(summary.summary.controllers[0].flyable);
  }, 900_000);

  it(`a sweep campaign: ${SWEEP.shards} array tasks of an ${SWEEP.cells}-cell sweep and the merge job give the one-process sweep byte for byte`, async () => {
    const c = cluster!;
    const campaign = path.join(work, 'sweep campaign');
    const refDir = path.join(work, 'sweep single process');
    const scenario = path.join(work, 'mst sweep.scenario.json');
    const base = mstScenario({ controlRateHz: 100, rk4StepsPerSample: 10, durationS: 20, hysteresis: 0.4, noiseMode: 'band-edge' });
    const json = {
      ...base,
      simulation: { ...base.simulation, settleAngleDeg: 60, settleRateDegPerS: 20 },
      study: { ...base.study, dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 1 } } },
    };
    writeFileSync(scenario, JSON.stringify(json, null, 2) + '\n');
    const sweep = ['--param', 'worst-case-eta=0.05,0.15,0.25,0.35', '--param2', 'hysteresis=0.1,0.3', '--runs', '2', '--seed', '11'];
    const sub = await node(
      [
        BIN,
        'sweep',
        'slurm',
        scenario,
        ...sweep,
        '--shards',
        String(SWEEP.shards),
        '--out',
        campaign,
        '--mem-mb',
        '400',
        '--time-min',
        '15',
        '--submit',
      ],
      c.env,
    );
    expect(sub.code, sub.err).toBe(0);
    const arrayJobId = /shard array job: (\d+)/.exec(sub.out)?.[1];
    const mergeJobId = /merge job: (\d+)/.exec(sub.out)?.[1];
    expect(arrayJobId && mergeJobId, sub.out).toBeTruthy();
    expect(readFileSync(path.join(campaign, 'slurm', 'shards.sbatch'), 'utf8')).toContain(`#SBATCH --array=0-${SWEEP.shards - 1}\n`);
    expect(readFileSync(path.join(campaign, 'slurm', 'merge.sbatch'), 'utf8')).toContain(`#SBATCH --dependency=afterok:${arrayJobId}`);

    const [jobs, ref] = await Promise.all([
      c.waitFor([arrayJobId!, mergeJobId!], 300_000),
      node([BIN, 'sweep', scenario, ...sweep, '--workers', '1', '--out', refDir], process.env),
    ]);
    expect(ref.code, ref.err).toBe(0);
    const logs = () =>
      readdirSync(path.join(campaign, 'logs'))
        .map((f) => `--- ${f}\n${readFileSync(path.join(campaign, 'logs', f), 'utf8')}`)
        .join('\n');
    const states = jobs
      .get(arrayJobId!)!
      .map((t) => `${t.arrayTaskId}:${t.state}:${t.exitCode}`)
      .sort();
    const want = Array.from({ length: SWEEP.shards }, (_, i) => `${i}:COMPLETED:0:0`).sort();
    if (JSON.stringify(states) !== JSON.stringify(want)) throw new Error(`sweep shard tasks: ${states.join(', ')}\n${logs()}`);
    expect(
      jobs.get(mergeJobId!)!.map((j) => j.state),
      logs(),
    ).toEqual(['COMPLETED']);
    const shardFiles = readdirSync(path.join(campaign, 'shards')).filter((f) => f.endsWith('.slewsmith-sweep-shard'));
    expect(shardFiles).toHaveLength(SWEEP.shards);
    for (const f of ['cells.csv', 'sweep.json']) {
      const merged = readFileSync(path.join(campaign, f), 'utf8');
      const single = readFileSync(path.join(refDir, f), 'utf8');
      expect(merged.length, f).toBe(single.length);
      expect(merged === single, `${f} differs from the single-process file`).toBe(true);
    }
    expect((JSON.parse(readFileSync(path.join(campaign, 'sweep.json'), 'utf8')) as { cells: unknown[] }).cells).toHaveLength(SWEEP.cells);
  }, 400_000);

  it('a second start in this process reuses the running cluster', async () => {
    const again = await startSlurmCluster();
    expect(again).toBe(cluster);
    await again.stop(); // one holder left: still running
    expect(runsIn(cluster!.pids.slurmctld, cluster!.dir)).toBe(true);
  });

  it('a cluster left behind by a killed test process is stopped by the next cleanup, and only that one', async () => {
    const child = spawn(process.execPath, [path.join(here, 'slurm-tasks/leave-cluster.mjs')], { stdio: ['ignore', 'pipe', 'pipe'] });
    const exited = new Promise((r) => child.once('exit', r));
    const left = await new Promise<{ dir: string; conf: string; pids: Record<string, number> }>((resolve, reject) => {
      let out = '';
      let err = '';
      child.stdout!.on('data', (d) => {
        out += d;
        if (out.includes('\n')) resolve(JSON.parse(out.split('\n')[0]!));
      });
      child.stderr!.on('data', (d) => (err += d));
      child.once('exit', (code) => reject(new Error(`leave-cluster exited (${code}) before starting a cluster: ${err}`)));
    });
    child.kill('SIGKILL'); // no stop(), no exit hook: the daemons stay behind
    await exited;
    for (const pid of Object.values(left.pids)) expect(runsIn(pid, left.dir)).toBe(true);

    expect(await cleanupLeftovers()).toBe(1);
    for (const pid of Object.values(left.pids)) expect(runsIn(pid, left.dir)).toBe(false);
    expect(existsSync(left.dir)).toBe(false);
    expect(runsIn(cluster!.pids.slurmctld, cluster!.dir)).toBe(true); // ours untouched
  }, 60_000);
});
