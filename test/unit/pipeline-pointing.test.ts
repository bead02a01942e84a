/**
 * Pointing-only targets through the pipeline: the two pointing laws in the law registry
 * (control/laws/pointing-pd, pointing-synergistic), the refusal of a pointing law on a
 * full-attitude target, the pointing error as the error angle of the metrics, the retargeting of
 * the synergistic family to a target's axis, and the plan's roll-free saving.
 *
 * References: rotations with the npm `quaternion` package (Hamilton, scalar first; an outside
 * library, not the engine's rotation.ts). Geometry: the angle between two unit vectors is
 * atan2(|a × b|, a·b) (standard, no source); the shortest rotation carrying x onto r turns by
 * ∠(x, r) (Euler's rotation theorem; standard, no source). A rotation R applied to the pointed
 * axis and to every warp direction leaves each member potential unchanged along R:
 * V'_p(Ry) = V_p(y), since V_p involves only inner products (derived in control/sphere/laws.ts).
 */
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { LAW_IDS, buildController, lawDefinition } from '../../app/engine/control/registry';
import { makeReducedSynergistic } from '../../app/engine/control/sphere/index';
import type { ControlInput, PlantModel } from '../../app/engine/control/types';
import { makeDiagnostics } from '../../app/engine/control/types';
import { runPipeline } from '../../app/engine/pipeline/run';
import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { buildVehicle } from '../../app/engine/pipeline/build';
import { RAD_PER_DEG } from '../../app/engine/units';
import { exportRun } from '../../app/engine/export/runExport';
import { parseAem } from '../../app/engine/export/aem-read';
import { loadExample } from './scenario-fixtures';

type V3 = [number, number, number];
const Q = (q: ArrayLike<number>) => new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!);
const rot = (q: ArrayLike<number>, v: readonly number[]) => Q(q).rotateVector([v[0]!, v[1]!, v[2]!]) as V3;
const unit = (v: readonly number[]): V3 => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};
const ang = (a: readonly number[], b: readonly number[]) =>
  Math.atan2(
    Math.hypot(a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!),
    a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!,
  );
const relAngle = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  const r = Q(a).conjugate().mul(Q(b));
  return 2 * Math.atan2(Math.hypot(r.x, r.y, r.z), Math.abs(r.w));
};

const AXIS: V3 = [0, 0, 1];
const DIRECTION: V3 = [0.3, -0.8, 0.2];

/** Tern-12 (invented) with one pointing-only target and a full-attitude law beside the two pointing laws. */
function pointingScenario(): any {
  const s = loadExample('tern12-reversal');
  s.name = 'Pointing-only test';
  s.vehicle.sensors = { attitudeNoiseArcsec: 0, rateNoiseDegPerS: 0, rateBiasDegPerS: [0, 0, 0] };
  s.targets = [
    {
      label: 'Boresight',
      rollFree: true,
      attitude: { pointing: { bodyAxis: AXIS, inertialDirection: DIRECTION, bodySecondary: [1, 0, 0], inertialSecondary: [0, 0, 1] } },
      holdS: 60,
    },
  ];
  s.controllers = [
    { id: 'pd', label: 'Quaternion PD', law: 'quaternion-pd', gains: { kp: 0.012, kd: 0.073 } },
    { id: 'ppd', label: 'Pointing PD', law: 'pointing-pd', gains: { bandwidthRadPerS: 0.15, dampingRatio: 0.9 } },
    {
      id: 'psyn',
      label: 'Pointing synergistic',
      law: 'pointing-synergistic',
      gains: { bandwidthRadPerS: 0.15, dampingRatio: 0.9 },
      warpGain: 0.5,
      warpAzimuthsDeg: [0, 120, 240],
      gapThreshold: 0.2,
    },
  ];
  s.simulation.durationS = 300;
  delete s.study;
  return s;
}

describe('registry', () => {
  it('offers both pointing laws, marked pointing-only; the hybrid one carries the S² certificate', () => {
    expect(LAW_IDS).toContain('pointing-pd');
    expect(LAW_IDS).toContain('pointing-synergistic');
    expect(lawDefinition('pointing-pd').pointingOnly).toBe(true);
    expect(lawDefinition('pointing-synergistic').pointingOnly).toBe(true);
    expect(lawDefinition('pointing-synergistic').certificate).toBe('S2');
    expect(lawDefinition('quaternion-pd').pointingOnly).toBeFalsy();
  });

  it('builds the synergistic law with its certificate; a family whose members share their undesired point is refused by field', () => {
    const s = resolveScenario(validOrThrow(pointingScenario()));
    const v = buildVehicle(s.vehicle);
    if (!v.ok) throw new Error('vehicle');
    const c = s.controllers[2]!;
    const built = buildController(c, v.value.design, 'controllers[2]');
    if (!built.ok) throw new Error(JSON.stringify(built.errors));
    const k = built.value.sphereCertificate!;
    expect(k.admissible).toBe(true);
    // three azimuths 120° apart at k = 0.5: δ* = 1.5 sin²θ*, θ* − k(1 + cos θ*) = 0 (closed form of sphere-certificate.test.ts)
    let lo = 0,
      hi = 1;
    for (let i = 0; i < 200; i++) {
      const m = 0.5 * (lo + hi);
      if (m - 0.5 * (1 + Math.cos(m)) < 0) lo = m;
      else hi = m;
    }
    expect(Math.abs(k.deltaStar - 1.5 * Math.sin(lo) ** 2)).toBeLessThan(1e-9);
    const bad = buildController(
      { ...c, law: 'pointing-synergistic', warpAzimuthsRad: [0, 0] } as typeof c,
      v.value.design,
      'controllers[2]',
    );
    expect(bad.ok).toBe(false);
    if (!bad.ok) {
      expect(bad.errors[0]!.path).toBe('controllers[2].warpAzimuthsDeg');
      expect(bad.errors[0]!.rule).toBe('zero-gap');
      expect(bad.errors[0]!.message).toMatch(/share their undesired critical point/);
    }
  });
});

function validOrThrow(json: unknown) {
  const v = validateScenario(json);
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.value;
}

describe('a pointing law on a full-attitude target is refused before any simulation', () => {
  it('names the controller, the target and the two ways out', () => {
    const s = pointingScenario();
    delete s.targets[0].rollFree;
    const r = runPipeline(s);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => e.path)).toEqual(['controllers[1].law', 'controllers[2].law']);
    for (const e of r.errors) {
      expect(e.rule).toBe('needs-pointing-only');
      expect(e.message).toMatch(/targets\[0\] "Boresight" fixes the whole attitude/);
      expect(e.message).toMatch(/rollFree: true/);
    }
    // with only the full-attitude law selected the same file runs
    expect(runPipeline(s, { controllers: ['pd'], modes: ['follow-plan'] }).ok).toBe(true);
  });
});

describe('flying a pointing-only target', () => {
  const out = runPipeline(pointingScenario(), { modes: ['step-target'] });
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  const r = unit(DIRECTION);

  it('every law settles on the axis; the final error is the POINTING error of the axis (npm quaternion), for the full-attitude law too', () => {
    expect(out.value.runs.length).toBe(3);
    for (const run of out.value.runs) {
      expect(run.verdict.kind, run.label).toBe('settled');
      const tr = run.trace;
      const k = tr.n - 1;
      const qEnd = Array.from(tr.q.subarray(4 * k, 4 * k + 4));
      const pointing = ang(rot(qEnd, AXIS), r);
      expect(Math.abs(run.metrics.finalErrorRad - pointing), run.label).toBeLessThan(1e-9);
      expect(pointing).toBeLessThan(0.1 * RAD_PER_DEG);
      // the peak tracking error of a step is the initial pointing error, not the full attitude error
      const q0 = Array.from(tr.q.subarray(0, 4));
      expect(Math.abs(run.metrics.trackingErrorPeakRad - ang(rot(q0, AXIS), r)), run.label).toBeLessThan(1e-9);
    }
  });

  it('the pointing laws leave the roll free: their final attitude differs from the held-roll attitude about the axis only', () => {
    for (const id of ['ppd', 'psyn']) {
      const run = out.value.runs.find((x) => x.controllerId === id)!;
      const k = run.trace.n - 1;
      const qEnd = Array.from(run.trace.q.subarray(4 * k, 4 * k + 4));
      // q_end = q_ref ⊗ R(α, b) for some roll α: the body-frame error rotation's axis is ±b
      const e = Q(out.value.targets).conjugate().mul(Q(qEnd));
      const s = Math.hypot(e.x, e.y, e.z);
      if (s > 1e-6) expect(ang(unit([Math.abs(e.x), Math.abs(e.y), Math.abs(e.z)]), [0, 0, 1])).toBeLessThan(2e-3);
    }
  });

  it('the certificate summary names the sphere and carries δ* with its tolerance', () => {
    const c = out.value.certificates.find((x) => x.controllerId === 'psyn')!;
    expect(c.space).toBe('S2');
    expect(c.admissible).toBe(true);
    expect(c.deltaStarTolerance).toBeGreaterThan(0);
    expect(c.deltaStarTolerance).toBeLessThan(1e-6);
  });

  it('the plan reports the saving: reduced angle = ∠(R(q0)b, r), held-roll angle = ∠(q0, q_held), time saved = difference', () => {
    const seg = out.value.plan.segments[0]!;
    const rf = seg.rollFree!;
    const json = pointingScenario();
    const sres = resolveScenario(validOrThrow(json));
    const q0 = sres.initial.qInertialFromBody;
    expect(Math.abs(rf.angleRad - ang(rot(q0, AXIS), r))).toBeLessThan(1e-9);
    expect(Math.abs(seg.angleRad - rf.angleRad)).toBeLessThan(1e-9);
    expect(Math.abs(rf.heldRollAngleRad - relAngle(q0, sres.targets[0]!.pointingOnly!.qHeldRoll))).toBeLessThan(1e-9);
    expect(rf.heldRollAngleRad).toBeGreaterThan(rf.angleRad);
    expect(rf.slewTimeS).toBeCloseTo(seg.slewTimeS, 9);
    expect(rf.timeSavedS).toBeCloseTo(rf.heldRollTimeS! - rf.slewTimeS!, 9);
    expect(rf.summary).toMatch(/^Pointing only: /);
  });
});

describe('exports of a pointing-only run', () => {
  const out = runPipeline(pointingScenario(), { modes: ['step-target'], controllers: ['psyn'] });
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  const run = out.value.runs[0]!;
  const opts = { toolName: 'Slewsmith', toolVersion: '0.1.0', creationDateUtc: '2030-01-01T00:00:00Z', sampleRateHz: 1 };

  it('the AEM carries the FULL attitude flown (every data line is ±q of the trace at that time, npm quaternion angle < 1e-8) and says the roll is free', () => {
    const text = exportRun('aem', run, out.value, opts);
    if (!text.ok) throw new Error(JSON.stringify(text.errors));
    const doc = parseAem(text.value);
    if (!doc.ok) throw new Error(JSON.stringify(doc.errors));
    const seg = doc.value.segments[0]!;
    expect(seg.comments.some((c) => /Pointing only \(roll free\): body axis \(0\.000000, 0\.000000, 1\.000000\) on EME2000/.test(c))).toBe(
      true,
    );
    const tr = run.trace;
    let checked = 0;
    for (const line of seg.lines) {
      const t = line.time.unixS - seg.lines[0]!.time.unixS;
      const k = Array.from(tr.t).findIndex((x) => Math.abs(x - t) < 1e-6);
      if (k < 0) continue;
      const [x, y, z, w] = line.values;
      // the AEM quaternion A = EME2000 → B = body has the same numbers as q_inertial←body (the
      // project's convention, pinned against the AEM standard in export-aem-convention.test.ts)
      expect(relAngle([x!, y!, z!, w!], tr.q.subarray(4 * k, 4 * k + 4))).toBeLessThan(1e-8);
      checked++;
    }
    expect(checked).toBeGreaterThan(100);
  });

  it('the JSON names the pointed axis and direction of the resolved target, and the saving of the plan', () => {
    const text = exportRun('json', run, out.value, opts);
    if (!text.ok) throw new Error(JSON.stringify(text.errors));
    const doc = JSON.parse(text.value);
    const p = doc.resolved.targets[0].pointingOnly;
    expect(p.bodyAxis).toEqual([0, 0, 1]);
    expect(ang(p.inertialDirection, unit(DIRECTION))).toBeLessThan(1e-12);
    expect(doc.plan.segments[0].rollFree.timeSavedS).toBeCloseTo(out.value.plan.segments[0]!.rollFree!.timeSavedS!, 12);
  });
});

describe('the synergistic family follows the target axis', () => {
  const plant: PlantModel = {
    Jperp: Float64Array.from([1.2, 0.1, -0.05, 0.1, 0.9, 0.02, -0.05, 0.02, 1.5]),
    nWheels: 3,
    axes: Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1),
  };
  const Kd = [0.6, 0.1, 0, 0.1, 0.5, 0, 0, 0, 0.7];
  const input = (q: number[], axis?: number[]): ControlInput => ({
    q: Float64Array.from(q),
    omega: Float64Array.of(0.01, -0.02, 0.005),
    hWheel: new Float64Array(3),
    qRef: Float64Array.of(0, 0, 0, 1),
    omegaRef: new Float64Array(3),
    omegaDotRef: new Float64Array(3),
    ...(axis ? { pointingAxis: Float64Array.from(axis) } : {}),
  });

  it('built about +Z and handed axis b′: the same potentials as a family built about b′ with the directions rotated (npm quaternion)', () => {
    const b2 = unit([0.6, -0.3, 0.74]);
    const dirs0: V3[] = [0, 2, 4].map((k) => [Math.cos((k * Math.PI) / 3), Math.sin((k * Math.PI) / 3), 0]);
    // shortest rotation +Z → b′, by the outside library
    const axisZ: V3 = [0, 0, 1];
    const w = unit([axisZ[1] * b2[2] - axisZ[2] * b2[1], axisZ[2] * b2[0] - axisZ[0] * b2[2], axisZ[0] * b2[1] - axisZ[1] * b2[0]]);
    const R = Quaternion.fromAxisAngle(w, ang(axisZ, b2));
    const dirs2 = dirs0.map((d) => R.rotateVector(d) as V3);
    const mk = (axis: V3, dirs: V3[]) => {
      const c = makeReducedSynergistic({ axis, kp: 0.8, Kd, warpGain: 0.5, warpDirections: dirs.flat(), hysteresis: 0.3 }, plant);
      if (!c.ok) throw new Error(JSON.stringify(c.errors));
      return c.value;
    };
    const moved = mk(axisZ, dirs0);
    const direct = mk(b2, dirs2);
    const d1 = makeDiagnostics(),
      d2 = makeDiagnostics();
    const attitudes = [
      [0.3, -0.2, 0.1, 0.927],
      [0.7, 0.1, -0.2, 0.678],
      [-0.1, 0.9, 0.3, 0.3],
    ];
    for (const q of attitudes) {
      const n = Math.hypot(...q);
      const qq = q.map((x) => x / n);
      for (let p = 0; p < 3; p++) {
        moved.diagnostics(d1, input(qq, b2), p);
        direct.diagnostics(d2, input(qq), p);
        expect(Math.abs(d1.potential - d2.potential)).toBeLessThan(1e-12);
        expect(Math.abs(d1.potentialMin - d2.potentialMin)).toBeLessThan(1e-12);
        expect(Math.abs(d1.errorAngle - d2.errorAngle)).toBeLessThan(1e-12);
      }
    }
  });
});
