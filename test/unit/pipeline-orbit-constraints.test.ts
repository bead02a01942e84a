/**
 * Constraints against orbit-dependent directions on an orbit scenario: the pipeline hands the orbit
 * stage's ephemeris to the constraint directions, so Earth-centre and Sun cones are checked on the
 * tracking plan. Expected values from the definitions (margin = angle − half-angle, in degrees):
 * during the nadir hold the +Z axis points at the Earth's centre by construction of the nadir target,
 * so a keep-out of half-angle 10° about the Earth's centre reaches −10° there; during the Sun hold −Z
 * points at the Sun, so a keep-out of 30° about the Sun on −Z reaches −30° there.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { preparePipeline } from '../../app/engine/pipeline/run';
import { DEG_PER_RAD } from '../../app/engine/units';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

function orbitDay(constraints: unknown[]): any {
  const s = JSON.parse(readFileSync(path.join(root, 'assets/lumen6-orbit-day.scenario.json'), 'utf8'));
  s.constraints = constraints;
  return s;
}

describe('constraints on an orbit scenario use the orbit stage’s ephemeris', () => {
  const p = preparePipeline(
    orbitDay([
      { name: 'camera earth', kind: 'keep-out', bodyAxis: [0, 0, 1], halfAngleDeg: 10, direction: { kind: 'earth-centre' } },
      { name: 'panel sun', kind: 'keep-out', bodyAxis: [0, 0, -1], halfAngleDeg: 30, direction: { kind: 'sun' } },
    ]),
  );

  it('is accepted (Earth-centre needs the orbit, which the scenario has)', () => {
    if (!p.ok) throw new Error(p.errors.map((e) => e.message).join('; '));
    expect(p.value.planConstraints).not.toBeNull();
  });

  it('reaches −half-angle where the planned reference points the axis at the direction', () => {
    if (!p.ok) return;
    const r = p.value.planConstraints!;
    const byName = new Map(r.constraints.map((c) => [c.name, c]));
    const earth = byName.get('camera earth')!;
    const sun = byName.get('panel sun')!;
    // Sampled and interpolated directions (constraints/directions.ts): agreement to 0.05°.
    expect(earth.minMarginRad * DEG_PER_RAD).toBeCloseTo(-10, 1);
    expect(sun.minMarginRad * DEG_PER_RAD).toBeCloseTo(-30, 1);
    expect(earth.intervals.length).toBeGreaterThan(0);
    expect(r.clear).toBe(false);
    // The Earth minimum falls in a nadir-pointing stretch: the nadir hold (last target) or a site
    // pass near the sub-satellite point; the Sun minimum while the Sun is tracked.
    const tracking = p.value.plan.tracking!.entries;
    const holding = (t: number, label: RegExp) =>
      tracking.some((e) => label.test(e.label) && t >= e.trackStartS - 1e-6 && t <= e.holdEndS + 1e-6);
    expect(holding(sun.minAtS, /Sun/)).toBe(true);
    expect(holding(earth.minAtS, /Nadir|Image/)).toBe(true);
  });
});
