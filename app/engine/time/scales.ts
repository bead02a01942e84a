/**
 * Time scales: UTC ↔ TAI ↔ TT, and the UT1 approximation.
 *
 * THE TIME CONVENTIONS of the orbit library:
 * - An instant is `taiS`: SI seconds of TAI since 2000-01-01T12:00:00 TAI. It is uniform (no
 *   leap seconds), so elapsed time is a plain difference, and TT = TAI + 32.184 s exactly
 *   (IAU 1991 Resolution A4), so TT seconds since J2000.0 (2000-01-01T12:00:00 TT) = taiS + 32.184.
 * - Plan time t (s) counts elapsed SI seconds from the plan's UTC epoch: taiS = epochTaiS + t.
 *   Labels therefore step through 23:59:60 during a leap second (see `utcLabelFromTai`).
 * - The UTC DAY COUNT `u` is seconds since 2000-01-01T12:00:00 UTC with every day 86 400 s long
 *   (as POSIX time and Julian dates of UTC count): u = taiS − (TAI − UTC). During an inserted
 *   leap second u is held at the following 0 h (the day count has no room for 23:59:60).
 * - UT1 IS TAKEN AS UTC: UT1 ≈ u. UTC is kept within |UT1 − UTC| < 0.9 s (ITU-R TF.460), so
 *   this is the error bound of every Earth-rotation quantity (inside an inserted leap second, where
 *   u is held, the error stays below 1 s): Greenwich sidereal time (GMST,
 *   satellite.js gstime) and therefore Earth-fixed ↔ inertial conversions (ground-site
 *   positions in EME2000 and Earth-fixed spacecraft positions err by ≤ 0.9 s of Earth rotation,
 *   ≤ 0.42 km at the equator, i.e. up to about 0.02° in azimuth/elevation of a spacecraft 1000 km
 *   away, and visibility-window edges shift by well under a second for LEO). Sun, Moon and
 *   precession–nutation use TT and are unaffected. SGP4's time argument is elapsed time, taken
 *   here as elapsed SI seconds from the element epoch (see orbit/propagate.ts).
 */
import { civilFromDayNumber, dayNumber, type CivilDate } from './calendar';
import { LEAP_SECONDS } from './leapSeconds';

/** TT − TAI in seconds (exact by definition). */
export const TT_MINUS_TAI_S = 32.184;
/** Julian date of 2000-01-01T12:00:00 (in whatever scale the date is read). */
export const JD_J2000 = 2451545.0;
const DAY_S = 86400;
const HALF_DAY_S = 43200;

// Per table entry: u and taiS at which the entry's value starts (0 h UTC of its date).
const N = LEAP_SECONDS.length;
const DAT = new Float64Array(N);
const TAI_START = new Float64Array(N);
for (let k = 0; k < N; k++) {
  const e = LEAP_SECONDS[k]!;
  DAT[k] = e.taiMinusUtcS;
  TAI_START[k] = e.day * DAY_S - HALF_DAY_S + e.taiMinusUtcS;
}

/** Index of the table entry in effect at TAI instant taiS; −1 before 1972. */
function entryAtTai(taiS: number): number {
  for (let k = N - 1; k >= 0; k--) if (taiS >= TAI_START[k]!) return k;
  return -1;
}

/** TAI − UTC (s) at TAI instant taiS (NaN before 1972). During a leap second: the old value. */
export function taiMinusUtcAtTai(taiS: number): number {
  const k = entryAtTai(taiS);
  return k < 0 ? NaN : DAT[k]!;
}

/**
 * TAI instant of a UTC calendar reading. `second` may be in [60, 61) only on a day that ends
 * with a leap second (the caller validates; `parseUtcIso` does). NaN before 1972.
 */
export function taiFromUtc(year: number, month: number, day: number, hour: number, minute: number, second: number): number {
  const d = dayNumber(year, month, day);
  const u = d * DAY_S - HALF_DAY_S + hour * 3600 + minute * 60 + second;
  // The offset in effect during that calendar day (a 23:59:60 reading still has the old value).
  let dat = NaN;
  for (let k = N - 1; k >= 0; k--)
    if (d >= LEAP_SECONDS[k]!.day) {
      dat = DAT[k]!;
      break;
    }
  return u + dat;
}

export interface UtcFields extends CivilDate {
  hour: number;
  minute: number;
  /** Seconds of the minute, in [0, 60), or [60, 61) during an inserted leap second. */
  second: number;
}

export function createUtcFields(): UtcFields {
  return { year: 0, month: 0, day: 0, hour: 0, minute: 0, second: 0 };
}

/** UTC calendar reading of a TAI instant, into `out`. Fields are NaN before 1972. */
export function utcFromTai(out: UtcFields, taiS: number): UtcFields {
  const k = entryAtTai(taiS);
  if (k < 0) {
    out.year = out.month = out.day = out.hour = out.minute = out.second = NaN;
    return out;
  }
  if (k + 1 < N) {
    const step = DAT[k + 1]! - DAT[k]!;
    const leapStart = TAI_START[k + 1]! - step;
    if (step > 0 && taiS >= leapStart) {
      // Inside the inserted second(s): 23:59:60.f of the day before the next entry.
      civilFromDayNumber(out, LEAP_SECONDS[k + 1]!.day - 1);
      out.hour = 23;
      out.minute = 59;
      out.second = 60 + (taiS - leapStart);
      return out;
    }
  }
  const fromMidnight = taiS - DAT[k]! + HALF_DAY_S;
  const d = Math.floor(fromMidnight / DAY_S);
  const sod = fromMidnight - d * DAY_S;
  civilFromDayNumber(out, d);
  out.hour = Math.floor(sod / 3600);
  out.minute = Math.floor((sod - out.hour * 3600) / 60);
  out.second = sod - out.hour * 3600 - out.minute * 60;
  return out;
}

/**
 * UTC day count u (s since 2000-01-01T12:00:00 UTC, 86 400 s per day) of a TAI instant; held
 * at the next 0 h during an inserted leap second. This is the library's UT1 (see the header).
 */
export function utcDayCountFromTai(taiS: number): number {
  const k = entryAtTai(taiS);
  if (k < 0) return NaN;
  if (k + 1 < N) {
    const step = DAT[k + 1]! - DAT[k]!;
    if (step > 0 && taiS >= TAI_START[k + 1]! - step) return TAI_START[k + 1]! - DAT[k + 1]!;
  }
  return taiS - DAT[k]!;
}

/** Julian date of UT1, taken as UTC (see the header), as satellite.js `gstime` expects it. */
export function julianDateUt1FromTai(taiS: number): number {
  return JD_J2000 + utcDayCountFromTai(taiS) / DAY_S;
}

/** TT days since J2000.0, the argument astronomy-engine's `AstroTime.FromTerrestrialTime` takes. */
export function ttDaysFromTai(taiS: number): number {
  return (taiS + TT_MINUS_TAI_S) / DAY_S;
}

/** TT seconds since J2000.0. */
export function ttSecondsFromTai(taiS: number): number {
  return taiS + TT_MINUS_TAI_S;
}
