/**
 * `slewsmith sweep <scenario> --param NAME=lo:hi:steps [--param2 NAME=v1,v2,…] --runs N`: a
 * robustness sweep (app/engine/study/sweep*.ts), its grid cells spread over worker threads.
 *
 * Progress (cells and cases done, time left) goes to stderr; a per-controller text map of the
 * settle share with the boundary to stdout; --out DIR writes cells.csv and sweep.json
 * atomically. Cells are handed out one at a time and kept in cell order, and a cell's seed depends
 * only on the sweep seed and its index, so any worker count gives the same files. Ctrl-C stops
 * handing out cells, abandons the running ones, writes the finished cells and exits with 130.
 * Exit codes: 0 done, 2 invalid input (naming the option), 1 a worker or a write failed, 130 interrupted.
 */
import { Worker } from 'node:worker_threads';
import os from 'node:os';
import path from 'node:path';
import type { ParsedArgs } from './args';
import type { CliIo } from './io';
import { printIssues, printWarnings } from './io';
import { writeFileAtomicNode } from './fs';
import { numberOptions, type NumberRule } from './options';
import { prepareOutputFolder } from './output';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { Issue } from '../../app/engine/errors';
import type { SweepAxisSpec, SweepDefinition } from '../../app/engine/study/sweep';
import { cellCount, SWEEP_PARAMETER_NAMES, validateSweep } from '../../app/engine/study/sweep';
import type { SweepCell, SweepResult } from '../../app/engine/study/sweepRun';
import { sweepInfo, sweepResultOf } from '../../app/engine/study/sweepRun';
import { sweepCellsCsv, sweepJson } from '../../app/engine/study/sweepExport';
import type { SweepFromWorker, SweepToWorker } from './sweep-messages';
import { parseShardSpec } from './study';
import { sweepShardCells, sweepShardFileName, sweepShardSpecIssues, sweepShardText } from '../../app/engine/study/sweepShard';

const WORKER_URL = new URL('./sweep-worker.mjs', import.meta.url);

const SWEEP_LIMITS = {
  runs: { integer: true, min: 1, max: 1_000_000 },
  workers: { integer: true, min: 1, max: 64 },
  seed: { integer: true, min: 0, max: 4294967295 },
  level: { min: 0.001, max: 0.999 },
} as const satisfies Record<string, NumberRule>;

/** Default settle-share level of the boundary (common practice, no source: the median outcome). */
export const DEFAULT_LEVEL = 0.5;

/** `NAME=lo:hi:steps` or `NAME=v1,v2,…` → an axis as asked, or a message naming the option. */
export function parseParamOption(option: string, text: string): SweepAxisSpec | string {
  const eq = text.indexOf('=');
  const usage = `${option} must be NAME=lo:hi:steps or NAME=v1,v2,… with NAME one of ${SWEEP_PARAMETER_NAMES.join(', ')} (got "${text}")`;
  if (eq <= 0) return usage;
  const parameter = text.slice(0, eq).trim();
  const rest = text.slice(eq + 1).trim();
  const num = (s: string) => (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s.trim()) ? Number(s) : NaN);
  if (rest.includes(':')) {
    const parts = rest.split(':');
    if (parts.length !== 3) return usage;
    const [lo, hi, steps] = parts.map(num) as [number, number, number];
    if ([lo, hi, steps].some((x) => Number.isNaN(x))) return `${option}: lo, hi and steps must be numbers (got "${rest}")`;
    return { parameter, lo, hi, steps };
  }
  const values = rest.split(',').map(num);
  if (!rest || values.some((x) => Number.isNaN(x))) return `${option}: the values must be numbers separated by commas (got "${rest}")`;
  return { parameter, values };
}

/** The option an issue of the sweep definition belongs to. */
function optionOf(e: Issue): string {
  if (e.path.startsWith('sweep.axes[1]')) return '--param2';
  if (e.path.startsWith('sweep.axes')) return '--param';
  if (e.path === 'sweep.runs') return '--runs';
  if (e.path === 'sweep.seed') return '--seed';
  if (e.path === 'sweep.level') return '--level';
  return e.path;
}

const pct = (x: number) => `${Math.round(100 * x)}`.padStart(3);
const num = (x: number) => Number(x.toPrecision(4)).toString();

/** Where a theory line lies, in the axes' names: one value, or a segment between two points. */
function theoryWhere(r: SweepResult, t: SweepResult['theory'][number]): string {
  const [a0, a1] = r.info.def.axes.map((a) => a.parameter);
  const first = t.points[0]!;
  const last = t.points[t.points.length - 1]!;
  if (first.a1 === null || last.a1 === null || a1 === undefined) return `at ${a0} = ${num(first.a0)}`;
  return `from (${a0}, ${a1}) = (${num(first.a0)}, ${num(first.a1)}) to (${num(last.a0)}, ${num(last.a1)})`;
}

/** One text map per controller: settle share (%) per cell, rows = second axis (largest on top), then the boundary points. */
export function sweepTextMap(r: SweepResult): string {
  const { def, controllers } = r.info;
  const [ax, ay] = def.axes as [SweepDefinition['axes'][0], SweepDefinition['axes'][0] | undefined];
  const byIndex = new Map<number, SweepCell>(r.cells.map((c) => [c.index, c]));
  const nx = ax.values.length;
  const rowsY = ay ? ay.values.map((_, j) => j).reverse() : [0];
  const labelY = ay ? Math.max(...ay.values.map((v) => num(v).length), ay.parameter.length) : 0;
  const width = Math.max(4, ...ax.values.map((v) => num(v).length)) + 1;
  const out: string[] = [];
  controllers.forEach((c, ci) => {
    out.push(`${c.label} [${c.id}] — settle share, % of flyable cases${ay ? ` (rows: ${ay.parameter})` : ''}`);
    for (const j of rowsY) {
      const cells = ax.values.map((_, i) => {
        const cell = byIndex.get(i + j * nx);
        const s = cell?.controllers[ci]?.settled;
        return (s && s.of > 0 ? pct(s.share) : '  ·').padStart(width);
      });
      out.push(`${ay ? num(ay.values[j]!).padStart(labelY) : ''} |${cells.join('')}`);
    }
    out.push(`${''.padStart(labelY)} +${'-'.repeat(width * nx)}`);
    out.push(`${''.padStart(labelY)}  ${ax.values.map((v) => num(v).padStart(width)).join('')}  ${ax.parameter}`);
    const b = r.boundaries[ci]!;
    if (b.points.length === 0) out.push(`boundary (settle share ${Math.round(100 * def.level)} %): not crossed on this grid`);
    else {
      out.push(`boundary (settle share ${Math.round(100 * def.level)} %, interpolated along each grid line):`);
      for (const p of b.points) {
        const along = def.axes[p.along]!.parameter;
        const at = p.fixedValue === null ? '' : ` at ${def.axes[1 - p.along]!.parameter} = ${num(p.fixedValue)}`;
        out.push(
          `  ${along} = ${num(p.value)}${at} (share ${p.direction === 'falls' ? 'falls below' : 'rises above'} the level as ${along} grows)`,
        );
      }
    }
    for (const t of r.theory.filter((x) => x.controllerId === c.id)) out.push(`theory: ${t.label} — ${theoryWhere(r, t)} (${t.source})`);
    out.push('');
  });
  return out.join('\n');
}

/** The number options, the axes and the messages of `sweep` and `sweep slurm` (before the sweep is validated). */
export function sweepOptionParts(a: ParsedArgs): {
  values: Partial<Record<keyof typeof SWEEP_LIMITS, number>>;
  axes: SweepAxisSpec[];
  messages: string[];
} {
  const n = numberOptions(a.values, SWEEP_LIMITS);
  const messages = n.ok ? [] : n.messages;
  const axes: SweepAxisSpec[] = [];
  for (const opt of ['param', 'param2'] as const) {
    const t = a.values[opt];
    if (t === undefined) continue;
    const p = parseParamOption(`--${opt}`, t);
    if (typeof p === 'string') messages.push(p);
    else axes.push(p);
  }
  if (a.values.param === undefined) messages.push('--param NAME=lo:hi:steps is required (the parameter to sweep)');
  if (a.values.runs === undefined) messages.push('--runs N is required (cases per grid cell)');
  return { values: n.ok ? n.values : {}, axes, messages };
}

/** The sweep definition of the options, or one message per problem naming its option. */
export function sweepDefinitionOf(
  a: ParsedArgs,
  parts: ReturnType<typeof sweepOptionParts>,
): { ok: true; def: SweepDefinition } | { ok: false; messages: string[] } {
  const v = parts.values;
  const d = validateSweep({
    axes: parts.axes,
    runs: v.runs!,
    seed: v.seed ?? 0,
    controllers: a.lists.controller ?? null,
    level: v.level ?? DEFAULT_LEVEL,
  });
  return d.ok ? { ok: true, def: d.value } : { ok: false, messages: d.errors.map((e) => `${optionOf(e)}: ${e.message}`) };
}

/** Options of `sweep slurm` only. */
export const SWEEP_SLURM_ONLY = ['shards', 'cpus-per-task', 'mem-mb', 'time-min', 'partition', 'account'] as const;

export async function runSweepCli(json: unknown, a: ParsedArgs, io: CliIo, tool = 'Slewsmith'): Promise<number> {
  const parts = sweepOptionParts(a);
  const messages = parts.messages;
  for (const o of SWEEP_SLURM_ONLY)
    if (a.values[o] !== undefined) messages.push(`--${o} is an option of "sweep slurm" (the campaign writer), not of a sweep run`);
  if (a.flags.has('submit')) messages.push('--submit is an option of "sweep slurm" (the campaign writer), not of a sweep run');
  const shardText = a.values.shard;
  const shard = shardText === undefined ? null : parseShardSpec(shardText);
  if (typeof shard === 'string') messages.push(shard);
  else if (shard && a.values.out === undefined) messages.push('--shard needs --out DIR (the folder the shard file is written to)');
  if (messages.length) {
    for (const m of messages) io.err(`error: ${m}`);
    return 2;
  }
  const v = parts.values;
  const d = sweepDefinitionOf(a, parts);
  if (!d.ok) {
    for (const m of d.messages) io.err(`error: ${m}`);
    return 2;
  }
  const def = d.def;
  const outDir = a.values.out;
  if (outDir !== undefined) {
    const ready = await prepareOutputFolder(outDir, '--out');
    if (!ready.ok) {
      io.err(`error: ${ready.message}`);
      return 2;
    }
  }
  const inf = sweepInfo(json, def);
  if (!inf.ok) {
    // unknown controller ids come back as the study block's problems: name the option
    const named = inf.errors.map((e) => (e.path.startsWith('study.controllers') ? { ...e, message: `--controller: ${e.message}` } : e));
    printIssues(io, 'the sweep cannot run', named);
    return 2;
  }
  printWarnings(io, inf.warnings);
  const info = inf.value;
  const total = cellCount(def);
  let indices = Array.from({ length: total }, (_, i) => i);
  if (shard && typeof shard !== 'string') {
    const bad = sweepShardSpecIssues(shard.index, shard.count, total);
    if (bad.length) {
      for (const e of bad) io.err(`error: ${e.message}`);
      return 2;
    }
    const r = sweepShardCells(shard.index, shard.count, total);
    indices = indices.slice(r.first, r.end);
  }
  const cores = typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length;
  const nWorkers = Math.max(1, Math.min(v.workers ?? cores, indices.length));
  const part =
    shard && typeof shard !== 'string'
      ? `shard ${shard.index} of ${shard.count}: cells ${indices[0]}–${indices[indices.length - 1]} of `
      : '';
  io.err(
    `sweep: ${part}${total} cells × ${def.runs} cases × ${info.controllers.length} controllers (${def.axes.map((x) => `${x.parameter} ${x.values.length}`).join(' × ')}) on ${nWorkers} worker thread${nWorkers === 1 ? '' : 's'}`,
  );
  const outcome = await runCells(json, def, nWorkers, io, indices);
  if (outcome.error) {
    printIssues(io, outcome.invalid ? 'the sweep cannot run' : 'the sweep failed', outcome.error);
    return outcome.invalid ? 2 : 1;
  }
  if (shard && typeof shard !== 'string' && outDir !== undefined) {
    if (outcome.interrupted) {
      io.err('sweep: shard stopped early; no shard file written (run it again: a shard is all or nothing)');
      return 130;
    }
    const file = path.join(outDir, sweepShardFileName(shard.index, shard.count));
    const w = await writeFileAtomicNode(file, sweepShardText(info, json, tool, shard.index, shard.count, outcome.cells));
    if (!w.ok) {
      io.err(`error: could not write ${file}: ${w.message}`);
      return 1;
    }
    io.err(`wrote ${file}`);
    io.out(
      `shard ${shard.index} of ${shard.count} of the sweep of "${info.scenarioName}": cells ${indices[0]}–${indices[indices.length - 1]} of ${total} done; merge all ${shard.count} shards with: slewsmith sweep merge ${outDir}`,
    );
    return 0;
  }
  const result = sweepResultOf(info, outcome.cells);
  io.out(
    `Robustness sweep of "${info.scenarioName}": ${result.cells.length} of ${total} cells, ${def.runs} cases per cell, seed ${def.seed}, ${info.durationS} s per case\n`,
  );
  io.out(sweepTextMap(result));
  io.out(
    'settle share: cases that settled within the duration (study rules); "·" a cell not run or with no flyable case. cells.csv and sweep.json (--out) add the stalled, unwound and chattered shares with 95 % intervals and the median and p95 settle times.',
  );
  io.out(`\n${CAUTION_TEXT}`);
  if (outDir !== undefined) {
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
  }
  if (outcome.interrupted) {
    io.err(`sweep: stopped early; ${result.cells.length} of ${total} cells finished${outDir ? ' and written' : ''}`);
    return 130;
  }
  return 0;
}

interface CellsOutcome {
  cells: SweepCell[];
  interrupted: boolean;
  error: Issue[] | null;
  /** The error is a problem of the input (a cell's scenario), not of a worker. */
  invalid: boolean;
}

/** Hand the cells `indices` out one at a time to `nWorkers` worker threads; Ctrl-C stops and keeps the finished ones. */
function runCells(json: unknown, def: SweepDefinition, nWorkers: number, io: CliIo, indices: readonly number[]): Promise<CellsOutcome> {
  return new Promise((resolve) => {
    const total = indices.length;
    const cancelFlag = new SharedArrayBuffer(4);
    const flag = new Int32Array(cancelFlag);
    const cells: SweepCell[] = [];
    let next = 0;
    let casesDone = 0;
    let interrupted = false;
    let error: Issue[] | null = null;
    let invalid = false;
    let settled = false;
    const t0 = Date.now();
    let lastPrint = 0;
    const busy = new Set<Worker>();
    const workers: Worker[] = [];
    const finish = () => {
      if (settled) return;
      settled = true;
      process.removeListener('SIGINT', onSigint);
      void Promise.all(workers.map((w) => w.terminate())).then(() => resolve({ cells, interrupted, error, invalid }));
    };
    const progress = (force: boolean) => {
      const now = Date.now();
      if (!force && now - lastPrint < 1000) return;
      lastPrint = now;
      const casesTotal = total * def.runs;
      const el = (now - t0) / 1000;
      const left = casesDone > 0 ? `, ~${((el / casesDone) * (casesTotal - casesDone)).toFixed(1)} s left` : '';
      io.err(
        `sweep: ${cells.length}/${total} cells, ${casesDone}/${casesTotal} cases (${Math.round((100 * casesDone) / casesTotal)}%), ${el.toFixed(1)} s${left}`,
      );
    };
    const handOut = (w: Worker) => {
      if (interrupted || error || next >= total) {
        busy.delete(w);
        if (busy.size === 0) finish();
        return;
      }
      busy.add(w);
      const msg: SweepToWorker = { type: 'run', index: indices[next++]! };
      w.postMessage(msg);
    };
    const fail = (issues: Issue[], isInput: boolean) => {
      if (error) return;
      error = issues;
      invalid = isInput;
      Atomics.store(flag, 0, 1);
    };
    const onSigint = () => {
      if (interrupted) return;
      interrupted = true;
      Atomics.store(flag, 0, 1);
      io.err('sweep: interrupted — writing the cells finished so far (Ctrl-C again to abort without writing)');
      process.once('SIGINT', () => process.exit(130));
    };
    process.once('SIGINT', onSigint);
    for (let k = 0; k < nWorkers; k++) {
      const w = new Worker(WORKER_URL);
      workers.push(w);
      const init: SweepToWorker = { type: 'init', json, def, cancelFlag };
      w.postMessage(init);
      w.on('message', (m: SweepFromWorker) => {
        if (m.type === 'case') {
          casesDone++;
          progress(false);
          return;
        }
        if (m.type === 'cell') {
          cells.push(m.cell);
          progress(true);
        } else if (m.type === 'error') fail(m.errors, true);
        handOut(w);
      });
      w.on('error', (e) => {
        fail([{ path: 'workers', rule: 'worker-failed', message: `a worker thread failed: ${e.message}` }], false);
        busy.delete(w);
        if (busy.size === 0) finish();
      });
      handOut(w);
    }
  });
}
