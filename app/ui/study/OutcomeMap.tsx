/**
 * The outcome map over initial attitudes (mapModel.ts / mapScene.ts), with the controller and
 * colour choice, a legend, and a case read-out under the pointer; a click on a case opens it as a
 * normal run with the chosen controller.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { MapPoint, StudyInfo } from '../../engine/study';
import { fmt } from '../format';
import { mapGeometry, OUTCOME_COLOURS, OUTCOME_TEXT, OUTCOMES, rgbCss, settleRamp, type MapColourMode } from './mapModel';
import { createOutcomeMapView, type OutcomeMapView } from './mapScene';
import { useStudySession } from './registry';

export function OutcomeMap({ info, points }: { info: StudyInfo; points: MapPoint[] }) {
  const session = useStudySession();
  const host = useRef<HTMLDivElement>(null);
  const canvas = useRef<HTMLCanvasElement>(null);
  const view = useRef<OutcomeMapView | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const [controller, setController] = useState(0);
  const [mode, setMode] = useState<MapColourMode>('settle');
  const [hover, setHover] = useState<{ i: number; x: number; y: number } | null>(null);
  const [drawn, setDrawn] = useState(0);
  const ci = Math.min(controller, Math.max(0, info.controllers.length - 1));
  const geometry = useMemo(() => mapGeometry(points, ci, mode), [points, ci, mode]);
  const geomRef = useRef(geometry);
  geomRef.current = geometry;

  useEffect(() => {
    const c = canvas.current;
    const h = host.current;
    if (!c || !h) return;
    let v: OutcomeMapView;
    try {
      v = createOutcomeMapView(c, { width: h.clientWidth, height: h.clientHeight, preserveDrawingBuffer: true });
    } catch (e) {
      setFailure(`Map unavailable: ${(e as Error).message}`);
      return;
    }
    view.current = v;
    v.setData(geomRef.current);
    setDrawn(v.stats().filled + v.stats().hollow);
    const ro = new ResizeObserver(() => v.resize(h.clientWidth, h.clientHeight));
    ro.observe(h);
    return () => {
      ro.disconnect();
      v.dispose();
      view.current = null;
    };
  }, []);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    v.setData(geometry);
    setDrawn(v.stats().filled + v.stats().hollow);
  }, [geometry]);

  const at = (e: React.PointerEvent | React.MouseEvent) => {
    const r = (e.currentTarget as HTMLElement).getBoundingClientRect();
    return { x: e.clientX - r.left, y: e.clientY - r.top };
  };
  const onMove = (e: React.PointerEvent) => {
    if (e.buttons) return setHover(null);
    const p = at(e);
    const i = view.current?.pick(p.x, p.y) ?? -1;
    setHover(i >= 0 ? { i, ...p } : null);
  };
  const down = useRef<{ x: number; y: number } | null>(null);
  const onClick = (e: React.MouseEvent) => {
    const p = at(e);
    const d = down.current;
    if (d && Math.hypot(d.x - p.x, d.y - p.y) > 3) return; // a drag turned the view
    const i = view.current?.pick(p.x, p.y) ?? -1;
    if (i >= 0) void session.openCase(geometry.caseIndex[i]!, info.controllers[ci]!.id);
  };

  const h = hover && hover.i < geometry.count ? hover : null;
  return (
    <div className="study-map" data-testid="study-map" data-points={geometry.count} data-drawn={drawn}>
      <div className="study-card-head">
        Outcome over initial attitudes
        <select
          aria-label="controller shown on the map"
          value={ci}
          onChange={(e) => setController(Number(e.target.value))}
          data-testid="map-controller"
        >
          {info.controllers.map((c, i) => (
            <option key={c.id} value={i}>
              {c.label}
            </option>
          ))}
        </select>
        <select aria-label="map colours" value={mode} onChange={(e) => setMode(e.target.value as MapColourMode)} data-testid="map-colour">
          <option value="settle">colour: settle time</option>
          <option value="outcome">colour: outcome</option>
        </select>
        <button className="small" onClick={() => view.current?.resetCamera()}>
          reset view
        </button>
      </div>
      <div className="study-map-canvas" ref={host}>
        <canvas
          ref={canvas}
          data-testid="study-map-canvas"
          onPointerDown={(e) => (down.current = at(e))}
          onPointerMove={onMove}
          onPointerLeave={() => setHover(null)}
          onClick={onClick}
        />
        {failure && <div className="overlay-msg">{failure}</div>}
        {h && (
          <div className="map-tip" style={{ left: h.x + 12, top: h.y + 8 }} data-testid="map-tip">
            case {geometry.caseIndex[h.i]} · {fmt(geometry.angleDeg[h.i], 4)}° · {OUTCOME_TEXT[geometry.outcome[h.i]!]}
            {geometry.settleTimeS[h.i] !== null && ` in ${fmt(geometry.settleTimeS[h.i], 3)} s`}
            {geometry.far[h.i] ? ' · η₀ < 0' : ''}
            <div className="muted">click to open as a run</div>
          </div>
        )}
      </div>
      <div className="map-legend" data-testid="map-legend">
        {mode === 'settle' && (
          <span className="ramp-block">
            settled in
            <span className="ramp">
              {Array.from({ length: 24 }, (_, k) => (
                <span key={k} style={{ background: rgbCss(settleRamp(k / 23)) }} />
              ))}
            </span>
            {fmt(geometry.settleMinS, 3)} – {fmt(geometry.settleMaxS, 3)} s
          </span>
        )}
        {OUTCOMES.filter((o) => mode === 'outcome' || (o !== 'settled' && o !== 'unwound' && o !== 'chattered')).map((o) => (
          <span key={o} className="legend-item">
            <span className="dot" style={{ background: OUTCOME_COLOURS[o] }} />
            {OUTCOME_TEXT[o]} ({geometry.counts[o]})
          </span>
        ))}
        <span className="legend-item">
          <span className="dot" /> η₀ ≥ 0
        </span>
        <span className="legend-item">
          <span className="dot ring" /> η₀ &lt; 0 (far hemisphere)
        </span>
      </div>
      <div className="map-caption">
        One point per case: its initial error rotation q_target* ⊗ q0, in the direction of the rotation axis (target axes X<sub>T</sub>, Y
        <sub>T</sub>, Z<sub>T</sub>) at a distance from the centre of angle / 180° (the wire sphere is 180°, the inner circles 90°). Drag to
        turn, click a point to open that case.
      </div>
    </div>
  );
}
