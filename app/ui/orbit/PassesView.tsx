/**
 * Passes and windows of an orbit scenario (PipelineOutput.orbit, pipeline/orbit.ts): each site's
 * passes above its elevation mask (UTC start and end, peak elevation), the eclipses (conical
 * shadow), the planned windows with when tracking starts, and the pointing error each run
 * achieved in each window (ControllerRun.windowErrors). Times are UTC, leap seconds counted.
 */
import { useMemo } from 'react';
import { useAppState } from '../context';
import { modeShort } from '../modeNames';
import { eclipseRows, passRows, utcText, windowErrorCells, windowRows } from './orbitRows';
import { GroundTrack } from './GroundTrack';

export function PassesView() {
  const orbit = useAppState((s) => s.output?.orbit ?? null);
  const runs = useAppState((s) => s.output?.runs);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const passes = useMemo(() => (orbit ? passRows(orbit) : []), [orbit]);
  const eclipses = useMemo(() => (orbit ? eclipseRows(orbit) : []), [orbit]);
  const windows = useMemo(() => (orbit ? windowRows(orbit) : []), [orbit]);
  if (!orbit) return null;
  const flown = (runs ?? []).filter((r) => r.windowErrors && r.windowErrors.length > 0);
  return (
    <div className={`passes ${current ? '' : 'stale'}`} data-testid="passes-view">
      <div className="panel-head">
        Passes and windows{' '}
        <span className="muted">
          · {orbit.elementSetName}; times UTC on {utcText(orbit.epochTaiS, 0).slice(0, 10)} unless dated
        </span>
      </div>
      <GroundTrack orbit={orbit} />
      <table className="data-table passes-table" data-testid="passes-table">
        <caption>Passes above each site&apos;s elevation mask</caption>
        <thead>
          <tr>
            <th>site</th>
            <th>start</th>
            <th>end</th>
            <th title="Peak elevation, deg">max el. deg</th>
          </tr>
        </thead>
        <tbody>
          {passes.length === 0 && (
            <tr>
              <td colSpan={4} className="muted">
                No pass within the horizon.
              </td>
            </tr>
          )}
          {passes.map((p, k) => (
            <tr
              key={k}
              data-site={p.siteId}
              title={`${p.siteLabel}: ${p.start} to ${p.end} UTC, ${p.duration} above the mask${p.note ? ` (${p.note})` : ''}`}
            >
              <td className="wrap">{p.siteLabel}</td>
              <td className="num">{p.startShort}</td>
              <td className="num">{p.endShort}</td>
              <td className="num">{p.maxElevation}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <table className="data-table" data-testid="eclipses-table">
        <caption>Eclipses (any of the Sun hidden)</caption>
        <thead>
          <tr>
            <th>start</th>
            <th>end</th>
            <th title="Time in full shadow, hh:mm:ss">umbra</th>
          </tr>
        </thead>
        <tbody>
          {eclipses.length === 0 && (
            <tr>
              <td colSpan={3} className="muted">
                No eclipse within the horizon.
              </td>
            </tr>
          )}
          {eclipses.map((e, k) => (
            <tr key={k} title={`${e.start} to ${e.end} UTC${e.note ? ` (${e.note})` : ''}`}>
              <td className="num">{e.startShort}</td>
              <td className="num">{e.endShort}</td>
              <td className="num">{e.umbra}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <table className="data-table" data-testid="windows-table">
        <caption>Planned windows</caption>
        <thead>
          <tr>
            <th>#</th>
            <th>target</th>
            <th title="When tracking (or the hold) starts; the slew ends here">tracking from</th>
            <th>hold to</th>
          </tr>
        </thead>
        <tbody>
          {windows.map((w) => (
            <tr
              key={w.target}
              title={`Slew starts ${w.slewStart}, tracking ${w.trackStart} to ${w.holdEnd} UTC; due ${w.due}; peak elevation ${w.maxElevation}°`}
            >
              <td>{w.target + 1}</td>
              <td className="wrap">
                {w.label}
                <div className="muted">
                  {w.what} · {w.due}
                </div>
              </td>
              <td className="num">{w.trackStartShort}</td>
              <td className="num">{w.holdEndShort}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {flown.length > 0 && (
        <table className="data-table" data-testid="window-errors-table">
          <caption>Pointing error in each window, deg (peak / RMS)</caption>
          <thead>
            <tr>
              <th>#</th>
              {flown.map((r) => (
                <th key={r.key} data-run={r.key}>
                  {r.label}
                  <div className="muted">{modeShort(r.mode)}</div>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {(flown[0]!.windowErrors ?? []).map((e0, k) => (
              <tr key={k} title={e0.label}>
                <td>{e0.target + 1}</td>
                {flown.map((r) => {
                  const e = r.windowErrors?.[k];
                  const c = e ? windowErrorCells(e) : null;
                  return (
                    <td key={r.key} className="num">
                      {c ? `${c.peakDeg} / ${c.rmsDeg}` : '—'}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
