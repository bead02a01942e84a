/**
 * `slewsmith sweep merge <files or folders>... [--out DIR]`: combines sweep shard files
 * (app/engine/study/sweepShard.ts; folders are searched for *.slewsmith-sweep-shard) into
 * cells.csv and sweep.json — byte for byte what one process running the whole sweep writes — and
 * prints the text maps. Every refusal names the files (and the cells no shard holds).
 * Exit 0 merged, 2 unusable input, 1 a failed write.
 */
import { readdir, readFile, stat } from 'node:fs/promises';
import path from 'node:path';
import type { ParsedArgs } from './args';
import { printIssues, type CliIo } from './io';
import { writeFileAtomicNode } from './fs';
import { prepareOutputFolder } from './output';
import { sweepTextMap } from './sweep';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { Issue, Result } from '../../app/engine/errors';
import { fail, ok } from '../../app/engine/errors';
import { sweepResultOf } from '../../app/engine/study/sweepRun';
import { sweepCellsCsv, sweepJson } from '../../app/engine/study/sweepExport';
import type { SweepShard } from '../../app/engine/study/sweepShard';
import { parseSweepShard, planSweepMerge, SWEEP_SHARD_EXTENSION } from '../../app/engine/study/sweepShard';

/** The files named, and the sweep shard files in the folders named (sorted by name). */
async function findSweepShards(args: readonly string[]): Promise<Result<string[]>> {
  const issues: Issue[] = [];
  const files: string[] = [];
  for (const a of args) {
    const st = await stat(a).catch(() => null);
    if (!st) issues.push({ path: a, rule: 'exists', message: `${a}: no such file or folder` });
    else if (st.isDirectory()) {
      const names = (await readdir(a)).filter((n) => n.endsWith(SWEEP_SHARD_EXTENSION)).sort();
      if (names.length === 0)
        issues.push({ path: a, rule: 'shards', message: `${a} holds no sweep shard files (*${SWEEP_SHARD_EXTENSION})` });
      files.push(...names.map((n) => path.join(a, n)));
    } else files.push(a);
  }
  return issues.length ? fail(issues) : ok(files);
}

async function readShards(files: readonly string[]): Promise<Result<{ file: string; shard: SweepShard }[]>> {
  const issues: Issue[] = [];
  const out: { file: string; shard: SweepShard }[] = [];
  for (const file of files) {
    const text = await readFile(file, 'utf8').catch(() => null);
    if (text === null) {
      issues.push({ path: file, rule: 'exists', message: `${file}: not a readable file` });
      continue;
    }
    const p = parseSweepShard(text, file);
    if (p.ok) out.push({ file, shard: p.value });
    else issues.push(...p.errors);
  }
  return issues.length ? fail(issues) : ok(out);
}

export async function runSweepMerge(a: ParsedArgs, io: CliIo, tool: string): Promise<number> {
  const args = a.positional.slice(1);
  if (args.length === 0) {
    io.err('error: give the sweep shard files (or the folders holding them): slewsmith sweep merge <file|folder>... [--out DIR]');
    return 2;
  }
  const found = await findSweepShards(args);
  if (!found.ok) {
    printIssues(io, 'nothing to merge', found.errors);
    return 2;
  }
  const read = await readShards(found.value);
  if (!read.ok) {
    printIssues(io, 'the shards cannot be merged', read.errors);
    return 2;
  }
  const plan = planSweepMerge(read.value, tool);
  if (!plan.ok) {
    printIssues(io, 'the shards cannot be merged', plan.errors);
    return 2;
  }
  const first = args[0]!;
  const firstIsDir = (await stat(first).catch(() => null))?.isDirectory() === true;
  const outDir = a.values.out ?? (firstIsDir ? first : path.dirname(first));
  const ready = await prepareOutputFolder(outDir, '--out');
  if (!ready.ok) {
    io.err(`error: ${ready.message}`);
    return 2;
  }
  const result = sweepResultOf(plan.value.info, plan.value.cells);
  const files: [string, string][] = [
    [path.join(outDir, 'cells.csv'), sweepCellsCsv(result)],
    [path.join(outDir, 'sweep.json'), sweepJson(result, CAUTION_TEXT)],
  ];
  for (const [file, text] of files) {
    const w = await writeFileAtomicNode(file, text);
    if (!w.ok) {
      io.err(`error: could not write ${file}: ${w.message}`);
      return 1;
    }
    io.err(`wrote ${file}`);
  }
  const info = result.info;
  io.err(`merged ${read.value.length} shard${read.value.length === 1 ? '' : 's'}: ${result.cells.length} cells`);
  io.out(
    `Robustness sweep of "${info.scenarioName}": ${result.cells.length} of ${info.cells} cells, ${info.def.runs} cases per cell, seed ${info.def.seed}, ${info.durationS} s per case\n`,
  );
  io.out(sweepTextMap(result));
  io.out(`\n${CAUTION_TEXT}`);
  return 0;
}
