/**
 * Geometry for the study view, kept free of React and the DOM so it can be tested alone.
 *
 * Outcome map: each case's initial error rotation axis (a unit vector) is drawn on two discs,
 * the hemispheres z ≥ 0 and z < 0, in the Lambert azimuthal equal-area projection about ±z:
 * a point at angular distance c from the disc's pole lands at radius ρ = 2 sin(c/2) (J. P.
 * Snyder, "Map Projections — A Working Manual", USGS Professional Paper 1395, 1987, from
 * memory), scaled so the hemisphere's rim (c = 90°) is radius 1. Equal area means a uniform
 * spread of axes looks uniform, so clusters of failures are real.
 */

/** Disc position of a unit axis: hemisphere (+1 for z ≥ 0) and x, y in the unit disc. */
export function equalAreaDisc(axis: readonly number[]): { hemisphere: 1 | -1; x: number; y: number } {
  const n = Math.hypot(axis[0], axis[1], axis[2]) || 1;
  const x = axis[0] / n, y = axis[1] / n, z = axis[2] / n;
  const hemisphere: 1 | -1 = z >= 0 ? 1 : -1;
  // Angular distance from the disc's pole (+z or −z): cos c = |z|.
  const c = Math.acos(Math.min(1, Math.abs(z)));
  const rho = (2 * Math.sin(c / 2)) / Math.SQRT2; // 2 sin(45°) = √2 at the rim → 1
  const h = Math.hypot(x, y);
  if (h < 1e-15) return { hemisphere, x: 0, y: 0 };
  // Seen from outside the sphere on each side: mirror x for the lower disc.
  return { hemisphere, x: (hemisphere * rho * x) / h, y: (rho * y) / h };
}

export const OUTCOME_COLOURS: Record<string, string> = {
  settled: '#1e7a45',
  chattered: '#c77c00',
  unwound: '#6a3fb0',
  unsettled: '#b3261e',
  failed: '#000000',
  unflyable: '#8a929c',
};

export const OUTCOME_ORDER = ['settled', 'chattered', 'unwound', 'unsettled', 'failed', 'unflyable'] as const;

/** Bars of a histogram in a box of width w and height h (counts scaled to the tallest bar). */
export function histogramBars(counts: readonly number[], overflow: number, w: number, h: number): { x: number; y: number; width: number; height: number; count: number }[] {
  const all = [...counts, overflow];
  const max = Math.max(1, ...all);
  const bw = w / all.length;
  return all.map((c, k) => {
    const height = (h * c) / max;
    return { x: k * bw, y: h - height, width: Math.max(1, bw - 1), height, count: c };
  });
}

/** Short label of a histogram edge. */
export function edgeLabel(v: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 100) return v.toFixed(0);
  if (a >= 1) return String(Number(v.toPrecision(3)));
  return String(Number(v.toPrecision(2)));
}
