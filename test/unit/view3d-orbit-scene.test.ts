/**
 * The renderer-free orbit scene (app/view3d/orbitScene.ts) posed from the engine's view samples of
 * the bundled invented orbit example, against satellite.js (npm reference library): the spacecraft
 * marker at the sgp4 position in Earth radii, and the line of sight ending on the tracked site
 * turned by gstime + ecfToEci; both from TEME to EME2000 with the engine's frame matrix (checked in
 * test/reference/orbit-frames.test.ts). Also: the marker dims in the umbra, and while the current
 * segment tracks no site (the example's first target tracks the Sun) there is no line of sight.
 */
import { readFileSync } from 'node:fs';
import { ecfToEci, gstime, sgp4, twoline2satrec } from 'satellite.js';
import { describe, expect, it } from 'vitest';
import { temeToEme2000Matrix } from '../../app/engine/orbit/frames';
import { geodeticToEcef, WGS84_A_M } from '../../app/engine/orbit/sites';
import { UMBRA } from '../../app/engine/orbit/sky';
import { orbitViewSamples } from '../../app/engine/orbit/viewSamples';
import { orbitOutput } from '../../app/engine/pipeline/orbit';
import { preparePipeline } from '../../app/engine/pipeline/run';
import { toOrbitViewData } from '../../app/ui/view/orbitViewData';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { OrbitScene } from '../../app/view3d/orbitScene';
import type { BufferAttribute, Mesh, MeshBasicMaterial } from 'three';

const file = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as {
  epochUtc: string;
  orbit: { tle: string[] };
};
const prep = preparePipeline(file);
if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
const p = prep.value;
const orbit = orbitOutput(p.scenario, p.orbit!, p.plan.tracking ?? null);
const out = { orbit, orbitView: orbitViewSamples(p.orbit!.ephemeris), vehicle: { name: 'Lumen-6' } } as unknown as PipelineOutput;
const data = toOrbitViewData(out)!;
const scene = new OrbitScene(null);
scene.setData(data);

const epochMs = Date.parse(file.epochUtc);
const satrec = twoline2satrec(file.orbit.tle[1]!, file.orbit.tle[2]!);
const elementEpochMs = Date.UTC(2000 + satrec.epochyr, 0, 1) + (satrec.epochdays - 1) * 86_400_000;
function toEme(v: number[], t: number): number[] {
  const m = temeToEme2000Matrix(new Float64Array(9), p.orbit!.ephemeris.epochTaiS + t);
  return [0, 1, 2].map((i) => m[i]! * v[0]! + m[3 + i]! * v[1]! + m[6 + i]! * v[2]!);
}

describe('orbit scene posed at a playback time', () => {
  it('the spacecraft marker sits at the sgp4 position (Earth radii) to 1e-8 R (6 cm)', () => {
    for (const t of [0, 777.7, 5000]) {
      scene.setTime(t);
      const pv = sgp4(satrec, (epochMs + 1000 * t - elementEpochMs) / 60_000);
      if (!pv || typeof pv.position === 'boolean') throw new Error('sgp4');
      const r = toEme([pv.position.x * 1000, pv.position.y * 1000, pv.position.z * 1000], t).map((x) => x / WGS84_A_M);
      const c = scene.craftPosition();
      expect(Math.hypot(c.x - r[0]!, c.y - r[1]!, c.z - r[2]!)).toBeLessThan(1e-8);
    }
  });

  it('in a planned site window the line of sight ends on that site as satellite.js turns it (1e-6 R)', () => {
    const w = orbit.windows.find((x) => x.siteId === 'aldermoor')!;
    const t = 0.5 * (w.trackStartS + w.holdEndS);
    scene.setTime(t);
    expect(scene.state.linkSite).toBe(w.siteLabel);
    expect(scene.state.tracking).toBe(true);
    const los = scene.scene.getObjectByName('line-of-sight') as Mesh;
    expect(los.visible).toBe(true);
    const pos = los.geometry.getAttribute('position') as BufferAttribute;
    const site = orbit.sites.find((s) => s.id === 'aldermoor')!;
    const ecef = geodeticToEcef(new Float64Array(3), site.latitudeRad, site.longitudeRad, site.heightM);
    const teme = ecfToEci({ x: ecef[0]! / 1000, y: ecef[1]! / 1000, z: ecef[2]! / 1000 }, gstime(new Date(epochMs + 1000 * t)));
    const s = toEme([teme.x * 1000, teme.y * 1000, teme.z * 1000], t).map((x) => x / WGS84_A_M);
    // Float32 vertex positions: ~1e-7 relative.
    expect(Math.hypot(pos.getX(1) - s[0]!, pos.getY(1) - s[1]!, pos.getZ(1) - s[2]!)).toBeLessThan(1e-6);
    // Before the slew arrives the line is drawn too (the segment already points at the site), not tracking.
    scene.setTime(w.slewStartS + 1);
    expect(scene.state.linkSite).toBe(w.siteLabel);
    expect(scene.state.tracking).toBe(false);
  });

  it('in the umbra the marker is dimmer; with no site tracked there is no line of sight', () => {
    scene.setTime(0);
    const lit = (scene.scene.getObjectByName('spacecraft') as Mesh).material as MeshBasicMaterial;
    const litSum = lit.color.r + lit.color.g + lit.color.b;
    const e = orbit.eclipses[0]!;
    scene.setTime(0.5 * (e.startS + e.endS));
    expect(scene.state.shadow).toBe(UMBRA);
    expect(lit.color.r + lit.color.g + lit.color.b).toBeLessThan(litSum);
    scene.setTime(0);
    expect(orbit.windows[0]!.siteId).toBeNull();
    expect(scene.state.linkSite).toBeNull();
    expect(scene.scene.getObjectByName('line-of-sight')!.visible).toBe(false);
  });
});
