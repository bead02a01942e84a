/**
 * What the sky view draws at the playback time (the clock the 3D view and the plots share,
 * app/ui/playback/clock.ts), over the fixed scene of skyModel.ts:
 * - the chosen body axis at time t: the shown run's attitude slerped between the trace samples
 *   around t (Shoemake, "Animating rotation with quaternion curves", SIGGRAPH 1985, the
 *   interpolation the 3D view uses too), turned into the inertial frame (qInertialFromBody);
 * - the cones against the Sun, Moon, Earth centre / limb and ground stations on that axis, aimed at
 *   time t by the same function the 3D view uses (app/ui/view/movingCones.ts, from
 *   PipelineOutput.orbitView; without an orbit the Sun and Moon cones from the epoch, geocentric),
 *   drawn as small circles;
 * - the Sun and the Moon at time t: from the spacecraft (orbitView) on orbit scenarios, geocentric
 *   (engine orbit/sky.ts) otherwise.
 * Called once per frame in which the time moved; the allocations are a few small arrays per cone.
 */
import { qRotate, qSlerp } from '../../engine/math/quaternion';
import { createOrbitViewPoint, orbitViewAt } from '../../engine/orbit/viewSamples';
import { moonDirectionEme2000, sunDirectionEme2000 } from '../../engine/orbit/sky';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { parseUtcIso } from '../../engine/time/iso';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../engine/units';
import { movingCone } from '../view/movingCones';
import { sampleAt } from '../view/viewRuns';
import { angleBetween, raDecOf, skyPieces, smallCircle, type SkyCone, type SkyMark } from './skyModel';

export interface SkyNow {
  /** Playback time, s from the plan start. */
  t: number;
  /** The chosen body axis at t (null without a run). */
  axis: SkyMark | null;
  /** Cones against moving directions on the chosen axis, aimed at t. */
  cones: SkyCone[];
  sun: SkyMark | null;
  moon: SkyMark | null;
}

const qa = new Float64Array(4),
  qb = new Float64Array(4),
  qt = new Float64Array(4);
const v = new Float64Array(3);
const point = createOrbitViewPoint();

function mark(label: string, d: ArrayLike<number>): SkyMark {
  const { raRad, decRad } = raDecOf(d);
  return { label, raDeg: raRad * DEG_PER_RAD, decDeg: decRad * DEG_PER_RAD };
}

/**
 * Inertial direction (unit, into `out`) of body axis `bodyAxis` (unit) at time `time` on a trace
 * (t: sample times, q: 4 per sample, n samples), slerped between the samples around it; clamped
 * to the first and last sample. Returns out, or null for an empty trace.
 */
export function bodyAxisAt(
  out: Float64Array,
  t: ArrayLike<number>,
  q: ArrayLike<number>,
  n: number,
  bodyAxis: ArrayLike<number>,
  time: number,
): Float64Array | null {
  if (n <= 0) return null;
  const i = sampleAt(t, n, time);
  const j = Math.min(i + 1, n - 1);
  const span = t[j]! - t[i]!;
  const alpha = span > 0 ? Math.min(1, Math.max(0, (time - t[i]!) / span)) : 0;
  for (let k = 0; k < 4; k++) {
    qa[k] = q[4 * i + k]!;
    qb[k] = q[4 * j + k]!;
  }
  qSlerp(qt, qa, qb, alpha);
  return qRotate(out, qt, bodyAxis);
}

/** File constraints whose direction moves, on the chosen body axis, as circles at time t (movingCones.ts says which can be aimed). */
export function movingSkyCones(out: PipelineOutput, bodyAxis: ArrayLike<number>, time: number, points = 180): SkyCone[] {
  const info = out.constraints ?? [];
  const cones: SkyCone[] = [];
  (out.scenario.file.constraints ?? []).forEach((c, j) => {
    if (c.direction.kind === 'fixed' || angleBetween(c.bodyAxis, bodyAxis) > 1e-9) return;
    const m = movingCone(out, c, info[out.keepOut.length + j]?.halfAngleRad ?? c.halfAngleDeg * RAD_PER_DEG, time);
    if (!m) return;
    cones.push({ label: c.name, kind: c.kind, pieces: skyPieces(smallCircle(m.dir, Math.min(Math.PI, m.halfAngleRad), points), true) });
  });
  return cones;
}

/** Everything drawn at the playback time for run `runKey` and body axis `bodyAxis` (unit). */
export function skyNow(out: PipelineOutput, runKey: string | null, bodyAxis: ArrayLike<number>, time: number): SkyNow {
  const run = out.runs.find((r) => r.key === runKey) ?? null;
  const tr = run?.trace ?? null;
  const axis = tr && bodyAxisAt(v, tr.t, tr.q, tr.n, bodyAxis, time) ? mark('now', v) : null;
  let sun: SkyMark | null = null,
    moon: SkyMark | null = null;
  if (out.orbitView) {
    const p = orbitViewAt(point, out.orbitView, Math.min(Math.max(time, 0), out.orbitView.endS));
    if (p.valid) {
      sun = mark('Sun', p.sunDir);
      moon = mark('Moon', p.moonDir);
    }
  } else if (!out.orbit) {
    const ep = parseUtcIso(out.scenario.epochUtc);
    if (ep.ok) {
      sunDirectionEme2000(v, ep.value.taiS + time);
      sun = mark('Sun', v);
      moonDirectionEme2000(v, ep.value.taiS + time);
      moon = mark('Moon', v);
    }
  }
  return { t: time, axis, cones: movingSkyCones(out, bodyAxis, time), sun, moon };
}
