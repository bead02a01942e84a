/**
 * Pointing-only (roll-free) targets in the scenario file (app/engine/scenario/pointingOnly.ts):
 * validation messages, resolution to the reduced target, the inverse (toScenarioFile) and the
 * pointing-only sensor and study fields.
 *
 * References: rotations are checked with the npm `quaternion` package (Hamilton product, scalar
 * first; an outside library, not the engine's rotation.ts). Geometry: the shortest rotation
 * carrying unit x0 onto r turns by ∠(x0, r) about x0 × r (Euler's rotation theorem; standard, no
 * source); TRIAD attitudes (Black, AIAA Journal 2(7), 1964) put the primary body axis exactly on
 * its inertial direction.
 */
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario, type ResolvedScenario } from '../../app/engine/scenario/resolve';
import { toScenarioFile } from '../../app/engine/scenario/toFile';
import { scenarioJsonSchema } from '../../app/engine/scenario/schema';
import { RAD_PER_DEG } from '../../app/engine/units';
import { loadExample } from './scenario-fixtures';

type V3 = [number, number, number];
const Q = (q: ArrayLike<number>) => new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!);
const rot = (q: ArrayLike<number>, v: V3) => Q(q).rotateVector(v) as V3;
const unit = (v: number[]): V3 => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};
const ang = (a: number[], b: number[]) =>
  Math.atan2(
    Math.hypot(a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!),
    a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!,
  );
/** Rotation angle of q_a* ⊗ q_b in [0, π] (npm quaternion). */
const relAngle = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  const r = Q(a).conjugate().mul(Q(b));
  return 2 * Math.atan2(Math.hypot(r.x, r.y, r.z), Math.abs(r.w));
};

function rollFreeScenario(): any {
  const s = loadExample('tern12-reversal');
  s.targets = [
    {
      label: 'Boresight on A',
      rollFree: true,
      attitude: {
        pointing: { bodyAxis: [0, 0, 2], inertialDirection: [0.3, -0.8, 0.2], bodySecondary: [1, 0, 0], inertialSecondary: [0, 0, 1] },
      },
      holdS: 20,
    },
    { label: 'Turn about it', attitude: { relative: { axis: [0, 1, 0], angleDeg: 40 } }, holdS: 10 },
    {
      label: 'Panel to the Sun',
      rollFree: true,
      attitude: {
        pointing: { bodyAxis: [1, 1, 0], inertialDirection: [-1, 0.2, 0.1], bodySecondary: [0, 0, 1], inertialSecondary: [0, 1, 0] },
      },
      holdS: 15,
    },
  ];
  return s;
}

function resolved(json: unknown): ResolvedScenario {
  const v = validateScenario(json);
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return resolveScenario(v.value);
}

describe('a roll-free target resolves to the reduced target', () => {
  it('the primary axis lands on its direction by the shortest rotation from the previous attitude; the held-roll attitude is the TRIAD one', () => {
    const json = rollFreeScenario();
    const r = resolved(json);
    const chain = [r.initial.qInertialFromBody, ...r.targets.map((t) => t.qInertialFromBody)];
    for (const k of [0, 2]) {
      const t = r.targets[k]!;
      const spec = json.targets[k].attitude.pointing;
      const b = unit(spec.bodyAxis),
        dir = unit(spec.inertialDirection);
      expect(t.pointingOnly).toBeDefined();
      const p = t.pointingOnly!;
      expect(ang(Array.from(p.bodyAxis), b)).toBeLessThan(1e-15);
      expect(ang(Array.from(p.inertialDirection), dir)).toBeLessThan(1e-12);
      // the reduced target points b at r ...
      expect(ang(rot(t.qInertialFromBody, b), dir)).toBeLessThan(1e-12);
      // ... and is exactly the angle between the previous pointing and r away from the previous attitude
      const prev = chain[k]!;
      expect(Math.abs(relAngle(prev, t.qInertialFromBody) - ang(rot(prev, b), dir))).toBeLessThan(1e-12);
      // the held-roll attitude: b on r and the secondary as close as TRIAD puts it
      expect(ang(rot(p.qHeldRoll, b), dir)).toBeLessThan(1e-12);
      const s2 = unit(spec.bodySecondary),
        sI = unit(spec.inertialSecondary);
      const img = rot(p.qHeldRoll, s2);
      // TRIAD: the secondary's image lies in the plane of r and the inertial secondary, on its side
      const n = unit([dir[1] * sI[2] - dir[2] * sI[1], dir[2] * sI[0] - dir[0] * sI[2], dir[0] * sI[1] - dir[1] * sI[0]]);
      expect(Math.abs(img[0] * n[0] + img[1] * n[1] + img[2] * n[2])).toBeLessThan(1e-12);
      expect(img[0] * sI[0] + img[1] * sI[1] + img[2] * sI[2]).toBeGreaterThan(0);
    }
    // the relative target composes on the REDUCED attitude (the one the plan reaches)
    const rel = Quaternion.fromAxisAngle([0, 1, 0], 40 * RAD_PER_DEG);
    const expected = Q(r.targets[0]!.qInertialFromBody).mul(rel);
    expect(relAngle(r.targets[1]!.qInertialFromBody, [expected.x, expected.y, expected.z, expected.w])).toBeLessThan(1e-12);
    expect(r.targets[1]!.pointingOnly).toBeUndefined();
  });

  it('without rollFree the same entry is the full TRIAD attitude, and rollFree: false changes nothing', () => {
    const a = rollFreeScenario();
    const b = rollFreeScenario();
    delete a.targets[0].rollFree;
    b.targets[0].rollFree = false;
    const ra = resolved(a),
      rb = resolved(b),
      rf = resolved(rollFreeScenario());
    expect(Array.from(ra.targets[0]!.qInertialFromBody)).toEqual(Array.from(rb.targets[0]!.qInertialFromBody));
    expect(relAngle(ra.targets[0]!.qInertialFromBody, rf.targets[0]!.pointingOnly!.qHeldRoll)).toBeLessThan(1e-12);
    expect(ra.targets[0]!.pointingOnly).toBeUndefined();
  });
});

describe('validation', () => {
  it('rollFree on a form without a pointed axis is refused at targets[i].rollFree, naming the forms that have one', () => {
    const s = rollFreeScenario();
    s.targets[1].rollFree = true;
    s.targets.push({ label: 'q', rollFree: true, attitude: { quaternion: [0, 0, 0, 1] }, holdS: 0 });
    const v = validateScenario(s);
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const bad = v.errors.filter((e) => e.rule === 'primary-axis');
    expect(bad.map((e) => e.path)).toEqual(['targets[1].rollFree', 'targets[3].rollFree']);
    expect(bad[0]!.message).toMatch(/"pointing"/);
    expect(bad[0]!.message).toMatch(/relative attitude has none/);
  });

  it('a non-boolean rollFree and a bad antipodal noise name their fields', () => {
    const s = rollFreeScenario();
    s.targets[0].rollFree = 'yes';
    s.vehicle.sensors.antipodalNoiseDeg = -1;
    const v = validateScenario(s);
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const paths = v.errors.map((e) => e.path);
    expect(paths).toContain('targets[0].rollFree');
    expect(paths).toContain('vehicle.sensors.antipodalNoiseDeg');
  });

  it('the bundled examples stay valid and the JSON Schema documents the new fields', () => {
    for (const name of ['lumen6-imaging', 'tern12-reversal', 'kestrel60-momentum'] as const)
      expect(validateScenario(loadExample(name)).ok).toBe(true);
    const text = JSON.stringify(scenarioJsonSchema());
    expect(text).toContain('"rollFree"');
    expect(text).toContain('"antipodalNoiseDeg"');
    expect(text).toContain('near-antipode');
  });

  it('a near-antipode study needs a roll-free first target', () => {
    const s = loadExample('tern12-reversal');
    s.study.dispersions = { initialAttitude: { mode: 'near-antipode', withinDeg: 2 } };
    const v = validateScenario(s);
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.errors.map((e) => [e.path, e.rule])).toContainEqual(['study.dispersions.initialAttitude.mode', 'needs-roll-free']);
    const ok = rollFreeScenario();
    ok.study.dispersions = { initialAttitude: { mode: 'near-antipode', withinDeg: 2 }, sensors: { antipodalNoiseDeg: 1.5 } };
    const r = resolved(ok);
    expect(r.study!.attitude).toEqual({ mode: 'near-antipode', withinRad: 2 * RAD_PER_DEG });
    expect(r.study!.sensors.antipodalNoiseRad).toBeCloseTo(1.5 * RAD_PER_DEG, 15);
  });
});

describe('toScenarioFile writes roll-free targets back', () => {
  it('resolve(validate(toScenarioFile(r))) gives the same reduced targets, axes, directions and held-roll attitudes', () => {
    const s = rollFreeScenario();
    s.vehicle.sensors.antipodalNoiseDeg = 2;
    s.study.dispersions = { initialAttitude: { mode: 'near-antipode', withinDeg: 3 }, sensors: { antipodalNoiseDeg: 1 } };
    const r = resolved(s);
    const file = toScenarioFile(r);
    expect(file.targets[0]!.rollFree).toBe(true);
    expect(file.targets[1]!.rollFree).toBeUndefined();
    const back = resolved(JSON.parse(JSON.stringify(file)));
    expect(back.vehicle.sensors.antipodalNoiseRad).toBeCloseTo(2 * RAD_PER_DEG, 15);
    expect(back.study!.attitude.mode).toBe('near-antipode');
    expect((back.study!.attitude as { withinRad: number }).withinRad).toBeCloseTo(3 * RAD_PER_DEG, 15);
    expect(back.study!.sensors.antipodalNoiseRad).toBeCloseTo(r.study!.sensors.antipodalNoiseRad!, 15);
    r.targets.forEach((t, k) => {
      const u = back.targets[k]!;
      expect(relAngle(t.qInertialFromBody, u.qInertialFromBody)).toBeLessThan(1e-12);
      expect(u.pointingOnly === undefined).toBe(t.pointingOnly === undefined);
      if (t.pointingOnly) {
        expect(ang(Array.from(u.pointingOnly!.bodyAxis), Array.from(t.pointingOnly.bodyAxis))).toBeLessThan(1e-12);
        expect(ang(Array.from(u.pointingOnly!.inertialDirection), Array.from(t.pointingOnly.inertialDirection))).toBeLessThan(1e-12);
        expect(relAngle(u.pointingOnly!.qHeldRoll, t.pointingOnly.qHeldRoll)).toBeLessThan(1e-12);
      }
    });
  });
});
