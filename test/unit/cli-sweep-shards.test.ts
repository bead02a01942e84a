/**
 * `slewsmith sweep --shard i/K` and `slewsmith sweep merge`: 1, 3 and 7 shards, given to the merge
 * in shuffled order, give byte for byte the cells.csv and sweep.json of one process running every
 * cell; foreign, duplicate and missing shards are refused naming the files and the missing cells.
 * Behaviour of our own command (no outside source: the reference is our single-process run). The
 * scenario is the invented MST-setting test vehicle of test/reference/sweep-fixtures.ts at 100 Hz
 * over 20 s, an 8-cell (ē, δ) grid with one case per cell. The single run is a separate process;
 * one shard comes from the CLI, the others are written from cells run in this thread (the test
 * checks that the CLI's shard file is byte for byte that text).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fsp from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { runInProcess, spawnCli, STACK_TRACE } from './cli-harness';
import { mstScenario } from '../reference/sweep-fixtures';
import { sweepShardCells, sweepShardFileName, sweepShardText } from '../../app/engine/study/sweepShard';
import { validateSweep } from '../../app/engine/study/sweep';
import { runSweepCell, sweepInfo } from '../../app/engine/study/sweepRun';

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

/** The sweep as the CLI defines it from sweepArgs (same grid, runs, seed, controllers and level). */
function sweepDef(seed: number) {
  const d = validateSweep({
    axes: [
      { parameter: 'worst-case-eta', values: [0.05, 0.15, 0.25, 0.35] },
      { parameter: 'hysteresis', values: [0.1, 0.3] },
    ],
    runs: 1,
    seed,
    controllers: ['hyst', 'sign'],
    level: 0.5,
  });
  if (!d.ok) throw new Error(JSON.stringify(d.errors));
  return d.value;
}

/**
 * Every cell of the sweep run in this thread, and a writer of shard i of K from them: the text
 * `slewsmith sweep --shard i/K` writes (checked against a real one below), so that the merges of
 * 1, 3 and 7 shards need no CLI run per shard (each costs a worker start-up of several seconds).
 */
async function engineShards(seed: number, tool: string) {
  const json = JSON.parse(await fsp.readFile(scenario, 'utf8')) as unknown;
  const def = sweepDef(seed);
  const inf = sweepInfo(json, def);
  if (!inf.ok) throw new Error(JSON.stringify(inf.errors));
  const cells = Array.from({ length: inf.value.cells }, (_, i) => {
    const c = runSweepCell(json, def, i);
    if (!c.ok || !c.value) throw new Error(`cell ${i} did not run`);
    return c.value;
  });
  return async (i: number, k: number, folder: string): Promise<string> => {
    const { first, end } = sweepShardCells(i, k, cells.length);
    await fsp.mkdir(folder, { recursive: true });
    const file = path.join(folder, sweepShardFileName(i, k));
    await fsp.writeFile(file, sweepShardText(inf.value, json, tool, i, k, cells.slice(first, end)));
    return file;
  };
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
  let cliShard = '';
  let writeShard: Awaited<ReturnType<typeof engineShards>>;
  let writeForeign: Awaited<ReturnType<typeof engineShards>>;
  beforeAll(async () => {
    single = path.join(dir, 'single');
    const r = await spawnCli(sweepArgs(['--out', single]));
    expect(r.code, r.stderr).toBe(0);
    const s = await runInProcess(sweepArgs(['--shard', '1/3', '--out', path.join(dir, 'cli')]));
    expect(s.code, s.stderr).toBe(0);
    expect(s.stdout).toContain('cells 2–4 of 8 done');
    cliShard = path.join(dir, 'cli', sweepShardFileName(1, 3));
    const tool = (JSON.parse(await fsp.readFile(cliShard, 'utf8')) as { tool: string }).tool;
    writeShard = await engineShards(9, tool);
    writeForeign = await engineShards(10, tool);
  }, 120_000);

  it('the CLI shard file is the shard text of its cells (what the merges below are fed)', async () => {
    const made = await writeShard(1, 3, path.join(dir, 'engine'));
    expect(await fsp.readFile(cliShard, 'utf8')).toBe(await fsp.readFile(made, 'utf8'));
  });

  for (const k of [1, 3, 7]) {
    it(`${k} shard${k === 1 ? '' : 's'} in shuffled order merge to the single run's bytes`, async () => {
      const folder = path.join(dir, `k${k}`);
      const files: string[] = [];
      for (let i = 0; i < k; i++) files.push(await writeShard(i, k, folder));
      if (k === 3) files[1] = cliShard; // one of them from the CLI itself
      const out = path.join(dir, `merged${k}`);
      const m = await runInProcess(['sweep', 'merge', ...shuffled(files), '--out', out]);
      expect(m.code, m.stderr).toBe(0);
      expect(m.stderr).not.toMatch(STACK_TRACE);
      expect(await read(out, 'sweep.json')).toBe(await read(single, 'sweep.json'));
      expect(await read(out, 'cells.csv')).toBe(await read(single, 'cells.csv'));
      expect(m.stdout).toContain('Hysteretic [hyst]');
      // the theory line of the (ē, δ) grid, clipped to the overlap of ē ∈ [0.05, 0.35] and δ ∈ [0.1, 0.3] (MST 2011)
      expect(m.stdout).toContain(
        'theory: ē = δ — from (worst-case-eta, hysteresis) = (0.1, 0.1) to (0.3, 0.3) (Mayhew, Sanfelice & Teel 2011',
      );
    });
  }

  it('a folder works as well as its files; --out defaults to it', async () => {
    const folder = path.join(dir, 'k7');
    const m = await runInProcess(['sweep', 'merge', folder]);
    expect(m.code, m.stderr).toBe(0);
    expect(await read(folder, 'sweep.json')).toBe(await read(single, 'sweep.json'));
  });

  it('refuses a missing shard, naming the shard and its cells with their grid values', async () => {
    const files = [0, 2].map((i) => path.join(dir, 'k3', sweepShardFileName(i, 3)));
    const m = await runInProcess(['sweep', 'merge', ...files, '--out', path.join(dir, 'bad1')]);
    expect(m.code).toBe(2);
    // shard 1 of 3 over 8 cells holds cells 2–4 (⌊8/3⌋ = 2 to ⌊16/3⌋ = 5); the first axis varies fastest
    expect(m.stderr).toContain('1 of 3 shards are missing: 1');
    expect(m.stderr).toContain('cell 2 (worst-case-eta = 0.25, hysteresis = 0.1)');
    expect(m.stderr).toContain('cell 4 (worst-case-eta = 0.05, hysteresis = 0.3)');
    expect(m.stderr).not.toMatch(STACK_TRACE);
  });

  it('refuses a shard given twice, an overlapping one and a shard of another sweep, naming the files', async () => {
    const three = [0, 1, 2].map((i) => path.join(dir, 'k3', sweepShardFileName(i, 3)));
    const d = await runInProcess(['sweep', 'merge', ...three, three[1]!, '--out', path.join(dir, 'bad2')]);
    expect(d.code).toBe(2);
    expect(d.stderr).toContain(`${three[1]} and ${three[1]} are the same shard (1 of 3, cells 2–4)`);
    const other = await writeForeign(1, 3, path.join(dir, 'seed10'));
    const f = await runInProcess(['sweep', 'merge', three[0]!, other, three[2]!, '--out', path.join(dir, 'bad3')]);
    expect(f.code).toBe(2);
    expect(f.stderr).toContain(`${other} and ${three[0]} are from sweeps with different seeds (10, 9)`);
    const seven = path.join(dir, 'k7', sweepShardFileName(3, 7));
    const o = await runInProcess(['sweep', 'merge', ...three, seven, '--out', path.join(dir, 'bad4')]);
    expect(o.code).toBe(2);
    expect(o.stderr).toMatch(/sweep-shard-00003-of-00007\.slewsmith-sweep-shard \(cells 3–3\) overlaps .*sweep-shard-00001-of-00003/);
  });

  it('refuses files that are not shards, damaged shards and bad --shard options, naming them', async () => {
    const m = await runInProcess(['sweep', 'merge', scenario, '--out', path.join(dir, 'bad5')]);
    expect(m.code).toBe(2);
    expect(m.stderr).toContain(`${scenario}: not a Slewsmith sweep shard`);
    const cut = path.join(dir, 'cut.slewsmith-sweep-shard');
    await fsp.writeFile(cut, (await fsp.readFile(cliShard, 'utf8')).slice(0, 500));
    const c = await runInProcess(['sweep', 'merge', cut, '--out', path.join(dir, 'bad7')]);
    expect(c.code).toBe(2);
    expect(c.stderr).toContain(`${cut}: not JSON`);
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
