/**
 * The 3D attitude view on a canvas: WebGL renderer, one orbit camera shared by every viewport,
 * a momentum inset per viewport and a HUD. The UI mounts it once and drives it imperatively:
 * `setRuns` when the runs change, `setTime` from the scrubber or playback, `render` from its
 * requestAnimationFrame loop. Nothing here goes through React state.
 *
 * Screen layout (our own): viewports side by side across the canvas (one for 'single' and
 * 'overlay'); in each, the inertial scene fills the viewport, the body-frame momentum inset sits
 * in the bottom-right square (SIZES.insetFraction of the smaller side), run labels top-left.
 * Z_I is drawn up (camera.up = +Z, adapter.ts); the data are never rotated for display.
 */
import { OrthographicCamera, PerspectiveCamera, Vector3, WebGLRenderer } from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import { qRotateInverse } from '../engine/math/rotation';
import { setInertialZUp } from './adapter';
import type { AttitudeSceneOptions } from './attitudeScene';
import { AttitudeScene } from './attitudeScene';
import { canvasLabelFactory, keepLabelsReadable } from './labels';
import { CAMERA_FOV_DEG, CAMERA_HOME, COLORS, SIZES } from './style';
import type { AttitudeView, ViewLayout, ViewOptions, ViewRun, ViewStats } from './types';

export interface AttitudeViewOptions extends Omit<AttitudeSceneOptions, 'labels'> {
  /** Device pixel ratio (default window.devicePixelRatio or 1). */
  pixelRatio?: number;
  /** Keep the drawing buffer for pixel read-back in tests (default false). */
  preserveDrawingBuffer?: boolean;
  antialias?: boolean;
  /** Initial size in CSS pixels (default the canvas's client size). */
  width?: number;
  height?: number;
}

/** The view plus handles the UI's tests may read (the scene model, renderer and camera). */
export interface AttitudeViewHandle extends AttitudeView {
  readonly model: AttitudeScene;
  readonly renderer: WebGLRenderer;
  readonly camera: PerspectiveCamera;
}

/** Inset camera for the fixed view: oblique, Z_B up. */
const INSET_HOME = [3.8, 2.9, 2.35] as const;

export function createAttitudeView(canvas: HTMLCanvasElement, opts: AttitudeViewOptions = {}): AttitudeViewHandle {
  const renderer = new WebGLRenderer({
    canvas,
    antialias: opts.antialias ?? true,
    preserveDrawingBuffer: opts.preserveDrawingBuffer ?? false,
  });
  const pr = opts.pixelRatio ?? (typeof window !== 'undefined' ? window.devicePixelRatio : 1);
  renderer.setPixelRatio(pr || 1);
  renderer.autoClear = false;

  const model = new AttitudeScene({ bus: opts.bus, options: opts.options, labels: canvasLabelFactory() });
  model.deferDisposal = true;

  const camera = new PerspectiveCamera(CAMERA_FOV_DEG, 1, 0.05, 200);
  setInertialZUp(camera);
  camera.position.set(CAMERA_HOME[0], CAMERA_HOME[1], CAMERA_HOME[2]);
  camera.lookAt(0, 0, 0);
  const controls = new OrbitControls(camera, canvas);
  controls.enableDamping = true;
  controls.dampingFactor = 0.12;
  controls.minDistance = 1.2;
  controls.maxDistance = 30;
  controls.target.set(0, 0, 0);
  controls.update();
  controls.saveState();

  const inset = new PerspectiveCamera(CAMERA_FOV_DEG, 1, 0.05, 50);
  const hud = new OrthographicCamera(-1, 1, 1, -1, -10, 10);
  const insetDist = Math.hypot(INSET_HOME[0], INSET_HOME[1], INSET_HOME[2]);

  let width = Math.max(1, Math.round(opts.width ?? (canvas.clientWidth || canvas.width)));
  let height = Math.max(1, Math.round(opts.height ?? (canvas.clientHeight || canvas.height)));
  renderer.setSize(width, height, false);

  // Scratch for the 'match-main' inset camera (no allocation per frame).
  const sDir = new Float64Array(3),
    sUp = new Float64Array(3),
    sOut = new Float64Array(3);
  const sCamUp = new Vector3();

  function poseInset(qBody: Float64Array | null, mode: ViewOptions['momentumCamera']): void {
    if (mode === 'match-main' && qBody) {
      // The main camera's viewing direction and up, carried into body axes: the inset then shows
      // the body-frame vectors as they lie on the body in the main view.
      sDir[0] = camera.position.x - controls.target.x;
      sDir[1] = camera.position.y - controls.target.y;
      sDir[2] = camera.position.z - controls.target.z;
      const n = Math.hypot(sDir[0], sDir[1], sDir[2]) || 1;
      qRotateInverse(sOut, qBody, sDir);
      inset.position.set((sOut[0]! / n) * insetDist, (sOut[1]! / n) * insetDist, (sOut[2]! / n) * insetDist);
      sCamUp.setFromMatrixColumn(camera.matrixWorld, 1);
      sUp[0] = sCamUp.x;
      sUp[1] = sCamUp.y;
      sUp[2] = sCamUp.z;
      qRotateInverse(sOut, qBody, sUp);
      inset.up.set(sOut[0]!, sOut[1]!, sOut[2]);
    } else {
      inset.position.set(INSET_HOME[0], INSET_HOME[1], INSET_HOME[2]);
      inset.up.set(0, 0, 1);
    }
    inset.lookAt(0, 0, 0);
  }

  function render(): void {
    controls.update();
    const vps = model.viewports;
    renderer.setScissorTest(false);
    renderer.setViewport(0, 0, width, height);
    renderer.setClearColor(0x05070a, 1);
    renderer.clear();
    if (vps.length === 0) {
      renderer.setClearColor(COLORS.background, 1);
      renderer.clear();
      model.flushDisposals();
      return;
    }
    renderer.setScissorTest(true);
    const n = vps.length;
    const o = model.options;
    for (let v = 0; v < n; v++) {
      const x0 = Math.floor((v * width) / n) + (v > 0 ? 1 : 0); // 1 px divider
      const w = Math.max(1, Math.floor(((v + 1) * width) / n) - x0);
      const h = height;
      const vp = vps[v]!;
      renderer.setViewport(x0, 0, w, h);
      renderer.setScissor(x0, 0, w, h);
      renderer.setClearColor(COLORS.background, 1);
      renderer.clear();
      camera.aspect = w / h;
      // Narrow viewports (side by side) widen the view so the sphere still fits across.
      camera.zoom = Math.min(1, camera.aspect / 0.95);
      camera.updateProjectionMatrix();
      keepLabelsReadable(vp.scene, h * camera.zoom);
      renderer.render(vp.scene, camera);

      const side = Math.max(1, Math.floor(SIZES.insetFraction * Math.min(w, h)));
      if (o.showMomentum) {
        renderer.setViewport(x0 + w - side, 0, side, side);
        renderer.setScissor(x0 + w - side, 0, side, side);
        renderer.setClearColor(COLORS.insetBackground, 1);
        renderer.clear();
        poseInset(vp.runs.length ? vp.runs[0]!.qNow : null, o.momentumCamera);
        inset.aspect = 1;
        inset.updateProjectionMatrix();
        keepLabelsReadable(vp.momentumScene, side);
        renderer.render(vp.momentumScene, inset);
      }

      const aspect = w / h;
      hud.left = -aspect;
      hud.right = aspect;
      hud.updateProjectionMatrix();
      keepLabelsReadable(vp.hudScene, h);
      vp.layoutHud(aspect, (2 * side) / h, o.showMomentum);
      renderer.setViewport(x0, 0, w, h);
      renderer.setScissor(x0, 0, w, h);
      renderer.clearDepth();
      renderer.render(vp.hudScene, hud);
    }
    renderer.setScissorTest(false);
    // The new run set has compiled against the programs the old one still holds; now let it go.
    model.flushDisposals();
  }

  return {
    model,
    renderer,
    camera,
    get stats(): ViewStats {
      return model.stats;
    },
    setRuns(runs: ViewRun[], layout: ViewLayout) {
      model.setRuns(runs, layout);
    },
    setTime(t: number) {
      model.setTime(t);
    },
    setOptions(o: Partial<ViewOptions>) {
      model.setOptions(o);
    },
    resetCamera() {
      controls.reset();
    },
    resize(w: number, h: number) {
      width = Math.max(1, Math.round(w));
      height = Math.max(1, Math.round(h));
      renderer.setSize(width, height, false);
    },
    render,
    dispose() {
      controls.dispose();
      model.dispose();
      renderer.dispose();
      // Release the GL context now; a remounted view makes its own (browsers cap live contexts).
      renderer.forceContextLoss();
    },
  };
}
