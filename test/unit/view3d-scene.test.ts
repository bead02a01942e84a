/**
 * The renderer-free scene model: the bus-model file, layouts, rebuilds, options and the shared
 * geometry (wire sphere, keep-out cones).
 *
 * References: spherical geometry (every wire-sphere vertex at the sphere radius; a cone rim point
 * at angle α from its axis), three.js's own world transforms for the bus parts, and the bundled
 * asset file itself.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { type BufferGeometry, type Material, type Mesh, Vector3 } from 'three';
import { AttitudeScene } from '../../app/view3d/attitudeScene';
import { buildBusGroup, parseBusModel } from '../../app/view3d/busModel';
import { keepOutConePositions, wireSpherePositions } from '../../app/view3d/commonContent';
import { DEFAULT_BUS_MODEL } from '../../app/view3d/defaultBus';
import { SIZES } from '../../app/view3d/style';
import type { SyntheticRunSpec } from './view3d-fixtures';
import { syntheticViewRun } from './view3d-fixtures';

const spec: SyntheticRunSpec = { n: 200, dt: 0.5, q0: [0, 0, 0, 1], omegaBody: [0.01, 0.02, 0.03], jumpSamples: [40], logicKind: 'sign' };

describe('bus model file', () => {
  const raw = JSON.parse(readFileSync(new URL('../../assets/bus-model.json', import.meta.url), 'utf8'));

  it('the bundled asset is valid: a box body, two wings and an imager on the +Z_B boresight', () => {
    const r = parseBusModel(raw);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.boresightBody).toEqual([0, 0, 1]);
    const names = r.value.parts.map((p) => p.name);
    expect(names).toEqual(expect.arrayContaining(['body', 'wing+Y', 'wing-Y', 'imager-barrel']));
    expect(DEFAULT_BUS_MODEL.parts.length).toBe(raw.parts.length);
  });

  it('every problem is reported together, each with its field path and rule', () => {
    const bad = {
      format: 'something-else',
      version: 2,
      name: 7,
      boresightBody: [0, 0, 0],
      parts: [
        { name: '', shape: 'box', size: [1, -1, 1], center: [0, 0], color: 'red' },
        {
          name: 'tube',
          shape: 'cylinder',
          radius: 0,
          length: Number.NaN,
          axis: [0, 0, 0],
          center: [0, 0, 0],
          color: '#ffffff',
          metalness: 2,
        },
        { name: 'blob', shape: 'sphere', center: [0, 0, 0], color: '#000000' },
        42,
      ],
    };
    const r = parseBusModel(bad);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const got = r.errors.map((e) => `${e.path}|${e.rule}`);
    expect(got).toEqual(
      expect.arrayContaining([
        'format|format',
        'version|version',
        'name|string',
        'boresightBody|non-zero',
        'parts[0].name|string',
        'parts[0].center|vector3',
        'parts[0].color|hex-color',
        'parts[0].size[1]|positive',
        'parts[1].radius|positive',
        'parts[1].length|finite',
        'parts[1].axis|non-zero',
        'parts[1].metalness|range',
        'parts[2].shape|enum',
        'parts[3]|object',
      ]),
    );
    for (const e of r.errors) expect(e.message.length).toBeGreaterThan(10);
    expect(parseBusModel(null).ok).toBe(false);
    expect(parseBusModel({ ...raw, parts: [] }).ok).toBe(false);
  });

  it('builds one mesh per part; a cylinder’s axis lands on the declared body axis', () => {
    const g = buildBusGroup(DEFAULT_BUS_MODEL);
    expect(g.children.length).toBe(DEFAULT_BUS_MODEL.parts.length);
    const barrel = g.getObjectByName('imager-barrel') as Mesh;
    g.updateMatrixWorld(true);
    // CylinderGeometry runs along local +Y; after placement it must run along +Z_B.
    const axis = new Vector3(0, 1, 0).transformDirection(barrel.matrixWorld);
    expect(axis.z).toBeCloseTo(1, 12);
    const tracker = g.getObjectByName('star-tracker') as Mesh;
    const ta = new Vector3(0, 1, 0).transformDirection(tracker.matrixWorld);
    expect(ta.x).toBeCloseTo(-Math.SQRT1_2, 12);
    expect(ta.z).toBeCloseTo(Math.SQRT1_2, 12);
    const translucent = buildBusGroup(DEFAULT_BUS_MODEL, 0.3);
    const m = (translucent.children[0] as Mesh).material as Material;
    expect(m.transparent).toBe(true);
    expect(m.opacity).toBe(0.3);
  });
});

describe('layouts', () => {
  const runs = () => [syntheticViewRun(spec, 'A'), syntheticViewRun({ ...spec, omegaBody: [0, 0, 0.05] }, 'B')];

  it('single: one viewport with the first run; overlay: one viewport with both; side-by-side: one each', () => {
    const s = new AttitudeScene();
    s.setRuns(runs(), 'single');
    expect(s.viewports.map((v) => v.runs.map((r) => r.run.label))).toEqual([['A']]);
    s.setRuns(runs(), 'overlay');
    expect(s.viewports.map((v) => v.runs.map((r) => r.run.label))).toEqual([['A', 'B']]);
    s.setRuns(runs(), 'side-by-side');
    expect(s.viewports.map((v) => v.runs.map((r) => r.run.label))).toEqual([['A'], ['B']]);
    s.setRuns([], 'overlay');
    expect(s.viewports.length).toBe(0);
    s.setTime(3); // nothing to pose, no error
    s.dispose();
  });

  it('overlay: the second body is translucent with the chosen opacity, the first opaque', () => {
    const s = new AttitudeScene({ options: { overlayOpacity: 0.4 } });
    s.setRuns(runs(), 'overlay');
    const shown = s.viewports[0]!.runs;
    const a = shown[0]!,
      b = shown[1]!;
    const mat = (r: typeof a) => (r.bus.children[0] as Mesh).material as Material;
    expect(mat(a).transparent).toBe(false);
    expect(mat(b).opacity).toBe(0.4);
    expect(mat(b).transparent).toBe(true);
    // Both posed at the same time, each from its own trace.
    s.setTime(20);
    expect(a.body.quaternion.equals(b.body.quaternion)).toBe(false);
    s.dispose();
  });

  it('setRuns rebuilds: old geometries and materials are disposed, new ones posed at the current time', () => {
    const s = new AttitudeScene();
    s.setRuns(runs(), 'overlay');
    s.setTime(33);
    const disposed = new Set<unknown>();
    const old = s.viewports[0]!;
    old.scene.traverse((o) => {
      const m = o as Mesh;
      if (m.geometry) m.geometry.addEventListener('dispose', () => disposed.add(m.geometry));
      if (m.material) (m.material as Material).addEventListener('dispose', () => disposed.add(m.material));
    });
    const trailGeom: BufferGeometry = old.runs[0]!.trail.line.geometry;
    s.setRuns(runs(), 'side-by-side');
    expect(disposed.has(trailGeom)).toBe(true);
    expect(disposed.has((old.runs[1]!.bus.children[0] as Mesh).material)).toBe(true);
    expect(s.viewports[0]!.runs[0]!.cursor.i).toBe(66); // 33 s / 0.5 s
    s.dispose();
  });

  it('an empty run (no samples) is hidden rather than posed', () => {
    const s = new AttitudeScene();
    const r = syntheticViewRun({ ...spec, n: 0, jumpSamples: [] }, 'empty', []);
    s.setRuns([r], 'single');
    s.setTime(1);
    expect(s.viewports[0]!.runs[0]!.group.visible).toBe(false);
    expect(s.viewports[0]!.runs[0]!.momentum.group.visible).toBe(false);
    s.dispose();
  });
});

describe('options', () => {
  it('layer switches hide and show their objects', () => {
    const s = new AttitudeScene();
    s.setRuns([syntheticViewRun(spec)], 'single');
    const v = s.viewports[0]!;
    const rc = v.runs[0]!;
    s.setOptions({
      showInertialTriad: false,
      showSphere: false,
      showBody: false,
      showBodyTriad: false,
      showReference: false,
      showTrail: false,
      showJumpMarkers: false,
      showMomentum: false,
    });
    expect([
      v.common.inertialTriad.visible,
      v.common.sphere.visible,
      rc.bus.visible,
      rc.bodyTriad.visible,
      rc.referenceGhost!.visible,
    ]).toEqual([false, false, false, false, false]);
    expect([rc.trail.line.visible, rc.trail.head.visible, rc.trail.jumpMarkers.visible, rc.momentum.group.visible]).toEqual([
      false,
      false,
      false,
      false,
    ]);
    s.setOptions({ showTrail: true, showMomentum: true });
    expect([rc.trail.line.visible, rc.momentum.group.visible]).toEqual([true, true]);
    s.dispose();
  });
});

describe('shared geometry', () => {
  it('every wire-sphere vertex lies on the sphere', () => {
    const p = wireSpherePositions(SIZES.sphereRadius);
    for (let k = 0; k < p.length; k += 3) expect(Math.hypot(p[k]!, p[k + 1]!, p[k + 2]!)).toBeCloseTo(SIZES.sphereRadius, 5);
  });

  it('a keep-out cone’s rim is at the half angle from its axis, on the sphere; the fan starts at the apex', () => {
    const d = [0.3, -0.4, Math.sqrt(1 - 0.25)];
    const alpha = 0.4;
    const { fan, rim } = keepOutConePositions(d, alpha, 2, 24);
    for (let s = 0; s < 24; s++) {
      const x = rim[3 * s]!,
        y = rim[3 * s + 1]!,
        z = rim[3 * s + 2]!;
      expect(Math.hypot(x, y, z)).toBeCloseTo(2, 5);
      expect(Math.acos((x * d[0]! + y * d[1]! + z * d[2]!) / 2)).toBeCloseTo(alpha, 5);
    }
    expect([fan[0], fan[1], fan[2]]).toEqual([0, 0, 0]);
    expect(fan.length).toBe(3 * 25);
  });
});
