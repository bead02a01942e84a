/**
 * 10,000 dispersed slews from the CLI (printed, never asserted): `slewsmith study` on the bundled
 * Tern-12 example (its five laws × 2,000 cases, seed 11) with two worker threads, wall time from
 * spawning the command to its exit (includes Node start, the CLI's TypeScript loading, worker
 * start-up and the summary), median and min of 3. The case duration is the file's own study block.
 * Goal (issue 12): ≤ 8 s wall on two cores.
 *
 * Runs `bin/slewsmith.mjs`, i.e. the prebuilt bundle (`npm run build:cli`, run first by this bench
 * when the bundle is missing or older than its sources) and tsx otherwise; `SLEWSMITH_CLI=tsx` or
 * `=bundle` in the environment picks one (bin/cli-bundle.mjs) and then nothing is built.
 *
 * Run: `node --import tsx test/bench/cliStudy.ts` or `npm run bench cliStudy`.
 */
import { spawnSync } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chooseCli } from '../../bin/cli-bundle.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export async function benchCliStudy(): Promise<void> {
  const args = [
    'bin/slewsmith.mjs',
    'study',
    'assets/tern12-reversal.scenario.json',
    '--runs',
    '2000',
    '--seed',
    '11',
    '--workers',
    '2',
    '--json',
  ];
  // Which form the command runs: a stale or missing bundle falls back to tsx (seconds slower).
  // The goal is for the command as the README sets it up (with `npm run build:cli`): a missing or
  // stale bundle is built first, unless SLEWSMITH_CLI asks for one form.
  let choice = chooseCli(root, process.env);
  if (choice.kind === 'tsx' && !process.env.SLEWSMITH_CLI) {
    const b = spawnSync('npm', ['run', '--silent', 'build:cli'], { cwd: root, encoding: 'utf8' });
    console.log(
      `   built the CLI bundle first (${choice.reason})${b.status === 0 ? '' : `: failed, ${(b.stderr || b.stdout).trim().split('\n').pop()}`}`,
    );
    choice = chooseCli(root, process.env);
  }
  const form =
    choice.kind === 'bundle'
      ? 'the prebuilt bundle'
      : choice.kind === 'tsx'
        ? `tsx (${choice.reason}; \`npm run build:cli\` for the bundle)`
        : choice.message;
  console.log(`   running through ${form}`);
  const walls: number[] = [];
  let summary = '';
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    const r = spawnSync(process.execPath, args, { cwd: root, encoding: 'utf8', maxBuffer: 1 << 28 });
    walls.push(performance.now() - t0);
    if (r.status !== 0 && r.status !== 1) {
      console.log(`   slewsmith study failed (exit ${r.status}): ${(r.stderr || '').trim().split('\n').pop()}`);
      return;
    }
    try {
      const doc = JSON.parse(r.stdout);
      summary = `${doc.summary?.casesDone ?? '?'} cases`;
    } catch {
      summary = 'summary not JSON';
    }
  }
  const s = [...walls].sort((a, b) => a - b);
  console.log(
    `   slewsmith study tern12 --runs 2000 (× 5 laws = 10,000 slews) --workers 2 (${summary}; load ${os.loadavg()[0]!.toFixed(1)}): ` +
      `median ${(s[1]! / 1000).toFixed(1)} s, min ${(s[0]! / 1000).toFixed(1)} s wall (goal ≤ 8 s)`,
  );
}

if (import.meta.url === pathToFileURL(process.argv[1]!).href) await benchCliStudy();
