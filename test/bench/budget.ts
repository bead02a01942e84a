/**
 * The resource budget's reference case (README "Resource limits", app/engine/pipeline/budget.ts):
 * the invented Lumen-6 demo flown for 24 h at its 10 Hz control rate with its three controllers
 * (follow-plan), through the real CLI process (`fly`, simulation in the worker thread, exports
 * streamed to disk at 1 Hz in all three formats). Prints wall time, the child's peak resident set
 * (GNU time's %M, kB) and the files written — figures, never asserted. Also prints the refusal of a
 * 10-day run at 100 Hz and how long it took.
 *
 * Run: `node --import tsx test/bench/budget.ts` (takes minutes; not part of `npm run bench` loops).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const bin = path.join(root, 'bin/slewsmith.mjs');
const dir = mkdtempSync(path.join(os.tmpdir(), 'slewsmith-budget-'));

function scenario(name: string, edit: (j: any) => void): string {
  const j = JSON.parse(readFileSync(path.join(root, 'assets/lumen6-imaging.scenario.json'), 'utf8'));
  edit(j);
  const p = path.join(dir, name);
  writeFileSync(p, JSON.stringify(j));
  return p;
}

function timed(args: string[]): { code: number | null; rssKb: number; wallS: number; stderr: string } {
  const t0 = Date.now();
  const r = spawnSync('/usr/bin/time', ['-f', 'PEAK_RSS_KB %M', process.execPath, bin, ...args], { encoding: 'utf8', cwd: root });
  const m = /PEAK_RSS_KB (\d+)/.exec(r.stderr);
  return { code: r.status, rssKb: m ? Number(m[1]) : NaN, wallS: (Date.now() - t0) / 1000, stderr: r.stderr };
}

try {
  const day = scenario('day.scenario.json', (j) => {
    j.simulation.durationS = 86400;
    j.simulation.mode = 'follow-plan';
  });
  const out = path.join(dir, 'out');
  const r = timed(['fly', day, '--mode', 'follow-plan', '--rate', '1', '--out', out, '--creation-date', '2030-03-13T08:00:00Z']);
  console.log(
    `24 h at 10 Hz, 3 controllers, follow-plan: exit ${r.code}, ${r.wallS.toFixed(1)} s wall, peak RSS ${(r.rssKb / 1024).toFixed(0)} MiB`,
  );
  for (const f of readdirSync(out)) console.log(`  ${f}: ${(statSync(path.join(out, f)).size / 1e6).toFixed(1)} MB`);
  if (r.code !== 0) console.log(r.stderr.split('\n').slice(-8).join('\n'));

  const tenDays = scenario('ten-days.scenario.json', (j) => {
    j.simulation.durationS = 864000;
    j.vehicle.controlRateHz = 100;
  });
  const t = timed(['fly', tenDays, '--out', path.join(dir, 'refused')]);
  console.log(`10 days at 100 Hz: exit ${t.code} after ${t.wallS.toFixed(1)} s, peak RSS ${(t.rssKb / 1024).toFixed(0)} MiB`);
  console.log(
    t.stderr
      .split('\n')
      .filter((l) => l && !l.startsWith('PEAK'))
      .slice(0, 6)
      .join('\n'),
  );
} finally {
  rmSync(dir, { recursive: true, force: true });
}
