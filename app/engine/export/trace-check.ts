/**
 * validateTraceForExport: every writer runs this first, so an export is either complete and
 * finite or not written at all. Problems name the channel and the sample index (and its time).
 *
 * Time order is that of a hybrid time domain: t never decreases, and two samples may share a t
 * only across a logic jump (j increases), as the continuous-ideal simulation records them.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { TRACE_CHANNELS, channelWidth } from '../sim/trace';
import type { RunTrace } from '../sim/types';

export interface TraceCheckOptions {
  /** Allowed | |q| − 1 | for q and qRef (default 1e-6). */
  unitNormTolerance?: number;
  /** At most this many issues per channel and rule; the rest are counted in one summary issue (default 5). */
  maxIssuesPerChannel?: number;
}

export function validateTraceForExport(trace: RunTrace, options: TraceCheckOptions = {}): Result<RunTrace> {
  const tol = options.unitNormTolerance ?? 1e-6;
  const cap = options.maxIssuesPerChannel ?? 5;
  const errors: Issue[] = [];
  const n = trace?.n;
  const nW = trace?.nWheels;
  if (!Number.isInteger(n) || n < 1) {
    return fail([
      {
        path: 'trace.n',
        rule: 'min-samples',
        message: `trace.n must be a whole number ≥ 1 (got ${String(n)}); there is nothing to export`,
      },
    ]);
  }
  if (!Number.isInteger(nW) || nW < 0) {
    return fail([{ path: 'trace.nWheels', rule: 'integer', message: `trace.nWheels must be a whole number ≥ 0 (got ${String(nW)})` }]);
  }

  const lengthOk = (name: string, arr: ArrayLike<number> | undefined, need: number): boolean => {
    if (!arr || typeof arr.length !== 'number' || arr.length < need) {
      errors.push({
        path: `trace.${name}`,
        rule: 'length',
        message: `trace.${name} must hold ${need} values for ${n} samples (has ${arr ? arr.length : 'none'})`,
      });
      return false;
    }
    return true;
  };

  // Time for people: 10 significant digits (0.7, not 0.7000000000000001).
  const tOf = (k: number) => (trace.t && Number.isFinite(trace.t[k]) ? ` (t = ${Number(trace.t[k]!.toPrecision(10))} s)` : '');

  /** Collects per-channel issues up to `cap`, then counts. */
  const capped = (path: string, rule: string) => {
    let count = 0;
    return {
      add(k: number, message: string) {
        count++;
        if (count <= cap) errors.push({ path: `${path}[${k}]`, rule, message });
      },
      close() {
        if (count > cap) errors.push({ path, rule, message: `${path}: ${count - cap} more samples break the same rule` });
      },
    };
  };

  const jOk = lengthOk('j', trace.j, n);
  const segOk = lengthOk('segment', trace.segment, n);
  const okChannels = new Set<string>();
  for (const name of TRACE_CHANNELS) {
    const w = channelWidth(name, nW);
    if (lengthOk(name, trace[name], n * w)) okChannels.add(name);
  }

  for (const name of TRACE_CHANNELS) {
    if (!okChannels.has(name)) continue;
    const a = trace[name];
    const w = channelWidth(name, nW);
    const c = capped(`trace.${name}`, 'finite');
    for (let k = 0; k < n; k++) {
      for (let i = 0; i < w; i++) {
        const v = a[k * w + i];
        if (!Number.isFinite(v)) {
          c.add(k, `sample ${k}${tOf(k)}: trace.${name}${w > 1 ? ` component ${i}` : ''} is ${String(v)}, not a finite number`);
          break;
        }
      }
    }
    c.close();
  }

  for (const [name, arr, isOk] of [
    ['j', trace.j, jOk],
    ['segment', trace.segment, segOk],
  ] as const) {
    if (!isOk) continue;
    const c = capped(`trace.${name}`, 'integer');
    for (let k = 0; k < n; k++)
      if (!Number.isInteger(arr[k]) || arr[k]! < 0)
        c.add(k, `sample ${k}${tOf(k)}: trace.${name} must be a whole number ≥ 0 (got ${arr[k]})`);
    c.close();
  }

  if (okChannels.has('t') && jOk) {
    const c = capped('trace.t', 'increasing');
    for (let k = 1; k < n; k++) {
      const t0 = trace.t[k - 1]!,
        t1 = trace.t[k]!;
      if (!Number.isFinite(t0) || !Number.isFinite(t1)) continue;
      if (t1 > t0) continue;
      if (t1 === t0 && trace.j[k]! > trace.j[k - 1]!) continue;
      c.add(
        k,
        `sample ${k}: time ${t1} s does not increase from ${t0} s at sample ${k - 1}${t1 === t0 ? ' and no jump happened (j did not increase)' : ''}`,
      );
    }
    c.close();
  }

  for (const name of ['q', 'qRef'] as const) {
    if (!okChannels.has(name)) continue;
    const a = trace[name];
    const c = capped(`trace.${name}`, 'unit-norm');
    for (let k = 0; k < n; k++) {
      const norm = Math.hypot(a[4 * k]!, a[4 * k + 1]!, a[4 * k + 2]!, a[4 * k + 3]!);
      if (Number.isFinite(norm) && Math.abs(norm - 1) > tol)
        c.add(k, `sample ${k}${tOf(k)}: trace.${name} has norm ${norm.toPrecision(9)}, not 1 within ${tol}`);
    }
    c.close();
  }

  return errors.length ? fail(errors) : ok(trace);
}
