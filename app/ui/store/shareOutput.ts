/**
 * Structural sharing between a new pipeline output and the one the store shows (issue 12, edit →
 * updated plots). The worker clones or transfers every run of every pass, so each reply arrives
 * as new objects even when a run is the same (the worker's run cache hands back an unchanged run:
 * a gain edit changes two of the demo's six). Here every part of the new output that is equal to
 * the shown one, bit for bit, is replaced by the shown object, so the views can tell "unchanged"
 * by identity (a plot card, the 3D view) and skip it.
 *
 * Equal means: the same plain-data shape (same keys in the same order, arrays of the same length),
 * numbers by Object.is (so −0 and 0 differ, NaN equals NaN), typed arrays of the same type and
 * length with the same bytes (NaN payloads included). Anything else (a Map, a class instance) is
 * never shared. Runs are matched by their key, not their place, since a partial output holds
 * fewer. The result is deep-equal to `next` in every value (test/unit/ui-share-output.test.ts).
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';

function sameBytes(a: ArrayBufferView, b: ArrayBufferView): boolean {
  if (a.byteLength !== b.byteLength) return false;
  const n = a.byteLength;
  // Whole 32-bit words where both views are aligned (every Float64Array is), bytes otherwise.
  if (a.byteOffset % 4 === 0 && b.byteOffset % 4 === 0 && n % 4 === 0) {
    const x = new Int32Array(a.buffer, a.byteOffset, n / 4);
    const y = new Int32Array(b.buffer, b.byteOffset, n / 4);
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
    return true;
  }
  const x = new Uint8Array(a.buffer, a.byteOffset, n);
  const y = new Uint8Array(b.buffer, b.byteOffset, n);
  for (let i = 0; i < n; i++) if (x[i] !== y[i]) return false;
  return true;
}

function isPlain(x: object): boolean {
  const p: unknown = Object.getPrototypeOf(x);
  return p === Object.prototype || p === null;
}

/**
 * `next` with every part equal to the matching part of `prev` replaced by `prev`'s object; `prev`
 * itself when the whole is equal. Never changes either argument.
 */
export function shareUnchanged<T>(prev: unknown, next: T): T {
  return share(prev, next, 0) as T;
}

const MAX_DEPTH = 64;

function share(prev: unknown, next: unknown, depth: number): unknown {
  if (Object.is(prev, next)) return prev;
  if (prev === null || next === null || typeof prev !== 'object' || typeof next !== 'object' || depth > MAX_DEPTH) return next;
  if (ArrayBuffer.isView(next) || ArrayBuffer.isView(prev)) {
    if (!ArrayBuffer.isView(next) || !ArrayBuffer.isView(prev) || next instanceof DataView || prev.constructor !== next.constructor)
      return next;
    return sameBytes(prev, next) ? prev : next;
  }
  if (Array.isArray(next)) {
    if (!Array.isArray(prev)) return next;
    for (let i = 0; i < next.length; i++) if (!(i in next)) return next; // a hole: not plain data
    let same = prev.length === next.length;
    let replaced = false;
    const out = next.map((v: unknown, i) => {
      const s = i < prev.length ? share(prev[i], v, depth + 1) : v;
      if (!Object.is(s, prev[i])) same = false;
      if (!Object.is(s, v)) replaced = true;
      return s;
    });
    if (same) return prev;
    return replaced ? out : next;
  }
  if (Array.isArray(prev) || !isPlain(next) || !isPlain(prev)) return next;
  const p = prev as Record<string, unknown>;
  const n = next as Record<string, unknown>;
  const pk = Object.keys(p);
  const nk = Object.keys(n);
  let same = pk.length === nk.length && nk.every((k, i) => pk[i] === k);
  let replaced = false;
  const out: Record<string, unknown> = {};
  for (const k of nk) {
    const v = n[k];
    const s = Object.prototype.hasOwnProperty.call(p, k) ? share(p[k], v, depth + 1) : v;
    if (!Object.is(s, p[k]) || !(k in p)) same = false;
    if (!Object.is(s, v)) replaced = true;
    out[k] = s;
  }
  if (same) return prev;
  return replaced ? out : next;
}

/**
 * `next` sharing what is unchanged with `prev` (the output shown): its runs by key, every other
 * field by shareUnchanged. `prev` itself only when nothing differs at all.
 */
export function shareOutput(prev: PipelineOutput | null, next: PipelineOutput): PipelineOutput {
  if (!prev || prev === next) return next;
  const byKey = new Map<string, ControllerRun>(prev.runs.map((r) => [r.key, r]));
  let runsSame = prev.runs.length === next.runs.length;
  const runs = next.runs.map((r, i) => {
    const s = shareUnchanged(byKey.get(r.key), r);
    if (s !== prev.runs[i]) runsSame = false;
    return s;
  });
  const restPrev = { ...prev, runs: null };
  const rest = shareUnchanged(restPrev, { ...next, runs: null });
  if (runsSame && rest === restPrev) return prev;
  return { ...rest, runs: runsSame ? prev.runs : runs };
}
