/**
 * The momentum envelope as drawn, and the total-momentum warning colour.
 *
 * References:
 * - Orthogonal triad: the envelope is the cube |H_i| ≤ h, capacity along unit d = h / max|d_i|
 *   (elementary geometry).
 * - Four-wheel pyramid, cant arccos(1/√3) from +Z, azimuth 45°: the envelope is a rhombic
 *   dodecahedron with capacity 4/√3 h = 2.3094 h along a body axis, 2 h along a wheel axis and
 *   4/√6 h = 1.6330 h along a face normal such as (1,1,0)/√2 (Markley, Reynolds, Liu, Lebsock,
 *   "Maximum torque and momentum envelopes for reaction-wheel arrays", JGCD 33(5), 2010; values
 *   as computed in references.md §3).
 * - The engine's own zonotope (app/engine/wheels/envelope.ts) drawn through the same path, its
 *   capacity function against the drawn surface.
 * The distance to the drawn surface is found by ray–triangle intersection (Möller & Trumbore,
 * "Fast, minimum storage ray/triangle intersection", J. Graphics Tools 2(1), 1997) written here,
 * and by three.js's own Raycaster against the Mesh object.
 */
import { describe, expect, it } from 'vitest';
import { Color, Raycaster, Vector3 } from 'three';
import type { Mesh } from 'three';
import { unwrap } from '../../app/engine/errors';
import { makeRng } from '../../app/engine/math/prng';
import { envelopeCapacity, makeWheelArray, momentumEnvelope, orthogonalTriad, pyramid } from '../../app/engine/wheels';
import { AttitudeScene } from '../../app/view3d/attitudeScene';
import { buildEnvelopeObject, envelopeDisplayScale, momentumFraction } from '../../app/view3d/envelope';
import { createKit } from '../../app/view3d/primitives';
import { MomentumContent } from '../../app/view3d/momentumContent';
import { createCursor, locateSample } from '../../app/view3d/sampling';
import { MOMENTUM_AMBER_FRACTION, MOMENTUM_COLORS, MOMENTUM_RED_FRACTION, momentumLevel } from '../../app/view3d/style';
import type { MomentumEnvelopeMesh } from '../../app/view3d/types';
import { pyramidAxes, syntheticViewRun, testZonotope, testZonotopeCapacity, TRIAD_AXES } from './view3d-fixtures';

const rng = makeRng(4242, 1);
const randomDir = () => {
  for (;;) {
    const v = [2 * rng.next() - 1, 2 * rng.next() - 1, 2 * rng.next() - 1];
    const n = Math.hypot(v[0]!, v[1]!, v[2]!);
    if (n > 0.1 && n <= 1) return Float64Array.from(v.map((x) => x / n));
  }
};

/** World-space triangles of a drawn mesh (geometry × matrixWorld). */
function drawnTriangles(mesh: Mesh): Float64Array {
  mesh.updateWorldMatrix(true, false);
  const pos = mesh.geometry.getAttribute('position');
  const idx = mesh.geometry.getIndex()!;
  const out = new Float64Array(idx.count * 3);
  const v = new Vector3();
  for (let k = 0; k < idx.count; k++) {
    v.fromBufferAttribute(pos, idx.getX(k)).applyMatrix4(mesh.matrixWorld);
    out[3 * k] = v.x;
    out[3 * k + 1] = v.y;
    out[3 * k + 2] = v.z;
  }
  return out;
}

/** Smallest positive ray parameter from the origin along d hitting any triangle (Möller–Trumbore). */
function rayDistance(tris: Float64Array, d: ArrayLike<number>): number {
  let best = Infinity;
  for (let k = 0; k < tris.length; k += 9) {
    const ax = tris[k]!,
      ay = tris[k + 1]!,
      az = tris[k + 2]!;
    const e1x = tris[k + 3]! - ax,
      e1y = tris[k + 4]! - ay,
      e1z = tris[k + 5]! - az;
    const e2x = tris[k + 6]! - ax,
      e2y = tris[k + 7]! - ay,
      e2z = tris[k + 8]! - az;
    const px = d[1]! * e2z - d[2]! * e2y,
      py = d[2]! * e2x - d[0]! * e2z,
      pz = d[0]! * e2y - d[1]! * e2x;
    const det = e1x * px + e1y * py + e1z * pz;
    if (Math.abs(det) < 1e-14) continue;
    const inv = 1 / det;
    const tx = -ax,
      ty = -ay,
      tz = -az; // ray origin 0
    const u = (tx * px + ty * py + tz * pz) * inv;
    if (u < -1e-9 || u > 1 + 1e-9) continue;
    const qx = ty * e1z - tz * e1y,
      qy = tz * e1x - tx * e1z,
      qz = tx * e1y - ty * e1x;
    const v = (d[0]! * qx + d[1]! * qy + d[2]! * qz) * inv;
    if (v < -1e-9 || u + v > 1 + 1e-9) continue;
    const t = (e2x * qx + e2y * qy + e2z * qz) * inv;
    if (t > 0 && t < best) best = t;
  }
  return best;
}

function checkDrawnEnvelope(env: MomentumEnvelopeMesh, capacity: (d: Float64Array) => number, nDirs = 300) {
  const scale = envelopeDisplayScale(env);
  const obj = buildEnvelopeObject(env, scale);
  // Vertices: the drawn positions (world, divided by the display scale) are the input vertices.
  obj.group.updateMatrixWorld(true);
  const pos = obj.mesh.geometry.getAttribute('position');
  expect(pos.count).toBe(env.vertices.length / 3);
  const v = new Vector3();
  let worstV = 0;
  for (let k = 0; k < pos.count; k++) {
    v.fromBufferAttribute(pos, k).applyMatrix4(obj.mesh.matrixWorld).divideScalar(scale);
    worstV = Math.max(
      worstV,
      Math.abs(v.x - env.vertices[3 * k]!),
      Math.abs(v.y - env.vertices[3 * k + 1]!),
      Math.abs(v.z - env.vertices[3 * k + 2]!),
    );
  }
  const vmax = Math.max(...Array.from(env.vertices, Math.abs));
  expect(worstV / vmax).toBeLessThan(1e-6); // Float32 storage
  expect(Array.from(obj.mesh.geometry.getIndex()!.array)).toEqual(Array.from(env.triangles));

  // Surface: ray distance / scale = capacity, for random directions.
  const tris = drawnTriangles(obj.mesh);
  const ray = new Raycaster();
  let worst = 0;
  for (let k = 0; k < nDirs; k++) {
    const d = randomDir();
    const cap = capacity(d);
    const r = rayDistance(tris, d) / scale;
    worst = Math.max(worst, Math.abs(r - cap) / cap);
    if (k < 40) {
      ray.set(new Vector3(0, 0, 0), new Vector3(d[0], d[1], d[2]));
      const hit = ray.intersectObject(obj.mesh, false)[0]!;
      expect(Math.abs(hit.distance / scale - cap) / cap).toBeLessThan(1e-5);
    }
  }
  expect(worst).toBeLessThan(1e-5);
  return { obj, tris, scale };
}

describe('drawn envelope = input mesh, its surface = the capacity function', () => {
  it('orthogonal triad: the cube, capacity h / max|d_i|', () => {
    const h = 0.02;
    const env = testZonotope(TRIAD_AXES, [h, h, h]);
    checkDrawnEnvelope(env, (d) => h / Math.max(Math.abs(d[0]!), Math.abs(d[1]!), Math.abs(d[2]!)));
  });

  it('4-wheel pyramid (rhombic dodecahedron): 2.3094 h on body axes, 2.0 h on a wheel axis, 1.6330 h worst', () => {
    const h = 0.006;
    const axes = pyramidAxes();
    const hm = [h, h, h, h];
    const env = testZonotope(axes, hm);
    expect(env.triangles.length / 3).toBe(24); // 12 rhombi
    const capF = testZonotopeCapacity(axes, hm);
    const { tris, scale } = checkDrawnEnvelope(env, capF);
    const along = (d: number[]) => {
      const n = Math.hypot(d[0]!, d[1]!, d[2]!);
      return (
        rayDistance(
          tris,
          d.map((x) => x / n),
        ) /
        scale /
        h
      );
    };
    expect(along([1, 0, 0])).toBeCloseTo(2.3094, 4);
    expect(along([0, 0, 1])).toBeCloseTo(2.3094, 4);
    expect(along([axes[0]!, axes[1]!, axes[2]!])).toBeCloseTo(2.0, 4);
    expect(along([1, 1, 0])).toBeCloseTo(1.633, 4);
    expect(along([1, 0, 1])).toBeCloseTo(1.633, 4);
  });

  it('the engine’s zonotope (pyramid and triad) drawn through the same path matches envelopeCapacity', () => {
    const h = 0.006;
    const limits = { maxTorqueNm: 0.002, maxMomentumNms: h, rotorInertiaKgm2: 2e-5 };
    const pyr = unwrap(makeWheelArray(pyramid({ ...limits, cantAngleRad: Math.acos(1 / Math.sqrt(3)), azimuthOffsetRad: Math.PI / 4 })));
    const zp = momentumEnvelope(pyr);
    const { tris, scale } = checkDrawnEnvelope({ vertices: zp.vertices, triangles: zp.triangles }, (d) => envelopeCapacity(zp, d));
    expect(rayDistance(tris, [0, 0, 1]) / scale / h).toBeCloseTo(2.3094, 4);
    expect(rayDistance(tris, [Math.SQRT1_2, Math.SQRT1_2, 0]) / scale / h).toBeCloseTo(1.633, 4);
    const tri = unwrap(makeWheelArray(orthogonalTriad(limits)));
    const zt = momentumEnvelope(tri);
    checkDrawnEnvelope(
      { vertices: zt.vertices, triangles: zt.triangles },
      (d) => h / Math.max(Math.abs(d[0]!), Math.abs(d[1]!), Math.abs(d[2]!)),
    );
  });

  it('the display scale puts the farthest vertex at the inset radius', () => {
    const env = testZonotope(TRIAD_AXES, [0.01, 0.02, 0.03]);
    const s = envelopeDisplayScale(env, 1);
    expect(s).toBeCloseTo(1 / Math.hypot(0.01, 0.02, 0.03), 12);
    expect(envelopeDisplayScale({ vertices: new Float64Array(0), triangles: new Uint32Array(0) })).toBe(1);
  });
});

describe('total momentum warning colour', () => {
  it('fraction = |H| / capacity(H/|H|); thresholds 0.7 (amber) and 0.9 (red)', () => {
    const h = 0.01;
    const cap = (d: Float64Array) => h / Math.max(Math.abs(d[0]!), Math.abs(d[1]!), Math.abs(d[2]!));
    const dir = new Float64Array(3);
    // Along (1,1,0)/√2 the cube reaches √2 h: |H| = h is 1/√2 ≈ 0.707 of it.
    expect(momentumFraction([h / Math.SQRT2, h / Math.SQRT2, 0], cap, dir)).toBeCloseTo(Math.SQRT1_2, 14);
    expect(dir[0]).toBeCloseTo(Math.SQRT1_2, 15);
    expect(dir[1]).toBeCloseTo(Math.SQRT1_2, 15);
    expect(dir[2]).toBe(0);
    expect(momentumFraction([0, 0, 0], cap, dir)).toBe(0);
    expect(momentumFraction([1, 0, 0], () => 0, dir)).toBe(Infinity);
    expect(momentumFraction([1, 0, 0], () => Number.NaN, dir)).toBe(Infinity);
    expect(MOMENTUM_AMBER_FRACTION).toBe(0.7);
    expect(MOMENTUM_RED_FRACTION).toBe(0.9);
    expect([0, 0.69, 0.7, 0.89, 0.9, 1.2, Infinity, Number.NaN].map(momentumLevel)).toEqual([
      'normal',
      'normal',
      'amber',
      'amber',
      'red',
      'red',
      'red',
      'normal',
    ]);
  });

  it('the inset arrows follow the wheel momenta and the total turns amber then red', () => {
    const run = syntheticViewRun({ n: 4, dt: 1, q0: [0, 0, 0, 1], omegaBody: [0, 0, 0], jumpSamples: [], logicKind: 'none' });
    const hm = 0.006;
    // Samples: H along (1,1,0) at 0.5, 0.8 and 0.95 of the cube's reach there, then −X at 0.3.
    const f = [0.5, 0.8, 0.95];
    run.trace.hWheel.fill(0);
    f.forEach((fr, k) => {
      run.trace.hWheel[3 * k] = fr * hm;
      run.trace.hWheel[3 * k + 1] = fr * hm;
    });
    run.trace.hWheel[9] = -0.3 * hm;
    const mc = new MomentumContent(createKit(null), run, { drawEnvelope: true, opacity: 1 });
    const c = createCursor();
    const levels: string[] = [];
    const colors: number[] = [];
    for (let k = 0; k < 4; k++) {
      mc.update(locateSample(run.trace.t, run.trace.n, k, c));
      levels.push(mc.level);
      colors.push(mc.totalArrow.material.color.getHex());
      if (k < 3) expect(mc.fraction).toBeCloseTo(f[k]!, 12);
    }
    expect(levels).toEqual(['normal', 'amber', 'red', 'normal']);
    const hex = (x: number) => new Color().setHex(x).getHex();
    expect(colors).toEqual([
      hex(MOMENTUM_COLORS.normal),
      hex(MOMENTUM_COLORS.amber),
      hex(MOMENTUM_COLORS.red),
      hex(MOMENTUM_COLORS.normal),
    ]);
    // Last sample: wheel 1 at −0.3 h_max → its arrow points along −X_B with length 0.3 h_max × scale.
    const a = mc.wheelArrows[0]!;
    expect(a.direction.x).toBeCloseTo(-1, 14);
    expect(a.length).toBeCloseTo(0.3 * hm * mc.scale, 14);
    expect(mc.wheelArrows[1]!.visible).toBe(false); // zero momentum: no arrow
    expect(mc.totalArrow.length).toBeCloseTo(0.3 * hm * mc.scale, 14);
  });

  it('in the scene, the inset uses the first run’s scale for every overlaid run and draws one envelope', () => {
    const spec = {
      n: 50,
      dt: 1,
      q0: [0, 0, 0, 1],
      omegaBody: [0, 0.01, 0] as [number, number, number],
      jumpSamples: [],
      logicKind: 'none' as const,
    };
    const scene = new AttitudeScene();
    scene.setRuns([syntheticViewRun(spec, 'A'), syntheticViewRun(spec, 'B')], 'overlay');
    const shown = scene.viewports[0]!.runs;
    const a = shown[0]!,
      b = shown[1]!;
    expect(a.momentum.scale).toBe(b.momentum.scale);
    expect(a.momentum.envelope).not.toBeNull();
    expect(b.momentum.envelope).toBeNull();
    scene.setOptions({ showEnvelope: false });
    expect(a.momentum.envelope!.group.visible).toBe(false);
    scene.dispose();
  });
});
