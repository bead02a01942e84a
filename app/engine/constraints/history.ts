/**
 * Validation of an attitude history (types.ts AttitudeHistory): n ≥ 1 finite, strictly increasing
 * times and 4n finite quaternion numbers [x, y, z, w] (qInertialFromBody), none zero. Quaternions
 * need not be exactly unit: the check rotates with R(q/|q|). Float64Array inputs are used as they
 * are (no copy); plain arrays are copied once.
 */
import { describe, type IssueList } from '../errors';
import type { AttitudeHistory } from './types';

/** Report at most this many bad samples of one kind (a long history can hold thousands). */
const MAX_REPORTED = 5;

function asFloat64(v: unknown): Float64Array | null {
  if (v instanceof Float64Array) return v;
  if (Array.isArray(v)) return Float64Array.from(v as number[]);
  return null;
}

export function readHistory(list: IssueList, h: AttitudeHistory | undefined): { t: Float64Array; q: Float64Array } | null {
  if (h === null || typeof h !== 'object') {
    list.add('history', 'type', `history must be {timesS, qInertialFromBody} (got ${describe(h)})`);
    return null;
  }
  const t = asFloat64(h.timesS),
    q = asFloat64(h.qInertialFromBody);
  if (!t || t.length < 1) {
    list.add('history.timesS', 'samples', 'history.timesS must be an array (or Float64Array) of at least one time');
    return null;
  }
  const n = t.length;
  if (!q || q.length !== 4 * n) {
    list.add(
      'history.qInertialFromBody',
      'length',
      `history.qInertialFromBody must hold 4 numbers per time: ${4 * n} (got ${describe(h.qInertialFromBody)})`,
    );
    return null;
  }
  let badT = 0,
    badQ = 0;
  for (let i = 0; i < n; i++) {
    const ti = t[i]!;
    // ti − ti is NaN for NaN and ±Infinity; NaN also fails every comparison.
    if (ti - ti !== 0 || (i > 0 && !(ti > t[i - 1]!))) {
      if (badT++ < MAX_REPORTED)
        list.add(`history.timesS[${i}]`, 'increasing', `history.timesS[${i}] must be finite and after the previous time (got ${ti})`);
    }
    const x = q[4 * i]!,
      y = q[4 * i + 1]!,
      z = q[4 * i + 2]!,
      w = q[4 * i + 3]!;
    const n2 = x * x + y * y + z * z + w * w;
    if (!(n2 > 1e-24 && n2 < Infinity)) {
      if (badQ++ < MAX_REPORTED)
        list.add(`history.qInertialFromBody[${i}]`, 'quaternion', `sample ${i} is not a finite non-zero quaternion`);
    }
  }
  if (badT > MAX_REPORTED) list.add('history.timesS', 'increasing', `${badT} bad times in all (first ${MAX_REPORTED} listed)`);
  if (badQ > MAX_REPORTED)
    list.add('history.qInertialFromBody', 'quaternion', `${badQ} bad quaternions in all (first ${MAX_REPORTED} listed)`);
  return badT || badQ ? null : { t, q };
}
