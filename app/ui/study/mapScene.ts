/**
 * The outcome map's three.js scene: the rotation-vector ball (mapModel.ts) on a dark canvas, with
 * the 180° sphere drawn as latitude/longitude lines, the 90° shell as three great circles, the
 * target axes as a labelled triad (the error axes are in target axes), and the cases as two point
 * clouds (filled discs for η₀ ≥ 0, rings for η₀ < 0). Orbit camera, Z up; renders on demand.
 * Reuses the 3D view's building blocks (app/view3d: triad, labels, Z-up camera, disposal).
 */
import {
  BufferAttribute,
  BufferGeometry,
  CanvasTexture,
  Color,
  Group,
  LineBasicMaterial,
  LineSegments,
  PerspectiveCamera,
  Points,
  PointsMaterial,
  SRGBColorSpace,
  Scene,
  Vector3,
  WebGLRenderer,
} from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import { setInertialZUp } from '../../view3d/adapter';
import { canvasLabelFactory } from '../../view3d/labels';
import { Triad, createKit, disposeKit, disposeTree } from '../../view3d/primitives';
import { CAMERA_FOV_DEG } from '../../view3d/style';
import type { MapGeometry } from './mapModel';
import { RAD_PER_DEG } from '../../engine/units';

export interface OutcomeMapView {
  readonly renderer: WebGLRenderer;
  setData(g: MapGeometry): void;
  resize(width: number, height: number): void;
  render(): void;
  resetCamera(): void;
  /** The point nearest to canvas-relative CSS pixel (x, y) within `radiusPx`, or −1. */
  pick(x: number, y: number, radiusPx?: number): number;
  /** Points drawn (filled, hollow). */
  stats(): { filled: number; hollow: number };
  dispose(): void;
}

const HOME = new Vector3(2.65, 1.95, 1.45);
const BG = 0x0b0f14;
const POINT_PX = 11;

/** Circle, latitude and meridian lines of radius r as line-segment pairs. */
function sphereLines(r: number, latStepDeg: number, lonStepDeg: number, segments = 96): Float32Array {
  const out: number[] = [];
  const push = (a: number[], b: number[]) => out.push(a[0]!, a[1]!, a[2]!, b[0]!, b[1]!, b[2]!);
  for (let lat = -90 + latStepDeg; lat < 90 - 1e-9; lat += latStepDeg) {
    const phi = lat * RAD_PER_DEG;
    const z = r * Math.sin(phi);
    const rr = r * Math.cos(phi);
    for (let k = 0; k < segments; k++) {
      const a0 = (2 * Math.PI * k) / segments;
      const a1 = (2 * Math.PI * (k + 1)) / segments;
      push([rr * Math.cos(a0), rr * Math.sin(a0), z], [rr * Math.cos(a1), rr * Math.sin(a1), z]);
    }
  }
  for (let lon = 0; lon < 180 - 1e-9; lon += lonStepDeg) {
    const l = lon * RAD_PER_DEG;
    for (let k = 0; k < segments; k++) {
      const a0 = (2 * Math.PI * k) / segments;
      const a1 = (2 * Math.PI * (k + 1)) / segments;
      push(
        [r * Math.cos(a0) * Math.cos(l), r * Math.cos(a0) * Math.sin(l), r * Math.sin(a0)],
        [r * Math.cos(a1) * Math.cos(l), r * Math.cos(a1) * Math.sin(l), r * Math.sin(a1)],
      );
    }
  }
  return Float32Array.from(out);
}

/** The three coordinate great circles of radius r. */
function greatCircles(r: number, segments = 96): Float32Array {
  const out: number[] = [];
  for (let plane = 0; plane < 3; plane++) {
    for (let k = 0; k < segments; k++) {
      for (const kk of [k, k + 1]) {
        const a = (2 * Math.PI * kk) / segments;
        const u = r * Math.cos(a);
        const v = r * Math.sin(a);
        out.push(...(plane === 0 ? [u, v, 0] : plane === 1 ? [u, 0, v] : [0, u, v]));
      }
    }
  }
  return Float32Array.from(out);
}

/** A round point sprite: a disc, or a ring for the far-hemisphere starts. */
function spriteTexture(hollow: boolean): CanvasTexture | null {
  if (typeof document === 'undefined') return null;
  const c = document.createElement('canvas');
  c.width = c.height = 64;
  const ctx = c.getContext('2d');
  if (!ctx) return null;
  ctx.fillStyle = '#ffffff';
  ctx.strokeStyle = '#ffffff';
  ctx.beginPath();
  if (hollow) {
    ctx.lineWidth = 13;
    ctx.arc(32, 32, 24, 0, 2 * Math.PI);
    ctx.stroke();
  } else {
    ctx.arc(32, 32, 29, 0, 2 * Math.PI);
    ctx.fill();
  }
  const t = new CanvasTexture(c);
  t.colorSpace = SRGBColorSpace;
  return t;
}

export function createOutcomeMapView(
  canvas: HTMLCanvasElement,
  opts: { width: number; height: number; preserveDrawingBuffer?: boolean },
): OutcomeMapView {
  const renderer = new WebGLRenderer({ canvas, antialias: true, preserveDrawingBuffer: opts.preserveDrawingBuffer ?? false });
  const pr = typeof window !== 'undefined' ? window.devicePixelRatio || 1 : 1;
  renderer.setPixelRatio(pr);
  renderer.setClearColor(BG, 1);
  let width = Math.max(1, Math.round(opts.width));
  let height = Math.max(1, Math.round(opts.height));
  renderer.setSize(width, height, false);

  const scene = new Scene();
  const camera = new PerspectiveCamera(CAMERA_FOV_DEG, width / height, 0.05, 50);
  setInertialZUp(camera);
  camera.position.copy(HOME);
  camera.lookAt(0, 0, 0);
  const controls = new OrbitControls(camera, canvas);
  controls.enableDamping = false;
  controls.enablePan = false;
  controls.minDistance = 1.4;
  controls.maxDistance = 12;
  controls.saveState();

  const kit = createKit(canvasLabelFactory());
  const frame = new Group();
  const shell = new BufferGeometry();
  shell.setAttribute('position', new BufferAttribute(sphereLines(1, 30, 30), 3));
  frame.add(new LineSegments(shell, new LineBasicMaterial({ color: 0x5b6b7e, transparent: true, opacity: 0.38, depthWrite: false })));
  const half = new BufferGeometry();
  half.setAttribute('position', new BufferAttribute(greatCircles(0.5), 3));
  frame.add(new LineSegments(half, new LineBasicMaterial({ color: 0x5b6b7e, transparent: true, opacity: 0.28, depthWrite: false })));
  frame.add(new Triad(kit, { length: 1.22, radius: 0.007, suffix: 'T', opacity: 0.9 }));
  if (kit.labels) {
    const l180 = kit.labels('180°', { color: '#9aa6b4', heightFraction: 0.03 });
    l180.position.set(0, -0.72, 0.72);
    const l90 = kit.labels('90°', { color: '#9aa6b4', heightFraction: 0.03 });
    l90.position.set(0, -0.36, 0.36);
    frame.add(l180, l90);
  }
  scene.add(frame);

  const filled = new Points(
    new BufferGeometry(),
    new PointsMaterial({
      size: POINT_PX * pr,
      sizeAttenuation: false,
      vertexColors: true,
      map: spriteTexture(false),
      alphaTest: 0.5,
      transparent: false,
    }),
  );
  const hollow = new Points(
    new BufferGeometry(),
    new PointsMaterial({
      size: (POINT_PX + 1) * pr,
      sizeAttenuation: false,
      vertexColors: true,
      map: spriteTexture(true),
      alphaTest: 0.5,
      transparent: false,
    }),
  );
  filled.renderOrder = hollow.renderOrder = 2;
  scene.add(filled, hollow);

  let data: MapGeometry | null = null;
  const counts = { filled: 0, hollow: 0 };
  const colour = new Color();
  const v = new Vector3();

  function fill(points: Points, g: MapGeometry, want: number) {
    const idx: number[] = [];
    for (let i = 0; i < g.count; i++) if (g.far[i] === want) idx.push(i);
    const pos = new Float32Array(3 * idx.length);
    const col = new Float32Array(3 * idx.length);
    idx.forEach((i, k) => {
      pos.set(g.positions.subarray(3 * i, 3 * i + 3), 3 * k);
      // Vertex colours are linear in three.js: convert from the model's sRGB.
      colour.setRGB(g.colours[3 * i]!, g.colours[3 * i + 1]!, g.colours[3 * i + 2]!, SRGBColorSpace);
      col[3 * k] = colour.r;
      col[3 * k + 1] = colour.g;
      col[3 * k + 2] = colour.b;
    });
    points.geometry.dispose();
    const geom = new BufferGeometry();
    geom.setAttribute('position', new BufferAttribute(pos, 3));
    geom.setAttribute('color', new BufferAttribute(col, 3));
    points.geometry = geom;
    return idx.length;
  }

  const render = () => renderer.render(scene, camera);
  controls.addEventListener('change', render);

  return {
    renderer,
    setData(g) {
      data = g;
      counts.filled = fill(filled, g, 0);
      counts.hollow = fill(hollow, g, 1);
      render();
    },
    resize(w, h) {
      width = Math.max(1, Math.round(w));
      height = Math.max(1, Math.round(h));
      renderer.setSize(width, height, false);
      camera.aspect = width / height;
      camera.updateProjectionMatrix();
      render();
    },
    render,
    resetCamera() {
      controls.reset();
      render();
    },
    pick(x, y, radiusPx = 7) {
      if (!data) return -1;
      let best = -1;
      let bestD = radiusPx * radiusPx;
      for (let i = 0; i < data.count; i++) {
        v.set(data.positions[3 * i]!, data.positions[3 * i + 1]!, data.positions[3 * i + 2]).project(camera);
        const d = (((v.x + 1) / 2) * width - x) ** 2 + (((1 - v.y) / 2) * height - y) ** 2;
        if (d < bestD) {
          best = i;
          bestD = d;
        }
      }
      return best;
    },
    stats: () => ({ ...counts }),
    dispose() {
      controls.removeEventListener('change', render);
      controls.dispose();
      disposeTree(scene, kit);
      disposeKit(kit);
      renderer.dispose();
    },
  };
}
