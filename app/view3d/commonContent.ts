/**
 * Content every inertial viewport shares, whatever the runs: lights, the inertial triad
 * (X_I, Y_I, Z_I), the faint wire sphere the trail lies on (meridians and parallels every 30°,
 * poles on Z_I) and the keep-out cones.
 */
import {
  AmbientLight,
  BufferAttribute,
  BufferGeometry,
  DirectionalLight,
  DoubleSide,
  Group,
  HemisphereLight,
  LineBasicMaterial,
  LineLoop,
  LineSegments,
  Mesh,
  MeshBasicMaterial,
} from 'three';
import type { Kit } from './primitives';
import { cssHex, disposeTree, Triad } from './primitives';
import { COLORS, SIZES } from './style';
import { unitAxis } from './trailMath';
import type { KeepOutCone } from './types';
import { RAD_PER_DEG } from '../engine/units';

/** Wire sphere as line segments: 12 meridians and parallels at ±30°, ±60° and the equator. */
export function wireSpherePositions(radius: number, seg = 72): Float32Array {
  const lines: number[] = [];
  const push = (a: number[], b: number[]) => lines.push(a[0]!, a[1]!, a[2]!, b[0]!, b[1]!, b[2]!);
  for (let m = 0; m < 12; m++) {
    const lon = (m * Math.PI) / 6;
    for (let s = 0; s < seg / 2; s++) {
      const l0 = -Math.PI / 2 + (Math.PI * s) / (seg / 2),
        l1 = -Math.PI / 2 + (Math.PI * (s + 1)) / (seg / 2);
      push(
        [radius * Math.cos(l0) * Math.cos(lon), radius * Math.cos(l0) * Math.sin(lon), radius * Math.sin(l0)],
        [radius * Math.cos(l1) * Math.cos(lon), radius * Math.cos(l1) * Math.sin(lon), radius * Math.sin(l1)],
      );
    }
  }
  for (const latDeg of [-60, -30, 0, 30, 60]) {
    const lat = latDeg * RAD_PER_DEG,
      r = radius * Math.cos(lat),
      z = radius * Math.sin(lat);
    for (let s = 0; s < seg; s++) {
      const a0 = (2 * Math.PI * s) / seg,
        a1 = (2 * Math.PI * (s + 1)) / seg;
      push([r * Math.cos(a0), r * Math.sin(a0), z], [r * Math.cos(a1), r * Math.sin(a1), z]);
    }
  }
  return Float32Array.from(lines);
}

/**
 * A keep-out cone: apex at the origin, axis `dir` (unit), half angle α, out to `radius`, as a
 * triangle fan (positions 3·(1+seg), the apex first) and its rim circle on the sphere.
 */
export function keepOutConePositions(
  dir: ArrayLike<number>,
  halfAngleRad: number,
  radius: number,
  seg = 48,
): { fan: Float32Array; rim: Float32Array } {
  // Orthonormal e1, e2 ⊥ dir.
  const dx = dir[0]!,
    dy = dir[1]!,
    dz = dir[2]!;
  let ex = Math.abs(dx) < 0.9 ? 1 : 0,
    ey = ex ? 0 : 1,
    ez = 0;
  const d = ex * dx + ey * dy;
  ex -= d * dx;
  ey -= d * dy;
  ez -= d * dz;
  const ne = Math.hypot(ex, ey, ez);
  ex /= ne;
  ey /= ne;
  ez /= ne;
  const fx = dy * ez - dz * ey,
    fy = dz * ex - dx * ez,
    fz = dx * ey - dy * ex;
  const ca = Math.cos(halfAngleRad),
    sa = Math.sin(halfAngleRad);
  const rim = new Float32Array(3 * seg);
  for (let s = 0; s < seg; s++) {
    const ph = (2 * Math.PI * s) / seg,
      c = Math.cos(ph),
      sn = Math.sin(ph);
    rim[3 * s] = radius * (ca * dx + sa * (c * ex + sn * fx));
    rim[3 * s + 1] = radius * (ca * dy + sa * (c * ey + sn * fy));
    rim[3 * s + 2] = radius * (ca * dz + sa * (c * ez + sn * fz));
  }
  const fan = new Float32Array(3 * (seg + 1));
  fan.set(rim, 3);
  return { fan, rim };
}

export class CommonContent {
  readonly group = new Group();
  readonly inertialTriad: Triad;
  readonly sphere: LineSegments;
  readonly keepOut = new Group();
  private readonly kit: Kit;
  private cones: readonly KeepOutCone[] | null = null;

  constructor(kit: Kit) {
    this.kit = kit;
    this.group.name = 'common';
    const hemi = new HemisphereLight(0xdde6f0, 0x202830, 1.4);
    hemi.position.set(0, 0, 1); // sky along Z_I (the scene's up)
    const sun = new DirectionalLight(0xffffff, 2.2);
    sun.position.set(3, -2, 4);
    this.group.add(hemi, sun, new AmbientLight(0xffffff, 0.25));

    this.inertialTriad = new Triad(kit, { length: SIZES.inertialTriad, suffix: 'I', radius: 0.008, opacity: 0.75 });
    this.inertialTriad.name = 'inertial-triad';
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(wireSpherePositions(SIZES.sphereRadius), 3));
    this.sphere = new LineSegments(g, new LineBasicMaterial({ color: COLORS.sphere, transparent: true, opacity: 0.45, depthWrite: false }));
    this.sphere.name = 'wire-sphere';
    this.keepOut.name = 'keep-out';
    this.group.add(this.inertialTriad, this.sphere, this.keepOut);
  }

  /** Rebuild the cones when the list changes (compared by identity: the scene copies option lists). */
  setKeepOut(cones: readonly KeepOutCone[]): void {
    if (cones === this.cones) return;
    this.cones = cones;
    disposeTree(this.keepOut, this.kit);
    this.keepOut.clear();
    const R = SIZES.sphereRadius;
    const dir = new Float64Array(3);
    for (const c of cones) {
      if (!unitAxis(dir, c.dirInertial) || !(c.halfAngleRad > 0)) continue;
      const seg = 48;
      const color = c.violated === false ? COLORS.constraintClear : COLORS.keepOut;
      const { fan, rim } = keepOutConePositions(dir, Math.min(c.halfAngleRad, Math.PI / 2), R, seg);
      const fg = new BufferGeometry();
      fg.setAttribute('position', new BufferAttribute(fan, 3));
      const idx: number[] = [];
      for (let s = 0; s < seg; s++) idx.push(0, 1 + s, 1 + ((s + 1) % seg));
      fg.setIndex(idx);
      const surface = new Mesh(
        fg,
        new MeshBasicMaterial({ color, transparent: true, opacity: c.violated ? 0.22 : 0.1, side: DoubleSide, depthWrite: false }),
      );
      surface.name = `keep-out:${c.label}${c.violated === undefined ? '' : c.violated ? ':violated' : ':clear'}`;
      const rg = new BufferGeometry();
      rg.setAttribute('position', new BufferAttribute(rim, 3));
      const ring = new LineLoop(rg, new LineBasicMaterial({ color, transparent: true, opacity: 0.85 }));
      this.keepOut.add(surface, ring);
      if (this.kit.labels) {
        const lab = this.kit.labels(c.violated ? `${c.label} (violated)` : c.label, { color: cssHex(color), heightFraction: 0.036 });
        lab.position.set(dir[0]!, dir[1]!, dir[2]).multiplyScalar(R * 1.08);
        this.keepOut.add(lab);
      }
    }
  }

  setVisibility(triad: boolean, sphere: boolean, keepOut: boolean): void {
    this.inertialTriad.visible = triad;
    this.sphere.visible = sphere;
    this.keepOut.visible = keepOut;
  }

  dispose(): void {
    disposeTree(this.group, this.kit);
  }
}
