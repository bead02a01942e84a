/**
 * The one adapter between engine arrays and three.js (app/view3d/adapter.ts).
 *
 * References outside the project: three.js's own Object3D world transform and Matrix4 rotation
 * (an independent implementation of Hamilton rotation), the npm `quaternion` package
 * (rotateVector, slerp; scalar-first), and the hand-computed case "90° about Z carries X to Y"
 * (right-hand rule; the CCSDS ADM Annex F2 check uses the same rotation, references.md §1.6).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { BufferAttribute, Group, Matrix3, Matrix4, Object3D, PerspectiveCamera, Quaternion as TQuat, Scene, Vector3 } from 'three';
import { makeRng } from '../../app/engine/math/prng';
import { qFromAxisAngle, qRandomUniform, qRotate, qSlerp, qToMat3 } from '../../app/engine/math/rotation';
import {
  mat3FromMatrix3,
  matrix3FromMat3,
  matrix4FromMat3,
  quaternionFromArray,
  quaternionToArray,
  setInertialZUp,
  setObjectAttitude,
  setObjectAttitudeInterpolated,
  slerpFlat,
} from '../../app/view3d/adapter';

const rng = makeRng(20260101, 7);
const randomUnitVector = (): Float64Array => {
  const v = new Float64Array([rng.next() - 0.5, rng.next() - 0.5, rng.next() - 0.5]);
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return v.map((x) => x / n);
};
const randomAttitude = () => qRandomUniform(new Float64Array(4), rng);
const sameAttitude = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  const s = a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]! < 0 ? -1 : 1;
  return Math.max(...[0, 1, 2, 3].map((i) => Math.abs(a[i]! - s * b[i]!)));
};

/** A body-frame object inside an identity "inertial" group inside a scene, as in the view. */
function bodyInScene(): Object3D {
  const scene = new Scene();
  const inertial = new Group();
  const body = new Object3D();
  scene.add(inertial);
  inertial.add(body);
  return body;
}

describe('engine attitude → three.js Object3D', () => {
  it('a body vector rotated by the engine equals the object world-space vector (1e-12, 500 random cases)', () => {
    const body = bodyInScene();
    const vEng = new Float64Array(3);
    const w = new Vector3();
    let worst = 0;
    for (let k = 0; k < 500; k++) {
      const q = randomAttitude();
      const v = randomUnitVector().map((x) => x * (0.1 + 3 * rng.next()));
      setObjectAttitude(body, q, 0);
      body.updateWorldMatrix(true, false);
      body.localToWorld(w.set(v[0]!, v[1]!, v[2]));
      qRotate(vEng, q, v);
      worst = Math.max(worst, Math.abs(w.x - vEng[0]!), Math.abs(w.y - vEng[1]!), Math.abs(w.z - vEng[2]!));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('agrees with the npm quaternion package (Hamilton, scalar-first) on the same rotation', () => {
    const body = bodyInScene();
    const w = new Vector3();
    for (let k = 0; k < 100; k++) {
      const q = randomAttitude();
      const v = randomUnitVector();
      setObjectAttitude(body, q);
      body.updateWorldMatrix(true, false);
      body.localToWorld(w.set(v[0]!, v[1]!, v[2]));
      const ref = new Quaternion(q[3], q[0], q[1], q[2]).rotateVector([v[0]!, v[1]!, v[2]!]) as number[];
      expect(Math.abs(w.x - ref[0]!) + Math.abs(w.y - ref[1]!) + Math.abs(w.z - ref[2]!)).toBeLessThan(1e-12);
    }
  });

  it('hand case: +90° about Z_I carries X_B onto +Y_I (right-hand rule)', () => {
    const body = bodyInScene();
    setObjectAttitude(body, qFromAxisAngle(new Float64Array(4), [0, 0, 1], Math.PI / 2));
    body.updateWorldMatrix(true, false);
    const w = body.localToWorld(new Vector3(1, 0, 0));
    expect(w.x).toBeCloseTo(0, 14);
    expect(w.y).toBeCloseTo(1, 14);
    expect(w.z).toBeCloseTo(0, 14);
  });

  it('reads at an offset of a flat sample-major array, and writes back unchanged', () => {
    const flat = new Float64Array(4 * 5);
    const qs = [0, 1, 2, 3, 4].map(() => randomAttitude());
    qs.forEach((q, k) => flat.set(q, 4 * k));
    const tq = new TQuat();
    const back = new Float64Array(4);
    for (let k = 0; k < 5; k++) {
      quaternionFromArray(tq, flat, 4 * k);
      quaternionToArray(back, tq, 0);
      expect(Array.from(back)).toEqual(Array.from(qs[k]!));
    }
  });

  it('after a Float32 upload (BufferAttribute) the rotation agrees to 1e-6', () => {
    const n = 400;
    const qs = new Float64Array(4 * n);
    const vs = new Float64Array(3 * n);
    for (let k = 0; k < n; k++) {
      qs.set(randomAttitude(), 4 * k);
      vs.set(randomUnitVector(), 3 * k);
    }
    const attr = new BufferAttribute(new Float32Array(qs), 4);
    const body = bodyInScene();
    const w = new Vector3();
    const vEng = new Float64Array(3);
    let worst = 0;
    for (let k = 0; k < n; k++) {
      // Read the uploaded (single-precision) values back, as a shader or instanced path would.
      body.quaternion.set(attr.getX(k), attr.getY(k), attr.getZ(k), attr.getW(k));
      body.updateWorldMatrix(true, false);
      body.localToWorld(w.set(vs[3 * k]!, vs[3 * k + 1]!, vs[3 * k + 2]));
      qRotate(vEng, qs.subarray(4 * k, 4 * k + 4), vs.subarray(3 * k, 3 * k + 3));
      worst = Math.max(worst, Math.abs(w.x - vEng[0]!), Math.abs(w.y - vEng[1]!), Math.abs(w.z - vEng[2]!));
    }
    expect(worst).toBeLessThan(1e-6);
    expect(worst).toBeGreaterThan(0); // the test really exercises single precision
  });
});

describe('slerp between two samples (shorter arc)', () => {
  it('matches gl-matrix (engine qSlerp) and the quaternion package to 1e-12', () => {
    const out = new Float64Array(4);
    const eng = new Float64Array(4);
    for (let k = 0; k < 300; k++) {
      const a = randomAttitude(),
        b = randomAttitude();
      const al = rng.next();
      slerpFlat(out, 0, a, 0, b, 0, al);
      qSlerp(eng, a, b, al);
      expect(sameAttitude(out, eng)).toBeLessThan(1e-12);
      const ref = new Quaternion(a[3], a[0], a[1], a[2]).slerp(new Quaternion(b[3], b[0], b[1], b[2]))(al);
      expect(sameAttitude(out, [ref.x, ref.y, ref.z, ref.w])).toBeLessThan(1e-12);
    }
  });

  it('takes the shorter arc: q and −q for the second sample give the same attitude path', () => {
    const o1 = new Float64Array(4),
      o2 = new Float64Array(4);
    const a = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0);
    const b = qFromAxisAngle(new Float64Array(4), [0, 0, 1], 0.6);
    const negB = b.map((x) => -x);
    for (const al of [0.1, 0.5, 0.9]) {
      slerpFlat(o1, 0, a, 0, b, 0, al);
      slerpFlat(o2, 0, a, 0, negB, 0, al);
      expect(sameAttitude(o1, o2)).toBeLessThan(1e-15);
      // Shorter arc about Z: the angle at alpha is alpha·0.6, not the long way round.
      expect(2 * Math.atan2(Math.hypot(o2[0]!, o2[1]!, o2[2]!), Math.abs(o2[3]!))).toBeCloseTo(al * 0.6, 13);
    }
  });

  it('is exact for a fixed-axis rotation at intermediate fractions and accurate for tiny angles', () => {
    const out = new Float64Array(4);
    const axis = [1, -2, 0.5];
    for (const th of [1e-12, 1e-7, 0.01, 1.0, 3.0]) {
      const a = qFromAxisAngle(new Float64Array(4), axis, 0.3);
      const b = qFromAxisAngle(new Float64Array(4), axis, 0.3 + th);
      for (const al of [0.25, 0.5, 0.75]) {
        slerpFlat(out, 0, a, 0, b, 0, al);
        const exact = qFromAxisAngle(new Float64Array(4), axis, 0.3 + al * th);
        expect(sameAttitude(out, exact)).toBeLessThan(1e-14);
      }
    }
  });

  it('is alias-safe and poses an object from two samples', () => {
    const flat = new Float64Array(8);
    flat.set(qFromAxisAngle(new Float64Array(4), [0, 1, 0], 0.2), 0);
    flat.set(qFromAxisAngle(new Float64Array(4), [0, 1, 0], 0.4), 4);
    const obj = new Object3D();
    setObjectAttitudeInterpolated(obj, flat, 0, 1, 0.5);
    const exact = qFromAxisAngle(new Float64Array(4), [0, 1, 0], 0.3);
    expect(sameAttitude([obj.quaternion.x, obj.quaternion.y, obj.quaternion.z, obj.quaternion.w], exact)).toBeLessThan(1e-15);
    slerpFlat(flat, 0, flat, 0, flat, 4, 0.5); // out aliases the first input
    expect(sameAttitude(flat.subarray(0, 4), exact)).toBeLessThan(1e-15);
  });
});

describe('engine mat3 (column-major) → three Matrix3 / Matrix4', () => {
  it('R(q) copied into Matrix3 equals three’s own rotation matrix of the same quaternion', () => {
    const m = new Float64Array(9);
    const m3 = new Matrix3();
    const ref4 = new Matrix4();
    const ref3 = new Matrix3();
    for (let k = 0; k < 100; k++) {
      const q = randomAttitude();
      qToMat3(m, q);
      matrix3FromMat3(m3, m);
      ref3.setFromMatrix4(ref4.makeRotationFromQuaternion(new TQuat(q[0], q[1], q[2], q[3])));
      for (let i = 0; i < 9; i++) expect(Math.abs(m3.elements[i]! - ref3.elements[i]!)).toBeLessThan(1e-15);
      // And it acts on vectors as the engine does.
      const v = randomUnitVector();
      const w = new Vector3(v[0], v[1], v[2]).applyMatrix3(m3);
      const e = qRotate(new Float64Array(3), q, v);
      expect(Math.abs(w.x - e[0]!) + Math.abs(w.y - e[1]!) + Math.abs(w.z - e[2]!)).toBeLessThan(1e-14);
      const back = new Float64Array(9);
      mat3FromMatrix3(back, m3);
      expect(Array.from(back)).toEqual(Array.from(m));
    }
  });

  it('a non-symmetric matrix keeps its (row, column) placement (no transpose slip)', () => {
    // Engine element (r, c) at 3c + r: put r*10 + c there, read three's elements the same way.
    const m = new Float64Array(9);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) m[3 * c + r] = r * 10 + c;
    const m4 = matrix4FromMat3(new Matrix4(), m);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) expect(m4.elements[4 * c + r]).toBe(r * 10 + c);
    expect([m4.elements[3], m4.elements[7], m4.elements[11], m4.elements[12], m4.elements[13], m4.elements[14], m4.elements[15]]).toEqual([
      0, 0, 0, 0, 0, 0, 1,
    ]);
    const m3 = matrix3FromMat3(new Matrix3(), m);
    // three's Matrix3.set() takes ROW-major arguments: build the same matrix that way and compare.
    const viaSet = new Matrix3().set(0, 1, 2, 10, 11, 12, 20, 21, 22);
    expect(Array.from(m3.elements)).toEqual(Array.from(viaSet.elements));
  });

  it('Matrix4 from R(q) gives back ±q through three’s setFromRotationMatrix', () => {
    const m = new Float64Array(9);
    for (let k = 0; k < 50; k++) {
      const q = randomAttitude();
      const tq = new TQuat().setFromRotationMatrix(matrix4FromMat3(new Matrix4(), qToMat3(m, q)));
      expect(sameAttitude([tq.x, tq.y, tq.z, tq.w], q)).toBeLessThan(1e-14);
    }
  });
});

describe('scene frame = inertial frame, Z_I drawn up', () => {
  it('a camera with setInertialZUp looking at the origin from the X_I–Y_I plane has +Z_I as screen up', () => {
    const cam = new PerspectiveCamera();
    setInertialZUp(cam);
    for (const pos of [
      [5, 0, 0],
      [0, -5, 0],
      [3, 4, 1],
    ]) {
      cam.position.set(pos[0]!, pos[1]!, pos[2]);
      cam.lookAt(0, 0, 0);
      cam.updateMatrixWorld();
      // The camera's local +Y (screen up) in world coordinates.
      const up = new Vector3(0, 1, 0).transformDirection(cam.matrixWorld);
      const horiz = Math.hypot(pos[0]!, pos[1]!);
      expect(up.z).toBeCloseTo(horiz / Math.hypot(pos[0]!, pos[1]!, pos[2]!), 12);
    }
  });
});
