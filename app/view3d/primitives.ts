/**
 * Small building blocks: shared geometries, an arrow that can be re-aimed and re-sized in place
 * (no allocation), a labelled triad, and a disposer for whole subtrees.
 */
import {
  ConeGeometry,
  CylinderGeometry,
  Group,
  type Material,
  Mesh,
  MeshBasicMaterial,
  type Object3D,
  OctahedronGeometry,
  SphereGeometry,
  Texture,
  Vector3,
  type BufferGeometry,
} from 'three';
import type { LabelFactory } from './labels';
import { COLORS } from './style';

/** Geometries shared by every arrow and marker of one view (disposed with the view). */
export interface Kit {
  shaft: CylinderGeometry;
  head: ConeGeometry;
  dot: SphereGeometry;
  diamond: OctahedronGeometry;
  labels: LabelFactory | null;
}

export function createKit(labels: LabelFactory | null): Kit {
  // Unit-height pieces with their base at the origin, growing along +Y; arrows scale them.
  const shaft = new CylinderGeometry(1, 1, 1, 12, 1);
  shaft.translate(0, 0.5, 0);
  const head = new ConeGeometry(1, 1, 16, 1);
  head.translate(0, 0.5, 0);
  return { shaft, head, dot: new SphereGeometry(1, 12, 8), diamond: new OctahedronGeometry(1, 0), labels };
}

export function disposeKit(kit: Kit): void {
  kit.shaft.dispose();
  kit.head.dispose();
  kit.dot.dispose();
  kit.diamond.dispose();
}

const UP = new Vector3(0, 1, 0);

export interface ArrowStyle {
  color: number;
  opacity?: number;
  /** Shaft radius (scene units). */
  radius?: number;
}

/** An arrow from its parent's origin; `set` re-aims and re-sizes it without allocating. */
export class VectorArrow extends Group {
  readonly material: MeshBasicMaterial;
  /** Current length (scene units) and unit direction (parent frame), as last set. */
  length = 0;
  readonly direction = new Vector3(0, 1, 0);
  private readonly shaft: Mesh;
  private readonly head: Mesh;
  private readonly radius: number;

  constructor(kit: Kit, style: ArrowStyle) {
    super();
    const opacity = style.opacity ?? 1;
    this.material = new MeshBasicMaterial({ color: style.color, transparent: opacity < 1, opacity, depthWrite: opacity >= 1 });
    this.radius = style.radius ?? 0.012;
    this.shaft = new Mesh(kit.shaft, this.material);
    this.head = new Mesh(kit.head, this.material);
    this.add(this.shaft, this.head);
  }

  /** Aim along (x, y, z) (any length > 0) with total length `length`; hides itself at length 0. */
  set(x: number, y: number, z: number, length: number): void {
    const n = Math.hypot(x, y, z);
    if (!(n > 0) || !(length > 1e-9)) {
      this.visible = false;
      this.length = 0;
      return;
    }
    this.visible = true;
    this.length = length;
    this.direction.set(x / n, y / n, z / n);
    this.quaternion.setFromUnitVectors(UP, this.direction);
    const headLen = Math.min(this.radius * 7, length * 0.35);
    const headR = this.radius * 2.6;
    this.shaft.scale.set(this.radius, Math.max(length - headLen, 1e-6), this.radius);
    this.head.position.set(0, length - headLen, 0);
    this.head.scale.set(headR, headLen, headR);
  }
}

export interface TriadStyle {
  length: number;
  opacity?: number;
  radius?: number;
  /** Axis-label suffix, e.g. 'I' → X_I, Y_I, Z_I; null for no axis labels. */
  suffix: string | null;
  /** Optional tag label placed beyond the tip of +X. */
  tag?: string;
  tagColor?: string;
  /**
   * Screen rows the tag is shifted by from its point (positive: down, negative: up; default 0).
   * Triads that coincide — body, reference and target once the slew has converged, or overlaid
   * runs — would otherwise draw their tags and the X axis label on top of each other.
   */
  tagRow?: number;
  colors?: readonly [number, number, number];
  /** Label height as a fraction of the viewport height (default SIZES.labelHeight). */
  labelHeight?: number;
}

/** Three arrows along the local X, Y, Z axes, with labels. */
export class Triad extends Group {
  readonly arrows: [VectorArrow, VectorArrow, VectorArrow];

  constructor(kit: Kit, style: TriadStyle) {
    super();
    const colors = style.colors ?? [COLORS.axisX, COLORS.axisY, COLORS.axisZ];
    const arrows = [0, 1, 2].map((a) => {
      const arrow = new VectorArrow(kit, { color: colors[a]!, opacity: style.opacity, radius: style.radius });
      arrow.set(a === 0 ? 1 : 0, a === 1 ? 1 : 0, a === 2 ? 1 : 0, style.length);
      this.add(arrow);
      return arrow;
    });
    this.arrows = arrows as [VectorArrow, VectorArrow, VectorArrow];
    if (kit.labels && style.suffix !== null) {
      const names = ['X', 'Y', 'Z'];
      for (let a = 0; a < 3; a++) {
        const lab = kit.labels(`${names[a]}_${style.suffix}`, { color: cssHex(colors[a]!), heightFraction: style.labelHeight });
        lab.position.set(a === 0 ? 1 : 0, a === 1 ? 1 : 0, a === 2 ? 1 : 0).multiplyScalar(style.length * 1.08);
        this.add(lab);
      }
    }
    if (kit.labels && style.tag) {
      // Row pitch 1.15 label heights: one row clears the X axis label (heightFraction 0.045).
      const lab = kit.labels(style.tag, {
        color: style.tagColor ?? COLORS.label,
        anchorX: 0,
        anchorY: 0.5 + 1.15 * (style.tagRow ?? 0),
        heightFraction: 0.036,
      });
      lab.position.set(style.length * 1.1, 0, style.length * 0.12);
      this.add(lab);
    }
  }
}

export function cssHex(hex: number): string {
  return `#${hex.toString(16).padStart(6, '0')}`;
}

/** A small marker mesh (sphere or diamond) for instancing. */
export function markerGeometry(kit: Kit, shape: 'dot' | 'diamond'): BufferGeometry {
  return shape === 'dot' ? kit.dot : kit.diamond;
}

/**
 * Dispose the materials, textures and non-shared geometries under `root`. Shared kit geometries
 * are skipped (they go with disposeKit).
 */
export function disposeTree(root: Object3D, kit: Kit | null): void {
  const shared = new Set<BufferGeometry>(kit ? [kit.shaft, kit.head, kit.dot, kit.diamond] : []);
  root.traverse((o) => {
    const m = o as Partial<Mesh>;
    if (m.geometry && !shared.has(m.geometry)) m.geometry.dispose();
    const mats = m.material ? (Array.isArray(m.material) ? m.material : [m.material]) : [];
    for (const mat of mats as Material[]) {
      for (const v of Object.values(mat)) if (v instanceof Texture) v.dispose();
      mat.dispose();
    }
  });
}
