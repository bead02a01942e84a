/**
 * uPlot charts from PlotSpecs: one cursor synchronised across every chart (uPlot cursor sync),
 * x zoom shared through a chart group, a playhead line moved by the frame loop (no redraw),
 * click-to-scrub, jump markers and flagged intervals drawn in a draw hook, PNG snapshots.
 */
import uPlot from 'uplot';
import { fmt } from '../format';
import type { PlotSpec } from './series';

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
  /** PNG of the chart with its title and a legend line. */
  toPng(): Promise<Uint8Array>;
  destroy(): void;
}

const FONT = '11px system-ui, -apple-system, "Segoe UI", sans-serif';
const AXIS_STROKE = '#4a5563';
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

function drawMarkers(spec: () => PlotSpec) {
  return (u: uPlot) => {
    const s = spec();
    if (!s.jumpTimes?.length && !s.intervals?.length) return;
    const ctx = u.ctx;
    const { left, top, width, height } = u.bbox;
    const xMin = u.scales.x!.min ?? -Infinity;
    const xMax = u.scales.x!.max ?? Infinity;
    ctx.save();
    ctx.beginPath();
    ctx.rect(left, top, width, height);
    ctx.clip();
    if (s.intervals) {
      ctx.fillStyle = 'rgba(214, 96, 20, 0.18)';
      for (const iv of s.intervals) {
        if (iv.t1 < xMin || iv.t0 > xMax) continue;
        const x0 = u.valToPos(iv.t0, 'x', true);
        const x1 = u.valToPos(iv.t1, 'x', true);
        ctx.fillRect(x0, top, Math.max(2 * devicePixelRatio, x1 - x0), height);
      }
    }
    if (s.jumpTimes) {
      ctx.strokeStyle = 'rgba(142, 68, 173, 0.55)';
      ctx.lineWidth = devicePixelRatio;
      ctx.setLineDash([3 * devicePixelRatio, 3 * devicePixelRatio]);
      ctx.beginPath();
      for (const t of s.jumpTimes) {
        if (t < xMin || t > xMax) continue;
        const x = Math.round(u.valToPos(t, 'x', true)) + 0.5;
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + height);
      }
      ctx.stroke();
      // A small triangle at the top of each jump line, so jumps read even over dense data.
      ctx.setLineDash([]);
      ctx.fillStyle = 'rgba(142, 68, 173, 0.9)';
      const a = 4 * devicePixelRatio;
      for (const t of s.jumpTimes) {
        if (t < xMin || t > xMax) continue;
        const x = u.valToPos(t, 'x', true);
        ctx.beginPath();
        ctx.moveTo(x - a, top);
        ctx.lineTo(x + a, top);
        ctx.lineTo(x, top + 1.6 * a);
        ctx.fill();
      }
    }
    ctx.restore();
  };
}

function buildOptions(spec: PlotSpec, width: number, height: number, group: ChartGroup, current: () => PlotSpec): uPlot.Options {
  const stepped = uPlot.paths.stepped?.({ align: 1 });
  const hasJ = spec.series.some((s) => s.scale === 'j');
  const axes: uPlot.Axis[] = [
    { label: 't (s)', stroke: AXIS_STROKE, font: FONT, labelFont: FONT, grid: GRID, ticks: GRID, size: 34, labelSize: 16 },
    {
      label: spec.yLabel,
      stroke: AXIS_STROKE,
      font: FONT,
      labelFont: FONT,
      grid: GRID,
      ticks: GRID,
      scale: 'y',
      size: 58,
      labelSize: 16,
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
      size: 40,
      labelSize: 16,
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
          // Share the x zoom with every other chart of the group.
          if (key !== 'x' || group.syncing) return;
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
  const plot = new uPlot(
    buildOptions(spec, size.width, size.height, group, () => spec),
    spec.data as uPlot.AlignedData,
    target,
  );
  group.charts.add(plot);

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
    const w = plot.over.clientWidth;
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
      plot.setData(next.data as uPlot.AlignedData);
      place(lastT);
    },
    resize(width, height) {
      plot.setSize({ width, height });
      place(lastT);
    },
    setPlayhead: place,
    async toPng() {
      const src = plot.ctx.canvas;
      const dpr = src.width / Math.max(1, plot.width);
      const pad = 8 * dpr;
      const titleH = 22 * dpr;
      const legendH = 20 * dpr;
      const c = document.createElement('canvas');
      c.width = src.width + 2 * pad;
      c.height = src.height + titleH + legendH + 2 * pad;
      const ctx = c.getContext('2d');
      if (!ctx) throw new Error('2D canvas unavailable');
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(0, 0, c.width, c.height);
      ctx.fillStyle = '#1f2731';
      ctx.font = `600 ${13 * dpr}px system-ui, sans-serif`;
      ctx.textBaseline = 'middle';
      ctx.fillText(spec.title, pad, pad + titleH / 2);
      ctx.drawImage(src, pad, pad + titleH);
      ctx.font = `${11 * dpr}px system-ui, sans-serif`;
      let x = pad;
      const y = pad + titleH + src.height + legendH / 2;
      for (const s of spec.series) {
        ctx.strokeStyle = s.color;
        ctx.lineWidth = 2 * dpr;
        ctx.setLineDash((s.dash ?? []).map((d) => d * dpr));
        ctx.beginPath();
        ctx.moveTo(x, y);
        ctx.lineTo(x + 16 * dpr, y);
        ctx.stroke();
        ctx.setLineDash([]);
        ctx.fillStyle = '#1f2731';
        ctx.fillText(s.label, x + 20 * dpr, y);
        x += 28 * dpr + ctx.measureText(s.label).width;
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
