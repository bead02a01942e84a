/**
 * Proleptic Gregorian calendar arithmetic on integer day numbers.
 *
 * Conventions: a DAY NUMBER counts days from 2000-01-01 (day 0); months are 1–12, days 1–31.
 * The conversions are the era-based (400-year cycle) method of H. Hinnant, "chrono-Compatible
 * Low-Level Date Algorithms" (2013, public domain), rewritten here for a 2000-01-01 origin.
 * Pure integer arithmetic on doubles: exact for any |year| < 10⁶.
 */

/** Days from 0000-03-01 (the era origin of the method) to 2000-01-01. */
const DAYS_0000_03_01_TO_2000_01_01 = 730425;

export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const;

/** Number of days in a month (1–12) of a year; 0 for a month outside 1–12. */
export function daysInMonth(year: number, month: number): number {
  if (!Number.isInteger(month) || month < 1 || month > 12) return 0;
  return month === 2 && isLeapYear(year) ? 29 : MONTH_DAYS[month - 1]!;
}

export function daysInYear(year: number): number {
  return isLeapYear(year) ? 366 : 365;
}

/** Day number (days since 2000-01-01) of a calendar date. The date is not validated. */
export function dayNumber(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yearOfEra = y - era * 400;
  const monthFromMarch = (month + 9) % 12;
  const dayOfYear = Math.floor((153 * monthFromMarch + 2) / 5) + day - 1;
  const dayOfEra = yearOfEra * 365 + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100) + dayOfYear;
  return era * 146097 + dayOfEra - DAYS_0000_03_01_TO_2000_01_01;
}

export interface CivilDate {
  year: number;
  month: number;
  day: number;
}

/** Calendar date of a day number, written into `out` (returned). */
export function civilFromDayNumber(out: CivilDate, n: number): CivilDate {
  const z = Math.floor(n) + DAYS_0000_03_01_TO_2000_01_01;
  const era = Math.floor(z / 146097);
  const dayOfEra = z - era * 146097;
  const yearOfEra = Math.floor(
    (dayOfEra - Math.floor(dayOfEra / 1460) + Math.floor(dayOfEra / 36524) - Math.floor(dayOfEra / 146096)) / 365,
  );
  const dayOfYear = dayOfEra - (365 * yearOfEra + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100));
  const monthFromMarch = Math.floor((5 * dayOfYear + 2) / 153);
  const day = dayOfYear - Math.floor((153 * monthFromMarch + 2) / 5) + 1;
  const month = monthFromMarch < 10 ? monthFromMarch + 3 : monthFromMarch - 9;
  out.year = yearOfEra + era * 400 + (month <= 2 ? 1 : 0);
  out.month = month;
  out.day = day;
  return out;
}
