/**
 * uPlot charts from PlotSpecs: one cursor synchronised across every chart (uPlot cursor sync),
 * x zoom shared through a chart group, a playhead line moved by the frame loop (no redraw),
 * click-to-scrub, segment starts and arrivals (labelled where there is room), jump markers and
 * shaded intervals drawn in a draw hook, PNG snapshots with a caption (pngCaption.ts).
 *
 * Canvas text is at least 11 CSS px (axis values 12 px); uPlot multiplies by the device pixel
 * ratio itself, our own draw hook does the same.
 */
import uPlot from 'uplot';
import { fmt } from '../format';
import type { PlotSpec } from './series';
import { captionLines, wrapText, type CaptionContext } from './pngCaption';
import { decimateAligned } from './decimate';
import { bandPixels, ECLIPSE_BAND_FILL, ECLIPSE_BAND_TEXT, WINDOW_BAND_FILL, WINDOW_BAND_TEXT } from './windowBands';

const CURSOR_SYNC_KEY = 'slewsmith-time';

export interface ChartGroup {
  charts: Set<uPlot>;
  syncing: boolean;
}

export function createChartGroup(): ChartGroup {
  return { charts: new Set(), syncing: false };
}

export interface ChartHandle {
  readonly plot: uPlot;
  setData(spec: PlotSpec): void;
  resize(width: number, height: number): void;
  setPlayhead(t: number): void;
  /** PNG of the chart with its caption (title, scenario, time axis, caution) and a legend. */
  toPng(caption: CaptionContext): Promise<Uint8Array>;
  destroy(): void;
}

const FAMILY = 'system-ui, -apple-system, "Segoe UI", sans-serif';
/** Axis values and titles, CSS px (at least 11 px: the renderer's text rule). */
const AXIS_FONT_PX = 12;
/** Segment labels drawn in the plot area, CSS px. */
const MARKER_FONT_PX = 11;
const FONT = `${AXIS_FONT_PX}px ${FAMILY}`;
const AXIS_STROKE = '#3d4654';
const GRID = { stroke: 'rgba(80, 90, 105, 0.12)', width: 1 };

function valueFormatter(_u: uPlot, v: number | null): string {
  return v === null || v === undefined ? '—' : fmt(v, 4);
}

/** On a log axis only the decades get a label; the minor ticks stay as grid lines. */
function logTickLabels(_u: uPlot, vals: number[]): string[] {
  return vals.map((v) => {
    const e = Math.log10(v);
    return Math.abs(e - Math.round(e)) < 1e-9 ? fmt(v, 1) : '';
  });
}

/** Structure key: charts are rebuilt when this changes, and only fed new data otherwise. */
export function structureKey(spec: PlotSpec): string {
  return [spec.id, spec.log ? 'log' : 'lin', spec.y2Label ?? '', ...spec.series.map((s) => `${s.label}|${s.color}|${s.scale ?? 'y'}`)].join(
    ';',
  );
}

/** Shaded intervals: monitor flags, wheels at a limit. */
function drawIntervals(u: uPlot, s: PlotSpec, xMin: number, xMax: number, dpr: number): void {
  if (!s.intervals?.length) return;
  const { top, height } = u.bbox;
  for (const iv of s.intervals) {
    if (iv.t1 < xMin || iv.t0 > xMax) continue;
    const x0 = u.valToPos(iv.t0, 'x', true);
    const x1 = u.valToPos(iv.t1, 'x', true);
    u.ctx.fillStyle = iv.color ?? 'rgba(214, 96, 20, 0.18)';
    u.ctx.fillRect(x0, top, Math.max(2 * dpr, x1 - x0), height);
  }
}

/**
 * Orbit bands (windowBands.ts): planned site/station windows and eclipses over the full height.
 * Labels sit near the bottom (windows one line above eclipses, which they often overlap): the
 * full name inside the band where it fits, else its first word, else that word just right of the
 * band when there is room before the next band of the same kind, else none.
 */
function drawWindowBands(u: uPlot, s: PlotSpec, xMin: number, xMax: number, dpr: number): void {
  const bands = s.windowBands;
  if (!bands?.length) return;
  const ctx = u.ctx;
  const { top, height, left, width } = u.bbox;
  const spans = bands.map((b) => bandPixels(b.t0, b.t1, xMin, xMax, left, width));
  bands.forEach((b, i) => {
    const px = spans[i];
    if (!px) return;
    ctx.fillStyle = b.kind === 'eclipse' ? ECLIPSE_BAND_FILL : WINDOW_BAND_FILL;
    ctx.fillRect(px.x0, top, Math.max(2 * dpr, px.x1 - px.x0), height);
  });
  ctx.font = `${MARKER_FONT_PX * dpr}px ${FAMILY}`;
  ctx.textBaseline = 'bottom';
  ctx.textAlign = 'left';
  const pad = 3 * dpr;
  const lineH = (MARKER_FONT_PX + 3) * dpr;
  bands.forEach((b, i) => {
    const px = spans[i];
    if (!px) return;
    let next = left + width;
    for (let k = i + 1; k < bands.length; k++) {
      const q = spans[k];
      if (bands[k]!.kind === b.kind && q) {
        next = q.x0;
        break;
      }
    }
    const short = b.label.split(/[\s(]/)[0] || b.label;
    const fits = (t: string, room: number) => ctx.measureText(t).width <= room;
    const inside = Math.max(2 * dpr, px.x1 - px.x0) - 2 * pad;
    let x = px.x0 + pad;
    let text = fits(b.label, inside) ? b.label : fits(short, inside) ? short : '';
    if (!text && fits(short, next - px.x1 - 2 * pad)) {
      text = short;
      x = px.x1 + pad;
    }
    if (!text) return;
    ctx.fillStyle = b.kind === 'eclipse' ? ECLIPSE_BAND_TEXT : WINDOW_BAND_TEXT;
    ctx.fillText(text, x, top + height - pad - (b.kind === 'window' ? lineH : 0));
  });
}

/**
 * Segment starts (solid) and planned arrivals (dotted), with "n label" at the top of each start
 * where it fits before the next start, else just the target number, else nothing.
 */
function drawSegments(u: uPlot, s: PlotSpec, xMin: number, xMax: number, dpr: number): void {
  const marks = s.markers;
  if (!marks?.length) return;
  const ctx = u.ctx;
  const { top, height, left, width } = u.bbox;
  ctx.lineWidth = dpr;
  for (const m of marks) {
    if (m.t < xMin || m.t > xMax) continue;
    const x = Math.round(u.valToPos(m.t, 'x', true)) + 0.5;
    ctx.strokeStyle = m.kind === 'segment' ? 'rgba(40, 48, 60, 0.55)' : 'rgba(40, 48, 60, 0.4)';
    ctx.setLineDash(m.kind === 'segment' ? [] : [2 * dpr, 3 * dpr]);
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
    ctx.stroke();
  }
  ctx.setLineDash([]);
  ctx.font = `600 ${MARKER_FONT_PX * dpr}px ${FAMILY}`;
  ctx.textBaseline = 'top';
  // uPlot leaves its own text alignment (axis labels are centred) on the context.
  ctx.textAlign = 'left';
  const starts = marks.filter((m) => m.kind === 'segment' && m.t >= xMin && m.t <= xMax);
  const pad = 3 * dpr;
  const lineH = (MARKER_FONT_PX + 3) * dpr;
  starts.forEach((m, i) => {
    const x = u.valToPos(m.t, 'x', true) + pad;
    const next = i + 1 < starts.length ? u.valToPos(starts[i + 1]!.t, 'x', true) : left + width;
    const room = next - x - pad;
    const full = `${m.number} ${m.label}`;
    const text = ctx.measureText(full).width <= room ? full : ctx.measureText(String(m.number)).width <= room ? String(m.number) : '';
    if (!text) return;
    const w = ctx.measureText(text).width;
    ctx.fillStyle = 'rgba(255, 255, 255, 0.85)';
    ctx.fillRect(x - 1 * dpr, top + 1 * dpr, w + 2 * dpr, lineH);
    ctx.fillStyle = '#28303c';
    ctx.fillText(text, x, top + 2 * dpr);
  });
}

function drawJumps(u: uPlot, s: PlotSpec, xMin: number, xMax: number, dpr: number): void {
  if (!s.jumpTimes?.length) return;
  const ctx = u.ctx;
  const { top, height } = u.bbox;
  ctx.strokeStyle = 'rgba(142, 68, 173, 0.55)';
  ctx.lineWidth = dpr;
  ctx.setLineDash([3 * dpr, 3 * dpr]);
  ctx.beginPath();
  for (const t of s.jumpTimes) {
    if (t < xMin || t > xMax) continue;
    const x = Math.round(u.valToPos(t, 'x', true)) + 0.5;
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
  }
  ctx.stroke();
  // A small triangle at the bottom of each jump line, so jumps read even over dense data.
  ctx.setLineDash([]);
  ctx.fillStyle = 'rgba(142, 68, 173, 0.9)';
  const a = 4 * dpr;
  for (const t of s.jumpTimes) {
    if (t < xMin || t > xMax) continue;
    const x = u.valToPos(t, 'x', true);
    ctx.beginPath();
    ctx.moveTo(x - a, top + height);
    ctx.lineTo(x + a, top + height);
    ctx.lineTo(x, top + height - 1.6 * a);
    ctx.fill();
  }
}

function drawMarkers(spec: () => PlotSpec) {
  return (u: uPlot) => {
    const s = spec();
    const ctx = u.ctx;
    const { left, top, width, height } = u.bbox;
    const xMin = u.scales.x!.min ?? -Infinity;
    const xMax = u.scales.x!.max ?? Infinity;
    const dpr = u.ctx.canvas.width / Math.max(1, u.width);
    ctx.save();
    ctx.beginPath();
    ctx.rect(left, top, width, height);
    ctx.clip();
    drawWindowBands(u, s, xMin, xMax, dpr);
    drawIntervals(u, s, xMin, xMax, dpr);
    drawJumps(u, s, xMin, xMax, dpr);
    drawSegments(u, s, xMin, xMax, dpr);
    ctx.restore();
  };
}

function buildOptions(
  spec: PlotSpec,
  width: number,
  height: number,
  group: ChartGroup,
  current: () => PlotSpec,
  /** Called on every x range change; true when it is a zoom (or its undo) to share with the group. */
  onZoom: (u: uPlot) => boolean,
): uPlot.Options {
  const stepped = uPlot.paths.stepped?.({ align: 1 });
  const hasJ = spec.series.some((s) => s.scale === 'j');
  const axes: uPlot.Axis[] = [
    { label: 't (s from epoch)', stroke: AXIS_STROKE, font: FONT, labelFont: FONT, grid: GRID, ticks: GRID, size: 36, labelSize: 18 },
    {
      label: spec.yLabel,
      stroke: AXIS_STROKE,
      font: FONT,
      labelFont: FONT,
      grid: GRID,
      ticks: GRID,
      scale: 'y',
      size: 62,
      labelSize: 18,
      values: spec.log ? logTickLabels : (_u, vals) => vals.map((v) => fmt(v, 3)),
    },
  ];
  if (hasJ)
    axes.push({
      label: spec.y2Label,
      stroke: AXIS_STROKE,
      font: FONT,
      labelFont: FONT,
      scale: 'j',
      side: 1,
      grid: { show: false },
      size: 44,
      labelSize: 18,
      values: (_u, vals) => vals.map((v) => (Number.isInteger(v) ? String(v) : '')),
    });
  return {
    width,
    height,
    pxAlign: false,
    scales: {
      x: { time: false },
      y: spec.log ? { distr: 3, log: 10 } : { auto: true },
      ...(hasJ
        ? { j: { auto: true, range: (_u: uPlot, min: number, max: number) => [Math.min(0, min) - 0.5, max + 0.5] as uPlot.Range.MinMax } }
        : {}),
    },
    series: [
      { label: 't (s)', value: (_u, v) => (v === null || v === undefined ? '—' : `${v.toFixed(2)}`) },
      ...spec.series.map<uPlot.Series>((s) => ({
        label: s.label,
        stroke: s.color,
        width: s.width ?? 1.5,
        dash: s.dash,
        scale: s.scale ?? 'y',
        paths: s.stepped ? stepped : undefined,
        points: { show: false },
        value: valueFormatter,
        spanGaps: false,
      })),
    ],
    bands: spec.bands?.map((b) => ({ series: [b.upper, b.lower] as uPlot.Band.Bounds, fill: b.color })),
    axes,
    cursor: { sync: { key: CURSOR_SYNC_KEY, setSeries: false }, drag: { x: true, y: false, setScale: true }, points: { size: 6 } },
    legend: { live: true },
    hooks: {
      draw: [drawMarkers(current)],
      setScale: [
        (u, key) => {
          // Share the x zoom with every other chart of the group: a zoom or its undo, not the
          // range a new output sets (each chart takes that from its own data).
          if (key !== 'x' || !onZoom(u) || group.syncing) return;
          group.syncing = true;
          const { min, max } = u.scales.x!;
          for (const other of group.charts) if (other !== u && min !== undefined && max !== undefined) other.setScale('x', { min, max });
          group.syncing = false;
        },
      ],
    },
  };
}

export function createChart(
  target: HTMLElement,
  initial: PlotSpec,
  size: { width: number; height: number },
  group: ChartGroup,
  onScrub: (t: number) => void,
): ChartHandle {
  let spec = initial;
  // Display only (decimate.ts): about one kept sample group per canvas pixel column of the shown
  // x range; the full columns stay in `spec`, and a zoom thins them again for its own range.
  const dprNow = () => (typeof devicePixelRatio === 'number' && devicePixelRatio > 0 ? devicePixelRatio : 1);
  let columns = Math.max(1, Math.round(size.width * dprNow()));
  let pendingZoom = false;
  /** The x range the shown columns were thinned for (null: the whole extent). */
  let thinnedFor: [number, number] | null = null;
  const thin = (range: [number, number] | null) => {
    thinnedFor = range;
    return decimateAligned(spec.data, columns, range?.[0], range?.[1]) as uPlot.AlignedData;
  };
  /** The x range now shown, or null when it covers every sample. */
  const shownRange = (u: uPlot): [number, number] | null => {
    const { min, max } = u.scales.x!;
    const x = spec.data[0];
    if (min === undefined || max === undefined || !x || x.length === 0) return null;
    return min <= (x[0] as number) && max >= (x[x.length - 1] as number) ? null : [min, max];
  };
  /** After an x zoom (or its undo) or a resize: the columns thinned for the range shown, y re-ranged on them. */
  const rethin = () => {
    pendingZoom = false;
    const range = shownRange(plot);
    const { min, max } = plot.scales.x!;
    plot.setData(thin(range), false);
    if (min !== undefined && max !== undefined) plot.setScale('x', { min, max });
  };
  /** True when the x range is a zoom or leaves one (not the whole extent a new output sets). */
  const onZoom = (u: uPlot, force = false): boolean => {
    const range = shownRange(u);
    const zoom = range !== null || thinnedFor !== null;
    if (pendingZoom) return zoom;
    const same = range === null ? thinnedFor === null : thinnedFor !== null && range[0] === thinnedFor[0] && range[1] === thinnedFor[1];
    if (same && !force) return zoom;
    pendingZoom = true;
    queueMicrotask(rethin);
    return zoom;
  };
  const plot = new uPlot(
    buildOptions(
      spec,
      size.width,
      size.height,
      group,
      () => spec,
      (u) => onZoom(u),
    ),
    thin(null),
    target,
  );
  group.charts.add(plot);
  // For the end-to-end tests (band pixels against uPlot's own valToPos); nothing in the app reads it.
  (target as HTMLElement & { __slewsmithPlot?: uPlot }).__slewsmithPlot = plot;

  const playhead = document.createElement('div');
  playhead.className = 'playhead';
  plot.over.appendChild(playhead);

  // A click without a drag scrubs to that time; a drag zooms (uPlot's own select).
  let downX = NaN;
  const onDown = (e: MouseEvent) => (downX = e.clientX);
  const onUp = (e: MouseEvent) => {
    if (Math.abs(e.clientX - downX) < 3) {
      const rect = plot.over.getBoundingClientRect();
      onScrub(plot.posToVal(e.clientX - rect.left, 'x'));
    }
    downX = NaN;
  };
  plot.over.addEventListener('mousedown', onDown);
  plot.over.addEventListener('mouseup', onUp);

  let lastT = 0;
  const place = (t: number) => {
    lastT = t;
    const x = plot.valToPos(t, 'x');
    // The plot area's CSS width from uPlot's own box (canvas px over the canvas's pixel ratio):
    // reading over.clientWidth here forced a layout for every chart at every new output.
    const w = plot.bbox.width / (plot.ctx.canvas.width / Math.max(1, plot.width));
    if (!Number.isFinite(x) || x < 0 || x > w) playhead.style.display = 'none';
    else {
      playhead.style.display = 'block';
      playhead.style.transform = `translateX(${x}px)`;
    }
  };

  return {
    plot,
    setData(next) {
      spec = next;
      plot.setData(thin(null));
      place(lastT);
    },
    resize(width, height) {
      plot.setSize({ width, height });
      const next = Math.max(1, Math.round(width * dprNow()));
      if (next !== columns) {
        columns = next;
        void onZoom(plot, true);
      }
      place(lastT);
    },
    setPlayhead: place,
    async toPng(caption) {
      const src = plot.ctx.canvas;
      const dpr = src.width / Math.max(1, plot.width);
      const pad = 10 * dpr;
      const maxW = src.width;
      const c = document.createElement('canvas');
      const ctx = c.getContext('2d');
      if (!ctx) throw new Error('2D canvas unavailable');
      const fonts = {
        title: `600 ${14 * dpr}px ${FAMILY}`,
        info: `${12 * dpr}px ${FAMILY}`,
        caution: `italic ${11 * dpr}px ${FAMILY}`,
      };
      const lineH = { title: 20 * dpr, info: 17 * dpr, caution: 15 * dpr };
      const lines: { text: string; kind: keyof typeof fonts }[] = [];
      for (const l of captionLines(spec.title, caption)) {
        ctx.font = fonts[l.kind];
        for (const t of wrapText(l.text, maxW, (x) => ctx.measureText(x).width)) lines.push({ text: t, kind: l.kind });
      }
      const headH = lines.reduce((h, l) => h + lineH[l.kind], 0) + 4 * dpr;
      // Legend entries in rows that fit the plot's width.
      const legendFont = `${12 * dpr}px ${FAMILY}`;
      const rowH = 20 * dpr;
      ctx.font = legendFont;
      // Series first, then the orbit bands' kinds (windowBands.ts) as filled swatches.
      const bandKinds = new Set((spec.windowBands ?? []).map((b) => b.kind));
      const items: { label: string; color: string; dash?: number[]; fill?: string }[] = [
        ...spec.series.map((s) => ({ label: s.label, color: s.color, dash: s.dash })),
        ...(bandKinds.has('window') ? [{ label: 'planned window (site named in the band)', color: '', fill: WINDOW_BAND_FILL }] : []),
        ...(bandKinds.has('eclipse') ? [{ label: 'eclipse', color: '', fill: ECLIPSE_BAND_FILL }] : []),
      ];
      const entries: { s: (typeof items)[number]; x: number; row: number }[] = [];
      let lx = 0,
        row = 0;
      for (const s of items) {
        const w = 28 * dpr + ctx.measureText(s.label).width;
        if (lx > 0 && lx + w > maxW) {
          lx = 0;
          row++;
        }
        entries.push({ s, x: lx, row });
        lx += w;
      }
      const legendH = (row + 1) * rowH + 4 * dpr;
      c.width = src.width + 2 * pad;
      c.height = src.height + headH + legendH + 2 * pad;
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(0, 0, c.width, c.height);
      ctx.textBaseline = 'middle';
      let y = pad;
      for (const l of lines) {
        ctx.font = fonts[l.kind];
        ctx.fillStyle = l.kind === 'caution' ? '#5c3d00' : '#1f2731';
        ctx.fillText(l.text, pad, y + lineH[l.kind] / 2);
        y += lineH[l.kind];
      }
      ctx.drawImage(src, pad, pad + headH);
      ctx.font = legendFont;
      for (const e of entries) {
        const x = pad + e.x;
        const ly = pad + headH + src.height + 4 * dpr + e.row * rowH + rowH / 2;
        if (e.s.fill) {
          ctx.fillStyle = e.s.fill;
          ctx.fillRect(x, ly - 6 * dpr, 16 * dpr, 12 * dpr);
        } else {
          ctx.strokeStyle = e.s.color;
          ctx.lineWidth = 2 * dpr;
          ctx.setLineDash((e.s.dash ?? []).map((d) => d * dpr));
          ctx.beginPath();
          ctx.moveTo(x, ly);
          ctx.lineTo(x + 16 * dpr, ly);
          ctx.stroke();
          ctx.setLineDash([]);
        }
        ctx.fillStyle = '#1f2731';
        ctx.fillText(e.s.label, x + 20 * dpr, ly);
      }
      const blob = await new Promise<Blob | null>((resolve) => c.toBlob(resolve, 'image/png'));
      if (!blob) throw new Error('PNG encoding failed');
      return new Uint8Array(await blob.arrayBuffer());
    },
    destroy() {
      group.charts.delete(plot);
      plot.over.removeEventListener('mousedown', onDown);
      plot.over.removeEventListener('mouseup', onUp);
      plot.destroy();
    },
  };
}
