/**
 * Tests build controllers from a compact spec (the shape the tests were written in):
 *   { kind, label?, gains: {kp, kd} | {k, c} | {kR, kOmega} | {omegaN, zeta}, hysteresis?,
 *     potential?: {eigenvalues, axes?}, warpGain?, warpDirections?, maxRateRadPerS?,
 *     torqueLimitNm?, initialLogic?, requireCertificate? }
 * This turns it into the engine's typed ControllerParams and builds through the law registry
 * (control/registry.ts). Test-only: the product validates scenario files, not these specs.
 * Defaults follow the ones the tests assume: warp directions default to A's eigenvectors in
 * ascending eigenvalue order (symmetricEigen3), hysteresis δ may be 0 or ≥ 1 for theory checks.
 */
import type { Result } from '../../app/engine/errors';
import { buildController } from '../../app/engine/control/registry';
import type { ControllerParams, GainSetting, LawId } from '../../app/engine/control/params';
import type { AttitudeController, DesignModel, PlantModel } from '../../app/engine/control/types';
import { m3Create, symmetricEigen3, v3Create } from '../../app/engine/math/mat3';
import type { Mat3, Vec3 } from '../../app/engine/math/mat3';
import { potentialMatrix } from '../../app/engine/control/laws/synergistic/definition';

type Spec = Record<string, unknown>;

function matrix(v: unknown): number | Mat3 {
  if (typeof v === 'number') return v;
  const a = v as unknown[];
  const M = m3Create();
  if (typeof a[0] === 'number') {
    M[0] = a[0] as number;
    M[4] = a[1] as number;
    M[8] = a[2] as number;
    return M;
  }
  const rows = a as number[][];
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) M[3 * c + r] = rows[r]![c]!;
  return M;
}

function gains(g: Spec): GainSetting {
  if ('omegaN' in g) return { form: 'bandwidth', bandwidthRadPerS: g.omegaN as number, dampingRatio: g.zeta as number };
  const [s, d] = 'kp' in g ? ['kp', 'kd'] : 'k' in g ? ['k', 'c'] : ['kR', 'kOmega'];
  return { form: 'explicit', stiffness: g[s!] as number, damping: matrix(g[d!]) };
}

function unit(v: readonly number[]): Vec3 {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return v3Create(v[0]! / n, v[1]! / n, v[2]! / n);
}

/** Typed parameters of a compact test spec. */
export function paramsOf(spec: Spec): ControllerParams {
  const law = spec.kind as LawId;
  const common = {
    label: typeof spec.label === 'string' ? spec.label : law,
    gains: gains(spec.gains as Spec),
    initialLogic: typeof spec.initialLogic === 'number' ? spec.initialLogic : 0,
    requireCertificate: spec.requireCertificate !== false,
  };
  switch (law) {
    case 'hysteretic':
      return { ...common, law, hysteresis: spec.hysteresis as number };
    case 'eigenaxis':
      return { ...common, law, maxRateRadPerS: spec.maxRateRadPerS as number };
    case 'synergistic': {
      const pot = spec.potential as { eigenvalues: number[]; axes?: number[][] };
      const axes = (
        pot.axes ?? [
          [1, 0, 0],
          [0, 1, 0],
          [0, 0, 1],
        ]
      ).map(unit);
      const V = m3Create();
      axes.forEach((a, k) => V.set(a, 3 * k));
      const weights = v3Create(pot.eigenvalues[0]!, pot.eigenvalues[1]!, pot.eigenvalues[2]!);
      const dirs = spec.warpDirections
        ? (spec.warpDirections as number[][]).map(unit)
        : [0, 1, 2].map((k) => {
            const ev = symmetricEigen3(potentialMatrix(weights, V)).vectors;
            return v3Create(ev[3 * k]!, ev[3 * k + 1]!, ev[3 * k + 2]!);
          });
      return {
        ...common,
        law,
        potentialWeights: weights,
        potentialAxes: V,
        warpGain: spec.warpGain as number,
        warpDirections: dirs,
        gapThreshold: spec.hysteresis as number,
      };
    }
    default:
      return { ...common, law } as ControllerParams;
  }
}

/** Build a controller from a compact test spec for a plant model. */
export function controllerFromSpec(spec: Spec, plant: PlantModel, path = 'controller'): Result<AttitudeController> {
  const t = spec.torqueLimitNm;
  const design: DesignModel = {
    ...plant,
    ...(t === undefined
      ? {}
      : { bodyAxisTorqueNm: typeof t === 'number' ? v3Create(t, t, t) : v3Create(...(t as [number, number, number])) }),
  };
  return buildController(paramsOf(spec), design, path);
}
