/**
 * The target card's track and window edits (app/ui/orbit/trackForms.ts): every result is run
 * through the engine's own validator (scenario/validate.ts, the reference for what a file may
 * hold), the file round-trips through resolve and toFile, and the engine's messages for track and
 * window fields are named in the form's words (issues/fieldLabels.ts).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { toScenarioFile } from '../../app/engine/scenario/toFile';
import { describeField, fieldTitle } from '../../app/ui/issues/fieldLabels';
import {
  retargetKind,
  secondaryFor,
  siteIdsOf,
  targetKindOf,
  windowFor,
  windowKindOf,
  type TargetKind,
} from '../../app/ui/orbit/trackForms';

type Obj = Record<string, any>;
const orbitDay = (): Obj => JSON.parse(readFileSync(join(__dirname, '../../assets/lumen6-orbit-day.scenario.json'), 'utf8'));

function withTarget(s: Obj, i: number, t: Obj): Obj {
  const targets = s.targets.slice();
  targets[i] = t;
  return { ...s, targets };
}

function errorsOf(s: unknown): string[] {
  const v = validateScenario(s);
  return v.ok ? [] : v.errors.map((e) => `${e.path} ${e.rule}`);
}

describe('target kinds (trackForms.ts)', () => {
  it('reads the example’s kinds and windows', () => {
    const s = orbitDay();
    expect(s.targets.map(targetKindOf)).toEqual(['sun', 'site', 'site', 'sun', 'station', 'nadir']);
    expect(windowKindOf(s.targets[4])).toBe('pass-to-end');
    expect(siteIdsOf(s)).toEqual(s.orbit.sites.map((x: Obj) => x.id));
  });

  it('every switch of every target gives a file the engine accepts', () => {
    const kinds: TargetKind[] = ['fixed', 'site', 'station', 'sun', 'nadir'];
    const base = orbitDay();
    expect(errorsOf(base)).toEqual([]);
    for (let i = 0; i < base.targets.length; i++)
      for (const k of kinds) {
        const t = retargetKind(base.targets[i], k, base, [0, 0, Math.SQRT1_2, Math.SQRT1_2]);
        expect(targetKindOf(t)).toBe(k);
        const edited = withTarget(base, i, t);
        expect({ i, k, errors: errorsOf(edited) }).toEqual({ i, k, errors: [] });
        // and the file round-trips (reference: the project's own inverse, scenario/toFile.ts)
        const v = validateScenario(edited);
        if (!v.ok) continue;
        const r = resolveScenario(v.value);
        const again = validateScenario(toScenarioFile(r));
        expect(again.ok).toBe(true);
        if (again.ok) expect(resolveScenario(again.value).targets).toEqual(r.targets);
      }
  });

  it('keeps the body axes between aimed forms and the site when going site → station', () => {
    const s = orbitDay();
    const site = s.targets[1].track.site;
    const st: Obj = retargetKind(s.targets[1], 'station', s);
    expect(st.track.station.id).toBe(site.id);
    expect(st.track.station.bodyAxis).toEqual(site.bodyAxis);
    expect(st.window).toEqual(s.targets[1].window);
    const sun: Obj = retargetKind(s.targets[1], 'sun', s);
    expect(sun.track.sun.bodySecondary).toEqual(site.bodySecondary);
    // a pass window has no meaning without a site
    expect(sun.window).toBeUndefined();
  });

  it('back to a fixed attitude writes the tracked attitude as a quaternion', () => {
    const s = orbitDay();
    const q = [0.1, -0.2, 0.3, Math.sqrt(1 - 0.14)];
    const t: Obj = retargetKind(s.targets[2], 'fixed', s, q);
    expect(t.attitude.quaternion).toEqual(q.map((x) => Number(x.toPrecision(12))));
    expect(t.track).toBeUndefined();
    expect(t.window).toBeUndefined();
  });

  it('windows: pass, pass to end, a time (at the epoch), none — each accepted', () => {
    const s = orbitDay();
    for (const k of ['none', 'pass', 'pass-to-end', 'time'] as const) {
      const t: Obj = { ...s.targets[1] };
      const w = windowFor(k, t.window, s.epochUtc);
      if (w) t.window = w;
      else delete t.window;
      expect(windowKindOf(t)).toBe(k);
      // holdUntil pass-end with a hold > 0 is a warning, not an error
      expect({ k, errors: errorsOf(withTarget(s, 1, t)) }).toEqual({ k, errors: [] });
    }
  });

  it('bad input: the engine names the field and the form names it in its words', () => {
    const s = orbitDay();
    const t: Obj = retargetKind(s.targets[1], 'station', s);
    t.track.station.id = 'nowhere';
    t.track.station.bodySecondary = [0, 0, 2]; // parallel to bodyAxis [0, 0, 1]
    t.window = { start: 'time', atUtc: '2020-01-01T00:00:00Z' };
    const v = validateScenario(withTarget(s, 1, t));
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const paths = v.errors.map((e) => e.path);
    expect(paths).toContain('targets[1].track.station.id');
    expect(paths).toContain('targets[1].window.atUtc');
    expect(paths.some((p) => p.startsWith('targets[1].track.station.bodySecondary'))).toBe(true);
    for (const e of v.errors) expect({ p: e.path, d: describeField(e.path, withTarget(s, 1, t)) }).not.toEqual({ p: e.path, d: null });
    expect(fieldTitle(describeField('targets[1].track.station.id', s)!)).toMatch(/Maneuver › Target 2 .*› Station$/);
    expect(fieldTitle(describeField('targets[1].track.site.bodyAxis[2]', s)!)).toMatch(/› Body axis z$/);
    expect(fieldTitle(describeField('targets[5].track.nadir.yaw', s)!)).toMatch(/› Yaw rule$/);
    expect(fieldTitle(describeField('targets[1].window.atUtc', s)!)).toMatch(/› Start \(UTC\)$/);
    expect(fieldTitle(describeField('targets[1].track.sun.secondaryToward.inertialDirection[0]', s)!)).toMatch(/EME2000 direction x$/);
  });

  it('a fixed EME2000 secondary direction round-trips through resolve and toFile', () => {
    const s = orbitDay();
    const t: Obj = retargetKind(s.targets[1], 'sun', s);
    t.track.sun.secondaryToward = secondaryFor('fixed', undefined);
    const v = validateScenario(withTarget(s, 1, t));
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    // reference: the project's own inverse — validate(toFile(resolve(x))) resolves to the same scenario
    const r = resolveScenario(v.value);
    const again = validateScenario(toScenarioFile(r));
    expect(again.ok).toBe(true);
    if (!again.ok) return;
    // (other blocks go through unit factors and may differ in the last bit; the targets must not)
    expect(resolveScenario(again.value).targets).toEqual(r.targets);
    expect((toScenarioFile(r) as Obj).targets[1].track).toEqual({ sun: { ...t.track.sun } });
  });
});
