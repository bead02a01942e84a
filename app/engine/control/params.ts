/**
 * Typed controller parameters, SI: what a law is built from (laws/<law>/definition.ts builds it).
 * The scenario file's entries are validated once (scenario/validate.ts) and resolved into these
 * (scenario/resolve.ts through each law's `resolve`); tests and tools may build them directly.
 */
import type { Mat3, Vec3 } from '../math/mat3';

/**
 * Gains: explicit stiffness and damping (their meaning per law is in its definition's
 * `gains`), or a small-error bandwidth ω_n and damping ratio ζ the law turns into gains for the
 * design inertia (gains.ts).
 */
export type GainSetting =
  | { form: 'explicit'; stiffness: number; /** Scalar, or a symmetric positive definite 3×3 (column-major). */ damping: number | Mat3 }
  | { form: 'bandwidth'; bandwidthRadPerS: number; dampingRatio: number };

/** The parameters each law adds, keyed by its `law` id (the scenario file's value). */
export type LawParams =
  | { law: 'quaternion-pd' }
  | { law: 'sign-switch' }
  | {
      law: 'eigenaxis';
      /** Slew-rate limit ω_max, rad/s. */
      maxRateRadPerS: number;
    }
  | {
      law: 'hysteretic';
      /** Hysteresis δ on h·η (dimensionless): flow while h·η ≥ −δ, jump when h·η ≤ −δ. */
      hysteresis: number;
    }
  | {
      law: 'synergistic';
      /** Eigenvalues λ of A in Φ(R) = tr(A(I − R)), distinct and positive. */
      potentialWeights: Vec3;
      /** Unit eigenvectors of A as columns (column-major). */
      potentialAxes: Mat3;
      /** Warp gain k in θ(R) = kΦ(R), rad per unit potential. */
      warpGain: number;
      /** Unit warp directions u_q, one member of the family each. */
      warpDirections: Vec3[];
      /** Jump threshold δ on the synergy gap μ = V_q − min_p V_p (potential units): jump when μ ≥ δ. */
      gapThreshold: number;
    }
  | {
      /** Smooth pointing-only PD on the sphere (control/sphere/laws.ts ReducedPd). */
      law: 'pointing-pd';
    }
  | {
      /** Synergistic pointing-only law on the sphere (control/sphere/laws.ts ReducedSynergistic). */
      law: 'pointing-synergistic';
      /** Warp gain k in θ(y) = k·V(y), rad per unit of V = 1 − cos φ (the warp is a diffeomorphism of S² for k < 1). */
      warpGain: number;
      /** Warp directions ⊥ the pointed axis, as azimuths about it, rad (one member each; only their differences matter). */
      warpAzimuthsRad: number[];
      /** Jump threshold δ on the synergy gap μ = V_q − min_p V_p (units of V): jump when μ ≥ δ. */
      gapThreshold: number;
    };

export type LawId = LawParams['law'];

export interface ControllerCommon {
  label: string;
  gains: GainSetting;
  /** Fixed logic value at the start (h = ±1, or a member index 1..M); 0 or absent: chosen from the start state. */
  initialLogic?: number;
  /** Synergistic only: build even when the certificate refuses (its refusal comes back as warnings). */
  requireCertificate?: boolean;
}

export type ControllerParams = ControllerCommon & LawParams;
