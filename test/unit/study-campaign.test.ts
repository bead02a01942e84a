/**
 * Sharded studies and the exact merge, through the CLI (worker threads, real files):
 * - a single-process study with --out writes cases.csv and summary.json (the reference);
 * - the same study as 1, 7 and 20 shards (`--shard i/K`), merged (`study merge`), gives the same
 *   bytes; so does a merge of the 7 shards given as files in a shuffled order;
 * - re-running a shard replaces its file with identical bytes;
 * - the merge refuses a missing shard (listing its index), a duplicate, and shards of another seed
 *   or another program version, naming the files, exit 2.
 * Reference: the single-process run of the same seed (the definition of "the same answer").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { runCli } from '../../main/cli/index';
import { testVehicleScenario } from './study-fixtures';

const study = {
  runs: 40,
  seed: 9071,
  durationS: 60,
  stopAfterSettledForS: 5,
  controllers: ['pd', 'hyst'],
  worstCases: 4,
  dispersions: {
    initialAttitude: { mode: 'uniform' },
    initialRateDegPerS: 0.05,
    inertia: { momentSigmaFraction: 0.05, axisMisalignmentDeg: 1 },
    wheels: { torqueDegradationMax: 0.2, failOneWheelProbability: 0.1 },
    controlRateHz: [5, 10],
  },
};

const root = mkdtempSync(path.join(tmpdir(), 'slewsmith-campaign-'));
const scenario = path.join(root, 'test.scenario.json');
writeFileSync(scenario, JSON.stringify(testVehicleScenario(study)));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const io = () => {
  const out: string[] = [];
  const err: string[] = [];
  return { out, err, io: { out: (s: string) => out.push(s), err: (s: string) => err.push(s) } };
};

async function cli(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const c = io();
  const code = await runCli(args, c.io);
  return { code, out: c.out.join('\n'), err: c.err.join('\n') };
}

/** Run shards `which` of K into dir (one worker thread each: the machine is shared). */
async function shards(k: number, dir: string, which: number[] = Array.from({ length: k }, (_, i) => i), file = scenario) {
  for (const i of which) {
    const r = await cli(['study', file, '--shard', `${i}/${k}`, '--out', dir, '--workers', '1']);
    if (r.code !== 0) throw new Error(`shard ${i}/${k}: ${r.err}`);
  }
}

const read = (dir: string) => ({
  csv: readFileSync(path.join(dir, 'cases.csv'), 'utf8'),
  json: readFileSync(path.join(dir, 'summary.json'), 'utf8'),
});

const single = path.join(root, 'single');
const dir7 = path.join(root, 'k7');
let ref: { csv: string; json: string };

beforeAll(async () => {
  const r = await cli(['study', scenario, '--out', single, '--workers', '2']);
  if (r.code !== 0) throw new Error(r.err);
  ref = read(single);
  await shards(7, dir7);
}, 240_000);

describe('sharded study and exact merge', () => {
  it('the reference holds every case and shares with intervals', () => {
    const rows = ref.csv.split('\n').filter((l) => /^\d+,/.test(l));
    expect(rows).toHaveLength(40 * 2);
    const s = JSON.parse(ref.json);
    expect(s.version).toBe(2);
    const sh = s.summary.controllers[0].shares.settled;
    expect(sh.of).toBe(s.summary.controllers[0].flyable);
    expect(sh.low).toBeLessThanOrEqual(sh.share);
    expect(sh.high).toBeGreaterThanOrEqual(sh.share);
  });

  it('7 shards merged give the single-process bytes; the merge prints shares with intervals', async () => {
    expect(readdirSync(dir7).filter((n) => n.endsWith('.slewsmith-shard'))).toHaveLength(7);
    const r = await cli(['study', 'merge', dir7]);
    expect(r.code, r.err).toBe(0);
    const m = read(dir7);
    expect(m.csv).toBe(ref.csv);
    expect(m.json).toBe(ref.json);
    expect(r.out).toMatch(/settled \d+\.\d% \[/);
  }, 60_000);

  it('1 and 20 shards give the same bytes too', async () => {
    for (const k of [1, 20]) {
      const dir = path.join(root, `k${k}`);
      await shards(k, dir);
      const r = await cli(['study', 'merge', dir]);
      expect(r.code, r.err).toBe(0);
      const m = read(dir);
      expect(m.csv).toBe(ref.csv);
      expect(m.json).toBe(ref.json);
    }
  }, 300_000);

  it('a shuffled merge order gives the same bytes', async () => {
    const files = readdirSync(dir7)
      .filter((n) => n.endsWith('.slewsmith-shard'))
      .map((n) => path.join(dir7, n));
    const shuffled = [files[4]!, files[0]!, files[6]!, files[2]!, files[5]!, files[1]!, files[3]!];
    const out = path.join(root, 'shuffled');
    const r = await cli(['study', 'merge', ...shuffled, '--out', out]);
    expect(r.code, r.err).toBe(0);
    expect(read(out)).toEqual(ref);
  }, 60_000);

  it('re-running a shard replaces its file with the same bytes', async () => {
    const f = path.join(dir7, 'shard-00003-of-00007.slewsmith-shard');
    const before = readFileSync(f, 'utf8');
    await shards(7, dir7, [3]);
    expect(readFileSync(f, 'utf8')).toBe(before);
    expect(before.split('\n')[0]).toContain('"format":"slewsmith-study-shard"');
  }, 60_000);

  it('refuses a missing shard and lists its index', async () => {
    const dir = path.join(root, 'missing');
    mkdirSync(dir);
    for (const n of readdirSync(dir7).filter((x) => x.endsWith('.slewsmith-shard') && !x.includes('00002-of') && !x.includes('00005-of')))
      copyFileSync(path.join(dir7, n), path.join(dir, n));
    const r = await cli(['study', 'merge', dir]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/2 of 7 shards are missing: 2, 5 \(cases 11–16, 28–33\)/);
  }, 60_000);

  it('refuses a duplicate shard, naming both files', async () => {
    const dir = path.join(root, 'dup');
    mkdirSync(dir);
    copyFileSync(path.join(dir7, 'shard-00001-of-00007.slewsmith-shard'), path.join(dir, 'shard-00001-of-00007.slewsmith-shard'));
    const r = await cli(['study', 'merge', dir7, dir]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(
      /dup\/shard-00001-of-00007\.slewsmith-shard and .*k7\/shard-00001-of-00007\.slewsmith-shard are the same shard|k7\/shard-00001-of-00007\.slewsmith-shard and .*dup\/shard-00001-of-00007\.slewsmith-shard are the same shard/,
    );
  }, 60_000);

  it('refuses shards of another seed and of another version, naming the files', async () => {
    const other = path.join(root, 'other-seed.scenario.json');
    writeFileSync(other, JSON.stringify(testVehicleScenario({ ...study, seed: 9072 })));
    const dir = path.join(root, 'mixed');
    await shards(7, dir, [0], other);
    for (const n of readdirSync(dir7).filter((x) => x.endsWith('.slewsmith-shard') && !x.includes('00000-of')))
      copyFileSync(path.join(dir7, n), path.join(dir, n));
    const r = await cli(['study', 'merge', dir]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(
      /shard-00001-of-00007\.slewsmith-shard and .*shard-00000-of-00007\.slewsmith-shard are from studies with different seeds \(9071, 9072\)/,
    );

    const vdir = path.join(root, 'version');
    mkdirSync(vdir);
    for (const n of readdirSync(dir7).filter((x) => x.endsWith('.slewsmith-shard'))) {
      const text = readFileSync(path.join(dir7, n), 'utf8');
      writeFileSync(
        path.join(vdir, n),
        n.includes('00004-of') ? text.replace('"tool":"Slewsmith 0.1.0"', '"tool":"Slewsmith 0.0.9"') : text,
      );
    }
    const v = await cli(['study', 'merge', vdir]);
    expect(v.code).toBe(2);
    expect(v.err).toMatch(
      /shard-00004-of-00007\.slewsmith-shard and .* were written by different versions \(Slewsmith 0\.0\.9, Slewsmith 0\.1\.0\)/,
    );
  }, 60_000);

  it('refuses a bad --shard with exit 2, naming the option', async () => {
    for (const [spec, msg] of [
      ['7/7', /shard index must be below the shard count/],
      ['1-7', /--shard must be i\/K/],
      ['0/41', /41 shards for 40 cases/],
    ] as const) {
      const r = await cli(['study', scenario, '--shard', spec, '--out', path.join(root, 'bad')]);
      expect(r.code, spec).toBe(2);
      expect(r.err).toMatch(msg);
    }
  }, 60_000);
});
