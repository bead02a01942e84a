/**
 * The sweep map's geometry, without React or the DOM: where each grid cell sits in pixels, its
 * colour (the settle share on a ramp) and the colour of its text, the measured boundary as line
 * segments in pixels (from the engine's BoundaryPoints), and the theory lines clipped to the map.
 *
 * Cells are equal-sized tiles in grid order (axis 0 left to right, axis 1 bottom to top), so a
 * list of uneven values still gives a readable grid. Parameter values map to pixels piecewise
 * linearly between the cell centres (and with the end spacing half a cell beyond), which is the
 * same linear interpolation the engine uses to place a boundary crossing between two cells.
 */
import type { BoundaryPoint, SweepCell } from '../../engine/study';
import type { SweepTheoryLine } from '../../engine/study/sweepTheory';

export type Rgb = readonly [number, number, number];

/**
 * Settle-share ramp, sRGB 0–255, from share 0 (nothing settles) to 1 (everything settles). Our
 * own stops: dark red through orange and sand to teal, ordered in lightness at the ends so the
 * grid still reads in grey; the boundary and theory lines are drawn with a casing on top.
 */
const SHARE_RAMP: readonly Rgb[] = [
  [122, 22, 40],
  [196, 72, 44],
  [236, 168, 80],
  [150, 196, 120],
  [26, 130, 120],
];

/** Colour of a settle share in [0, 1] (clamped; a non-finite share is the 0 end). */
export function shareColour(share: number): Rgb {
  const f = Number.isFinite(share) ? Math.min(1, Math.max(0, share)) : 0;
  const x = f * (SHARE_RAMP.length - 1);
  const k = Math.min(SHARE_RAMP.length - 2, Math.floor(x));
  const t = x - k;
  const a = SHARE_RAMP[k]!;
  const b = SHARE_RAMP[k + 1]!;
  return [Math.round(a[0] + t * (b[0] - a[0])), Math.round(a[1] + t * (b[1] - a[1])), Math.round(a[2] + t * (b[2] - a[2]))] as const;
}

export const rgbText = (c: Rgb) => `rgb(${c[0]}, ${c[1]}, ${c[2]})`;

/**
 * Relative luminance of an sRGB colour (0–255 channels): linearise each channel
 * (c ≤ 0.04045 ? c/12.92 : ((c + 0.055)/1.055)^2.4) and weight 0.2126 R + 0.7152 G + 0.0722 B
 * (W3C WCAG 2.1, definition "relative luminance").
 */
export function relativeLuminance(c: Rgb): number {
  const f = (v: number) => {
    const s = v / 255;
    return s <= 0.04045 ? s / 12.92 : Math.pow((s + 0.055) / 1.055, 2.4);
  };
  return 0.2126 * f(c[0]) + 0.7152 * f(c[1]) + 0.0722 * f(c[2]);
}

/** (L1 + 0.05) / (L2 + 0.05), lighter over darker (W3C WCAG 2.1, definition "contrast ratio"). */
export function contrastRatio(a: Rgb, b: Rgb): number {
  const la = relativeLuminance(a);
  const lb = relativeLuminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}

/** Black or white, whichever contrasts more with the cell colour. */
export function textOn(c: Rgb): '#000000' | '#ffffff' {
  return contrastRatio(c, [0, 0, 0]) >= contrastRatio(c, [255, 255, 255]) ? '#000000' : '#ffffff';
}

/** The plot box in pixels (inside the axis margins). */
export interface PlotBox {
  left: number;
  top: number;
  width: number;
  height: number;
}

/** One axis of the map: its values and the pixel span they are laid over. */
export interface AxisScale {
  values: readonly number[];
  /** Pixel of the start edge of the first tile and the tile size (negative on the vertical axis: values grow upwards). */
  start: number;
  step: number;
}

/** Pixel centre of tile k. */
export const tileCentre = (s: AxisScale, k: number) => s.start + (k + 0.5) * s.step;

/**
 * Value → pixel along an axis: linear between neighbouring tile centres, and beyond the first or
 * last value with the spacing of the first or last pair (a single value maps to its tile centre).
 */
export function valueToPixel(s: AxisScale, v: number): number {
  const xs = s.values;
  const n = xs.length;
  if (n === 1) return tileCentre(s, 0);
  let k = 0;
  while (k < n - 2 && v > xs[k + 1]!) k++;
  const x0 = xs[k]!;
  const x1 = xs[k + 1]!;
  return tileCentre(s, k) + ((v - x0) / (x1 - x0)) * s.step;
}

/** The value range the tiles cover: half a spacing beyond the first and last values ([v, v] for one value). */
export function valueExtent(values: readonly number[]): [number, number] {
  const n = values.length;
  if (n === 1) return [values[0]!, values[0]!];
  const lo = values[0]! - (values[1]! - values[0]!) / 2;
  const hi = values[n - 1]! + (values[n - 1]! - values[n - 2]!) / 2;
  return [lo, hi];
}

export interface MapLayout {
  box: PlotBox;
  x: AxisScale;
  /** Null for a one-axis sweep (a strip). */
  y: AxisScale | null;
}

/** Tiles over the plot box: axis 0 across, axis 1 (if any) upwards. */
export function mapLayout(axisValues: readonly (readonly number[])[], box: PlotBox): MapLayout {
  const v0 = axisValues[0] ?? [0];
  const v1 = axisValues[1];
  const x: AxisScale = { values: v0, start: box.left, step: box.width / v0.length };
  const y: AxisScale | null = v1 ? { values: v1, start: box.top + box.height, step: -box.height / v1.length } : null;
  return { box, x, y };
}

export interface TileRect {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** A cell's tile from its grid position. */
export function tileRect(l: MapLayout, position: readonly number[]): TileRect {
  const i = position[0] ?? 0;
  const j = position[1] ?? 0;
  const x = l.x.start + i * l.x.step;
  if (!l.y) return { x, y: l.box.top, width: l.x.step, height: l.box.height };
  const yBottom = l.y.start + j * l.y.step;
  return { x, y: yBottom + l.y.step, width: l.x.step, height: -l.y.step };
}

export interface MapTile extends TileRect {
  index: number;
  /** Settle share of the controller, or null when the cell has no flyable case. */
  share: number | null;
  fill: string;
  text: string;
}

/** Colour of a finished cell with no flyable case (hatched in the view). */
export const NO_CASE_FILL = '#c9ced6';

/** The finished cells of one controller as coloured tiles. */
export function mapTiles(l: MapLayout, cells: readonly SweepCell[], controller: number): MapTile[] {
  return cells.map((c) => {
    const s = c.controllers[controller]?.settled;
    const share = s && s.of > 0 ? s.share : null;
    const colour: Rgb = share === null ? [201, 206, 214] : shareColour(share);
    return {
      ...tileRect(l, c.position),
      index: c.index,
      share,
      fill: share === null ? NO_CASE_FILL : rgbText(colour),
      text: textOn(colour),
    };
  });
}

export interface Pt {
  x: number;
  y: number;
}

export interface Segment {
  a: Pt;
  b: Pt;
}

/** A boundary point in pixels (on a strip: at mid-height). */
export function boundaryPixel(l: MapLayout, p: BoundaryPoint): Pt {
  if (!l.y) return { x: valueToPixel(l.x, p.value), y: l.box.top + l.box.height / 2 };
  if (p.along === 0) return { x: valueToPixel(l.x, p.value), y: tileCentre(l.y, p.fixedIndex ?? 0) };
  return { x: tileCentre(l.x, p.fixedIndex ?? 0), y: valueToPixel(l.y, p.value) };
}

/** Index k of the grid interval [x_k, x_{k+1}) holding v (the last interval is closed); −1 outside. */
export function intervalOf(values: readonly number[], v: number): number {
  const n = values.length;
  for (let k = 0; k + 1 < n; k++) if (v >= values[k]! && (v < values[k + 1]! || (k + 2 === n && v <= values[k + 1]!))) return k;
  return -1;
}

const dist = (a: Pt, b: Pt) => Math.hypot(a.x - b.x, a.y - b.y);

/**
 * The boundary as pixel segments. One axis: a vertical line across the strip at each crossing.
 * Two axes: marching squares (the 2-D form of Lorensen & Cline, "Marching cubes", SIGGRAPH 1987)
 * over the squares between four neighbouring cell centres: the crossings on a square's edges are
 * joined, two at a time; a square with four (a saddle) is joined in the pairing of shorter total
 * length (common practice, no source); a square with one or three (a missing cell) is left to its
 * point markers.
 */
export function boundarySegments(l: MapLayout, points: readonly BoundaryPoint[]): Segment[] {
  if (!l.y) {
    return points.map((p) => {
      const x = valueToPixel(l.x, p.value);
      return { a: { x, y: l.box.top }, b: { x, y: l.box.top + l.box.height } };
    });
  }
  const xs = l.x.values;
  const ys = l.y.values;
  // square (i, j) spans cells i..i+1 on axis 0 and j..j+1 on axis 1
  const squares = new Map<string, Pt[]>();
  const add = (i: number, j: number, p: Pt) => {
    if (i < 0 || j < 0 || i + 1 >= xs.length || j + 1 >= ys.length) return;
    const key = `${i},${j}`;
    const list = squares.get(key) ?? [];
    list.push(p);
    squares.set(key, list);
  };
  for (const p of points) {
    const px = boundaryPixel(l, p);
    const f = p.fixedIndex ?? 0;
    if (p.along === 0) {
      const i = intervalOf(xs, p.value);
      // the row line j = f is the top edge of square (i, f − 1) and the bottom edge of (i, f)
      add(i, f - 1, px);
      add(i, f, px);
    } else {
      const j = intervalOf(ys, p.value);
      add(f - 1, j, px);
      add(f, j, px);
    }
  }
  const out: Segment[] = [];
  for (const pts of squares.values()) {
    if (pts.length === 2) out.push({ a: pts[0]!, b: pts[1]! });
    else if (pts.length === 4) {
      const [a, b, c, d] = pts as [Pt, Pt, Pt, Pt];
      const pairings: [Pt, Pt, Pt, Pt][] = [
        [a, b, c, d],
        [a, c, b, d],
        [a, d, b, c],
      ];
      let best = pairings[0]!;
      let bestLen = Infinity;
      for (const q of pairings) {
        const len = dist(q[0], q[1]) + dist(q[2], q[3]);
        if (len < bestLen) {
          bestLen = len;
          best = q;
        }
      }
      out.push({ a: best[0], b: best[1] }, { a: best[2], b: best[3] });
    }
  }
  return out;
}

/**
 * Clip the segment p → q (parameter space) to the box [x0, x1] × [y0, y1] by Liang & Barsky's
 * parametric method ("A new concept and method for line clipping", ACM TOG 3(1), 1984).
 * Returns the clipped end parameters t ∈ [0, 1], or null when nothing is inside.
 */
export function clipSegment(p: Pt, q: Pt, x0: number, x1: number, y0: number, y1: number): [number, number] | null {
  const dx = q.x - p.x;
  const dy = q.y - p.y;
  let t0 = 0;
  let t1 = 1;
  const tests: [number, number][] = [
    [-dx, p.x - x0],
    [dx, x1 - p.x],
    [-dy, p.y - y0],
    [dy, y1 - p.y],
  ];
  for (const [pk, qk] of tests) {
    if (pk === 0) {
      if (qk < 0) return null;
      continue;
    }
    const r = qk / pk;
    if (pk < 0) {
      if (r > t1) return null;
      if (r > t0) t0 = r;
    } else {
      if (r < t0) return null;
      if (r < t1) t1 = r;
    }
  }
  return [t0, t1];
}

export interface TheoryPath {
  controllerId: string;
  label: string;
  source: string;
  /** Pixel polyline (empty when the line misses the map). */
  points: Pt[];
}

/**
 * A theory line in pixels: each segment clipped to the map's value extent, then split at every
 * grid value it crosses so that it stays straight in parameter space on an uneven grid. On a
 * strip a point value is a vertical line across the strip.
 */
export function theoryPath(l: MapLayout, t: SweepTheoryLine): TheoryPath {
  const base = { controllerId: t.controllerId, label: t.label, source: t.source };
  const [ex0, ex1] = valueExtent(l.x.values);
  if (!l.y) {
    const v = t.points[0]?.a0;
    if (v === undefined || v < ex0 || v > ex1) return { ...base, points: [] };
    const x = valueToPixel(l.x, v);
    return {
      ...base,
      points: [
        { x, y: l.box.top },
        { x, y: l.box.top + l.box.height },
      ],
    };
  }
  const ly = l.y;
  const [ey0, ey1] = valueExtent(ly.values);
  const out: Pt[] = [];
  const px = (x: number, y: number): Pt => ({ x: valueToPixel(l.x, x), y: valueToPixel(ly, y) });
  for (let k = 0; k + 1 < t.points.length; k++) {
    const p = { x: t.points[k]!.a0, y: t.points[k]!.a1 ?? 0 };
    const q = { x: t.points[k + 1]!.a0, y: t.points[k + 1]!.a1 ?? 0 };
    const c = clipSegment(p, q, ex0, ex1, ey0, ey1);
    if (!c) continue;
    const at = (s: number) => ({ x: p.x + s * (q.x - p.x), y: p.y + s * (q.y - p.y) });
    // parameters where the segment crosses a grid value (a kink of the value → pixel map)
    const ts = new Set<number>([c[0], c[1]]);
    const cross = (a: number, b: number, grid: readonly number[]) => {
      if (a === b) return;
      for (const g of grid) {
        const s = (g - a) / (b - a);
        if (s > c[0] && s < c[1]) ts.add(s);
      }
    };
    cross(p.x, q.x, l.x.values);
    cross(p.y, q.y, ly.values);
    for (const s of [...ts].sort((a, b) => a - b)) {
      const v = at(s);
      const pt = px(v.x, v.y);
      const last = out[out.length - 1];
      if (!last || dist(last, pt) > 1e-9) out.push(pt);
    }
  }
  return { ...base, points: out };
}

/** SVG path data for a polyline ("M x y L x y …", 2 decimals). */
export function polylineData(points: readonly Pt[]): string {
  return points.map((p, i) => `${i === 0 ? 'M' : 'L'}${p.x.toFixed(2)} ${p.y.toFixed(2)}`).join(' ');
}
