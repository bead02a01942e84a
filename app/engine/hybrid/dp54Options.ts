/**
 * Options of the Dormand–Prince 5(4) stepper (dp54.ts) and their validation: every problem an
 * Issue with its path, checked before any work.
 */
import type { Issue } from '../errors';
import { issue } from '../errors';

export interface Dp54Options {
  /** Relative tolerance (> 0, ≥ 1e-14). */
  rtol: number;
  /** Absolute tolerance, scalar or per component (≥ 0). */
  atol: number | ArrayLike<number>;
  /** First step; computed by the HNW starting-step algorithm when absent. */
  hInit?: number;
  /** Smallest step the error control may ask for before giving up (default 0: a few ulps of t). */
  hMin?: number;
  /** Largest step (default Infinity). */
  hMax?: number;
}

function isNum(v: unknown): v is number {
  return typeof v === 'number' && !Number.isNaN(v);
}

/** Every problem with DP54 options, each with its path (`integrator.rtol`, ...). */
export function validateDp54Options(o: Record<string, unknown>, n: number, path = 'integrator'): Issue[] {
  const out: Issue[] = [];
  const rtol = o.rtol;
  if (!isNum(rtol) || !Number.isFinite(rtol) || rtol < 1e-14 || rtol >= 1) {
    out.push(issue(`${path}.rtol`, 'range', `${path}.rtol must be a number in [1e-14, 1) (got ${String(rtol)})`));
  }
  const atol = o.atol;
  if (typeof atol === 'number') {
    if (!Number.isFinite(atol) || atol < 0)
      out.push(issue(`${path}.atol`, 'non-negative', `${path}.atol must be a finite number ≥ 0 (got ${atol})`));
  } else if (Array.isArray(atol) || ArrayBuffer.isView(atol)) {
    const a = atol as ArrayLike<unknown>;
    if (a.length !== n) out.push(issue(`${path}.atol`, 'shape', `${path}.atol must have one entry per state (${n}), got ${a.length}`));
    for (let i = 0; i < a.length; i++) {
      const v = a[i];
      if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) {
        out.push(issue(`${path}.atol[${i}]`, 'non-negative', `${path}.atol[${i}] must be a finite number ≥ 0`));
      }
    }
  } else {
    out.push(issue(`${path}.atol`, 'required', `${path}.atol must be a number or an array of ${n} numbers`));
  }
  for (const k of ['hInit', 'hMin', 'hMax'] as const) {
    const v = o[k];
    if (v === undefined) continue;
    const allowInf = k === 'hMax';
    if (!isNum(v) || v < 0 || (k !== 'hMin' && v === 0) || (!allowInf && !Number.isFinite(v))) {
      out.push(
        issue(`${path}.${k}`, 'positive', `${path}.${k} must be a ${k === 'hMin' ? 'finite number ≥ 0' : 'number > 0'} (got ${String(v)})`),
      );
    }
  }
  const hMin = isNum(o.hMin) ? o.hMin : 0;
  const hMax = isNum(o.hMax) ? o.hMax : Infinity;
  if (hMin > hMax) out.push(issue(`${path}.hMin`, 'order', `${path}.hMin (${hMin}) must not exceed ${path}.hMax (${hMax})`));
  if (isNum(o.hInit) && (o.hInit < hMin || o.hInit > hMax)) {
    out.push(issue(`${path}.hInit`, 'order', `${path}.hInit (${o.hInit}) must lie within [hMin, hMax] = [${hMin}, ${hMax}]`));
  }
  return out;
}
