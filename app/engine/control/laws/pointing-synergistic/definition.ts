/**
 * Registry entry of the synergistic pointing-only law on the sphere (law.ts). The S² certificate
 * (control/sphere/certificate.ts: every undesired critical point of every member located, δ* with
 * its error bound, zero-gap families refused) runs at build time, and the law is built only when
 * δ is admissible (unless requireCertificate is false: then the refusal comes back as warnings).
 */
import type { Issue } from '../../../errors';
import { fail, ok } from '../../../errors';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../../units';
import type { LawDefinition } from '../../definition';
import { certifySphereFamily } from '../../sphere/certificate';
import { ReducedSynergistic } from '../../sphere/laws';
import { pointingGainNote, pointingGains } from '../pointing-pd/law';
import { pointingFamilyOf } from './law';

/** The certificate's words → this law's file fields. */
function renameText(m: string): string {
  return m
    .replace(/warp directions? ⊥ b \(e\.g\. u and −u\)/g, 'warp azimuths (e.g. [0, 180] or [0, 120, 240])')
    .replace(/equal warp directions/g, 'equal warp azimuths')
    .replace(/warp direction (\d+)/g, 'warp azimuth $1')
    .replace(/hysteresis δ/g, 'jump threshold δ (gapThreshold)');
}

/** The certificate's field names → this law's file fields, in paths and in words. */
function renameFields(i: Issue, path: string): Issue {
  const p = i.path.startsWith(`${path}.`) ? i.path.slice(path.length + 1) : i.path;
  const field = p
    .replace(/^warpDirections/, 'warpAzimuthsDeg')
    .replace(/^hysteresis/, 'gapThreshold')
    .replace(/^axis/, 'law');
  return { ...i, path: `${path}.${field}`, message: renameText(i.message) };
}

export const pointingSynergistic: LawDefinition<'pointing-synergistic'> = {
  law: 'pointing-synergistic',
  title: 'Pointing synergistic (roll free, hybrid)',
  summary:
    'τ = −k_p ∇V_q − K_d ω_e over a family of warped pointing potentials on the sphere; the member q jumps when the synergy gap V_q − min_p V_p reaches δ, so the axis reaches its direction from every start, the antipode included, and noise below δ cannot hold it.',
  source:
    'Mayhew & Teel, Automatica 2013 (synergistic hybrid feedback on the 2-sphere, reduced-attitude tracking); Casau, Mayhew, Sanfelice & Silvestre, Automatica 2019 (n-sphere) — venues from memory; angular warping after Berkane & Tayebi, IEEE TAC 62(1):495–501, 2017',
  liftDependent: false,
  pointingOnly: true,
  certificate: 'S2',
  logicKind: 'index',
  gains: {
    stiffness: { symbol: 'k_p', unit: 'N·m', meaning: 'per unit of the active potential’s gradient' },
    damping: { symbol: 'k_d', unit: 'N·m·s', meaning: 'per rad/s of rate error' },
  },
  fields: [
    {
      key: 'warpGain',
      label: 'Warp gain k',
      unit: 'rad',
      kind: 'number',
      step: 0.05,
      help: 'θ(y) = k·(1 − cos φ): how far each member turns the sphere; keep 0 < k < 1 (the certificate checks the diffeomorphism).',
      suggested: 0.5,
    },
    {
      key: 'warpAzimuthsDeg',
      label: 'Warp azimuths',
      unit: 'deg',
      kind: 'number-list',
      step: 10,
      help: 'One member per azimuth: its warp direction ⊥ the pointed axis, at that angle about it. At least 2, distinct (equal ones share their undesired critical point: zero gap).',
      suggested: [0, 120, 240],
    },
    {
      key: 'gapThreshold',
      label: 'Jump threshold δ',
      unit: '—',
      kind: 'number',
      step: 0.05,
      help: 'The member jumps when the synergy gap V_q − min_p V_p reaches δ (units of V = 1 − cos φ); must stay below the certified gap δ*, and above what the noise can move the gap by.',
      suggested: 0.4,
    },
  ],
  fileDefaults: { warpGain: 0.5, warpAzimuthsDeg: [0, 120, 240], gapThreshold: 0.4 },
  check() {},
  resolve: (e) => ({
    law: 'pointing-synergistic',
    warpGain: e.warpGain,
    warpAzimuthsRad: e.warpAzimuthsDeg.map((a) => a * RAD_PER_DEG),
    gapThreshold: e.gapThreshold,
  }),
  toFile: (p) => ({ warpGain: p.warpGain, warpAzimuthsDeg: p.warpAzimuthsRad.map((a) => a * DEG_PER_RAD), gapThreshold: p.gapThreshold }),
  build(c, design, path) {
    const fam = pointingFamilyOf(c);
    const raw = certifySphereFamily({ family: fam, delta: c.gapThreshold }, { path });
    const warnings = raw.warnings.map((i) => renameFields(i, path));
    const issues = raw.issues.map((i) => renameFields(i, path));
    const cert = { ...raw, issues, warnings: [...warnings], summary: renameText(raw.summary) };
    if (!cert.admissible) {
      if (c.requireCertificate !== false) return fail(issues, warnings);
      warnings.push(...issues.map((i) => ({ ...i, message: `${i.message} (built anyway: requireCertificate is false)` })));
    }
    const g = pointingGains(c.gains, design.Jperp);
    return ok(new ReducedSynergistic(c.label, design, fam, g.kp, g.Kd, c.gapThreshold, c.initialLogic ?? 0, cert), warnings);
  },
  gainNote: (c, design) => pointingGainNote(c.gains, design.Jperp),
};
