/**
 * The CLI's exit status follows every run's outcome (issue 17 items 3–5): 0 only when every run
 * settled; 1 when any run is unsettled, failed or truncated, named in the closing lines; streamed
 * exports are written chunk by chunk through the atomic writer, and one whose writer finds a
 * problem part-way leaves neither the target nor a temporary file. In-process through runCli with
 * a fake simulation (the real one is covered by cli.test.ts).
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ChunkPull, ComputeResult, Computer, RunEndLine } from '../../main/cli/compute';
import { asset, runInProcess as cli } from './cli-harness';
import { tempDir } from './main-fakes';

let dir: string;
beforeAll(async () => {
  dir = await tempDir();
});
afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

const SETTLED: RunEndLine = { key: 'pd:follow-plan', verdict: 'settled', end: 'complete', text: 'settled in 70.0 s' };
const UNSETTLED: RunEndLine = { key: 'hysteretic:follow-plan', verdict: 'unsettled', end: 'complete', text: 'not settled (segment 2)' };
const TRUNCATED: RunEndLine = {
  key: 'eigenaxis:follow-plan',
  verdict: 'failed',
  end: 'truncated',
  text: 'failed: stopped at the step limit',
};
const FAILED: RunEndLine = { key: 'synergistic:follow-plan', verdict: 'failed', end: 'failed', text: 'failed: torqueCmdBody[0] is NaN' };

/** A pull over fixed chunks, ending with `problems`; counts how many chunks were taken. */
function pulls(chunks: string[], problems: { path: string; rule: string; message: string }[] = []) {
  const taken = { n: 0 };
  const pull: ChunkPull = async () => (taken.n < chunks.length ? { chunk: chunks[taken.n++]! } : { done: problems });
  return { pull, taken };
}

function fake(runs: RunEndLine[], files: { name: string; pull: ChunkPull }[] = []): { compute: Computer; released: () => boolean } {
  let released = false;
  const result: ComputeResult = {
    kind: 'ran',
    feasible: true,
    headline: 'h',
    table: 't',
    csv: 'c\n',
    json: '{}',
    failedRuns: [],
    runs,
    files: files.map((f) => ({ name: f.name })),
    openFile: (i) => files[i]!.pull,
    release: () => (released = true),
  };
  return { compute: async () => result, released: () => released };
}

const fly = (out: string, compute: Computer) =>
  cli(['fly', asset('lumen6-imaging.scenario.json'), '--out', path.join(dir, out)], { compute });

describe('exit status by run outcome', () => {
  it('all runs settled: 0, no closing run lines, the thread released', async () => {
    const f = fake([SETTLED]);
    const r = await fly('ok', f.compute);
    expect(r.code).toBe(0);
    expect(r.stderr).not.toMatch(/^run /m);
    expect(f.released()).toBe(true);
  });

  for (const [what, run, word] of [
    ['unsettled', UNSETTLED, 'UNSETTLED'],
    ['truncated', TRUNCATED, 'TRUNCATED'],
    ['failed', FAILED, 'FAILED'],
  ] as const) {
    it(`fly with one ${what} run: 1, and the last line names the run and why`, async () => {
      const r = await fly(what, fake([SETTLED, run]).compute);
      expect(r.code).toBe(1);
      const last = r.stderr.trimEnd().split('\n').at(-1);
      expect(last).toBe(`run ${run.key}: ${word}: ${run.text}`);
    });
  }

  it('compare with an unsettled run: 1, named; with all settled: 0', async () => {
    const args = ['compare', asset('lumen6-imaging.scenario.json')];
    const bad = fake([SETTLED, UNSETTLED]);
    const r = await cli(args, { compute: bad.compute });
    expect(r.code).toBe(1);
    expect(r.stderr).toContain(`run ${UNSETTLED.key}: UNSETTLED`);
    expect(bad.released()).toBe(true);
    expect((await cli(args, { compute: fake([SETTLED]).compute })).code).toBe(0);
  });
});

describe('streamed export files', () => {
  it('every chunk is pulled and written in order, the file is exactly their concatenation', async () => {
    const chunks = Array.from({ length: 50 }, (_, i) => `${'row,'.repeat(2000)}${i}\n`);
    const p = pulls(chunks);
    const r = await fly('stream', fake([SETTLED], [{ name: 'a.csv', pull: p.pull }]).compute);
    expect(r.code, r.stderr).toBe(0);
    expect(p.taken.n).toBe(50);
    expect(await fsp.readFile(path.join(dir, 'stream', 'a.csv'), 'utf8')).toBe(chunks.join(''));
  });

  it('a problem found part-way: the target is not created, no temporary file remains, the problem is named, exit 1', async () => {
    const out = path.join(dir, 'refused');
    const p = pulls(
      ['# head\n', '1,2\n'],
      [{ path: 'aem.line 9', rule: 'internal', message: 'the written AEM failed its own read-back check' }],
    );
    const ok = pulls(['fine\n']);
    const r = await fly(
      'refused',
      fake(
        [SETTLED],
        [
          { name: 'x.aem', pull: p.pull },
          { name: 'y.csv', pull: ok.pull },
        ],
      ).compute,
    );
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('read-back check');
    expect((await fsp.readdir(out)).sort()).toEqual(['y.csv']);
  });
});
