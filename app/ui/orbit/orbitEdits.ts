/**
 * What the Orbit panel's buttons write (pure, so tests can validate it): the orbit block a new
 * orbit starts from (invented elements), a new site, and the orbit size given the other way
 * (mean motion ↔ semi-major axis through the engine's own Kepler conversion with SGP4's μ,
 * orbit/propagate.ts, so the orbit does not change).
 */
import { meanMotionRevPerDayFromSemiMajorAxis, semiMajorAxisKmFromMeanMotion } from '../../engine/orbit/propagate';
import { DEFAULT_HORIZON_S } from '../../engine/scenario/orbitSchema';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

/** Invented starting elements: near-circular, 97.4° (common practice for a small imager, no source). */
export function starterElements(epochUtc: unknown): Obj {
  return {
    name: 'New orbit (invented)',
    epochUtc: typeof epochUtc === 'string' ? epochUtc : '2030-01-01T00:00:00Z',
    meanMotionRevPerDay: 15.2,
    eccentricity: 0.001,
    inclinationDeg: 97.4,
    raanDeg: 0,
    argPerigeeDeg: 90,
    meanAnomalyDeg: 0,
  };
}

export function starterOrbit(epochUtc: unknown): Obj {
  return { meanElements: starterElements(epochUtc), sites: [], horizonS: DEFAULT_HORIZON_S };
}

/** A new site with an id no other site has. */
export function newSite(list: readonly unknown[]): Obj {
  const ids = new Set(list.map((s) => (isObj(s) ? s.id : undefined)));
  let n = list.length + 1;
  while (ids.has(`site-${n}`)) n++;
  return { id: `site-${n}`, label: `Site ${n} (invented)`, latitudeDeg: 0, longitudeDeg: 0, heightM: 0, elevationMaskDeg: 10 };
}

export type SizeKey = 'meanMotionRevPerDay' | 'semiMajorAxisKm';

/** The value of the size under `to` for the elements `me` (a start value when the current one is unusable). */
export function sizeAs(me: Obj, to: SizeKey): number {
  const from: SizeKey = to === 'semiMajorAxisKm' ? 'meanMotionRevPerDay' : 'semiMajorAxisKm';
  const cur = me[from];
  if (typeof cur !== 'number' || !(cur > 0)) return to === 'semiMajorAxisKm' ? 6900 : 15;
  return to === 'semiMajorAxisKm'
    ? Number(semiMajorAxisKmFromMeanMotion(cur).toPrecision(9))
    : Number(meanMotionRevPerDayFromSemiMajorAxis(cur).toPrecision(11));
}
