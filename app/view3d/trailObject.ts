/**
 * One run's boresight trail on the sphere (inertial frame): the path of the chosen body axis for
 * the whole run, preallocated and coloured by the logic value once, revealed by drawRange; a short
 * head segment from the last sample to the interpolated current direction; a marker at every
 * jump; for the active segment, the shortest great-circle arc from the segment's start direction
 * to the target direction (so unwinding — going the long way round — is visible); and markers
 * where the path enters a keep-out cone.
 */
import {
  BufferAttribute,
  BufferGeometry,
  Color,
  Group,
  InstancedMesh,
  Line,
  LineBasicMaterial,
  Matrix4,
  Mesh,
  MeshBasicMaterial,
  Quaternion,
  Vector3,
} from 'three';
import { qRotate } from '../engine/math/rotation';
import type { Kit } from './primitives';
import { markerGeometry } from './primitives';
import type { SampleCursor } from './sampling';
import { countUpTo } from './sampling';
import { COLORS, logicColorHex, SIZES } from './style';
import {
  boresightPath,
  firstSampleAtOrAfter,
  greatCircleArc,
  jumpMarkerDirections,
  keepOutEntries,
  trailColors,
  unitAxis,
} from './trailMath';
import { NO_KEEP_OUT } from './types';
import type { KeepOutCone, ViewRun } from './types';

const ARC_POINTS = 64;

const sColor = new Color();
const sMat = new Matrix4();
const sPos = new Vector3();
const sScale = new Vector3();
const IDENTITY_Q = new Quaternion();
const sDir = new Float64Array(3);

export interface TrailStyle {
  /** 1 for the first run; lower for overlaid runs. */
  opacity: number;
  marker: 'dot' | 'diamond';
  sphereRadius: number;
}

export class TrailObject {
  readonly group = new Group();
  /** Unit inertial direction of the boresight at every sample (the line's position array). */
  readonly path: Float32Array;
  readonly colors: Float32Array;
  readonly line: Line;
  readonly head: Line;
  readonly jumpMarkers: InstancedMesh;
  /** Sample indices (sorted) where the path enters a keep-out cone; markers in the same order. */
  entrySamples = new Float64Array(0);
  entryMarkers: InstancedMesh | null = null;
  /** One arc per target (null where the segment has no samples). */
  readonly arcs: (Line | null)[] = [];
  readonly axis = new Float64Array([0, 0, 1]);

  private readonly run: ViewRun;
  private readonly kit: Kit;
  private readonly style: TrailStyle;
  private readonly jumpTimes: Float64Array;
  private readonly jumpDirs: Float64Array;
  private readonly headPos: Float32Array;
  private readonly headCol: Float32Array;
  private readonly arcGroup = new Group();
  private readonly entryGroup = new Group();
  private readonly arcMaterial: LineBasicMaterial;
  private readonly arcEndMaterial: MeshBasicMaterial;
  private keepOut: readonly KeepOutCone[] = NO_KEEP_OUT;
  private activeArc = -1;

  constructor(kit: Kit, run: ViewRun, axisBody: ArrayLike<number>, style: TrailStyle) {
    this.run = run;
    this.kit = kit;
    this.style = style;
    const n = run.trace.n;
    const R = style.sphereRadius;
    this.group.name = `trail:${run.label}`;
    const transparent = style.opacity < 1;

    this.path = new Float32Array(3 * Math.max(n, 1));
    this.colors = new Float32Array(3 * Math.max(n, 1));
    const kind = run.logicKind;
    trailColors(this.colors, run.trace.logic, n, (v, rgb) => {
      sColor.setHex(logicColorHex(kind, v));
      rgb[0] = sColor.r;
      rgb[1] = sColor.g;
      rgb[2] = sColor.b;
    });
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(this.path, 3));
    g.setAttribute('color', new BufferAttribute(this.colors, 3));
    g.setDrawRange(0, 0);
    this.line = new Line(g, new LineBasicMaterial({ vertexColors: true, transparent, opacity: style.opacity }));
    this.line.scale.setScalar(R);
    this.line.frustumCulled = false;
    this.line.name = 'trail-line';

    this.headPos = new Float32Array(6);
    this.headCol = new Float32Array(6);
    const hg = new BufferGeometry();
    hg.setAttribute('position', new BufferAttribute(this.headPos, 3));
    hg.setAttribute('color', new BufferAttribute(this.headCol, 3));
    this.head = new Line(hg, new LineBasicMaterial({ vertexColors: true, transparent, opacity: style.opacity }));
    this.head.scale.setScalar(R);
    this.head.frustumCulled = false;
    this.head.name = 'trail-head';

    const m = run.jumps.length;
    this.jumpTimes = Float64Array.from(run.jumps, (jp) => jp.t);
    this.jumpDirs = new Float64Array(3 * m);
    this.jumpMarkers = new InstancedMesh(
      markerGeometry(kit, style.marker),
      new MeshBasicMaterial({ color: COLORS.jumpMarker, transparent, opacity: style.opacity }),
      Math.max(m, 1),
    );
    this.jumpMarkers.count = 0;
    this.jumpMarkers.frustumCulled = false;
    this.jumpMarkers.name = 'jump-markers';

    this.arcMaterial = new LineBasicMaterial({
      color: COLORS.greatCircle,
      transparent: true,
      opacity: 0.55 * style.opacity,
      depthWrite: false,
    });
    this.arcEndMaterial = new MeshBasicMaterial({ color: COLORS.greatCircle, transparent: true, opacity: 0.8 * style.opacity });

    this.group.add(this.line, this.head, this.jumpMarkers, this.arcGroup, this.entryGroup);
    this.setAxis(axisBody);
  }

  /** Recompute everything that depends on the body axis (not a per-frame call). */
  setAxis(axisBody: ArrayLike<number>): void {
    if (!unitAxis(this.axis, axisBody)) return;
    const tr = this.run.trace,
      R = this.style.sphereRadius;
    boresightPath(this.path, tr.q, tr.n, this.axis);
    (this.line.geometry.getAttribute('position') as BufferAttribute).needsUpdate = true;
    this.line.geometry.computeBoundingSphere();

    jumpMarkerDirections(this.jumpDirs, this.run.jumps, tr, this.axis);
    sScale.setScalar(SIZES.jumpMarker);
    for (let k = 0; k < this.run.jumps.length; k++) {
      sPos.set(this.jumpDirs[3 * k]!, this.jumpDirs[3 * k + 1]!, this.jumpDirs[3 * k + 2]).multiplyScalar(R);
      this.jumpMarkers.setMatrixAt(k, sMat.compose(sPos, IDENTITY_Q, sScale));
    }
    this.jumpMarkers.instanceMatrix.needsUpdate = true;

    this.buildArcs();
    this.setKeepOut(this.keepOut, true);
  }

  private buildArcs(): void {
    for (const a of this.arcs) if (a) a.geometry.dispose();
    this.arcGroup.clear();
    this.arcs.length = 0;
    const tr = this.run.trace,
      R = this.style.sphereRadius;
    const mat = this.arcMaterial,
      endMat = this.arcEndMaterial;
    for (const tg of this.run.targets) {
      const k0 = firstSampleAtOrAfter(tr.t, tr.n, tg.tStart);
      if (k0 >= tr.n) {
        this.arcs.push(null);
        continue;
      }
      qRotate(sDir, tg.q, this.axis);
      const pts = new Float32Array(3 * ARC_POINTS);
      greatCircleArc(pts, 0, this.path.subarray(3 * k0, 3 * k0 + 3), sDir, ARC_POINTS);
      const geom = new BufferGeometry();
      geom.setAttribute('position', new BufferAttribute(pts, 3));
      const arc = new Line(geom, mat);
      arc.scale.setScalar(R);
      arc.name = `great-circle:${tg.label}`;
      // A small ring-like dot at the target direction.
      const end = new Mesh(this.kit.dot, endMat);
      end.position.set(sDir[0]!, sDir[1]!, sDir[2]);
      end.scale.setScalar((SIZES.jumpMarker * 0.9) / R);
      arc.add(end);
      arc.visible = false;
      this.arcs.push(arc);
      this.arcGroup.add(arc);
    }
    this.activeArc = -1;
  }

  /** Recompute keep-out entry markers for the current path (when the list or, with force, the path changed). */
  setKeepOut(cones: readonly KeepOutCone[], force = false): void {
    if (cones === this.keepOut && !force) return;
    this.keepOut = cones;
    if (this.entryMarkers) {
      this.entryGroup.remove(this.entryMarkers);
      (this.entryMarkers.material as MeshBasicMaterial).dispose();
      this.entryMarkers.dispose();
      this.entryMarkers = null;
    }
    const idx: number[] = [];
    const n = this.run.trace.n;
    for (const c of cones) {
      if (!unitAxis(sDir, c.dirInertial) || !(c.halfAngleRad > 0)) continue;
      for (const k of keepOutEntries(this.path, n, sDir, c.halfAngleRad)) idx.push(k);
    }
    idx.sort((a, b) => a - b);
    this.entrySamples = Float64Array.from(idx);
    if (idx.length === 0) return;
    const R = this.style.sphereRadius;
    const im = new InstancedMesh(
      markerGeometry(this.kit, 'diamond'),
      new MeshBasicMaterial({ color: COLORS.keepOutEntry, transparent: this.style.opacity < 1, opacity: this.style.opacity }),
      idx.length,
    );
    sScale.setScalar(SIZES.keepOutEntryMarker);
    idx.forEach((k, m) => {
      sPos.set(this.path[3 * k]!, this.path[3 * k + 1]!, this.path[3 * k + 2]).multiplyScalar(R);
      im.setMatrixAt(m, sMat.compose(sPos, IDENTITY_Q, sScale));
    });
    im.count = 0;
    im.frustumCulled = false;
    im.name = 'keep-out-entries';
    this.entryMarkers = im;
    this.entryGroup.add(im);
  }

  /**
   * Reveal the trail up to the cursor. `qNow` is the interpolated attitude at `time`.
   * Allocation-free: drawRange, six head floats, instance counts, visibility flags.
   */
  update(c: SampleCursor, qNow: ArrayLike<number>, time: number, activeTarget: number): void {
    if (c.i < 0) {
      this.group.visible = false;
      return;
    }
    this.group.visible = true;
    this.line.geometry.setDrawRange(0, c.i + 1);
    const p = this.path,
      hp = this.headPos,
      hc = this.headCol,
      col = this.colors,
      i3 = 3 * c.i;
    qRotate(sDir, qNow, this.axis);
    hp[0] = p[i3]!;
    hp[1] = p[i3 + 1]!;
    hp[2] = p[i3 + 2]!;
    hp[3] = sDir[0]!;
    hp[4] = sDir[1]!;
    hp[5] = sDir[2]!;
    hc[0] = hc[3] = col[i3]!;
    hc[1] = hc[4] = col[i3 + 1]!;
    hc[2] = hc[5] = col[i3 + 2]!;
    (this.head.geometry.attributes.position as BufferAttribute).needsUpdate = true;
    (this.head.geometry.attributes.color as BufferAttribute).needsUpdate = true;

    this.jumpMarkers.count = countUpTo(this.jumpTimes, this.jumpTimes.length, time);
    if (this.entryMarkers) this.entryMarkers.count = countUpTo(this.entrySamples, this.entrySamples.length, c.i);

    if (activeTarget !== this.activeArc) {
      if (this.activeArc >= 0 && this.arcs[this.activeArc]) this.arcs[this.activeArc]!.visible = false;
      if (activeTarget >= 0 && this.arcs[activeTarget]) this.arcs[activeTarget]!.visible = true;
      this.activeArc = activeTarget;
    }
  }

  /** Show or hide the parts (called from setOptions). */
  setVisibility(trail: boolean, jumps: boolean, arcs: boolean, entries: boolean): void {
    this.line.visible = trail;
    this.head.visible = trail;
    this.jumpMarkers.visible = jumps;
    this.arcGroup.visible = arcs;
    this.entryGroup.visible = entries;
  }

  dispose(): void {
    this.line.geometry.dispose();
    (this.line.material as LineBasicMaterial).dispose();
    this.head.geometry.dispose();
    (this.head.material as LineBasicMaterial).dispose();
    (this.jumpMarkers.material as MeshBasicMaterial).dispose();
    this.jumpMarkers.dispose();
    for (const a of this.arcs) if (a) a.geometry.dispose();
    this.arcMaterial.dispose();
    this.arcEndMaterial.dispose();
    this.setKeepOut(NO_KEEP_OUT, true);
  }
}
