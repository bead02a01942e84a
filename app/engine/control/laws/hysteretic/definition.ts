/** Registry entry of hysteretic hybrid quaternion feedback (methods §3). */
import type { Issue } from '../../../errors';
import { ok } from '../../../errors';
import type { LawDefinition } from '../../definition';
import { quaternionGainNote, quaternionGains } from '../../lawSupport';
import { Hysteretic } from './law';

export const hysteretic: LawDefinition<'hysteretic'> = {
  law: 'hysteretic',
  title: 'Hysteretic hybrid (h ∈ {−1, 1})',
  summary: 'τ = −k_p h ε − K_d ω_e with a logic h that flips when h·η ≤ −δ: no unwinding, and no chatter under noise below δ.',
  source:
    'Mayhew, Sanfelice & Teel, "Quaternion-based hybrid control for robust global attitude tracking", IEEE TAC 56(11):2555–2566, 2011',
  liftDependent: true,
  logicKind: 'sign',
  gains: {
    stiffness: { symbol: 'k_p', unit: 'N·m', meaning: 'per unit of the error quaternion vector part' },
    damping: { symbol: 'k_d', unit: 'N·m·s', meaning: 'per rad/s of rate error' },
  },
  fields: [
    {
      key: 'hysteresis',
      label: 'Hysteresis δ',
      unit: '—',
      kind: 'number',
      step: 0.05,
      help: 'Width δ on h·η: the logic flips when h·η ≤ −δ. Keep 0 < δ < 1 and above the attitude noise (as η); larger δ allows a longer way round (up to π + 2·asin δ).',
      suggested: 0.2,
    },
  ],
  fileDefaults: { hysteresis: 0.2 },
  check() {},
  resolve: (e) => ({ law: 'hysteretic', hysteresis: e.hysteresis }),
  toFile: (p) => ({ hysteresis: p.hysteresis }),
  build(c, design, path) {
    const warnings: Issue[] = [];
    const d = c.hysteresis;
    if (d === 0)
      warnings.push({
        path: `${path}.hysteresis`,
        rule: 'no-hysteresis',
        message: 'hysteresis δ = 0 makes the law a memoryless sign switch: measurement noise can make it chatter near η = 0',
      });
    if (d >= 1)
      warnings.push({
        path: `${path}.hysteresis`,
        rule: 'no-jumps',
        message: `hysteresis δ = ${d} ≥ 1: |η| ≤ 1 so no jump can occur and the law is the continuous PD, which unwinds`,
      });
    const g = quaternionGains(c.gains, design.Jperp);
    return ok(new Hysteretic(c.label, design, g.kp, g.Kd, d, c.initialLogic ?? 0), warnings);
  },
  gainNote: (c, design) => quaternionGainNote(c.gains, design.Jperp),
};
