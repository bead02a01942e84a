/**
 * JSON export: the same per-sample table as the CSV (one array per column), plus the scenario
 * file, the resolved targets, segments, jump events, plan, metrics (with the settings they were
 * computed with, the Lyapunov monitor's flags, the run's outcome and verdict), conventions and the caution
 * (and, for a run that was cut short or failed, an `incomplete` sentence right after it).
 * Opaque inputs (plan, metrics) are copied through a strict JSON filter: a NaN, Infinity,
 * function, bigint or cycle anywhere is an error naming its path, never a silent `null`.
 *
 * Streamed (chunks.ts): everything but the per-sample table is one JSON.stringify; the table
 * (`channels`, the document's last member) follows column by column in chunks, formatted exactly
 * as JSON.stringify would format it with the same indentation (ECMA-262 §25.5.2.4 SerializeJSONArray
 * and SerializeJSONObject: members separated by "," plus, when indenting, a line break and the
 * indentation of their depth; numbers as Number::toString).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { collectChunks, LineChunker, type ChunkedExport, type ChunkSource } from './chunks';
import type { Column } from './columns';
import type { ScenarioSummary } from '../pipeline/types';
import type { RunTrace } from '../sim/types';
import { CAUTION_TEXT, FRAME_CONVENTION, QUATERNION_CONVENTION, TIME_CONVENTION } from '../caution';
import { selectSamples, traceColumns } from './columns';
import { constraintColumnNames, constraintColumns } from './constraintColumns';
import { DEG_PER_RAD } from '../units';
import { exportSegments } from './segments';
import { checkExportInputs } from './prepare';
import type { ExportMeta } from './types';

export const RUN_FORMAT = 'slewsmith-run';
export const RUN_FORMAT_VERSION = 1;

export interface JsonOptions {
  sampleRateHz?: number;
  /** JSON.stringify indentation, 0–8 (default 0: compact). */
  indent?: number;
}

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Strict JSON copy of `v`; problems are pushed with their path. Undefined members are dropped. */
export function toJsonSafe(v: unknown, path: string, errors: Issue[], seen: Set<object> = new Set()): Json | undefined {
  if (v === undefined) return undefined;
  if (v === null || typeof v === 'boolean' || typeof v === 'string') return v;
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) {
      errors.push({ path, rule: 'finite', message: `${path} is ${String(v)}; JSON exports carry finite numbers only` });
      return null;
    }
    return v === 0 ? 0 : v;
  }
  if (typeof v !== 'object') {
    errors.push({ path, rule: 'json-type', message: `${path} is a ${typeof v}, which JSON cannot hold` });
    return null;
  }
  if (seen.has(v)) {
    errors.push({ path, rule: 'cycle', message: `${path} refers back to one of its own parents` });
    return null;
  }
  if (ArrayBuffer.isView(v)) {
    if (v instanceof DataView || typeof (v as unknown as { length?: unknown }).length !== 'number') {
      errors.push({ path, rule: 'json-type', message: `${path} is a binary view, which JSON cannot hold` });
      return null;
    }
    return Array.from(v as unknown as ArrayLike<number | bigint>, (x, i) => toJsonSafe(x, `${path}[${i}]`, errors, seen) ?? null);
  }
  seen.add(v);
  let out: Json;
  if (Array.isArray(v)) {
    out = v.map((x, i) => toJsonSafe(x, `${path}[${i}]`, errors, seen) ?? null);
  } else {
    const proto = Object.getPrototypeOf(v);
    if (proto !== Object.prototype && proto !== null) {
      errors.push({
        path,
        rule: 'json-type',
        message: `${path} is a ${proto?.constructor?.name ?? 'non-plain'} object; pass plain objects and arrays`,
      });
      seen.delete(v);
      return null;
    }
    const o: { [k: string]: Json } = {};
    for (const [k, x] of Object.entries(v)) {
      const j = toJsonSafe(x, `${path}.${k}`, errors, seen);
      if (j !== undefined) o[k] = j;
    }
    out = o;
  }
  seen.delete(v);
  return out;
}

/** The whole JSON document as one string (tests, the app's download); the CLI streams jsonChunks instead. */
export function writeJson(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: JsonOptions = {}): Result<string> {
  return collectChunks(jsonChunks(trace, scenario, meta, options));
}

/** Checks every input, then the JSON text chunk by chunk (chunks.ts). */
export function jsonChunks(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: JsonOptions = {}): ChunkedExport {
  const errors = checkExportInputs(trace, scenario, meta);
  const indent = options.indent ?? 0;
  if (!Number.isInteger(indent) || indent < 0 || indent > 8) {
    errors.push({
      path: 'options.indent',
      rule: 'range',
      message: `options.indent must be a whole number from 0 to 8 (got ${String(indent)})`,
    });
  }
  if (errors.length) return fail(errors);
  const sel = selectSamples(trace, options.sampleRateHz);
  if (!sel.ok) return sel;
  const segs = exportSegments(trace, scenario, meta.segments);
  if (!segs.ok) return segs;

  const idx = sel.value;
  const cols = [...traceColumns(trace.nWheels), ...constraintColumns(meta.constraints)];
  const units: Record<string, string> = {};
  for (const c of cols) units[c.name] = c.unit;

  const doc = {
    format: RUN_FORMAT,
    version: RUN_FORMAT_VERSION,
    caution: CAUTION_TEXT,
    incomplete: meta.incomplete,
    tool: { name: meta.toolName, version: meta.toolVersion },
    conventions: {
      quaternion: QUATERNION_CONVENTION,
      quaternionOrder: ['x', 'y', 'z', 'w'],
      frames: FRAME_CONVENTION,
      time: TIME_CONVENTION,
      units,
    },
    epochUtc: scenario.epochUtc,
    inertialFrame: scenario.inertialFrame,
    controller: meta.controllerId !== undefined ? { id: meta.controllerId, label: meta.controllerLabel } : { label: meta.controllerLabel },
    scenario: scenario.file,
    resolved: {
      initialQInertialFromBody: Array.from(scenario.initialQ),
      targets: scenario.targets.map((t) => ({
        label: t.label,
        form: t.form,
        qInertialFromBody: Array.from(t.q),
        holdS: t.holdS,
        ...(t.pointingOnly ? { pointingOnly: t.pointingOnly } : {}),
      })),
    },
    segments: segs.value,
    ...(scenario.orbit ? { orbit: scenario.orbit } : {}),
    wheels: meta.wheels
      ? {
          axes: Array.from(meta.wheels.axes),
          maxTorqueNm: Array.from(meta.wheels.maxTorqueNm),
          maxMomentumNms: Array.from(meta.wheels.maxMomentumNms),
        }
      : undefined,
    jumpEvents: meta.jumpEvents ?? [],
    plan: meta.plan,
    metrics: meta.metrics,
    metricInputs: meta.metricInputs,
    monitor: meta.monitor,
    outcome: meta.outcome,
    verdict: meta.verdict,
    ...(meta.constraints?.length
      ? {
          constraints: meta.constraints.map((c, i) => ({
            name: c.name,
            kind: c.kind,
            column: constraintColumnNames(meta.constraints!.map((x) => x.name))[i],
            minMarginDeg: Number.isFinite(c.minMarginRad) ? c.minMarginRad * DEG_PER_RAD : null,
            minAtS: Number.isFinite(c.minMarginRad) ? c.minAtS : null,
            violatedS: c.violatedS,
            violations: c.violations,
          })),
        }
      : {}),
    samples: { count: idx.length, ofTrace: trace.n, sampleRateHz: options.sampleRateHz ?? null },
  };
  const jsonErrors: Issue[] = [];
  const safe = toJsonSafe(doc, 'export', jsonErrors);
  if (jsonErrors.length) return fail(jsonErrors);
  return ok(jsonDocument(JSON.stringify(safe, null, indent || undefined), trace, idx, cols, indent));
}

/**
 * The document: `head` (every member but the table, as JSON.stringify wrote it) reopened, then
 * the member "channels" — one array per column — and the closing braces, with JSON.stringify's
 * layout for `indent` spaces (0: compact). Values are checked finite as they are written (the
 * trace check already holds them to that; a column computed from finite values could still
 * overflow): a non-finite one stops the document with a problem naming it.
 */
function* jsonDocument(head: string, trace: RunTrace, idx: Int32Array, cols: readonly Column[], indent: number): ChunkSource {
  const pad = (depth: number) => (indent ? '\n' + ' '.repeat(indent * depth) : '');
  const colon = indent ? ': ' : ':';
  // `head` ends with its closing brace (preceded by a line break when indenting): reopen it.
  const out = new LineChunker('');
  let chunk = out.add(`${head.slice(0, indent ? -2 : -1)},${pad(1)}"channels"${colon}{`);
  if (chunk !== null) yield chunk;
  for (let c = 0; c < cols.length; c++) {
    const col = cols[c]!;
    chunk = out.add(`${c ? ',' : ''}${pad(2)}${JSON.stringify(col.name)}${colon}[`);
    if (chunk !== null) yield chunk;
    for (let m = 0; m < idx.length; m++) {
      const x = col.get(trace, idx[m]!);
      if (col.undefinedAsNaN && Number.isNaN(x)) {
        chunk = out.add(`${m ? ',' : ''}${pad(3)}null`);
        if (chunk !== null) yield chunk;
        continue;
      }
      if (!Number.isFinite(x))
        return [
          {
            path: `export.channels.${col.name}[${m}]`,
            rule: 'finite',
            message: `export.channels.${col.name}[${m}] is ${String(x)}; JSON exports carry finite numbers only`,
          },
        ];
      chunk = out.add(`${m ? ',' : ''}${pad(3)}${x === 0 ? 0 : x}`);
      if (chunk !== null) yield chunk;
    }
    chunk = out.add(`${pad(2)}]`);
    if (chunk !== null) yield chunk;
  }
  chunk = out.add(`${pad(1)}}${pad(0)}}\n`);
  if (chunk !== null) yield chunk;
  const rest = out.flush();
  if (rest !== null) yield rest;
  return [];
}
