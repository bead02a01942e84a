/**
 * Controller specifications (what a scenario file or the UI says) and their validation.
 * Every problem is reported together, each with its field path and rule (errors.ts).
 *
 * Shapes (SI units; angles in rad):
 *   { kind: 'quaternion-pd' | 'sign-switch', label?, gains }
 *   { kind: 'hysteretic', label?, gains, hysteresis: δ ≥ 0, initialLogic?: 'auto' | 1 | -1 }
 *   { kind: 'eigenaxis', label?, gains: { k, c } | { omegaN, zeta }, maxRateRadPerS,
 *     torqueLimitNm?: number | [x, y, z] }
 *   { kind: 'synergistic', label?, gains: { kR, kOmega } | { omegaN, zeta },
 *     potential: { eigenvalues: [λ1, λ2, λ3], axes?: [v1, v2, v3] (unit, orthogonal; default body axes) },
 *     warpGain: k, warpDirections?: [u1, …, uM] (unit; default A's eigenvectors),
 *     hysteresis: δ, initialLogic?: 'auto' | 1..M, requireCertificate?: boolean (default true) }
 *   gains for the quaternion laws: { kp, kd } or { omegaN, zeta }; kd (and kOmega) may be a
 *   number, a diagonal [3] or a symmetric positive definite 3×3 (rows).
 */
import type { Issue } from '../errors';
import { IssueList, describe } from '../errors';
import type { Mat3 } from '../math/mat3';
import { m3Create, symmetricEigen3 } from '../math/mat3';
import type { ControllerKind, PlantModel } from './types';
import { CONTROLLER_KINDS } from './types';

export type GainSpec = { mode: 'explicit'; stiffness: number; damping: Mat3 } | { mode: 'bandwidth'; omegaN: number; zeta: number };

export interface ResolvedSpec {
  kind: ControllerKind;
  label: string | null;
  gains: GainSpec;
  /** hysteretic / synergistic. */
  hysteresis: number;
  /** 0 = auto. */
  initialLogic: number;
  /** eigenaxis. */
  maxRate: number;
  torqueLimit: Float64Array | null;
  /** synergistic: A (column-major), k and unit directions (3 per member, null = eigenvectors). */
  A: Mat3 | null;
  warpGain: number;
  warpDirections: Float64Array | null;
  requireCertificate: boolean;
}

const KNOWN: Record<ControllerKind, string[]> = {
  'quaternion-pd': ['kind', 'label', 'gains'],
  'sign-switch': ['kind', 'label', 'gains'],
  hysteretic: ['kind', 'label', 'gains', 'hysteresis', 'initialLogic'],
  eigenaxis: ['kind', 'label', 'gains', 'maxRateRadPerS', 'torqueLimitNm'],
  synergistic: ['kind', 'label', 'gains', 'potential', 'warpGain', 'warpDirections', 'hysteresis', 'initialLogic', 'requireCertificate'],
};

const GAIN_NAMES: Record<ControllerKind, [string, string]> = {
  'quaternion-pd': ['kp', 'kd'],
  'sign-switch': ['kp', 'kd'],
  hysteretic: ['kp', 'kd'],
  eigenaxis: ['k', 'c'],
  synergistic: ['kR', 'kOmega'],
};

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isNumArray(v: unknown, n: number): v is number[] {
  return Array.isArray(v) && v.length === n;
}

/** A positive number, a positive diagonal [3] or a symmetric positive definite 3×3 (rows). */
function parseGainMatrix(L: IssueList, path: string, v: unknown): Mat3 | null {
  const M = m3Create();
  if (typeof v === 'number') {
    if (!L.positive(path, v)) return null;
    M[0] = M[4] = M[8] = v;
    return M;
  }
  if (isNumArray(v, 3) && v.every((x) => typeof x === 'number')) {
    let good = true;
    v.forEach((x, i) => (good = L.positive(`${path}[${i}]`, x) && good));
    if (!good) return null;
    M[0] = v[0]!;
    M[4] = v[1]!;
    M[8] = v[2]!;
    return M;
  }
  if (isNumArray(v, 3) && v.every((r) => isNumArray(r, 3))) {
    let good = true;
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) good = L.finite(`${path}[${r}][${c}]`, (v[r] as unknown[])[c]) && good;
    if (!good) return null;
    const rows = v as unknown as number[][];
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) M[3 * c + r] = rows[r]![c]!;
    if (!checkSymmetricPd(L, path, M)) return null;
    return M;
  }
  L.add(
    path,
    'gain-shape',
    `${path} must be a positive number, a positive diagonal [x, y, z] or a symmetric positive definite 3×3 matrix (got ${describe(v)})`,
  );
  return null;
}

export function checkSymmetricPd(L: IssueList, path: string, M: ArrayLike<number>): boolean {
  let scale = 0;
  for (let i = 0; i < 9; i++) scale = Math.max(scale, Math.abs(M[i]!));
  for (let r = 0; r < 3; r++)
    for (let c = r + 1; c < 3; c++)
      if (Math.abs(M[3 * c + r]! - M[3 * r + c]!) > 1e-9 * scale) {
        L.add(`${path}[${r}][${c}]`, 'symmetric', `${path} must be symmetric: entries (${r},${c}) and (${c},${r}) differ`);
        return false;
      }
  const ev = symmetricEigen3(M).values;
  if (!(ev[0]! > 1e-12 * scale)) {
    L.add(path, 'positive-definite', `${path} must be positive definite (smallest eigenvalue ${ev[0]})`);
    return false;
  }
  return true;
}

function parseGains(L: IssueList, path: string, kind: ControllerKind, v: unknown): GainSpec | null {
  if (!isObject(v)) {
    L.add(path, 'required', `${path} must be an object with {${GAIN_NAMES[kind].join(', ')}} or {omegaN, zeta} (got ${describe(v)})`);
    return null;
  }
  const [sName, dName] = GAIN_NAMES[kind];
  const explicit = sName in v || dName in v;
  const band = 'omegaN' in v || 'zeta' in v;
  if (explicit && band) {
    L.add(path, 'exclusive', `${path}: give either {${sName}, ${dName}} or {omegaN, zeta}, not both`);
    return null;
  }
  for (const key of Object.keys(v))
    if (![sName, dName, 'omegaN', 'zeta'].includes(key))
      L.add(`${path}.${key}`, 'unknown-field', `${path}.${key} is not a gain of this law`);
  if (band) {
    const a = L.positive(`${path}.omegaN`, v.omegaN);
    const b = L.positive(`${path}.zeta`, v.zeta);
    return a && b ? { mode: 'bandwidth', omegaN: v.omegaN as number, zeta: v.zeta as number } : null;
  }
  const s = L.positive(`${path}.${sName}`, v[sName]);
  // The eigenaxis damping c is a scalar of the inertia-normalised loop.
  const d =
    kind === 'eigenaxis'
      ? L.positive(`${path}.${dName}`, v[dName])
        ? diagOf(v[dName] as number)
        : null
      : parseGainMatrix(L, `${path}.${dName}`, v[dName]);
  return s && d ? { mode: 'explicit', stiffness: v[sName] as number, damping: d } : null;
}

function diagOf(x: number): Mat3 {
  const M = m3Create();
  M[0] = M[4] = M[8] = x;
  return M;
}

/** Unit 3-vector (|‖u‖ − 1| ≤ 1e-6), returned normalised. */
function parseUnit(L: IssueList, path: string, v: unknown): number[] | null {
  if (!isNumArray(v, 3)) {
    L.add(path, 'vector3', `${path} must be an array of 3 numbers (got ${describe(v)})`);
    return null;
  }
  let good = true;
  v.forEach((x, i) => (good = L.finite(`${path}[${i}]`, x) && good));
  if (!good) return null;
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(Math.abs(n - 1) <= 1e-6)) {
    L.add(path, 'unit-norm', `${path} must be a unit vector (norm ${n})`);
    return null;
  }
  return [v[0]! / n, v[1]! / n, v[2]! / n];
}

function parsePotential(L: IssueList, path: string, v: unknown): Mat3 | null {
  if (!isObject(v)) {
    L.add(path, 'required', `${path} must be an object {eigenvalues: [λ1, λ2, λ3], axes?: [v1, v2, v3]} (got ${describe(v)})`);
    return null;
  }
  for (const key of Object.keys(v))
    if (key !== 'eigenvalues' && key !== 'axes') L.add(`${path}.${key}`, 'unknown-field', `${path}.${key} is not a field of the potential`);
  const ev = v.eigenvalues;
  let lam: number[] | null = null;
  if (!isNumArray(ev, 3))
    L.add(`${path}.eigenvalues`, 'vector3', `${path}.eigenvalues must be an array of 3 numbers (got ${describe(ev)})`);
  else {
    let good = true;
    ev.forEach((x, i) => (good = L.positive(`${path}.eigenvalues[${i}]`, x) && good));
    if (good) {
      lam = ev.slice();
      const s = [...lam].sort((a, b) => a - b);
      if (s[1]! - s[0]! <= 1e-6 * s[2]! || s[2]! - s[1]! <= 1e-6 * s[2]!) {
        L.add(
          `${path}.eigenvalues`,
          'distinct',
          `${path}.eigenvalues must be distinct (got ${lam.join(', ')}): repeated eigenvalues give continua of critical points (methods §1.2)`,
        );
        lam = null;
      }
    }
  }
  let axes: number[][] = [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ];
  if (v.axes !== undefined) {
    if (!isNumArray(v.axes, 3)) {
      L.add(`${path}.axes`, 'axes', `${path}.axes must be three unit vectors (got ${describe(v.axes)})`);
      return null;
    }
    const parsed = (v.axes as unknown[]).map((a, i) => parseUnit(L, `${path}.axes[${i}]`, a));
    if (parsed.some((a) => a === null)) return null;
    axes = parsed as number[][];
    for (let i = 0; i < 3; i++)
      for (let j = i + 1; j < 3; j++) {
        const d = axes[i]![0]! * axes[j]![0]! + axes[i]![1]! * axes[j]![1]! + axes[i]![2]! * axes[j]![2]!;
        if (Math.abs(d) > 1e-6) {
          L.add(`${path}.axes`, 'orthogonal', `${path}.axes[${i}] and [${j}] must be orthogonal (dot product ${d})`);
          return null;
        }
      }
  }
  if (!lam) return null;
  // A = Σ λ_i v_i v_iᵀ
  const A = m3Create();
  for (let i = 0; i < 3; i++)
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) A[3 * c + r]! += lam[i]! * axes[i]![r]! * axes[i]![c]!;
  return A;
}

/** Validate a controller spec; errors and warnings carry `path`-prefixed field paths. */
export function parseControllerSpec(spec: unknown, path: string): { spec: ResolvedSpec | null; errors: Issue[]; warnings: Issue[] } {
  const L = new IssueList();
  const W: Issue[] = [];
  if (!isObject(spec)) {
    L.add(path, 'required', `${path} must be an object with a "kind" (got ${describe(spec)})`);
    return { spec: null, errors: L.items, warnings: W };
  }
  const kind = spec.kind;
  if (typeof kind !== 'string' || !(CONTROLLER_KINDS as readonly string[]).includes(kind)) {
    L.add(`${path}.kind`, 'one-of', `${path}.kind must be one of ${CONTROLLER_KINDS.join(', ')} (got ${describe(kind)})`);
    return { spec: null, errors: L.items, warnings: W };
  }
  const k = kind as ControllerKind;
  for (const key of Object.keys(spec))
    if (!KNOWN[k].includes(key))
      W.push({ path: `${path}.${key}`, rule: 'unknown-field', message: `${path}.${key} is not used by a ${k} controller and was ignored` });
  let label: string | null = null;
  if (spec.label !== undefined) {
    if (typeof spec.label !== 'string' || spec.label.trim() === '')
      L.add(`${path}.label`, 'string', `${path}.label must be a non-empty string`);
    else label = spec.label;
  }
  const gains = parseGains(L, `${path}.gains`, k, spec.gains);
  const out: ResolvedSpec = {
    kind: k,
    label,
    gains: gains ?? { mode: 'bandwidth', omegaN: 1, zeta: 1 },
    hysteresis: 0,
    initialLogic: 0,
    maxRate: 0,
    torqueLimit: null,
    A: null,
    warpGain: 0,
    warpDirections: null,
    requireCertificate: true,
  };

  if (k === 'hysteretic') {
    if (L.finite(`${path}.hysteresis`, spec.hysteresis)) {
      const d = spec.hysteresis as number;
      if (d < 0) L.add(`${path}.hysteresis`, 'non-negative', `${path}.hysteresis must be ≥ 0 (got ${d})`);
      else {
        out.hysteresis = d;
        if (d === 0)
          W.push({
            path: `${path}.hysteresis`,
            rule: 'no-hysteresis',
            message: `${path}.hysteresis = 0 makes the law a memoryless sign switch: measurement noise can make it chatter near η = 0`,
          });
        if (d >= 1)
          W.push({
            path: `${path}.hysteresis`,
            rule: 'no-jumps',
            message: `${path}.hysteresis = ${d} ≥ 1: |η| ≤ 1 so no jump can occur and the law is the continuous PD, which unwinds`,
          });
      }
    }
    const il = spec.initialLogic;
    if (il === undefined || il === 'auto') out.initialLogic = 0;
    else if (il === 1 || il === -1) out.initialLogic = il;
    else L.add(`${path}.initialLogic`, 'one-of', `${path}.initialLogic must be 'auto', 1 or -1 (got ${describe(il)})`);
  }

  if (k === 'eigenaxis') {
    if (L.positive(`${path}.maxRateRadPerS`, spec.maxRateRadPerS)) out.maxRate = spec.maxRateRadPerS as number;
    const tl = spec.torqueLimitNm;
    if (tl !== undefined) {
      if (typeof tl === 'number') {
        if (L.positive(`${path}.torqueLimitNm`, tl)) out.torqueLimit = Float64Array.of(tl, tl, tl);
      } else if (isNumArray(tl, 3)) {
        let good = true;
        tl.forEach((x, i) => (good = L.positive(`${path}.torqueLimitNm[${i}]`, x) && good));
        if (good) out.torqueLimit = Float64Array.from(tl);
      } else
        L.add(`${path}.torqueLimitNm`, 'vector3', `${path}.torqueLimitNm must be a positive number or [x, y, z] (got ${describe(tl)})`);
    }
  }

  if (k === 'synergistic') {
    out.A = parsePotential(L, `${path}.potential`, spec.potential);
    if (L.positive(`${path}.warpGain`, spec.warpGain)) out.warpGain = spec.warpGain as number;
    const wd = spec.warpDirections;
    if (wd !== undefined) {
      if (!Array.isArray(wd) || wd.length < 2)
        L.add(`${path}.warpDirections`, 'min-members', `${path}.warpDirections must list at least 2 unit vectors (got ${describe(wd)})`);
      else {
        const dirs = wd.map((u, i) => parseUnit(L, `${path}.warpDirections[${i}]`, u));
        if (dirs.every((u) => u !== null)) out.warpDirections = Float64Array.from((dirs as number[][]).flat());
      }
    }
    if (L.finite(`${path}.hysteresis`, spec.hysteresis)) {
      const d = spec.hysteresis as number;
      if (!(d > 0)) L.add(`${path}.hysteresis`, 'positive', `${path}.hysteresis must be greater than zero (got ${d})`);
      else out.hysteresis = d;
    }
    const members = out.warpDirections ? out.warpDirections.length / 3 : 3;
    const il = spec.initialLogic;
    if (il === undefined || il === 'auto') out.initialLogic = 0;
    else if (typeof il === 'number' && Number.isInteger(il) && il >= 1 && il <= members) out.initialLogic = il;
    else
      L.add(`${path}.initialLogic`, 'one-of', `${path}.initialLogic must be 'auto' or a member index 1..${members} (got ${describe(il)})`);
    if (spec.requireCertificate !== undefined) {
      if (typeof spec.requireCertificate !== 'boolean')
        L.add(`${path}.requireCertificate`, 'boolean', `${path}.requireCertificate must be true or false`);
      else out.requireCertificate = spec.requireCertificate;
    }
  }
  return { spec: L.empty ? out : null, errors: L.items, warnings: W };
}

/** Validate the plant model a controller is built for. */
export function checkPlant(plant: unknown, path = 'plant'): Issue[] {
  const L = new IssueList();
  if (!isObject(plant)) {
    L.add(path, 'required', `${path} must be an object {Jperp, nWheels, axes}`);
    return L.items;
  }
  const p = plant as unknown as PlantModel;
  if (!(p.Jperp instanceof Float64Array) || p.Jperp.length !== 9) L.add(`${path}.Jperp`, 'mat3', `${path}.Jperp must be a Float64Array(9)`);
  else {
    let good = true;
    for (let i = 0; i < 9; i++) good = L.finite(`${path}.Jperp[${i % 3}][${Math.floor(i / 3)}]`, p.Jperp[i]) && good;
    if (good) checkSymmetricPd(L, `${path}.Jperp`, p.Jperp);
  }
  if (!Number.isInteger(p.nWheels) || p.nWheels < 0)
    L.add(`${path}.nWheels`, 'integer', `${path}.nWheels must be a non-negative integer (got ${describe(p.nWheels)})`);
  else if (!(p.axes instanceof Float64Array) || p.axes.length !== 3 * p.nWheels)
    L.add(`${path}.axes`, 'length', `${path}.axes must be a Float64Array of 3·nWheels = ${3 * p.nWheels} numbers`);
  else
    for (let i = 0; i < p.nWheels; i++) {
      const n = Math.hypot(p.axes[3 * i]!, p.axes[3 * i + 1]!, p.axes[3 * i + 2]!);
      if (!(Math.abs(n - 1) <= 1e-6)) L.add(`${path}.axes[${i}]`, 'unit-norm', `${path}.axes[${i}] must be a unit vector (norm ${n})`);
    }
  return L.items;
}
