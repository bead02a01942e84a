/**
 * Centre: the three.js attitude view (app/view3d), mounted once on a canvas and driven
 * imperatively. Runs go in with setRuns when the output or the selection changes; playback time
 * goes in from the clock's frame loop. It renders when the time moved, after a resize or data
 * change, and for a moment after pointer input (the orbit camera damps its motion).
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { createAttitudeView, type AttitudeViewHandle } from '../../view3d';
import type { OrbitViewHandle } from '../../view3d/orbitView';
import { OrbitView3D } from './OrbitView3D';
import type { ViewLayout, ViewOptions } from '../../view3d/types';
import { useApp, useAppState } from '../context';
import { constraintCones, conesKey, toViewRuns } from './viewRuns';
import { canvasUpkeep } from './canvasUpkeep';

const TOGGLES: { key: keyof ViewOptions; label: string }[] = [
  { key: 'showTrail', label: 'trail' },
  { key: 'showReference', label: 'reference' },
  { key: 'showTarget', label: 'target' },
  { key: 'showJumpMarkers', label: 'jumps' },
  { key: 'showMomentum', label: 'momentum' },
  { key: 'showKeepOut', label: 'keep-out' },
];

export function View3DPanel() {
  const app = useApp();
  const host = useRef<HTMLDivElement>(null);
  const canvas = useRef<HTMLCanvasElement>(null);
  const view = useRef<AttitudeViewHandle | null>(null);
  const needsRender = useRef(true);
  /**
   * True from a new run set until the frame after the one that shows it in the plots: the 3D frame
   * (its first shader compiles at start, a new run set's upload at each edit) then does not hold
   * back the plots' frame; the scene follows one frame later.
   */
  const holdRender = useRef(false);
  const [failure, setFailure] = useState<string | null>(null);
  const [layout, setLayout] = useState<ViewLayout>('overlay');
  const [toggles, setToggles] = useState<Record<string, boolean>>(() => Object.fromEntries(TOGGLES.map((t) => [t.key, true])));
  const output = useAppState((s) => s.output);
  // Which scene the panel shows: the body-centred attitude view, or (orbit scenarios) the orbit.
  const [mode, setMode] = useState<'attitude' | 'orbit'>('attitude');
  const orbitAvailable = !!output?.orbitView;
  const showOrbit = mode === 'orbit' && orbitAvailable;
  const orbitView = useRef<OrbitViewHandle | null>(null);
  const [follow, setFollow] = useState(true);
  const onOrbitHandle = useCallback((h: OrbitViewHandle | null) => (orbitView.current = h), []);
  const selected = useAppState((s) => s.selectedRunKeys);
  const runs = useMemo(
    () => (output ? selected.map((k) => output.runs.find((r) => r.key === k)).filter((r) => r !== undefined) : []),
    [output, selected],
  );

  // What the frame loop needs to colour the cones by the shown run's margin at the current time.
  const shown = useRef<{ output: typeof output; run: (typeof runs)[number] | null; key: string }>({ output: null, run: null, key: '' });
  shown.current.output = output;
  shown.current.run = runs[0] ?? null;

  // Mount once.
  useEffect(() => {
    const c = canvas.current;
    const h = host.current;
    if (!c || !h) return;
    let v: AttitudeViewHandle;
    try {
      v = createAttitudeView(c, { width: h.clientWidth, height: h.clientHeight, preserveDrawingBuffer: true });
    } catch (e) {
      setFailure(`3D view unavailable: ${(e as Error).message}`);
      return;
    }
    view.current = v;
    // The view's first frame compiles its shaders (≈ 150 ms in software GL): like a new run set's,
    // it waits until the frame after the one that paints the plots (the panel often mounts in the
    // same commit as the first output).
    holdRender.current = true;
    let firstTimer: ReturnType<typeof setTimeout> | null = null;
    const firstFrame = requestAnimationFrame(() => {
      firstTimer = setTimeout(() => (holdRender.current = false), 0);
    });
    // For the end-to-end tests and the console, as main.tsx exposes the store and clock: the
    // view handle (model, renderer, camera). Nothing in the app reads it.
    const hook = window as unknown as { __slewsmithView?: AttitudeViewHandle };
    hook.__slewsmithView = v;
    const upkeep = canvasUpkeep(c, h, (w, hh) => {
      v.resize(w, hh);
      needsRender.current = true;
    });
    const offTick = app.clock.onTick((t, moved) => {
      if (moved) {
        v.setTime(t);
        const sh = shown.current;
        const cones = constraintCones(sh.output, sh.run, t);
        const key = conesKey(cones);
        if (key !== sh.key) {
          sh.key = key;
          v.setOptions({ keepOut: cones });
        }
      }
      if (holdRender.current) {
        needsRender.current = true;
        return;
      }
      if (moved || needsRender.current || upkeep.active()) {
        needsRender.current = false;
        v.render();
      }
    });
    return () => {
      cancelAnimationFrame(firstFrame);
      if (firstTimer !== null) clearTimeout(firstTimer);
      offTick();
      upkeep.dispose();
      v.dispose();
      if (hook.__slewsmithView === v) delete hook.__slewsmithView;
      view.current = null;
    };
  }, [app]);

  useEffect(() => {
    const v = view.current;
    if (!v || !output) return;
    v.setRuns(toViewRuns(output, runs), runs.length > 1 ? layout : 'single');
    v.setTime(app.clock.t);
    needsRender.current = true;
    // Released by a task after this frame's animation callbacks, i.e. after the frame that paints
    // the plots; the next frame draws the scene.
    holdRender.current = true;
    let timer: ReturnType<typeof setTimeout> | null = null;
    const frame = requestAnimationFrame(() => {
      timer = setTimeout(() => (holdRender.current = false), 0);
    });
    return () => {
      cancelAnimationFrame(frame);
      if (timer !== null) clearTimeout(timer);
      holdRender.current = false;
    };
  }, [output, runs, layout, app]);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    const cones = constraintCones(output, runs[0] ?? null, app.clock.t);
    shown.current.key = conesKey(cones);
    v.setOptions({ ...toggles, keepOut: cones });
    needsRender.current = true;
  }, [toggles, output, runs, app]);

  return (
    <div className="view3d" data-testid="view3d">
      {showOrbit && <OrbitView3D output={output} follow={follow} onHandle={onOrbitHandle} />}
      <div className="view3d-canvas" ref={host} style={showOrbit ? { display: 'none' } : undefined}>
        <canvas ref={canvas} data-testid="view3d-canvas" />
        {failure && <div className="panel-empty overlay-msg">{failure}</div>}
        {!output && !failure && <div className="overlay-msg">The 3D view shows the run once it is computed.</div>}
      </div>
      <div className="view-mode-float">
        <button
          className="small view-reset"
          title="Back to the starting camera"
          onClick={() => (showOrbit ? orbitView.current?.resetCamera() : view.current?.resetCamera(), (needsRender.current = true))}
        >
          reset view
        </button>
        <span className="view-mode" role="group" aria-label="scene shown in the 3D view">
          <button
            className={`small ${showOrbit ? '' : 'on'}`}
            aria-pressed={!showOrbit}
            onClick={() => setMode('attitude')}
            title="The spacecraft's attitude, body-centred, in inertial axes"
            data-testid="view-mode-attitude"
          >
            attitude
          </button>
          <button
            className={`small ${showOrbit ? 'on' : ''}`}
            aria-pressed={showOrbit}
            onClick={() => setMode('orbit')}
            disabled={!orbitAvailable}
            title={
              orbitAvailable
                ? 'The Earth, the orbit, the Sun and Moon directions and the line of sight to the tracked site'
                : 'Needs a scenario with an orbit block, run once'
            }
            data-testid="view-mode-orbit"
          >
            orbit
          </button>
        </span>
      </div>
      <div className="view3d-bar">
        {!showOrbit &&
          TOGGLES.map((t) => (
            <label key={t.key} className="check">
              <input
                type="checkbox"
                checked={toggles[t.key] ?? true}
                onChange={(e) => setToggles({ ...toggles, [t.key]: e.target.checked })}
              />{' '}
              {t.label}
            </label>
          ))}
        {showOrbit && (
          <label className="check" title="Keep the camera on the spacecraft's side as the time moves; untick to turn the view freely">
            <input type="checkbox" checked={follow} onChange={(e) => setFollow(e.target.checked)} data-testid="orbit-follow" /> follow
            spacecraft
          </label>
        )}
        {showOrbit && (
          <span
            className="muted orbit-key"
            data-testid="orbit-view-key"
            title="Frame EME2000, Z up. Yellow arrow: toward the Sun; grey arrow: toward the Moon; green line: line of sight to the tracked site (amber while the slew is under way); orange: the prime meridian; the spacecraft marker dims in eclipse."
          >
            EME2000 · yellow: Sun · grey: Moon · green: line of sight
          </span>
        )}
        <select
          hidden={showOrbit || runs.length < 2}
          value={layout}
          onChange={(e) => setLayout(e.target.value as ViewLayout)}
          aria-label="layout of several runs"
          title="How several selected runs are shown"
        >
          <option value="overlay">overlay</option>
          <option value="side-by-side">side by side</option>
        </select>
      </div>
    </div>
  );
}
