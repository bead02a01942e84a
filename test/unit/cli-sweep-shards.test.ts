/**
 * `slewsmith sweep --shard i/K` and `slewsmith sweep merge`: 1, 3 and 7 shards, given to the merge
 * in shuffled order, give byte for byte the cells.csv and sweep.json of one process running every
 * cell; foreign, duplicate and missing shards are refused naming the files and the missing cells.
 * Behaviour of our own command (no outside source: the reference is our single-process run). The
 * scenario is the invented MST-setting test vehicle of test/reference/sweep-fixtures.ts at 100 Hz
 * over 20 s, an 8-cell (ē, δ) grid with one case per cell.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fsp from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { runInProcess, spawnCli, STACK_TRACE } from './cli-harness';
import { mstScenario } from '../reference/sweep-fixtures';
import { sweepShardFileName } from '../../app/engine/study/sweepShard';

let dir = '';
let scenario = '';
beforeAll(async () => {
  dir = await fsp.mkdtemp(path.join(os.tmpdir(), 'slewsmith-sweep-shards-'));
  scenario = path.join(dir, 'mst.scenario.json');
  const base = mstScenario({ controlRateHz: 100, rk4StepsPerSample: 10, durationS: 20, hysteresis: 0.4, noiseMode: 'band-edge' });
  const json = {
    ...base,
    simulation: { ...base.simulation, settleAngleDeg: 60, settleRateDegPerS: 20 },
    study: { ...base.study, dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 1 } } },
  };
  await fsp.writeFile(scenario, JSON.stringify(json));
});
afterAll(async () => {
  if (dir) await fsp.rm(dir, { recursive: true, force: true });
});

const sweepArgs = (extra: string[], seed = '9') => [
  'sweep',
  scenario,
  '--param',
  'worst-case-eta=0.05,0.15,0.25,0.35',
  '--param2',
  'hysteresis=0.1,0.3',
  '--runs',
  '1',
  '--controller',
  'hyst,sign',
  '--seed',
  seed,
  '--workers',
  '1',
  ...extra,
];

/** Run shards `which` (default all) of K of the sweep into `folder` (in process); their files in shard order. */
async function runShards(k: number, folder: string, seed = '9', which?: number[]): Promise<string[]> {
  const files: string[] = [];
  for (const i of which ?? Array.from({ length: k }, (_, j) => j)) {
    const r = await runInProcess(sweepArgs(['--shard', `${i}/${k}`, '--out', folder], seed));
    expect(r.code, r.stderr).toBe(0);
    files.push(path.join(folder, sweepShardFileName(i, k)));
  }
  return files;
}

/** A fixed shuffle (reverse, then swap neighbours) so that no merge sees its shards in order. */
const shuffled = (xs: string[]) => {
  const r = [...xs].reverse();
  for (let i = 0; i + 1 < r.length; i += 2) [r[i], r[i + 1]] = [r[i + 1]!, r[i]!];
  return r;
};

const read = (d: string, f: string) => fsp.readFile(path.join(d, f), 'utf8');

describe('slewsmith sweep --shard / sweep merge', () => {
  let single = '';
  beforeAll(async () => {
    single = path.join(dir, 'single');
    const r = await spawnCli(sweepArgs(['--out', single]));
    expect(r.code, r.stderr).toBe(0);
  }, 60_000);

  for (const k of [1, 3, 7]) {
    it(`${k} shard${k === 1 ? '' : 's'} in shuffled order merge to the single run's bytes`, async () => {
      const folder = path.join(dir, `k${k}`);
      const files = await runShards(k, folder);
      const out = path.join(dir, `merged${k}`);
      const m = await runInProcess(['sweep', 'merge', ...shuffled(files), '--out', out]);
      expect(m.code, m.stderr).toBe(0);
      expect(m.stderr).not.toMatch(STACK_TRACE);
      expect(await read(out, 'sweep.json')).toBe(await read(single, 'sweep.json'));
      expect(await read(out, 'cells.csv')).toBe(await read(single, 'cells.csv'));
      expect(m.stdout).toContain('Hysteretic [hyst]');
    }, 120_000);
  }

  it('a folder works as well as its files; --out defaults to it', async () => {
    const folder = path.join(dir, 'k3');
    const m = await runInProcess(['sweep', 'merge', folder]);
    expect(m.code, m.stderr).toBe(0);
    expect(await read(folder, 'sweep.json')).toBe(await read(single, 'sweep.json'));
  });

  it('refuses a missing shard, naming the shard and its cells with their grid values', async () => {
    const files = [0, 2].map((i) => path.join(dir, 'k3', sweepShardFileName(i, 3)));
    const m = await runInProcess(['sweep', 'merge', ...files, '--out', path.join(dir, 'bad1')]);
    expect(m.code).toBe(2);
    // shard 1 of 3 over 8 cells holds cells 2–4 (⌊8/3⌋ = 2 to ⌊16/3⌋ = 5)
    expect(m.stderr).toContain('1 of 3 shards are missing: 1');
    expect(m.stderr).toContain('cell 2 (worst-case-eta = 0.25, hysteresis = 0.1)');
    expect(m.stderr).toContain('cell 4 (worst-case-eta = 0.05, hysteresis = 0.3)');
    expect(m.stderr).not.toMatch(STACK_TRACE);
  });

  it('refuses a shard given twice and a shard of another sweep, naming both files', async () => {
    const three = [0, 1, 2].map((i) => path.join(dir, 'k3', sweepShardFileName(i, 3)));
    const d = await runInProcess(['sweep', 'merge', ...three, three[1]!, '--out', path.join(dir, 'bad2')]);
    expect(d.code).toBe(2);
    expect(d.stderr).toContain(`${three[1]} and ${three[1]} are the same shard (1 of 3, cells 2–4)`);
    const other = await runShards(3, path.join(dir, 'seed10'), '10', [1]);
    const f = await runInProcess(['sweep', 'merge', three[0]!, other[0]!, three[2]!, '--out', path.join(dir, 'bad3')]);
    expect(f.code).toBe(2);
    expect(f.stderr).toContain(`${other[0]} and ${three[0]} are from sweeps with different seeds (10, 9)`);
    const overlap = await runInProcess([
      'sweep',
      'merge',
      ...three,
      path.join(dir, 'k7', sweepShardFileName(3, 7)),
      '--out',
      path.join(dir, 'bad4'),
    ]);
    expect(overlap.code).toBe(2);
    expect(overlap.stderr).toMatch(/overlaps .*sweep-shard-00001-of-00003/);
  }, 120_000);

  it('refuses files that are not shards, and bad --shard options, naming them', async () => {
    const m = await runInProcess(['sweep', 'merge', scenario, '--out', path.join(dir, 'bad5')]);
    expect(m.code).toBe(2);
    expect(m.stderr).toContain(`${scenario}: not a Slewsmith sweep shard`);
    const n = await runInProcess(sweepArgs(['--shard', '8/9', '--out', path.join(dir, 'bad6')]));
    expect(n.code).toBe(2);
    expect(n.stderr).toContain('--shard 8/9: 9 shards for a grid of 8 cells would leave shards empty');
    const o = await runInProcess(sweepArgs(['--shard', '0/2']));
    expect(o.code).toBe(2);
    expect(o.stderr).toContain('--shard needs --out DIR');
    const p = await runInProcess(['sweep', 'merge', path.join(dir, 'nothing-here')]);
    expect(p.code).toBe(2);
    expect(p.stderr).toContain('no such file or folder');
  });
});
