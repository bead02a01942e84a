/** Registry entry of synergistic hybrid feedback over angularly warped trace potentials (methods §4). */
import type { Issue } from '../../../errors';
import { fail, ok } from '../../../errors';
import type { Mat3, Vec3 } from '../../../math/mat3';
import { m3Create, v3Create } from '../../../math/mat3';
import { MILLI_PER_SI } from '../../../units';
import { certifySynergistic } from '../../certificate';
import type { LawDefinition, ParamsOf } from '../../definition';
import { synergisticGainsFromBandwidth } from '../../gains';
import { dampingMatrix, dampingScalar } from '../../lawSupport';
import { makeWarpFamily, type WarpFamily } from '../../potential';
import { Synergistic } from './law';

const IDENTITY_ROWS = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
];

function unit(v: readonly number[]): Vec3 {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return v3Create(v[0]! / n, v[1]! / n, v[2]! / n);
}

/** A = Σ λ_i v_i v_iᵀ (column-major) from the weights and the axes (columns of V). */
export function potentialMatrix(weights: ArrayLike<number>, axes: Mat3): Mat3 {
  const A = m3Create();
  for (let i = 0; i < 3; i++)
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) A[3 * c + r]! += weights[i]! * axes[3 * i + r]! * axes[3 * i + c]!;
  return A;
}

/** The warped family of a synergistic controller's parameters. */
export function familyOf(p: ParamsOf<'synergistic'>): WarpFamily {
  const dirs = new Float64Array(3 * p.warpDirections.length);
  p.warpDirections.forEach((u, k) => dirs.set(u, 3 * k));
  return makeWarpFamily(potentialMatrix(p.potentialWeights, p.potentialAxes), p.warpGain, dirs);
}

export const synergistic: LawDefinition<'synergistic'> = {
  law: 'synergistic',
  title: 'Synergistic hybrid (warped potentials)',
  summary:
    'τ = −k_R ∇V_q − K_ω ω_e over a family of warped trace potentials; the member index q jumps when the synergy gap V_q − min_p V_p reaches δ, so every attitude converges.',
  source:
    'Mayhew & Teel, IEEE TAC 58(11):2730–2742, 2013 (synergistic hybrid feedback); angular warping: Berkane & Tayebi, IEEE TAC 62(1):495–501, 2017',
  liftDependent: false,
  logicKind: 'index',
  gains: {
    stiffness: { symbol: 'k_R', unit: 'N·m', meaning: 'per unit of the potential gradient' },
    damping: { symbol: 'K_ω', unit: 'N·m·s', meaning: 'per rad/s of rate error' },
  },
  fields: [
    {
      key: 'potentialWeights',
      label: 'Potential weights λ',
      unit: '—',
      kind: 'vector3',
      help: 'Eigenvalues of A in Φ(R) = tr(A(I − R)); positive and distinct.',
      suggested: [0.125, 0.25, 0.375],
    },
    {
      key: 'warpGain',
      label: 'Warp gain k',
      unit: 'rad',
      kind: 'number',
      step: 0.05,
      help: 'θ(R) = k·Φ(R); the warp must stay a diffeomorphism (the certificate checks it).',
      suggested: 1.2,
    },
    {
      key: 'gapThreshold',
      label: 'Jump threshold δ',
      unit: '—',
      kind: 'number',
      step: 0.005,
      help: 'The index jumps when the synergy gap V_q − min_p V_p reaches δ (potential units); must stay below the certified gap δ*.',
      suggested: 0.025,
    },
    {
      key: 'potentialAxes',
      label: 'Potential axes',
      unit: '—',
      kind: 'optional-axes',
      help: 'Orthonormal eigenvectors of A, one per weight (default: body x, y, z).',
    },
    {
      key: 'warpDirections',
      label: 'Warp directions',
      unit: '—',
      kind: 'optional-directions',
      help: 'One member of the family per direction, at least 2 (default: the potential axes).',
    },
  ],
  fileDefaults: { potentialWeights: [0.125, 0.25, 0.375], warpGain: 1.2, gapThreshold: 0.025 },
  check(e, path, errors) {
    const w = e.potentialWeights;
    const wMax = Math.max(...w);
    pairs: for (let a = 0; a < 3; a++)
      for (let b = a + 1; b < 3; b++)
        if (Math.abs(w[a]! - w[b]!) <= 1e-9 * wMax) {
          errors.push({
            path: `${path}.potentialWeights`,
            rule: 'distinct',
            message: `the potential weights λ must be distinct (entries ${a + 1} and ${b + 1} are both ${w[a]}); repeated weights give a continuum of critical attitudes`,
          });
          break pairs;
        }
    if (e.potentialAxes) {
      const ax = e.potentialAxes;
      let worst = 0;
      for (let a = 0; a < 3; a++)
        for (let b = a; b < 3; b++) {
          const d = ax[a]![0]! * ax[b]![0]! + ax[a]![1]! * ax[b]![1]! + ax[a]![2]! * ax[b]![2]!;
          worst = Math.max(worst, Math.abs(d - (a === b ? 1 : 0)));
        }
      if (!(worst <= 1e-6))
        errors.push({
          path: `${path}.potentialAxes`,
          rule: 'orthonormal',
          message: `the potential axes must be three orthonormal vectors (within 1e-6; largest departure ${worst.toPrecision(3)})`,
        });
    }
    e.warpDirections?.forEach((u, k) => {
      if (!(Math.hypot(u[0]!, u[1]!, u[2]!) > 0))
        errors.push({
          path: `${path}.warpDirections[${k}]`,
          rule: 'non-zero',
          message: `warp direction ${k + 1} is the zero vector; a warping direction needs a non-zero length`,
        });
    });
  },
  resolve(e) {
    const rows = e.potentialAxes ?? IDENTITY_ROWS;
    const axes = rows.map(unit);
    const V = m3Create();
    axes.forEach((a, k) => V.set(a, 3 * k));
    return {
      law: 'synergistic',
      potentialWeights: v3Create(e.potentialWeights[0]!, e.potentialWeights[1]!, e.potentialWeights[2]!),
      potentialAxes: V,
      warpGain: e.warpGain,
      warpDirections: e.warpDirections ? e.warpDirections.map(unit) : axes.map((a) => v3Create(a[0]!, a[1]!, a[2]!)),
      gapThreshold: e.gapThreshold,
    };
  },
  toFile(p) {
    const axes = [0, 1, 2].map((k) => [p.potentialAxes[3 * k]!, p.potentialAxes[3 * k + 1]!, p.potentialAxes[3 * k + 2]!]);
    const identity = axes.every((row, k) => row.every((x, c) => x === IDENTITY_ROWS[k]![c]));
    const dirs = p.warpDirections.map((u) => [u[0]!, u[1]!, u[2]!]);
    const dirsAreAxes = dirs.length === 3 && dirs.every((row, k) => row.every((x, c) => x === axes[k]![c]));
    return {
      potentialWeights: [p.potentialWeights[0]!, p.potentialWeights[1]!, p.potentialWeights[2]!],
      ...(identity ? {} : { potentialAxes: axes }),
      warpGain: p.warpGain,
      ...(dirsAreAxes ? {} : { warpDirections: dirs }),
      gapThreshold: p.gapThreshold,
    };
  },
  build(c, design, path) {
    const warnings: Issue[] = [];
    const fam = familyOf(c);
    const cert = certifySynergistic({ family: fam, delta: c.gapThreshold }, { path });
    if (!cert.admissible) {
      if (c.requireCertificate !== false) return fail(cert.issues, [...warnings, ...cert.warnings]);
      warnings.push(...cert.issues.map((i) => ({ ...i, message: `${i.message} (built anyway: requireCertificate is false)` })));
    }
    warnings.push(...cert.warnings);
    let kR: number, Ko: Mat3;
    if (c.gains.form === 'bandwidth') {
      const g = synergisticGainsFromBandwidth(design.Jperp, fam, c.gains.bandwidthRadPerS, c.gains.dampingRatio);
      kR = g.kR;
      Ko = dampingMatrix(g.kOmega);
    } else {
      kR = c.gains.stiffness;
      Ko = dampingMatrix(c.gains.damping);
    }
    return ok(new Synergistic(c.label, design, fam, kR, Ko, c.gapThreshold, c.initialLogic ?? 0, cert), warnings);
  },
  gainNote(c, design) {
    const g = c.gains;
    if (g.form === 'explicit') return `k_R = ${g.stiffness} N·m, K_ω = ${dampingScalar(g.damping)} N·m·s`;
    const s = synergisticGainsFromBandwidth(design.Jperp, familyOf(c), g.bandwidthRadPerS, g.dampingRatio);
    return `k_R = ${s.kR.toPrecision(3)} N·m, K_ω = ${s.kOmega.toPrecision(3)} N·m·s; asks ${(s.torqueAtErrorNm * MILLI_PER_SI).toPrecision(3)} mN·m at a 90° error`;
  },
};
