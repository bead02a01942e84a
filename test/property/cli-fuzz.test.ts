/**
 * The CLI under generated input (cases from cli-fuzz-cases.ts, seeded so every run is the same):
 * a few hundred invocations in this process through runCli, and a few dozen as the real
 * `bin/slewsmith.mjs` process. For every one:
 * - the exit status is 0, 1 or 2 (130 needs a signal and none is sent here; the CLI never exits 141);
 * - nothing escapes as an exception: no stack trace, no "internal error", no "unexpected failure";
 * - a success (0) prints no "NaN", and the files it wrote contain none either;
 * - problems are listed within the cap (at most 40 plus the count line per list).
 */
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asset, runInProcess, spawnCli, STACK_TRACE, type CliRun } from '../unit/cli-harness';
import { tempDir } from '../unit/main-fakes';
import { caseArb, type FuzzCase } from './cli-fuzz-cases';

const SEED = 20260303;
const IN_PROCESS_RUNS = 300;
// Each process costs a Node and tsx start (about 1 s of CPU), so the spawned runs are hostile
// cases only (they end before any simulation); the in-process runs cover the simulations.
const SPAWNED_RUNS = 40;
const SPAWN_CONCURRENCY = 2;

const bases = Object.fromEntries(
  ['lumen6-imaging', 'tern12-reversal', 'kestrel60-momentum'].map((n) => [n, fs.readFileSync(asset(`${n}.scenario.json`), 'utf8')]),
);

let dir: string;
beforeAll(async () => {
  dir = await tempDir();
  await fsp.writeFile(path.join(dir, 'existing-file'), 'not a folder');
});
afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

/** Writes the case's file and resolves the placeholders; `n` keeps runs apart. */
async function materialise(c: FuzzCase, n: number): Promise<{ args: string[]; out: string }> {
  const out = path.join(dir, `out-${n}`);
  const file = path.join(dir, `case-${n}.scenario.json`);
  if (c.file) await fsp.writeFile(file, c.file);
  const args = c.args.map((a) => a.replaceAll('@FILE@', file).replaceAll('@OUT@', out).replaceAll('@TMP@', dir));
  return { args, out };
}

async function writtenFiles(out: string): Promise<string[]> {
  try {
    return (await fsp.readdir(out, { recursive: true, withFileTypes: true }))
      .filter((e) => e.isFile())
      .map((e) => path.join(e.parentPath, e.name));
  } catch {
    return [];
  }
}

/** Every rule of the header comment; returns the broken ones. */
async function problems(r: CliRun, out: string): Promise<string[]> {
  const bad: string[] = [];
  if (r.code !== 0 && r.code !== 1 && r.code !== 2) bad.push(`exit status ${r.code}${r.signal ? ` (signal ${r.signal})` : ''}`);
  const all = r.stdout + r.stderr;
  if (STACK_TRACE.test(all)) bad.push('a stack trace or internal error');
  if (/^slewsmith \S+: unexpected failure:/m.test(all)) bad.push('an unexpected exception');
  if (r.code === 0 && /\bNaN\b/.test(r.stdout)) bad.push('NaN in a success output');
  if (r.code === 0)
    for (const f of await writtenFiles(out)) if (/\bNaN\b/.test(await fsp.readFile(f, 'utf8'))) bad.push(`NaN in ${path.basename(f)}`);
  // A problem list is its title, at most 40 problems and one "… and N more" line.
  const listed = r.stderr.split('\n').filter((l) => l.startsWith('  ')).length;
  if (listed > 200) bad.push(`${listed} indented stderr lines`);
  return bad;
}

function report(c: FuzzCase, args: string[], r: CliRun, bad: string[]): string {
  return [
    `${bad.join('; ')}`,
    `  args: ${JSON.stringify(args)}`,
    `  made by: ${c.how.join(', ') || '(no file)'}; env ${JSON.stringify(c.env)}`,
    `  exit ${r.code}; stderr: ${r.stderr.slice(0, 600)}`,
  ].join('\n');
}

describe('CLI fuzz', () => {
  it(`${IN_PROCESS_RUNS} generated invocations in-process: statuses 0/1/2, no exception escapes, no NaN on success`, async () => {
    const cases = fc.sample(caseArb(bases), { seed: SEED, numRuns: IN_PROCESS_RUNS });
    const failures: string[] = [];
    const codes = new Map<number, number>();
    const byCommand: Record<string, number> = {};
    for (const [n, c] of cases.entries()) {
      const { args, out } = await materialise(c, n);
      const r = await runInProcess(args, { env: c.env });
      codes.set(r.code ?? -1, (codes.get(r.code ?? -1) ?? 0) + 1);
      byCommand[`${args[0]} ${r.code}`] = (byCommand[`${args[0]} ${r.code}`] ?? 0) + 1;
      const bad = await problems(r, out);
      if (bad.length) failures.push(report(c, args, r, bad));
    }
    if (failures.length) console.error(`${failures.length} failures:\n${failures.slice(0, 8).join('\n')}`);
    // SLEWSMITH_FUZZ_STATS=1 prints how often each command ended with each status.
    if (process.env.SLEWSMITH_FUZZ_STATS) console.error('FUZZSTATS', JSON.stringify(byCommand));
    expect(failures).toEqual([]);
    // The generator reaches all three outcomes (a fuzz that only ever fails parsing tests little).
    expect([...codes.keys()].sort()).toEqual([0, 1, 2]);
    // … and simulations with exports do run (clean cases), not only the checks in front of them.
    expect((byCommand['fly 0'] ?? 0) + (byCommand['compare 0'] ?? 0)).toBeGreaterThanOrEqual(10);
  }, 120_000);

  it(`${SPAWNED_RUNS} generated invocations of the real process: the same rules on what a shell sees`, async () => {
    const cases = fc.sample(caseArb(bases, 0), { seed: SEED + 1, numRuns: SPAWNED_RUNS });
    const failures: string[] = [];
    let next = 0;
    const worker = async () => {
      while (next < cases.length) {
        const n = next++;
        const c = cases[n]!;
        const { args, out } = await materialise(c, 10_000 + n);
        const r = await spawnCli(args, { env: c.env });
        const bad = await problems(r, out);
        if (bad.length) failures.push(report(c, args, r, bad));
      }
    };
    await Promise.all(Array.from({ length: SPAWN_CONCURRENCY }, worker));
    expect(failures).toEqual([]);
  }, 180_000);
});
