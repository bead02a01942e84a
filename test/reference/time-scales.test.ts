/**
 * Time scales and UTC epochs against outside references:
 * - ECMAScript Date (ECMA-262 §21.4.1: proleptic Gregorian calendar, a time value that ignores
 *   leap seconds) for the calendar and for UTC instants away from leap seconds;
 * - the IANA/NIST leap-seconds.list shipped by the tz database (tzdata, /usr/share/zoneinfo), when
 *   the machine has it, for every entry of the TAI − UTC table;
 * - IERS Bulletin C 52 (6 July 2016; read): 2016 December 31 23:59:59, 23:59:60, 2017 January 1
 *   0:00:00, UTC − TAI = −36 s before and −37 s after;
 * - IAU 1991 Resolution A4: TT − TAI = 32.184 s exactly (from memory);
 * - the label examples of the task brief (epoch 2016-12-31T23:59:50Z + 10 s / + 11 s).
 */
import { existsSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  LEAP_SECONDS,
  civilFromDayNumber,
  createUtcFields,
  dayNumber,
  julianDateUt1FromTai,
  parseUtcIso,
  taiFromUtc,
  taiMinusUtcAtTai,
  ttDaysFromTai,
  ttSecondsFromTai,
  utcDayCountFromTai,
  utcFromTai,
  utcLabel,
  utcLabelFromTai,
} from '../../app/engine/time';
import { makeRng } from '../../app/engine/math/prng';

/** Seconds from 1970-01-01T00:00Z to 2000-01-01T12:00Z in a leap-second-free count (Date.UTC). */
const POSIX_AT_J2000_NOON = Date.UTC(2000, 0, 1, 12) / 1000;

describe('calendar', () => {
  it('day numbers and dates agree with ECMAScript Date (proleptic Gregorian) over 1600–2400', () => {
    const rng = makeRng(11, 0);
    const cd = { year: 0, month: 0, day: 0 };
    for (let k = 0; k < 5000; k++) {
      const n = Math.floor((rng.next() - 0.5) * 2 * 146097 * 2);
      const ms = Date.UTC(2000, 0, 1) + n * 86400000; // ECMA-262 Date: days of exactly 86 400 000 ms
      const d = new Date(ms);
      civilFromDayNumber(cd, n);
      expect([cd.year, cd.month, cd.day]).toEqual([d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate()]);
      expect(dayNumber(cd.year, cd.month, cd.day)).toBe(n);
    }
  });
});

describe('leap-second table', () => {
  const listPath = '/usr/share/zoneinfo/leap-seconds.list';
  it.skipIf(!existsSync(listPath))('matches every entry of the tz database leap-seconds.list (IERS Bulletin C via IANA)', () => {
    const rows = readFileSync(listPath, 'utf8')
      .split('\n')
      .filter((l) => /^\d/.test(l))
      .map((l) => l.trim().split(/\s+/).map(Number) as [number, number]);
    // NTP seconds since 1900-01-01; 36524 days from 1900-01-01 to 2000-01-01.
    const fromList = rows.map(([ntp, dat]) => [ntp / 86400 - 36524, dat]);
    expect(LEAP_SECONDS.map((e) => [e.day, e.taiMinusUtcS])).toEqual(fromList);
  });

  it('Bulletin C 52: TAI − UTC = 36 s through 2016-12-31T23:59:60, 37 s from 2017-01-01', () => {
    const before = taiFromUtc(2016, 12, 31, 23, 59, 59);
    const leap = taiFromUtc(2016, 12, 31, 23, 59, 60);
    const after = taiFromUtc(2017, 1, 1, 0, 0, 0);
    expect(leap - before).toBe(1);
    expect(after - leap).toBe(1);
    expect(taiMinusUtcAtTai(before)).toBe(36);
    expect(taiMinusUtcAtTai(after)).toBe(37);
    // TAI − UTC = 10 s at 1972-01-01 (first Bulletin C value, from memory) and 37 s in 2030.
    expect(taiMinusUtcAtTai(taiFromUtc(1972, 1, 1, 0, 0, 0))).toBe(10);
    expect(taiMinusUtcAtTai(taiFromUtc(2030, 3, 13, 8, 0, 0))).toBe(37);
    expect(taiMinusUtcAtTai(taiFromUtc(1971, 12, 31, 0, 0, 0))).toBeNaN();
  });

  it('TT − UTC = 32.184 s + TAI − UTC (IAU 1991 Resolution A4; from memory)', () => {
    const tai = taiFromUtc(2020, 6, 1, 0, 0, 0);
    // TT days since J2000.0 minus UTC days since 2000-01-01T12:00 UTC.
    expect(ttSecondsFromTai(tai) - utcDayCountFromTai(tai)).toBeCloseTo(69.184, 6); // doubles near 6e8 s resolve 0.1 µs
    expect(ttDaysFromTai(tai) * 86400 - utcDayCountFromTai(tai)).toBeCloseTo(69.184, 6); // days lose digits
    // J2000.0 itself: 2000-01-01T11:58:55.816 UTC is TT 0.
    expect(ttDaysFromTai(taiFromUtc(2000, 1, 1, 11, 58, 55.816))).toBeCloseTo(0, 12);
  });
});

describe('UTC ↔ TAI', () => {
  it('away from leap seconds the UTC day count equals the ECMAScript time value', () => {
    const rng = makeRng(12, 0);
    const f = createUtcFields();
    for (let k = 0; k < 2000; k++) {
      const ms = Date.UTC(1972, 0, 1) + Math.floor(rng.next() * (Date.UTC(2040, 0, 1) - Date.UTC(1972, 0, 1)));
      const d = new Date(ms);
      const sec = d.getUTCSeconds() + d.getUTCMilliseconds() / 1000;
      const tai = taiFromUtc(d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate(), d.getUTCHours(), d.getUTCMinutes(), sec);
      expect(utcDayCountFromTai(tai)).toBeCloseTo(ms / 1000 - POSIX_AT_J2000_NOON, 6);
      expect(julianDateUt1FromTai(tai)).toBeCloseTo(ms / 86400000 + 2440587.5, 9); // JD of the Unix epoch: 2440587.5
      utcFromTai(f, tai);
      expect([f.year, f.month, f.day, f.hour, f.minute]).toEqual([
        d.getUTCFullYear(),
        d.getUTCMonth() + 1,
        d.getUTCDate(),
        d.getUTCHours(),
        d.getUTCMinutes(),
      ]);
      expect(f.second).toBeCloseTo(sec, 6);
    }
  });

  it('every leap second of the table reads 23:59:60 and the day count holds through it', () => {
    const f = createUtcFields();
    for (let k = 1; k < LEAP_SECONDS.length; k++) {
      const e = LEAP_SECONDS[k]!;
      const midnight = taiFromUtc(...ymd(e.day), 0, 0, 0);
      utcFromTai(f, midnight - 0.5);
      expect([f.hour, f.minute, f.second]).toEqual([23, 59, 60.5]);
      expect(utcDayCountFromTai(midnight - 0.5)).toBe(utcDayCountFromTai(midnight));
      expect(utcDayCountFromTai(midnight - 1.5)).toBe(utcDayCountFromTai(midnight) - 0.5); // 23:59:59.5
    }
  });
});

function ymd(day: number): [number, number, number] {
  const c = civilFromDayNumber({ year: 0, month: 0, day: 0 }, day);
  return [c.year, c.month, c.day];
}

describe('utcLabel', () => {
  it('counts elapsed SI seconds across the 2016 leap second (task brief example)', () => {
    expect(utcLabel('2016-12-31T23:59:50Z', 10, 3)).toBe('2016-12-31T23:59:60.000');
    expect(utcLabel('2016-12-31T23:59:50Z', 11, 3)).toBe('2017-01-01T00:00:00.000');
    expect(utcLabel('2016-12-31T23:59:50Z', 9.9996, 3)).toBe('2016-12-31T23:59:60.000');
    expect(utcLabel('2016-12-31T23:59:50Z', 10.9996, 3)).toBe('2017-01-01T00:00:00.000');
    expect(utcLabel('2016-12-31T23:59:50Z', 10.5, 1)).toBe('2016-12-31T23:59:60.5');
    expect(utcLabel('2016-12-31T23:59:60.250Z', 0, 2)).toBe('2016-12-31T23:59:60.25');
  });

  it('never reads :60 on an ordinary day; rounding carries into the next day', () => {
    expect(utcLabel('2017-12-31T23:59:50Z', 9.9996, 3)).toBe('2018-01-01T00:00:00.000');
    expect(utcLabel('2017-12-31T23:59:50Z', 9.9994, 3)).toBe('2017-12-31T23:59:59.999');
    expect(utcLabel('2024-02-28T23:59:59.5Z', 1, 1)).toBe('2024-02-29T00:00:00.5');
    expect(utcLabel('2030-03-13T08:00:00Z', 3600.25, 0)).toBe('2030-03-13T09:00:00');
  });

  it('labels parse back to the same instant (round trip over random instants, 1 µs)', () => {
    const rng = makeRng(13, 0);
    for (let k = 0; k < 1000; k++) {
      const tai = taiFromUtc(1972, 1, 1, 0, 0, 0) + rng.next() * 2.1e9;
      const label = utcLabelFromTai(tai, 6);
      const back = parseUtcIso(label + 'Z');
      expect(back.ok).toBe(true);
      if (back.ok) expect(Math.abs(back.value.taiS - tai)).toBeLessThan(1.0e-6);
    }
  });

  it('rejects a bad digit count', () => {
    expect(() => utcLabel('2030-03-13T08:00:00Z', 0, 7)).toThrow(/fractionDigits/);
  });
});

describe('parseUtcIso', () => {
  const rules = (s: string) => {
    const r = parseUtcIso(s);
    return r.ok ? [] : r.errors.map((e) => e.rule);
  };
  it('accepts calendar and day-of-year forms, with or without Z', () => {
    const a = parseUtcIso('2030-03-13T08:00:00.125Z');
    const b = parseUtcIso('2030-072T08:00:00.125');
    expect(a.ok && b.ok).toBe(true);
    if (a.ok && b.ok) {
      expect(a.value.taiS).toBe(b.value.taiS);
      expect(a.value.iso).toBe('2030-03-13T08:00:00.125Z');
      expect(b.value.iso).toBe('2030-03-13T08:00:00.125Z');
      // Leap-table expiry is a warning, not an error.
      expect(a.warnings.map((w) => w.rule)).toEqual(['leap-table-expired']);
    }
    expect(rules('2024-366T00:00:00Z')).toEqual([]);
  });

  it('rejects dates that do not exist, each with its rule', () => {
    expect(rules('2023-02-29T00:00:00Z')).toEqual(['day']);
    expect(rules('2024-04-31T00:00:00Z')).toEqual(['day']);
    expect(rules('2023-366T00:00:00Z')).toEqual(['day']);
    expect(rules('2024-13-01T00:00:00Z')).toEqual(['month']);
    expect(rules('2024-01-01T24:00:00Z')).toEqual(['hour']);
    expect(rules('2024-01-01T23:60:00Z')).toEqual(['minute']);
    expect(rules('2024-01-01T23:59:61Z')).toEqual(['second']);
    expect(rules('2024-01-01T25:61:00Z')).toEqual(['hour', 'minute']);
    expect(rules('1971-12-31T00:00:00Z')).toEqual(['before-1972']);
    expect(rules('2024-01-01T00:00:00+02:00')).toEqual(['utc-only']);
    expect(rules('2024-01-01 00:00:00')).toEqual(['format']);
    expect(rules('2024-1-01T00:00:00Z')).toEqual(['format']);
  });

  it('accepts :60 only on a leap second', () => {
    expect(rules('2016-12-31T23:59:60Z')).toEqual([]);
    expect(rules('2015-06-30T23:59:60.999Z')).toEqual([]);
    expect(rules('2017-12-31T23:59:60Z')).toEqual(['leap-second']);
    expect(rules('2016-12-31T23:58:60Z')).toEqual(['leap-second']);
    expect(rules('2016-12-30T23:59:60Z')).toEqual(['leap-second']);
  });
});
