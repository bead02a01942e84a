/**
 * The renderer-free half of the view: scene graphs for the chosen layout, built once per
 * `setRuns` and updated in place by `setTime`. It needs no DOM or WebGL, so the tests and the
 * benchmark drive it in Node; view.ts adds the WebGL renderer, cameras and orbit controls.
 *
 * Layouts: 'single' shows the first run; 'overlay' puts every run in one scene (the first solid,
 * the rest translucent, overlaid runs' trails dimmer and their jump markers diamonds);
 * 'side-by-side' gives each run its own viewport, all sharing one camera and one time.
 * Each viewport has a body-frame momentum inset (its own scene) and a HUD with the run labels.
 *
 * A new run set in the same layout whose runs have the same frame keys (runContent.ts
 * runFrameKey; an edit's new output) keeps the viewports: scenes, common content, HUD, buses and
 * triads with their materials stay, and only each run's trail and inset are built anew.
 */
import { Scene } from 'three';
import type { Object3D } from 'three';
import type { BusModel } from './busModel';
import { CommonContent } from './commonContent';
import { DEFAULT_BUS_MODEL } from './defaultBus';
import { envelopeDisplayScale } from './envelope';
import type { LabelFactory } from './labels';
import type { Kit } from './primitives';
import { createKit, disposeKit, disposeTree, Triad } from './primitives';
import { RunContent, runFrameKey, sameRunData } from './runContent';
import { SIZES } from './style';
import { NO_KEEP_OUT } from './types';
import type { ViewLayout, ViewOptions, ViewRun, ViewStats } from './types';

export function defaultViewOptions(bus: BusModel): ViewOptions {
  return {
    boresightBody: Float64Array.from(bus.boresightBody),
    showInertialTriad: true,
    showBody: true,
    showBodyTriad: true,
    showTarget: true,
    showReference: true,
    showSphere: true,
    showTrail: true,
    showGreatCircle: true,
    showJumpMarkers: true,
    showMomentum: true,
    showEnvelope: true,
    showKeepOut: true,
    keepOut: [],
    overlayOpacity: 0.35,
    momentumCamera: 'fixed',
  };
}

interface HudItem {
  obj: Object3D;
  /** Scale as built (the inset title is shrunk to fit narrow insets). */
  baseScaleX: number;
  baseScaleY: number;
  /** Row from the top (0, 1, …) or −1 for the inset title. */
  row: number;
}

/** Something retired by setRuns, disposed once the new content has been drawn. */
interface Retired {
  dispose(kit: Kit): void;
}

/** The key of a viewport showing `runs` (overlay or not): equal keys can share the viewport. */
function viewportKey(runs: readonly ViewRun[], overlay: boolean): string {
  return JSON.stringify([overlay, runs.map(runFrameKey)]);
}

/** The runs of each viewport for a layout. */
function viewportRuns(runs: ViewRun[], layout: ViewLayout): ViewRun[][] {
  if (runs.length === 0) return [];
  if (layout === 'side-by-side') return runs.map((r) => [r]);
  if (layout === 'overlay') return [runs];
  return [[runs[0]!]];
}

class Viewport {
  readonly key: string;
  readonly scene = new Scene();
  readonly momentumScene = new Scene();
  readonly hudScene = new Scene();
  readonly common: CommonContent;
  readonly insetTriad: Triad;
  readonly runs: RunContent[] = [];
  private readonly hud: HudItem[] = [];

  constructor(kit: Kit, bus: BusModel, runs: ViewRun[], options: ViewOptions, overlay: boolean) {
    this.key = viewportKey(runs, overlay);
    this.common = new CommonContent(kit);
    this.scene.add(this.common.group);
    this.insetTriad = new Triad(kit, {
      length: SIZES.insetTriad,
      suffix: 'B',
      radius: 0.01,
      opacity: 0.8,
      labelHeight: SIZES.insetLabelHeight,
    });
    this.momentumScene.add(this.insetTriad);
    const scale = runs.length ? envelopeDisplayScale(runs[0]!.momentumEnvelope) : 1;
    runs.forEach((run, index) => {
      const rc = new RunContent(kit, bus, run, options, {
        index,
        overlayOpacity: options.overlayOpacity,
        drawEnvelope: index === 0,
        tagBody: overlay && runs.length > 1,
        momentumScale: scale,
      });
      this.runs.push(rc);
      this.scene.add(rc.group);
      this.momentumScene.add(rc.momentum.group);
    });
    if (kit.labels) {
      runs.forEach((run, index) => {
        const text = runs.length > 1 ? `${run.label}  (${index === 0 ? 'solid' : 'translucent'})` : run.label;
        const lab = kit.labels!(text, { color: '#e6edf3', anchorX: 0, anchorY: 1, heightFraction: 0.04, screenSpace: true });
        this.hud.push({ obj: lab, row: index, baseScaleX: lab.scale.x, baseScaleY: lab.scale.y });
        this.hudScene.add(lab);
      });
      const title = kit.labels('wheel momentum, body axes', {
        color: '#9aa7b4',
        anchorX: 0,
        anchorY: 1,
        heightFraction: 0.03,
        screenSpace: true,
      });
      this.hud.push({ obj: title, row: -1, baseScaleX: title.scale.x, baseScaleY: title.scale.y });
      this.hudScene.add(title);
    }
    this.applyOptions(options);
  }

  /**
   * Place the HUD for a viewport of the given aspect (width/height); the HUD camera spans
   * x ∈ [−aspect, aspect], y ∈ [−1, 1]. `insetSide` is the inset's side in the same units.
   */
  layoutHud(aspect: number, insetSide: number, showInset: boolean): void {
    for (const h of this.hud) {
      // Labels keep a readable size in small views (labels.ts keepLabelsReadable): space rows by their height.
      if (h.row >= 0) {
        const y = 0.96 - Math.max(0.095, 1.15 * h.obj.scale.y) * h.row;
        h.obj.position.set(-aspect + 0.04, y, 0);
        // In a small view the run list keeps to the top third; the bodies carry their own tags.
        h.obj.visible = h.row === 0 || y - h.obj.scale.y > 0.3;
      } else {
        // Just above the inset, right-aligned with it, at full size.
        h.obj.position.set(Math.max(-aspect + 0.02, aspect - h.obj.scale.x - 0.02), -1 + insetSide + h.obj.scale.y + 0.01, 0);
        h.obj.visible = showInset;
      }
    }
  }

  update(time: number): void {
    for (let k = 0; k < this.runs.length; k++) this.runs[k]!.update(time);
  }

  /** Show `runs` (same viewportKey as this viewport's) in place; the replaced parts go to `retire`. */
  takeRuns(runs: ViewRun[], options: ViewOptions, retire: (r: Retired) => void): void {
    const scale = envelopeDisplayScale(runs[0]!.momentumEnvelope);
    // The inset keeps the constructor's order: its triad, then each run's momentum in run order.
    for (const rc of this.runs) this.momentumScene.remove(rc.momentum.group);
    this.runs.forEach((rc, i) => {
      const run = runs[i]!;
      // An unchanged run (another law's gain edited) keeps its trail and inset as they are.
      if (sameRunData(rc.run, run) && rc.momentumScale === scale) rc.run = run;
      else retire(rc.replaceRun(run, options, scale));
    });
    for (const rc of this.runs) this.momentumScene.add(rc.momentum.group);
    this.applyOptions(options);
  }

  applyOptions(o: ViewOptions): void {
    this.common.setVisibility(o.showInertialTriad, o.showSphere, o.showKeepOut);
    this.common.setKeepOut(o.showKeepOut ? o.keepOut : NO_KEEP_OUT);
    for (const r of this.runs) r.applyOptions(o);
  }

  dispose(kit: Kit): void {
    for (const r of this.runs) r.dispose();
    this.common.dispose();
    disposeTree(this.insetTriad, kit);
    disposeTree(this.hudScene, kit);
  }
}

export interface AttitudeSceneOptions {
  bus?: BusModel;
  /** Label factory; null builds no labels (Node). */
  labels?: LabelFactory | null;
  options?: Partial<ViewOptions>;
}

export class AttitudeScene {
  readonly kit: Kit;
  readonly bus: BusModel;
  readonly options: ViewOptions;
  readonly stats: ViewStats = { lastUpdateMs: 0 };
  layout: ViewLayout = 'single';
  runs: ViewRun[] = [];
  viewports: Viewport[] = [];
  time = 0;
  /**
   * When true (the WebGL view sets it), viewports replaced by setRuns are disposed only at the
   * next flushDisposals(), after the new ones have been drawn once: three.js frees a shader
   * program when its last material is disposed, so disposing first would recompile every program
   * for each new run set. Node tests leave it false and see old geometry freed at once.
   */
  deferDisposal = false;
  private retired: Retired[] = [];

  constructor(o: AttitudeSceneOptions = {}) {
    this.bus = o.bus ?? DEFAULT_BUS_MODEL;
    this.kit = createKit(o.labels ?? null);
    this.options = defaultViewOptions(this.bus);
    if (o.options) this.mergeOptions(o.options);
  }

  /** Build the viewports for `runs` in `layout` (once per run set), posed at the current time. */
  setRuns(runs: ViewRun[], layout: ViewLayout): void {
    const groups = viewportRuns(runs, layout);
    const overlay = layout === 'overlay';
    const same =
      layout === this.layout &&
      groups.length > 0 &&
      groups.length === this.viewports.length &&
      groups.every((g, i) => this.viewports[i]!.key === viewportKey(g, overlay));
    this.runs = runs.slice();
    this.layout = layout;
    if (same) {
      const retire = (r: Retired) => (this.deferDisposal ? this.retired.push(r) : r.dispose(this.kit));
      groups.forEach((g, i) => this.viewports[i]!.takeRuns(g, this.options, retire));
    } else {
      this.disposeViewports();
      this.viewports = groups.map((g) => new Viewport(this.kit, this.bus, g, this.options, overlay));
    }
    this.setTime(this.time);
  }

  /** Pose every run at time t (s). Cheap: typed-array reads, in-place updates, no allocation. */
  setTime(t: number): void {
    const t0 = performance.now();
    this.time = t;
    for (let v = 0; v < this.viewports.length; v++) this.viewports[v]!.update(t);
    this.stats.lastUpdateMs = performance.now() - t0;
  }

  setOptions(o: Partial<ViewOptions>): void {
    this.mergeOptions(o);
    for (const v of this.viewports) v.applyOptions(this.options);
    this.setTime(this.time);
  }

  private mergeOptions(o: Partial<ViewOptions>): void {
    const prev = this.options.boresightBody;
    Object.assign(this.options, o);
    if (o.boresightBody) {
      const b = o.boresightBody;
      const n = Math.hypot(b[0]!, b[1]!, b[2]!);
      // A zero or non-finite axis is ignored (the previous axis stays).
      this.options.boresightBody = n > 0 && Number.isFinite(n) ? Float64Array.of(b[0]! / n, b[1]! / n, b[2]! / n) : prev;
    }
    if (o.keepOut) this.options.keepOut = o.keepOut.slice();
  }

  private disposeViewports(): void {
    if (this.deferDisposal) this.retired.push(...this.viewports);
    else for (const v of this.viewports) v.dispose(this.kit);
    this.viewports = [];
  }

  /** Dispose viewports retired by setRuns (call after rendering the new ones). */
  flushDisposals(): void {
    for (const v of this.retired) v.dispose(this.kit);
    this.retired = [];
  }

  dispose(): void {
    this.disposeViewports();
    this.flushDisposals();
    disposeKit(this.kit);
  }
}
