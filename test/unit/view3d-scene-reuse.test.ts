/**
 * The 3D run-set swap (issue 12, "edit → updated plots"): a new run set whose runs have the same
 * frame keys in the same layout keeps the viewports (buses, triads, HUD and their materials) and
 * rebuilds only each run's trail and momentum inset. Checks: the scene graph after the in-place
 * swap is the one a scene built afresh for the new runs has (every object's type, name,
 * visibility, world matrix, geometry data and draw range, instance matrices, material settings),
 * at several times; the kept parts are the same objects and the replaced ones are disposed; any
 * change of label, targets, reference ghost or layout builds anew (a cache miss).
 * (Plumbing, no outside source: the reference is the scene built from scratch; three.js computes
 * the world matrices of both.)
 */
import { describe, expect, it } from 'vitest';
import { BufferGeometry, InstancedMesh, type Material, type Mesh, type Object3D } from 'three';
import { AttitudeScene } from '../../app/view3d/attitudeScene';
import type { KeepOutCone, ViewLayout, ViewRun } from '../../app/view3d/types';
import type { SyntheticRunSpec } from './view3d-fixtures';
import { syntheticViewRun } from './view3d-fixtures';

const spec: SyntheticRunSpec = { n: 200, dt: 0.5, q0: [0, 0, 0, 1], omegaBody: [0.01, 0.02, 0.03], jumpSamples: [40], logicKind: 'sign' };
const before = (): ViewRun[] => [syntheticViewRun(spec, 'A'), syntheticViewRun({ ...spec, omegaBody: [0, 0, 0.05] }, 'B')];
// The "edited" runs: same labels and targets' labels, other data (length, rates, jumps, start attitude).
const after = (): ViewRun[] => [
  syntheticViewRun({ ...spec, n: 150, omegaBody: [0.03, -0.01, 0.02], jumpSamples: [20, 90] }, 'A'),
  syntheticViewRun({ ...spec, n: 260, q0: [0, 0, Math.SQRT1_2, Math.SQRT1_2], omegaBody: [0.02, 0, -0.04], jumpSamples: [] }, 'B'),
];
const cones: KeepOutCone[] = [{ label: 'sun', dirInertial: [1, 0, 0.2], halfAngleRad: 0.4 }];

/** Everything a render would read from one object subtree, in traversal order. */
function describeTree(root: Object3D): unknown[] {
  root.updateMatrixWorld(true);
  const out: unknown[] = [];
  root.traverse((o) => {
    const m = o as Partial<Mesh>;
    const g = m.geometry instanceof BufferGeometry ? m.geometry : null;
    const mats = m.material ? (Array.isArray(m.material) ? m.material : [m.material]) : [];
    out.push({
      type: o.type,
      name: o.name,
      visible: o.visible,
      world: Array.from(o.matrixWorld.elements),
      geometry: g && {
        drawRange: { ...g.drawRange },
        attributes: Object.fromEntries(Object.entries(g.attributes).map(([k, a]) => [k, Array.from(a.array as ArrayLike<number>)])),
      },
      instances: o instanceof InstancedMesh ? { count: o.count, m: Array.from(o.instanceMatrix.array.slice(0, 16 * o.count)) } : null,
      materials: (mats as Material[]).map((x) => {
        const c = (x as unknown as { color?: { getHex(): number } }).color;
        return { type: x.type, opacity: x.opacity, transparent: x.transparent, depthWrite: x.depthWrite, color: c?.getHex() ?? null };
      }),
    });
  });
  return out;
}

function describeScene(s: AttitudeScene): unknown {
  return s.viewports.map((v) => ({
    scene: describeTree(v.scene),
    momentum: describeTree(v.momentumScene),
    hud: describeTree(v.hudScene),
    runs: v.runs.map((r) => ({ label: r.run.label, cursor: { ...r.cursor }, active: r.activeTarget, q: Array.from(r.qNow) })),
  }));
}

function busMaterial(s: AttitudeScene, viewport = 0, run = 0): unknown {
  return (s.viewports[viewport]!.runs[run]!.bus.children[0] as Mesh).material;
}

describe('3D run-set swap in place', () => {
  for (const layout of ['overlay', 'side-by-side', 'single'] as ViewLayout[]) {
    it(`${layout}: the swapped scene equals a scene built afresh for the new runs, at every time tried`, () => {
      const reused = new AttitudeScene();
      reused.setOptions({ keepOut: cones });
      reused.setRuns(before(), layout);
      reused.setTime(33);
      const kept = busMaterial(reused);
      const oldTrail = reused.viewports[0]!.runs[0]!.trail.line.geometry;
      let oldTrailDisposed = false;
      oldTrail.addEventListener('dispose', () => (oldTrailDisposed = true));
      reused.setRuns(after(), layout);

      const fresh = new AttitudeScene();
      fresh.setOptions({ keepOut: cones });
      fresh.setTime(33);
      fresh.setRuns(after(), layout);

      expect(busMaterial(reused)).toBe(kept); // the frame parts were reused …
      expect(oldTrailDisposed).toBe(true); // … the old data parts freed (no deferred disposal in Node)
      for (const t of [33, 0, 12.25, 74.9, 1000, 20]) {
        reused.setTime(t);
        fresh.setTime(t);
        expect(describeScene(reused)).toEqual(describeScene(fresh));
      }
      reused.dispose();
      fresh.dispose();
    });
  }

  it('a run with the same data (same trace and vehicle objects, equal jumps and targets) keeps its trail; a changed run gets a new one', () => {
    const first = before();
    const s = new AttitudeScene();
    s.setRuns(first, 'overlay');
    s.setTime(20);
    const trailA = s.viewports[0]!.runs[0]!.trail;
    const trailB = s.viewports[0]!.runs[1]!.trail;
    // As the app gives it after another law's edit: new ViewRun objects, the same trace and vehicle
    // arrays, jumps and targets copied; run B changed.
    const copy = (r: ViewRun): ViewRun => ({
      ...r,
      jumps: r.jumps.map((j) => ({ ...j })),
      targets: r.targets.map((t) => ({ ...t, q: t.q.slice() })),
    });
    const next = [copy(first[0]!), after()[1]!];
    s.setRuns(next, 'overlay');
    expect(s.viewports[0]!.runs[0]!.trail).toBe(trailA);
    expect(s.viewports[0]!.runs[1]!.trail).not.toBe(trailB);
    const fresh = new AttitudeScene();
    fresh.setRuns(next, 'overlay');
    for (const t of [20, 0, 47.5, 99]) {
      s.setTime(t);
      fresh.setTime(t);
      expect(describeScene(s)).toEqual(describeScene(fresh));
    }
    // A jump that differs, or a trace that is another object with the same values, is rebuilt.
    const jumped = copy(next[0]!);
    jumped.jumps = jumped.jumps.map((j) => ({ ...j, t: j.t + 0.5 }));
    s.setRuns([jumped, next[1]!], 'overlay');
    expect(s.viewports[0]!.runs[0]!.trail).not.toBe(trailA);
    const trailA2 = s.viewports[0]!.runs[0]!.trail;
    s.setRuns([{ ...jumped, trace: { ...jumped.trace } }, next[1]!], 'overlay');
    expect(s.viewports[0]!.runs[0]!.trail).not.toBe(trailA2);
    s.dispose();
    fresh.dispose();
  });

  it('with deferred disposal the replaced parts are freed only at flushDisposals', () => {
    const s = new AttitudeScene();
    s.deferDisposal = true;
    s.setRuns(before(), 'overlay');
    const g = s.viewports[0]!.runs[1]!.trail.line.geometry;
    let disposed = false;
    g.addEventListener('dispose', () => (disposed = true));
    s.setRuns(after(), 'overlay');
    expect(disposed).toBe(false);
    s.flushDisposals();
    expect(disposed).toBe(true);
    s.dispose();
  });

  const misses: [string, () => ViewRun[], ViewLayout][] = [
    ['a run renamed', () => [after()[0]!, { ...after()[1]!, label: 'C' }], 'overlay'],
    [
      'a target renamed',
      () => [{ ...after()[0]!, targets: after()[0]!.targets.map((t, i) => ({ ...t, label: `T${i}` })) }, after()[1]!],
      'overlay',
    ],
    ['a target fewer', () => [{ ...after()[0]!, targets: after()[0]!.targets.slice(0, 1) }, after()[1]!], 'overlay'],
    ['no reference ghost', () => [{ ...after()[0]!, hasReference: false }, after()[1]!], 'overlay'],
    ['one run fewer', () => after().slice(0, 1), 'overlay'],
    ['the runs swapped', () => after().reverse(), 'overlay'],
    ['another layout', after, 'side-by-side'],
  ];
  for (const [what, next, layout] of misses) {
    it(`${what}: built anew, equal to a fresh scene`, () => {
      const s = new AttitudeScene();
      s.setRuns(before(), 'overlay');
      const kept = busMaterial(s);
      s.setRuns(next(), layout);
      expect(busMaterial(s)).not.toBe(kept);
      const fresh = new AttitudeScene();
      fresh.setRuns(next(), layout);
      s.setTime(40);
      fresh.setTime(40);
      expect(describeScene(s)).toEqual(describeScene(fresh));
      s.dispose();
      fresh.dispose();
    });
  }
});
