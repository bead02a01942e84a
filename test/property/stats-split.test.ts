/**
 * The exactness rule of app/engine/math/stats.ts: a campaign split into shards and merged gives
 * byte-identical output to one process. 10⁵ synthetic cases (test/integration/campaign-fixture.ts:
 * a settled share, seven quantities with exact moments and histograms, a worst-case list) are cut
 * at 1, 7 and 20 random points; each piece adds its cases in shuffled order, goes through its JSON
 * shard file, and the pieces are merged in shuffled order along a random merge tree. The merged
 * shard state and the final report (means, deviations, quantiles, share intervals) must equal the
 * single-process ones byte for byte. Reference: the single-process computation itself; the property
 * is the definition of split independence.
 */
import { describe, expect, it } from 'vitest';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import { momentsAdd, momentsEmpty, momentsMerge } from '../../app/engine/math/stats';
import {
  campaignReport,
  campaignState,
  mergeStates,
  stateFromJson,
  stateToJson,
  type CampaignShape,
} from '../integration/campaign-fixture';

function shuffle<T>(rng: Rng, xs: T[]): T[] {
  const a = [...xs];
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(rng.next() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

describe('split independence of the campaign statistics', () => {
  it('10⁵ cases cut at 1, 7 and 20 random points and merged in shuffled order: identical bytes', () => {
    const shape: CampaignShape = { seed: 2718, cases: 100_000, controllers: 1, worst: 12 };
    const all = Array.from({ length: shape.cases }, (_, i) => i);
    const single = campaignState(shape, all);
    const singleState = stateToJson(single);
    const singleReport = campaignReport(single);
    const rng = makeRng(1618, 0);
    for (const cuts of [1, 7, 20]) {
      const at = new Set<number>();
      while (at.size < cuts) at.add(1 + Math.floor(rng.next() * (shape.cases - 1)));
      const bounds = [0, ...[...at].sort((a, b) => a - b), shape.cases];
      const files = bounds.slice(1).map((end, i) => stateToJson(campaignState(shape, shuffle(rng, all.slice(bounds[i]!, end)))));
      let list = shuffle(rng, files).map(stateFromJson);
      while (list.length > 1) {
        const i = Math.floor(rng.next() * (list.length - 1));
        list = [...list.slice(0, i), mergeStates(list[i]!, list[i + 1]!), ...list.slice(i + 2)];
      }
      expect(stateToJson(list[0]!)).toBe(singleState);
      expect(campaignReport(list[0]!)).toBe(singleReport);
    }
    // The report is not trivially constant: it carries the data's figures.
    const report = JSON.parse(singleReport);
    expect(report.cases).toBe(100_000);
    expect(report.controllers[0].settled.method).toBe('wilson');
    expect(report.controllers[0].worst).toHaveLength(12);
  });

  it('the rule is needed: streaming Chan moments of the same split differ in their last bits', () => {
    // Seeded, so deterministic; shows what exact sums buy (the tolerance-level agreement of Chan
    // moments is checked in test/unit/math-stats.test.ts).
    const rng = makeRng(1, 1);
    const xs = Array.from({ length: 100_000 }, () => Math.exp(rng.normal()));
    const one = xs.reduce(momentsAdd, momentsEmpty());
    let differ = 0;
    for (let t = 0; t < 5; t++) {
      const cuts = [0, ...Array.from({ length: 19 }, () => Math.floor(rng.next() * xs.length)).sort((a, b) => a - b), xs.length];
      const parts = cuts.slice(1).map((end, i) => xs.slice(cuts[i]!, end).reduce(momentsAdd, momentsEmpty()));
      const m = parts.reduce((a, b) => momentsMerge(momentsEmpty(), a, b));
      expect(Math.abs(m.m2 - one.m2) / one.m2).toBeLessThan(1e-12);
      if (m.mean !== one.mean || m.m2 !== one.m2) differ++;
    }
    expect(differ).toBeGreaterThan(0);
  });
});
