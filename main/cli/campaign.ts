/**
 * Campaign files on disk: the study table streamed case by case, shard files, and the merge.
 *
 * - `StudyTableStream`: cases.csv written as cases finish (workers finish out of order; the
 *   CaseOrderer puts them back in case order), atomically (main/atomic-stream.ts), so a study of
 *   any size never holds its table as one string.
 * - `ShardStream`: one shard file (app/engine/study/shard.ts): header line, the shard's rows,
 *   trailer with its mergeable summary state; atomic, so re-running a shard replaces it whole.
 * - `mergeShards`: reads each shard's header and trailer (never the whole file), checks that the
 *   shards tile one study (planMerge), merges their states, copies the row sections in case order
 *   into cases.csv as a stream and writes summary.json — the bytes a single-process study of the
 *   same seed writes.
 */
import { open, readdir, stat } from 'node:fs/promises';
import path from 'node:path';
import { createAtomicStreamWriter, type AtomicStreamWriter } from '../atomic-stream';
import type { Issue, Result } from '../../app/engine/errors';
import { fail, ok } from '../../app/engine/errors';
import type { CaseRecord } from '../../app/engine/study/runCase';
import type { StudyInfo, StudySummary } from '../../app/engine/study/summary';
import { studySummaryOf } from '../../app/engine/study/summary';
import type { StudyAccumulator } from '../../app/engine/study/accumulate';
import { mergeStudyAccumulators } from '../../app/engine/study/accumulate';
import { CaseOrderer } from '../../app/engine/study/ordered';
import { caseRowsText, casesCsvHead, casesCsvTail, summaryJson } from '../../app/engine/study/export';
import type { ShardHeader } from '../../app/engine/study/shard';
import {
  parseShardHeader,
  parseShardTrailer,
  planMerge,
  shardFileName,
  shardHeader,
  shardHeaderLine,
  shardTrailerLine,
  SHARD_EXTENSION,
} from '../../app/engine/study/shard';
import { writeFileAtomicNode } from './fs';

/** Text is gathered up to this many characters before it is handed to the writer. */
const FLUSH_CHARS = 1 << 16;

/** Case rows to a file in case order, through a buffer; every write is queued on one chain. */
class OrderedRows {
  private readonly orderer: CaseOrderer;
  private buffer = '';
  private chain: Promise<boolean> = Promise.resolve(true);
  rows = 0;
  bytes = 0;

  constructor(
    private readonly w: AtomicStreamWriter,
    first: number,
  ) {
    this.orderer = new CaseOrderer(first);
  }

  protected text(t: string): void {
    this.buffer += t;
    if (this.buffer.length >= FLUSH_CHARS) this.flush();
  }

  protected flush(): void {
    const chunk = this.buffer;
    this.buffer = '';
    if (chunk) this.chain = this.chain.then((go) => (go ? this.w.write(chunk) : false));
  }

  private rowsOf(rec: CaseRecord): void {
    const t = caseRowsText(rec);
    this.rows += rec.runs.length;
    this.bytes += Buffer.byteLength(t, 'utf8');
    this.text(t);
  }

  /** A finished case (any order). */
  add(rec: CaseRecord): void {
    for (const r of this.orderer.push(rec)) this.rowsOf(r);
  }

  /** Cases left waiting behind a gap (a study stopped early), in case order. */
  protected drain(): void {
    for (const r of this.orderer.drain()) this.rowsOf(r);
  }

  protected async finish(tail: string): Promise<Result<void>> {
    this.text(tail);
    this.flush();
    await this.chain;
    const r = await this.w.commit();
    return r.ok ? ok(undefined) : fail([{ path: this.w.target, rule: 'write', message: `could not write ${this.w.target}: ${r.message}` }]);
  }

  abort(): Promise<void> {
    return this.w.abort();
  }
}

/** cases.csv of a whole study, written while it runs. */
export class StudyTableStream extends OrderedRows {
  constructor(file: string, info: StudyInfo) {
    super(createAtomicStreamWriter(file), 0);
    this.text(casesCsvHead(info));
  }

  /** Writes what is left (cases after a gap, the closing line) and replaces the file. */
  close(summary: StudySummary): Promise<Result<void>> {
    this.drain();
    return this.finish(casesCsvTail(summary));
  }
}

/** One shard file, written while its cases run. */
export class ShardStream extends OrderedRows {
  readonly header: ShardHeader;

  constructor(
    readonly file: string,
    info: StudyInfo,
    tool: string,
    index: number,
    count: number,
  ) {
    const header = shardHeader(info, tool, index, count);
    super(createAtomicStreamWriter(file), header.cases.first);
    this.header = header;
    this.text(shardHeaderLine(header));
  }

  /** Writes the trailer with the shard's state and replaces the file. Only for a shard that ran every case. */
  close(state: StudyAccumulator): Promise<Result<void>> {
    this.drain();
    return this.finish(shardTrailerLine(this.header, this.rows, this.bytes, state));
  }
}

export { shardFileName };

interface ShardOnDisk {
  file: string;
  header: ShardHeader;
  /** Byte offsets of the row section [rowsStart, rowsEnd). */
  rowsStart: number;
  rowsEnd: number;
  size: number;
}

/** The first line of a file (read in chunks until the first newline). */
async function firstLine(file: string): Promise<Result<{ text: string; bytes: number }>> {
  const h = await open(file, 'r');
  try {
    const parts: Buffer[] = [];
    let pos = 0;
    for (;;) {
      const buf = Buffer.alloc(1 << 16);
      const { bytesRead } = await h.read(buf, 0, buf.length, pos);
      if (bytesRead === 0) break;
      const nl = buf.subarray(0, bytesRead).indexOf(10);
      if (nl >= 0) {
        parts.push(buf.subarray(0, nl));
        const text = Buffer.concat(parts).toString('utf8');
        return ok({ text, bytes: pos + nl + 1 });
      }
      parts.push(buf.subarray(0, bytesRead));
      pos += bytesRead;
      if (pos > 64 << 20) break;
    }
  } finally {
    await h.close();
  }
  return fail([{ path: file, rule: 'shard-file', message: `${file}: no complete first line (not a shard file, or cut short)` }]);
}

/** The last line of a file (the text after the last-but-one newline), read from the end. */
async function lastLine(file: string, size: number): Promise<Result<{ text: string; start: number }>> {
  const h = await open(file, 'r');
  try {
    const parts: Buffer[] = [];
    let pos = size - 1; // before the final newline
    while (pos > 0) {
      const len = Math.min(1 << 16, pos);
      const buf = Buffer.alloc(len);
      await h.read(buf, 0, len, pos - len);
      const nl = buf.lastIndexOf(10);
      if (nl >= 0) {
        parts.unshift(buf.subarray(nl + 1));
        return ok({ text: Buffer.concat(parts).toString('utf8'), start: pos - len + nl + 1 });
      }
      parts.unshift(buf);
      pos -= len;
    }
  } finally {
    await h.close();
  }
  return fail([{ path: file, rule: 'shard-file', message: `${file}: no trailer line (the file is incomplete)` }]);
}

/** Shard files named on the command line: files as given, folders searched (one level) for *.slewsmith-shard. */
export async function findShardFiles(args: readonly string[]): Promise<Result<string[]>> {
  const issues: Issue[] = [];
  const files: string[] = [];
  for (const a of args) {
    const st = await stat(a).catch(() => null);
    if (!st) issues.push({ path: a, rule: 'exists', message: `${a}: no such file or folder` });
    else if (st.isDirectory()) {
      const names = (await readdir(a)).filter((n) => n.endsWith(SHARD_EXTENSION)).sort();
      if (names.length === 0) issues.push({ path: a, rule: 'shards', message: `${a} holds no shard files (*${SHARD_EXTENSION})` });
      files.push(...names.map((n) => path.join(a, n)));
    } else files.push(a);
  }
  return issues.length ? fail(issues) : ok(files);
}

async function readShardHead(file: string): Promise<Result<ShardOnDisk>> {
  const st = await stat(file).catch(() => null);
  if (!st || !st.isFile()) return fail([{ path: file, rule: 'exists', message: `${file}: not a readable file` }]);
  const l = await firstLine(file);
  if (!l.ok) return l;
  const h = parseShardHeader(l.value.text, file);
  if (!h.ok) return h;
  return ok({ file, header: h.value, rowsStart: l.value.bytes, rowsEnd: -1, size: st.size });
}

export interface MergeOutcome {
  info: StudyInfo;
  summary: StudySummary;
  shards: number;
  files: string[];
}

/** Copy bytes [start, end) of `file` into the writer, in chunks. */
async function copyRange(file: string, start: number, end: number, w: AtomicStreamWriter): Promise<boolean> {
  const h = await open(file, 'r');
  try {
    for (let pos = start; pos < end;) {
      const len = Math.min(1 << 20, end - pos);
      const buf = Buffer.alloc(len);
      const { bytesRead } = await h.read(buf, 0, len, pos);
      if (bytesRead === 0) return false;
      if (!(await w.write(buf.subarray(0, bytesRead)))) return false;
      pos += bytesRead;
    }
    return true;
  } finally {
    await h.close();
  }
}

/**
 * Merge shard files into `outDir`/cases.csv and summary.json. `tool` is this program ("Slewsmith
 * 0.1.0"): shards written by another version are refused. Every refusal names the files.
 */
export async function mergeShards(files: readonly string[], outDir: string, tool: string): Promise<Result<MergeOutcome>> {
  const heads: ShardOnDisk[] = [];
  const issues: Issue[] = [];
  for (const f of files) {
    const r = await readShardHead(f);
    if (r.ok) heads.push(r.value);
    else issues.push(...r.errors);
  }
  if (issues.length) return fail(issues);
  const plan = planMerge(heads, tool);
  if (!plan.ok) return fail(plan.errors);
  const ordered = plan.value;
  const first = ordered[0]!;
  const info: StudyInfo = { ...first.header.study, scenario: first.header.scenario };
  // Trailers one at a time: each shard's state is merged and dropped.
  let acc: StudyAccumulator | null = null;
  for (const s of ordered) {
    const t = await lastLine(s.file, s.size);
    if (!t.ok) return fail(t.errors);
    const tr = parseShardTrailer(t.value.text, s.header, s.file);
    if (!tr.ok) return fail(tr.errors);
    if (t.value.start - s.rowsStart !== tr.value.rowBytes)
      return fail([
        {
          path: s.file,
          rule: 'shard-file',
          message: `${s.file}: its rows take ${t.value.start - s.rowsStart} bytes, its trailer says ${tr.value.rowBytes} (damaged?)`,
        },
      ]);
    s.rowsEnd = t.value.start;
    if (acc === null) acc = tr.value.state;
    else {
      const m = mergeStudyAccumulators(acc, tr.value.state);
      if (!m.ok) return fail(m.errors.map((e) => ({ ...e, path: s.file, message: `${s.file}: ${e.message}` })));
      acc = m.value;
    }
  }
  const summary = studySummaryOf(info, acc!);
  const csvFile = path.join(outDir, 'cases.csv');
  const w = createAtomicStreamWriter(csvFile);
  let going = await w.write(casesCsvHead(info));
  for (const s of ordered) if (going) going = await copyRange(s.file, s.rowsStart, s.rowsEnd, w);
  if (going) going = await w.write(casesCsvTail(summary));
  if (!going) {
    await w.abort();
    return fail([
      { path: csvFile, rule: 'write', message: `could not write ${csvFile} (a shard changed while it was read, or the disk refused)` },
    ]);
  }
  const c = await w.commit();
  if (!c.ok) return fail([{ path: csvFile, rule: 'write', message: `could not write ${csvFile}: ${c.message}` }]);
  const sumFile = path.join(outDir, 'summary.json');
  const sw = await writeFileAtomicNode(sumFile, summaryJson(info, summary, acc!.map));
  if (!sw.ok) return fail([{ path: sumFile, rule: 'write', message: `could not write ${sumFile}: ${sw.message}` }]);
  return ok({ info, summary, shards: ordered.length, files: [csvFile, sumFile] });
}
