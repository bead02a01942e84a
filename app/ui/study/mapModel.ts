/**
 * The outcome map's data, without three.js: every case as a point of the rotation-vector ball,
 * coloured by one controller's outcome.
 *
 * A case's initial error rotation q_e = q_target* ⊗ q0 (shortest rotation, target axes; the
 * engine's MapPoint) is drawn at axis · θ/180°: the centre is "already on target", the unit
 * sphere is a 180° error (the reversal, where smooth laws must pick a way round), and a point's
 * direction is the error rotation axis. Points whose error quaternion as flown has η₀ < 0 (the
 * start is on the far quaternion hemisphere) are drawn hollow: that is where a smooth
 * quaternion law unwinds.
 *
 * Colours: by settle time (settled runs on a blue-to-orange ramp from the fastest to the slowest; runs
 * that did not settle in category colours), or by outcome category.
 */
import type { MapPoint } from '../../engine/study';

export type MapColourMode = 'settle' | 'outcome';

export const OUTCOMES = ['settled', 'unwound', 'chattered', 'unsettled', 'failed', 'unflyable'] as const;
export type Outcome = (typeof OUTCOMES)[number];

/** Category colours (sRGB hex), chosen to stay apart from the settle-time ramp's blues and yellows. */
export const OUTCOME_COLOURS: Record<Outcome, string> = {
  settled: '#3fae6a',
  unwound: '#ff9f1a',
  chattered: '#c77dff',
  unsettled: '#ff3b30',
  failed: '#ffffff',
  unflyable: '#7d8794',
};

export const OUTCOME_TEXT: Record<Outcome, string> = {
  settled: 'settled',
  unwound: 'settled, unwound',
  chattered: 'settled, chattered',
  unsettled: 'not settled',
  failed: 'failed',
  unflyable: 'unflyable vehicle',
};

/**
 * Ramp stops for settle time (fast → slow), sRGB 0–255. Our own choice: every stop stays bright on
 * the map's dark background and away from the category red, white and grey: sky blue, green,
 * yellow, orange.
 */
const RAMP: readonly [number, number, number][] = [
  [80, 196, 255],
  [100, 226, 170],
  [214, 236, 96],
  [255, 206, 70],
  [255, 150, 40],
];

/** Settle-time ramp at f ∈ [0, 1] (clamped), sRGB components in [0, 1]. */
export function settleRamp(f: number): [number, number, number] {
  const x = Math.min(1, Math.max(0, Number.isFinite(f) ? f : 1)) * (RAMP.length - 1);
  const k = Math.min(RAMP.length - 2, Math.floor(x));
  const t = x - k;
  const a = RAMP[k]!;
  const b = RAMP[k + 1]!;
  return [(a[0] + t * (b[0] - a[0])) / 255, (a[1] + t * (b[1] - a[1])) / 255, (a[2] + t * (b[2] - a[2])) / 255];
}

export function hexToRgb(hex: string): [number, number, number] {
  const n = parseInt(hex.slice(1), 16);
  return [((n >> 16) & 255) / 255, ((n >> 8) & 255) / 255, (n & 255) / 255];
}

export function rgbCss(c: readonly number[]): string {
  return `rgb(${Math.round(c[0]! * 255)}, ${Math.round(c[1]! * 255)}, ${Math.round(c[2]! * 255)})`;
}

export interface MapGeometry {
  count: number;
  /** Ball coordinates, 3 per point (x, y, z of axis · θ/180°). */
  positions: Float32Array;
  /** sRGB colours in [0, 1], 3 per point. */
  colours: Float32Array;
  /** 1 where η₀ < 0 (drawn hollow). */
  far: Uint8Array;
  /** Case index of each point. */
  caseIndex: Int32Array;
  outcome: Outcome[];
  settleTimeS: (number | null)[];
  angleDeg: Float64Array;
  /** Settle-time colour scale, s: the fastest and the slowest settled run (max ≥ min + 1 s). */
  settleMinS: number;
  settleMaxS: number;
  counts: Record<Outcome, number>;
}

function asOutcome(s: string | undefined): Outcome {
  return (OUTCOMES as readonly string[]).includes(s ?? '') ? (s as Outcome) : 'failed';
}

/** A settled run (of any flavour): it has a settle time to colour by. */
const settledKind = (o: Outcome) => o === 'settled' || o === 'unwound' || o === 'chattered';

export function mapGeometry(points: readonly MapPoint[], controller: number, mode: MapColourMode): MapGeometry {
  const n = points.length;
  const positions = new Float32Array(3 * n);
  const colours = new Float32Array(3 * n);
  const far = new Uint8Array(n);
  const caseIndex = new Int32Array(n);
  const angleDeg = new Float64Array(n);
  const outcome: Outcome[] = [];
  const settleTimeS: (number | null)[] = [];
  const counts = Object.fromEntries(OUTCOMES.map((o) => [o, 0])) as Record<Outcome, number>;
  let settleMinS = Infinity;
  let settleMaxS = -Infinity;
  for (const p of points) {
    const o = asOutcome(p.outcome[controller]);
    const t = p.settleTimeS[controller] ?? null;
    if (settledKind(o) && t !== null && Number.isFinite(t)) {
      settleMinS = Math.min(settleMinS, t);
      settleMaxS = Math.max(settleMaxS, t);
    }
  }
  if (!Number.isFinite(settleMinS)) settleMinS = settleMaxS = 0;
  // A scale at least 1 s wide, so near-equal settle times do not look wildly different.
  if (settleMaxS - settleMinS < 1) settleMaxS = settleMinS + 1;
  points.forEach((p, i) => {
    const r = Math.min(1, Math.max(0, p.angleDeg / 180));
    positions[3 * i] = p.axis[0] * r;
    positions[3 * i + 1] = p.axis[1] * r;
    positions[3 * i + 2] = p.axis[2] * r;
    far[i] = p.eta0 < 0 ? 1 : 0;
    caseIndex[i] = p.index;
    angleDeg[i] = p.angleDeg;
    const o = asOutcome(p.outcome[controller]);
    const t = p.settleTimeS[controller] ?? null;
    outcome.push(o);
    settleTimeS.push(t);
    counts[o]++;
    const c =
      mode === 'settle' && settledKind(o) && t !== null
        ? settleRamp((t - settleMinS) / (settleMaxS - settleMinS))
        : hexToRgb(OUTCOME_COLOURS[o]);
    colours[3 * i] = c[0];
    colours[3 * i + 1] = c[1];
    colours[3 * i + 2] = c[2];
  });
  return { count: n, positions, colours, far, caseIndex, outcome, settleTimeS, angleDeg, settleMinS, settleMaxS, counts };
}
