/**
 * Directions of the constraints that move (Sun, Moon, Earth centre and limb, ground station) at a
 * playback time, from the orbit geometry the pipeline sampled once per run set
 * (PipelineOutput.orbitView, engine orbit/viewSamples.ts), the same definitions as the engine's
 * constraint directions (constraints/directions.ts): Sun and Moon from the spacecraft; Earth centre
 * −r/|r|; Earth limb the centre direction with the disc's angular radius asin(R⊕/|r|) added to the
 * half angle (the margin is measured to the nearest edge of the disc); ground station (site − r)
 * normalised with the site (WGS-84) turned with the Earth. Interpolation only: no allocation.
 *
 * Scenarios without an orbit have no samples, but the Sun and Moon directions are still defined by
 * the epoch: geocentric, from the engine's orbit/sky.ts at TAI = epoch + t, the functions the
 * engine's constraint check samples in that case (constraints/directions.ts; it interpolates
 * between samples SKY_STEP_S apart, within 0.1°). Earth and station cones need the orbit (the
 * engine refuses them without one), so none is drawn.
 */
import { createOrbitViewPoint, earthFixedPointAt, orbitViewAt, siteEcefM } from '../../engine/orbit/viewSamples';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { moonDirectionEme2000, sunDirectionEme2000 } from '../../engine/orbit/sky';
import { parseUtcIso } from '../../engine/time/iso';
import { RAD_PER_DEG } from '../../engine/units';

type FileConstraint = NonNullable<PipelineOutput['scenario']['file']['constraints']>[number];

export interface MovingCone {
  /** Unit direction, EME2000 (a fresh array: the view keeps it until the next rebuild). */
  dir: Float64Array;
  /** Half angle of the region to draw around dir, rad (the limb adds the Earth's angular radius). */
  halfAngleRad: number;
}

const point = createOrbitViewPoint();
const ecef = new Float64Array(3),
  site = new Float64Array(3);

// The last epoch parsed (one scenario is shown at a time): a frame does not parse it again.
let epochText = '';
let epochTai = NaN;

/** TAI seconds since J2000 of the output's epoch (NaN when it does not parse), as the engine's constraint check reads it. */
function epochTaiS(out: Pick<PipelineOutput, 'scenario'>): number {
  const text = out.scenario.epochUtc;
  if (text !== epochText) {
    const e = parseUtcIso(text, 'epochUtc');
    epochText = text;
    epochTai = e.ok ? e.value.taiS : NaN;
  }
  return epochTai;
}

/** Whether cones against direction `kind` can be aimed for this output: orbit samples, or the Sun and Moon by the epoch without an orbit. */
export function movingConeAvailable(
  out: Pick<PipelineOutput, 'scenario' | 'orbitView'>,
  kind: FileConstraint['direction']['kind'],
): boolean {
  if (kind === 'fixed') return false;
  if (out.orbitView) return true;
  return !out.scenario.file.orbit && (kind === 'sun' || kind === 'moon') && Number.isFinite(epochTaiS(out));
}

/** The cone of a moving-direction constraint at plan time t, or null (fixed direction, no orbit samples, or t outside them). */
export function movingCone(out: PipelineOutput, c: FileConstraint, halfAngleRad: number, t: number): MovingCone | null {
  const d = c.direction;
  const s = out.orbitView;
  if (d.kind === 'fixed') return null;
  if (!s) {
    // No orbit: the geocentric Sun and Moon by the epoch (an orbit scenario without samples draws none).
    if (!movingConeAvailable(out, d.kind)) return null;
    const dir = new Float64Array(3);
    const tai = epochTaiS(out) + Math.max(t, 0);
    if (d.kind === 'sun') sunDirectionEme2000(dir, tai);
    else moonDirectionEme2000(dir, tai);
    return { dir, halfAngleRad };
  }
  const p = orbitViewAt(point, s, Math.min(Math.max(t, 0), s.endS));
  if (!p.valid) return null;
  switch (d.kind) {
    case 'sun':
      return { dir: Float64Array.from(p.sunDir), halfAngleRad };
    case 'moon':
      return { dir: Float64Array.from(p.moonDir), halfAngleRad };
    case 'earth-centre':
      return { dir: Float64Array.from(p.earthDir), halfAngleRad };
    case 'earth-limb':
      return { dir: Float64Array.from(p.earthDir), halfAngleRad: halfAngleRad + p.earthAngularRadiusRad };
    case 'ground-station': {
      siteEcefM(ecef, d.latitudeDeg * RAD_PER_DEG, d.longitudeDeg * RAD_PER_DEG, d.altitudeM);
      earthFixedPointAt(site, p, ecef);
      const x = site[0]! - p.rM[0]!,
        y = site[1]! - p.rM[1]!,
        z = site[2]! - p.rM[2]!;
      const n = Math.hypot(x, y, z);
      return n > 0 ? { dir: Float64Array.of(x / n, y / n, z / n), halfAngleRad } : null;
    }
  }
}
