/**
 * Outcome map data (app/ui/study/mapModel.ts) on a real study with a non-trivial target:
 * - each case sits at axis · θ/180° of its initial error rotation q_target* ⊗ q0, recomputed here
 *   with the independent npm "quaternion" library (Hamilton product, toAxisAngle), folded to the
 *   shortest rotation (θ ≤ 180°); hollow exactly when that error quaternion's scalar part is < 0;
 * - colours: settled runs on the settle-time ramp from the fastest (first stop) to the slowest
 *   (last stop); other outcomes in their category colour; the outcome mode colours by category;
 * - legibility on the map's dark background #0b0f14: every ramp colour and category colour has a
 *   contrast ratio of at least 3:1, the WCAG 2.1 minimum for graphical objects (W3C, Web Content
 *   Accessibility Guidelines 2.1, 2018, success criterion 1.4.11; relative luminance and contrast
 *   ratio as defined there).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { outcomeMap, runStudy, type StudyResult } from '../../app/engine/study';
import { hexToRgb, mapGeometry, OUTCOME_COLOURS, OUTCOMES, settleRamp } from '../../app/ui/study/mapModel';
import { testVehicleScenario } from './study-fixtures';

const T = (() => {
  const q = [0.3, -0.2, 0.5, 0.78];
  const n = Math.hypot(...q);
  return q.map((x) => x / n);
})();

let cached: StudyResult | null = null;
function result(): StudyResult {
  if (cached) return cached;
  const json = testVehicleScenario({
    runs: 24,
    seed: 31337,
    durationS: 90,
    stopAfterSettledForS: 5,
    controllers: ['pd', 'hyst'],
    dispersions: { initialAttitude: { mode: 'uniform' } },
  }) as { targets: { attitude: unknown }[] };
  json.targets[0]!.attitude = { quaternion: T };
  const r = runStudy(json);
  if (!r.ok) throw new Error(`study refused: ${JSON.stringify(r.errors)}`);
  cached = r.value;
  return cached;
}

/** WCAG 2.1 relative luminance of an sRGB colour with components in [0, 1]. */
function luminance(c: readonly number[]): number {
  const lin = (v: number) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
  return 0.2126 * lin(c[0]!) + 0.7152 * lin(c[1]!) + 0.0722 * lin(c[2]!);
}
const contrast = (a: readonly number[], b: readonly number[]) => {
  const [l1, l2] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (l1 + 0.05) / (l2 + 0.05);
};

describe('outcome map geometry', () => {
  it('puts each case at axis · θ/180° of q_target* ⊗ q0 (npm quaternion), hollow when its scalar part is negative', () => {
    const r = result();
    const points = outcomeMap(r.records);
    const g = mapGeometry(points, 0, 'settle');
    expect(g.count).toBe(24);
    const qt = new Quaternion(T[3], T[0], T[1], T[2]);
    let hollow = 0;
    r.records.forEach((rec, i) => {
      const q0 = rec.draw.q0;
      const qe = qt.conjugate().mul(new Quaternion(q0[3], q0[0], q0[1], q0[2]));
      let [axis, angle] = qe.toAxisAngle();
      if (angle > Math.PI) {
        angle = 2 * Math.PI - angle;
        axis = axis.map((x) => -x) as [number, number, number];
      }
      const r0 = angle / Math.PI;
      for (let k = 0; k < 3; k++) expect(g.positions[3 * i + k]).toBeCloseTo(axis[k]! * r0, 5);
      expect(Math.hypot(g.positions[3 * i]!, g.positions[3 * i + 1]!, g.positions[3 * i + 2]!)).toBeCloseTo(r0, 5);
      expect(g.angleDeg[i]).toBeCloseTo((angle * 180) / Math.PI, 6);
      expect(g.far[i]).toBe(qe.w < 0 ? 1 : 0);
      expect(g.caseIndex[i]).toBe(rec.draw.index);
      hollow += g.far[i]!;
    });
    // Uniform starts: both hemispheres occur.
    expect(hollow).toBeGreaterThan(0);
    expect(hollow).toBeLessThan(24);
  });

  it('colours settled runs on the ramp from fastest to slowest and the rest by category', () => {
    const r = result();
    const points = outcomeMap(r.records);
    for (const ci of [0, 1]) {
      const g = mapGeometry(points, ci, 'settle');
      const settled = r.records
        .map((rec) => rec.runs[ci]!)
        .filter((x) => x.status === 'settled')
        .map((x) => x.settleTimeS!);
      expect(settled.length).toBeGreaterThan(1);
      expect(g.settleMinS).toBe(Math.min(...settled));
      expect(g.settleMaxS).toBe(Math.max(g.settleMinS + 1, Math.max(...settled)));
      for (let i = 0; i < g.count; i++) {
        const col = Array.from(g.colours.subarray(3 * i, 3 * i + 3));
        const o = g.outcome[i]!;
        const t = g.settleTimeS[i]!;
        const expected =
          ['settled', 'unwound', 'chattered'].includes(o) && t !== null
            ? settleRamp((t - g.settleMinS) / (g.settleMaxS - g.settleMinS))
            : hexToRgb(OUTCOME_COLOURS[o]);
        for (let k = 0; k < 3; k++) expect(col[k]).toBeCloseTo(expected[k]!, 6);
        expect(o).toBe(points[i]!.outcome[ci]);
      }
      const byCategory = mapGeometry(points, ci, 'outcome');
      for (let i = 0; i < byCategory.count; i++) {
        const c = hexToRgb(OUTCOME_COLOURS[byCategory.outcome[i]!]);
        for (let k = 0; k < 3; k++) expect(byCategory.colours[3 * i + k]).toBeCloseTo(c[k]!, 6);
      }
      // Category counts cover every case.
      expect(OUTCOMES.reduce((s, o) => s + g.counts[o], 0)).toBe(g.count);
    }
  });

  it('the ramp runs from its first stop to its last, and every map colour reads on the dark background (WCAG 3:1)', () => {
    const bg = hexToRgb('#0b0f14');
    expect(settleRamp(0)).toEqual([80 / 255, 196 / 255, 1]);
    expect(settleRamp(1)).toEqual([1, 150 / 255, 40 / 255]);
    expect(settleRamp(-3)).toEqual(settleRamp(0));
    expect(settleRamp(NaN)).toEqual(settleRamp(1));
    for (let k = 0; k <= 50; k++) expect(contrast(settleRamp(k / 50), bg), `ramp ${k / 50}`).toBeGreaterThanOrEqual(3);
    for (const o of OUTCOMES) expect(contrast(hexToRgb(OUTCOME_COLOURS[o]), bg), o).toBeGreaterThanOrEqual(3);
  });
});
