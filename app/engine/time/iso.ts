/**
 * ISO 8601 UTC epochs: parsing with validation, and time labels that count leap seconds.
 *
 * Accepted forms (UTC only; the trailing `Z` is optional, as CCSDS 502/504 time strings allow):
 *   YYYY-MM-DDThh:mm:ss[.f…]Z      calendar date
 *   YYYY-DDDThh:mm:ss[.f…]Z        day-of-year date
 * with 1–9 fractional digits. Rejected, each as its own issue: other layouts, offsets other than
 * Z, months/days that do not exist (2023-02-29, 2024-04-31, day 366 of a common year), hour ≥ 24,
 * minute ≥ 60, second ≥ 60 except 23:59:60 on a day that ends with a leap second, and dates
 * before 1972 (no integer TAI − UTC). Dates after the leap-second table's validity
 * (leapSeconds.ts) parse with a warning.
 */
import { EngineInputError, fail, issue, ok, type Issue, type Result } from '../errors';
import { dayNumber, daysInMonth, daysInYear, civilFromDayNumber, type CivilDate } from './calendar';
import { LEAP_TABLE_FIRST_DAY, LEAP_TABLE_VALID_UNTIL_DAY, LEAP_TABLE_VALID_UNTIL_UTC, leapSecondsAtEndOfDay } from './leapSeconds';
import { createUtcFields, taiFromUtc, utcFromTai, type UtcFields } from './scales';

export interface UtcEpoch extends UtcFields {
  /** The epoch written back in the calendar form, with the fractional digits given and a `Z`. */
  iso: string;
  /** TAI seconds since 2000-01-01T12:00:00 TAI (scales.ts). */
  taiS: number;
}

const CALENDAR = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(?:\.(\d{1,9}))?(Z?)$/;
const ORDINAL = /^(\d{4})-(\d{3})T(\d{2}):(\d{2}):(\d{2})(?:\.(\d{1,9}))?(Z?)$/;
const OFFSET = /[+-]\d{2}:?\d{2}$/;

/** Parse and validate an ISO 8601 UTC epoch; every problem is reported. */
export function parseUtcIso(text: unknown, path = 'epoch'): Result<UtcEpoch> {
  if (typeof text !== 'string') return fail([issue(path, 'type', `${path} must be an ISO 8601 UTC string`)]);
  const s = text.trim();
  let year: number, month: number, day: number, rest: string[];
  const c = CALENDAR.exec(s);
  const o = c ? null : ORDINAL.exec(s);
  const errors: Issue[] = [];
  if (c) {
    year = Number(c[1]);
    month = Number(c[2]);
    day = Number(c[3]);
    rest = c.slice(4);
    if (month < 1 || month > 12) errors.push(issue(path, 'month', `${path}: month ${c[2]} does not exist (01–12)`));
    else if (day < 1 || day > daysInMonth(year, month))
      errors.push(issue(path, 'day', `${path}: ${c[1]}-${c[2]} has no day ${c[3]} (1–${daysInMonth(year, month)})`));
  } else if (o) {
    year = Number(o[1]);
    const doy = Number(o[2]);
    rest = o.slice(3);
    if (doy < 1 || doy > daysInYear(year)) {
      errors.push(issue(path, 'day', `${path}: ${o[1]} has no day-of-year ${o[2]} (001–${daysInYear(year)})`));
      month = day = 1;
    } else {
      const cd: CivilDate = civilFromDayNumber({ year: 0, month: 0, day: 0 }, dayNumber(year, 1, 1) + doy - 1);
      month = cd.month;
      day = cd.day;
    }
  } else {
    const why = OFFSET.test(s)
      ? issue(path, 'utc-only', `${path}: only UTC is accepted (end with Z or nothing), got the offset in ${JSON.stringify(s)}`)
      : issue(path, 'format', `${path} must look like 2030-03-13T08:00:00Z or 2030-072T08:00:00.000Z (got ${JSON.stringify(s)})`);
    return fail([why]);
  }
  const [hh, mm, ss, frac] = rest as [string, string, string, string | undefined];
  const hour = Number(hh),
    minute = Number(mm),
    secInt = Number(ss);
  if (hour > 23) errors.push(issue(path, 'hour', `${path}: hour ${hh} does not exist (00–23)`));
  if (minute > 59) errors.push(issue(path, 'minute', `${path}: minute ${mm} does not exist (00–59)`));
  const d = dayNumber(year, month, day);
  if (secInt === 60) {
    if (hour !== 23 || minute !== 59 || leapSecondsAtEndOfDay(d) <= 0)
      errors.push(
        issue(path, 'leap-second', `${path}: second 60 exists only at 23:59:60 UTC on a day that ends with a leap second (leapSeconds.ts)`),
      );
  } else if (secInt > 60) errors.push(issue(path, 'second', `${path}: second ${ss} does not exist (00–59, or 60 on a leap second)`));
  if (d < LEAP_TABLE_FIRST_DAY)
    errors.push(
      issue(path, 'before-1972', `${path}: dates before 1972-01-01 are outside the leap-second table (UTC had no integer offset)`),
    );
  if (errors.length) return fail(errors);
  const warnings: Issue[] = [];
  if (d >= LEAP_TABLE_VALID_UNTIL_DAY)
    warnings.push(
      issue(
        path,
        'leap-table-expired',
        `${path}: ${s} is after ${LEAP_TABLE_VALID_UNTIL_UTC}, the end of the leap-second table's validity; TAI − UTC = 37 s is assumed (check the latest IERS Bulletin C)`,
      ),
    );
  const second = secInt + (frac ? Number(`0.${frac}`) : 0);
  const taiS = taiFromUtc(year, month, day, hour, minute, second);
  const iso = `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}T${hh}:${mm}:${ss}${frac ? '.' + frac : ''}Z`;
  return ok({ year, month, day, hour, minute, second, iso, taiS }, warnings);
}

function pad(n: number, w: number): string {
  return String(n).padStart(w, '0');
}

const scratchFields = createUtcFields();

/**
 * UTC label of a TAI instant, `YYYY-MM-DDThh:mm:ss.fff` (no zone letter), rounded to
 * `fractionDigits` (0–6) digits. Rounding is done on the instant, so a label never reads
 * 23:59:60 on a day without a leap second and an inserted second reads 23:59:60.xxx.
 */
export function utcLabelFromTai(taiS: number, fractionDigits: number): string {
  if (!Number.isInteger(fractionDigits) || fractionDigits < 0 || fractionDigits > 6)
    throw new EngineInputError([issue('fractionDigits', 'range', `fractionDigits must be an integer 0–6 (got ${fractionDigits})`)]);
  const scale = 10 ** fractionDigits;
  let whole = Math.floor(taiS);
  let units = Math.round((taiS - whole) * scale);
  if (units >= scale) {
    whole += 1;
    units = 0;
  }
  // TAI − UTC is an integer since 1972, so an integer TAI second is an integer UTC second.
  const f = utcFromTai(scratchFields, whole);
  if (!Number.isFinite(f.year)) return 'before-1972';
  const sec = Math.round(f.second);
  const head = `${pad(f.year, 4)}-${pad(f.month, 2)}-${pad(f.day, 2)}T${pad(f.hour, 2)}:${pad(f.minute, 2)}:${pad(sec, 2)}`;
  return fractionDigits > 0 ? `${head}.${pad(units, fractionDigits)}` : head;
}

/**
 * The UTC label of plan time t (elapsed SI seconds, leap seconds counted) from a UTC epoch:
 * utcLabel('2016-12-31T23:59:50Z', 10, 3) = '2016-12-31T23:59:60.000'. A bad epoch or digit
 * count is a programming error here (validate epochs with `parseUtcIso` at the edge): it
 * throws EngineInputError listing the problems.
 */
export function utcLabel(epochUtcIso: string, tSeconds: number, fractionDigits: number): string {
  const r = parseUtcIso(epochUtcIso);
  if (!r.ok) throw new EngineInputError(r.errors);
  return utcLabelFromTai(r.value.taiS + tSeconds, fractionDigits);
}
