/**
 * Validations made before, by this same program, for exact JSON values: the bundled demo is
 * validated when the app is built (main/demo-validation.ts) and each renderer thread plants that
 * result here at start, so the first pass and the first screen skip validating it (issue 12, cold
 * start). validateScenario answers from here only for an input equal to a planted one in every
 * value, key and key order (sameJson); anything else, however close, is validated as before.
 */
import type { Result } from '../errors';

type Obj = Record<string, unknown>;

function isPlainObject(v: unknown): v is Obj {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) return false;
  const proto = Object.getPrototypeOf(v) as unknown;
  return proto === Object.prototype || proto === null;
}

/**
 * Whether two values are the same JSON-like data: numbers, strings, booleans, null and undefined
 * by Object.is (so -0 differs from 0, and NaN equals only NaN), arrays element by element, plain
 * objects by their own keys in the same order. Anything else (a Date, a typed array, a Map) is
 * never equal to a copy, so it never takes a planted validation.
 */
export function sameJson(a: unknown, b: unknown): boolean {
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return Object.is(a, b);
  if (Array.isArray(a)) {
    if (!Array.isArray(b) || a.length !== b.length) return false;
    for (let i = 0; i < a.length; i++) {
      if (!(i in a) || !(i in b) || !sameJson(a[i], b[i])) return false;
    }
    return true;
  }
  if (!isPlainObject(a) || !isPlainObject(b)) return false;
  const ka = Object.keys(a),
    kb = Object.keys(b);
  if (ka.length !== kb.length) return false;
  for (let i = 0; i < ka.length; i++) {
    const k = ka[i]!;
    if (k !== kb[i] || !sameJson(a[k], b[k])) return false;
  }
  return true;
}

/** Deep copy of JSON-like data (arrays and plain objects; undefined-valued keys kept). */
export function copyJson<T>(v: T): T {
  if (Array.isArray(v)) return v.map(copyJson) as T;
  if (isPlainObject(v)) {
    const o: Obj = {};
    for (const k of Object.keys(v)) o[k] = copyJson(v[k]);
    return o as T;
  }
  return v;
}

interface Planted {
  json: unknown;
  result: Result<unknown>;
}

/** A handful at most (the demo); the oldest goes first. */
const MAX_PLANTED = 4;
const planted: Planted[] = [];

/**
 * Keeps `result` as the validation of `json` (both copied: later changes to the caller's objects
 * do not reach it). Only plain JSON data is accepted; anything else is refused with a message.
 */
export function plantValidation(json: unknown, result: Result<unknown>): void {
  if (!sameJson(json, copyJson(json))) throw new Error('plantValidation: the scenario must be plain JSON data');
  planted.push({ json: copyJson(json), result: copyJson(result) });
  if (planted.length > MAX_PLANTED) planted.shift();
}

/** The planted validation of a value equal to `json` (a fresh copy the caller may change), else null. */
export function knownValidation<T>(json: unknown): Result<T> | null {
  for (const p of planted) if (sameJson(json, p.json)) return copyJson(p.result) as Result<T>;
  return null;
}

/** Forgets every planted validation (tests). */
export function clearKnownValidations(): void {
  planted.length = 0;
}
