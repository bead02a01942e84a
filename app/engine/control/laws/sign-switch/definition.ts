/** Registry entry of the memoryless sign-switch law (methods §2b). */
import { ok } from '../../../errors';
import type { LawDefinition } from '../../definition';
import { quaternionGainNote, quaternionGains } from '../../lawSupport';
import { SignSwitch } from './law';

export const signSwitch: LawDefinition<'sign-switch'> = {
  law: 'sign-switch',
  title: 'Sign switch (memoryless)',
  summary: 'τ = −k_p sgn(η) ε − K_d ω_e: the short way round, but discontinuous at η = 0, where noise makes it chatter.',
  source: 'Mayhew, Sanfelice & Teel, IEEE TAC 58(5):1179–1191, 2013',
  liftDependent: true,
  logicKind: 'sign',
  gains: {
    stiffness: { symbol: 'k_p', unit: 'N·m', meaning: 'per unit of the error quaternion vector part' },
    damping: { symbol: 'k_d', unit: 'N·m·s', meaning: 'per rad/s of rate error' },
  },
  fields: [],
  fileDefaults: {},
  check() {},
  resolve: () => ({ law: 'sign-switch' }),
  toFile: () => ({}),
  build(c, design) {
    const g = quaternionGains(c.gains, design.Jperp);
    return ok(new SignSwitch(c.label, design, g.kp, g.Kd));
  },
  gainNote: (c, design) => quaternionGainNote(c.gains, design.Jperp),
};
