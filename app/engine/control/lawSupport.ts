/**
 * Small pieces the law definitions share: gains from a GainSetting, the damping matrix, the
 * bandwidth-against-sample-rate check and the generic gain read-out.
 */
import type { Issue } from '../errors';
import type { Mat3 } from '../math/mat3';
import { m3Create } from '../math/mat3';
import type { FileGains } from './fileBase';
import { gainsFromBandwidth } from './gains';
import { MILLI_PER_SI } from '../units';
import type { GainSetting } from './params';

/** A scalar as a diagonal 3×3 (column-major); a matrix passes through. */
export function dampingMatrix(d: number | Mat3): Mat3 {
  if (typeof d !== 'number') return d;
  const M = m3Create();
  M[0] = M[4] = M[8] = d;
  return M;
}

/** k_p and K_d of the quaternion laws (PD, sign switch, hysteretic) for the design inertia. */
export function quaternionGains(g: GainSetting, Jperp: Mat3): { kp: number; Kd: Mat3 } {
  if (g.form === 'explicit') return { kp: g.stiffness, Kd: dampingMatrix(g.damping) };
  const b = gainsFromBandwidth(Jperp, g.bandwidthRadPerS, g.dampingRatio);
  return { kp: b.kp, Kd: dampingMatrix(b.kd) };
}

/** The file's gains → a GainSetting (kp, kd are the law's stiffness and damping). */
export function resolveGains(g: FileGains): GainSetting {
  return 'kp' in g
    ? { form: 'explicit', stiffness: g.kp, damping: g.kd }
    : { form: 'bandwidth', bandwidthRadPerS: g.bandwidthRadPerS, dampingRatio: g.dampingRatio };
}

/** A GainSetting → the file's gains (the inverse of resolveGains; a matrix damping has no file form). */
export function gainsToFile(g: GainSetting): FileGains {
  if (g.form === 'bandwidth') return { bandwidthRadPerS: g.bandwidthRadPerS, dampingRatio: g.dampingRatio };
  const kd = typeof g.damping === 'number' ? g.damping : g.damping[0]!;
  return { kp: g.stiffness, kd };
}

/** Scalar view of a damping setting for read-outs. */
export function dampingScalar(d: number | Mat3): number {
  return typeof d === 'number' ? d : d[0]!;
}

/**
 * A bandwidth above a tenth of the control rate makes the sampled loop differ from the continuous
 * design (common practice, no source): a warning on the gains.
 */
export function checkBandwidthAgainstRate(gains: FileGains, controlRateHz: number | null, path: string, warnings: Issue[]): void {
  if (!('bandwidthRadPerS' in gains) || controlRateHz === null || !(controlRateHz > 0)) return;
  const nyquistFraction = gains.bandwidthRadPerS / (2 * Math.PI * controlRateHz);
  if (nyquistFraction > 0.1)
    warnings.push({
      path: `${path}.gains.bandwidthRadPerS`,
      rule: 'sample-rate',
      message: `the bandwidth ${gains.bandwidthRadPerS} rad/s is more than a tenth of the ${controlRateHz} Hz control rate; sampled behaviour will differ from the continuous design`,
    });
}

/** "asks N mN·m at a 90° error" for the quaternion laws. */
export function quaternionGainNote(g: GainSetting, Jperp: Mat3): string {
  if (g.form === 'bandwidth') {
    const b = gainsFromBandwidth(Jperp, g.bandwidthRadPerS, g.dampingRatio);
    return `k_p = ${b.kp.toPrecision(3)} N·m, k_d = ${b.kd.toPrecision(3)} N·m·s; asks ${(b.torqueAtErrorNm * MILLI_PER_SI).toPrecision(3)} mN·m at a 90° error`;
  }
  return `asks ${(g.stiffness * Math.SQRT1_2 * MILLI_PER_SI).toPrecision(3)} mN·m at a 90° error (k_p sin 45°)`;
}
