/**
 * Orbit bands on the time plots (app/ui/plots/windowBands.ts): which intervals are shaded and how a
 * run-time interval becomes pixels.
 * - Bands come from the orbit stage of the bundled invented example (no flight needed): each
 *   site/station window is the planned tracking interval, named with the site's label as written
 *   in the scenario file, and lies inside one of that site's passes (the engine's visibility
 *   windows); eclipses are the engine's eclipse windows; a scenario without an orbit has none.
 * - Pixels: the affine map of a linear axis, x = left + (t − xMin)·width/(xMax − xMin) (the map
 *   uPlot's valToPos applies on a linear scale; the e2e spec test/e2e/orbit-view.test.ts compares
 *   the drawn band with uPlot's own valToPos), checked here on worked examples done by hand.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { orbitOutput } from '../../app/engine/pipeline/orbit';
import { preparePipeline } from '../../app/engine/pipeline/run';
import { bandPixels, windowBands } from '../../app/ui/plots/windowBands';

const file = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as {
  orbit: { sites: { id: string; label: string }[] };
  targets: { label: string }[];
};

describe('orbit bands: which intervals', () => {
  const prep = preparePipeline(file);
  if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
  const p = prep.value;
  const orbit = orbitOutput(p.scenario, p.orbit!, p.plan.tracking ?? null);
  const bands = windowBands({ orbit });

  it('one window band per site/station target, named as the file names its site, inside that site pass', () => {
    const windows = bands.filter((b) => b.kind === 'window');
    // The example file: Aldermoor, Brisk Plain (imaging) and Harrowgate (downlink) are tracked.
    expect(windows.map((b) => b.label)).toEqual(file.orbit.sites.map((s) => s.label));
    for (const b of windows) {
      const site = orbit.sites.find((s) => s.label === b.label)!;
      expect(b.t1).toBeGreaterThan(b.t0);
      expect(site.passes.some((q) => b.t0 >= q.startS - 1e-6 && b.t1 <= q.endS + 1e-6)).toBe(true);
    }
  });

  it('eclipse bands are the engine eclipse windows; bands are in time order', () => {
    const ecl = bands.filter((b) => b.kind === 'eclipse');
    expect(ecl.length).toBe(orbit.eclipses.length);
    expect(ecl.length).toBeGreaterThan(0);
    ecl.forEach((b, i) => {
      expect(b.t0).toBe(orbit.eclipses[i]!.startS);
      expect(b.t1).toBe(orbit.eclipses[i]!.endS);
    });
    for (let i = 1; i < bands.length; i++) expect(bands[i]!.t0).toBeGreaterThanOrEqual(bands[i - 1]!.t0);
  });

  it('no orbit, no bands', () => {
    expect(windowBands({ orbit: null })).toEqual([]);
    expect(windowBands({})).toEqual([]);
  });
});

describe('orbit bands: run time to pixels (affine map, worked by hand)', () => {
  it('[100, 400] s on an axis 0…1000 s drawn over x = 50…850 px is 130…370 px', () => {
    // 50 + 100·800/1000 = 130, 50 + 400·800/1000 = 370.
    const px = bandPixels(100, 400, 0, 1000, 50, 800)!;
    expect(px.x0).toBeCloseTo(130, 12);
    expect(px.x1).toBeCloseTo(370, 12);
  });

  it('a zoomed axis 2000…2600 s over 62…662 px: [1900, 2150] s is clipped to 62…212 px', () => {
    // The part before 2000 s is outside the view; 62 + 150·600/600 = 212.
    const px = bandPixels(1900, 2150, 2000, 2600, 62, 600)!;
    expect(px.x0).toBeCloseTo(62, 12);
    expect(px.x1).toBeCloseTo(212, 12);
  });

  it('outside the view, reversed or degenerate: null', () => {
    expect(bandPixels(0, 10, 20, 30, 0, 100)).toBeNull();
    expect(bandPixels(40, 50, 20, 30, 0, 100)).toBeNull();
    expect(bandPixels(25, 22, 20, 30, 0, 100)).toBeNull();
    expect(bandPixels(21, 22, 20, 20, 0, 100)).toBeNull();
    expect(bandPixels(21, 22, 20, 30, 0, 0)).toBeNull();
  });
});
