/**
 * KVN value rules of CCSDS 504.0-B-2 §6 for the AEM writer and reader: numbers with at most 16
 * significant digits, no NaN/Inf/−0; text values in one case; printable ASCII lines of at most
 * 254 characters; epochs `YYYY-MM-DDThh:mm:ss[.d…d][Z]` or `YYYY-DDDThh:mm:ss[.d…d][Z]` (§6.8.9).
 */

/** Fixed-point with `decimals` digits after the point; zero (and −0) written without a sign. */
export function kvnFixed(x: number, decimals: number): string {
  const s = x.toFixed(decimals);
  return Number(s) === 0 ? (0).toFixed(decimals) : s;
}

/**
 * `sig` significant digits, fixed form for moderate magnitudes and `d.ddd…E±n` otherwise;
 * zero (and −0, and anything that rounds to it) as "0.0".
 */
export function kvnSignificant(x: number, sig: number): string {
  if (x === 0) return '0.0';
  let s = x.toPrecision(sig);
  if (Number(s) === 0) return '0.0';
  const e = s.indexOf('e');
  if (e >= 0) {
    const mant = s.slice(0, e);
    const exp = s.slice(e + 1);
    s = `${mant}E${exp[0] === '-' ? '-' : '+'}${exp.replace(/^[+-]/, '').padStart(2, '0')}`;
  }
  return s;
}

const KVN_NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[Ee][+-]?\d+)?$/;

/** Count of significant digits in a KVN number's mantissa. */
export function significantDigits(s: string): number {
  const mant = s.replace(/^[+-]/, '').split(/[Ee]/)[0]!.replace('.', '');
  const trimmed = mant.replace(/^0+/, '');
  return trimmed === '' ? 1 : trimmed.length;
}

/** Parse a KVN number; `reason` says why it is not one. */
export function parseKvnNumber(s: string): { value: number } | { reason: string } {
  if (!KVN_NUMBER.test(s)) return { reason: `"${s}" is not a number` };
  if (significantDigits(s) > 16) return { reason: `"${s}" has more than 16 significant digits` };
  const v = Number(s);
  if (!Number.isFinite(v)) return { reason: `"${s}" is out of range` };
  if (v === 0 && s.startsWith('-')) return { reason: `"${s}" is a negative zero, which KVN does not allow` };
  return { value: v };
}

/** Printable ASCII (0x20–0x7E). */
export function isPrintableAscii(s: string): boolean {
  return /^[\x20-\x7e]*$/.test(s);
}

/** A text value the writer may emit: printable ASCII, one case (§6: all upper or all lower). */
export function isKvnText(s: string): boolean {
  return s.length > 0 && /^[A-Za-z0-9_\-.:+/ ]+$/.test(s) && (s === s.toUpperCase() || s === s.toLowerCase());
}

/** Upper-case a free name into a KVN text value: other characters become `_`. */
export function toKvnText(s: string): string {
  const t = s
    .toUpperCase()
    .replace(/[^A-Z0-9_\-.]+/g, '_')
    .replace(/^_+|_+$/g, '');
  return t === '' ? 'UNNAMED' : t;
}

export interface AemEpoch {
  /** Days since 1970-01-01. */
  day: number;
  /** Seconds of that day, 0 ≤ sod < 86401 (a UTC leap second reads 86400.x). */
  sod: number;
  /** POSIX seconds (a leap second overlaps the next second's start). */
  unixS: number;
}

const CAL = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(\.\d+)?Z?$/;
const DOY = /^(\d{4})-(\d{3})T(\d{2}):(\d{2}):(\d{2})(\.\d+)?Z?$/;

function isLeap(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

/** Parse an AEM epoch; seconds = 60 only with `allowLeapSecond` (UTC) and only at 23:59. */
export function parseAemEpoch(s: string, allowLeapSecond: boolean): AemEpoch | null {
  let year: number, month: number, day: number, hh: number, mm: number, ss: number, frac: string | undefined;
  let m = CAL.exec(s);
  if (m) {
    year = Number(m[1]);
    month = Number(m[2]);
    day = Number(m[3]);
    hh = Number(m[4]);
    mm = Number(m[5]);
    ss = Number(m[6]);
    frac = m[7];
    const dim = [31, isLeap(year) ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
    if (month < 1 || month > 12 || day < 1 || day > dim[month - 1]!) return null;
  } else {
    m = DOY.exec(s);
    if (!m) return null;
    year = Number(m[1]);
    const doy = Number(m[2]);
    if (doy < 1 || doy > (isLeap(year) ? 366 : 365)) return null;
    hh = Number(m[3]);
    mm = Number(m[4]);
    ss = Number(m[5]);
    frac = m[6];
    month = 1;
    day = doy;
  }
  if (hh > 23 || mm > 59 || ss > 60) return null;
  if (ss === 60 && !(allowLeapSecond && hh === 23 && mm === 59)) return null;
  if (frac && frac.length - 1 > 16) return null;
  // setUTCFullYear, unlike Date.UTC, does not map years 0–99 to 1900–1999; day-of-year rolls over.
  const d = new Date(0);
  d.setUTCFullYear(year, month - 1, day);
  const dayNumber = Math.round(d.setUTCHours(0, 0, 0, 0) / 86400000);
  const sod = hh * 3600 + mm * 60 + ss + (frac ? Number(frac) : 0);
  return { day: dayNumber, sod, unixS: dayNumber * 86400 + sod };
}

/** Strict order of two epochs (−1, 0, 1). */
export function compareEpochs(a: AemEpoch, b: AemEpoch): number {
  if (a.day !== b.day) return a.day < b.day ? -1 : 1;
  return a.sod < b.sod ? -1 : a.sod > b.sod ? 1 : 0;
}
