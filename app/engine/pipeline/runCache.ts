/**
 * The runs of the last pass, for the app's pipeline worker (issue 12, edit → updated plots): an
 * edit of one controller's gain changes that controller's runs only; every other run has the same
 * inputs and, the pipeline being deterministic, the same result. pipelinePass (run.ts) keys each
 * run by everything it is made from, flies only the runs whose key it has not seen, and takes the
 * others from here, so the output equals a fresh pass bit for bit
 * (test/unit/pipeline-run-cache.test.ts).
 *
 * The key is derived, not listed: the whole resolved scenario (vehicle, wheels, friction, sensors
 * and seed, targets, planning limits, simulation rates and end rules, keep-out cones, constraints,
 * orbit, study block) with the controller list cut down to the run's own controller, then the mode
 * list, the run's mode and the pass settings a flight reads (step cap, display-trace limit). The
 * plan, the vehicle model, the built law and its certificate are functions of those, so a change
 * in any of them changes the key. Written out exactly: every number by its shortest round-trip
 * text (−0, NaN and ±∞ spelled apart), typed arrays with their type, keys in their order and
 * undefined-valued keys kept. A value of any other kind (a Map, a class instance, a function)
 * gives no key, and the run is flown.
 *
 * The worker transfers the output's buffers to the renderer (they detach), so the cache keeps its
 * own copy of each run and hands out a fresh copy each time (views sharing a buffer still share one).
 */
import type { RunMode } from '../sim/types';
import type { ResolvedScenario } from '../scenario/resolve';
import type { ControllerRun } from './types';

/** What a flight reads besides the resolved scenario (run.ts pipelinePass). */
export interface RunKeySettings {
  /** The pass's modes, in order (the runs of one controller are flown in this order). */
  modes: readonly RunMode[];
  maxSteps: number;
  displayTraceLimit: unknown;
}

/** The exact text of a plain-data value, or null when it holds something else. */
export function exactText(x: unknown): string | null {
  const parts: string[] = [];
  return write(x, parts, 0) ? parts.join('') : null;
}

function numberText(v: number): string {
  if (Object.is(v, -0)) return '-0';
  return String(v); // NaN, Infinity and -Infinity print as words, every finite double uniquely
}

const MAX_DEPTH = 64;

function write(x: unknown, out: string[], depth: number): boolean {
  if (depth > MAX_DEPTH) return false;
  switch (typeof x) {
    case 'number':
      out.push(numberText(x));
      return true;
    case 'string':
      out.push(JSON.stringify(x));
      return true;
    case 'boolean':
      out.push(x ? 'T' : 'F');
      return true;
    case 'undefined':
      out.push('U');
      return true;
    case 'bigint':
      out.push(`${x}n`);
      return true;
    case 'object':
      break;
    default:
      return false; // function, symbol
  }
  if (x === null) {
    out.push('N');
    return true;
  }
  if (ArrayBuffer.isView(x)) {
    if (x instanceof DataView) return false;
    const a = x as unknown as ArrayLike<number> & { constructor: { name: string } };
    out.push(a.constructor.name, '<');
    for (let i = 0; i < a.length; i++) {
      if (i) out.push(',');
      out.push(numberText(a[i]!));
    }
    out.push('>');
    return true;
  }
  if (Array.isArray(x)) {
    out.push('[');
    for (let i = 0; i < x.length; i++) {
      if (i) out.push(',');
      if (!(i in x)) return false; // a hole
      if (!write(x[i], out, depth + 1)) return false;
    }
    out.push(']');
    return true;
  }
  const proto: unknown = Object.getPrototypeOf(x);
  if (proto !== Object.prototype && proto !== null) return false;
  out.push('{');
  let first = true;
  for (const k of Object.keys(x)) {
    if (!first) out.push(',');
    first = false;
    out.push(JSON.stringify(k), ':');
    if (!write((x as Record<string, unknown>)[k], out, depth + 1)) return false;
  }
  out.push('}');
  return true;
}

/** The key of one run: controller `controllerId` of `s` flown in `mode`; null when it cannot be written out. */
export function runKey(s: ResolvedScenario, controllerId: string, mode: RunMode, settings: RunKeySettings): string | null {
  const own = s.controllers.filter((c) => c.id === controllerId);
  if (own.length !== 1) return null;
  return exactText({ scenario: { ...s, controllers: own }, mode, settings });
}

/** A deep copy of plain data with typed arrays; views that shared a buffer share one copy. */
export function copyData<T>(x: T): T {
  return copyValue(x, new Map()) as T;
}

function copyValue(x: unknown, buffers: Map<ArrayBufferLike, ArrayBuffer>): unknown {
  if (x === null || typeof x !== 'object') return x;
  if (ArrayBuffer.isView(x)) {
    const src = x.buffer;
    let buf = buffers.get(src);
    if (!buf) {
      buf = (src as ArrayBuffer).slice(0);
      buffers.set(src, buf);
    }
    const Ctor = x.constructor as new (b: ArrayBuffer, offset: number, length: number) => ArrayBufferView;
    const length = x instanceof DataView ? x.byteLength : (x as unknown as { length: number }).length;
    return new Ctor(buf, x.byteOffset, length);
  }
  if (Array.isArray(x)) return x.map((v: unknown) => copyValue(v, buffers));
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(x)) out[k] = copyValue((x as Record<string, unknown>)[k], buffers);
  return out;
}

function bytesOf(x: unknown, seen: Set<ArrayBufferLike>): number {
  if (x === null || typeof x !== 'object') return 0;
  if (ArrayBuffer.isView(x)) {
    if (seen.has(x.buffer)) return 0;
    seen.add(x.buffer);
    return x.buffer.byteLength;
  }
  let n = 0;
  for (const v of Object.values(x)) n += bytesOf(v, seen);
  return n;
}

export interface RunCache {
  /** A fresh copy of the run stored under `key`, or null. */
  take(key: string): ControllerRun | null;
  /**
   * The run stored under `key` claimed now and copied later: a function that returns a fresh copy
   * each time it is called (from the run as stored at the claim, even if the cache drops it since),
   * or null. Lets a pass fly its changed runs first and pay for the copies after.
   */
  claim(key: string): (() => ControllerRun) | null;
  /** Keeps a copy of `run` under `key` (nothing when it would pass the cache's byte limit). */
  put(key: string, run: ControllerRun): void;
  /** Drops every run but those of `keys` (the pass just completed). */
  keepOnly(keys: ReadonlySet<string>): void;
  /** Runs taken, runs stored, and runs held now (for tests and the bench). */
  readonly stats: { hits: number; stored: number; held: number; bytes: number };
}

/** Default limit: a few demo-sized passes; long runs (tens of MB each) are simply flown again. */
export const RUN_CACHE_MAX_BYTES = 96 * 1024 * 1024;

export function createRunCache(maxBytes = RUN_CACHE_MAX_BYTES): RunCache {
  const runs = new Map<string, { run: ControllerRun; bytes: number }>();
  const stats = { hits: 0, stored: 0, held: 0, bytes: 0 };
  const drop = (key: string) => {
    const e = runs.get(key);
    if (!e) return;
    runs.delete(key);
    stats.bytes -= e.bytes;
    stats.held = runs.size;
  };
  const claim = (key: string): (() => ControllerRun) | null => {
    const e = runs.get(key);
    if (!e) return null;
    stats.hits++;
    const stored = e.run;
    return () => copyData(stored);
  };
  return {
    stats,
    take(key) {
      return claim(key)?.() ?? null;
    },
    claim,
    put(key, run) {
      drop(key);
      const bytes = bytesOf(run, new Set());
      // Oldest first out (a Map iterates in insertion order) until the new run fits.
      for (const k of runs.keys()) {
        if (stats.bytes + bytes <= maxBytes) break;
        drop(k);
      }
      if (stats.bytes + bytes > maxBytes) return;
      runs.set(key, { run: copyData(run), bytes });
      stats.bytes += bytes;
      stats.stored++;
      stats.held = runs.size;
    },
    keepOnly(keys) {
      for (const k of [...runs.keys()]) if (!keys.has(k)) drop(k);
    },
  };
}
