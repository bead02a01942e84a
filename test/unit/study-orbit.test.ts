/**
 * A robustness study on an orbit scenario: the study regulates each dispersed case onto the first
 * target's planned attitude (for a moving target, the attitude at which tracking starts), so every
 * case is flyable. Reference: the pipeline's own plan of the nominal scenario (project code; the
 * plan itself is checked in test/reference/orbit-tracking.test.ts). The scenario is invented.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { makeStudyContext } from '../../app/engine/study/context';
import { runCase } from '../../app/engine/study/runCase';
import { asset } from './cli-harness';

describe('study on an orbit scenario', () => {
  it('cases regulate onto the planned tracking-start attitude and fly', () => {
    const j = JSON.parse(readFileSync(asset('lumen6-orbit-day.scenario.json'), 'utf8'));
    j.targets = j.targets.slice(0, 2);
    j.orbit.horizonS = 900;
    j.study = { runs: 2, seed: 7, controllers: ['pd'], durationS: 300, mode: 'follow-plan' };
    const c = makeStudyContext(j);
    if (!c.ok) throw new Error(JSON.stringify(c.errors));
    const ctx = c.value;
    const e = ctx.prepared.plan.tracking!.entries[0]!;
    expect(Array.from(ctx.target)).toEqual(Array.from(e.qTrack));
    const rec = runCase(ctx, 0)!;
    expect(rec.runs[0]!.status).not.toBe('unflyable');
    expect(rec.runs[0]!.status).not.toBe('failed');
  }, 60_000);
});
