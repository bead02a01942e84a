/**
 * The orbit view on a canvas: WebGL renderer, a perspective camera orbiting the Earth (Z_I up,
 * adapter.ts), and a HUD with the frame and the spacecraft's eclipse state. Driven imperatively
 * like the attitude view (view.ts): `setData` once per run set, `setTime` from the playback loop,
 * `render` when something moved.
 */
import { OrthographicCamera, PerspectiveCamera, WebGLRenderer } from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import { setInertialZUp } from './adapter';
import { canvasLabelFactory, keepLabelsReadable } from './labels';
import { ORBIT_COLORS, OrbitScene, type OrbitViewData } from './orbitScene';
import { CAMERA_FOV_DEG } from './style';

/** Camera home, Earth radii: oblique from above the equator (our own choice). */
const HOME = [2.6, -2.1, 1.6] as const;
/** Camera distance when framing the spacecraft, Earth radii: a low orbit then fills the view's height. */
const FRAME_DISTANCE = 3.5;

export interface OrbitViewHandle {
  readonly model: OrbitScene;
  readonly renderer: WebGLRenderer;
  readonly camera: PerspectiveCamera;
  setData(d: OrbitViewData | null): void;
  setTime(t: number): void;
  /** Keep the camera on the spacecraft's side as the time moves (at the user's zoom distance). */
  setFollow(on: boolean): void;
  resetCamera(): void;
  resize(width: number, height: number): void;
  render(): void;
  dispose(): void;
}

export function createOrbitView(
  canvas: HTMLCanvasElement,
  opts: { width?: number; height?: number; preserveDrawingBuffer?: boolean } = {},
): OrbitViewHandle {
  const renderer = new WebGLRenderer({ canvas, antialias: true, preserveDrawingBuffer: opts.preserveDrawingBuffer ?? false });
  renderer.setPixelRatio(typeof window !== 'undefined' ? window.devicePixelRatio || 1 : 1);
  renderer.autoClear = false;
  const model = new OrbitScene(canvasLabelFactory());
  const camera = new PerspectiveCamera(CAMERA_FOV_DEG, 1, 0.01, 400);
  setInertialZUp(camera);
  camera.position.set(HOME[0], HOME[1], HOME[2]);
  camera.lookAt(0, 0, 0);
  const controls = new OrbitControls(camera, canvas);
  controls.enableDamping = true;
  controls.dampingFactor = 0.12;
  controls.minDistance = 1.3;
  controls.maxDistance = 60;
  controls.update();
  let follow = true;
  const hud = new OrthographicCamera(-1, 1, 1, -1, -10, 10);
  let width = Math.max(1, Math.round(opts.width ?? (canvas.clientWidth || canvas.width)));
  let height = Math.max(1, Math.round(opts.height ?? (canvas.clientHeight || canvas.height)));
  renderer.setSize(width, height, false);

  /**
   * Look at the Earth from the spacecraft's side (above its position, a little toward +Z_I), so the
   * spacecraft is in front of the globe with the orbit around it; the default camera otherwise.
   */
  function frame(distance = FRAME_DISTANCE): void {
    const c = model.craftPosition();
    const n = Math.hypot(c.x, c.y, c.z);
    if (n > 0 && model.state.valid) {
      const x = c.x / n,
        y = c.y / n,
        z = c.z / n + 0.45;
      const m = Math.hypot(x, y, z);
      camera.position.set((distance * x) / m, (distance * y) / m, (distance * z) / m);
    } else camera.position.set(HOME[0], HOME[1], HOME[2]);
    controls.target.set(0, 0, 0);
    camera.lookAt(0, 0, 0);
    controls.update();
  }

  function render(): void {
    controls.update();
    renderer.setViewport(0, 0, width, height);
    renderer.setClearColor(ORBIT_COLORS.background, 1);
    renderer.clear();
    camera.aspect = width / height;
    // A narrow view widens so the Earth and the orbit still fit across.
    camera.zoom = Math.min(1, camera.aspect / 0.95);
    camera.updateProjectionMatrix();
    keepLabelsReadable(model.scene, height * camera.zoom);
    renderer.render(model.scene, camera);
    const aspect = width / height;
    hud.left = -aspect;
    hud.right = aspect;
    hud.updateProjectionMatrix();
    keepLabelsReadable(model.hudScene, height);
    model.layoutHud(aspect);
    renderer.clearDepth();
    renderer.render(model.hudScene, hud);
  }

  return {
    model,
    renderer,
    camera,
    setData(d) {
      const first = !model.data;
      model.setData(d);
      if (first && d) frame();
    },
    setTime(t) {
      model.setTime(t);
      if (follow) frame(camera.position.length());
    },
    setFollow(on) {
      follow = on;
      if (on) frame(camera.position.length());
    },
    resetCamera: () => {
      frame();
      render();
    },
    resize(w, h) {
      width = Math.max(1, Math.round(w));
      height = Math.max(1, Math.round(h));
      renderer.setSize(width, height, false);
    },
    render,
    dispose() {
      controls.dispose();
      model.dispose();
      renderer.dispose();
      renderer.forceContextLoss();
    },
  };
}
