/**
 * TLE column and checksum validation. The layout and the modulo-10 checksum rule are those of the
 * standard two-line format (Spacetrack Report #3 documentation; CelesTrak format notes): the test
 * builds bad lines with its own checksum helper (orbit-fixtures.ts) and checks that each problem is
 * named by line, columns and rule, all at once.
 */
import { describe, expect, it } from 'vitest';
import { orbitFromTle, parseTle, tleChecksum } from '../../app/engine/orbit/tle';
import { checksumOf, DEMO_TLE_LEO, DEMO_TLE_SSO, editColumns, VALLADO_00005 } from '../reference/orbit-fixtures';

const [L1, L2] = VALLADO_00005.split('\n') as [string, string];
const where = (text: string) => {
  const r = parseTle(text);
  return r.ok ? [] : r.errors.map((e) => `${e.path}: ${e.rule}`);
};

describe('TLE parsing', () => {
  it('reads every field of the verification case 00005 (AIAA 2006-6753)', () => {
    const r = parseTle(VALLADO_00005);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const f = r.value;
    expect(f.catalogNumber).toBe(5);
    expect(f.classification).toBe('U');
    expect(f.internationalDesignator).toBe('58002B');
    expect(f.epochYear).toBe(2000);
    expect(f.epochDayOfYear).toBe(179.78495062);
    expect(f.meanMotionDotHalf).toBe(0.00000023);
    expect(f.meanMotionDdotSixth).toBe(0);
    expect(f.bstar).toBeCloseTo(0.28098e-4, 15);
    expect(f.elementSetNumber).toBe(475);
    expect([f.inclinationDeg, f.raanDeg, f.eccentricity, f.argPerigeeDeg, f.meanAnomalyDeg]).toEqual([
      34.2682, 348.7242, 0.1859667, 331.7664, 19.3264,
    ]);
    expect(f.meanMotionRevPerDay).toBe(10.82419157);
    expect(f.revolutionNumber).toBe(41366);
    // The published lines carry checksums 3 and 7.
    expect([tleChecksum(L1), tleChecksum(L2)]).toEqual([3, 7]);
    expect([checksumOf(L1), checksumOf(L2)]).toEqual([3, 7]);
  });

  it('accepts an optional title line (with or without "0 ") and CRLF line ends', () => {
    const r = parseTle(DEMO_TLE_SSO.replace(/\n/g, '\r\n'));
    expect(r.ok && r.value.title).toBe('LUMEN-6 (INVENTED)');
    const r0 = parseTle('0 KESTREL\n' + DEMO_TLE_LEO);
    expect(r0.ok && r0.value.title).toBe('KESTREL');
    const long = parseTle('A TITLE MUCH LONGER THAN TWENTY-FOUR\n' + DEMO_TLE_LEO);
    expect(long.ok && long.warnings.map((w) => w.rule)).toEqual(['title-length']);
  });

  it('Alpha-5 catalogue numbers: A0001 = 100001, Z9999 = 339999', () => {
    const a1 = editColumns(L1, 3, 7, 'A0001'),
      a2 = editColumns(L2, 3, 7, 'A0001');
    const r = parseTle(`${a1}\n${a2}`);
    expect(r.ok && r.value.catalogNumber).toBe(100001);
    const z = parseTle(`${editColumns(L1, 3, 7, 'Z9999')}\n${editColumns(L2, 3, 7, 'Z9999')}`);
    expect(z.ok && z.value.catalogNumber).toBe(339999);
    expect(where(`${editColumns(L1, 3, 7, 'I0001')}\n${editColumns(L2, 3, 7, 'I0001')}`)).toEqual([
      'tle line 1, columns 3–7: format',
      'tle line 2, columns 3–7: format',
    ]);
  });
});

describe('TLE errors name line, columns and rule', () => {
  it('a wrong checksum', () => {
    const bad = L2.slice(0, 68) + String((checksumOf(L2) + 1) % 10);
    expect(where(`${L1}\n${bad}`)).toEqual(['tle line 2, column 69: checksum']);
  });

  it('a letter inside the eccentricity also breaks the checksum: both reported', () => {
    const bad = editColumns(L2, 27, 33, '18596x7', false);
    expect(where(`${L1}\n${bad}`)).toEqual(['tle line 2, columns 27–33: format', 'tle line 2, column 69: checksum']);
  });

  it('separator columns, line numbers, lengths and catalogue mismatch', () => {
    expect(where(`${editColumns(L1, 9, 9, 'X')}\n${L2}`)).toEqual(['tle line 1, column 9: blank']);
    expect(where(`${editColumns(L1, 1, 1, '3')}\n${L2}`)).toEqual(['tle line 1, column 1: line-number']);
    expect(where(`${L1.slice(0, 60)}\n${L2}`)).toEqual(['tle line 1: line-length']);
    expect(where(`${L1}\n${editColumns(L2, 3, 7, '00006')}`)).toEqual(['tle line 2, columns 3–7: catalogue-mismatch']);
    expect(where(L1)).toEqual(['tle: line-count']);
  });

  it('field formats and ranges, all problems at once', () => {
    let l1 = editColumns(L1, 8, 8, 'X');
    l1 = editColumns(l1, 21, 32, '179,78495062');
    l1 = editColumns(l1, 54, 61, ' 28098*4');
    let l2 = editColumns(L2, 9, 16, '190.0000');
    l2 = editColumns(l2, 18, 25, '360.0000');
    l2 = editColumns(l2, 53, 63, '10.8241915x');
    expect(where(`${l1}\n${l2}`)).toEqual([
      'tle line 1, column 8: format',
      'tle line 1, columns 21–32: format',
      'tle line 1, columns 54–61: format',
      'tle line 2, columns 53–63: format',
      'tle line 2, columns 9–16: range',
      'tle line 2, columns 18–25: range',
    ]);
  });

  it('epoch day beyond the year, pre-1972 epochs, a perigee below the surface', () => {
    expect(where(`${editColumns(L1, 19, 32, '01366.50000000')}\n${L2}`)).toEqual(['tle line 1, columns 21–32: epoch']);
    expect(where(`${editColumns(L1, 19, 32, '71100.50000000')}\n${L2}`)).toEqual(['tle line 1, columns 19–32: before-1972']);
    // 16.5 rev/day (a ≈ 6.66e3 km) with e = 0.1859667 puts perigee ~ 960 km underground.
    expect(where(`${L1}\n${editColumns(L2, 53, 63, '16.50000000')}`)).toEqual(['tle line 2, columns 27–63: perigee']);
  });

  it('a valid TLE initialises SGP4; the message of each issue starts with its location', () => {
    const o = orbitFromTle(DEMO_TLE_SSO);
    expect(o.ok && o.value.name).toBe('LUMEN-6 (INVENTED)');
    expect(o.ok && o.value.epochUtcIso).toBe('2026-03-20T12:00:00.000000Z');
    const bad = parseTle(`${L1}\n${editColumns(L2, 27, 33, '18596x7', false)}`);
    expect(!bad.ok && bad.errors[0]!.message).toMatch(/^line 2, columns 27–33: eccentricity must be seven digits/);
  });
});
