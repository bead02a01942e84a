/**
 * `slewsmith sweep`: the same sweep on one and on two worker threads writes the same bytes; bad
 * options exit 2 naming the option; Ctrl-C exits 130 and keeps the finished cells. Behaviour of our
 * own command (no outside source); the scenario is the invented MST-setting test vehicle of
 * test/reference/sweep-fixtures.ts at 100 Hz over 20 s (short: held and converging runs differ by then).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fsp from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { runInProcess, spawnCli, STACK_TRACE } from './cli-harness';
import { mstScenario } from '../reference/sweep-fixtures';

let dir = '';
let scenario = '';
beforeAll(async () => {
  dir = await fsp.mkdtemp(path.join(os.tmpdir(), 'slewsmith-sweep-'));
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

const args = (out: string, workers: number) => [
  'sweep',
  scenario,
  '--param',
  'worst-case-eta=0.05:0.25:2',
  '--param2',
  'hysteresis=0.1,0.3',
  '--runs',
  '2',
  '--controller',
  'hyst',
  '--seed',
  '9',
  '--workers',
  String(workers),
  '--out',
  out,
];

describe('slewsmith sweep', () => {
  it('one and two workers write identical sweep.json and cells.csv', async () => {
    const a = await spawnCli(args(path.join(dir, 'w1'), 1));
    const b = await spawnCli(args(path.join(dir, 'w2'), 2));
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    expect(a.stderr).not.toMatch(STACK_TRACE);
    const read = (d: string, f: string) => fsp.readFile(path.join(dir, d, f), 'utf8');
    const j1 = await read('w1', 'sweep.json');
    expect(await read('w2', 'sweep.json')).toBe(j1);
    expect(await read('w2', 'cells.csv')).toBe(await read('w1', 'cells.csv'));
    const j = JSON.parse(j1) as { cells: { values: number[]; controllers: { settled: { share: number } }[] }[]; complete: boolean };
    expect(j.complete).toBe(true);
    expect(j.cells.length).toBe(4);
    // δ = 0.3 > ē settles, δ = 0.1 < ē = 0.25 is held at 180° (band-edge worst-case noise; MST 2011)
    const at = (e: number, d: number) => j.cells.find((c) => c.values[0] === e && c.values[1] === d)!.controllers[0]!.settled.share;
    expect(at(0.25, 0.3)).toBe(1);
    expect(at(0.25, 0.1)).toBe(0);
    expect(a.stdout).toContain('Hysteretic [hyst]');
    expect(a.stdout).toContain('boundary (settle share 50 %');
  }, 60_000);

  it('bad options exit 2 and name the option', async () => {
    const r = await runInProcess(['sweep', scenario, '--param', 'gain=1:2:3', '--runs', '2']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('error: --param: sweep.axes[0].parameter "gain" is not a sweep parameter');
    const s = await runInProcess(['sweep', scenario, '--param', 'hysteresis=0.1:0.3', '--runs', '0']);
    expect(s.code).toBe(2);
    expect(s.stderr).toContain('--param must be NAME=lo:hi:steps');
    expect(s.stderr).toContain('--runs');
    const u = await runInProcess(['sweep', scenario, '--param', 'hysteresis=0.1,0.3', '--runs', '1', '--controller', 'nope']);
    expect(u.code).toBe(2);
    expect(u.stderr).toContain('--controller: grid cell 0: study.controllers[0] "nope" is not a controller');
    const t = await runInProcess(['sweep', scenario, '--param2', 'hysteresis=0.1,0.3', '--runs', '1']);
    expect(t.code).toBe(2);
    expect(t.stderr).toContain('--param NAME=lo:hi:steps is required');
  });

  it('Ctrl-C: status 130, the finished cells written, marked incomplete', async () => {
    const out = path.join(dir, 'int');
    const r = await spawnCli(
      ['sweep', scenario, '--param', 'worst-case-eta=0.05:0.35:20', '--runs', '1', '--controller', 'hyst', '--workers', '1', '--out', out],
      {
        onStart: (child, stderr) => {
          const poll = setInterval(() => {
            if (/sweep: [1-9]\d*\/20 cells/.test(stderr())) {
              clearInterval(poll);
              child.kill('SIGINT');
            }
          }, 20);
          child.on('exit', () => clearInterval(poll));
        },
      },
    );
    expect(r.code).toBe(130);
    expect(r.stderr).toContain('sweep: interrupted');
    expect(r.stderr).not.toMatch(STACK_TRACE);
    const j = JSON.parse(await fsp.readFile(path.join(out, 'sweep.json'), 'utf8')) as { complete: boolean; cellsDone: number };
    expect(j.complete).toBe(false);
    expect(j.cellsDone).toBeGreaterThanOrEqual(1);
    expect(j.cellsDone).toBeLessThan(20);
  }, 60_000);
});
