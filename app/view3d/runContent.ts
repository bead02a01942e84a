/**
 * Everything one run contributes to the view, built once per run and updated in place by
 * `update(time)`: the posed bus with its body triad, the active target's ghost triad, the moving
 * reference's ghost (profiled mode), the boresight trail (inertial scene) and the wheel momentum
 * (body-frame inset).
 *
 * A new run with the same frame key (runFrameKey: label, reference ghost, targets) can take the
 * place of the old one (`replaceRun`): the bus, triads, target ghosts and their materials stay, so
 * an edit's new run set costs neither their construction nor new shader programs; the trail and
 * the momentum inset, which are the run's data, are built anew.
 */
import { Group } from 'three';
import { setObjectAttitude, slerpFlat } from './adapter';
import type { BusModel } from './busModel';
import { buildBusGroup } from './busModel';
import { MomentumContent } from './momentumContent';
import type { Kit } from './primitives';
import { cssHex, disposeTree, Triad } from './primitives';
import { countUpTo, createCursor, locateSample } from './sampling';
import { COLORS, SIZES } from './style';
import { TrailObject } from './trailObject';
import { NO_KEEP_OUT } from './types';
import type { ViewOptions, ViewRun } from './types';

export interface RunContentStyle {
  /** Position of the run among those sharing a viewport (0 = drawn solid). */
  index: number;
  /** Opacity for index ≥ 1. */
  overlayOpacity: number;
  /** Draw the envelope in the inset (the first run of a viewport only). */
  drawEnvelope: boolean;
  /** Show the run's label beside its body (overlay). */
  tagBody: boolean;
  /** Shared momentum display scale (so overlaid runs use one scale). */
  momentumScale?: number;
}

/** Index of the active target at `time`: last with tStart ≤ time, −1 in a gap or before the first. */
export function activeTargetIndex(tStarts: Float64Array, tEnds: Float64Array, time: number): number {
  const m = tStarts.length;
  const k = countUpTo(tStarts, m, time) - 1;
  if (k < 0) return -1;
  // After the last segment ends the run is over: keep its target on screen.
  if (time > tEnds[k]! && k < m - 1) return -1;
  return k;
}

/**
 * What the frame parts of a run's content are built from (everything but the trace, the jumps and
 * the vehicle): runs with equal keys can share them (RunContent.replaceRun).
 */
export function runFrameKey(run: ViewRun): string {
  return JSON.stringify([run.label, run.hasReference, run.targets.map((t) => t.label)]);
}

/**
 * True when `b` shows exactly what `a` shows: the same trace and vehicle arrays (by identity: the
 * app's store keeps an unchanged run's objects between passes, app/ui/store/shareOutput.ts), and
 * equal label, mode flags, jumps and targets. Such a run keeps its content as it is (no new trail
 * or momentum inset, so no new GPU buffers or shader programs).
 */
export function sameRunData(a: ViewRun, b: ViewRun): boolean {
  if (a === b) return true;
  if (
    a.trace !== b.trace ||
    a.wheelAxes !== b.wheelAxes ||
    a.maxMomentumNms !== b.maxMomentumNms ||
    a.momentumEnvelope !== b.momentumEnvelope ||
    a.label !== b.label ||
    a.hasReference !== b.hasReference ||
    a.logicKind !== b.logicKind ||
    a.jumps.length !== b.jumps.length ||
    a.targets.length !== b.targets.length
  )
    return false;
  const sameJump = (x: ViewRun['jumps'][number], y: ViewRun['jumps'][number]) =>
    Object.is(x.t, y.t) && x.j === y.j && x.from === y.from && x.to === y.to;
  if (!a.jumps.every((x, i) => sameJump(x, b.jumps[i]!))) return false;
  return a.targets.every((x, i) => {
    const y = b.targets[i]!;
    return (
      Object.is(x.tStart, y.tStart) &&
      Object.is(x.tEnd, y.tEnd) &&
      x.label === y.label &&
      x.q.length === y.q.length &&
      x.q.every((v, k) => Object.is(v, y.q[k]))
    );
  });
}

export class RunContent {
  run: ViewRun;
  /** Inertial-frame content. */
  readonly group = new Group();
  readonly body = new Group();
  readonly bus: Group;
  readonly bodyTriad: Triad;
  /** Target ghosts; the group carries the show/hide option, each ghost shows while its segment is active. */
  readonly targets = new Group();
  readonly targetGhosts: Triad[] = [];
  readonly referenceGhost: Triad | null;
  trail: TrailObject;
  momentum: MomentumContent;
  /** The momentum inset's display scale (shared by a viewport's runs). */
  momentumScale: number | undefined;
  cursor = createCursor();
  /** Interpolated attitude at the last update, [x, y, z, w]. */
  readonly qNow = new Float64Array([0, 0, 0, 1]);
  readonly qRefNow = new Float64Array([0, 0, 0, 1]);
  activeTarget = -1;

  private tStarts: Float64Array;
  private tEnds: Float64Array;
  private readonly kit: Kit;
  private readonly style: RunContentStyle;

  constructor(kit: Kit, bus: BusModel, run: ViewRun, options: ViewOptions, style: RunContentStyle) {
    this.kit = kit;
    this.run = run;
    this.style = style;
    const solid = style.index === 0;
    const opacity = solid ? 1 : style.overlayOpacity;
    this.group.name = `run:${run.label}`;

    this.bus = buildBusGroup(bus, opacity);
    this.bus.scale.setScalar(SIZES.busScale);
    this.bodyTriad = new Triad(kit, {
      length: SIZES.bodyTriad,
      opacity: solid ? 1 : Math.min(1, opacity + 0.15),
      suffix: solid ? 'B' : null,
      tag: style.tagBody ? run.label : undefined,
      // Below the target's tag, one row per overlaid run (converged runs stack, not overprint).
      tagRow: 2 + style.index,
      radius: 0.011,
    });
    this.body.add(this.bus, this.bodyTriad);
    this.body.name = 'body';
    this.group.add(this.body);

    this.targets.name = 'targets';
    this.group.add(this.targets);
    this.tStarts = Float64Array.from(run.targets, (t) => t.tStart);
    this.tEnds = Float64Array.from(run.targets, (t) => t.tEnd);
    run.targets.forEach((tg, k) => {
      const ghost = new Triad(kit, {
        length: SIZES.targetTriad,
        opacity: 0.5 * (solid ? 1 : 0.7),
        radius: 0.008,
        suffix: null,
        tag: solid ? `target ${k + 1}${tg.label ? `: ${tg.label}` : ''}` : undefined,
        tagRow: 1,
        tagColor: '#aab4c0',
      });
      setObjectAttitude(ghost, tg.q, 0);
      ghost.visible = false;
      ghost.name = `target-ghost:${k}`;
      this.targetGhosts.push(ghost);
      this.targets.add(ghost);
    });

    if (run.hasReference) {
      const c = COLORS.reference;
      this.referenceGhost = new Triad(kit, {
        length: SIZES.referenceTriad,
        opacity: 0.5 * (solid ? 1 : 0.7),
        radius: 0.007,
        suffix: null,
        tag: solid ? 'reference' : undefined,
        tagRow: -1,
        tagColor: cssHex(c),
        colors: [c, c, c],
      });
      this.referenceGhost.name = 'reference-ghost';
      this.group.add(this.referenceGhost);
    } else this.referenceGhost = null;

    this.trail = this.buildTrail(run, options);
    this.group.add(this.trail.group);
    this.momentum = this.buildMomentum(run, style.momentumScale);
    this.momentumScale = style.momentumScale;
    this.applyOptions(options);
  }

  private buildTrail(run: ViewRun, options: ViewOptions): TrailObject {
    const solid = this.style.index === 0;
    return new TrailObject(this.kit, run, options.boresightBody, {
      opacity: solid ? 1 : Math.max(0.35, this.style.overlayOpacity),
      marker: solid ? 'dot' : 'diamond',
      sphereRadius: SIZES.sphereRadius,
    });
  }

  private buildMomentum(run: ViewRun, scale: number | undefined): MomentumContent {
    const solid = this.style.index === 0;
    return new MomentumContent(this.kit, run, {
      drawEnvelope: this.style.drawEnvelope,
      opacity: solid ? 1 : Math.max(0.35, this.style.overlayOpacity),
      scale,
    });
  }

  /**
   * Show `run` (whose runFrameKey equals the current run's) in this content: the frame parts stay
   * and are re-posed as a new content would pose them; the trail and the momentum inset are built
   * anew. The caller moves `momentum.group` into its inset scene and disposes what this returns
   * (the old trail and inset) once the new ones have been drawn.
   */
  replaceRun(run: ViewRun, options: ViewOptions, momentumScale: number | undefined): { dispose(): void } {
    const oldTrail = this.trail;
    const oldMomentum = this.momentum;
    this.run = run;
    this.cursor = createCursor();
    this.qNow.set([0, 0, 0, 1]);
    this.qRefNow.set([0, 0, 0, 1]);
    this.body.quaternion.identity();
    this.referenceGhost?.quaternion.identity();
    this.tStarts = Float64Array.from(run.targets, (t) => t.tStart);
    this.tEnds = Float64Array.from(run.targets, (t) => t.tEnd);
    run.targets.forEach((tg, k) => {
      const ghost = this.targetGhosts[k]!;
      setObjectAttitude(ghost, tg.q, 0);
      ghost.visible = false;
    });
    this.activeTarget = -1;
    // The trail group is the last child, as in the constructor.
    this.group.remove(oldTrail.group);
    this.trail = this.buildTrail(run, options);
    this.group.add(this.trail.group);
    this.momentum = this.buildMomentum(run, momentumScale);
    this.momentumScale = momentumScale;
    this.applyOptions(options);
    const kit = this.kit;
    return {
      dispose() {
        oldTrail.dispose();
        disposeTree(oldTrail.group, kit);
        disposeTree(oldMomentum.group, kit);
      },
    };
  }

  /** Pose everything for `time` (s). Reads the trace's typed arrays; allocation-free. */
  update(time: number): void {
    const tr = this.run.trace;
    const c = locateSample(tr.t, tr.n, time, this.cursor);
    if (c.i < 0) return; // empty run: its groups stay hidden (applyOptions)
    slerpFlat(this.qNow, 0, tr.q, 4 * c.i, tr.q, 4 * c.i1, c.alpha);
    setObjectAttitude(this.body, this.qNow, 0);
    if (this.referenceGhost) {
      slerpFlat(this.qRefNow, 0, tr.qRef, 4 * c.i, tr.qRef, 4 * c.i1, c.alpha);
      setObjectAttitude(this.referenceGhost, this.qRefNow, 0);
    }
    const k = activeTargetIndex(this.tStarts, this.tEnds, time);
    if (k !== this.activeTarget) {
      if (this.activeTarget >= 0) this.targetGhosts[this.activeTarget]!.visible = false;
      if (k >= 0) this.targetGhosts[k]!.visible = true;
      this.activeTarget = k;
    }
    this.trail.update(c, this.qNow, time, k);
    this.momentum.update(c);
  }

  /** Apply display options (not per frame: may recompute the trail for a new boresight axis). */
  applyOptions(o: ViewOptions): void {
    const a = this.trail.axis,
      b = o.boresightBody;
    if (a[0] !== b[0] || a[1] !== b[1] || a[2] !== b[2]) this.trail.setAxis(b);
    this.trail.setKeepOut(o.showKeepOut ? o.keepOut : NO_KEEP_OUT);
    this.trail.setVisibility(o.showTrail, o.showJumpMarkers, o.showGreatCircle, o.showKeepOut);
    this.bus.visible = o.showBody;
    this.bodyTriad.visible = o.showBodyTriad;
    this.targets.visible = o.showTarget;
    if (this.referenceGhost) this.referenceGhost.visible = o.showReference;
    const empty = this.run.trace.n === 0;
    this.group.visible = !empty;
    this.momentum.group.visible = o.showMomentum && !empty;
    if (this.momentum.envelope) this.momentum.envelope.group.visible = o.showEnvelope;
  }

  dispose(): void {
    this.trail.dispose();
    disposeTree(this.group, this.kit);
    disposeTree(this.momentum.group, this.kit);
  }
}
