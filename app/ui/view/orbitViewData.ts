/**
 * Engine results → the orbit view's input (app/view3d/orbitScene.ts): the sampled geometry the
 * pipeline made once per run set (PipelineOutput.orbitView), the sites in Earth-fixed axes (WGS-84,
 * engine orbit/sites.ts) and, from the planned windows, when the current segment points at a site.
 */
import { siteEcefM } from '../../engine/orbit/viewSamples';
import type { PipelineOutput } from '../../engine/pipeline/types';
import type { OrbitViewData, OrbitViewLink } from '../../view3d/orbitScene';

export function toOrbitViewData(out: PipelineOutput | null): OrbitViewData | null {
  const samples = out?.orbitView;
  const orbit = out?.orbit;
  if (!out || !samples || !orbit) return null;
  const sites = orbit.sites.map((s) => ({
    label: s.label,
    ecefM: siteEcefM(new Float64Array(3), s.latitudeRad, s.longitudeRad, s.heightM),
  }));
  const links: OrbitViewLink[] = [];
  for (const w of orbit.windows) {
    const site = w.siteId === null ? -1 : orbit.sites.findIndex((s) => s.id === w.siteId);
    if (site < 0) continue;
    links.push({ t0: w.slewStartS, t1: w.holdEndS, trackStartS: w.trackStartS, site, target: w.label });
  }
  return { samples, sites, links, vehicleName: out.vehicle.name || 'spacecraft' };
}
