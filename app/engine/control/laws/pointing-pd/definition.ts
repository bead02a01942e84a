/** Registry entry of the smooth pointing-only PD on the sphere (control/sphere/laws.ts ReducedPd). */
import { fail, ok } from '../../../errors';
import type { LawDefinition } from '../../definition';
import { makeReducedPd } from '../../sphere/build';
import { BUILD_AXIS, pointingGainNote, pointingGains } from './law';

export const pointingPd: LawDefinition<'pointing-pd'> = {
  law: 'pointing-pd',
  title: 'Pointing PD (roll free, smooth)',
  summary:
    'τ = −k_p (y × b) − K_d ω_e on V = 1 − cos φ: one body axis onto its direction, roll left free; smooth, so it hesitates near the antipode and noise can hold it there.',
  source:
    'PD on the sphere with V = 1 − rᵀx; obstruction: Bhat & Bernstein, Systems & Control Letters 39(1):63–70, 2000; noise stall: Mayhew, Sanfelice & Teel, IEEE TAC 58(5), 2013 (from memory)',
  liftDependent: false,
  pointingOnly: true,
  logicKind: 'none',
  gains: {
    stiffness: { symbol: 'k_p', unit: 'N·m', meaning: 'per unit of the pointing-potential gradient (sin of the pointing error)' },
    damping: { symbol: 'k_d', unit: 'N·m·s', meaning: 'per rad/s of rate error' },
  },
  fields: [],
  fileDefaults: {},
  check() {},
  resolve: () => ({ law: 'pointing-pd' }),
  toFile: () => ({}),
  build(c, design, path) {
    const g = pointingGains(c.gains, design.Jperp);
    const r = makeReducedPd({ label: c.label, axis: BUILD_AXIS, kp: g.kp, Kd: g.Kd }, design, path);
    return r.ok ? ok(r.value, r.warnings) : fail(r.errors, r.warnings);
  },
  gainNote: (c, design) => pointingGainNote(c.gains, design.Jperp),
};
