/**
 * Options of simulateHybrid, their defaults and their validation (every bad option a specific
 * Issue naming its field, checked before any work — the habit of a configured solver object).
 */
import type { Issue, Result } from '../errors';
import { describe, fail, issue, ok } from '../errors';
import type { Dp54Options } from './dp54Options';
import { validateDp54Options } from './dp54Options';
import type { HybridSystem } from './types';

export type IntegratorOptions =
  /** Fixed-step RK4: equal steps of at most dt between stops (scheduled jumps, tEnd). */
  | { kind: 'rk4'; dt: number }
  /** Adaptive Dormand–Prince 5(4) with dense output. */
  | ({ kind: 'dp54' } & Dp54Options);

/**
 * What the arc stores besides the start, the end and both sides of every reported jump:
 * 'step' every accepted step end; 'scheduled' the state after every scheduled jump (the sample
 * instants of a sampled-data loop); 'interval' t0 + k·dt from the dense output; 'none' nothing more.
 */
export type RecordEvery = 'step' | 'scheduled' | 'interval' | 'none';

export interface RecordOptions {
  every?: RecordEvery;
  /** Spacing for 'interval', s. */
  dt?: number;
  /** Keep points in the arc's arrays (default true); false with onRecord streams them instead. */
  store?: boolean;
  /** Called for every recorded point (x is a scratch view: copy it). Return false to cancel the run. */
  onRecord?: (t: number, j: number, x: Float64Array) => boolean | void;
}

export interface HybridOptions {
  /** Start time, s (default 0). */
  t0?: number;
  /** End time, s (> t0). The arc ends at (tEnd, j) before any jump due exactly at tEnd. */
  tEnd: number;
  /** Stop after the jump that brings j to jMax (integer ≥ 1, default Infinity). */
  jMax?: number;
  integrator: IntegratorOptions;
  /** At most this many jumps within zenoWindow before the run is reported 'zeno' (default 50). */
  maxJumpsPerInstant?: number;
  /** Time tolerance of event location, s (default 1e-12·max(1, |t0|, |tEnd|)). */
  eventTimeTol?: number;
  /** Window for counting jumps at "one instant", s (default 1e4·eventTimeTol). */
  zenoWindow?: number;
  /** Extra guard samples inside each step to catch a crossing and return within one step (default 0). */
  eventScan?: number;
  /** Step attempts allowed (default 1e7). */
  maxSteps?: number;
  /** What to store; a bare RecordEvery is short for { every }. Default 'step'. */
  record?: RecordOptions | RecordEvery;
}

export interface ResolvedOptions {
  t0: number;
  tEnd: number;
  jMax: number;
  integrator: IntegratorOptions;
  maxJumpsPerInstant: number;
  eventTimeTol: number;
  zenoWindow: number;
  eventScan: number;
  maxSteps: number;
  record: { every: RecordEvery; dt: number; store: boolean; onRecord?: RecordOptions['onRecord'] };
}

const TOP_KEYS = [
  't0',
  'tEnd',
  'jMax',
  'integrator',
  'maxJumpsPerInstant',
  'eventTimeTol',
  'zenoWindow',
  'eventScan',
  'maxSteps',
  'record',
];
const RK4_KEYS = ['kind', 'dt'];
const DP54_KEYS = ['kind', 'rtol', 'atol', 'hInit', 'hMin', 'hMax'];
const RECORD_KEYS = ['every', 'dt', 'store', 'onRecord'];
const RECORD_EVERY: RecordEvery[] = ['step', 'scheduled', 'interval', 'none'];

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function unknownKeys(o: Record<string, unknown>, allowed: string[], path: string, out: Issue[]): void {
  for (const k of Object.keys(o)) {
    if (!allowed.includes(k)) {
      out.push(
        issue(
          path ? `${path}.${k}` : k,
          'unknown-option',
          `${path ? path + '.' : ''}${k} is not an option (allowed: ${allowed.join(', ')})`,
        ),
      );
    }
  }
}

function finiteNum(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/** Check every option; defaults filled in. `dim` is the system's state length. */
export function validateHybridOptions(opts: unknown, dim: number): Result<ResolvedOptions> {
  const e: Issue[] = [];
  if (!isObject(opts)) return fail([issue('options', 'required', `options must be an object (got ${describe(opts)})`)]);
  unknownKeys(opts, TOP_KEYS, '', e);
  const t0 = opts.t0 === undefined ? 0 : opts.t0;
  if (!finiteNum(t0)) e.push(issue('t0', 'finite', `t0 must be a finite number (got ${describe(t0)})`));
  const tEnd = opts.tEnd;
  if (!finiteNum(tEnd)) e.push(issue('tEnd', 'finite', `tEnd must be a finite number (got ${describe(tEnd)})`));
  else if (finiteNum(t0) && !(tEnd > t0)) e.push(issue('tEnd', 'order', `tEnd (${tEnd}) must be later than t0 (${t0})`));
  const jMax = opts.jMax === undefined ? Infinity : opts.jMax;
  if (!(jMax === Infinity || (Number.isInteger(jMax) && (jMax as number) >= 1))) {
    e.push(issue('jMax', 'integer', `jMax must be an integer ≥ 1 or Infinity (got ${describe(jMax)})`));
  }
  const integ = opts.integrator;
  if (!isObject(integ)) {
    e.push(
      issue(
        'integrator',
        'required',
        `integrator must be { kind: 'rk4', dt } or { kind: 'dp54', rtol, atol, ... } (got ${describe(integ)})`,
      ),
    );
  } else if (integ.kind === 'rk4') {
    unknownKeys(integ, RK4_KEYS, 'integrator', e);
    if (!finiteNum(integ.dt) || integ.dt <= 0)
      e.push(issue('integrator.dt', 'positive', `integrator.dt must be a finite number > 0 (got ${describe(integ.dt)})`));
  } else if (integ.kind === 'dp54') {
    unknownKeys(integ, DP54_KEYS, 'integrator', e);
    e.push(...validateDp54Options(integ, dim, 'integrator'));
  } else {
    e.push(issue('integrator.kind', 'one-of', `integrator.kind must be 'rk4' or 'dp54' (got ${describe(integ.kind)})`));
  }
  const mj = opts.maxJumpsPerInstant === undefined ? 50 : opts.maxJumpsPerInstant;
  if (!Number.isInteger(mj) || (mj as number) < 1)
    e.push(issue('maxJumpsPerInstant', 'integer', `maxJumpsPerInstant must be an integer ≥ 1 (got ${describe(mj)})`));
  const scale = Math.max(1, finiteNum(t0) ? Math.abs(t0) : 1, finiteNum(tEnd) ? Math.abs(tEnd) : 1);
  const ett = opts.eventTimeTol === undefined ? 1e-12 * scale : opts.eventTimeTol;
  if (!finiteNum(ett) || ett <= 0)
    e.push(issue('eventTimeTol', 'positive', `eventTimeTol must be a finite number > 0 (got ${describe(ett)})`));
  const zw = opts.zenoWindow === undefined ? 1e4 * (finiteNum(ett) ? ett : 1e-12) : opts.zenoWindow;
  if (!finiteNum(zw) || zw <= 0) e.push(issue('zenoWindow', 'positive', `zenoWindow must be a finite number > 0 (got ${describe(zw)})`));
  const scan = opts.eventScan === undefined ? 0 : opts.eventScan;
  if (!Number.isInteger(scan) || (scan as number) < 0 || (scan as number) > 64)
    e.push(issue('eventScan', 'integer', `eventScan must be an integer in [0, 64] (got ${describe(scan)})`));
  const ms = opts.maxSteps === undefined ? 1e7 : opts.maxSteps;
  if (!Number.isInteger(ms) || (ms as number) < 1)
    e.push(issue('maxSteps', 'integer', `maxSteps must be an integer ≥ 1 (got ${describe(ms)})`));
  let rec: ResolvedOptions['record'] = { every: 'step', dt: NaN, store: true };
  if (opts.record !== undefined) {
    const r = typeof opts.record === 'string' ? { every: opts.record } : opts.record;
    if (!isObject(r)) e.push(issue('record', 'shape', `record must be an object (got ${describe(r)})`));
    else {
      unknownKeys(r, RECORD_KEYS, 'record', e);
      const every = r.every === undefined ? 'step' : r.every;
      if (!RECORD_EVERY.includes(every as RecordEvery))
        e.push(issue('record.every', 'one-of', `record.every must be one of ${RECORD_EVERY.join(', ')} (got ${describe(every)})`));
      const dt = r.dt;
      if (every === 'interval') {
        if (!finiteNum(dt) || dt <= 0)
          e.push(
            issue('record.dt', 'positive', `record.dt must be a finite number > 0 when record.every is 'interval' (got ${describe(dt)})`),
          );
      } else if (dt !== undefined) {
        e.push(issue('record.dt', 'unused', `record.dt is only used when record.every is 'interval'`));
      }
      if (r.store !== undefined && typeof r.store !== 'boolean')
        e.push(issue('record.store', 'boolean', 'record.store must be true or false'));
      if (r.onRecord !== undefined && typeof r.onRecord !== 'function')
        e.push(issue('record.onRecord', 'function', 'record.onRecord must be a function'));
      if (r.store === false && r.onRecord === undefined)
        e.push(issue('record.store', 'pointless', 'record.store is false but no record.onRecord is given: nothing would be recorded'));
      rec = {
        every: every as RecordEvery,
        dt: typeof dt === 'number' ? dt : NaN,
        store: r.store !== false,
        onRecord: r.onRecord as RecordOptions['onRecord'],
      };
    }
  }
  if (e.length) return fail(e);
  return ok({
    t0: t0 as number,
    tEnd: tEnd as number,
    jMax: jMax as number,
    integrator: integ as unknown as IntegratorOptions,
    maxJumpsPerInstant: mj as number,
    eventTimeTol: ett as number,
    zenoWindow: zw as number,
    eventScan: scan as number,
    maxSteps: ms as number,
    record: rec,
  });
}

/** Every problem with a system and its initial state (`system.dim`, `x0[3]`, ...). */
export function validateHybridSystem(sys: unknown, x0: unknown): Issue[] {
  const e: Issue[] = [];
  if (!isObject(sys)) return [issue('system', 'required', `system must be an object (got ${describe(sys)})`)];
  const s = sys as unknown as HybridSystem;
  const dimOk = Number.isInteger(s.dim) && s.dim >= 1;
  if (!dimOk) e.push(issue('system.dim', 'integer', `system.dim must be an integer ≥ 1 (got ${describe(s.dim)})`));
  if (typeof s.flow !== 'function') e.push(issue('system.flow', 'function', 'system.flow must be a function'));
  if (typeof s.jump !== 'function') e.push(issue('system.jump', 'function', 'system.jump must be a function'));
  for (const k of ['jumpGuard', 'inFlowSet', 'nextScheduledJump', 'project', 'stop'] as const) {
    if (s[k] !== undefined && typeof s[k] !== 'function')
      e.push(issue(`system.${k}`, 'function', `system.${k} must be a function when given`));
  }
  if (s.both !== undefined && s.both !== 'jump' && s.both !== 'flow')
    e.push(issue('system.both', 'one-of', `system.both must be 'jump' or 'flow' (got ${describe(s.both)})`));
  if (!(Array.isArray(x0) || ArrayBuffer.isView(x0))) {
    e.push(issue('x0', 'shape', `x0 must be an array of ${dimOk ? s.dim : 'dim'} numbers (got ${describe(x0)})`));
    return e;
  }
  const xa = x0 as ArrayLike<unknown>;
  if (dimOk && xa.length !== s.dim) e.push(issue('x0', 'shape', `x0 must have system.dim = ${s.dim} entries (got ${xa.length})`));
  for (let i = 0; i < xa.length; i++) {
    const v = xa[i];
    if (typeof v !== 'number' || !Number.isFinite(v))
      e.push(issue(`x0[${i}]`, 'finite', `x0[${i}] must be a finite number (got ${describe(v)})`));
  }
  return e;
}
