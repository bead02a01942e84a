/**
 * Layout of one study histogram as grouped bars (one bar per controller in every bin), from the
 * engine's fixed-bin histograms (engine/study/summary.ts). Pure: the SVG component draws what this
 * returns, and the unit tests check it without a DOM.
 *
 * Bins are drawn as equal-width slots whatever their edges (the chatter and final-error edges are
 * log-like), with the edge values written under the slot boundaries; the engine's overflow count
 * (values past the last edge, or for settle time the runs that never settled) gets a slot of its
 * own at the right, set apart by a gap.
 */
import type { ControllerSummary, Histogram } from '../../engine/study';
import { fmt } from '../format';

export type HistogramKey = keyof ControllerSummary['histograms'];

export interface QuantitySpec {
  key: HistogramKey;
  title: string;
  /** Unit as shown on the axis. */
  unit: string;
  /** Display value = engine value × scale (fractions → %). */
  scale: number;
  overflowLabel: (lastEdge: string) => string;
  /** Bins are single integers (label the bin, not its edges). */
  integerBins?: boolean;
  help: string;
}

export const QUANTITIES: readonly QuantitySpec[] = [
  {
    key: 'settleTimeS',
    title: 'Settle time',
    unit: 's',
    scale: 1,
    overflowLabel: () => 'never',
    help: 'Time after which the error angle and rate error stay inside the settle thresholds; "never" = not settled within the case duration (or failed)',
  },
  {
    key: 'rotationTravelledDeg',
    title: 'Rotation travelled',
    unit: 'deg',
    scale: 1,
    overflowLabel: (e) => `>${e}`,
    help: 'Total rotation the body travelled; far above the initial error angle means the slew went the long way or unwound',
  },
  {
    key: 'jumps',
    title: 'Logic jumps',
    unit: 'count',
    scale: 1,
    integerBins: true,
    overflowLabel: (e) => `≥${Number(e) + 1}`,
    help: 'Jumps of the hybrid logic variable over the case',
  },
  {
    key: 'chatterPerS',
    title: 'Chatter',
    unit: 'events/s',
    scale: 1,
    overflowLabel: (e) => `≥${e}`,
    help: 'Logic jumps plus torque sign reversals per second in the busiest 10 s window',
  },
  {
    key: 'peakWheelMomentumFraction',
    title: 'Peak wheel momentum',
    unit: '% of limit',
    scale: 100,
    overflowLabel: (e) => `>${e}`,
    help: "Largest wheel momentum over the case as a share of that case's (degraded) wheel limit",
  },
  {
    key: 'peakWheelTorqueFraction',
    title: 'Peak wheel torque',
    unit: '% of limit',
    scale: 100,
    overflowLabel: (e) => `>${e}`,
    help: "Largest wheel torque over the case as a share of that case's (degraded) wheel limit",
  },
  {
    key: 'finalErrorDeg',
    title: 'Final error',
    unit: 'deg',
    scale: 1,
    overflowLabel: (e) => `>${e}`,
    help: 'Error angle at the end of the case',
  },
];

export interface BarRect {
  /** Controller position in the study (colour index). */
  controller: number;
  /** Bin index; counts.length is the overflow slot. */
  bin: number;
  count: number;
  x: number;
  y: number;
  w: number;
  h: number;
  /** Tooltip: what the bar counts. */
  title: string;
}

export interface AxisLabel {
  x: number;
  text: string;
}

export interface HistogramLayout {
  width: number;
  height: number;
  plot: { left: number; top: number; right: number; bottom: number };
  bars: BarRect[];
  yTicks: { value: number; y: number }[];
  xLabels: AxisLabel[];
  overflow: AxisLabel;
  /** x of the dashed separator between the bins and the overflow slot. */
  separatorX: number;
  /** Largest bar count (the y scale's data maximum). */
  maxCount: number;
  /** Runs drawn per controller (bins + overflow). */
  totals: number[];
}

/** Integer ticks from 0 with a 1-2-5 step, the last at or above `max` (at least [0, 1]). */
export function countTicks(max: number, target = 4): number[] {
  const m = Math.max(1, Math.ceil(max));
  const raw = m / Math.max(1, target);
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = Math.max(1, [1, 2, 5, 10].map((f) => f * mag).find((s) => s >= raw) ?? 10 * mag);
  const ticks: number[] = [];
  for (let v = 0; v < m + step; v += step) {
    ticks.push(v);
    if (v >= m) break;
  }
  return ticks;
}

/** Edge text in display units. */
function edgeText(v: number, q: QuantitySpec): string {
  return fmt(v * q.scale, 3);
}

/** Which slot boundaries get a label: about `want` of them, always the first and the last. */
function labelStride(edges: number, want: number): number {
  return Math.max(1, Math.ceil((edges - 1) / Math.max(1, want - 1)));
}

export interface LayoutSize {
  width: number;
  height: number;
  left?: number;
  right?: number;
  top?: number;
  bottom?: number;
}

/**
 * Grouped bars for one quantity: `hists[c]` is controller c's histogram (same edges for every
 * controller of a study), `names[c]` its label for tooltips.
 */
export function layoutHistogram(hists: readonly Histogram[], names: readonly string[], q: QuantitySpec, size: LayoutSize): HistogramLayout {
  const plot = {
    left: size.left ?? 40,
    right: size.width - (size.right ?? 8),
    top: size.top ?? 8,
    bottom: size.height - (size.bottom ?? 32),
  };
  const edges = hists[0]?.edges ?? [0, 1];
  const nBins = edges.length - 1;
  const gap = 1.6; // the overflow slot is set apart by this many slot widths (room for both labels)
  const slots = nBins + 1 + gap;
  const slotW = (plot.right - plot.left) / slots;
  const nC = Math.max(1, hists.length);
  const inner = slotW * 0.86;
  const barW = inner / nC;
  let maxCount = 0;
  for (const h of hists) for (const c of [...h.counts, h.overflow]) maxCount = Math.max(maxCount, c);
  const ticks = countTicks(maxCount);
  const top = ticks[ticks.length - 1]!;
  const yOf = (v: number) => plot.bottom - (v / top) * (plot.bottom - plot.top);
  const slotX = (k: number) => plot.left + (k < nBins ? k : nBins + gap) * slotW;
  /** Boundary k of the regular bins (k = nBins is the right end of the last bin, before the gap). */
  const edgeX = (k: number) => plot.left + k * slotW;

  const bars: BarRect[] = [];
  hists.forEach((h, c) => {
    const all = [...h.counts, h.overflow];
    all.forEach((count, k) => {
      const x = slotX(k) + (slotW - inner) / 2 + c * barW;
      const y = yOf(count);
      const range =
        k === nBins
          ? `${q.overflowLabel(edgeText(edges[nBins]!, q))}${q.key === 'settleTimeS' ? ' (not settled)' : ` ${q.unit}`}`
          : q.integerBins
            ? k === nBins - 1
              ? `${edgeText(edges[k]!, q)}–${edgeText(edges[k + 1]!, q)}` // the last bin is closed: it holds both
              : edgeText(edges[k]!, q)
            : `[${edgeText(edges[k]!, q)}, ${edgeText(edges[k + 1]!, q)}${k === nBins - 1 ? ']' : ')'} ${q.unit}`;
      bars.push({
        controller: c,
        bin: k,
        count,
        x,
        y,
        w: Math.max(0.5, barW - 0.4),
        h: plot.bottom - y,
        title: `${names[c] ?? `controller ${c + 1}`}: ${count} run${count === 1 ? '' : 's'} in ${range}`,
      });
    });
  });

  const xLabels: AxisLabel[] = [];
  if (q.integerBins) {
    const stride = labelStride(nBins + 1, 10);
    for (let k = 0; k < nBins; k += stride) {
      const last = k === nBins - 1;
      xLabels.push({
        x: slotX(k) + slotW / 2,
        text: last ? `${edgeText(edges[k]!, q)}–${edgeText(edges[k + 1]!, q)}` : edgeText(edges[k]!, q),
      });
    }
  } else {
    const stride = labelStride(edges.length, 6);
    for (let k = 0; k < edges.length; k += stride) xLabels.push({ x: edgeX(k), text: edgeText(edges[k]!, q) });
    if ((edges.length - 1) % stride !== 0) xLabels.push({ x: edgeX(nBins), text: edgeText(edges[nBins]!, q) });
  }
  return {
    width: size.width,
    height: size.height,
    plot,
    bars,
    yTicks: ticks.map((value) => ({ value, y: yOf(value) })),
    xLabels,
    overflow: { x: slotX(nBins) + slotW / 2, text: q.overflowLabel(edgeText(edges[nBins]!, q)) },
    separatorX: plot.left + (nBins + gap / 2) * slotW,
    maxCount,
    totals: hists.map((h) => h.counts.reduce((s, c) => s + c, 0) + h.overflow),
  };
}
