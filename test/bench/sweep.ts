/**
 * Robustness-sweep speed from the CLI (printed, never asserted): `slewsmith sweep` on the bundled
 * Tern-12 example, a 10 × 10 (ē, δ) grid (worst-case-eta 0…0.45 × hysteresis 0.05…0.5) flown by
 * three of its laws (sign switch, hysteretic, synergistic), seed 18, two worker threads; wall time
 * from spawning the command to its exit (Node start, TypeScript loading, worker start-up, every
 * cell, the text maps). Goal (issue 18): the full sweep, 200 cases per cell = 60,000 slews, in
 * ≤ 60 s wall on two cores.
 *
 * The full sweep takes about a minute per repetition, so by default the bench runs the same grid
 * with 20 cases per cell (6,000 slews), min and median of 3, and scales it to 200 cases: start-up
 * (a one-cell, one-case sweep, min of 3) + 10 × (reduced wall − start-up). The printout says which
 * figure is measured and which is scaled. `--full` runs the full sweep instead (min and median of
 * its repetitions, `--reps N`, default 1).
 *
 * Run: `node --import tsx test/bench/sweep.ts [--full] [--reps N]` or `npm run bench sweep`.
 */
import { spawnSync } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const FULL_CASES = 200;
const REDUCED_CASES = 20;
const GOAL_S = 60;

function sweepArgs(cases: number, grid: 'full' | 'tiny'): string[] {
  const axes =
    grid === 'full' ? ['--param', 'worst-case-eta=0:0.45:10', '--param2', 'hysteresis=0.05:0.5:10'] : ['--param', 'worst-case-eta=0.1,0.2'];
  return [
    'bin/slewsmith.mjs',
    'sweep',
    'assets/tern12-reversal.scenario.json',
    ...axes,
    '--runs',
    String(cases),
    '--controller',
    'sign,hyst,syn',
    '--seed',
    '18',
    '--workers',
    '2',
  ];
}

/** Wall and CPU seconds (user + system, main thread and workers) of one run, or a message when the command failed. */
function wall(args: string[]): { wallS: number; cpuS: number } | string {
  // bash's `time` reports the CPU time of the finished child; TIMEFORMAT prints user and system seconds
  const script = `TIMEFORMAT='cpu %U %S'; time "$0" "$@" > /dev/null 2> /dev/null`;
  const t0 = performance.now();
  const r = spawnSync('bash', ['-c', script, process.execPath, ...args], { cwd: root, encoding: 'utf8', maxBuffer: 1 << 26 });
  const wallS = (performance.now() - t0) / 1000;
  const m = /cpu (\d+\.\d+) (\d+\.\d+)/.exec(r.stderr || '');
  if (r.status !== 0 || !m) return `slewsmith sweep failed (exit ${r.status}): ${(r.stderr || '').trim().split('\n').pop()}`;
  return { wallS, cpuS: Number(m[1]) + Number(m[2]) };
}

function repeat(args: string[], n: number): { wall: number[]; cpu: number[] } | string {
  const wall_: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < n; i++) {
    const w = wall(args);
    if (typeof w === 'string') return w;
    wall_.push(w.wallS);
    cpu.push(w.cpuS);
  }
  return { wall: wall_.sort((a, b) => a - b), cpu: cpu.sort((a, b) => a - b) };
}

const median = (s: number[]) => (s.length % 2 ? s[(s.length - 1) / 2]! : 0.5 * (s[s.length / 2 - 1]! + s[s.length / 2]!));
const f1 = (x: number) => x.toFixed(1);

export async function benchSweep(argv: string[] = []): Promise<void> {
  const full = argv.includes('--full');
  const ri = argv.indexOf('--reps');
  const reps = ri >= 0 ? Math.max(1, Number(argv[ri + 1]) || 1) : full ? 1 : 3;
  console.log(
    `   machine: ${os.cpus().length} cores, 1-min load average ${os.loadavg()[0]!.toFixed(1)} at start (other jobs on the machine inflate every figure)`,
  );
  const slews = (cases: number) => (100 * cases * 3).toLocaleString('en-US');
  if (full) {
    const r = repeat(sweepArgs(FULL_CASES, 'full'), reps);
    if (typeof r === 'string') return void console.log(`   ${r}`);
    console.log(
      `   measured: 10 × 10 cells × ${FULL_CASES} cases × 3 laws = ${slews(FULL_CASES)} slews, --workers 2: ` +
        `median ${f1(median(r.wall))} s, min ${f1(r.wall[0]!)} s wall over ${reps} run${reps === 1 ? '' : 's'} (goal ≤ ${GOAL_S} s); ` +
        `CPU (user + system) median ${f1(median(r.cpu))} s`,
    );
    return;
  }
  const start = repeat(sweepArgs(1, 'tiny'), 3);
  if (typeof start === 'string') return void console.log(`   ${start}`);
  const r = repeat(sweepArgs(REDUCED_CASES, 'full'), reps);
  if (typeof r === 'string') return void console.log(`   ${r}`);
  const t0 = start.wall[0]!;
  const c0 = start.cpu[0]!;
  const k = FULL_CASES / REDUCED_CASES;
  const scaled = (x: number, x0: number) => x0 + k * Math.max(0, x - x0);
  console.log(`   measured: start-up (2 cells × 1 case × 3 laws, --workers 2): min ${f1(t0)} s wall, ${f1(c0)} s CPU, of 3`);
  console.log(
    `   measured: 10 × 10 cells × ${REDUCED_CASES} cases × 3 laws = ${slews(REDUCED_CASES)} slews, --workers 2: ` +
      `median ${f1(median(r.wall))} s, min ${f1(r.wall[0]!)} s wall; CPU median ${f1(median(r.cpu))} s (of ${reps})`,
  );
  const cpuFull = scaled(median(r.cpu), c0);
  console.log(
    `   SCALED (not measured) to ${FULL_CASES} cases per cell = ${slews(FULL_CASES)} slews: start-up + ${k} × (measured − start-up) = ` +
      `median ${f1(scaled(median(r.wall), t0))} s, min ${f1(scaled(r.wall[0]!, t0))} s wall (goal ≤ ${GOAL_S} s; measure with --full); ` +
      `${f1(cpuFull)} s CPU, i.e. about ${f1(t0 + (cpuFull - c0) / 2)} s wall on two otherwise idle cores (estimate: start-up + CPU / 2)`,
  );
}

if (import.meta.url === pathToFileURL(process.argv[1]!).href) await benchSweep(process.argv.slice(2));
