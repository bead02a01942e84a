/**
 * Switching an attitude between its written forms keeps the attitude (app/ui/attitudeForms.ts).
 * Checked two ways: round trip through the engine's resolver for every form and every Euler
 * sequence, and against hand-worked cases (a 90° turn about Z, worked by hand below) and the npm
 * `quaternion` package as an independent rotation library.
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { EULER_SEQUENCES, qAngleBetween, type Quat } from '../../app/engine/math/rotation';
import { attitudeInForm, convertAttitude, resolveAttitudeChain } from '../../app/ui/attitudeForms';
import demo from '../../assets/lumen6-imaging.scenario.json';

const FORMS = ['quaternion', 'euler', 'pointing', 'relative'] as const;

function withAttitude(k: number, attitude: unknown): unknown {
  const s = structuredClone(demo) as { initial: { attitude: unknown }; targets: { attitude: unknown }[] };
  if (k === 0) s.initial.attitude = attitude;
  else s.targets[k - 1]!.attitude = attitude;
  return s;
}

describe('attitude form conversion', () => {
  const chain = resolveAttitudeChain(demo);

  it('resolves every attitude of the demo', () => {
    expect(chain).toHaveLength(1 + demo.targets.length);
    for (const q of chain) expect(q).not.toBeNull();
  });

  it('keeps each demo attitude when rewritten in any form (and any Euler sequence)', () => {
    for (let k = 0; k < chain.length; k++) {
      for (const form of FORMS) {
        if (k === 0 && form === 'relative') continue; // the initial attitude has nothing to be relative to
        const seqs = form === 'euler' ? EULER_SEQUENCES : (['ZYX'] as const);
        for (const seq of seqs) {
          const spec = convertAttitude(demo, k, form, seq);
          expect(Object.keys(spec)).toEqual([form]);
          const q = resolveAttitudeChain(withAttitude(k, spec))[k] as Quat;
          // 1e-9 rad: the file keeps 12 significant digits.
          expect(qAngleBetween(q, chain[k] as Quat), `${k} ${form} ${seq}`).toBeLessThan(1e-9);
        }
      }
    }
  });

  it('a later relative target still lands where it did after an earlier target changes form', () => {
    // Target 2 of the demo is relative to target 1; rewrite target 1 as a quaternion.
    const s = withAttitude(1, convertAttitude(demo, 1, 'quaternion'));
    const after = resolveAttitudeChain(s);
    expect(qAngleBetween(after[2] as Quat, chain[2] as Quat)).toBeLessThan(1e-9);
  });

  it('writes a 90° turn about Z in each form (worked by hand)', () => {
    // q = [0, 0, sin 45°, cos 45°]: body X → inertial Y, body Y → inertial −X, body Z → inertial Z.
    const h = Math.SQRT1_2;
    const q = Float64Array.of(0, 0, h, h);
    expect(attitudeInForm(q, 'euler', null, 'ZYX')).toEqual({ euler: { sequence: 'ZYX', anglesDeg: [90, 0, 0] } });
    expect(attitudeInForm(q, 'pointing', null)).toEqual({
      pointing: { bodyAxis: [0, 0, 1], inertialDirection: [0, 0, 1], bodySecondary: [1, 0, 0], inertialSecondary: [0, 1, 0] },
    });
    // Relative to the identity it is the rotation itself.
    expect(attitudeInForm(q, 'relative', Float64Array.of(0, 0, 0, 1))).toEqual({ relative: { axis: [0, 0, 1], angleDeg: 90 } });
    expect(attitudeInForm(q, 'relative', null)).toBeNull();
  });

  it('agrees with the npm quaternion package on the pointing form of a random-looking attitude', () => {
    const q = Float64Array.of(0.2, -0.4, 0.1, Math.sqrt(1 - 0.04 - 0.16 - 0.01));
    const spec = attitudeInForm(q, 'pointing', null) as { pointing: { inertialDirection: number[]; inertialSecondary: number[] } };
    // quaternion(w, x, y, z).rotateVector rotates v by q (v' = q v q*), independent of our code.
    const ref = new Quaternion(q[3], q[0], q[1], q[2]);
    const z = ref.rotateVector([0, 0, 1]) as number[];
    const x = ref.rotateVector([1, 0, 0]) as number[];
    spec.pointing.inertialDirection.forEach((v, i) => expect(v).toBeCloseTo(z[i]!, 11));
    spec.pointing.inertialSecondary.forEach((v, i) => expect(v).toBeCloseTo(x[i]!, 11));
  });
});
