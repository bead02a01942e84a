/**
 * Sweep shards: a campaign of a robustness sweep split over processes or batch array tasks. A
 * sweep cell depends only on (scenario, sweep definition, cell index) (sweepRun.ts), so shard i of
 * K runs the contiguous cell range [⌊i·N/K⌋, ⌊(i + 1)·N/K⌋) of N cells — the study shards' split
 * (shard.ts shardRange) applied to cell indices — and a merge of all K shards is the same result,
 * hence the same cells.csv and sweep.json bytes, as one process running every cell.
 *
 * A sweep shard file is one JSON object (cells are summaries, a few hundred bytes per controller,
 * so no streaming is needed): format and version, the tool that wrote it, which shard and which
 * cells, the sweep's info (definition, controllers, theory inputs), the scenario as given, a
 * sentence saying what the file holds, and the finished cells in cell order.
 *
 * `planSweepMerge` refuses, naming the files: shards of another format version or tool, of
 * another scenario or sweep definition, a shard given twice or two that overlap, a shard whose
 * cells are not exactly the ones it claims, and the cells (with their grid values) no shard holds.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { shardRange } from './shard';
import type { SweepCell, SweepInfo } from './sweepRun';

export const SWEEP_SHARD_FORMAT = 'slewsmith-sweep-shard';
export const SWEEP_SHARD_VERSION = 1;
export const SWEEP_SHARD_EXTENSION = '.slewsmith-sweep-shard';

export interface SweepShard {
  format: typeof SWEEP_SHARD_FORMAT;
  version: typeof SWEEP_SHARD_VERSION;
  /** The program that wrote it, e.g. "Slewsmith 0.1.0": shards of different versions are never merged. */
  tool: string;
  shard: { index: number; count: number };
  /** The cell range [first, end) of `total` cells. */
  cells: { first: number; end: number; total: number };
  info: SweepInfo;
  /** The scenario JSON as given to the sweep. */
  scenario: unknown;
  contents: string;
  /** The shard's finished cells, in cell order. */
  done: SweepCell[];
}

/** Shard i of K over N cells: the cell indices [first, end). Needs 0 ≤ i < K ≤ N. */
export function sweepShardCells(index: number, count: number, cells: number): { first: number; end: number } {
  return shardRange(index, count, cells);
}

/** Problems with "i/K" for a sweep of `cells` cells (the path is the option the user typed). */
export function sweepShardSpecIssues(index: number, count: number, cells: number, path = '--shard'): Issue[] {
  if (count > cells)
    return [
      {
        path,
        rule: 'shards-within-cells',
        message: `${path} ${index}/${count}: ${count} shards for a grid of ${cells} cells would leave shards empty; use at most ${cells}`,
      },
    ];
  if (index >= count)
    return [
      { path, rule: 'index', message: `${path} ${index}/${count}: the shard index must be below the shard count (0 to ${count - 1})` },
    ];
  return [];
}

/** `sweep-shard-00003-of-00020.slewsmith-sweep-shard` (zero-padded so that names sort in shard order). */
export function sweepShardFileName(index: number, count: number): string {
  const w = Math.max(5, String(count).length);
  return `sweep-shard-${String(index).padStart(w, '0')}-of-${String(count).padStart(w, '0')}${SWEEP_SHARD_EXTENSION}`;
}

/** The shard file's text (newline-terminated); `done` must be exactly the shard's cells. */
export function sweepShardText(
  info: SweepInfo,
  scenario: unknown,
  tool: string,
  index: number,
  count: number,
  done: readonly SweepCell[],
): string {
  const { first, end } = sweepShardCells(index, count, info.cells);
  const s: SweepShard = {
    format: SWEEP_SHARD_FORMAT,
    version: SWEEP_SHARD_VERSION,
    tool,
    shard: { index, count },
    cells: { first, end, total: info.cells },
    info,
    scenario,
    contents: `Shard ${index} of ${count} of the robustness sweep of "${info.scenarioName}" (seed ${info.def.seed}, ${info.cells} cells of ${info.def.runs} cases): cells ${first} to ${end - 1}, in "done". Merge the shards with: slewsmith sweep merge <files or folders>`,
    done: [...done].sort((a, b) => a.index - b.index),
  };
  return JSON.stringify(s) + '\n';
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isCount = (v: unknown): v is number => typeof v === 'number' && Number.isSafeInteger(v) && v >= 0;

/** Read a shard file's text. `file` names it in every message. */
export function parseSweepShard(text: string, file: string): Result<SweepShard> {
  const bad = (rule: string, message: string) => fail<SweepShard>([{ path: file, rule, message: `${file}: ${message}` }]);
  let v: unknown;
  try {
    v = JSON.parse(text);
  } catch {
    return bad('shard-file', 'not JSON (not a sweep shard file, or damaged: was its job stopped while writing?)');
  }
  if (!isObj(v) || v.format !== SWEEP_SHARD_FORMAT)
    return bad('shard-file', `not a Slewsmith sweep shard (it names no "${SWEEP_SHARD_FORMAT}")`);
  if (v.version !== SWEEP_SHARD_VERSION)
    return bad('same-version', `a sweep shard of format version ${String(v.version)}; this Slewsmith reads version ${SWEEP_SHARD_VERSION}`);
  const sh = isObj(v.shard) ? v.shard : {};
  const cs = isObj(v.cells) ? v.cells : {};
  const info = isObj(v.info) ? v.info : {};
  const def = isObj(info.def) ? info.def : {};
  const shapeOk =
    typeof v.tool === 'string' &&
    isCount(sh.index) &&
    isCount(sh.count) &&
    (sh.index as number) < (sh.count as number) &&
    isCount(cs.first) &&
    isCount(cs.end) &&
    isCount(cs.total) &&
    (cs.first as number) < (cs.end as number) &&
    (cs.end as number) <= (cs.total as number) &&
    info.cells === cs.total &&
    typeof info.scenarioName === 'string' &&
    Array.isArray(info.controllers) &&
    Array.isArray(def.axes) &&
    isCount(def.runs) &&
    isCount(def.seed) &&
    Array.isArray(v.done);
  if (!shapeOk) return bad('shard-file', 'the shard is incomplete or inconsistent (damaged?)');
  const s = v as unknown as SweepShard;
  const range = sweepShardCells(s.shard.index, s.shard.count, s.cells.total);
  if (range.first !== s.cells.first || range.end !== s.cells.end)
    return bad(
      'shard-file',
      `shard ${s.shard.index} of ${s.shard.count} would hold cells ${range.first}–${range.end - 1}, not ${s.cells.first}–${s.cells.end - 1}`,
    );
  const nCtrl = s.info.controllers.length;
  const want = s.cells.end - s.cells.first;
  const idx = s.done.map((c) =>
    isObj(c) && isCount(c.index) && Array.isArray(c.controllers) && c.controllers.length === nCtrl ? c.index : -1,
  );
  const expected = Array.from({ length: want }, (_, k) => s.cells.first + k);
  if (JSON.stringify(idx) !== JSON.stringify(expected))
    return bad(
      'shard-file',
      `it should hold cells ${s.cells.first}–${s.cells.end - 1} once each, in order, with ${nCtrl} controller${nCtrl === 1 ? '' : 's'} per cell; it holds ${s.done.length} cells (damaged?)`,
    );
  return ok(s);
}

/** The part that must be the same in every shard of one sweep. */
const identity = (s: SweepShard) => JSON.stringify({ tool: s.tool, info: s.info, scenario: s.scenario });

/** Why shard `b` does not belong with shard `a` (one issue, naming both files). */
function mismatch(a: { file: string; shard: SweepShard }, b: { file: string; shard: SweepShard }): Issue {
  const x = a.shard,
    y = b.shard;
  const files = `${b.file} and ${a.file}`;
  const issue = (rule: string, what: string): Issue => ({ path: b.file, rule, message: `${files} ${what}` });
  if (x.tool !== y.tool) return issue('same-version', `were written by different versions (${y.tool}, ${x.tool})`);
  if (JSON.stringify(x.scenario) !== JSON.stringify(y.scenario) || x.info.scenarioName !== y.info.scenarioName)
    return issue('same-scenario', `are from different scenarios ("${y.info.scenarioName}", "${x.info.scenarioName}")`);
  if (x.info.def.seed !== y.info.def.seed)
    return issue('same-seed', `are from sweeps with different seeds (${y.info.def.seed}, ${x.info.def.seed})`);
  if (JSON.stringify(x.info.def) !== JSON.stringify(y.info.def))
    return issue('same-sweep', 'are from different sweeps of the scenario (grid, cases per cell, controllers or level differ)');
  return issue('same-sweep', 'are from different runs of the sweep (their sweep information differs)');
}

/** Up to `max` items, then "… and N more". */
function listed(items: string[], max = 20): string {
  return items.length <= max ? items.join(', ') : `${items.slice(0, max).join(', ')} … and ${items.length - max} more`;
}

/** "cell 7 (hysteresis = 0.2, worst-case-eta = 0.1)". */
function cellText(info: SweepInfo, index: number): string {
  const dims = info.def.axes.map((a) => a.values.length);
  let r = index;
  const parts = info.def.axes.map((a, k) => {
    const p = r % dims[k]!;
    r = Math.floor(r / dims[k]!);
    return `${a.parameter} = ${a.values[p]}`;
  });
  return `cell ${index} (${parts.join(', ')})`;
}

/**
 * Check that the shards belong to one sweep and hold each of its cells exactly once; gives the
 * sweep's info and every cell in cell order.
 */
export function planSweepMerge(
  shards: readonly { file: string; shard: SweepShard }[],
  tool: string,
): Result<{ info: SweepInfo; cells: SweepCell[] }> {
  if (shards.length === 0) return fail([{ path: 'shards', rule: 'none', message: 'no sweep shard files were given' }]);
  const issues: Issue[] = [];
  const sorted = [...shards].sort((a, b) => a.shard.cells.first - b.shard.cells.first || a.file.localeCompare(b.file));
  const ref = sorted[0]!;
  if (ref.shard.tool !== tool)
    issues.push({
      path: ref.file,
      rule: 'same-version',
      message: `${ref.file} was written by ${ref.shard.tool}; this is ${tool}: merge with the version that ran the shards (or run them again)`,
    });
  for (const s of sorted.slice(1)) if (identity(s.shard) !== identity(ref.shard)) issues.push(mismatch(ref, s));
  if (issues.length) return fail(issues);
  const info = ref.shard.info;
  const owner = new Set<number>();
  const cells: SweepCell[] = [];
  let covered = 0;
  for (let i = 0; i < sorted.length; i++) {
    const s = sorted[i]!;
    const { first, end } = s.shard.cells;
    if (first < covered) {
      const prev = sorted.slice(0, i).find((p) => p.shard.cells.end > first)!;
      const same = prev.shard.cells.first === first && prev.shard.cells.end === end;
      issues.push({
        path: s.file,
        rule: same ? 'duplicate' : 'overlap',
        message: same
          ? `${s.file} and ${prev.file} are the same shard (${s.shard.shard.index} of ${s.shard.shard.count}, cells ${first}–${end - 1}): give each shard once`
          : `${s.file} (cells ${first}–${end - 1}) overlaps ${prev.file} (cells ${prev.shard.cells.first}–${prev.shard.cells.end - 1})`,
      });
      continue;
    }
    covered = end;
    for (const c of s.shard.done) {
      owner.add(c.index);
      cells.push(c);
    }
  }
  const missing: number[] = [];
  for (let i = 0; i < info.cells; i++) if (!owner.has(i)) missing.push(i);
  if (missing.length) {
    const ks = new Set(sorted.map((s) => s.shard.shard.count));
    const k = ks.size === 1 ? ref.shard.shard.count : null;
    const missingShards: string[] = [];
    if (k !== null)
      for (let i = 0; i < k; i++) {
        const r = sweepShardCells(i, k, info.cells);
        if (missing.includes(r.first)) missingShards.push(String(i));
      }
    const what = listed(
      missing.map((i) => cellText(info, i)),
      10,
    );
    issues.push({
      path: 'shards',
      rule: 'missing',
      message:
        k !== null
          ? `${missingShards.length} of ${k} shards are missing: ${listed(missingShards)}, so no shard holds ${what}; run them (slewsmith sweep <scenario> … --shard i/${k} --out <folder>) and merge again`
          : `no shard holds ${what}; run the shards that hold them and merge again`,
    });
  }
  if (issues.length) return fail(issues);
  return ok({ info, cells: cells.sort((a, b) => a.index - b.index) });
}
