/**
 * Typed builders for the pointing laws: plain data in, a law or every problem out (errors.ts).
 * The synergistic law is built only with an admissible S² certificate unless requireCertificate
 * is false (then the refusal comes back as warnings, as ../index.ts does for the SO(3) law).
 *
 * Units: axis and warp directions in body axes (any non-zero length, normalised here); kp in N·m
 * per unit of V = 1 − cos φ; Kd in N·m·s (a number for K_d = kd·I, or 9 numbers column-major,
 * symmetric positive definite); warp gain in rad per unit of V; hysteresis δ in units of V.
 */
import type { Issue, Result } from '../../errors';
import { fail, ok } from '../../errors';
import { allFinite } from '../../math/arrays';
import type { Mat3 } from '../../math/mat3';
import { symmetricEigen3 } from '../../math/mat3';
import type { PlantModel } from '../types';
import type { SphereCertifyOptions } from './certificate';
import { certifySphereFamily, sphereFamilyInputIssues } from './certificate';
import { ReducedPd, ReducedSynergistic } from './laws';
import { evenWarpDirections, makeSphereFamily } from './potential';

export interface ReducedPdSpec {
  label?: string;
  /** The pointed body axis b. */
  axis: ArrayLike<number>;
  kp: number;
  Kd: number | ArrayLike<number>;
}

export interface ReducedSynergisticSpec extends ReducedPdSpec {
  /** Warp gain k, 0 < k < 1/|u × b| (k < 1 for directions ⊥ b). */
  warpGain: number;
  /** Warp directions, 3 per member; default `members` directions evenly spaced ⊥ b. */
  warpDirections?: ArrayLike<number>;
  /** Members when warpDirections is absent (default 2: u and −u). */
  members?: number;
  hysteresis: number;
  /** Fixed 1-based q(0), or 0 / absent for argmin at the start. */
  initialLogic?: number;
  requireCertificate?: boolean;
  certify?: SphereCertifyOptions;
}

function readGains(spec: ReducedPdSpec, base: string, issues: Issue[]): Mat3 | null {
  if (!Number.isFinite(spec.kp) || !(spec.kp > 0))
    issues.push({ path: base + 'kp', rule: 'positive', message: `kp must be a finite number > 0 (got ${spec.kp})` });
  const K = new Float64Array(9);
  if (typeof spec.Kd === 'number') {
    if (!Number.isFinite(spec.Kd) || !(spec.Kd > 0)) {
      issues.push({ path: base + 'Kd', rule: 'positive', message: `Kd must be a finite number > 0 (got ${spec.Kd})` });
      return null;
    }
    K[0] = K[4] = K[8] = spec.Kd;
    return K;
  }
  const d = spec.Kd;
  if (!d || d.length !== 9 || !allFinite(d)) {
    issues.push({ path: base + 'Kd', rule: 'matrix', message: 'Kd must be a number or 9 finite numbers (column-major 3×3)' });
    return null;
  }
  for (let i = 0; i < 9; i++) K[i] = d[i]!;
  const asym = Math.max(Math.abs(K[1]! - K[3]!), Math.abs(K[2]! - K[6]!), Math.abs(K[5]! - K[7]!));
  const scale = Math.max(...Array.from(K, Math.abs));
  if (asym > 1e-12 * scale || !(symmetricEigen3(K).values[0]! > 0)) {
    issues.push({
      path: base + 'Kd',
      rule: 'positive-definite',
      message: 'Kd must be symmetric positive definite (the energy argument needs ω_eᵀK_dω_e > 0)',
    });
    return null;
  }
  return K;
}

function axisIssues(axis: ArrayLike<number>, base: string): Issue[] {
  if (axis && axis.length === 3 && allFinite(axis) && Math.hypot(axis[0]!, axis[1]!, axis[2]!) > 0) return [];
  return [{ path: base + 'axis', rule: 'unit-vector', message: 'the pointed body axis must be three finite numbers, not all zero' }];
}

export function makeReducedPd(spec: ReducedPdSpec, plant: PlantModel, path = 'controller'): Result<ReducedPd> {
  const base = path ? path + '.' : '';
  const issues = axisIssues(spec.axis, base);
  const K = readGains(spec, base, issues);
  if (issues.length || !K) return fail(issues);
  return ok(new ReducedPd(spec.label ?? 'Pointing PD (roll free)', plant, spec.axis, spec.kp, K));
}

export function makeReducedSynergistic(spec: ReducedSynergisticSpec, plant: PlantModel, path = 'controller'): Result<ReducedSynergistic> {
  const base = path ? path + '.' : '';
  const issues = axisIssues(spec.axis, base);
  const K = readGains(spec, base, issues);
  const m = spec.members ?? 2;
  if (!spec.warpDirections && !(Number.isInteger(m) && m >= 2))
    issues.push({ path: base + 'members', rule: 'min-members', message: `members must be an integer ≥ 2 (got ${m})` });
  if (issues.length || !K) return fail(issues);
  const dirs = spec.warpDirections ?? evenWarpDirections(spec.axis, m);
  const inputIssues = sphereFamilyInputIssues(spec.axis, spec.warpGain, dirs, path);
  if (inputIssues.length) return fail(inputIssues);
  const fam = makeSphereFamily(spec.axis, spec.warpGain, dirs);
  const start = spec.initialLogic ?? 0;
  if (!(start === 0 || (Number.isInteger(start) && start >= 1 && start <= fam.members)))
    return fail([
      { path: base + 'initialLogic', rule: 'one-of', message: `initialLogic must be 0 (auto) or 1..${fam.members} (got ${start})` },
    ]);
  const cert = certifySphereFamily({ family: fam, delta: spec.hysteresis }, { ...spec.certify, path });
  const warnings: Issue[] = [...cert.warnings];
  if (!cert.admissible) {
    if (spec.requireCertificate ?? true) return fail(cert.issues, warnings);
    warnings.push(...cert.issues.map((i) => ({ ...i, message: `${i.message} (built anyway: requireCertificate is false)` })));
  }
  const label = spec.label ?? `Pointing synergistic (δ = ${spec.hysteresis})`;
  return ok(new ReducedSynergistic(label, plant, fam, spec.kp, K, spec.hysteresis, start, cert), warnings);
}
