/**
 * A real one-node Slurm cluster on localhost for the integration tests (Debian's packages
 * slurmctld, slurmd, slurm-client and munge; see DEVELOPERS.md, "The Slurm test").
 *
 * Everything lives in one temporary folder, so the harness never touches /etc/slurm, /run/munge or
 * a Slurm installation the machine may already run:
 * - its own munged (started as user munge) on a socket in that folder, with the package's key
 *   /etc/munge/munge.key; slurm.conf points Slurm at it with AuthInfo=socket=…;
 * - slurm.conf, state, spool, logs and pid files in the folder; free TCP ports picked at start;
 *   SlurmUser=root (the tests run as root; no chown of state folders needed);
 * - no cgroups: ProctrackType=proctrack/linuxproc (processes tracked through their parent
 *   chain), TaskPlugin=task/none; CR_CPU scheduling over the CPUs and memory `slurmd -C` reports.
 * The client commands find the cluster through SLURM_CONF, set only in the environment the harness
 * passes to its children (`cluster.env`), never in this process.
 *
 * Stopping: the daemons are stopped by the PIDs read from their pid files (each checked against
 * /proc/PID/cmdline first, so a recycled PID is never signalled), SIGTERM then SIGKILL. Job
 * processes Slurm started (slurmstepd and the jobs) are found by the one thing that marks them as
 * this cluster's: SLURM_CONF=<this cluster's slurm.conf> in /proc/PID/environ. Never by name.
 *
 * Reuse and restart: within one process a second `startSlurmCluster()` returns the running cluster
 * (reference counted; the last `stop()` stops it). Every cluster is recorded in
 * <tmp>/slewsmith-slurm-<uid>/<id>.json with the PID of the process that owns it; a record whose
 * owner has exited (a crashed or killed earlier test) is a leftover: the next start stops its
 * daemons and removes it before starting afresh. `node --import tsx test/integration/slurm-cluster.ts
 * cleanup` does the same from the shell (.ci/run calls it on exit); `check` reports what is missing.
 */
import { execFile, execFileSync, spawnSync } from 'node:child_process';
import {
  accessSync,
  constants,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  writeFileSync,
  chownSync,
  chmodSync,
  rmdirSync,
} from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** The Debian packages the cluster needs. */
export const SLURM_PACKAGES = ['slurmctld', 'slurmd', 'slurm-client', 'munge'] as const;

/** Each program the harness runs, where Debian installs it, and the package that provides it. */
const PROGRAMS: { file: string; pkg: (typeof SLURM_PACKAGES)[number] }[] = [
  { file: '/usr/sbin/munged', pkg: 'munge' },
  { file: '/usr/bin/munge', pkg: 'munge' },
  { file: '/usr/sbin/slurmctld', pkg: 'slurmctld' },
  { file: '/usr/sbin/slurmd', pkg: 'slurmd' },
  { file: '/usr/bin/sbatch', pkg: 'slurm-client' },
  { file: '/usr/bin/scontrol', pkg: 'slurm-client' },
  { file: '/usr/bin/sinfo', pkg: 'slurm-client' },
  { file: '/usr/bin/scancel', pkg: 'slurm-client' },
];
const MUNGE_KEY = '/etc/munge/munge.key';

export interface InstallCheck {
  ok: boolean;
  /** Packages to install (Debian names), in SLURM_PACKAGES order. */
  missingPackages: string[];
  /** Everything wrong, one line each (missing programs with their package, key, user, root). */
  problems: string[];
  /** One paragraph for a person: what is missing and the command that installs it. */
  message: string;
}

/** uid and gid of a local user, from /etc/passwd; null when there is no such user. */
function passwdEntry(name: string): { uid: number; gid: number } | null {
  const line = readFileSync('/etc/passwd', 'utf8')
    .split('\n')
    .find((l) => l.startsWith(`${name}:`));
  if (!line) return null;
  const [, , uid, gid] = line.split(':');
  return { uid: Number(uid), gid: Number(gid) };
}

/** What the check looks at (a parameter so that its messages can be tested without uninstalling). */
export interface InstallProbe {
  executable(file: string): boolean;
  exists(file: string): boolean;
  hasUser(name: string): boolean;
  isRoot(): boolean;
}

export const systemProbe: InstallProbe = {
  executable(file) {
    try {
      accessSync(file, constants.X_OK);
      return true;
    } catch {
      return false;
    }
  },
  exists: (file) => existsSync(file),
  hasUser: (name) => passwdEntry(name) !== null,
  isRoot: () => typeof process.getuid !== 'function' || process.getuid() === 0,
};

/** (a) Are the Slurm and MUNGE programs installed, and can this process start them? */
export function checkSlurmInstalled(probe: InstallProbe = systemProbe): InstallCheck {
  const problems: string[] = [];
  const missing = new Set<string>();
  for (const p of PROGRAMS) {
    if (!probe.executable(p.file)) {
      problems.push(`${p.file} is missing (Debian package ${p.pkg})`);
      missing.add(p.pkg);
    }
  }
  if (!missing.has('munge')) {
    if (!probe.exists(MUNGE_KEY)) {
      problems.push(`${MUNGE_KEY} is missing (the munge package creates it; reinstall munge)`);
      missing.add('munge');
    }
    if (!probe.hasUser('munge')) problems.push('there is no user "munge" (the munge package creates it)');
  }
  if (!probe.isRoot()) problems.push('the test cluster must be started as root (munged runs as user munge; slurmd runs jobs as root)');
  const missingPackages = SLURM_PACKAGES.filter((p) => missing.has(p));
  const install = missingPackages.length ? ` Install with: apt-get install -y ${missingPackages.join(' ')}` : '';
  return {
    ok: problems.length === 0,
    missingPackages,
    problems,
    message: problems.length
      ? `The Slurm test needs the Debian packages ${SLURM_PACKAGES.join(', ')}. ${problems.join('; ')}.${install}`
      : 'Slurm and MUNGE are installed.',
  };
}

// ---------------------------------------------------------------------------------------------
// Processes

function cmdline(pid: number): string | null {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').join(' ');
  } catch {
    return null;
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** SIGTERM, wait up to `graceMs`, then SIGKILL; only while the PID still runs `expect`. */
async function stopPid(pid: number, expect: (cmd: string) => boolean, graceMs = 10_000): Promise<void> {
  const ours = () => {
    const c = cmdline(pid);
    return c !== null && expect(c);
  };
  if (!ours()) return;
  try {
    process.kill(pid, 'SIGTERM');
  } catch {
    return;
  }
  const until = Date.now() + graceMs;
  while (Date.now() < until) {
    if (!alive(pid) || !ours()) return;
    await sleep(100);
  }
  if (ours()) {
    try {
      process.kill(pid, 'SIGKILL');
    } catch {
      /* gone meanwhile */
    }
  }
}

/** PIDs whose environment holds exactly `SLURM_CONF=<conf>` (processes this cluster started). */
export function pidsWithConf(conf: string): number[] {
  const needle = `SLURM_CONF=${conf}`;
  const out: number[] = [];
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    const pid = Number(d);
    if (pid === process.pid) continue;
    try {
      if (readFileSync(`/proc/${pid}/environ`, 'utf8').split('\0').includes(needle)) out.push(pid);
    } catch {
      /* exited, or not ours to read */
    }
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// The record of running clusters

const REGISTRY = path.join(os.tmpdir(), `slewsmith-slurm-${typeof process.getuid === 'function' ? process.getuid() : 0}`);

interface ClusterRecord {
  id: string;
  dir: string;
  conf: string;
  owner: number;
  pids: { munged: number | null; slurmctld: number | null; slurmd: number | null };
}

function records(): ClusterRecord[] {
  if (!existsSync(REGISTRY)) return [];
  return readdirSync(REGISTRY)
    .filter((f) => f.endsWith('.json'))
    .flatMap((f) => {
      try {
        return [JSON.parse(readFileSync(path.join(REGISTRY, f), 'utf8')) as ClusterRecord];
      } catch {
        return [];
      }
    });
}

function saveRecord(r: ClusterRecord): void {
  mkdirSync(REGISTRY, { recursive: true, mode: 0o700 });
  writeFileSync(path.join(REGISTRY, `${r.id}.json`), JSON.stringify(r, null, 1));
}

/** Stop everything a record names (daemons by verified PID, then this cluster's job processes). */
async function stopRecord(r: ClusterRecord, keepDir: boolean): Promise<void> {
  const mentions = (cmd: string) => cmd.includes(r.dir);
  if (r.pids.slurmd) await stopPid(r.pids.slurmd, (c) => c.includes('slurmd') && mentions(c));
  if (r.pids.slurmctld) await stopPid(r.pids.slurmctld, (c) => c.includes('slurmctld') && mentions(c));
  for (const pid of pidsWithConf(r.conf)) await stopPid(pid, () => true, 3000);
  if (r.pids.munged) await stopPid(r.pids.munged, (c) => c.includes('munged') && mentions(c));
  rmSync(path.join(REGISTRY, `${r.id}.json`), { force: true });
  if (!keepDir) rmSync(r.dir, { recursive: true, force: true });
  try {
    rmdirSync(REGISTRY); // only when no other cluster is recorded
  } catch {
    /* not empty, or gone */
  }
}

/**
 * Stop the clusters whose owning process has exited (and any earlier cluster of this process that
 * is not its running one). Returns how many were stopped.
 */
export async function cleanupLeftovers(): Promise<number> {
  let n = 0;
  for (const r of records()) {
    if (r.id === current?.id) continue;
    if (r.owner !== process.pid && alive(r.owner)) continue;
    await stopRecord(r, false);
    n++;
  }
  return n;
}

// ---------------------------------------------------------------------------------------------
// Starting

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const a = s.address();
      s.close(() => (a && typeof a === 'object' ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}

export interface JobRecord {
  jobId: string;
  arrayTaskId: string | null;
  state: string;
  reason: string;
  exitCode: string;
}

export interface SubmitOptions {
  /** Extra sbatch arguments (before the script), e.g. ['--array=0-9']. */
  args?: string[];
  cwd?: string;
}

export interface SlurmCluster {
  dir: string;
  conf: string;
  node: string;
  cpus: number;
  memoryMB: number;
  /** The environment for client commands (this process's plus SLURM_CONF). */
  env: NodeJS.ProcessEnv;
  pids: { munged: number; slurmctld: number; slurmd: number };
  /** Run a client command (sbatch, scontrol, …) against this cluster. */
  run(program: string, args: string[]): Promise<{ code: number; stdout: string; stderr: string }>;
  /** (d) sbatch --parsable; the job id. */
  submit(script: string, opts?: SubmitOptions): Promise<string>;
  /** (d) Wait until every job (and every task of an array) has ended; their records. */
  waitFor(jobIds: readonly string[], timeoutMs: number): Promise<Map<string, JobRecord[]>>;
  /** The last lines of the daemons' logs (for failure messages). */
  logTail(lines?: number): string;
  /** (e) Stop what this harness started (the last holder in this process stops it). */
  stop(): Promise<void>;
}

let current: { id: string; cluster: SlurmCluster; holders: number } | null = null;

function run(
  program: string,
  args: string[],
  env: NodeJS.ProcessEnv,
  cwd?: string,
): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(program, args, { env, cwd, encoding: 'utf8', timeout: 30_000 }, (err, stdout, stderr) => {
      const code = err ? (typeof err.code === 'number' ? err.code : 1) : 0;
      resolve({ code, stdout, stderr: stderr || (err && typeof err.code !== 'number' ? String(err.message) : '') });
    });
  });
}

/** slurmd -C: the node's real CPUs and memory, so slurm.conf never claims more than there is. */
function nodeResources(): { cpus: number; memoryMB: number } {
  const line = execFileSync('/usr/sbin/slurmd', ['-C'], { encoding: 'utf8' });
  const cpus = Number(/\bCPUs=(\d+)/.exec(line)?.[1] ?? os.cpus().length);
  const mem = Number(/\bRealMemory=(\d+)/.exec(line)?.[1] ?? Math.floor(os.totalmem() / 2 ** 20));
  return { cpus, memoryMB: Math.max(500, mem - 256) };
}

function slurmConf(o: { dir: string; node: string; ctldPort: number; slurmdPort: number; cpus: number; memoryMB: number }): string {
  const d = o.dir;
  return [
    '# Written by test/integration/slurm-cluster.ts: a one-node test cluster on localhost, no cgroups.',
    'ClusterName=slewsmithtest',
    `SlurmctldHost=${o.node}(127.0.0.1)`,
    `SlurmctldPort=${o.ctldPort}`,
    `SlurmdPort=${o.slurmdPort}`,
    'AuthType=auth/munge',
    'CredType=cred/munge',
    `AuthInfo=socket=${d}/munge/munge.socket`,
    'ProctrackType=proctrack/linuxproc',
    'TaskPlugin=task/none',
    'SwitchType=switch/none',
    'MpiDefault=none',
    'JobAcctGatherType=jobacct_gather/none',
    'JobCompType=jobcomp/none',
    'AccountingStorageType=accounting_storage/none',
    'ReturnToService=2',
    'SlurmUser=root',
    'SlurmdUser=root',
    'SchedulerType=sched/backfill',
    'SelectType=select/cons_tres',
    'SelectTypeParameters=CR_CPU',
    'MaxArraySize=100001',
    `StateSaveLocation=${d}/ctld`,
    `SlurmdSpoolDir=${d}/slurmd`,
    `SlurmctldPidFile=${d}/slurmctld.pid`,
    `SlurmdPidFile=${d}/slurmd.pid`,
    `SlurmctldLogFile=${d}/slurmctld.log`,
    `SlurmdLogFile=${d}/slurmd.log`,
    `PlugStackConfig=${d}/plugstack.conf`,
    `NodeName=${o.node} NodeAddr=127.0.0.1 CPUs=${o.cpus} RealMemory=${o.memoryMB} State=UNKNOWN`,
    `PartitionName=debug Nodes=${o.node} Default=YES MaxTime=INFINITE State=UP`,
    '',
  ].join('\n');
}

async function readPid(file: string, timeoutMs = 10_000): Promise<number> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    try {
      const pid = Number(readFileSync(file, 'utf8').trim());
      if (pid > 0 && alive(pid)) return pid;
    } catch {
      /* not written yet */
    }
    await sleep(100);
  }
  throw new Error(`no live process in ${file} after ${timeoutMs / 1000} s`);
}

const TERMINAL = new Set([
  'COMPLETED',
  'FAILED',
  'CANCELLED',
  'TIMEOUT',
  'NODE_FAIL',
  'OUT_OF_MEMORY',
  'BOOT_FAIL',
  'DEADLINE',
  'PREEMPTED',
]);

function parseJobs(text: string): JobRecord[] {
  return text
    .split('\n')
    .filter((l) => l.startsWith('JobId='))
    .map((l) => ({
      jobId: /\bJobId=(\d+)/.exec(l)?.[1] ?? '?',
      arrayTaskId: /\bArrayTaskId=(\S+)/.exec(l)?.[1] ?? null,
      state: /\bJobState=(\S+)/.exec(l)?.[1] ?? 'UNKNOWN',
      reason: /\bReason=(\S+)/.exec(l)?.[1] ?? '',
      exitCode: /\bExitCode=(\S+)/.exec(l)?.[1] ?? '',
    }));
}

/** Ended: a terminal state, or pending on a dependency that can never be met. */
function ended(j: JobRecord): boolean {
  return TERMINAL.has(j.state) || (j.state === 'PENDING' && j.reason === 'DependencyNeverSatisfied');
}

/** (b)+(c) Start the cluster, or return the one this process already runs. */
export async function startSlurmCluster(): Promise<SlurmCluster> {
  if (current) {
    current.holders++;
    return current.cluster;
  }
  const check = checkSlurmInstalled();
  if (!check.ok) throw new Error(check.message);
  await cleanupLeftovers();

  const dir = mkdtempSync(path.join(os.tmpdir(), 'slewsmith-slurm-cluster-'));
  chmodSync(dir, 0o755); // munged (user munge) must reach its socket folder inside
  const conf = path.join(dir, 'slurm.conf');
  const node = os.hostname().split('.')[0]!;
  const { cpus, memoryMB } = nodeResources();
  const [ctldPort, slurmdPort] = [await freePort(), await freePort()];
  const record: ClusterRecord = {
    id: path.basename(dir),
    dir,
    conf,
    owner: process.pid,
    pids: { munged: null, slurmctld: null, slurmd: null },
  };
  saveRecord(record);
  const env: NodeJS.ProcessEnv = { ...process.env, SLURM_CONF: conf };
  const logTail = (lines = 15) =>
    ['munge/munged.log', 'slurmctld.log', 'slurmd.log']
      .map((f) => {
        const p = path.join(dir, f);
        const text = existsSync(p) ? readFileSync(p, 'utf8').trimEnd().split('\n').slice(-lines).join('\n') : '(none)';
        return `--- ${f}\n${text}`;
      })
      .join('\n');
  const fail = async (what: string, detail = ''): Promise<never> => {
    const logs = logTail();
    await stopRecord(record, true);
    throw new Error(`${what}${detail ? `: ${detail}` : ''}\nlogs (kept in ${dir}):\n${logs}`);
  };

  try {
    // munged, as user munge, on its own socket. The folder must be owned by munge and readable by all.
    const mungeDir = path.join(dir, 'munge');
    mkdirSync(mungeDir, { mode: 0o755 });
    const munge = passwdEntry('munge')!;
    chownSync(mungeDir, munge.uid, munge.gid);
    for (const d of ['ctld', 'slurmd']) mkdirSync(path.join(dir, d));
    writeFileSync(path.join(dir, 'plugstack.conf'), '');
    writeFileSync(conf, slurmConf({ dir, node, ctldPort, slurmdPort, cpus, memoryMB }));

    const m = spawnSync(
      'runuser',
      [
        '-u',
        'munge',
        '--',
        '/usr/sbin/munged',
        `--socket=${mungeDir}/munge.socket`,
        `--key-file=${MUNGE_KEY}`,
        `--pid-file=${mungeDir}/munged.pid`,
        `--seed-file=${mungeDir}/munged.seed`,
        `--log-file=${mungeDir}/munged.log`,
      ],
      { encoding: 'utf8' },
    );
    if (m.status !== 0) await fail('munged did not start', (m.stderr || m.error?.message || '').trim());
    record.pids.munged = await readPid(path.join(mungeDir, 'munged.pid'));
    saveRecord(record);

    for (const daemon of ['slurmctld', 'slurmd'] as const) {
      const r = spawnSync(`/usr/sbin/${daemon}`, ['-f', conf], { env, encoding: 'utf8' });
      if (r.status !== 0) await fail(`${daemon} did not start`, (r.stderr || r.error?.message || '').trim());
      record.pids[daemon] = await readPid(path.join(dir, `${daemon}.pid`)).catch(() => fail(`${daemon} exited after starting`));
      saveRecord(record);
    }

    // Wait for the node to be idle.
    const until = Date.now() + 30_000;
    let last = '';
    for (;;) {
      const s = await run('/usr/bin/sinfo', ['-h', '-N', '-o', '%N %t'], env);
      last = (s.stdout + s.stderr).trim();
      if (s.code === 0 && new RegExp(`^${node} idle$`, 'm').test(s.stdout)) break;
      if (Date.now() > until) await fail('the node did not become idle within 30 s', `sinfo says: ${last}`);
      await sleep(300);
    }
  } catch (e) {
    if (existsSync(path.join(REGISTRY, `${record.id}.json`))) await stopRecord(record, true);
    throw e;
  }

  const submitted = new Set<string>();
  const cluster: SlurmCluster = {
    dir,
    conf,
    node,
    cpus,
    memoryMB,
    env,
    pids: { munged: record.pids.munged!, slurmctld: record.pids.slurmctld!, slurmd: record.pids.slurmd! },
    run: (program, args) => run(program, args, env),
    async submit(script, opts = {}) {
      const r = await run('/usr/bin/sbatch', ['--parsable', ...(opts.args ?? []), script], env, opts.cwd);
      const id = /^(\d+)(;\S+)?$/.exec(r.stdout.trim())?.[1];
      if (r.code !== 0 || !id) throw new Error(`sbatch refused ${script}: ${(r.stderr || r.stdout).trim()}`);
      submitted.add(id);
      return id;
    },
    async waitFor(jobIds, timeoutMs) {
      const until = Date.now() + timeoutMs;
      for (;;) {
        const out = new Map<string, JobRecord[]>();
        let done = true;
        for (const id of jobIds) {
          const r = await run('/usr/bin/scontrol', ['-o', 'show', 'job', id], env);
          if (r.code !== 0) throw new Error(`scontrol show job ${id} failed: ${r.stderr.trim()}`);
          const jobs = parseJobs(r.stdout);
          out.set(id, jobs);
          if (jobs.length === 0 || !jobs.every(ended)) done = false;
        }
        if (done) return out;
        if (Date.now() > until) {
          const states = [...out.entries()].map(
            ([id, js]) => `${id}: ${js.map((j) => `${j.jobId}/${j.arrayTaskId ?? '-'} ${j.state} ${j.reason}`).join(', ')}`,
          );
          throw new Error(`jobs not finished after ${timeoutMs / 1000} s:\n${states.join('\n')}\n${logTail()}`);
        }
        await sleep(500);
      }
    },
    logTail,
    async stop() {
      if (!current || current.cluster !== cluster) return;
      if (--current.holders > 0) return;
      current = null;
      const open = [...submitted];
      if (open.length) await run('/usr/bin/scancel', open, env);
      await stopRecord(record, process.env.SLEWSMITH_SLURM_KEEP === '1');
    },
  };
  current = { id: record.id, cluster, holders: 1 };
  // Safety net for a test process that ends without stop() (a crash, a timeout): signal the
  // daemons synchronously on exit; the next start or `cleanup` sweeps the rest.
  process.once('exit', () => {
    if (current?.cluster !== cluster) return;
    for (const [name, pid] of Object.entries(cluster.pids)) {
      const c = cmdline(pid);
      if (c && c.includes(name) && c.includes(dir)) process.kill(pid, 'SIGTERM');
    }
  });
  return cluster;
}

// The shell entry: `check` and `cleanup` (.ci/run runs cleanup when it exits).
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const cmd = process.argv[2];
  if (cmd === 'check') {
    const c = checkSlurmInstalled();
    console.log(c.message);
    process.exitCode = c.ok ? 0 : 1;
  } else if (cmd === 'cleanup') {
    const n = await cleanupLeftovers();
    console.log(`slurm test clusters stopped: ${n}`);
  } else {
    console.error('usage: node --import tsx test/integration/slurm-cluster.ts check|cleanup');
    process.exitCode = 2;
  }
}
