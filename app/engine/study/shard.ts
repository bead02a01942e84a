/**
 * Campaign shards: a shard is one range of case indices [first, end) of a deterministic case
 * generator (the robustness study: a case depends only on (seed, index)); shard i of K holds
 * [⌊i·N/K⌋, ⌊(i + 1)·N/K⌋) of N cases. Nothing here is specific to how the cases are drawn, so
 * a parameter sweep that numbers its cases can reuse the same files and merge.
 *
 * A shard file is text, self-describing, and written in one pass:
 *   line 1        header (JSON): format and version, the tool that wrote it, which shard and
 *                 which cases, the study (controllers and definition) and the scenario as run,
 *                 the table columns, and a sentence saying what the file holds;
 *   next lines    the shard's rows of cases.csv, byte for byte as the whole study writes them
 *                 (one per case and controller, in case order);
 *   last line     trailer (JSON): the row count and byte length, and the shard's mergeable
 *                 summary state (accumulate.ts), known only once every case has run.
 * A merge reads each header first and checks that the shards belong together, tile the study's
 * cases exactly once and were written by the same version (`planMerge`); it then copies the row
 * sections in case order into cases.csv and merges the states, one shard at a time.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { StudyAccumulator } from './accumulate';
import { accumulatedCases } from './accumulate';
import type { StudyAccumulatorJson } from './accumulateJson';
import { accumulatorFromJson, accumulatorToJson } from './accumulateJson';
import { CASE_COLUMNS } from './export';
import { pairwiseRanges } from '../math/stats';
import type { StudyInfo } from './summary';

export const SHARD_FORMAT = 'slewsmith-study-shard';
export const SHARD_END_FORMAT = 'slewsmith-study-shard-end';
export const SHARD_VERSION = 1;
export const SHARD_EXTENSION = '.slewsmith-shard';

/** Shard i of K over N cases: [⌊iN/K⌋, ⌊(i+1)N/K⌋). Needs 0 ≤ i < K ≤ N. */
export function shardRange(index: number, count: number, runs: number): { first: number; end: number } {
  return { first: Math.floor((index * runs) / count), end: Math.floor(((index + 1) * runs) / count) };
}

/** Problems with "i/K" for a study of `runs` cases (the path is the option the user typed). */
export function shardSpecIssues(index: number, count: number, runs: number, path = '--shard'): Issue[] {
  if (count > runs)
    return [
      {
        path,
        rule: 'shards-within-cases',
        message: `${path} ${index}/${count}: ${count} shards for ${runs} cases would leave shards empty; use at most ${runs}`,
      },
    ];
  if (index >= count)
    return [
      { path, rule: 'index', message: `${path} ${index}/${count}: the shard index must be below the shard count (0 to ${count - 1})` },
    ];
  return [];
}

/** `shard-00003-of-00020.slewsmith-shard` (zero-padded so that names sort in shard order). */
export function shardFileName(index: number, count: number): string {
  const w = Math.max(5, String(count).length);
  return `shard-${String(index).padStart(w, '0')}-of-${String(count).padStart(w, '0')}${SHARD_EXTENSION}`;
}

export interface ShardHeader {
  format: typeof SHARD_FORMAT;
  version: typeof SHARD_VERSION;
  /** The program that wrote it, e.g. "Slewsmith 0.1.0": shards of different versions are never merged. */
  tool: string;
  shard: { index: number; count: number };
  cases: { first: number; end: number; runs: number };
  study: Omit<StudyInfo, 'scenario'>;
  /** The scenario JSON as run (effective study block included). */
  scenario: unknown;
  columns: string[];
  contents: string;
}

export function shardHeader(info: StudyInfo, tool: string, index: number, count: number): ShardHeader {
  const { first, end } = shardRange(index, count, info.def.runs);
  return {
    format: SHARD_FORMAT,
    version: SHARD_VERSION,
    tool,
    shard: { index, count },
    cases: { first, end, runs: info.def.runs },
    study: { scenarioName: info.scenarioName, def: info.def, controllers: info.controllers },
    scenario: info.scenario ?? null,
    columns: [...CASE_COLUMNS],
    contents: `Shard ${index} of ${count} of the robustness study of "${info.scenarioName}" (seed ${info.def.seed}, ${info.def.runs} cases): cases ${first} to ${end - 1}. The lines after this one are their rows of cases.csv (columns above); the last line holds the row count and the shard's mergeable summary. Merge the shards with: slewsmith study merge <folder>`,
  };
}

/** The header line, newline included. */
export function shardHeaderLine(h: ShardHeader): string {
  return JSON.stringify(h) + '\n';
}

export interface ShardTrailer {
  rows: number;
  rowBytes: number;
  state: StudyAccumulator;
}

/** The trailer line, newline included: row count, row bytes and the state of the shard's cases. */
export function shardTrailerLine(h: ShardHeader, rows: number, rowBytes: number, state: StudyAccumulator): string {
  const end: { format: string; shard: ShardHeader['shard']; rows: number; rowBytes: number; state: StudyAccumulatorJson } = {
    format: SHARD_END_FORMAT,
    shard: h.shard,
    rows,
    rowBytes,
    state: accumulatorToJson(state),
  };
  return JSON.stringify(end) + '\n';
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isCount = (v: unknown): v is number => typeof v === 'number' && Number.isSafeInteger(v) && v >= 0;

function parseJsonLine(text: string, file: string, what: string): Result<Record<string, unknown>> {
  let v: unknown;
  try {
    v = JSON.parse(text);
  } catch {
    return fail([{ path: file, rule: 'shard-file', message: `${file}: the ${what} line is not JSON (not a shard file, or damaged)` }]);
  }
  if (!isObj(v)) return fail([{ path: file, rule: 'shard-file', message: `${file}: the ${what} line is not a JSON object` }]);
  return ok(v);
}

/** Read a shard's first line. `file` names it in every message. */
export function parseShardHeader(line: string, file: string): Result<ShardHeader> {
  const p = parseJsonLine(line, file, 'first');
  if (!p.ok) return p;
  const v = p.value;
  if (v.format !== SHARD_FORMAT)
    return fail([
      { path: file, rule: 'shard-file', message: `${file} is not a Slewsmith study shard (its first line names no "${SHARD_FORMAT}")` },
    ]);
  if (v.version !== SHARD_VERSION)
    return fail([
      {
        path: file,
        rule: 'same-version',
        message: `${file} is a shard of format version ${String(v.version)}; this Slewsmith reads version ${SHARD_VERSION}`,
      },
    ]);
  const sh = isObj(v.shard) ? v.shard : {};
  const cs = isObj(v.cases) ? v.cases : {};
  const st = isObj(v.study) ? v.study : {};
  const def = isObj(st.def) ? st.def : {};
  const shapeOk =
    typeof v.tool === 'string' &&
    isCount(sh.index) &&
    isCount(sh.count) &&
    (sh.index as number) < (sh.count as number) &&
    isCount(cs.first) &&
    isCount(cs.end) &&
    isCount(cs.runs) &&
    (cs.first as number) < (cs.end as number) &&
    (cs.end as number) <= (cs.runs as number) &&
    typeof st.scenarioName === 'string' &&
    Array.isArray(st.controllers) &&
    def.runs === cs.runs &&
    isCount(def.seed) &&
    isCount(def.worstCases) &&
    typeof def.durationS === 'number' &&
    Array.isArray(v.columns);
  if (!shapeOk) return fail([{ path: file, rule: 'shard-file', message: `${file}: the header is incomplete or inconsistent (damaged?)` }]);
  if (JSON.stringify(v.columns) !== JSON.stringify(CASE_COLUMNS))
    return fail([
      { path: file, rule: 'same-version', message: `${file} has other table columns than this Slewsmith writes (another version?)` },
    ]);
  return ok(v as unknown as ShardHeader);
}

/** Read a shard's last line against its header: counts, coverage of exactly the header's cases, the state. */
export function parseShardTrailer(line: string, h: ShardHeader, file: string): Result<ShardTrailer> {
  const p = parseJsonLine(line, file, 'last');
  if (!p.ok) return p;
  const v = p.value;
  const bad = (message: string) => fail<ShardTrailer>([{ path: file, rule: 'shard-file', message: `${file}: ${message}` }]);
  if (v.format !== SHARD_END_FORMAT) return bad('the last line is not the shard trailer (the file is incomplete: was its job stopped?)');
  if (!isObj(v.shard) || v.shard.index !== h.shard.index || v.shard.count !== h.shard.count)
    return bad('the trailer names another shard than the header');
  if (!isCount(v.rows) || !isCount(v.rowBytes)) return bad('the trailer has no row count');
  const info: StudyInfo = { ...h.study, scenario: h.scenario };
  const st = accumulatorFromJson(v.state, info, `${file}: state`);
  if (!st.ok) return fail(st.errors.map((e) => ({ ...e, message: e.message.startsWith(file) ? e.message : `${file}: ${e.message}` })));
  const ranges = pairwiseRanges(st.value.coverage);
  if (ranges.length !== 1 || ranges[0]![0] !== h.cases.first || ranges[0]![1] !== h.cases.end)
    return bad(`its summary covers other cases than ${h.cases.first}–${h.cases.end - 1}`);
  const controllers = h.study.controllers.length;
  if (v.rows !== (h.cases.end - h.cases.first) * controllers)
    return bad(
      `it holds ${v.rows} rows; ${h.cases.end - h.cases.first} cases × ${controllers} controllers need ${(h.cases.end - h.cases.first) * controllers}`,
    );
  if (accumulatedCases(st.value) !== h.cases.end - h.cases.first) return bad('its summary counts the wrong number of cases');
  return ok({ rows: v.rows, rowBytes: v.rowBytes, state: st.value });
}

/** The part of a header that must be the same in every shard of one campaign. */
function identity(h: ShardHeader): string {
  return JSON.stringify({ tool: h.tool, study: h.study, scenario: h.scenario });
}

/** First place two JSON values differ, as a path ("" when equal). */
function firstDifference(a: unknown, b: unknown, at: string): string | null {
  if (JSON.stringify(a) === JSON.stringify(b)) return null;
  if (isObj(a) && isObj(b)) {
    for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) {
      const d = firstDifference(a[k], b[k], at ? `${at}.${k}` : k);
      if (d !== null) return d;
    }
  }
  if (Array.isArray(a) && Array.isArray(b) && a.length === b.length) {
    for (let i = 0; i < a.length; i++) {
      const d = firstDifference(a[i], b[i], `${at}[${i}]`);
      if (d !== null) return d;
    }
  }
  return at || '(the whole scenario)';
}

/** Why shard `b` does not belong with shard `a` (one issue, naming both files). */
function mismatch(a: { file: string; header: ShardHeader }, b: { file: string; header: ShardHeader }): Issue {
  const x = a.header,
    y = b.header;
  const files = `${b.file} and ${a.file}`;
  if (x.tool !== y.tool)
    return { path: b.file, rule: 'same-version', message: `${files} were written by different versions (${y.tool}, ${x.tool})` };
  if (x.study.def.seed !== y.study.def.seed)
    return {
      path: b.file,
      rule: 'same-seed',
      message: `${files} are from studies with different seeds (${y.study.def.seed}, ${x.study.def.seed})`,
    };
  if (x.study.scenarioName !== y.study.scenarioName)
    return {
      path: b.file,
      rule: 'same-scenario',
      message: `${files} are from different scenarios ("${y.study.scenarioName}", "${x.study.scenarioName}")`,
    };
  if (x.cases.runs !== y.cases.runs)
    return {
      path: b.file,
      rule: 'same-scenario',
      message: `${files} are from studies of different sizes (${y.cases.runs}, ${x.cases.runs} cases)`,
    };
  const where = firstDifference(x.scenario, y.scenario, '') ?? firstDifference(x.study, y.study, 'study');
  return { path: b.file, rule: 'same-scenario', message: `${files} are from different scenarios (they differ at ${where})` };
}

/** Up to `max` items, then "… and N more". */
function listed(items: string[], max = 30): string {
  return items.length <= max ? items.join(', ') : `${items.slice(0, max).join(', ')} … and ${items.length - max} more`;
}

/**
 * Check that the shards belong to one study and tile its cases [0, runs) exactly once, and put
 * them in case order. Refusals name the files: a shard from another scenario, seed or version; a
 * shard given twice (or two that overlap); and the cases no shard holds, with the missing shard
 * indices when the shards agree on K.
 */
export function planMerge<T extends { file: string; header: ShardHeader }>(shards: readonly T[], tool: string): Result<T[]> {
  if (shards.length === 0) return fail([{ path: 'shards', rule: 'none', message: 'no shard files were given' }]);
  const issues: Issue[] = [];
  const sorted = [...shards].sort((a, b) => a.header.cases.first - b.header.cases.first || a.file.localeCompare(b.file));
  const ref = sorted[0]!;
  if (ref.header.tool !== tool)
    issues.push({
      path: ref.file,
      rule: 'same-version',
      message: `${ref.file} was written by ${ref.header.tool}; this is ${tool}: merge with the version that ran the shards (or run them again)`,
    });
  for (const s of sorted.slice(1)) if (identity(s.header) !== identity(ref.header)) issues.push(mismatch(ref, s));
  if (issues.length) return fail(issues);
  let covered = 0;
  const gaps: [number, number][] = [];
  for (let i = 0; i < sorted.length; i++) {
    const s = sorted[i]!;
    const { first, end } = s.header.cases;
    if (first < covered) {
      const prev = sorted.slice(0, i).find((p) => p.header.cases.end > first)!;
      const same = prev.header.cases.first === first && prev.header.cases.end === end;
      issues.push({
        path: s.file,
        rule: same ? 'duplicate' : 'overlap',
        message: same
          ? `${s.file} and ${prev.file} are the same shard (${s.header.shard.index} of ${s.header.shard.count}, cases ${first}–${end - 1}): give each shard once`
          : `${s.file} (cases ${first}–${end - 1}) overlaps ${prev.file} (cases ${prev.header.cases.first}–${prev.header.cases.end - 1})`,
      });
      continue;
    }
    if (first > covered) gaps.push([covered, first]);
    covered = end;
  }
  const runs = ref.header.cases.runs;
  if (covered < runs) gaps.push([covered, runs]);
  if (gaps.length) {
    const ks = new Set(sorted.map((s) => s.header.shard.count));
    const k = ks.size === 1 ? sorted[0]!.header.shard.count : null;
    const missingShards: string[] = [];
    if (k !== null)
      for (let i = 0; i < k; i++) {
        const r = shardRange(i, k, runs);
        if (gaps.some(([a, b]) => r.first >= a && r.end <= b)) missingShards.push(String(i));
      }
    const cases = gaps.map(([a, b]) => (b - a === 1 ? `${a}` : `${a}–${b - 1}`));
    issues.push({
      path: 'shards',
      rule: 'missing',
      message:
        k !== null
          ? `${missingShards.length} of ${k} shards are missing: ${listed(missingShards)} (cases ${listed(cases, 10)}); run them (slewsmith study <scenario> --shard i/${k} --out <folder>) and merge again`
          : `no shard holds cases ${listed(cases, 10)}; run the shards that hold them and merge again`,
    });
  }
  return issues.length ? fail(issues) : ok(sorted);
}
