/**
 * Constraint library speed figures (no assertions): checking a 24 h, 10 Hz attitude history
 * against ten constraints, and a constrained slew around three cones at the default grid.
 * Run: node --import tsx test/bench/constraints.ts, or through run.ts.
 */
import { cpus, loadavg } from 'node:os';
import { checkAttitudeHistory } from '../../app/engine/constraints/check';
import { planConstrainedSlew, type ConstrainedSlewInput } from '../../app/engine/constraints/slew';
import type { AttitudeConstraint, SampledDirectionSource } from '../../app/engine/constraints/types';
import { cubeCapacity } from '../../app/engine/plan/limits';
import type { PlanLimits } from '../../app/engine/plan/types';

const D = Math.PI / 180;

function stats(ms: number[]): { min: number; median: number } {
  const s = [...ms].sort((a, b) => a - b);
  return { min: s[0]!, median: s[Math.floor(s.length / 2)]! };
}

/** An invented inertial direction that turns at `rate` rad/s about a tilted axis, sampled every `stepS`. */
function movingSource(
  spanS: number,
  stepS: number,
  rate: number,
  tiltRad: number,
  interpolation: SampledDirectionSource['interpolation'],
  radius?: number,
): SampledDirectionSource {
  const n = Math.floor(spanS / stepS) + 1;
  const t: number[] = [],
    d: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = rate * i * stepS;
    t.push(i * stepS);
    d.push(Math.cos(a), Math.sin(a) * Math.cos(tiltRad), Math.sin(a) * Math.sin(tiltRad));
  }
  return { kind: 'sampled', timesS: t, directions: d, interpolation, ...(radius !== undefined ? { angularRadiusRad: radius } : {}) };
}

/** 24 h at 10 Hz: an invented spacecraft turning once per 95 min orbit about +Y with a slow wobble. */
function dayHistory(): { timesS: Float64Array; qInertialFromBody: Float64Array } {
  const n = 864_000;
  const t = new Float64Array(n),
    q = new Float64Array(4 * n);
  const w = (2 * Math.PI) / 5700;
  for (let i = 0; i < n; i++) {
    const ti = i / 10;
    t[i] = ti;
    const a = 0.5 * w * ti,
      b = 0.5 * 0.2 * Math.sin(ti / 300);
    // q = rotY(w t) ⊗ rotX(0.2 sin(t/300))
    const ca = Math.cos(a),
      sa = Math.sin(a),
      cb = Math.cos(b),
      sb = Math.sin(b);
    q[4 * i] = ca * sb;
    q[4 * i + 1] = sa * cb;
    q[4 * i + 2] = -sa * sb;
    q[4 * i + 3] = ca * cb;
  }
  return { timesS: t, qInertialFromBody: q };
}

export function dayConstraints(): AttitudeConstraint[] {
  const span = 86_400;
  const sun = movingSource(span, 60, (2 * Math.PI) / (365.25 * 86_400), 23.4 * D, 'great-circle');
  const moon = movingSource(span, 60, (2 * Math.PI) / (27.3 * 86_400), 5 * D, 'linear');
  const earth = movingSource(span, 10, (2 * Math.PI) / 5700, 0, 'great-circle', 66 * D);
  const station = movingSource(span, 10, (2 * Math.PI) / 5700, 10 * D, 'linear');
  const star: AttitudeConstraint['source'] = { kind: 'fixed', direction: [0.2, -0.3, 0.93] };
  const st1 = [0, 0.5, 0.866],
    st2 = [0, -0.5, 0.866],
    cam = [0, 0, -1],
    ant = [1, 0, 0];
  const c = (
    name: string,
    kind: 'keep-out' | 'keep-in',
    bodyAxis: number[],
    half: number,
    source: AttitudeConstraint['source'],
  ): AttitudeConstraint => ({
    name,
    kind,
    bodyAxis,
    halfAngleRad: half * D,
    marginRad: 1 * D,
    source,
  });
  return [
    c('ST1 Sun', 'keep-out', st1, 30, sun),
    c('ST2 Sun', 'keep-out', st2, 30, sun),
    c('ST1 Moon', 'keep-out', st1, 15, moon),
    c('ST2 Moon', 'keep-out', st2, 15, moon),
    c('ST1 Earth limb', 'keep-out', st1, 20, earth),
    c('ST2 Earth limb', 'keep-out', st2, 20, earth),
    c('Camera Sun', 'keep-out', cam, 40, sun),
    c('Antenna station', 'keep-in', ant, 70, station),
    c('ST1 bright star', 'keep-out', st1, 5, star),
    c('Camera Earth', 'keep-in', cam, 80, earth),
  ];
}

/** Attitude with body +Z at azimuth a, elevation e (rad), roll fixed by a +X-about-Z-first construction. */
function pointZ(a: number, e: number): number[] {
  // q = rotZ(a) ⊗ rotY(π/2 − e): +Z → (cos e cos a, cos e sin a, sin e).
  const h = 0.5 * (Math.PI / 2 - e);
  const qz = [0, 0, Math.sin(a / 2), Math.cos(a / 2)],
    qy = [0, Math.sin(h), 0, Math.cos(h)];
  return [
    qz[3]! * qy[0]! + qz[0]! * qy[3]! + qz[1]! * qy[2]! - qz[2]! * qy[1]!,
    qz[3]! * qy[1]! - qz[0]! * qy[2]! + qz[1]! * qy[3]! + qz[2]! * qy[0]!,
    qz[3]! * qy[2]! + qz[0]! * qy[1]! - qz[1]! * qy[0]! + qz[2]! * qy[3]!,
    qz[3]! * qy[3]! - qz[0]! * qy[0]! - qz[1]! * qy[1]! - qz[2]! * qy[2]!,
  ];
}

/** An invented Lumen-6-like slew: the tracker (+Z) must pass between the Sun, the Moon and the Earth's limb. */
export function threeConeSlew(multiAxis: boolean): ConstrainedSlewInput {
  const dir = (az: number, el: number) => [Math.cos(el * D) * Math.cos(az * D), Math.cos(el * D) * Math.sin(az * D), Math.sin(el * D)];
  const tracker = [0, 0, 1];
  const constraints: AttitudeConstraint[] = [
    {
      name: 'tracker Sun',
      kind: 'keep-out',
      bodyAxis: tracker,
      halfAngleRad: 30 * D,
      marginRad: 2 * D,
      source: { kind: 'fixed', direction: dir(0, 0) },
    },
    {
      name: 'tracker Moon',
      kind: 'keep-out',
      bodyAxis: tracker,
      halfAngleRad: 12 * D,
      marginRad: 1 * D,
      source: { kind: 'fixed', direction: dir(10, 45) },
    },
    {
      name: 'tracker Earth limb',
      kind: 'keep-out',
      bodyAxis: tracker,
      halfAngleRad: 15 * D,
      marginRad: 1 * D,
      source: { kind: 'fixed', direction: dir(0, -90), angularRadiusRad: 66 * D },
    },
  ];
  if (multiAxis) {
    constraints.push({
      name: 'camera Sun',
      kind: 'keep-out',
      bodyAxis: [1, 0, 0],
      halfAngleRad: 25 * D,
      marginRad: 1 * D,
      source: { kind: 'fixed', direction: dir(0, 0) },
    });
  }
  return {
    qStart: pointZ(-70 * D, 10 * D),
    qTarget: pointZ(70 * D, 5 * D),
    inertia: [0.11, 0.002, -0.001, 0.002, 0.12, 0.0015, -0.001, 0.0015, 0.08],
    wheelMomentumBody: [0, 0, 0],
    constraints,
  };
}

const limits: PlanLimits = {
  torqueCapacity: cubeCapacity(0.002),
  momentumCapacity: cubeCapacity(0.006),
  torqueMargin: 0.8,
  momentumMargin: 0.8,
};

function benchSlew(multiAxis: boolean): void {
  const input = threeConeSlew(multiAxis);
  const t0 = performance.now();
  const first = planConstrainedSlew(input, limits);
  const cold = performance.now() - t0;
  const ms: number[] = [];
  for (let k = 0; k < 20; k++) {
    const t1 = performance.now();
    planConstrainedSlew(input, limits);
    ms.push(performance.now() - t1);
  }
  const s = stats(ms);
  const v = first.ok ? first.value : null;
  const what =
    v && v.status === 'planned'
      ? `${v.search} search, ${v.legs.length} legs, ${v.totalTimeS.toFixed(1)} s vs ${v.unconstrainedTimeS.toFixed(1)} s unconstrained, min margin ${(v.minimumMarginRad / D).toFixed(3)} deg`
      : JSON.stringify(v && v.status);
  console.log(
    `   constrained slew, ${multiAxis ? 'three tracker cones + a camera cone on a second axis (lattice)' : 'three tracker cones, default grid'}: min ${s.min.toFixed(1)} ms, median ${s.median.toFixed(1)} ms${multiAxis ? '' : ' (goal <= 100 ms)'}; first call ${cold.toFixed(0)} ms (builds any grid not yet cached); ${what}`,
  );
}

export async function benchConstraints(): Promise<void> {
  benchSlew(false);
  benchSlew(true);
  const h = dayHistory();
  const cs = dayConstraints();
  for (const series of [false, true]) {
    const ms: number[] = [],
      cpu: number[] = [];
    let last = null as ReturnType<typeof checkAttitudeHistory> | null;
    for (let k = 0; k < (series ? 5 : 15); k++) {
      const c0 = process.cpuUsage(),
        t0 = performance.now();
      last = checkAttitudeHistory(h, cs, { series });
      ms.push(performance.now() - t0);
      const c = process.cpuUsage(c0);
      cpu.push((c.user + c.system) / 1000);
    }
    const s = stats(ms);
    const v = last && last.ok ? last.value : null;
    const nInt = v ? v.constraints.reduce((a, c) => a + c.intervals.length, 0) : -1;
    console.log(
      `   check 24 h at 10 Hz (864,000 samples) x 10 constraints${series ? ', with margin series' : ''}: min ${s.min.toFixed(1)} ms, median ${s.median.toFixed(1)} ms (goal <= 50 ms); process CPU min ${stats(cpu).min.toFixed(1)} ms; load average ${loadavg()[0]!.toFixed(1)} on ${cpus().length} cores; ${nInt} violation intervals`,
    );
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await benchConstraints();
