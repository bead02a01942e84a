/**
 * TAI − UTC (leap seconds) since 1972, from IERS Bulletin C.
 *
 * Each entry says: from 0 h UTC on this date, TAI − UTC = value (s). Every step so far has been
 * a positive leap second inserted as 23:59:60 at the end of the preceding day.
 *
 * Source and validity (checked for this table, not from memory): the entries reflect IERS Bulletin
 * C up to Bulletin C 70 (Paris, July 2025: no leap second at the end of December 2025), as
 * carried by the IANA/NIST `leap-seconds.list` updated 2025-07-07 (tzdata 2025b), which states
 * "File expires on 28 June 2026". The table is therefore VALID UNTIL 2026-06-28 00:00 UTC;
 * later Bulletins (C 71, January 2026 onward) could not be checked here. After that date the
 * last value (37 s) is used and `parseUtcIso` warns. The final entry (2017-01-01, 37 s) is
 * also stated in Bulletin C 52 (6 July 2016).
 *
 * Before 1972 UTC was not an integer offset from TAI (rate offsets and fractional steps); this
 * table does not cover it: lookups before 1972-01-01 return NaN and the epoch parser rejects
 * such dates.
 */
import { dayNumber } from './calendar';

/** [year, month, TAI − UTC in seconds from the 1st of that month, 0 h UTC]. */
const ENTRIES: readonly (readonly [number, number, number])[] = [
  [1972, 1, 10],
  [1972, 7, 11],
  [1973, 1, 12],
  [1974, 1, 13],
  [1975, 1, 14],
  [1976, 1, 15],
  [1977, 1, 16],
  [1978, 1, 17],
  [1979, 1, 18],
  [1980, 1, 19],
  [1981, 7, 20],
  [1982, 7, 21],
  [1983, 7, 22],
  [1985, 7, 23],
  [1988, 1, 24],
  [1990, 1, 25],
  [1991, 1, 26],
  [1992, 7, 27],
  [1993, 7, 28],
  [1994, 7, 29],
  [1996, 1, 30],
  [1997, 7, 31],
  [1999, 1, 32],
  [2006, 1, 33],
  [2009, 1, 34],
  [2012, 7, 35],
  [2015, 7, 36],
  [2017, 1, 37],
];

/** The end of the table's validity (UTC); the table reflects IERS Bulletin C 70 (July 2025). */
export const LEAP_TABLE_VALID_UNTIL_UTC = '2026-06-28T00:00:00Z';
/** Day number (days since 2000-01-01) of LEAP_TABLE_VALID_UNTIL_UTC. */
export const LEAP_TABLE_VALID_UNTIL_DAY = dayNumber(2026, 6, 28);

export interface LeapEntry {
  /** ISO date (YYYY-MM-DD) from whose 0 h UTC the value holds. */
  readonly date: string;
  /** Day number of that date (days since 2000-01-01). */
  readonly day: number;
  /** TAI − UTC in seconds. */
  readonly taiMinusUtcS: number;
}

export const LEAP_SECONDS: readonly LeapEntry[] = ENTRIES.map(([y, m, v]) => ({
  date: `${y}-${String(m).padStart(2, '0')}-01`,
  day: dayNumber(y, m, 1),
  taiMinusUtcS: v,
}));

/** Day number of the table's first entry (1972-01-01). */
export const LEAP_TABLE_FIRST_DAY = LEAP_SECONDS[0]!.day;

/**
 * Seconds inserted at the end of UTC day `day` (1 for a positive leap second, −1 for a
 * negative one, 0 otherwise): the change of TAI − UTC at the next day's 0 h.
 */
export function leapSecondsAtEndOfDay(day: number): number {
  for (let k = 1; k < LEAP_SECONDS.length; k++) {
    const e = LEAP_SECONDS[k]!;
    if (e.day === day + 1) return e.taiMinusUtcS - LEAP_SECONDS[k - 1]!.taiMinusUtcS;
  }
  return 0;
}
