/**
 * The study's parallel path, run for real: Node worker threads started from
 * main/cli/study-worker.mjs (which registers tsx itself). Assertions:
 * - the same study with 1 and 2 worker threads gives identical per-case results, and the same as
 *   the single-thread runner (each case depends only on (seed, index));
 * - cancelling keeps the finished cases and reports the study as incomplete;
 * - the CLI command: summary table and files with exit 0, `--case` writes a valid scenario,
 *   bad options / bad study block exit 2.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { threadPort } from '../../main/cli/study';
import { runCli } from '../../main/cli/index';
import { startStudyParallel, inThreadPort } from '../../app/engine/study/parallel';
import { runStudy } from '../../app/engine/study/runner';
import type { CaseRecord } from '../../app/engine/study/runCase';
import { CAUTION_TEXT } from '../../app/engine/caution';
import { validateScenario } from '../../app/engine/scenario/validate';
import { testVehicleScenario } from './study-fixtures';

const study = {
  runs: 7,
  seed: 4242,
  durationS: 120,
  stopAfterSettledForS: 5,
  controllers: ['pd', 'hyst'],
  dispersions: {
    initialAttitude: { mode: 'uniform' },
    initialRateDegPerS: 0.05,
    inertia: { momentSigmaFraction: 0.05, axisMisalignmentDeg: 1 },
    wheels: { torqueDegradationMax: 0.2 },
    sensors: { attitudeNoiseScale: [0.5, 2] },
    controlRateHz: [5, 10],
  },
};
const json = testVehicleScenario(study);

/** Plain-data view of records (typed arrays to arrays) for deep equality. */
const plain = (rs: CaseRecord[]) =>
  rs.map((r) => ({ draw: r.draw, runs: r.runs.map((x) => ({ ...x, errorTraceDeg: Array.from(x.errorTraceDeg) })) }));

const threads: ReturnType<typeof threadPort>[] = [];
function ports(n: number) {
  const t = Array.from({ length: n }, () => threadPort());
  threads.push(...t);
  return t.map((x) => x.port);
}
afterAll(async () => {
  await Promise.all(threads.map((t) => t.worker.terminate()));
});

describe('parallel study in worker threads', () => {
  it('1 worker and 2 workers give identical per-case results, equal to the single-thread run', async () => {
    const one = await startStudyParallel(json, ports(1), { chunkSize: 2 }).result;
    const two = await startStudyParallel(json, ports(2), { chunkSize: 1 }).result;
    const ref = runStudy(json);
    if (!one.ok || !two.ok || !ref.ok) throw new Error('study refused');
    expect(one.value.records.map((r) => r.draw.index)).toEqual([0, 1, 2, 3, 4, 5, 6]);
    expect(plain(two.value.records)).toEqual(plain(one.value.records));
    expect(plain(one.value.records)).toEqual(plain(ref.value.records));
    expect(two.value.summary).toEqual(ref.value.summary);
    expect(one.value.cancelled).toBe(false);
  }, 60_000);

  it('cancel keeps the finished cases (in-thread ports) and marks the study incomplete', async () => {
    const p = startStudyParallel(testVehicleScenario({ ...study, runs: 40 }), [inThreadPort()], {
      chunkSize: 1,
      onProgress: (pr) => {
        if (pr.done === 3) p.cancel();
      },
    });
    const r = await p.result;
    if (!r.ok) throw new Error('study refused');
    expect(r.value.cancelled).toBe(true);
    expect(r.value.records.length).toBeGreaterThanOrEqual(3);
    expect(r.value.records.length).toBeLessThan(40);
    expect(r.value.summary.incomplete).toBe(true);
    expect(r.value.summary.casesDone).toBe(r.value.records.length);
  });

  it('an invalid study block is refused by the workers with every problem named', async () => {
    const bad = testVehicleScenario({ ...study, runs: 0, controllers: ['nope'], dispersions: { sensors: { attitudeNoiseScale: [2, 1] } } });
    const r = await startStudyParallel(bad, ports(2)).result;
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const paths = r.errors.map((e) => e.path);
    expect(paths).toContain('study.runs');
    // Cross-field rules are checked once the structure is valid: fix runs and see them.
    const r2 = await startStudyParallel(
      testVehicleScenario({ ...study, controllers: ['nope'], dispersions: { sensors: { attitudeNoiseScale: [2, 1] } } }),
      ports(1),
    ).result;
    expect(r2.ok).toBe(false);
    if (r2.ok) return;
    expect(r2.errors.map((e) => `${e.path}|${e.rule}`).sort()).toEqual([
      'study.controllers[0]|unknown-id',
      'study.dispersions.sensors.attitudeNoiseScale|min-max',
    ]);
  }, 60_000);
});

describe('slewsmith study (CLI)', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'slewsmith-study-'));
  const file = path.join(dir, 'test.scenario.json');
  writeFileSync(file, JSON.stringify(json));
  const io = () => {
    const out: string[] = [];
    const err: string[] = [];
    return { out, err, io: { out: (s: string) => out.push(s), err: (s: string) => err.push(s) } };
  };

  it('prints the summary table, writes cases.csv and summary.json, exit 0', async () => {
    const c = io();
    const code = await runCli(['study', file, '--runs', '4', '--workers', '2', '--out', dir], c.io);
    expect(code).toBe(0);
    const text = c.out.join('\n');
    expect(text).toContain('4 of 4 cases');
    expect(text).toMatch(/PD \[pd\]\s+4\s/);
    expect(text).toContain('not flight software');
    expect(c.err.join('\n')).toMatch(/study: 4\/4 cases/);
    const csv = readFileSync(path.join(dir, 'cases.csv'), 'utf8').split('\n');
    expect(csv[0]).toBe(`# CAUTION: ${CAUTION_TEXT}`);
    const header = csv.findIndex((l) => l.startsWith('case,controller,'));
    expect(csv.slice(header + 1).filter(Boolean)).toHaveLength(4 * 2);
    const summary = JSON.parse(readFileSync(path.join(dir, 'summary.json'), 'utf8'));
    expect(summary.caution).toBe(CAUTION_TEXT);
    expect(summary.summary.casesDone).toBe(4);
    expect(summary.map).toHaveLength(4);
  }, 60_000);

  it('--case writes one case as a normal scenario file that validates; an index out of range is exit 2', async () => {
    const c = io();
    expect(await runCli(['study', file, '--case', '3', '--out', dir], c.io)).toBe(0);
    const written = JSON.parse(readFileSync(path.join(dir, 'study-case-3.scenario.json'), 'utf8'));
    expect(validateScenario(written).ok).toBe(true);
    expect(written.study).toBeUndefined();
    const d = io();
    expect(await runCli(['study', file, '--case', '7'], d.io)).toBe(2); // runs = 7: indices 0..6
    expect(d.err.join('\n')).toContain('from 0 to 6');
  }, 60_000);

  it('refuses bad options and a bad study block with exit 2', async () => {
    for (const args of [
      ['--runs', '0'],
      ['--workers', 'two'],
      ['--seed', '-1'],
      ['--controller', 'nope'],
    ]) {
      const c = io();
      expect(await runCli(['study', file, ...args], c.io)).toBe(2);
      expect(c.err.join('\n')).toMatch(/runs|workers|seed|nope/);
    }
  }, 60_000);
});
