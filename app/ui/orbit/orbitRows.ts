/**
 * Pure helpers of the app's orbit views: the rows of the passes-and-windows table (UTC labels from
 * the engine's leap-second-aware clock, pipeline/orbit.ts orbitUtcLabel), the ground track cut at
 * the antimeridian, and the TLE text of the editor as the scenario's list of lines.
 */
import type { OrbitOutput, WindowError } from '../../engine/pipeline/orbit';
import { orbitUtcLabel } from '../../engine/pipeline/orbit';
import { DEG_PER_RAD } from '../../engine/units';

/** `YYYY-MM-DD hh:mm:ss` UTC of plan time t (s from the scenario epoch). */
export function utcText(epochTaiS: number, t: number): string {
  return orbitUtcLabel(epochTaiS, t, 0).replace('T', ' ');
}

/**
 * Short UTC text for narrow tables: `hh:mm:ss` on the scenario epoch's UTC date, `MM-DD hh:mm:ss`
 * on any other date (the full label is in utcText).
 */
export function shortUtcText(epochTaiS: number, t: number): string {
  const full = utcText(epochTaiS, t);
  const day0 = utcText(epochTaiS, 0).slice(0, 10);
  return full.slice(0, 10) === day0 ? full.slice(11) : full.slice(5);
}

/** `hh:mm:ss` of a duration in seconds (rounded to the second). */
export function durationText(s: number): string {
  const whole = Math.round(s);
  const h = Math.floor(whole / 3600),
    m = Math.floor((whole % 3600) / 60),
    sec = whole % 60;
  const two = (n: number) => String(n).padStart(2, '0');
  return `${two(h)}:${two(m)}:${two(sec)}`;
}

export interface PassRow {
  siteId: string;
  siteLabel: string;
  start: string;
  end: string;
  /** Start and end in shortUtcText form. */
  startShort: string;
  endShort: string;
  duration: string;
  /** Peak elevation, degrees, two decimals. */
  maxElevation: string;
  /** "starts before the horizon" / "ends after it" notes, or ''. */
  note: string;
}

function clipNote(startClipped: boolean, endClipped: boolean): string {
  if (startClipped && endClipped) return 'under way at t = 0 and past the horizon';
  if (startClipped) return 'under way at t = 0';
  if (endClipped) return 'past the horizon';
  return '';
}

/** Every site's passes, in time order. */
export function passRows(o: Pick<OrbitOutput, 'epochTaiS' | 'sites'>): PassRow[] {
  const rows: (PassRow & { t: number })[] = [];
  for (const s of o.sites)
    for (const p of s.passes)
      rows.push({
        t: p.startS,
        siteId: s.id,
        siteLabel: s.label,
        start: utcText(o.epochTaiS, p.startS),
        end: utcText(o.epochTaiS, p.endS),
        startShort: shortUtcText(o.epochTaiS, p.startS),
        endShort: shortUtcText(o.epochTaiS, p.endS),
        duration: durationText(p.endS - p.startS),
        maxElevation: (p.maxElevationRad * DEG_PER_RAD).toFixed(2),
        note: clipNote(p.startClipped, p.endClipped),
      });
  rows.sort((a, b) => a.t - b.t);
  return rows.map(({ t: _t, ...r }) => r);
}

export interface EclipseRow {
  start: string;
  end: string;
  startShort: string;
  endShort: string;
  duration: string;
  /** Umbra duration, or "no umbra". */
  umbra: string;
  note: string;
}

export function eclipseRows(o: Pick<OrbitOutput, 'epochTaiS' | 'eclipses'>): EclipseRow[] {
  return o.eclipses.map((e) => ({
    start: utcText(o.epochTaiS, e.startS),
    end: utcText(o.epochTaiS, e.endS),
    startShort: shortUtcText(o.epochTaiS, e.startS),
    endShort: shortUtcText(o.epochTaiS, e.endS),
    duration: durationText(e.endS - e.startS),
    umbra: Number.isFinite(e.umbraStartS) && Number.isFinite(e.umbraEndS) ? durationText(e.umbraEndS - e.umbraStartS) : 'no umbra',
    note: clipNote(e.startClipped, e.endClipped),
  }));
}

const KIND_TEXT: Record<string, string> = {
  site: 'site',
  station: 'station',
  sun: 'Sun',
  nadir: 'nadir',
  fixed: 'fixed attitude',
};

export interface WindowRow {
  target: number;
  label: string;
  what: string;
  slewStart: string;
  trackStart: string;
  holdEnd: string;
  trackStartShort: string;
  holdEndShort: string;
  /** How the window was set: "next pass" / "at a time" / "after the previous target". */
  due: string;
  maxElevation: string;
}

export function windowRows(o: Pick<OrbitOutput, 'epochTaiS' | 'windows'>): WindowRow[] {
  return o.windows.map((w) => ({
    target: w.target,
    label: w.label,
    what: `${KIND_TEXT[w.kind] ?? w.kind}${w.siteLabel ? `: ${w.siteLabel}` : ''}`,
    slewStart: utcText(o.epochTaiS, w.slewStartS),
    trackStart: utcText(o.epochTaiS, w.trackStartS),
    holdEnd: utcText(o.epochTaiS, w.holdEndS),
    trackStartShort: shortUtcText(o.epochTaiS, w.trackStartS),
    holdEndShort: shortUtcText(o.epochTaiS, w.holdEndS),
    due: w.window === 'pass' ? 'next pass' : w.window === 'time' ? 'at a time' : 'after the previous target',
    maxElevation: w.maxElevationRad === null ? '—' : (w.maxElevationRad * DEG_PER_RAD).toFixed(2),
  }));
}

/** A run's pointing error per window in degrees (peak and RMS, 4 significant digits), "—" without samples. */
export function windowErrorCells(e: WindowError): { peakDeg: string; rmsDeg: string } {
  const deg = (v: number | null) => (v === null ? '—' : (v * DEG_PER_RAD).toPrecision(4));
  return { peakDeg: deg(e.peakPointingErrorRad), rmsDeg: deg(e.rmsPointingErrorRad) };
}

/**
 * Longitudes in degrees wrapped to [−180, 180).
 */
export function wrapLongitudeDeg(lonDeg: number): number {
  const w = (((lonDeg + 180) % 360) + 360) % 360;
  return w - 180;
}

/**
 * The track in degrees cut into pieces that do not cross the antimeridian: a step of more than
 * 180° between neighbouring samples (a jump from +179° to −179°, not a real 358° move in one
 * sample) starts a new piece. Each piece carries the sample indices it covers.
 */
export function groundTrackPieces(
  latRad: ArrayLike<number>,
  lonRad: ArrayLike<number>,
): { lonDeg: number[]; latDeg: number[]; firstIndex: number }[] {
  const pieces: { lonDeg: number[]; latDeg: number[]; firstIndex: number }[] = [];
  let cur: { lonDeg: number[]; latDeg: number[]; firstIndex: number } | null = null;
  let prev = NaN;
  for (let i = 0; i < lonRad.length; i++) {
    const lon = wrapLongitudeDeg(lonRad[i]! * DEG_PER_RAD);
    const lat = latRad[i]! * DEG_PER_RAD;
    if (!cur || Math.abs(lon - prev) > 180) {
      cur = { lonDeg: [], latDeg: [], firstIndex: i };
      pieces.push(cur);
    }
    cur.lonDeg.push(lon);
    cur.latDeg.push(lat);
    prev = lon;
  }
  return pieces;
}

/**
 * The TLE as typed or pasted → the scenario's list of lines: split at line breaks (\n, \r\n, \r),
 * trailing spaces of each line dropped (editors and mail add them; column 69 is a checksum
 * digit, never a space), empty lines dropped. The engine checks the lines column by column.
 */
export function tleLinesOfText(text: string): string[] {
  return text
    .split(/\r\n|\r|\n/)
    .map((l) => l.replace(/[ \t]+$/, ''))
    .filter((l) => l.length > 0);
}
