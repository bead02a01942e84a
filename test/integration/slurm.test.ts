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

const here = path.dirname(fileURLToPath(import.meta.url));
const TASK = path.join(here, 'slurm-tasks/campaign-task.mjs');
const SHARDS = 20;
const CASES = 20_000;
const SEED = 60613;

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
