// Study worker threads started by the launcher, before the CLI itself is loaded: a worker loads
// the engine on its own (≈ 0.2–0.5 s of CPU each), which then overlaps the CLI's own load and its
// reading of the scenario instead of following them. main/cli/study.ts adopts these workers (only
// those started from the worker file it would start itself) and ends any it does not need.
// Plain JavaScript on purpose: it runs before any TypeScript loader.
import os from 'node:os';
import { Worker } from 'node:worker_threads';

/** Where the launcher leaves the started workers for main/cli/study.ts (a registered symbol). */
export const PRESTARTED = Symbol.for('slewsmith.prestartedStudyWorkers');

/**
 * How many study workers `slewsmith <argv>` will start, when that is clear from argv alone: a plain
 * `study <file>` run (not merge, slurm, --case or --help) with `--workers N` / `--runs N` written
 * as two words or not at all; 0 otherwise (the CLI then starts its workers itself, as before).
 * @param {readonly string[]} argv the arguments after the command name
 * @param {number} cores
 */
export function studyWorkersAhead(argv, cores) {
  if (argv[0] !== 'study' || argv[1] === undefined || argv[1] === 'merge' || argv[1] === 'slurm') return 0;
  let workers = cores;
  let runs = Infinity;
  for (let i = 1; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--help' || a === '-h' || a === '--case' || a.startsWith('--case=') || a.startsWith('--workers=') || a.startsWith('--runs='))
      return 0;
    if (a === '--workers' || a === '--runs') {
      const v = argv[i + 1];
      if (v === undefined || !/^[1-9][0-9]{0,7}$/.test(v)) return 0;
      if (a === '--workers') workers = Number(v);
      else runs = Number(v);
      i++;
    }
  }
  const n = Math.min(workers, runs, 64);
  return n >= 2 ? n : 0;
}

/**
 * Start the study workers `argv` asks for from `workerUrl` and leave them for the CLI. Each is
 * unref'd (it does not keep the process alive) until the CLI adopts it.
 * @param {readonly string[]} argv
 * @param {URL} workerUrl
 */
export function prestartStudyWorkers(argv, workerUrl) {
  const cores = typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length;
  const n = studyWorkersAhead(argv, cores);
  const workers = [];
  for (let i = 0; i < n; i++) {
    const w = new Worker(workerUrl);
    w.unref();
    // A worker that fails or ends before it is adopted leaves the list (the CLI starts its own).
    const drop = () => {
      const k = workers.indexOf(w);
      if (k >= 0) workers.splice(k, 1);
    };
    w.on('error', drop);
    w.on('exit', drop);
    workers.push(w);
  }
  globalThis[PRESTARTED] = { url: workerUrl.href, workers };
}
