/**
 * Orbit bands on every time plot: each planned window in which a target tracks a ground site or
 * station (from tracking start to the end of its hold, labelled with the site's name) and each
 * eclipse (penumbra entry to exit), from the engine's orbit output. Scenarios without an orbit
 * have none. Pure data and arithmetic, no DOM: chart.ts draws them with `bandPixels`.
 */
import type { PipelineOutput } from '../../engine/pipeline/types';

export interface WindowBand {
  t0: number;
  t1: number;
  kind: 'window' | 'eclipse';
  /** Site or station name (windows), 'eclipse' (eclipses). */
  label: string;
}

export const WINDOW_BAND_FILL = 'rgba(39, 134, 74, 0.13)';
export const WINDOW_BAND_TEXT = '#1f6b3b';
export const ECLIPSE_BAND_FILL = 'rgba(52, 60, 76, 0.12)';
export const ECLIPSE_BAND_TEXT = '#3d4654';

/** The shared empty list (plots compare band lists by identity). */
export const NO_BANDS: readonly WindowBand[] = Object.freeze([]);

/** Planned site/station windows and eclipses of an output, in time order; none without an orbit. */
export function windowBands(out: Pick<PipelineOutput, 'orbit'>): readonly WindowBand[] {
  const o = out.orbit;
  if (!o) return NO_BANDS;
  const bands: WindowBand[] = [];
  for (const w of o.windows) {
    if (w.siteLabel === null) continue;
    if (!(w.holdEndS > w.trackStartS)) continue;
    bands.push({ t0: w.trackStartS, t1: w.holdEndS, kind: 'window', label: w.siteLabel });
  }
  for (const e of o.eclipses) if (e.endS > e.startS) bands.push({ t0: e.startS, t1: e.endS, kind: 'eclipse', label: 'eclipse' });
  return bands.sort((a, b) => a.t0 - b.t0 || a.t1 - b.t1);
}

/**
 * Pixel span [x0, x1] of the time interval [t0, t1] on a linear x axis showing [xMin, xMax] over
 * [left, left + width] (the affine map uPlot's valToPos uses for a linear scale), clipped to the
 * plot area; null when the interval lies outside the view or the scale is degenerate.
 */
export function bandPixels(
  t0: number,
  t1: number,
  xMin: number,
  xMax: number,
  left: number,
  width: number,
): { x0: number; x1: number } | null {
  if (!(xMax > xMin) || !(width > 0) || !(t1 >= t0) || t1 < xMin || t0 > xMax) return null;
  const k = width / (xMax - xMin);
  const x0 = left + (Math.max(t0, xMin) - xMin) * k;
  const x1 = left + (Math.min(t1, xMax) - xMin) * k;
  return { x0, x1 };
}
