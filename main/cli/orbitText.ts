/**
 * The orbit sections of the CLI's output (scenarios with an `orbit` block): the inertial frame,
 * the element set, each site's passes, the eclipses and the planned windows with UTC labels
 * (leap seconds counted, time/iso.ts), and after a flight each window's pointing error.
 */
import { orbitExportInfo, type OrbitExportInfo, type OrbitOutput } from '../../app/engine/pipeline/orbit';
import type { ControllerRun } from '../../app/engine/pipeline/types';
import { utcLabelFromTai } from '../../app/engine/time/iso';
import { DEG_PER_RAD } from '../../app/engine/units';
import { table } from './format';

function utc(o: OrbitOutput, t: number): string {
  return `${utcLabelFromTai(o.epochTaiS + t, 1)}Z`;
}

/** The windows section of `plan`: passes, eclipses and the planned windows. */
export function windowsText(o: OrbitOutput): string {
  const out: string[] = [];
  out.push(`Orbit: ${o.elementSetName} (element epoch ${o.elementEpochUtc}), frame ${o.inertialFrame}, horizon ${o.horizonS} s`);
  const passRows: string[][] = [];
  for (const s of o.sites)
    for (const p of s.passes)
      passRows.push([
        s.id,
        utc(o, p.startS),
        utc(o, p.endS),
        p.startS.toFixed(1),
        p.endS.toFixed(1),
        (p.maxElevationRad * DEG_PER_RAD).toFixed(1),
        (s.elevationMaskRad * DEG_PER_RAD).toFixed(1),
      ]);
  out.push('');
  out.push('Passes (above each site’s elevation mask):');
  out.push(
    passRows.length
      ? table(['site', 'start UTC', 'end UTC', 'start s', 'end s', 'max elev deg', 'mask deg'], passRows)
      : '  none within the horizon',
  );
  out.push('');
  out.push('Eclipses (conical shadow, penumbra entry to exit):');
  out.push(
    o.eclipses.length
      ? table(
          ['#', 'start UTC', 'end UTC', 'start s', 'end s'],
          o.eclipses.map((e, i) => [
            String(i + 1),
            utc(o, e.startS),
            utc(o, e.endS),
            `${e.startS.toFixed(1)}${e.startClipped ? '*' : ''}`,
            `${e.endS.toFixed(1)}${e.endClipped ? '*' : ''}`,
          ]),
        )
      : '  none within the horizon',
  );
  if (o.eclipses.some((e) => e.startClipped || e.endClipped)) out.push('  (* cut at the start or end of the horizon)');
  out.push('');
  out.push('Planned windows (tracking starts when the slew ends on the target’s attitude and rate):');
  out.push(
    o.windows.length
      ? table(
          ['target', 'kind', 'site', 'slew start s', 'tracking from UTC', 'tracking from s', 'hold to s', 'window'],
          o.windows.map((w) => [
            `${w.target + 1}. ${w.label}`,
            w.kind,
            w.siteId ?? '-',
            w.slewStartS.toFixed(1),
            utc(o, w.trackStartS),
            w.trackStartS.toFixed(1),
            w.holdEndS.toFixed(1),
            w.window === 'pass'
              ? `pass to ${w.passEndS!.toFixed(1)} s, max ${(w.maxElevationRad! * DEG_PER_RAD).toFixed(1)}°`
              : (w.window ?? 'after previous'),
          ]),
        )
      : '  none planned',
  );
  for (const w of o.windows) for (const n of w.notes) out.push(`  ${w.target + 1}. ${n}`);
  return out.join('\n');
}

/** Pointing error achieved while tracking, per run and planned target. */
export function windowErrorText(runs: readonly ControllerRun[]): string {
  const rows: string[][] = [];
  for (const r of runs)
    for (const w of r.windowErrors ?? [])
      rows.push([
        `${r.label} (${r.mode})`,
        `${w.target + 1}. ${w.label}`,
        w.startS.toFixed(1),
        w.endS.toFixed(1),
        w.peakPointingErrorRad === null ? '-' : (w.peakPointingErrorRad * DEG_PER_RAD).toPrecision(3),
        w.rmsPointingErrorRad === null ? '-' : (w.rmsPointingErrorRad * DEG_PER_RAD).toPrecision(3),
      ]);
  if (!rows.length) return '';
  return `Pointing error while tracking (primary body axis against the target direction):\n${table(
    ['run', 'target', 'from s', 'to s', 'peak deg', 'rms deg'],
    rows,
  )}`;
}

/** The orbit summary for --json output (the per-sample track left out). */
export function orbitJson(o: OrbitOutput): OrbitExportInfo {
  return orbitExportInfo(o);
}
