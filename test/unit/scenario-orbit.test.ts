/**
 * The scenario file's orbit block, moving (track) targets and windows: validation messages name
 * the field and the rule (TLE problems name the line and columns of the standard two-line format,
 * Spacetrack Report #3 / CelesTrak format notes, with the checksum written out independently in
 * test/reference/orbit-fixtures.ts), resolution to SI and the round trip through toScenarioFile
 * (reference: the project's own resolve stage, as in scenario-migrate-tofile.test.ts).
 * The element set and the sites are invented.
 */
import { describe, expect, it } from 'vitest';
import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { toScenarioFile } from '../../app/engine/scenario/toFile';
import { scenarioJsonSchema } from '../../app/engine/scenario/schema';
import { DEG_PER_RAD } from '../../app/engine/units';
import { DEMO_TLE_SSO, editColumns } from '../reference/orbit-fixtures';
import { EXAMPLE_FILES, loadExample } from './scenario-fixtures';

const TLE = DEMO_TLE_SSO.split('\n');

/** An example with an invented orbit, two invented sites and one target of each moving kind. */
function orbitScenario(): any {
  const j = loadExample('lumen6-imaging');
  delete j.orbit;
  j.epochUtc = '2026-03-20T12:00:00Z';
  j.orbit = {
    tle: [...TLE],
    sites: [
      { id: 'north-field', label: 'North field (invented)', latitudeDeg: 46.5, longitudeDeg: 6.6, heightM: 400, elevationMaskDeg: 30 },
      { id: 'dish', label: 'Dish (invented)', latitudeDeg: 64.8, longitudeDeg: -147.7, heightM: 200, elevationMaskDeg: 5 },
    ],
    horizonS: 43200,
  };
  j.targets = [
    { label: 'Sun', track: { sun: { bodyAxis: [0, -1, 0], bodySecondary: [0, 0, 1], secondaryToward: 'nadir' } }, holdS: 0 },
    {
      label: 'Image',
      track: { site: { id: 'north-field', bodyAxis: [0, 0, 1], bodySecondary: [0, 1, 0] } },
      window: { start: 'pass-start' },
      holdS: 30,
    },
    { label: 'Nadir', track: { nadir: { yaw: 'sun-steering' } }, holdS: 60 },
    {
      label: 'Downlink',
      track: { station: { id: 'dish', bodyAxis: [1, 0, 0], bodySecondary: [0, 0, 1], secondaryToward: { inertialDirection: [0, 0, 2] } } },
      window: { start: 'pass-start', holdUntil: 'pass-end' },
      holdS: 0,
    },
    {
      label: 'Star field',
      attitude: { euler: { sequence: 'ZYX', anglesDeg: [10, 20, 30] } },
      window: { start: 'time', atUtc: '2026-03-20T20:00:00Z' },
      holdS: 20,
    },
  ];
  return j;
}

function errorsOf(j: unknown) {
  const r = validateScenario(j);
  expect(r.ok).toBe(false);
  return r.ok ? [] : r.errors;
}

describe('orbit scenarios validate', () => {
  it('a full orbit scenario is valid; the files without an orbit stay valid', () => {
    const r = validateScenario(orbitScenario());
    expect(r.ok ? [] : r.errors).toEqual([]);
    for (const name of EXAMPLE_FILES) {
      const j = loadExample(name);
      delete j.orbit;
      for (const t of j.targets) {
        delete t.track;
        delete t.window;
      }
      if (j.targets.every((t: { attitude?: unknown }) => t.attitude)) expect(validateScenario(j).ok).toBe(true);
    }
  });

  it('the JSON Schema carries the orbit, track and window forms with their units', () => {
    const text = JSON.stringify(scenarioJsonSchema());
    for (const key of ['meanElements', 'semiMajorAxisKm', 'latitudeDeg', 'elevationMaskDeg', 'secondaryToward', 'pass-start', 'horizonS'])
      expect(text).toContain(key);
  });

  it('a TLE with a bad checksum or bad columns is refused by line and column', () => {
    const j = orbitScenario();
    // Column 69 of line 1 is the checksum (modulo-10 sum of columns 1–68, '-' counting 1).
    j.orbit.tle[1] = editColumns(TLE[1]!, 69, 69, String((Number(TLE[1]![68]) + 1) % 10), false);
    // A letter inside the eccentricity field (columns 27–33 of line 2); the checksum is kept right.
    j.orbit.tle[2] = editColumns(TLE[2]!, 27, 33, '00A2000');
    const e = errorsOf(j);
    expect(e.map((x) => [x.path, x.rule])).toEqual(
      expect.arrayContaining([
        ['orbit.tle line 1, column 69', 'checksum'],
        ['orbit.tle line 2, columns 27–33', 'format'],
      ]),
    );
    expect(e.find((x) => x.rule === 'checksum')!.message).toMatch(/^line 1, column 69: checksum must be \d/);
  });

  it('a horizon far from the element epoch warns (SGP4 element sets are used within about 14 days, common practice)', () => {
    const j = orbitScenario();
    j.epochUtc = '2026-04-20T12:00:00Z';
    for (const t of j.targets) delete t.window;
    const r = validateScenario(j);
    expect(r.ok).toBe(true);
    const w = r.warnings.find((x) => x.rule === 'far-from-epoch');
    expect(w?.path).toBe('orbit');
    expect(w?.message).toMatch(/31\.\d days from the element epoch/);
  });

  it('names every misuse of targets, tracks and windows', () => {
    const j = orbitScenario();
    j.orbit.sites.push({ ...j.orbit.sites[0], label: 'again' });
    j.targets[0].attitude = { quaternion: [0, 0, 0, 1] };
    j.targets[1].track.site.id = 'nowhere';
    j.targets[1].track.site.bodySecondary = [0, 0, -3];
    j.targets[2].track.nadir.bodyAxis = [0, 0, 0];
    j.targets[3].track.station.secondaryToward = 'sun';
    j.targets.push({ label: 'Turn', attitude: { relative: { axis: [1, 0, 0], angleDeg: 5 } }, holdS: 1 });
    j.targets.splice(4, 0, {
      label: 'Sun again',
      track: { sun: { bodyAxis: [0, 0, 1], bodySecondary: [1, 0, 0], secondaryToward: 'sun' } },
      holdS: 1,
    });
    j.targets[5].window = { start: 'pass-start' };
    j.targets.push({
      label: 'Late',
      attitude: { quaternion: [0, 0, 0, 1] },
      window: { start: 'time', atUtc: '2026-03-21T12:00:01Z' },
      holdS: 0,
    });
    j.targets.push({ label: 'Nothing', holdS: 0 });
    const got = errorsOf(j).map((x) => [x.path, x.rule]);
    expect(got).toEqual(
      expect.arrayContaining([
        ['orbit.sites[2].id', 'unique'],
        ['targets[0]', 'one-form'],
        ['targets[1].track.site.id', 'known-site'],
        ['targets[1].track.site.bodySecondary', 'not-parallel'],
        ['targets[2].track.nadir.bodyAxis', 'non-zero'],
        ['targets[4].track.sun.secondaryToward', 'parallel'],
        ['targets[5].window.start', 'needs-site'],
        ['targets[7].window.atUtc', 'within-horizon'],
        ['targets[8]', 'required'],
      ]),
    );
    // The Sun secondary of the station target is allowed; the relative turn after a track is not.
    expect(got).not.toContainEqual(['targets[3].track.station.secondaryToward', 'parallel']);
    const j2 = orbitScenario();
    j2.targets.splice(1, 0, { label: 'Turn', attitude: { relative: { axis: [1, 0, 0], angleDeg: 5 } }, holdS: 1 });
    expect(errorsOf(j2).map((x) => [x.path, x.rule])).toContainEqual(['targets[1].attitude.relative', 'after-track']);
  });

  it('tracks and windows need the orbit block; orbit needs exactly one element source', () => {
    const j = orbitScenario();
    delete j.orbit;
    const got = errorsOf(j).map((x) => [x.path, x.rule]);
    expect(got).toEqual(
      expect.arrayContaining([
        ['targets[0].track', 'needs-orbit'],
        ['targets[1].window', 'needs-orbit'],
      ]),
    );
    const k = orbitScenario();
    k.orbit.meanElements = {
      epochUtc: '2026-03-20T00:00:00Z',
      meanMotionRevPerDay: 15.2,
      eccentricity: 0.001,
      inclinationDeg: 97.4,
      raanDeg: 0,
      argPerigeeDeg: 0,
      meanAnomalyDeg: 0,
    };
    expect(errorsOf(k).map((x) => [x.path, x.rule])).toContainEqual(['orbit', 'one-of']);
    delete k.orbit.tle;
    k.orbit.meanElements.meanMotionRevPerDay = 40; // perigee below the surface
    expect(errorsOf(k).map((x) => x.rule)).toContain('perigee');
  });

  it('"pass-end" holds ignore holdS with a warning', () => {
    const j = orbitScenario();
    j.targets[3].holdS = 50;
    const r = validateScenario(j);
    expect(r.ok).toBe(true);
    expect(r.warnings.map((w) => [w.path, w.rule])).toContainEqual(['targets[3].holdS', 'ignored']);
  });
});

describe('orbit scenarios resolve to SI and back', () => {
  it('sites in radians, unit body axes, a time window in plan seconds (leap seconds counted)', () => {
    const v = validateScenario(orbitScenario());
    if (!v.ok) throw new Error('fixture');
    const r = resolveScenario(v.value);
    expect(r.orbit!.horizonS).toBe(43200);
    expect(r.orbit!.sites[0]!.latitudeRad * DEG_PER_RAD).toBeCloseTo(46.5, 12);
    expect(r.orbit!.sites[0]!.elevationMaskRad * DEG_PER_RAD).toBeCloseTo(30, 12);
    const st = r.targets[3]!.track!;
    expect(st.kind).toBe('station');
    if (st.kind !== 'station') return;
    expect(st.siteIndex).toBe(1);
    expect(st.secondary).toEqual({ inertial: Float64Array.of(0, 0, 1) });
    expect(r.targets[3]!.window).toEqual({ start: 'pass-start', untilPassEnd: true });
    // 12:00 → 20:00 UTC on the same day: 8 h, no leap second in between.
    expect(r.targets[4]!.window).toEqual({ start: 'time', atS: 28800, atUtc: '2026-03-20T20:00:00Z' });
    expect(r.targets[1]!.form).toBe('site');
    expect(Array.from(r.targets[1]!.qInertialFromBody).every(Number.isNaN)).toBe(true);
    expect(Array.from(r.targets[4]!.qInertialFromBody).some(Number.isNaN)).toBe(false);
  });

  it('a window across the 2016-12-31 leap second counts the inserted second (IERS Bulletin C 52)', () => {
    const j = orbitScenario();
    j.epochUtc = '2016-12-31T23:59:50Z';
    j.orbit = {
      meanElements: {
        epochUtc: '2016-12-31T12:00:00Z',
        meanMotionRevPerDay: 15.2,
        eccentricity: 0.001,
        inclinationDeg: 51.6,
        raanDeg: 10,
        argPerigeeDeg: 20,
        meanAnomalyDeg: 30,
      },
    };
    j.targets = [
      { label: 'Hold', attitude: { quaternion: [0, 0, 0, 1] }, window: { start: 'time', atUtc: '2017-01-01T00:00:00Z' }, holdS: 5 },
    ];
    const v = validateScenario(j);
    if (!v.ok) throw new Error(JSON.stringify(v.errors));
    const w = resolveScenario(v.value).targets[0]!.window!;
    expect(w.start === 'time' && w.atS).toBe(11);
  });

  it('toScenarioFile writes the orbit, tracks and windows back (resolve ∘ validate ∘ toFile = identity)', () => {
    const v = validateScenario(orbitScenario());
    if (!v.ok) throw new Error('fixture');
    const r = resolveScenario(v.value);
    const file = toScenarioFile(r);
    expect(file.orbit!.tle).toEqual(TLE);
    expect(file.orbit!.horizonS).toBe(43200);
    const v2 = validateScenario(file);
    expect(v2.ok ? [] : v2.errors).toEqual([]);
    if (!v2.ok) return;
    const r2 = resolveScenario(v2.value);
    expect(r2.orbit!.sites.map((s) => s.id)).toEqual(['north-field', 'dish']);
    r2.orbit!.sites.forEach((s, i) => {
      const a = r.orbit!.sites[i]!;
      expect(Math.abs(s.latitudeRad - a.latitudeRad)).toBeLessThan(1e-15);
      expect(Math.abs(s.elevationMaskRad - a.elevationMaskRad)).toBeLessThan(1e-15);
    });
    // Fixed attitudes come back as quaternions (by design); track forms and windows as they were.
    const forms = (x: typeof r) => x.targets.map((t) => [t.track ? t.form : 'fixed', t.window]);
    expect(forms(r2)).toEqual(forms(r));
    expect(r2.targets.map((t) => t.track)).toEqual(r.targets.map((t) => t.track));
    // Mean elements round-trip too.
    const j = orbitScenario();
    delete j.orbit.tle;
    j.orbit.meanElements = {
      name: 'invented',
      epochUtc: '2026-03-20T06:00:00.250Z',
      semiMajorAxisKm: 6890,
      eccentricity: 0.002,
      inclinationDeg: 97.5,
      raanDeg: -20,
      argPerigeeDeg: 400,
      meanAnomalyDeg: 5,
      bstarPerEarthRadii: 1e-5,
    };
    const v3 = validateScenario(j);
    if (!v3.ok) throw new Error(JSON.stringify(v3.errors));
    expect(toScenarioFile(resolveScenario(v3.value)).orbit!.meanElements).toEqual(j.orbit.meanElements);
  });
});
