/**
 * UTC epochs: the scenario's ISO 8601 start epoch and the fixed-point epoch strings the exports
 * write (CCSDS 504.0-B-2 §6.8.9 calendar form `YYYY-MM-DDThh:mm:ss.sss`).
 *
 * Leap seconds: the engine counts time as seconds from the scenario epoch and maps it onto the
 * calendar without a leap-second table (POSIX time). A run that spans a leap second is off by one
 * second after it; slews last minutes, so this is stated rather than handled.
 */

const ISO_UTC = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(?:\.(\d{1,3}))?Z$/;

function daysInMonth(year: number, month: number): number {
  // Date.UTC normalises day 0 of the next month to the last day of this one.
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/**
 * Milliseconds since 1970-01-01T00:00:00Z of a strict ISO 8601 UTC string
 * `YYYY-MM-DDThh:mm:ss[.s{1,3}]Z` (trailing Z required, seconds 0–59), or null when the string is
 * not of that form or names an impossible date (2030-02-30).
 */
export function parseIsoUtcMs(s: unknown): number | null {
  if (typeof s !== 'string') return null;
  const m = ISO_UTC.exec(s);
  if (!m) return null;
  const year = Number(m[1]),
    month = Number(m[2]),
    day = Number(m[3]);
  const hh = Number(m[4]),
    mm = Number(m[5]),
    ss = Number(m[6]);
  const ms = m[7] ? Number(m[7].padEnd(3, '0')) : 0;
  if (year < 1 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  if (hh > 23 || mm > 59 || ss > 59) return null;
  const d = new Date(0);
  d.setUTCFullYear(year, month - 1, day);
  d.setUTCHours(hh, mm, ss, ms);
  return d.getTime();
}

/**
 * Calendar epoch string `YYYY-MM-DDThh:mm:ss[.f…]` (no zone letter) of `epochUnixMs + tS`,
 * rounded to `fractionDigits` (0–6) decimal places of a second. The sum is formed in integer
 * units of 10^-fractionDigits s, exact for |t| below ~10^9 s at 6 digits.
 */
export function formatEpoch(epochUnixMs: number, tS: number, fractionDigits: number): string {
  const u = epochUnits(epochUnixMs, tS, fractionDigits);
  return formatEpochUnits(u, fractionDigits);
}

/** Integer count of 10^-fractionDigits s since 1970 for `epochUnixMs + tS`. */
export function epochUnits(epochUnixMs: number, tS: number, fractionDigits: number): number {
  const perS = 10 ** fractionDigits;
  return Math.round((epochUnixMs * perS) / 1000 + tS * perS);
}

export function formatEpochUnits(units: number, fractionDigits: number): string {
  const perS = 10 ** fractionDigits;
  const whole = Math.floor(units / perS);
  const frac = units - whole * perS;
  const base = new Date(whole * 1000).toISOString().slice(0, 19);
  return fractionDigits > 0 ? `${base}.${String(frac).padStart(fractionDigits, '0')}` : base;
}
