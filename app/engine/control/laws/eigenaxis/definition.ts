/** Registry entry of rate-limited eigenaxis feedback (methods §2c). */
import type { Issue } from '../../../errors';
import { ok } from '../../../errors';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../../units';
import type { LawDefinition } from '../../definition';
import { gainsFromBandwidth } from '../../gains';
import { dampingScalar } from '../../lawSupport';
import type { GainSetting } from '../../params';
import type { Mat3 } from '../../../math/mat3';
import { Eigenaxis } from './law';

/** k (1/s²) and c (1/s) of the inertia-normalised loop ω̇_e = −k sat(ε) − c ω_e. */
function eigenGains(g: GainSetting, Jperp: Mat3): { k: number; c: number } {
  if (g.form === 'explicit') return { k: g.stiffness, c: dampingScalar(g.damping) };
  const b = gainsFromBandwidth(Jperp, g.bandwidthRadPerS, g.dampingRatio);
  return { k: b.kEigen, c: b.cEigen };
}

export const eigenaxis: LawDefinition<'eigenaxis'> = {
  law: 'eigenaxis',
  title: 'Eigenaxis, rate-limited',
  summary: 'Computed-torque eigenaxis feedback: from rest it turns about a fixed axis, the rate capped at ω_max.',
  source:
    'Wie, Weiss & Arapostathis, JGCD 12(3):375–380, 1989; rate limit: Wie & Lu, JGCD 18(6):1372–1379, 1995 (both from memory, methods §2c)',
  liftDependent: true,
  logicKind: 'none',
  gains: {
    stiffness: { symbol: 'k', unit: '1/s²', meaning: 'per unit of the error quaternion vector part (inertia-normalised)' },
    damping: { symbol: 'c', unit: '1/s', meaning: 'per rad/s of rate error (inertia-normalised)' },
  },
  fields: [
    {
      key: 'maxRateDegPerS',
      label: 'Slew-rate limit ω_max',
      unit: 'deg/s',
      kind: 'number',
      step: 0.5,
      help: 'The law saturates its attitude term so that the slew rate approaches ω_max from below.',
      suggested: 3,
    },
  ],
  fileDefaults: { maxRateDegPerS: 3 },
  check() {},
  resolve: (e) => ({ law: 'eigenaxis', maxRateRadPerS: e.maxRateDegPerS * RAD_PER_DEG }),
  toFile: (p) => ({ maxRateDegPerS: p.maxRateRadPerS * DEG_PER_RAD }),
  build(c, design, path) {
    const warnings: Issue[] = [];
    const { k, c: cGain } = eigenGains(c.gains, design.Jperp);
    const lim = design.bodyAxisTorqueNm ? Float64Array.from(design.bodyAxisTorqueNm) : null;
    if (lim) {
      // Rest-start peak |τ_i| ≤ c ω_max Σ_j |J_ij| (methods §2c): warn when the guard may scale.
      const J = design.Jperp;
      for (let i = 0; i < 3; i++) {
        const peak = cGain * c.maxRateRadPerS * (Math.abs(J[i]!) + Math.abs(J[3 + i]!) + Math.abs(J[6 + i]!));
        if (peak > lim[i]!)
          warnings.push({
            path: `${path}.maxRateDegPerS`,
            rule: 'torque-margin',
            message: `axis ${'xyz'[i]}: the rate-limited law may ask up to ${peak.toPrecision(3)} N·m at a rest start, above the wheels' ${lim[i]!.toPrecision(3)} N·m; the command will then be scaled and the eigenaxis is not kept exactly — lower the slew-rate limit or the damping`,
          });
      }
    }
    return ok(new Eigenaxis(c.label, design, k, cGain, c.maxRateRadPerS, lim), warnings);
  },
  gainNote(c, design) {
    const g = c.gains;
    if (g.form === 'bandwidth') {
      const b = gainsFromBandwidth(design.Jperp, g.bandwidthRadPerS, g.dampingRatio);
      return `k = ${b.kEigen.toPrecision(3)} s⁻², c = ${b.cEigen.toPrecision(3)} s⁻¹ (ω_n ${g.bandwidthRadPerS} rad/s, ζ ${g.dampingRatio})`;
    }
    return `k = ${g.stiffness} s⁻², c = ${dampingScalar(g.damping)} s⁻¹`;
  },
};
