/**
 * Ground track of an orbit scenario on a plain longitude/latitude grid (equirectangular): the
 * sub-spacecraft point over the horizon (geodetic, PipelineOutput.orbit.track), cut at the
 * antimeridian, with the sites and the arcs of each site's passes drawn thicker in the site's
 * colour. A canvas; the legend under it is text.
 */
import { useEffect, useRef } from 'react';
import type { OrbitOutput } from '../../engine/pipeline/orbit';
import { DEG_PER_RAD } from '../../engine/units';
import { groundTrackPieces, wrapLongitudeDeg } from './orbitRows';

/** Site colours (dark enough for 4.5:1 on white). */
const COLOURS = ['#0b5cad', '#a3330b', '#1d6b2f', '#7a2a8c', '#6b5200', '#005f66'];

export function siteColour(k: number): string {
  return COLOURS[k % COLOURS.length]!;
}

function draw(canvas: HTMLCanvasElement, orbit: OrbitOutput) {
  const cssW = canvas.clientWidth || 300;
  const cssH = Math.round(cssW / 2);
  const dpr = window.devicePixelRatio || 1;
  canvas.width = Math.round(cssW * dpr);
  canvas.height = Math.round(cssH * dpr);
  canvas.style.height = `${cssH}px`;
  const g = canvas.getContext('2d');
  if (!g) return;
  g.setTransform(dpr, 0, 0, dpr, 0, 0);
  const x = (lon: number) => ((lon + 180) / 360) * cssW;
  const y = (lat: number) => ((90 - lat) / 180) * cssH;
  g.fillStyle = '#f4f7fb';
  g.fillRect(0, 0, cssW, cssH);
  g.strokeStyle = '#d5dce6';
  g.lineWidth = 1;
  for (let lon = -180; lon <= 180; lon += 30) {
    g.beginPath();
    g.moveTo(x(lon), 0);
    g.lineTo(x(lon), cssH);
    g.stroke();
  }
  for (let lat = -90; lat <= 90; lat += 30) {
    g.beginPath();
    g.moveTo(0, y(lat));
    g.lineTo(cssW, y(lat));
    g.stroke();
  }
  const tr = orbit.track;
  const path = (lat: ArrayLike<number>, lon: ArrayLike<number>) => {
    for (const p of groundTrackPieces(lat, lon)) {
      g.beginPath();
      p.lonDeg.forEach((lo, k) => (k === 0 ? g.moveTo(x(lo), y(p.latDeg[k]!)) : g.lineTo(x(lo), y(p.latDeg[k]!))));
      g.stroke();
    }
  };
  g.strokeStyle = '#5b6b80';
  g.lineWidth = 1.2;
  path(tr.latitudeRad, tr.longitudeRad);
  // Start of the track.
  if (tr.t.length > 0) {
    g.fillStyle = '#1f2933';
    g.beginPath();
    g.arc(x(wrapLongitudeDeg(tr.longitudeRad[0]! * DEG_PER_RAD)), y(tr.latitudeRad[0]! * DEG_PER_RAD), 3.5, 0, 2 * Math.PI);
    g.fill();
  }
  orbit.sites.forEach((s, k) => {
    const c = siteColour(k);
    g.strokeStyle = c;
    g.lineWidth = 3.5;
    for (const p of s.passes) {
      const i0 = Math.max(0, Math.ceil(p.startS / tr.stepS));
      const i1 = Math.min(tr.t.length - 1, Math.floor(p.endS / tr.stepS));
      if (i1 > i0) path(tr.latitudeRad.subarray(i0, i1 + 1), tr.longitudeRad.subarray(i0, i1 + 1));
    }
    g.fillStyle = c;
    g.beginPath();
    const sx = x(wrapLongitudeDeg(s.longitudeRad * DEG_PER_RAD)),
      sy = y(s.latitudeRad * DEG_PER_RAD);
    g.rect(sx - 3.5, sy - 3.5, 7, 7);
    g.fill();
  });
}

export function GroundTrack({ orbit }: { orbit: OrbitOutput }) {
  const ref = useRef<HTMLCanvasElement | null>(null);
  useEffect(() => {
    const c = ref.current;
    if (!c) return;
    draw(c, orbit);
    const ro = new ResizeObserver(() => draw(c, orbit));
    ro.observe(c);
    return () => ro.disconnect();
  }, [orbit]);
  return (
    <figure className="ground-track" data-testid="ground-track">
      <canvas
        ref={ref}
        role="img"
        aria-label="Ground track: longitude and latitude of the sub-spacecraft point, with the sites and their pass arcs"
      />
      <figcaption>
        Ground track, longitude −180° to 180° by latitude −90° to 90° (grid every 30°), over {Math.round(orbit.horizonS / 60)} min; dot: t =
        0.{' '}
        {orbit.sites.map((s, k) => (
          <span key={s.id} className="ground-track-key" style={{ color: siteColour(k) }}>
            ■ {s.label} ({s.passes.length} pass{s.passes.length === 1 ? '' : 'es'})
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
