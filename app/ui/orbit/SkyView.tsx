/**
 * Sky view: the celestial sphere in the engine's inertial frame (EME2000) as a right ascension /
 * declination chart, with the chosen body axis' path over the shown run, the Sun and the Moon
 * (their path over the run), fixed cones on that body axis as circles on the sky, and where the
 * axis points at each target. At the playback time (the clock the 3D view and the plots share)
 * it marks the axis, aims the cones against the Sun, Moon, Earth and stations, and places the Sun
 * and Moon; the canvas is redrawn from the clock's frame listener, not through React state. The
 * geometry is skyModel.ts and skyPlayback.ts; this file only draws it on a canvas.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { useApp, useAppState } from '../context';
import { SelectField } from '../components/fields';
import { angleBetween, skyScene, SKY_AXES, type SkyPiece, type SkyScene } from './skyModel';
import { skyNow, type SkyNow } from './skyPlayback';
import { movingConeAvailable } from '../view/movingCones';

const COLOUR = {
  grid: '#d5dce6',
  trail: '#0b5cad',
  sun: '#a35a00',
  moon: '#5b6b80',
  keepOut: '#b3261e',
  keepIn: '#1d6b2f',
  target: '#1f2933',
  now: '#0b5cad',
};

function draw(canvas: HTMLCanvasElement, scene: SkyScene, now: SkyNow | null) {
  const cssW = canvas.clientWidth || 300;
  const cssH = Math.round(cssW / 2);
  const dpr = window.devicePixelRatio || 1;
  canvas.width = Math.round(cssW * dpr);
  canvas.height = Math.round(cssH * dpr);
  canvas.style.height = `${cssH}px`;
  const g = canvas.getContext('2d');
  if (!g) return;
  g.setTransform(dpr, 0, 0, dpr, 0, 0);
  // RA 0° at the left edge to 360° at the right, Dec +90° at the top.
  const x = (ra: number) => (ra / 360) * cssW;
  const y = (dec: number) => ((90 - dec) / 180) * cssH;
  g.fillStyle = '#f7f8fb';
  g.fillRect(0, 0, cssW, cssH);
  g.strokeStyle = COLOUR.grid;
  g.lineWidth = 1;
  g.fillStyle = '#3a4656';
  g.font = '11px system-ui, sans-serif';
  for (let ra = 0; ra <= 360; ra += 30) {
    g.beginPath();
    g.moveTo(x(ra), 0);
    g.lineTo(x(ra), cssH);
    g.stroke();
  }
  for (let dec = -60; dec <= 60; dec += 30) {
    g.beginPath();
    g.moveTo(0, y(dec));
    g.lineTo(cssW, y(dec));
    g.stroke();
  }
  g.strokeStyle = '#aab4c3';
  g.beginPath();
  g.moveTo(0, y(0));
  g.lineTo(cssW, y(0));
  g.stroke();
  for (let ra = 90; ra < 360; ra += 90) g.fillText(`${ra}°`, x(ra) + 2, cssH - 3);
  g.fillText('+60°', 2, y(60) - 2);
  g.fillText('−60°', 2, y(-60) - 2);
  const lines = (pieces: SkyPiece[]) => {
    for (const p of pieces) {
      g.beginPath();
      p.raDeg.forEach((ra, k) => (k === 0 ? g.moveTo(x(ra), y(p.decDeg[k]!)) : g.lineTo(x(ra), y(p.decDeg[k]!))));
      g.stroke();
    }
  };
  for (const c of [...scene.cones, ...(now?.cones ?? [])]) {
    g.strokeStyle = c.kind === 'keep-out' ? COLOUR.keepOut : COLOUR.keepIn;
    g.lineWidth = 1.5;
    g.setLineDash(c.kind === 'keep-out' ? [] : [5, 3]);
    lines(c.pieces);
  }
  g.setLineDash([]);
  g.lineWidth = 2;
  g.strokeStyle = COLOUR.sun;
  lines(scene.sunPath);
  g.strokeStyle = COLOUR.moon;
  lines(scene.moonPath);
  const disc = (m: { raDeg: number; decDeg: number } | null, colour: string, r: number, fill: boolean) => {
    if (!m) return;
    g.beginPath();
    g.arc(x(m.raDeg), y(m.decDeg), r, 0, 2 * Math.PI);
    if (fill) {
      g.fillStyle = colour;
      g.fill();
    } else {
      g.strokeStyle = colour;
      g.lineWidth = 2;
      g.stroke();
    }
  };
  disc(now?.sun ?? scene.sun, COLOUR.sun, 6, true);
  disc(now?.moon ?? scene.moon, COLOUR.moon, 5, true);
  g.strokeStyle = COLOUR.trail;
  g.lineWidth = 2;
  lines(scene.trail);
  disc(scene.trailStart, COLOUR.trail, 4, true);
  disc(scene.trailEnd, COLOUR.trail, 6, false);
  if (now?.axis) {
    // The axis at the playback time: a filled dot in a white ring, then a ring in the trail's colour.
    disc(now.axis, '#ffffff', 8, true);
    disc(now.axis, COLOUR.now, 5, true);
    disc(now.axis, COLOUR.now, 8, false);
  }
  g.font = '12px system-ui, sans-serif';
  for (const t of scene.targets) {
    g.strokeStyle = COLOUR.target;
    g.lineWidth = 1.5;
    const cx = x(t.raDeg),
      cy = y(t.decDeg);
    g.beginPath();
    g.moveTo(cx - 5, cy - 5);
    g.lineTo(cx + 5, cy + 5);
    g.moveTo(cx - 5, cy + 5);
    g.lineTo(cx + 5, cy - 5);
    g.stroke();
    g.fillStyle = COLOUR.target;
    g.fillText(t.label, cx + 6, cy - 6);
  }
}

/** The body axis to follow first: a tracking target's or a fixed cone's axis when it is a ±X/Y/Z axis, else +Z. */
function defaultAxis(candidates: readonly ArrayLike<number>[]): string {
  for (const c of candidates) {
    const hit = SKY_AXES.find((a) => angleBetween(a.axis, c) < 1e-9);
    if (hit) return hit.value;
  }
  return '+Z';
}

export function SkyView() {
  const app = useApp();
  const output = useAppState((s) => s.output);
  const runKey = useAppState((s) => s.selectedRunKeys[0] ?? null);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const suggested = useMemo(() => {
    if (!output) return '+Z';
    const axes: ArrayLike<number>[] = [];
    for (const t of output.scenario.file.targets ?? []) {
      const tr = (t as { track?: Record<string, { bodyAxis?: number[] }> }).track;
      const body = tr ? Object.values(tr)[0] : undefined;
      if (body?.bodyAxis) axes.push(body.bodyAxis);
    }
    // Cones the view draws: fixed ones, and moving ones it can aim (movingCones.ts).
    for (const c of output.constraints ?? [])
      if (c.directionKind === 'fixed' || movingConeAvailable(output, c.directionKind)) axes.push(c.bodyAxis);
    for (const k of output.keepOut) axes.push(k.bodyAxis);
    return defaultAxis(axes);
  }, [output]);
  const [chosen, setChosen] = useState<string | null>(null);
  const axisName = chosen ?? suggested;
  const axisVector = useMemo(() => SKY_AXES.find((a) => a.value === axisName)?.axis ?? [0, 0, 1], [axisName]);
  const scene = useMemo(() => (output ? skyScene(output, runKey, axisVector) : null), [output, runKey, axisVector]);
  const ref = useRef<HTMLCanvasElement | null>(null);
  const figure = useRef<HTMLElement | null>(null);
  useEffect(() => {
    const c = ref.current;
    if (!c || !scene || !output) return;
    const paint = () => {
      const now = skyNow(output, runKey, axisVector, app.clock.t);
      draw(c, scene, now);
      // For tests and tools: where the marker is (written here, not through React state).
      const f = figure.current;
      if (f) {
        f.dataset.nowT = String(now.t);
        f.dataset.nowRaDeg = now.axis ? now.axis.raDeg.toFixed(6) : '';
        f.dataset.nowDecDeg = now.axis ? now.axis.decDeg.toFixed(6) : '';
        f.dataset.movingCones = String(now.cones.length);
        f.dataset.sunRaDeg = now.sun ? now.sun.raDeg.toFixed(6) : '';
      }
    };
    paint();
    const off = app.clock.onFrame(paint);
    const ro = new ResizeObserver(paint);
    ro.observe(c);
    return () => {
      off();
      ro.disconnect();
    };
  }, [scene, output, runKey, axisVector, app]);
  const movingLabels = useMemo(
    () =>
      !output
        ? []
        : (output.scenario.file.constraints ?? [])
            .filter((c) => movingConeAvailable(output, c.direction.kind) && angleBetween(c.bodyAxis, axisVector) < 1e-9)
            .map((c) => ({ label: c.name, kind: c.kind })),
    [output, axisVector],
  );
  if (!output || !scene) return null;
  const run = output.runs.find((r) => r.key === runKey);
  const minutes = scene.spanS / 60;
  return (
    <figure
      ref={figure}
      className={`sky-view ${current ? '' : 'stale'}`}
      data-testid="sky-view"
      data-points={scene.trail.reduce((s, p) => s + p.raDeg.length, 0)}
    >
      <div className="panel-head">Sky view</div>
      <SelectField
        label="Body axis"
        value={axisName}
        choices={SKY_AXES}
        title="The body axis whose direction is drawn over the shown run"
        onChoose={(v) => setChosen(v)}
      />
      <canvas
        ref={ref}
        role="img"
        aria-label={`Sky chart in EME2000: right ascension 0° to 360° by declination −90° to 90°, the body ${axisName} axis over the run, the Sun, the Moon, cones and targets`}
      />
      <figcaption>
        EME2000 sky, right ascension 0° (left) to 360° by declination −90° to 90°, grid every 30°.{' '}
        <span style={{ color: COLOUR.trail }}>
          ● body {axisName}{' '}
          {run
            ? `over ${run.label} (${minutes < 2 ? `${scene.spanS.toFixed(0)} s` : `${minutes.toFixed(1)} min`}), ○ at the end, ◉ at the playback time`
            : '(no run yet)'}
        </span>{' '}
        <span style={{ color: COLOUR.sun }}>● Sun</span> <span style={{ color: COLOUR.moon }}>● Moon</span>
        {output.orbit
          ? output.orbitView
            ? ' (from the spacecraft, at the playback time; line: over the run)'
            : ' (from the spacecraft, at the start; line: over the run)'
          : ' (geocentric, at the playback time)'}
        {scene.cones.map((c, k) => (
          <span key={k} style={{ color: c.kind === 'keep-out' ? COLOUR.keepOut : COLOUR.keepIn }}>
            {' '}
            ◯ {c.label} ({c.kind === 'keep-out' ? 'keep-out' : 'keep-in, dashed'})
          </span>
        ))}
        {movingLabels.map((c, k) => (
          <span key={`m${k}`} style={{ color: c.kind === 'keep-out' ? COLOUR.keepOut : COLOUR.keepIn }}>
            {' '}
            ◯ {c.label} ({c.kind === 'keep-out' ? 'keep-out' : 'keep-in, dashed'}, at the playback time)
          </span>
        ))}
        . ✕ n: the axis at target n.
      </figcaption>
    </figure>
  );
}
