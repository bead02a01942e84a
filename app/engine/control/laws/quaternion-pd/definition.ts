/** Registry entry of the continuous quaternion PD law (methods §2a). */
import { ok } from '../../../errors';
import type { LawDefinition } from '../../definition';
import { quaternionGainNote, quaternionGains } from '../../lawSupport';
import { QuaternionPd } from './law';

export const quaternionPd: LawDefinition<'quaternion-pd'> = {
  law: 'quaternion-pd',
  title: 'Quaternion PD (smooth)',
  summary: 'τ = −k_p ε − K_d ω_e with tracking feedforward; continuous, so it unwinds from the far hemisphere.',
  source:
    'Wie & Barba, JGCD 8(3), 1985 (quaternion feedback, from memory); unwinding: Bhat & Bernstein, Systems & Control Letters 39(1), 2000',
  liftDependent: true,
  logicKind: 'none',
  gains: {
    stiffness: { symbol: 'k_p', unit: 'N·m', meaning: 'per unit of the error quaternion vector part' },
    damping: { symbol: 'k_d', unit: 'N·m·s', meaning: 'per rad/s of rate error' },
  },
  fields: [],
  fileDefaults: {},
  check() {},
  resolve: () => ({ law: 'quaternion-pd' }),
  toFile: () => ({}),
  build(c, design) {
    const g = quaternionGains(c.gains, design.Jperp);
    return ok(new QuaternionPd(c.label, design, g.kp, g.Kd));
  },
  gainNote: (c, design) => quaternionGainNote(c.gains, design.Jperp),
};
