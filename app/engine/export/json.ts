/**
 * JSON export: the same per-sample table as the CSV (one array per column), plus the scenario
 * file, the resolved targets, segments, jump events, plan, metrics, conventions and the caution.
 * Opaque inputs (plan, metrics) are copied through a strict JSON filter: a NaN, Infinity,
 * function, bigint or cycle anywhere is an error naming its path, never a silent `null`.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { ScenarioSummary } from '../pipeline/types';
import type { RunTrace } from '../sim/types';
import { CAUTION_TEXT, FRAME_CONVENTION, QUATERNION_CONVENTION, TIME_CONVENTION } from '../caution';
import { selectSamples, traceColumns } from './columns';
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

export function writeJson(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: JsonOptions = {}): Result<string> {
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
  const cols = traceColumns(trace.nWheels);
  const channels: Record<string, number[]> = {};
  const units: Record<string, string> = {};
  for (const c of cols) {
    const a = new Array<number>(idx.length);
    for (let m = 0; m < idx.length; m++) {
      const x = c.get(trace, idx[m]!);
      a[m] = x === 0 ? 0 : x;
    }
    channels[c.name] = a;
    units[c.name] = c.unit;
  }

  const doc = {
    format: RUN_FORMAT,
    version: RUN_FORMAT_VERSION,
    caution: CAUTION_TEXT,
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
    samples: { count: idx.length, ofTrace: trace.n, sampleRateHz: options.sampleRateHz ?? null },
    channels,
  };
  const jsonErrors: Issue[] = [];
  const safe = toJsonSafe(doc, 'export', jsonErrors);
  if (jsonErrors.length) return fail(jsonErrors);
  return ok(JSON.stringify(safe, null, indent || undefined) + '\n');
}
