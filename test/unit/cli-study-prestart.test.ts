/**
 * Study worker threads started by the launcher before the CLI loads (bin/study-prestart.mjs) and
 * adopted by main/cli/study.ts:
 * - studyWorkersAhead starts workers only for a plain `study <file>` run whose worker count is
 *   clear from argv (never for merge, slurm, --case, --help, one worker, or `--name=value` forms);
 * - threadPort adopts the launcher's workers (the same Worker objects) only when they run the
 *   worker file it would start itself, and endPrestartedWorkers ends the ones left over;
 * - the command through bin/slewsmith.mjs prints the same study with prestarted workers
 *   (`--workers 2`) as without (`--workers=2`, which the launcher leaves alone) and on one thread.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { Worker } from 'node:worker_threads';
import { PRESTARTED, prestartStudyWorkers, studyWorkersAhead } from '../../bin/study-prestart.mjs';
import { endPrestartedWorkers, threadPort } from '../../main/cli/study';

const root = path.resolve(__dirname, '../..');

describe('studyWorkersAhead', () => {
  it('counts the workers of a plain study run, and 0 whenever argv alone does not settle it', () => {
    const cases: [string[], number][] = [
      [['study', 'a.json'], 4],
      [['study', 'a.json', '--workers', '2'], 2],
      [['study', 'a.json', '--workers', '3', '--runs', '2'], 2],
      [['study', 'a.json', '--runs', '500', '--seed', '3', '--json'], 4],
      [['study', 'a.json', '--workers', '1'], 0],
      [['study', 'a.json', '--runs', '1'], 0],
      [['study', 'a.json', '--workers=2'], 0],
      [['study', 'a.json', '--runs=20'], 0],
      [['study', 'a.json', '--workers', 'two'], 0],
      [['study', 'a.json', '--workers', '0'], 0],
      [['study', 'a.json', '--workers'], 0],
      [['study', 'a.json', '--case', '3'], 0],
      [['study', 'a.json', '--help'], 0],
      [['study', 'merge', 'dir'], 0],
      [['study', 'slurm', 'a.json', '--shards', '4'], 0],
      [['study'], 0],
      [['fly', 'a.json'], 0],
      [['sweep', 'a.json'], 0],
      [['study', 'a.json', '--workers', '200'], 64],
    ];
    for (const [argv, n] of cases) expect(studyWorkersAhead(argv, 4), argv.join(' ')).toBe(n);
  });
});

describe('adopting the launcher’s workers', () => {
  it('threadPort takes the prestarted workers of its own worker file; the rest are ended', async () => {
    const own = pathToFileURL(path.join(root, 'main/cli/study-worker.mjs'));
    prestartStudyWorkers(['study', 'x.json', '--workers', '3'], own);
    const left = (globalThis as Record<symbol, { workers: Worker[] }>)[PRESTARTED]!.workers;
    const started = [...left];
    expect(started).toHaveLength(3);
    const a = threadPort().worker,
      b = threadPort().worker;
    expect(a).toBe(started[0]);
    expect(b).toBe(started[1]);
    const exited = new Promise((resolve) => started[2]!.once('exit', resolve));
    endPrestartedWorkers();
    expect(left).toHaveLength(0);
    await exited;
    await Promise.all([a.terminate(), b.terminate()]);

    // Workers of another file are never adopted.
    prestartStudyWorkers(['study', 'x.json', '--workers', '2'], pathToFileURL(path.join(root, 'main/cli/sweep-worker.mjs')));
    const other = [...(globalThis as Record<symbol, { workers: Worker[] }>)[PRESTARTED]!.workers];
    const c = threadPort().worker;
    expect(other).not.toContain(c);
    await c.terminate();
    endPrestartedWorkers();
  }, 60_000);
});

describe('the command with prestarted workers', () => {
  it('prints the same study as without them and as one thread', () => {
    const run = (...extra: string[]) => {
      const r = spawnSync(
        process.execPath,
        ['bin/slewsmith.mjs', 'study', 'assets/petrel16-pointing.scenario.json', '--runs', '6', '--seed', '5', '--json', ...extra],
        { cwd: root, encoding: 'utf8', maxBuffer: 1 << 26 },
      );
      expect(r.status, r.stderr).toBe(0);
      return r.stdout;
    };
    const prestarted = run('--workers', '2');
    expect(prestarted).toContain('"casesDone": 6');
    expect(run('--workers=2')).toBe(prestarted);
    expect(run('--workers', '1')).toBe(prestarted);
  }, 180_000);
});
