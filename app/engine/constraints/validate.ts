/**
 * Validation of constraint lists: every problem is collected with its field path and rule
 * (errors.ts); nothing throws. A valid list comes back prepared (types.ts PreparedConstraint):
 * unit axes and directions in Float64Array, windows as numbers, each distinct source object once.
 *
 * Also the endpoint helpers: which constraints an attitude itself violates at a time.
 */
import { describe, fail, type Issue, IssueList, ok, type Result } from '../errors';
import { DEG_PER_RAD } from '../units';
import { arcTables, attitudeMargin } from './source';
import type { AttitudeConstraint, DirectionSource, PreparedConstraint, PreparedSource } from './types';

/** Consecutive samples of a direction source must be closer than this (rad) to interpolate. */
const MAX_SAMPLE_STEP_RAD = 0.5 * Math.PI;

function isArrayLike(v: unknown): v is ArrayLike<unknown> {
  return v !== null && typeof v === 'object' && typeof (v as ArrayLike<unknown>).length === 'number';
}

/** A non-zero 3-vector, normalised; null (with issues) otherwise. */
function readDirection(list: IssueList, path: string, v: unknown, what: string): Float64Array | null {
  if (!isArrayLike(v) || v.length !== 3) {
    list.add(path, 'vector3', `${path} must be 3 numbers (got ${describe(v)})`);
    return null;
  }
  let good = true;
  for (let i = 0; i < 3; i++) if (!list.finite(`${path}[${i}]`, v[i])) good = false;
  if (!good) return null;
  const x = v[0] as number,
    y = v[1] as number,
    z = v[2] as number;
  const n = Math.hypot(x, y, z);
  if (!(n > 1e-12)) {
    list.add(path, 'non-zero', `${path} is a zero vector: ${what} needs a direction`);
    return null;
  }
  return Float64Array.of(x / n, y / n, z / n);
}

function checkRadius(list: IssueList, path: string, r: unknown): boolean {
  if (!list.finite(path, r)) return false;
  if (r < 0 || r >= 0.5 * Math.PI) {
    list.add(path, 'radius-range', `${path} must be in [0°, 90°) (got ${(r * DEG_PER_RAD).toPrecision(4)}°)`);
    return false;
  }
  return true;
}

/**
 * The common case of a sampled source in one tight pass: finite, strictly increasing times and
 * finite non-zero directions, normalised into `dirs`. False at the first problem (the caller then
 * names every problem sample by sample).
 */
function readSamplesFast(t: ArrayLike<unknown>, d: ArrayLike<unknown>, times: Float64Array, dirs: Float64Array): boolean {
  const n = times.length;
  for (let i = 0; i < n; i++) {
    const ti = t[i],
      x = d[3 * i],
      y = d[3 * i + 1],
      z = d[3 * i + 2];
    if (typeof ti !== 'number' || typeof x !== 'number' || typeof y !== 'number' || typeof z !== 'number') return false;
    // ti − ti is NaN for NaN and ±Infinity.
    if (ti - ti !== 0 || (i > 0 && !(ti > times[i - 1]!))) return false;
    const r = Math.hypot(x, y, z);
    if (!(r > 1e-12 && r < Infinity)) return false;
    times[i] = ti;
    dirs[3 * i] = x / r;
    dirs[3 * i + 1] = y / r;
    dirs[3 * i + 2] = z / r;
  }
  return true;
}

/** Validate one direction source into its prepared shape. */
function prepareSource(list: IssueList, path: string, s: DirectionSource | undefined): PreparedSource | null {
  if (s === null || typeof s !== 'object') {
    list.add(path, 'type', `${path} must be a direction source {kind: 'fixed' | 'sampled', …}`);
    return null;
  }
  const radius = s.angularRadiusRad ?? 0;
  if (s.kind === 'fixed') {
    const d = readDirection(list, `${path}.direction`, s.direction, 'a fixed source');
    const rOk = checkRadius(list, `${path}.angularRadiusRad`, radius);
    if (!d || !rOk) return null;
    return {
      timesS: Float64Array.of(0),
      directions: d,
      greatCircle: true,
      radiusRad: Float64Array.of(radius as number),
      radiusVaries: false,
      ...arcTables(d),
    };
  }
  if (s.kind !== 'sampled') {
    list.add(`${path}.kind`, 'enum', `${path}.kind must be 'fixed' or 'sampled' (got ${describe((s as { kind: unknown }).kind)})`);
    return null;
  }
  const before = list.items.length;
  const t = s.timesS,
    d = s.directions;
  if (!isArrayLike(t) || t.length < 1) {
    list.add(`${path}.timesS`, 'samples', `${path}.timesS must hold at least one time (got ${describe(t)})`);
    return null;
  }
  const n = t.length;
  if (!isArrayLike(d) || d.length !== 3 * n) {
    list.add(`${path}.directions`, 'length', `${path}.directions must hold 3 numbers per time: ${3 * n} (got ${describe(d)})`);
    return null;
  }
  if (s.interpolation !== 'linear' && s.interpolation !== 'great-circle') {
    list.add(`${path}.interpolation`, 'enum', `${path}.interpolation must be 'linear' or 'great-circle'`);
  }
  const times = new Float64Array(n),
    dirs = new Float64Array(3 * n);
  if (!readSamplesFast(t, d, times, dirs)) {
    // Something is wrong: go through every sample again and name each problem.
    for (let i = 0; i < n; i++) {
      if (list.finite(`${path}.timesS[${i}]`, t[i])) times[i] = t[i] as number;
      if (i > 0 && !(times[i]! > times[i - 1]!) && list.items.length === before) {
        list.add(`${path}.timesS[${i}]`, 'increasing', `${path}.timesS must be strictly increasing (sample ${i} is not after ${i - 1})`);
      }
      const u = readDirection(list, `${path}.directions[${i}]`, [d[3 * i], d[3 * i + 1], d[3 * i + 2]], 'every sample');
      if (u) dirs.set(u, 3 * i);
    }
  }
  for (let i = 1; i < n && list.items.length === before; i++) {
    const c = dirs[3 * i]! * dirs[3 * i - 3]! + dirs[3 * i + 1]! * dirs[3 * i - 2]! + dirs[3 * i + 2]! * dirs[3 * i - 1]!;
    if (!(c > Math.cos(MAX_SAMPLE_STEP_RAD))) {
      const deg = Math.acos(Math.max(-1, Math.min(1, c))) * DEG_PER_RAD;
      list.add(
        `${path}.directions[${i}]`,
        'sample-step',
        `${path}: samples ${i - 1} and ${i} are ${deg.toFixed(1)}° apart; sample more densely (< 90°)`,
      );
    }
  }
  const rad = new Float64Array(n);
  let varies = false;
  if (typeof radius === 'number' || !isArrayLike(radius)) {
    if (checkRadius(list, `${path}.angularRadiusRad`, radius)) rad.fill(radius as number);
  } else if (radius.length !== n) {
    list.add(`${path}.angularRadiusRad`, 'length', `${path}.angularRadiusRad must be one number or one per sample (${n})`);
  } else {
    for (let i = 0; i < n; i++) if (checkRadius(list, `${path}.angularRadiusRad[${i}]`, radius[i])) rad[i] = radius[i] as number;
    for (let i = 1; i < n; i++) if (rad[i] !== rad[0]) varies = true;
  }
  if (list.items.length !== before) return null;
  return {
    timesS: times,
    directions: dirs,
    greatCircle: s.interpolation === 'great-circle',
    radiusRad: rad,
    radiusVaries: varies,
    ...arcTables(dirs),
  };
}

/** Validate one constraint; `sourceIndex` is filled by prepareConstraints. */
function prepareOne(list: IssueList, path: string, c: AttitudeConstraint, source: PreparedSource | null): PreparedConstraint | null {
  const before = list.items.length;
  if (typeof c.name !== 'string' || c.name.trim() === '') list.add(`${path}.name`, 'name', `${path}.name must be non-empty text`);
  if (c.kind !== 'keep-out' && c.kind !== 'keep-in') {
    list.add(`${path}.kind`, 'enum', `${path}.kind must be 'keep-out' or 'keep-in' (got ${describe(c.kind)})`);
  }
  const axis = readDirection(list, `${path}.bodyAxis`, c.bodyAxis, 'a cone');
  if (list.finite(`${path}.halfAngleRad`, c.halfAngleRad) && !(c.halfAngleRad > 0 && c.halfAngleRad < Math.PI)) {
    list.add(
      `${path}.halfAngleRad`,
      'half-angle-range',
      `${path}.halfAngleRad must be strictly between 0° and 180° (got ${(c.halfAngleRad * DEG_PER_RAD).toPrecision(4)}°)`,
    );
  }
  if (list.finite(`${path}.marginRad`, c.marginRad) && c.marginRad < 0) {
    list.add(`${path}.marginRad`, 'non-negative', `${path}.marginRad must be zero or more (got ${c.marginRad})`);
  }
  let ws = -Infinity,
    we = Infinity;
  if (c.window !== undefined) {
    const w = c.window;
    if (w === null || typeof w !== 'object') list.add(`${path}.window`, 'type', `${path}.window must be {startS, endS}`);
    else if (list.finite(`${path}.window.startS`, w.startS) && list.finite(`${path}.window.endS`, w.endS)) {
      if (w.endS < w.startS) {
        list.add(`${path}.window.endS`, 'window-order', `${path}.window ends (${w.endS} s) before it starts (${w.startS} s)`);
      }
      ws = w.startS;
      we = w.endS;
    }
  }
  if (list.items.length === before && c.kind === 'keep-in' && !(c.halfAngleRad - c.marginRad > 0)) {
    list.add(`${path}.marginRad`, 'keep-in-vanishes', `${path}: the margin leaves nothing of the keep-in cone (margin ≥ half-angle)`);
  }
  if (list.items.length !== before || !axis || !source) return null;
  return {
    name: c.name,
    kind: c.kind,
    axisBody: axis,
    halfAngleRad: c.halfAngleRad,
    marginRad: c.marginRad,
    windowStartS: ws,
    windowEndS: we,
    source,
    sourceIndex: 0,
  };
}

/**
 * Validate a list of constraints. Sources shared by object identity (the same Sun table given to
 * several constraints) are prepared once and share a sourceIndex.
 */
export function prepareConstraints(constraints: unknown): Result<PreparedConstraint[]> {
  const list = new IssueList();
  if (!Array.isArray(constraints)) {
    list.add('constraints', 'type', `constraints must be a list (got ${describe(constraints)})`);
    return fail(list.items);
  }
  const seen = new Map<unknown, { index: number; prepared: PreparedSource | null }>();
  const out: PreparedConstraint[] = [];
  constraints.forEach((c: AttitudeConstraint, k: number) => {
    const path = `constraints[${k}]`;
    if (c === null || typeof c !== 'object') {
      list.add(path, 'type', `${path} must be a constraint object`);
      return;
    }
    let src = seen.get(c.source);
    if (!src) {
      src = { index: seen.size, prepared: prepareSource(list, `${path}.source`, c.source) };
      seen.set(c.source, src);
    }
    const p = prepareOne(list, path, c, src.prepared);
    if (p) out.push({ ...p, sourceIndex: src.index });
  });
  return list.empty ? ok(out) : fail(list.items);
}

/**
 * Issues for every constraint the attitude q violates at time tS (windows honoured), e.g. a
 * target that itself points a keep-in axis out of its cone. `path` prefixes each issue.
 */
export function attitudeViolations(
  q: ArrayLike<number>,
  constraints: readonly PreparedConstraint[],
  tS: number,
  path = 'attitude',
): Issue[] {
  const out: Issue[] = [];
  for (const c of constraints) {
    if (tS < c.windowStartS || tS > c.windowEndS) continue;
    const m = attitudeMargin(q, c, tS);
    if (m < 0) {
      out.push({
        path,
        rule: c.kind === 'keep-in' ? 'keep-in-violated' : 'keep-out-violated',
        message: `${path} violates ${c.kind} constraint "${c.name}" by ${(-m * DEG_PER_RAD).toFixed(3)}° at t = ${tS} s`,
      });
    }
  }
  return out;
}

/** The keep-in constraints that the target attitude itself violates (it can never be reached inside them). */
export function targetKeepInViolations(qTarget: ArrayLike<number>, constraints: readonly PreparedConstraint[], tS: number): Issue[] {
  return attitudeViolations(
    qTarget,
    constraints.filter((c) => c.kind === 'keep-in'),
    tS,
    'qTarget',
  );
}
