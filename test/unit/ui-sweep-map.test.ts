/**
 * The sweep map's geometry (app/ui/study/sweepMapModel.ts). Every expected pixel is worked out by
 * hand in the comments from the layout below:
 *   box left 50, top 10, 300 × 150; axis 0 values [0, 1, 2] → tiles 100 px wide, centres 100, 200,
 *   300; axis 1 values [10, 20, 30] → tiles 50 px high from the bottom (y 160) up, centres 135, 85, 35.
 * Sources named beside each check: WCAG 2.1 (relative luminance, contrast ratio), Liang & Barsky
 * 1984 (parametric line clipping), Lorensen & Cline 1987 (marching cubes, here in 2-D).
 */
import { describe, expect, it } from 'vitest';
import type { BoundaryPoint, SweepCell } from '../../app/engine/study';
import type { SweepTheoryLine } from '../../app/engine/study/sweepTheory';
import {
  boundaryPixel,
  boundarySegments,
  clipSegment,
  contrastRatio,
  mapLayout,
  mapTiles,
  shareColour,
  textOn,
  theoryPath,
  tileRect,
  valueExtent,
  valueToPixel,
} from '../../app/ui/study/sweepMapModel';

const box = { left: 50, top: 10, width: 300, height: 150 };
const L = mapLayout(
  [
    [0, 1, 2],
    [10, 20, 30],
  ],
  box,
);
const bp = (along: number, fixedIndex: number | null, value: number): BoundaryPoint => ({
  along,
  fixedIndex,
  fixedValue: null,
  value,
  direction: 'falls',
});
const close = (a: { x: number; y: number }, b: { x: number; y: number }) => {
  expect(a.x).toBeCloseTo(b.x, 9);
  expect(a.y).toBeCloseTo(b.y, 9);
};

describe('share colours and their text (WCAG 2.1 relative luminance and contrast ratio)', () => {
  it('ramp ends and midpoints are the stops, interpolated linearly between them', () => {
    expect(shareColour(0)).toEqual([122, 22, 40]);
    expect(shareColour(1)).toEqual([26, 130, 120]);
    expect(shareColour(0.5)).toEqual([236, 168, 80]);
    // halfway between stops 0 and 1: ((122+196)/2, (22+72)/2, (40+44)/2)
    expect(shareColour(0.125)).toEqual([159, 47, 42]);
    expect(shareColour(-3)).toEqual(shareColour(0));
    expect(shareColour(7)).toEqual(shareColour(1));
    expect(shareColour(NaN)).toEqual(shareColour(0));
  });

  it('contrast ratio: black on white is 21:1 and equal colours 1:1 (WCAG 2.1: ratios range from 1 to 21)', () => {
    expect(contrastRatio([0, 0, 0], [255, 255, 255])).toBeCloseTo(21, 10);
    expect(contrastRatio([90, 90, 90], [90, 90, 90])).toBe(1);
  });

  it('#767676 on white is 4.54:1 (from memory: the WebAIM contrast checker value, the lightest grey passing 4.5:1)', () => {
    expect(contrastRatio([0x76, 0x76, 0x76], [255, 255, 255])).toBeCloseTo(4.54, 2);
  });

  it('sand (236, 168, 80) has L ≈ 0.4642, so black text (10.28:1) beats white (2.04:1), by hand from the WCAG 2.1 formula', () => {
    // channels: ((c/255 + 0.055)/1.055)^2.4 = 0.8388, 0.3916, 0.0802; L = 0.2126·0.8388 + 0.7152·0.3916 + 0.0722·0.0802
    expect(contrastRatio([236, 168, 80], [0, 0, 0])).toBeCloseTo(10.28, 1);
    expect(contrastRatio([236, 168, 80], [255, 255, 255])).toBeCloseTo(2.04, 1);
    expect(textOn([236, 168, 80])).toBe('#000000');
    expect(textOn([122, 22, 40])).toBe('#ffffff');
  });

  it('the text chosen on every ramp colour contrasts at least 4.5:1 (WCAG 2.1 SC 1.4.3 minimum for text)', () => {
    for (let k = 0; k <= 100; k++) {
      const c = shareColour(k / 100);
      const t = textOn(c) === '#000000' ? ([0, 0, 0] as const) : ([255, 255, 255] as const);
      expect(contrastRatio(c, t), `share ${k} %`).toBeGreaterThanOrEqual(4.5);
    }
  });
});

describe('tiles and value → pixel (hand-computed layout)', () => {
  it('maps values linearly between tile centres and half a tile beyond the ends', () => {
    expect(valueToPixel(L.x, 0)).toBe(100);
    expect(valueToPixel(L.x, 0.5)).toBe(150);
    expect(valueToPixel(L.x, 2.5)).toBe(350); // 200 + (2.5 − 1)·100: the right edge of the last tile
    expect(valueToPixel(L.x, -0.5)).toBe(50);
    expect(valueToPixel(L.y!, 10)).toBe(135);
    expect(valueToPixel(L.y!, 25)).toBe(60); // 85 + 0.5·(−50)
    expect(valueExtent([0, 1, 2])).toEqual([-0.5, 2.5]);
    expect(valueExtent([0, 1, 4])).toEqual([-0.5, 5.5]);
  });

  it('places cell (1, 2) in the middle column of the top row, cell (0, 0) bottom left', () => {
    expect(tileRect(L, [1, 2])).toEqual({ x: 150, y: 10, width: 100, height: 50 });
    expect(tileRect(L, [0, 0])).toEqual({ x: 50, y: 110, width: 100, height: 50 });
  });

  it('colours a cell by its settle share and greys a cell with no flyable case', () => {
    const share = (count: number, of: number) => ({ count, of, share: of ? count / of : 0, low: 0, high: 1, ruleOfThreeHigh: null });
    const ctl = (count: number, of: number) => ({
      controllerId: 'h',
      flyable: of,
      settled: share(count, of),
      stalled: share(of - count, of),
      unwound: share(0, of),
      chattered: share(0, of),
      settleMedianS: null,
      settleP95S: null,
      worstCase: 0,
    });
    const cells: SweepCell[] = [
      { index: 0, position: [0, 0], values: [0, 10], seed: 1, casesDone: 2, controllers: [ctl(2, 2)] },
      { index: 4, position: [1, 1], values: [1, 20], seed: 1, casesDone: 2, controllers: [ctl(0, 0)] },
    ];
    const t = mapTiles(L, cells, 0);
    expect(t[0]).toMatchObject({ x: 50, y: 110, share: 1, fill: 'rgb(26, 130, 120)', text: '#ffffff' });
    expect(t[1]).toMatchObject({ x: 150, y: 60, share: null, fill: '#c9ced6' });
  });
});

describe('boundary in pixels (marching squares over the cell centres, Lorensen & Cline 1987 in 2-D)', () => {
  it('puts each crossing on its grid line at the interpolated value', () => {
    close(boundaryPixel(L, bp(0, 1, 0.5)), { x: 150, y: 85 }); // along ē on row δ index 1
    close(boundaryPixel(L, bp(1, 0, 15)), { x: 100, y: 110 }); // along δ on column 0
  });

  it('joins the two crossings on the edges of one square into one segment', () => {
    const s = boundarySegments(L, [bp(0, 1, 0.5), bp(1, 0, 15)]);
    expect(s.length).toBe(1);
    close(s[0]!.a, { x: 150, y: 85 });
    close(s[0]!.b, { x: 100, y: 110 });
  });

  it('leaves a lone crossing to its marker (no segment)', () => {
    expect(boundarySegments(L, [bp(0, 2, 0.5)])).toEqual([]);
  });

  it('joins a saddle (four crossings in one square) in the pairing of shorter total length', () => {
    // bottom (150, 135), top (150, 85), left (100, 110), right at 12 → (200, 125).
    // Pairings: bottom–right + top–left = 50.99 + 55.90 = 106.89 (shortest); bottom–left + top–right = 55.90 + 64.03;
    // bottom–top + left–right = 50 + 101.1.
    const s = boundarySegments(L, [bp(0, 0, 0.5), bp(0, 1, 0.5), bp(1, 0, 15), bp(1, 1, 12)]);
    const inSquare = s.filter((g) => [g.a, g.b].every((p) => p.x <= 200 && p.y >= 85));
    expect(inSquare.length).toBe(2);
    close(inSquare[0]!.a, { x: 150, y: 135 });
    close(inSquare[0]!.b, { x: 200, y: 125 });
    close(inSquare[1]!.a, { x: 150, y: 85 });
    close(inSquare[1]!.b, { x: 100, y: 110 });
  });

  it('draws a one-axis crossing across the strip', () => {
    const strip = mapLayout([[0, 1, 2]], { left: 50, top: 10, width: 300, height: 40 });
    const s = boundarySegments(strip, [bp(0, null, 1.5)]);
    expect(s).toEqual([{ a: { x: 250, y: 10 }, b: { x: 250, y: 50 } }]);
  });
});

describe('theory lines clipped to the map (Liang & Barsky 1984)', () => {
  it('clips a segment crossing the unit box at t = 1/3 and 2/3', () => {
    const c = clipSegment({ x: -1, y: 0.5 }, { x: 2, y: 0.5 }, 0, 1, 0, 1)!;
    expect(c[0]).toBeCloseTo(1 / 3, 12);
    expect(c[1]).toBeCloseTo(2 / 3, 12);
    expect(clipSegment({ x: 2, y: 2 }, { x: 3, y: 3 }, 0, 1, 0, 1)).toBeNull();
    expect(clipSegment({ x: -1, y: 2 }, { x: 2, y: 2 }, 0, 1, 0, 1)).toBeNull(); // parallel, outside
  });

  const line = (points: { a0: number; a1: number | null }[]): SweepTheoryLine => ({
    controllerId: 'h',
    label: 'ē = δ',
    source: 'MST 2011',
    points,
  });

  it('clips (−1, 10)–(3, 30) to the tiles (x in [−0.5, 2.5]) and keeps a vertex at every grid value', () => {
    // y = 10 + 5(x + 1): clipped at x = −0.5 (y 12.5) and x = 2.5 (y 27.5); grid crossings x = 0, 1, 2 (y = 20 at x = 1)
    const p = theoryPath(
      L,
      line([
        { a0: -1, a1: 10 },
        { a0: 3, a1: 30 },
      ]),
    );
    const want = [
      { x: 50, y: 122.5 },
      { x: 100, y: 110 },
      { x: 200, y: 85 },
      { x: 300, y: 60 },
      { x: 350, y: 47.5 },
    ];
    expect(p.points.length).toBe(want.length);
    p.points.forEach((q, i) => close(q, want[i]!));
    expect(p.source).toBe('MST 2011');
  });

  it('bends at the grid values of an uneven grid so the line stays straight in parameter space', () => {
    // axis 0 values [0, 1, 4]: the line y = 10 + 5x from (0, 10) to (4, 30) crosses x = 1 at y 15 and y = 20 at x = 2;
    // x = 2 lies a third of the way from 1 to 4: 200 + 100/3 px
    const U = mapLayout(
      [
        [0, 1, 4],
        [10, 20, 30],
      ],
      box,
    );
    const p = theoryPath(
      U,
      line([
        { a0: 0, a1: 10 },
        { a0: 4, a1: 30 },
      ]),
    );
    const want = [
      { x: 100, y: 135 },
      { x: 200, y: 110 },
      { x: 200 + 100 / 3, y: 85 },
      { x: 300, y: 35 },
    ];
    expect(p.points.length).toBe(want.length);
    p.points.forEach((q, i) => close(q, want[i]!));
  });

  it('drops a line that misses the map, and draws a one-axis value across the strip', () => {
    expect(
      theoryPath(
        L,
        line([
          { a0: 10, a1: 10 },
          { a0: 20, a1: 20 },
        ]),
      ).points,
    ).toEqual([]);
    const strip = mapLayout([[0, 1, 2]], { left: 50, top: 10, width: 300, height: 40 });
    expect(theoryPath(strip, line([{ a0: 0.5, a1: null }])).points).toEqual([
      { x: 150, y: 10 },
      { x: 150, y: 50 },
    ]);
    expect(theoryPath(strip, line([{ a0: 9, a1: null }])).points).toEqual([]);
  });
});
