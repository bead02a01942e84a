/**
 * The view's look: colours, sizes and thresholds, in one place. Our own choices (common
 * practice, no source): red/green/blue for x/y/z axes, a dark neutral background.
 */
import type { LogicKind } from './types';

export const COLORS = {
  background: 0x0f1318,
  insetBackground: 0x161c24,
  axisX: 0xe5534b,
  axisY: 0x57ab5a,
  axisZ: 0x539bf5,
  sphere: 0x3a4656,
  greatCircle: 0x9aa7b4,
  jumpMarker: 0xffffff,
  keepOut: 0xd6455d,
  keepOutEntry: 0xff5c7a,
  /** A constraint cone whose margin is not negative at the current time. */
  constraintClear: 0x3fb68b,
  reference: 0xc0a0ff,
  envelope: 0x6b8fb3,
  envelopeEdge: 0x8fb0cf,
  wheelAxis: 0x56606b,
  label: '#d8dee6',
} as const;

/** Wheel arrows in the momentum inset; cycles for more than six wheels. */
export const WHEEL_COLORS = [0x4fc1e9, 0xa0d468, 0xed5565, 0xffce54, 0xac92ec, 0xf7a072] as const;

/** Trail colour for the smooth laws (no logic variable). */
const LOGIC_NONE = 0xc9d1d9;
/** Hysteretic sign logic: h = +1 and h = −1. */
export const LOGIC_SIGN_POS = 0x3fb8af;
export const LOGIC_SIGN_NEG = 0xe06c9f;
/** Synergistic index q = 1, 2, …; cycles past six. */
export const LOGIC_INDEX = [0x5dade2, 0xf5b041, 0x58d68d, 0xec7063, 0xaf7ac5, 0xf4d03f] as const;

/** Hex colour of a logic value under a given kind. */
export function logicColorHex(kind: LogicKind, value: number): number {
  if (kind === 'sign') return value < 0 ? LOGIC_SIGN_NEG : LOGIC_SIGN_POS;
  if (kind === 'index') {
    const m = LOGIC_INDEX.length;
    const k = Math.round(value) - 1;
    return Number.isFinite(k) ? LOGIC_INDEX[((k % m) + m) % m]! : LOGIC_NONE;
  }
  return LOGIC_NONE;
}

/**
 * Momentum warning levels for the total wheel momentum H, by the fraction
 * f = |H| / capacity(H/|H|) of the envelope in H's own direction: below 0.7 normal, from 0.7
 * amber, from 0.9 red (thresholds: common practice for margin displays, no source).
 */
export const MOMENTUM_AMBER_FRACTION = 0.7;
export const MOMENTUM_RED_FRACTION = 0.9;
export const MOMENTUM_COLORS = { normal: 0xf2f4f7, amber: 0xf0a020, red: 0xf03a3a } as const;

export type MomentumLevel = 'normal' | 'amber' | 'red';

export function momentumLevel(fraction: number): MomentumLevel {
  if (fraction >= MOMENTUM_RED_FRACTION) return 'red';
  if (fraction >= MOMENTUM_AMBER_FRACTION) return 'amber';
  return 'normal'; // includes NaN (no momentum, no capacity)
}

/** Scene sizes (scene units; the bus body is about 0.5 across). */
export const SIZES = {
  sphereRadius: 1.5,
  inertialTriad: 1.95,
  bodyTriad: 1.0,
  targetTriad: 1.2,
  referenceTriad: 1.1,
  jumpMarker: 0.028,
  keepOutEntryMarker: 0.035,
  /** Momentum inset: the envelope's farthest vertex is drawn at this radius. */
  insetEnvelopeRadius: 1.0,
  insetTriad: 1.25,
  /** Inset square side as a fraction of its viewport's smaller side. */
  insetFraction: 0.36,
  /** Label height on screen, as a fraction of the viewport height. */
  labelHeight: 0.045,
  /** Labels in the (smaller) momentum inset. */
  insetLabelHeight: 0.075,
  /** The bus model is drawn this many scene units per model unit. */
  busScale: 1.5,
} as const;

/** Main and inset cameras: vertical field of view (deg) and the default viewing position. */
export const CAMERA_FOV_DEG = 38;
export const CAMERA_HOME = [5.3, 4.0, 3.0] as const;
