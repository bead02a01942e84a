/**
 * Two-line element sets: parse, validate column by column, and initialise SGP4 (satellite.js).
 *
 * Layout (standard NORAD two-line format, as documented with Spacetrack Report #3 and CelesTrak's
 * format notes; columns 1-based, inclusive):
 *   line 1: 1 line number · 3–7 catalogue number · 8 classification (U/C/S) · 10–17 international
 *     designator · 19–20 epoch year · 21–32 epoch day DDD.DDDDDDDD · 34–43 ṅ/2 (rev/day²) ·
 *     45–52 n̈/6 (rev/day³, assumed decimal point and exponent) · 54–61 B* (1/Earth radii, same
 *     form) · 63 ephemeris type · 65–68 element set number · 69 checksum
 *   line 2: 1 line number · 3–7 catalogue number · 9–16 inclination (deg) · 18–25 RAAN (deg) ·
 *     27–33 eccentricity (assumed leading decimal point) · 35–42 argument of perigee (deg) ·
 *     44–51 mean anomaly (deg) · 53–63 mean motion (rev/day) · 64–68 revolution number · 69 checksum
 *   All other columns up to 68 are blanks. Checksum: the sum of the digits of columns 1–68, each
 *   minus sign counting 1, modulo 10. Catalogue numbers may use the Alpha-5 form (a letter other
 *   than I or O, then four digits). Epoch years 57–99 mean 1957–1999, 00–56 mean 2000–2056.
 * An optional title line (line 0) may precede; a leading "0 " is dropped; more than 24 characters
 * draws a warning (the traditional title width).
 *
 * Every problem is an Issue whose path names the line and columns ("tle line 2, columns 27–33")
 * and whose rule names the check (line-length, line-number, blank, format, checksum,
 * catalogue-mismatch, range, epoch, propagator-init, …); all problems are reported together.
 */
import { twoline2satrec } from 'satellite.js';
import { fail, issue, ok, type Issue, type Result } from '../errors';
import { civilFromDayNumber, dayNumber, daysInYear } from '../time/calendar';
import { LEAP_TABLE_FIRST_DAY } from '../time/leapSeconds';
import { utcLabelFromTai } from '../time/iso';
import { taiFromUtc } from '../time/scales';
import { checkMeanOrbit, sgp4ErrorText, type Sgp4Orbit } from './propagate';

export interface TleFields {
  title: string;
  catalogNumber: number;
  classification: string;
  internationalDesignator: string;
  epochYear: number;
  epochDayOfYear: number;
  /** ṅ/2 in rev/day² and n̈/6 in rev/day³, as the format carries them. */
  meanMotionDotHalf: number;
  meanMotionDdotSixth: number;
  /** B* drag term, 1/Earth radii. */
  bstar: number;
  ephemerisType: number;
  elementSetNumber: number;
  inclinationDeg: number;
  raanDeg: number;
  eccentricity: number;
  argPerigeeDeg: number;
  meanAnomalyDeg: number;
  meanMotionRevPerDay: number;
  revolutionNumber: number;
}

type Kind = 'blank' | 'digits' | 'catalogue' | 'class' | 'designator' | 'angle' | 'epochDay' | 'ndot' | 'expo' | 'ecc' | 'mm' | 'int';
interface Col {
  from: number;
  to: number;
  kind: Kind;
  name: string;
  key?: keyof TleFields;
}

const FORMAT: Record<Kind, [RegExp, string]> = {
  blank: [/^ $/, 'a blank'],
  digits: [/^\d+$/, 'digits'],
  catalogue: [/^(\d{5}|[A-HJ-NP-Z]\d{4})$/, 'five digits or an Alpha-5 number (letter other than I/O, four digits)'],
  class: [/^[UCS]$/, 'U, C or S'],
  designator: [/^(\d{5}[A-Z ]{3}| {8})$/, 'YYNNNPPP (launch year, launch number, piece) or blanks'],
  angle: [/^[ \d]{2}\d\.\d{4}$/, 'an angle written DDD.DDDD'],
  epochDay: [/^[ \d]{2}\d\.\d{8}$/, 'a day of year written DDD.DDDDDDDD'],
  ndot: [/^[ +-]\.\d{8}$/, 'a signed decimal written ±.NNNNNNNN'],
  expo: [/^[ +-]\d{5}[+-]\d$/, 'a signed mantissa and exponent written ±NNNNN±N (assumed decimal point)'],
  ecc: [/^\d{7}$/, 'seven digits (assumed leading decimal point)'],
  mm: [/^[ \d]\d\.\d{8}$/, 'a mean motion written NN.NNNNNNNN'],
  int: [/^ *\d+$/, 'a right-aligned integer'],
};

const LINE1: Col[] = [
  { from: 2, to: 2, kind: 'blank', name: 'separator' },
  { from: 3, to: 7, kind: 'catalogue', name: 'catalogue number', key: 'catalogNumber' },
  { from: 8, to: 8, kind: 'class', name: 'classification', key: 'classification' },
  { from: 9, to: 9, kind: 'blank', name: 'separator' },
  { from: 10, to: 17, kind: 'designator', name: 'international designator', key: 'internationalDesignator' },
  { from: 18, to: 18, kind: 'blank', name: 'separator' },
  { from: 19, to: 20, kind: 'digits', name: 'epoch year', key: 'epochYear' },
  { from: 21, to: 32, kind: 'epochDay', name: 'epoch day', key: 'epochDayOfYear' },
  { from: 33, to: 33, kind: 'blank', name: 'separator' },
  { from: 34, to: 43, kind: 'ndot', name: 'first derivative of mean motion', key: 'meanMotionDotHalf' },
  { from: 44, to: 44, kind: 'blank', name: 'separator' },
  { from: 45, to: 52, kind: 'expo', name: 'second derivative of mean motion', key: 'meanMotionDdotSixth' },
  { from: 53, to: 53, kind: 'blank', name: 'separator' },
  { from: 54, to: 61, kind: 'expo', name: 'B* drag term', key: 'bstar' },
  { from: 62, to: 62, kind: 'blank', name: 'separator' },
  { from: 63, to: 63, kind: 'digits', name: 'ephemeris type', key: 'ephemerisType' },
  { from: 64, to: 64, kind: 'blank', name: 'separator' },
  { from: 65, to: 68, kind: 'int', name: 'element set number', key: 'elementSetNumber' },
];

const LINE2: Col[] = [
  { from: 2, to: 2, kind: 'blank', name: 'separator' },
  { from: 3, to: 7, kind: 'catalogue', name: 'catalogue number' },
  { from: 8, to: 8, kind: 'blank', name: 'separator' },
  { from: 9, to: 16, kind: 'angle', name: 'inclination', key: 'inclinationDeg' },
  { from: 17, to: 17, kind: 'blank', name: 'separator' },
  { from: 18, to: 25, kind: 'angle', name: 'right ascension of the ascending node', key: 'raanDeg' },
  { from: 26, to: 26, kind: 'blank', name: 'separator' },
  { from: 27, to: 33, kind: 'ecc', name: 'eccentricity', key: 'eccentricity' },
  { from: 34, to: 34, kind: 'blank', name: 'separator' },
  { from: 35, to: 42, kind: 'angle', name: 'argument of perigee', key: 'argPerigeeDeg' },
  { from: 43, to: 43, kind: 'blank', name: 'separator' },
  { from: 44, to: 51, kind: 'angle', name: 'mean anomaly', key: 'meanAnomalyDeg' },
  { from: 52, to: 52, kind: 'blank', name: 'separator' },
  { from: 53, to: 63, kind: 'mm', name: 'mean motion', key: 'meanMotionRevPerDay' },
  { from: 64, to: 68, kind: 'int', name: 'revolution number', key: 'revolutionNumber' },
];

/** "columns 27–33" or "column 69". */
function where(prefix: string, line: number, from: number, to: number): string {
  return `${prefix} line ${line}, ${from === to ? `column ${from}` : `columns ${from}–${to}`}`;
}

/** The modulo-10 checksum of columns 1–68: digits count their value, '-' counts 1. */
export function tleChecksum(line: string): number {
  let sum = 0;
  for (let i = 0; i < 68 && i < line.length; i++) {
    const ch = line.charCodeAt(i);
    if (ch >= 48 && ch <= 57) sum += ch - 48;
    else if (ch === 45) sum += 1;
  }
  return sum % 10;
}

function alpha5(s: string): number {
  const c = s.charCodeAt(0);
  if (c >= 48 && c <= 57) return Number(s);
  // A=10 … H=17, J=18 … N=22, P=23 … Z=33 (I and O are skipped).
  let v = c - 65 + 10;
  if (c > 73) v -= 1;
  if (c > 79) v -= 1;
  return v * 10000 + Number(s.slice(1));
}

function value(kind: Kind, text: string): number | string {
  switch (kind) {
    case 'catalogue':
      return alpha5(text);
    case 'class':
    case 'designator':
      return text.trim();
    case 'ecc':
      return Number(`0.${text}`);
    case 'ndot':
      return Number(text.replace(' ', ''));
    case 'expo':
      return Number(`${text[0] === '-' ? '-' : ''}0.${text.slice(1, 6)}e${text.slice(6)}`);
    default:
      return Number(text);
  }
}

/** Check one line's columns; fills `fields`, pushes issues. Returns false if the line is unusable. */
function checkLine(line: string, n: 1 | 2, cols: Col[], prefix: string, fields: Partial<TleFields>, errors: Issue[]): boolean {
  if (line.length !== 69) {
    errors.push(issue(`${prefix} line ${n}`, 'line-length', `line ${n}: must be 69 characters (got ${line.length})`));
    if (line.length < 69) return false;
  }
  if (line[0] !== String(n))
    errors.push(issue(where(prefix, n, 1, 1), 'line-number', `line ${n}, column 1: must be "${n}" (got "${line[0]}")`));
  for (const c of cols) {
    const text = line.slice(c.from - 1, c.to);
    const [re, what] = FORMAT[c.kind];
    const loc = where('', n, c.from, c.to).trim();
    if (!re.test(text)) {
      const rule = c.kind === 'blank' ? 'blank' : 'format';
      errors.push(issue(where(prefix, n, c.from, c.to), rule, `${loc}: ${c.name} must be ${what} (got ${JSON.stringify(text)})`));
    } else if (c.key) (fields as Record<string, unknown>)[c.key] = value(c.kind, text);
  }
  const want = tleChecksum(line);
  const got = line[68];
  if (got !== String(want))
    errors.push(
      issue(
        where(prefix, n, 69, 69),
        'checksum',
        `line ${n}, column 69: checksum must be ${want} (sum of columns 1–68 mod 10), got "${got}"`,
      ),
    );
  return true;
}

function rangeChecks(f: Partial<TleFields>, prefix: string, errors: Issue[], warnings: Issue[]): void {
  const range = (key: keyof TleFields, col: [number, number], lo: number, hi: number, hiOpen: boolean, name: string) => {
    const v = f[key] as number | undefined;
    if (v === undefined) return;
    if (v < lo || (hiOpen ? v >= hi : v > hi))
      errors.push(
        issue(
          where(prefix, 2, col[0], col[1]),
          'range',
          `line 2, columns ${col[0]}–${col[1]}: ${name} ${v}° is outside [${lo}, ${hi}${hiOpen ? ')' : ']'}`,
        ),
      );
  };
  range('inclinationDeg', [9, 16], 0, 180, false, 'inclination');
  range('raanDeg', [18, 25], 0, 360, true, 'right ascension of the ascending node');
  range('argPerigeeDeg', [35, 42], 0, 360, true, 'argument of perigee');
  range('meanAnomalyDeg', [44, 51], 0, 360, true, 'mean anomaly');
  if (f.ephemerisType !== undefined && f.ephemerisType !== 0)
    warnings.push(
      issue(where(prefix, 1, 63, 63), 'ephemeris-type', `line 1, column 63: ephemeris type ${f.ephemerisType}; SGP4 element sets carry 0`),
    );
  if (f.meanMotionRevPerDay !== undefined && f.eccentricity !== undefined)
    checkMeanOrbit(
      f.meanMotionRevPerDay,
      f.eccentricity,
      { eccentricity: where(prefix, 2, 27, 33), meanMotion: where(prefix, 2, 53, 63), perigee: where(prefix, 2, 27, 63) },
      errors,
      warnings,
    );
}

/** Parse and validate the text of a TLE (two lines, or three with a title); no SGP4 yet. */
export function parseTle(text: string, prefix = 'tle'): Result<TleFields & { line1: string; line2: string }> {
  const lines = text
    .split(/\r?\n/)
    .map((l) => l.replace(/\s+$/, ''))
    .filter((l) => l.length > 0);
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  let title = '';
  if (lines.length === 3) title = lines.shift()!.replace(/^0 /, '').trim();
  if (lines.length !== 2)
    return fail([
      issue(
        prefix,
        'line-count',
        `a TLE is two lines, optionally preceded by a title line (got ${lines.length + (title ? 1 : 0)} non-empty lines)`,
      ),
    ]);
  if (title.length > 24)
    warnings.push(
      issue(`${prefix} line 0`, 'title-length', `line 0: the title has ${title.length} characters; 24 is the traditional width`),
    );
  const [l1, l2] = lines as [string, string];
  const f: Partial<TleFields> = { title };
  const ok1 = checkLine(l1, 1, LINE1, prefix, f, errors);
  const f2: Partial<TleFields> = {};
  const ok2 = checkLine(l2, 2, LINE2, prefix, f2, errors);
  Object.assign(f, f2);
  if (ok1 && ok2) {
    const c1 = l1.slice(2, 7),
      c2 = l2.slice(2, 7);
    if (c1 !== c2)
      errors.push(
        issue(where(prefix, 2, 3, 7), 'catalogue-mismatch', `line 2, columns 3–7: catalogue number "${c2}" differs from line 1's "${c1}"`),
      );
  }
  if (f.epochYear !== undefined) f.epochYear = f.epochYear < 57 ? 2000 + f.epochYear : 1900 + f.epochYear;
  if (f.epochYear !== undefined && f.epochDayOfYear !== undefined) {
    if (f.epochDayOfYear < 1 || f.epochDayOfYear >= daysInYear(f.epochYear) + 1)
      errors.push(issue(where(prefix, 1, 21, 32), 'epoch', `line 1, columns 21–32: ${f.epochYear} has no day ${f.epochDayOfYear}`));
    else if (dayNumber(f.epochYear, 1, 1) + Math.floor(f.epochDayOfYear) - 1 < LEAP_TABLE_FIRST_DAY)
      errors.push(
        issue(where(prefix, 1, 19, 32), 'before-1972', `line 1, columns 19–32: epochs before 1972 are outside the leap-second table`),
      );
  }
  rangeChecks(f, prefix, errors, warnings);
  if (errors.length) return fail(errors, warnings);
  return ok({ ...(f as TleFields), line1: l1, line2: l2 }, warnings);
}

/** TAI instant (time/scales.ts) of a TLE epoch: year and day-of-year with fraction, UTC. */
export function tleEpochTai(year: number, dayOfYear: number): number {
  const whole = Math.floor(dayOfYear);
  const c = civilFromDayNumber({ year: 0, month: 0, day: 0 }, dayNumber(year, 1, 1) + whole - 1);
  return taiFromUtc(c.year, c.month, c.day, 0, 0, (dayOfYear - whole) * 86400);
}

/** Parse, validate and initialise SGP4 from a TLE; SGP4 initialisation errors become issues. */
export function orbitFromTle(text: string, prefix = 'tle'): Result<Sgp4Orbit & { fields: TleFields }> {
  const p = parseTle(text, prefix);
  if (!p.ok) return p;
  const f = p.value;
  const satrec = twoline2satrec(f.line1, f.line2);
  if (satrec.error !== 0)
    return fail([issue(prefix, 'propagator-init', `SGP4 initialisation failed: ${sgp4ErrorText(satrec.error)}`)], p.warnings);
  const epochTaiS = tleEpochTai(f.epochYear, f.epochDayOfYear);
  const name = f.title || `catalogue ${String(f.catalogNumber).padStart(5, '0')}`;
  return ok({ name, origin: 'tle', satrec, epochTaiS, epochUtcIso: utcLabelFromTai(epochTaiS, 6) + 'Z', fields: f }, p.warnings);
}
