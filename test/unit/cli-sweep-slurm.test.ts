/**
 * `slewsmith sweep slurm` (main/cli/sweep-slurm.ts): the campaign folder it writes, its job scripts
 * run by bash as Slurm would run them (task i with SLURM_ARRAY_TASK_ID=i, then the merge), and its
 * refusals. Outside references: bash itself (`bash -n` parses the scripts; running them shows the
 * argv the tasks really get), and the sbatch option syntax of the Slurm manual page sbatch(1)
 * (--array=0-N, --cpus-per-task, --mem=<MiB>M, --time=HH:MM:SS, --chdir, --output/--error with
 * %a / %A / %j, --partition). The byte-for-byte reference is our own one-process `sweep` run (no
 * outside source: the claim is that the campaign reproduces it). The real Slurm run is in
 * test/integration/slurm.test.ts. Scenario: the invented MST-setting test vehicle of
 * test/reference/sweep-fixtures.ts at 100 Hz over 20 s, an 8-cell grid with one case per cell.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import fsp from 'node:fs/promises';
import { chmodSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { runInProcess, spawnCli, STACK_TRACE } from './cli-harness';
import { mstScenario } from '../reference/sweep-fixtures';

let dir = '';
let scenario = '';
let scenarioText = '';
beforeAll(async () => {
  dir = await fsp.mkdtemp(path.join(os.tmpdir(), 'slewsmith-sweep-slurm-'));
  scenario = path.join(dir, 'mst.scenario.json');
  const base = mstScenario({ controlRateHz: 100, rk4StepsPerSample: 10, durationS: 20, hysteresis: 0.4, noiseMode: 'band-edge' });
  const json = {
    ...base,
    simulation: { ...base.simulation, settleAngleDeg: 60, settleRateDegPerS: 20 },
    study: { ...base.study, dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 1 } } },
  };
  scenarioText = JSON.stringify(json, null, 1) + '\n';
  await fsp.writeFile(scenario, scenarioText);
});
afterAll(async () => {
  if (dir) await fsp.rm(dir, { recursive: true, force: true });
});

const SWEEP = [
  '--param',
  'worst-case-eta=0.05,0.15,0.25,0.35',
  '--param2',
  'hysteresis=0.1,0.3',
  '--runs',
  '1',
  '--seed',
  '9',
  '--controller',
  'hyst,sign',
];
const read = (d: string, f: string) => fsp.readFile(path.join(d, f), 'utf8');

describe('slewsmith sweep slurm: the campaign folder', () => {
  let campaign = '';
  beforeAll(async () => {
    // A space, a quote and a percent sign in the folder: the scripts must quote it.
    campaign = path.join(dir, "sweep campaign 'q' 5%");
    const r = await runInProcess([
      'sweep',
      'slurm',
      scenario,
      ...SWEEP,
      '--shards',
      '3',
      '--out',
      campaign,
      '--mem-mb',
      '500',
      '--time-min',
      '95',
      '--partition',
      'batch',
    ]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain('sweep campaign: 8 cells × 1 cases × 2 controllers in 3 shards; per array task 1 CPU, 500 MiB, 95 min');
    expect(r.stdout).toContain(`submit with "bash ${path.join(campaign, 'slurm', 'submit.sh')}"`);
  }, 60_000);

  it('writes the scenario as given, the scripts with their #SBATCH lines (sbatch(1) syntax) and a README', async () => {
    expect(await read(campaign, 'scenario.json')).toBe(scenarioText);
    const logs = `${campaign.replace('%', '%%')}/logs`;
    const shards = await read(campaign, 'slurm/shards.sbatch');
    expect(shards.split('\n').filter((l) => l.startsWith('#SBATCH'))).toEqual([
      '#SBATCH --job-name=slewsmith-sweep-MST-2011-setting',
      '#SBATCH --array=0-2',
      '#SBATCH --ntasks=1',
      '#SBATCH --cpus-per-task=1',
      '#SBATCH --mem=500M',
      '#SBATCH --time=01:35:00',
      `#SBATCH --chdir="${campaign}"`,
      `#SBATCH --output="${logs}/shard-%a.%A.out"`,
      `#SBATCH --error="${logs}/shard-%a.%A.err"`,
      '#SBATCH --partition=batch',
    ]);
    const merge = await read(campaign, 'slurm/merge.sbatch');
    expect(merge.split('\n').filter((l) => l.startsWith('#SBATCH'))).toEqual([
      '#SBATCH --job-name=slewsmith-sweep-MST-2011-setting-merge',
      '#SBATCH --ntasks=1',
      '#SBATCH --cpus-per-task=1',
      '#SBATCH --mem=1024M',
      '#SBATCH --time=01:35:00',
      `#SBATCH --chdir="${campaign}"`,
      `#SBATCH --output="${logs}/merge.%j.out"`,
      `#SBATCH --error="${logs}/merge.%j.err"`,
      '#SBATCH --partition=batch',
    ]);
    expect(await read(campaign, 'slurm/submit.sh')).toContain('--dependency=afterok:"$ARRAY" --kill-on-invalid-dep=yes slurm/merge.sbatch');
    for (const f of ['slurm/shards.sbatch', 'slurm/merge.sbatch', 'slurm/submit.sh']) {
      expect(spawnSync('bash', ['-n', path.join(campaign, f)]).status, f).toBe(0);
      expect((await fsp.stat(path.join(campaign, f))).mode & 0o111, f).toBe(0o111);
    }
    for (const d of ['logs', 'shards']) expect((await fsp.stat(path.join(campaign, d))).isDirectory()).toBe(true);
    const readme = await read(campaign, 'README.txt');
    expect(readme).toContain('8 grid cells (worst-case-eta 4 × hysteresis 2) × 1 cases per cell (seed 9) × 2 controllers (hyst, sign)');
    expect(readme).toContain('in 3 shards of 2 to 3 cells');
    expect(readme).toMatch(
      /sweep scenario\.json --param worst-case-eta=0\.05,0\.15,0\.25,0\.35 .* --shard i\/3 --out shards --workers 1\n/,
    );
  });

  it('task i gets shard i with the sweep options as given (bash runs the task with a stand-in node)', async () => {
    // The script starts `<node> <bin> sweep …`: swap the node path for a program that prints its argv.
    const shards = await read(campaign, 'slurm/shards.sbatch');
    const quotedNode = `'${process.execPath}'`;
    expect(shards).toContain(`exec ${quotedNode} `);
    const echo = path.join(dir, 'echo-argv');
    writeFileSync(echo, `#!/bin/bash\nprintf '%s\\n' "$@"\n`);
    chmodSync(echo, 0o755);
    const stand = path.join(dir, 'stand-in.sbatch');
    writeFileSync(stand, shards.replace(`exec ${quotedNode} `, `exec '${echo}' `));
    const r = spawnSync('bash', [stand], {
      cwd: campaign,
      env: { PATH: process.env.PATH ?? '', SLURM_ARRAY_TASK_ID: '2' },
      encoding: 'utf8',
    });
    expect(r.status, r.stderr).toBe(0);
    const argv = r.stdout.trim().split('\n');
    expect(argv.slice(1)).toEqual(['sweep', 'scenario.json', ...SWEEP, '--shard', '2/3', '--out', 'shards', '--workers', '1']);
    expect(argv[0]).toMatch(/bin\/slewsmith\.mjs$/);
  });

  it('the array tasks and the merge, run as Slurm runs them, give the one-process sweep byte for byte', async () => {
    const single = path.join(dir, 'single');
    const ref = await spawnCli(['sweep', scenario, ...SWEEP, '--workers', '1', '--out', single]);
    expect(ref.code, ref.stderr).toBe(0);
    const env = { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '' };
    for (const task of [2, 0, 1]) {
      const r = spawnSync('bash', ['slurm/shards.sbatch'], {
        cwd: campaign,
        env: { ...env, SLURM_ARRAY_TASK_ID: String(task) },
        encoding: 'utf8',
      });
      expect(r.status, r.stderr).toBe(0);
    }
    expect((await fsp.readdir(path.join(campaign, 'shards'))).sort()).toEqual([
      'sweep-shard-00000-of-00003.slewsmith-sweep-shard',
      'sweep-shard-00001-of-00003.slewsmith-sweep-shard',
      'sweep-shard-00002-of-00003.slewsmith-sweep-shard',
    ]);
    const m = spawnSync('bash', ['slurm/merge.sbatch'], { cwd: campaign, env, encoding: 'utf8' });
    expect(m.status, m.stderr).toBe(0);
    expect(m.stderr).toContain('merged 3 shards: 8 cells');
    for (const f of ['cells.csv', 'sweep.json']) expect(await read(campaign, f), f).toBe(await read(single, f));
  }, 240_000);

  it('written again over a folder holding shard files: a warning says the merge would read them', async () => {
    const r = await runInProcess(['sweep', 'slurm', scenario, ...SWEEP, '--shards', '2', '--out', campaign]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain(`warning: ${path.join(campaign, 'shards')} already holds 3 shard files of an earlier run`);
  });
});

describe('slewsmith sweep slurm --submit', () => {
  it('calls sbatch for the array, then the merge depending on it, and prints both job ids', async () => {
    const bin = path.join(dir, 'fake-bin');
    await fsp.mkdir(bin, { recursive: true });
    const log = path.join(dir, 'sbatch.log');
    // A stand-in sbatch (answers like `sbatch --parsable`: "<id>;<cluster>").
    writeFileSync(path.join(bin, 'sbatch'), `#!/bin/bash\necho "$@" >> '${log}'\nn=$(wc -l < '${log}')\necho "$((4700 + n));test"\n`);
    chmodSync(path.join(bin, 'sbatch'), 0o755);
    const campaign = path.join(dir, 'submitted');
    const oldPath = process.env.PATH;
    process.env.PATH = `${bin}:${oldPath ?? ''}`;
    try {
      const r = await runInProcess(['sweep', 'slurm', scenario, ...SWEEP, '--shards', '8', '--out', campaign, '--submit']);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toContain('shard array job: 4701\nmerge job: 4702');
    } finally {
      process.env.PATH = oldPath;
    }
    expect((await fsp.readFile(log, 'utf8')).trim().split('\n')).toEqual([
      `--parsable ${path.join(campaign, 'slurm/shards.sbatch')}`,
      `--parsable ${path.join(campaign, 'slurm/merge.sbatch')}`,
    ]);
    const merge = await read(campaign, 'slurm/merge.sbatch');
    expect(merge).toContain('#SBATCH --dependency=afterok:4701\n#SBATCH --kill-on-invalid-dep=yes');
    expect(await read(campaign, 'slurm/shards.sbatch')).toContain('#SBATCH --array=0-7\n');
  });
});

describe('slewsmith sweep slurm: refusals name the option and the rule', () => {
  const cases: [string, string[], RegExp[]][] = [
    ['no --shards, no --out', [...SWEEP], [/--shards K is needed/, /--out DIR is needed/]],
    [
      'more shards than cells',
      [...SWEEP, '--shards', '9', '--out', 'x'],
      [/--shards 9 for a grid of 8 cells would leave shards empty; use at most 8/],
    ],
    [
      'bad resources',
      [...SWEEP, '--shards', '0', '--out', 'x', '--cpus-per-task', '0', '--mem-mb', '12', '--time-min', '1.5'],
      [
        /--shards must be a whole number from 1 to 4000000 \(got "0"\)/,
        /--cpus-per-task must be a whole number from 1 to 256/,
        /--mem-mb must be a whole number from 64/,
        /--time-min must be a whole number from 1/,
      ],
    ],
    [
      'a shard of its own',
      [...SWEEP, '--shards', '2', '--out', 'x', '--shard', '0/2'],
      [/--shard is set by the campaign for each array task/],
    ],
    [
      '--workers',
      [...SWEEP, '--shards', '2', '--out', 'x', '--workers', '2'],
      [/--workers: each array task runs --cpus-per-task worker threads/],
    ],
    ['partition with a semicolon', [...SWEEP, '--shards', '2', '--out', 'x', '--partition', 'a;b'], [/--partition must be 1–64 letters/]],
    ['no grid', ['--runs', '1', '--shards', '2', '--out', 'x'], [/--param NAME=lo:hi:steps is required/]],
    ['a bad grid', [...SWEEP.slice(2), '--param', 'no-such=1,2', '--shards', '2', '--out', 'x'], [/--param: /]],
    ['an unknown controller', [...SWEEP.slice(0, 8), '--controller', 'nope', '--shards', '2', '--out', 'x'], [/--controller: /]],
  ];
  for (const [what, args, want] of cases)
    it(what, async () => {
      const out = path.join(dir, `refused-${what.replace(/\W+/g, '-')}`);
      const r = await runInProcess(['sweep', 'slurm', scenario, ...args.map((x) => (x === 'x' ? out : x))]);
      expect(r.code).toBe(2);
      for (const w of want) expect(r.stderr).toMatch(w);
      expect(r.stderr).not.toMatch(STACK_TRACE);
      await expect(fsp.stat(out)).rejects.toThrow(); // nothing written
    });

  it('plain sweep refuses the campaign options instead of ignoring them', async () => {
    const r = await runInProcess(['sweep', scenario, ...SWEEP, '--shards', '3', '--submit']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('error: --shards is an option of "sweep slurm" (the campaign writer), not of a sweep run');
    expect(r.stderr).toContain('error: --submit is an option of "sweep slurm"');
  });

  it('no scenario file', async () => {
    const r = await runInProcess(['sweep', 'slurm']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/give a scenario file/);
  });

  it('--help lists the campaign options', async () => {
    const r = await runInProcess(['sweep', '--help']);
    expect(r.code).toBe(0);
    for (const o of [
      '--shards <K>',
      '--cpus-per-task <N>',
      '--mem-mb <M>',
      '--time-min <T>',
      '--partition <P>',
      '--account <A>',
      '--submit',
    ])
      expect(r.stdout).toContain(o);
    expect(r.stdout).toContain('slewsmith sweep slurm <scenario.json>');
  });
});
