/**
 * Controller factory: validate a spec against the plant and build the law behind the common
 * interface (types.ts). The synergistic law is built only when its family is certified and δ is
 * admissible (certificate.ts), unless the spec sets requireCertificate: false, in which case the
 * refusal comes back as warnings and the controller is built anyway (for demonstrations of what
 * goes wrong).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { m3Create, symmetricEigen3 } from '../math/mat3';
import { certifySynergistic } from './certificate';
import { Eigenaxis } from './eigenaxis';
import { gainsFromBandwidth, synergisticGainsFromBandwidth } from './gains';
import { makeWarpFamily } from './potential';
import { Hysteretic, QuaternionPd, SignSwitch } from './quaternionLaws';
import { checkPlant, parseControllerSpec } from './spec';
import { Synergistic } from './synergistic';
import type { AttitudeController, ControllerKind, PlantModel } from './types';

export type { AttitudeController, ControlDiagnostics, ControlInput, ControllerKind, PlantModel } from './types';
export { CONTROLLER_KINDS, makeDiagnostics } from './types';
export { gainsFromBandwidth, synergisticGainsFromBandwidth } from './gains';
export type { BandwidthGains, SynergisticBandwidthGains } from './gains';
export { certifySynergistic } from './certificate';
export type { CertificateResult, CertifyOptions, CertifyParams, CriticalPointReport } from './certificate';
export { flowSetGradientCheck } from './flowset';
export type { FlowSetCheck } from './flowset';
export { makeWarpFamily } from './potential';
export type { WarpFamily } from './potential';
export { eigenaxisLimits } from './eigenaxis';

const DEFAULT_LABELS: Record<ControllerKind, string> = {
  'quaternion-pd': 'Quaternion PD',
  'sign-switch': 'Sign-switch PD',
  eigenaxis: 'Eigenaxis, rate-limited',
  hysteretic: 'Hysteretic hybrid',
  synergistic: 'Synergistic hybrid',
};

function diag(x: number) {
  const M = m3Create();
  M[0] = M[4] = M[8] = x;
  return M;
}

export function makeController(spec: unknown, plant: PlantModel, path = 'controller'): Result<AttitudeController> {
  const parsed = parseControllerSpec(spec, path);
  const plantIssues = checkPlant(plant);
  const errors: Issue[] = [...parsed.errors, ...plantIssues];
  const warnings: Issue[] = [...parsed.warnings];
  const s = parsed.spec;
  if (!s || errors.length > 0) return fail(errors, warnings);
  const label =
    s.label ??
    (s.kind === 'hysteretic' || s.kind === 'synergistic' ? `${DEFAULT_LABELS[s.kind]} (δ = ${s.hysteresis})` : DEFAULT_LABELS[s.kind]);
  const J = plant.Jperp;

  if (s.kind === 'synergistic') {
    const A = s.A as Float64Array;
    // Default warp directions: A's eigenvectors (methods §4.2, §4.3).
    const fam = makeWarpFamily(A, s.warpGain, s.warpDirections ?? symmetricEigen3(A).vectors);
    const cert = certifySynergistic({ family: fam, delta: s.hysteresis }, { path });
    if (!cert.admissible) {
      if (s.requireCertificate) return fail(cert.issues, [...warnings, ...cert.warnings]);
      warnings.push(...cert.issues.map((i) => ({ ...i, message: `${i.message} (built anyway: requireCertificate is false)` })));
    }
    warnings.push(...cert.warnings);
    let kR: number, Ko: Float64Array;
    if (s.gains.mode === 'bandwidth') {
      const g = synergisticGainsFromBandwidth(J, fam, s.gains.omegaN, s.gains.zeta);
      kR = g.kR;
      Ko = diag(g.kOmega);
    } else {
      kR = s.gains.stiffness;
      Ko = s.gains.damping;
    }
    return ok(new Synergistic(label, plant, fam, kR, Ko, s.hysteresis, s.initialLogic, cert), warnings);
  }

  if (s.kind === 'eigenaxis') {
    let k: number, c: number;
    if (s.gains.mode === 'bandwidth') {
      const g = gainsFromBandwidth(J, s.gains.omegaN, s.gains.zeta);
      k = g.kEigen;
      c = g.cEigen;
    } else {
      k = s.gains.stiffness;
      c = s.gains.damping[0]!;
    }
    if (s.torqueLimit) {
      // Rest-start peak |τ_i| ≤ c ω_max Σ_j |J_ij| (methods §2c): warn when the guard may scale.
      for (let i = 0; i < 3; i++) {
        const peak = c * s.maxRate * (Math.abs(J[i]!) + Math.abs(J[3 + i]!) + Math.abs(J[6 + i]!));
        if (peak > s.torqueLimit[i]!)
          warnings.push({
            path: `${path}.torqueLimitNm`,
            rule: 'torque-margin',
            message: `axis ${'xyz'[i]}: the rate-limited law may ask up to ${peak.toPrecision(3)} N·m at a rest start, above the limit ${s.torqueLimit[i]} N·m; the command will then be scaled and the eigenaxis is not kept exactly — lower maxRateRadPerS or the damping`,
          });
      }
    }
    return ok(new Eigenaxis(label, plant, k, c, s.maxRate, s.torqueLimit), warnings);
  }

  let kp: number, Kd: Float64Array;
  if (s.gains.mode === 'bandwidth') {
    const g = gainsFromBandwidth(J, s.gains.omegaN, s.gains.zeta);
    kp = g.kp;
    Kd = diag(g.kd);
  } else {
    kp = s.gains.stiffness;
    Kd = s.gains.damping;
  }
  if (s.kind === 'quaternion-pd') return ok(new QuaternionPd(label, plant, kp, Kd), warnings);
  if (s.kind === 'sign-switch') return ok(new SignSwitch(label, plant, kp, Kd), warnings);
  return ok(new Hysteretic(label, plant, kp, Kd, s.hysteresis, s.initialLogic), warnings);
}
