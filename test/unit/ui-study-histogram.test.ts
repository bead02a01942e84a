/**
 * Study histogram layout (app/ui/study/histogramModel.ts) on a real small study:
 * - every run is drawn once: per controller the bars (bins + overflow) add up to the flyable runs,
 *   and each bar's count equals a binning of the raw per-run values done here by hand with the
 *   bin rule the summary states ([e_k, e_k+1), the last bin closed, beyond it overflow; settle
 *   time: runs that never settled are overflow) — common practice, no source;
 * - bar heights are proportional to the counts, on a 0-based axis whose top tick holds the
 *   tallest bar; slots run left to right, the overflow slot right of the dashed separator;
 * - count ticks are whole 1-2-5 steps (hand-worked examples);
 * - axis labels: hand-worked edge texts, and no two labels on an axis overlap (text width taken
 *   as 0.6 em per character at the 9.5-unit tick font, a generous estimate).
 */
import { describe, expect, it } from 'vitest';
import { runStudy, type CaseRun, type StudyResult } from '../../app/engine/study';
import { countTicks, layoutHistogram, QUANTITIES, type QuantitySpec } from '../../app/ui/study/histogramModel';
import { testVehicleScenario } from './study-fixtures';

const study = {
  runs: 16,
  seed: 99,
  durationS: 90,
  stopAfterSettledForS: 5,
  controllers: ['pd', 'sign', 'syn'],
  dispersions: { initialAttitude: { mode: 'uniform' }, initialRateDegPerS: 0.1, sensors: { attitudeNoiseScale: [0.5, 3] } },
};

let cached: StudyResult | null = null;
function result(): StudyResult {
  if (cached) return cached;
  const r = runStudy(testVehicleScenario(study));
  if (!r.ok) throw new Error(`study refused: ${JSON.stringify(r.errors)}`);
  cached = r.value;
  return cached;
}

const SIZE = { width: 400, height: 168, left: 40, right: 8, top: 8, bottom: 34 };

const VALUE: Record<QuantitySpec['key'], (r: CaseRun) => number | null> = {
  settleTimeS: (r) => (r.status === 'settled' ? r.settleTimeS : null),
  rotationTravelledDeg: (r) => r.rotationTravelledDeg,
  extraRotationDeg: (r) => r.extraRotationDeg,
  jumps: (r) => r.jumps,
  chatterPerS: (r) => r.chatterPerS,
  peakWheelMomentumFraction: (r) => r.peakWheelMomentumFraction,
  peakWheelTorqueFraction: (r) => r.peakWheelTorqueFraction,
  finalErrorDeg: (r) => r.finalErrorDeg,
};

/** Our own binning: returns counts per bin and the overflow (null values overflow). */
function binByHand(values: (number | null)[], edges: number[]): { counts: number[]; overflow: number } {
  const counts = new Array(edges.length - 1).fill(0);
  let overflow = 0;
  for (const v of values) {
    if (v === null || v > edges[edges.length - 1]!) {
      overflow++;
      continue;
    }
    let k = edges.findIndex((e, i) => i < edges.length - 1 && v >= e && (v < edges[i + 1]! || i === edges.length - 2));
    if (k < 0) k = 0; // below the first edge (not expected: all quantities are ≥ 0)
    counts[k]++;
  }
  return { counts, overflow };
}

describe('histogram layout on a real study', () => {
  it('draws every run once, with the counts of a binning by hand', () => {
    const r = result();
    for (const q of QUANTITIES) {
      const hists = r.summary.controllers.map((c) => c.histograms[q.key]);
      const L = layoutHistogram(
        hists,
        r.summary.controllers.map((c) => c.label),
        q,
        SIZE,
      );
      r.summary.controllers.forEach((c, ci) => {
        const bars = L.bars.filter((b) => b.controller === ci);
        expect(bars.length, q.key).toBe(hists[ci]!.counts.length + 1);
        expect(
          bars.reduce((s, b) => s + b.count, 0),
          `${q.key} ${c.controllerId}`,
        ).toBe(c.flyable);
        expect(L.totals[ci]).toBe(c.flyable);
        const raw = r.records.map((rec) => rec.runs[ci]!).filter((x) => x.status !== 'unflyable');
        const hand = binByHand(raw.map(VALUE[q.key]!), hists[ci]!.edges);
        expect(
          bars.map((b) => b.count),
          `${q.key} ${c.controllerId}`,
        ).toEqual([...hand.counts, hand.overflow]);
      });
    }
  });

  it('bar heights are proportional to counts on a 0-based axis whose top holds the tallest bar', () => {
    const r = result();
    for (const q of QUANTITIES) {
      const L = layoutHistogram(
        r.summary.controllers.map((c) => c.histograms[q.key]),
        ['a', 'b', 'c'],
        q,
        SIZE,
      );
      const top = L.yTicks[L.yTicks.length - 1]!;
      expect(L.yTicks[0]).toEqual({ value: 0, y: L.plot.bottom });
      expect(top.value).toBeGreaterThanOrEqual(L.maxCount);
      expect(top.y).toBeCloseTo(L.plot.top, 9);
      for (const b of L.bars) {
        expect(b.h).toBeCloseTo((b.count / top.value) * (L.plot.bottom - L.plot.top), 9);
        expect(b.y + b.h).toBeCloseTo(L.plot.bottom, 9);
        expect(b.x).toBeGreaterThanOrEqual(L.plot.left);
        expect(b.x + b.w).toBeLessThanOrEqual(L.plot.right + 1e-9);
      }
      // Left to right by bin, controllers side by side within a bin, overflow past the separator.
      const c0 = L.bars.filter((b) => b.controller === 0);
      for (let k = 1; k < c0.length; k++) expect(c0[k]!.x).toBeGreaterThan(c0[k - 1]!.x);
      const nBins = c0.length - 1;
      for (const b of L.bars) {
        if (b.bin === nBins) expect(b.x).toBeGreaterThan(L.separatorX);
        else expect(b.x + b.w).toBeLessThan(L.separatorX);
      }
      const inBin0 = L.bars.filter((b) => b.bin === 0).sort((a, b) => a.controller - b.controller);
      for (let c = 1; c < inBin0.length; c++) expect(inBin0[c]!.x).toBeGreaterThanOrEqual(inBin0[c - 1]!.x + inBin0[c - 1]!.w);
    }
  });

  it('labels the edges in display units without overlaps', () => {
    const r = result();
    const settle = QUANTITIES.find((q) => q.key === 'settleTimeS')!;
    const L = layoutHistogram(
      r.summary.controllers.map((c) => c.histograms.settleTimeS),
      [],
      settle,
      SIZE,
    );
    // 20 bins over the 90 s case length, every 4th edge labelled.
    expect(L.xLabels.map((l) => l.text)).toEqual(['0', '18', '36', '54', '72', '90']);
    expect(L.overflow.text).toBe('never');
    const mom = QUANTITIES.find((q) => q.key === 'peakWheelMomentumFraction')!;
    const M = layoutHistogram(
      r.summary.controllers.map((c) => c.histograms.peakWheelMomentumFraction),
      [],
      mom,
      SIZE,
    );
    expect(M.xLabels.map((l) => l.text)).toEqual(['0', '20', '40', '60', '80', '100']);
    expect(M.overflow.text).toBe('>100');
    const jumps = QUANTITIES.find((q) => q.key === 'jumps')!;
    const J = layoutHistogram(
      r.summary.controllers.map((c) => c.histograms.jumps),
      [],
      jumps,
      SIZE,
    );
    expect(J.xLabels.map((l) => l.text)).toEqual(['0', '2', '4', '6', '8']);
    for (const q of QUANTITIES) {
      const A = layoutHistogram(
        r.summary.controllers.map((c) => c.histograms[q.key]),
        [],
        q,
        SIZE,
      );
      const labels = [...A.xLabels, A.overflow].sort((a, b) => a.x - b.x);
      const halfW = (t: string) => (t.length * 0.6 * 9.5) / 2;
      for (let k = 1; k < labels.length; k++) {
        expect(labels[k]!.x - labels[k - 1]!.x, `${q.key}: "${labels[k - 1]!.text}" vs "${labels[k]!.text}"`).toBeGreaterThan(
          halfW(labels[k]!.text) + halfW(labels[k - 1]!.text),
        );
      }
    }
  });

  it('tooltips say which controller, how many runs and the bin range with its unit', () => {
    const r = result();
    const q = QUANTITIES.find((x) => x.key === 'finalErrorDeg')!;
    const L = layoutHistogram(
      r.summary.controllers.map((c) => c.histograms[q.key]),
      ['PD', 'Sign', 'Syn'],
      q,
      SIZE,
    );
    const b = L.bars.find((x) => x.controller === 1 && x.bin === 2)!;
    expect(b.title).toBe(`Sign: ${b.count} run${b.count === 1 ? '' : 's'} in [0.03, 0.1) deg`);
    const last = L.bars.find((x) => x.controller === 0 && x.bin === 8)!;
    expect(last.title).toContain('in [30, 90] deg');
  });
});

describe('count ticks', () => {
  it('are whole 1-2-5 steps from 0 up to at least the largest count (worked by hand)', () => {
    expect(countTicks(0)).toEqual([0, 1]);
    expect(countTicks(1)).toEqual([0, 1]);
    expect(countTicks(3)).toEqual([0, 1, 2, 3]);
    expect(countTicks(7)).toEqual([0, 2, 4, 6, 8]);
    expect(countTicks(24)).toEqual([0, 10, 20, 30]);
    expect(countTicks(100)).toEqual([0, 50, 100]);
    expect(countTicks(1234)).toEqual([0, 500, 1000, 1500]);
  });
});
