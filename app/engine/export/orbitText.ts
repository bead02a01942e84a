/**
 * What the exports say about an orbit scenario (ScenarioSummary.orbit, pipeline/orbit.ts): the
 * inertial frame, the element set, the sites, each planned target with its kind and site, the
 * windows and the eclipses, as one-line texts for CSV header lines and AEM COMMENT lines
 * (CCSDS 504.0-B-2 allows COMMENT lines at the start of the header and of each metadata block).
 * Times are plan seconds and UTC labels with leap seconds counted (time/iso.ts).
 */
import type { OrbitExportInfo, PlannedWindow } from '../pipeline/orbit';
import { utcLabelFromTai } from '../time/iso';
import { DEG_PER_RAD } from '../units';

function utc(o: OrbitExportInfo, t: number): string {
  return `${utcLabelFromTai(o.epochTaiS + t, 3)}Z`;
}

/** One line naming a planned target: its kind, its site and its tracking interval. */
export function windowText(o: OrbitExportInfo, w: PlannedWindow): string {
  const site = w.siteId ? ` ${w.siteId} (${w.siteLabel ?? ''})` : '';
  const win =
    w.window === 'pass'
      ? `, pass window to ${w.passEndS?.toFixed(3)} s, max elevation ${((w.maxElevationRad ?? 0) * DEG_PER_RAD).toFixed(2)} deg`
      : w.window === 'time'
        ? ', time window'
        : '';
  return `target ${w.target + 1} "${w.label}": ${w.kind}${site}; slew from ${w.slewStartS.toFixed(3)} s; tracking ${w.trackStartS.toFixed(3)} s (${utc(o, w.trackStartS)}) to ${w.holdEndS.toFixed(3)} s (${utc(o, w.holdEndS)})${win}`;
}

/** Header lines of an orbit scenario's export. */
export function orbitHeaderLines(o: OrbitExportInfo): string[] {
  const out: string[] = [];
  out.push(`orbit: ${o.elementSetName}, element epoch ${o.elementEpochUtc}; SGP4 (satellite.js), TEME converted to ${o.inertialFrame}`);
  out.push(`reference frame: ${o.inertialFrame} (every attitude and direction in this file)`);
  for (const s of o.sites)
    out.push(
      `site ${s.id} (${s.label}): WGS-84 lat ${(s.latitudeRad * DEG_PER_RAD).toFixed(6)} deg, lon ${(s.longitudeRad * DEG_PER_RAD).toFixed(6)} deg, height ${s.heightM} m, mask ${(s.elevationMaskRad * DEG_PER_RAD).toFixed(2)} deg; passes: ${s.passes.length ? s.passes.map((p) => `${p.startS.toFixed(3)}-${p.endS.toFixed(3)} s`).join(', ') : 'none'}`,
    );
  for (const w of o.windows) out.push(windowText(o, w));
  out.push(
    `eclipses (conical shadow): ${o.eclipses.length ? o.eclipses.map((e) => `${e.startS.toFixed(3)}-${e.endS.toFixed(3)} s`).join(', ') : 'none'}`,
  );
  return out;
}
