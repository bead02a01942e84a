/**
 * The orbit view (app/view3d/orbitView.ts) on its own canvas, mounted while the 3D panel shows the
 * orbit. Same driving as the attitude view: data in when the output changes, playback time from
 * the clock's frame loop, a render when the time moved or after pointer input.
 */
import { useEffect, useRef, useState } from 'react';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { createOrbitView, type OrbitViewHandle } from '../../view3d/orbitView';
import { useApp } from '../context';
import { toOrbitViewData } from './orbitViewData';
import { canvasUpkeep } from './canvasUpkeep';

export function OrbitView3D({
  output,
  follow,
  onHandle,
}: {
  output: PipelineOutput | null;
  follow: boolean;
  onHandle?: (h: OrbitViewHandle | null) => void;
}) {
  const app = useApp();
  const host = useRef<HTMLDivElement>(null);
  const canvas = useRef<HTMLCanvasElement>(null);
  const view = useRef<OrbitViewHandle | null>(null);
  const needsRender = useRef(true);
  const [failure, setFailure] = useState<string | null>(null);

  useEffect(() => {
    const c = canvas.current;
    const h = host.current;
    if (!c || !h) return;
    let v: OrbitViewHandle;
    try {
      v = createOrbitView(c, { width: h.clientWidth, height: h.clientHeight, preserveDrawingBuffer: true });
    } catch (e) {
      setFailure(`Orbit view unavailable: ${(e as Error).message}`);
      return;
    }
    view.current = v;
    onHandle?.(v);
    // For the end-to-end tests and the console (as __slewsmithView for the attitude view).
    const hook = window as unknown as { __slewsmithOrbitView?: OrbitViewHandle };
    hook.__slewsmithOrbitView = v;
    const upkeep = canvasUpkeep(c, h, (w, hh) => {
      v.resize(w, hh);
      needsRender.current = true;
    });
    const offTick = app.clock.onTick((t, moved) => {
      if (moved) v.setTime(t);
      if (moved || needsRender.current || upkeep.active()) {
        needsRender.current = false;
        v.render();
      }
    });
    return () => {
      offTick();
      upkeep.dispose();
      v.dispose();
      if (hook.__slewsmithOrbitView === v) delete hook.__slewsmithOrbitView;
      view.current = null;
      onHandle?.(null);
    };
  }, [app, onHandle]);

  useEffect(() => {
    view.current?.setFollow(follow);
    needsRender.current = true;
  }, [follow]);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    v.setData(toOrbitViewData(output));
    v.setTime(app.clock.t);
    needsRender.current = true;
  }, [output, app]);

  return (
    <div className="view3d-canvas" ref={host} data-testid="orbit-view">
      <canvas ref={canvas} data-testid="orbit-view-canvas" />
      {failure && <div className="panel-empty overlay-msg">{failure}</div>}
    </div>
  );
}
