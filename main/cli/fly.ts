/**
 * `slewsmith fly` and `slewsmith compare`: simulate (compute.ts, in a worker thread from the real
 * command), then print the comparison and write the files.
 *
 * Order of work: every option is checked and every output place is made and probed for writing
 * before the simulation starts (a bad --out costs milliseconds, not a run). Ctrl-C stops the
 * simulation at once or stops between files; a file being written is dropped whole (its temporary
 * file removed), never left half-written; the status is then 130.
 */
import path from 'node:path';
import type { ScenarioDocument } from '../../app/bridge/scenario-bytes';
import { EXPORT_FORMATS, type ExportFormat } from '../../app/engine/export/runExport';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { RunMode } from '../../app/engine/pipeline/types';
import type { ParsedArgs } from './args';
import type { ChunkPull, ComputeJob, ComputeResult, RunEndLine } from './compute';
import { printIssues, type CliContext } from './io';
import { EXPORT_RATE_RULE, exportStamp, numberOption } from './options';
import { prepareOutputFile, prepareOutputFolder, writeStreamAtomic, writeTextAtomic } from './output';
import { withConstraintStatus } from './constraintStatus';

const INTERRUPTED = 130;

function modesOf(a: ParsedArgs, ctx: CliContext): RunMode[] | undefined | null {
  const m = a.values.mode;
  if (m === undefined) return undefined;
  if (m === 'both') return ['follow-plan', 'step-target'];
  if (m === 'follow-plan' || m === 'step-target') return [m];
  ctx.io.err(`error: --mode must be follow-plan, step-target or both (got ${JSON.stringify(m)})`);
  return null;
}

/**
 * Runs `fn` with Ctrl-C wired to an abort signal for its whole length (simulation and writes), so
 * no gap is left where Node's default handler would end the process without the message.
 */
async function interruptible<T>(ctx: CliContext, fn: (stop: AbortController) => Promise<T>): Promise<T> {
  const stop = new AbortController();
  const off = ctx.onInterrupt(() => stop.abort());
  try {
    return await fn(stop);
  } finally {
    off();
  }
}

function interrupted(ctx: CliContext, command: string, written: number): number {
  ctx.io.err(`slewsmith ${command}: interrupted; ${written} file${written === 1 ? '' : 's'} written, none left half-written`);
  return INTERRUPTED;
}

/** A scenario or option the simulation refused: status 2. */
function refused(file: string, r: Exclude<ComputeResult, { kind: 'ran' }>, ctx: CliContext): number {
  if (r.kind === 'option') ctx.io.err(`error: ${r.message}`);
  else printIssues(ctx.io, `${file} is not valid`, r.errors);
  return 2;
}

/**
 * Writes one file that Ctrl-C can drop whole, from a whole text or streamed chunk by chunk;
 * returns 'ok', 'failed' or 'interrupted'.
 */
async function writeOne(
  file: string,
  text: string | ChunkPull,
  ctx: CliContext,
  stop: AbortController,
): Promise<'ok' | 'failed' | 'interrupted'> {
  if (stop.signal.aborted) return 'interrupted';
  const w = typeof text === 'string' ? await writeTextAtomic(file, text, stop.signal) : await writeStreamAtomic(file, text, stop.signal);
  if (w.ok) return 'ok';
  if (w.interrupted) return 'interrupted';
  if (w.errors) printIssues(ctx.io, `export ${file} refused`, w.errors);
  else ctx.io.err(`error: could not write ${file}: ${w.message}`);
  return 'failed';
}

/**
 * The closing lines: every run that did not settle, and why (unsettled, failed, truncated). The
 * status is 0 only when every run settled (issue 17: a partial or failed run is never success).
 */
function runLines(runs: readonly RunEndLine[], ctx: CliContext): boolean {
  let allSettled = true;
  for (const r of runs) {
    if (r.verdict === 'settled') continue;
    allSettled = false;
    const what = r.end === 'truncated' ? 'TRUNCATED' : r.verdict === 'failed' ? 'FAILED' : 'UNSETTLED';
    ctx.io.err(`run ${r.key}: ${what}: ${r.text}`);
  }
  return allSettled;
}

export async function runCompare(file: string, doc: ScenarioDocument, a: ParsedArgs, ctx: CliContext): Promise<number> {
  const modes = modesOf(a, ctx);
  if (modes === null) return 2;
  const targets: [string, string][] = [];
  if (a.values.csv !== undefined) targets.push(['--csv', a.values.csv]);
  if (a.values['json-file'] !== undefined) targets.push(['--json-file', a.values['json-file']]);
  for (const [option, target] of targets) {
    const ready = await prepareOutputFile(target, option);
    if (!ready.ok) {
      ctx.io.err(`error: ${ready.message}`);
      return 2;
    }
  }
  return interruptible(ctx, async (stop) => {
    const job: ComputeJob = { command: 'compare', text: doc.text, controllers: a.lists.controller, modes };
    const r = await ctx.compute(job, (line) => ctx.io.err(line), stop.signal);
    if (r === null) return interrupted(ctx, 'compare', 0);
    if (r.kind !== 'ran') return refused(file, r, ctx);
    r.release?.(); // compare writes no run exports: the simulation thread can go
    if (a.flags.has('json')) ctx.io.out(r.json);
    else ctx.io.out(`${r.headline}\n\n${r.table}\n\n${CAUTION_TEXT}`);
    let written = 0;
    let failed = false;
    for (const [option, target] of targets) {
      const w = await writeOne(target, option === '--csv' ? r.csv : r.json + '\n', ctx, stop);
      if (w === 'interrupted') return interrupted(ctx, 'compare', written);
      if (w === 'failed') failed = true;
      else written++;
    }
    const settled = runLines(r.runs, ctx);
    for (const v of r.constraintViolations ?? []) ctx.io.err(`constraint violated: ${v}`);
    return withConstraintStatus(r.feasible && settled && !failed ? 0 : 1, (r.constraintViolations ?? []).length > 0);
  });
}

export async function runFly(
  file: string,
  doc: ScenarioDocument,
  a: ParsedArgs,
  ctx: CliContext,
  tool: { name: string; version: string },
): Promise<number> {
  const problems: string[] = [];
  const modes = modesOf(a, ctx);
  if (modes === null) return 2;
  const formats = (a.lists.format ?? [...EXPORT_FORMATS]) as ExportFormat[];
  const bad = formats.filter((f) => !(EXPORT_FORMATS as readonly string[]).includes(f));
  if (bad.length) problems.push(`--format takes csv, json and aem (got ${bad.map((b) => JSON.stringify(b)).join(', ')})`);
  let sampleRateHz: number | undefined;
  if (a.values.rate !== undefined) {
    const rate = numberOption('rate', a.values.rate, EXPORT_RATE_RULE);
    if (rate.ok) sampleRateHz = rate.value;
    else problems.push(rate.message);
  }
  const stamp = exportStamp(a.values, ctx.env);
  if (!stamp.ok) problems.push(...stamp.message.split('\n'));
  if (problems.length || !stamp.ok) {
    for (const p of problems) ctx.io.err(`error: ${p}`);
    return 2;
  }
  const outDir = a.values.out ?? 'slewsmith-out';
  const ready = await prepareOutputFolder(outDir, '--out');
  if (!ready.ok) {
    ctx.io.err(`error: ${ready.message}`);
    return 2;
  }
  const base = path.basename(file).replace(/\.scenario\.json$|\.json$/, '') || 'scenario';
  const job: ComputeJob = {
    command: 'fly',
    text: doc.text,
    controllers: a.lists.controller,
    modes,
    exports: { formats, base, toolName: tool.name, toolVersion: tool.version, sampleRateHz, ...stamp.value },
  };
  return interruptible(ctx, async (stop) => {
    const r = await ctx.compute(job, (line) => ctx.io.err(line), stop.signal);
    if (r === null) return interrupted(ctx, 'fly', 0);
    if (r.kind !== 'ran') return refused(file, r, ctx);
    try {
      return await writeFiles(r, outDir, sampleRateHz, ctx, stop);
    } finally {
      r.release?.();
    }
  });
}

/** fly's files, then the table and the closing lines; the status (0 only if all runs settled and every file was written). */
async function writeFiles(
  r: Extract<ComputeResult, { kind: 'ran' }>,
  outDir: string,
  sampleRateHz: number | undefined,
  ctx: CliContext,
  stop: AbortController,
): Promise<number> {
  let status = r.feasible ? 0 : 1;
  let written = 0;
  for (const [i, f] of r.files.entries()) {
    const target = path.join(outDir, f.name);
    const text = f.text ?? r.openFile?.(i);
    if (f.errors || text === undefined) {
      printIssues(ctx.io, `export ${target} refused`, f.errors ?? []);
      if (sampleRateHz !== undefined && f.errors?.some((e) => e.rule === 'empty-segment'))
        ctx.io.err(
          `  (with --rate ${sampleRateHz} Hz a segment shorter than ${(1 / sampleRateHz).toPrecision(3)} s gets no sample; raise --rate)`,
        );
      status = 1;
      continue;
    }
    const w = await writeOne(target, text, ctx, stop);
    if (w === 'interrupted') return interrupted(ctx, 'fly', written);
    if (w === 'failed') status = 1;
    else {
      written++;
      ctx.io.out(`wrote ${target}`);
    }
  }
  ctx.io.out(`\n${r.table}\n\n${CAUTION_TEXT}`);
  if (!runLines(r.runs, ctx)) status = 1;
  for (const v of r.constraintViolations ?? []) ctx.io.err(`constraint violated: ${v}`);
  return withConstraintStatus(status, (r.constraintViolations ?? []).length > 0);
}
