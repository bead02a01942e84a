/**
 * Pure helpers of the app's orbit views (app/ui/orbit/orbitRows.ts): UTC labels, duration text,
 * the rows of the passes table, the ground track cut at the antimeridian and the TLE text split
 * into lines. Hand values, worked out beside each check.
 */
import { describe, expect, it } from 'vitest';
import {
  durationText,
  eclipseRows,
  groundTrackPieces,
  passRows,
  shortUtcText,
  tleLinesOfText,
  utcText,
  windowErrorCells,
  wrapLongitudeDeg,
} from '../../app/ui/orbit/orbitRows';
import { describeField } from '../../app/ui/issues/fieldLabels';
import { newSite, sizeAs, starterOrbit } from '../../app/ui/orbit/orbitEdits';
import { validateScenario } from '../../app/engine/scenario/validate';
import demoScenario from '../../assets/lumen6-imaging.scenario.json';
import { boresightChoices } from '../../app/ui/plots/overlays';
import type { PipelineOutput } from '../../app/engine/pipeline/types';

// 2026-03-20T21:55:00Z as TAI seconds since 2000-01-01T12:00:00 TAI, by hand: 2000-01-01 → 2026-01-01
// is 26·365 + 7 leap days (2000 … 2024) = 9497 d; to 20 March 31 + 28 + 19 = 78 d more, so 9575 d;
// 9575·86400 + 21:55 (78900 s) − 12 h (43200 s) = 827 315 700 s on the UTC calendar; plus TAI − UTC
// = 37 s in 2026 (IERS Bulletin C, unchanged since 2017-01-01) = 827 315 737 s.
const EPOCH_TAI = 827_315_737;

const site = (id: string, passes: { startS: number; endS: number; maxElevationRad: number; startClipped?: boolean }[]) => ({
  id,
  label: `${id} (invented)`,
  latitudeRad: 0,
  longitudeRad: 0,
  heightM: 0,
  elevationMaskRad: 0,
  passes: passes.map((p) => ({ tMaxS: (p.startS + p.endS) / 2, startClipped: false, endClipped: false, ...p })),
});

describe('orbit rows', () => {
  it('UTC text and durations (hand values above)', () => {
    expect(utcText(EPOCH_TAI, 0)).toBe('2026-03-20 21:55:00');
    // 3661.4 s = 1 h 1 min 1.4 s later, rounded to the second.
    expect(utcText(EPOCH_TAI, 3661.4)).toBe('2026-03-20 22:56:01');
    // 2 h 5 min later crosses midnight.
    expect(utcText(EPOCH_TAI, 7500)).toBe('2026-03-21 00:00:00');
    expect(shortUtcText(EPOCH_TAI, 3661.4)).toBe('22:56:01');
    expect(shortUtcText(EPOCH_TAI, 7500)).toBe('03-21 00:00:00');
    expect(durationText(3725)).toBe('01:02:05');
    expect(durationText(59.6)).toBe('00:01:00');
  });

  it('passes of all sites in time order, peak elevation in degrees', () => {
    const rows = passRows({
      epochTaiS: EPOCH_TAI,
      sites: [
        site('b', [{ startS: 600, endS: 1080, maxElevationRad: 0.5 }]),
        site('a', [{ startS: 60, endS: 300, maxElevationRad: Math.PI / 4, startClipped: true }]),
      ],
    });
    expect(rows.map((r) => r.siteId)).toEqual(['a', 'b']);
    // π/4 rad = 45°; 0.5 rad = 28.6479°.
    expect(rows[0]).toMatchObject({
      start: '2026-03-20 21:56:00',
      end: '2026-03-20 22:00:00',
      duration: '00:04:00',
      maxElevation: '45.00',
    });
    expect(rows[0]!.note).toBe('under way at t = 0');
    expect(rows[1]).toMatchObject({ duration: '00:08:00', maxElevation: '28.65', note: '' });
  });

  it('eclipses: umbra duration or none', () => {
    const rows = eclipseRows({
      epochTaiS: EPOCH_TAI,
      eclipses: [
        { startS: 100, endS: 2200, umbraStartS: 110, umbraEndS: 2190, startClipped: false, endClipped: false },
        { startS: 5000, endS: 5010, umbraStartS: NaN, umbraEndS: NaN, startClipped: false, endClipped: true },
      ],
    });
    expect(rows[0]).toMatchObject({ duration: '00:35:00', umbra: '00:34:40' });
    expect(rows[1]).toMatchObject({ umbra: 'no umbra', note: 'past the horizon' });
  });

  it('window errors in degrees', () => {
    // 1e-3 rad = 0.0572958°.
    const c = windowErrorCells({
      target: 0,
      label: 'x',
      startS: 0,
      endS: 1,
      samples: 10,
      peakPointingErrorRad: 1e-3,
      rmsPointingErrorRad: null,
      peakAttitudeErrorRad: 1e-3,
    });
    expect(c).toEqual({ peakDeg: '0.05730', rmsDeg: '—' });
  });

  it('longitude wrapping and the antimeridian cut', () => {
    expect(wrapLongitudeDeg(190)).toBe(-170);
    expect(wrapLongitudeDeg(-190)).toBe(170);
    expect(wrapLongitudeDeg(180)).toBe(-180);
    expect(wrapLongitudeDeg(540)).toBe(-180);
    const r = Math.PI / 180;
    const lon = [170, 179, -179, -170, -160].map((d) => d * r);
    const lat = [10, 11, 12, 13, 14].map((d) => d * r);
    const pieces = groundTrackPieces(lat, lon);
    expect(pieces.map((p) => p.firstIndex)).toEqual([0, 2]);
    expect(pieces[0]!.lonDeg.map((v) => Math.round(v * 1e9) / 1e9)).toEqual([170, 179]);
    expect(pieces[1]!.lonDeg.map((v) => Math.round(v * 1e9) / 1e9)).toEqual([-179, -170, -160]);
    // An eastward run that stays in one hemisphere is one piece.
    expect(groundTrackPieces([0, 0, 0], [0, 1, 2]).length).toBe(1);
  });

  it('TLE text to lines: CRLF, trailing spaces and empty lines dropped', () => {
    expect(tleLinesOfText('TITLE  \r\n1 abc \r\n\r\n2 def\n')).toEqual(['TITLE', '1 abc', '2 def']);
    expect(tleLinesOfText('')).toEqual([]);
  });
});

describe('orbit issue labels (app/ui/issues/fieldLabels.ts)', () => {
  it('TLE issues, elements and sites are named in the Orbit panel’s words', () => {
    expect(describeField('orbit.tle line 2, column 69', {})).toEqual({ where: ['Orbit'], label: 'Two-line element set' });
    expect(describeField('orbit.meanElements.inclinationDeg', {})).toMatchObject({
      where: ['Orbit', 'Mean elements'],
      label: 'Inclination',
    });
    expect(describeField('orbit.sites[1].elevationMaskDeg', {})).toMatchObject({ where: ['Orbit', 'Site 2'], label: 'Elevation mask' });
    expect(describeField('orbit.horizonS', {})).toMatchObject({ where: ['Orbit'], label: 'Horizon' });
  });
});

describe('boresight choices of tracking targets (app/ui/plots/overlays.ts)', () => {
  it('a track names its body axis; nadir without one is +Z; a fixed target without pointing has none', () => {
    const out = {
      scenario: {
        targets: [{ label: 'site' }, { label: 'nadir' }, { label: 'fixed' }],
        file: {
          targets: [
            { track: { site: { id: 'a', bodyAxis: [0, 0, 2], bodySecondary: [1, 0, 0] } } },
            { track: { nadir: { yaw: 'lvlh' } } },
            { attitude: { euler: { sequence: 'zyx', anglesDeg: [0, 0, 0] } } },
          ],
        },
      },
    } as unknown as PipelineOutput;
    const c = boresightChoices(out).filter((x) => x.key.startsWith('target-'));
    expect(c.map((x) => [x.key, [...x.axis]])).toEqual([
      ['target-1', [0, 0, 1]],
      ['target-2', [0, 0, 1]],
    ]);
  });
});

describe('what the Orbit panel writes (app/ui/orbit/orbitEdits.ts)', () => {
  it('the demo with a new orbit block and two new sites is a valid scenario', () => {
    const demo = JSON.parse(JSON.stringify(demoScenario)) as Record<string, unknown>;
    const orbit = starterOrbit(demo.epochUtc);
    const s1 = newSite([]);
    orbit.sites = [s1, newSite([s1])];
    const v = validateScenario({ ...demo, orbit });
    expect(v.ok ? [] : v.errors).toEqual([]);
    expect((orbit.sites as { id: string }[]).map((s) => s.id)).toEqual(['site-1', 'site-2']);
  });

  it('orbit size given the other way keeps the orbit', () => {
    // Kepler's third law with SGP4's μ = 398600.8 km³/s² (WGS-72; Vallado et al. 2006, "Revisiting
    // Spacetrack Report #3"), by hand: n = 15.2·2π/86400 = 1.105375e-3 rad/s, a = (μ/n²)^(1/3) ≈ 6884.0 km.
    const a = sizeAs({ meanMotionRevPerDay: 15.2 }, 'semiMajorAxisKm');
    expect(Math.abs(a - 6884.0)).toBeLessThan(0.5);
    // a is stored to 9 significant digits (1e-5 km): the mean motion comes back within ~3e-8 rev/day.
    expect(sizeAs({ semiMajorAxisKm: a }, 'meanMotionRevPerDay')).toBeCloseTo(15.2, 6);
    // Nothing usable to convert: a start value.
    expect(sizeAs({ meanMotionRevPerDay: 'x' }, 'semiMajorAxisKm')).toBe(6900);
  });
});
