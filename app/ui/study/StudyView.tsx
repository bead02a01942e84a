/**
 * The study view (design.md "A study view replaces the centre with its map, histograms and
 * worst-case list"): run controls with a progress bar, the per-controller summary, histograms,
 * the outcome map over initial error axes, and the worst cases, each openable as a normal run.
 * Self-contained: give it the scenario JSON; whoever mounts it decides where an opened case goes.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { ParallelOutcome, ParallelStudy } from '../../engine/study/parallel';
import type { StudyProgress } from '../../engine/study/runner';
import type { ControllerSummary, Histogram, MapPoint } from '../../engine/study/summary';
import { outcomeMap } from '../../engine/study/summary';
import { studyCaseScenario } from '../../engine/study/caseScenario';
import { CHATTER_THRESHOLD_PER_S } from '../../engine/study/runCase';
import type { Issue } from '../../engine/errors';
import { startBrowserStudy, spawnStudyWorker, type StudyWorkerLike } from './browserStudy';
import { OUTCOME_COLOURS, OUTCOME_ORDER, edgeLabel, equalAreaDisc, histogramBars } from './studyPlot';
import './study.css';

export interface StudyViewProps {
  scenario: unknown;
  spawnWorker?: () => StudyWorkerLike;
  /** Worker count (default: the machine's logical cores, at most 8). */
  workers?: number;
  /** Open one case as a normal scenario (e.g. as a new document). */
  onOpenCase?: (scenario: Record<string, unknown>, name: string) => void;
  onClose?: () => void;
}

type HistKey = keyof ControllerSummary['histograms'];
const HISTS: { key: HistKey; label: string }[] = [
  { key: 'settleTimeS', label: 'settle time' },
  { key: 'rotationTravelledDeg', label: 'rotation travelled' },
  { key: 'jumps', label: 'logic jumps' },
  { key: 'chatterPerS', label: 'chatter' },
  { key: 'peakWheelMomentumFraction', label: 'peak wheel momentum' },
  { key: 'peakWheelTorqueFraction', label: 'peak wheel torque' },
  { key: 'finalErrorDeg', label: 'final error' },
];

const pct = (x: number) => `${(100 * x).toFixed(1)} %`;
const sec = (x: number | null, d: number) => (x === null ? `> ${d}` : x.toFixed(1));

function fileStudy(s: unknown): { runs: number; seed: number } {
  const st = (s as { study?: { runs?: unknown; seed?: unknown }; simulation?: { seed?: unknown } } | null) ?? {};
  const runs = typeof st.study?.runs === 'number' ? st.study.runs : 100;
  const seed = typeof st.study?.seed === 'number' ? st.study.seed : typeof st.simulation?.seed === 'number' ? st.simulation.seed : 0;
  return { runs, seed };
}

export function StudyView({ scenario, spawnWorker = spawnStudyWorker, workers, onOpenCase, onClose }: StudyViewProps) {
  const defaults = useMemo(() => fileStudy(scenario), [scenario]);
  const [runs, setRuns] = useState(defaults.runs);
  const [seed, setSeed] = useState(defaults.seed);
  const [progress, setProgress] = useState<StudyProgress | null>(null);
  const [result, setResult] = useState<ParallelOutcome | null>(null);
  const [errors, setErrors] = useState<Issue[]>([]);
  const [controller, setController] = useState(0);
  const [hist, setHist] = useState<HistKey>('settleTimeS');
  const [opening, setOpening] = useState<string | null>(null);
  const running = useRef<(ParallelStudy & { dispose(): void }) | null>(null);
  const ran = useRef<{ runs: number; seed: number }>({ runs, seed });

  useEffect(() => () => running.current?.dispose(), []);

  const start = () => {
    running.current?.dispose();
    setResult(null);
    setErrors([]);
    setProgress({ done: 0, total: runs, notSettled: 0, unflyable: 0, elapsedMs: 0, remainingMs: null });
    ran.current = { runs, seed };
    const n = workers ?? Math.min(8, Math.max(1, globalThis.navigator?.hardwareConcurrency ?? 2));
    const st = startBrowserStudy(scenario, { spawn: spawnWorker, workers: n, overrides: { runs, seed }, onProgress: setProgress });
    running.current = st;
    void st.result.then((r) => {
      if (running.current !== st) return;
      running.current = null;
      if (r.ok) setResult(r.value);
      else setErrors(r.errors);
    });
  };
  const cancel = () => running.current?.cancel();

  const map: MapPoint[] = useMemo(() => (result ? outcomeMap(result.records) : []), [result]);
  const isRunning = running.current !== null && !result && errors.length === 0;

  const openCase = (index: number) => {
    if (!onOpenCase) return;
    setOpening(`opening case ${index}…`);
    // One case costs a study context (a certificate for synergistic laws): a fraction of a second.
    setTimeout(() => {
      const r = studyCaseScenario(scenario, ran.current, index);
      setOpening(null);
      if (r.ok) onOpenCase(r.value, `study-case-${index}.scenario.json`);
      else setErrors(r.errors);
    }, 0);
  };

  return (
    <div className="study-view" data-testid="study-view">
      <div className="panel-head">
        Robustness study <span className="muted">· seeded Monte Carlo over the scenario's study block</span>
        {onClose && (
          <button className="small push-right" onClick={onClose}>
            close
          </button>
        )}
      </div>
      <div className="study-controls">
        <label>
          cases <input className="num" type="number" min={1} max={1000000} value={runs} onChange={(e) => setRuns(Math.max(1, Math.floor(Number(e.target.value) || 1)))} disabled={isRunning} />
        </label>
        <label>
          seed <input className="num" type="number" min={0} value={seed} onChange={(e) => setSeed(Math.max(0, Math.floor(Number(e.target.value) || 0)))} disabled={isRunning} />
        </label>
        <button onClick={start} disabled={isRunning} data-testid="study-run">
          Run study
        </button>
        <button onClick={cancel} disabled={!isRunning} data-testid="study-cancel">
          Stop (keep finished cases)
        </button>
        {opening && <span className="muted">{opening}</span>}
      </div>
      {progress && <ProgressBar p={progress} />}
      {errors.length > 0 && (
        <ul className="blockers">
          {errors.map((e, i) => (
            <li key={i}>
              <code>{e.path}</code> {e.message}
            </li>
          ))}
        </ul>
      )}
      {result && (
        <>
          <SummaryTable r={result} />
          <div className="study-row">
            <div className="study-card">
              <div className="panel-head">
                Histogram
                <select value={hist} onChange={(e) => setHist(e.target.value as HistKey)}>
                  {HISTS.map((h) => (
                    <option key={h.key} value={h.key}>
                      {h.label}
                    </option>
                  ))}
                </select>
              </div>
              {result.summary.controllers.map((c) => (
                <HistogramPlot key={c.controllerId} title={c.label} h={c.histograms[hist]} />
              ))}
            </div>
            <div className="study-card">
              <div className="panel-head">
                Outcome map
                <select value={controller} onChange={(e) => setController(Number(e.target.value))}>
                  {result.info.controllers.map((c, i) => (
                    <option key={c.id} value={i}>
                      {c.label}
                    </option>
                  ))}
                </select>
              </div>
              <OutcomeMap points={map} controller={controller} />
            </div>
            <div className="study-card">
              <div className="panel-head">Worst cases</div>
              {result.summary.controllers.map((c) => (
                <div key={c.controllerId} className="study-worst">
                  <div className="muted">{c.label}</div>
                  {c.worst.map((w) => (
                    <div key={w.index} className="study-worst-row">
                      <code>#{w.index}</code> {w.status}
                      {w.settleTimeS !== null ? `, ${w.settleTimeS.toFixed(1)} s` : `, final error ${w.finalErrorDeg.toPrecision(3)}°`}
                      {w.unwound ? ', unwound' : ''}
                      {w.chattered ? ', chattered' : ''}
                      {onOpenCase && (
                        <button className="link" onClick={() => openCase(w.index)} title="Open this case as a normal scenario">
                          open
                        </button>
                      )}
                    </div>
                  ))}
                </div>
              ))}
            </div>
          </div>
        </>
      )}
    </div>
  );
}

function ProgressBar({ p }: { p: StudyProgress }) {
  const f = p.total > 0 ? p.done / p.total : 0;
  return (
    <div className="study-progress" role="progressbar" aria-valuemin={0} aria-valuemax={p.total} aria-valuenow={p.done} data-testid="study-progress">
      <div className="study-progress-bar" style={{ width: `${(100 * f).toFixed(1)}%` }} />
      <span>
        {p.done}/{p.total} cases · {p.notSettled} runs not settled · {p.unflyable} unflyable · {(p.elapsedMs / 1000).toFixed(1)} s
        {p.remainingMs !== null && p.done < p.total ? ` · ~${(p.remainingMs / 1000).toFixed(0)} s left` : ''}
      </span>
    </div>
  );
}

function SummaryTable({ r }: { r: ParallelOutcome }) {
  const s = r.summary;
  return (
    <div className="table-scroll">
      <div className="muted">
        {s.casesDone} of {s.runsRequested} cases{r.cancelled ? ' (stopped early)' : ''} · seed {s.seed} · {s.mode} · {s.durationS} s per case · inertia redraws {s.inertiaRejections} · unflyable {s.unflyableCases}
      </div>
      <table className="data-table study-table" data-testid="study-summary">
        <thead>
          <tr>
            <th>controller</th>
            <th>runs</th>
            <th>settled</th>
            <th title="driven to the far quaternion lift, or an extra full turn">unwound</th>
            <th title="ended on the far lift: turned through the 180° attitude">long way</th>
            <th title={`≥ ${CHATTER_THRESHOLD_PER_S} logic jumps or torque reversals per second in the busiest 10 s`}>chatter</th>
            <th>settle median s</th>
            <th>settle p95 s</th>
            <th>jumps median</th>
            <th>peak h p95</th>
            <th>peak τ p95</th>
          </tr>
        </thead>
        <tbody>
          {s.controllers.map((c) => (
            <tr key={c.controllerId}>
              <th>{c.label}</th>
              <td className="num">{c.flyable}</td>
              <td className="num">{pct(c.settledShare)}</td>
              <td className="num">{pct(c.unwoundShare)}</td>
              <td className="num">{pct(c.longWayShare)}</td>
              <td className="num">{pct(c.chatteredShare)}</td>
              <td className="num">{sec(c.settleTimeS.median, s.durationS)}</td>
              <td className="num">{sec(c.settleTimeS.p95, s.durationS)}</td>
              <td className="num">{c.jumps.median ?? '-'}</td>
              <td className="num">{c.peakWheelMomentumFraction.p95 === null ? '-' : pct(c.peakWheelMomentumFraction.p95)}</td>
              <td className="num">{c.peakWheelTorqueFraction.p95 === null ? '-' : pct(c.peakWheelTorqueFraction.p95)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function HistogramPlot({ title, h }: { title: string; h: Histogram }) {
  const W = 260, H = 46;
  const bars = histogramBars(h.counts, h.overflow, W, H);
  const last = h.edges[h.edges.length - 1];
  return (
    <figure className="study-hist">
      <figcaption>
        {title} <span className="muted">({h.quantity}, {h.unit}; last bar: above {edgeLabel(last)})</span>
      </figcaption>
      <svg width={W} height={H + 12} role="img" aria-label={`${title}: ${h.quantity}`}>
        {bars.map((b, k) => (
          <rect key={k} x={b.x} y={b.y} width={b.width} height={b.height} className={k === bars.length - 1 ? 'overflow' : ''}>
            <title>{k < h.counts.length ? `[${edgeLabel(h.edges[k])}, ${edgeLabel(h.edges[k + 1])}) ${h.unit}: ${b.count}` : `above ${edgeLabel(last)} ${h.unit}: ${b.count}`}</title>
          </rect>
        ))}
        <text x={0} y={H + 11}>{edgeLabel(h.edges[0])}</text>
        <text x={W - bars[0].width - 2} y={H + 11} textAnchor="end">{edgeLabel(last)}</text>
      </svg>
    </figure>
  );
}

function OutcomeMap({ points, controller }: { points: MapPoint[]; controller: number }) {
  const R = 80;
  const counts: Record<string, number> = {};
  for (const p of points) counts[p.outcome[controller]] = (counts[p.outcome[controller]] ?? 0) + 1;
  const disc = (hemi: 1 | -1, cx: number) => (
    <g>
      <circle cx={cx} cy={R + 4} r={R} className="study-disc" />
      {points.map((p) => {
        const d = equalAreaDisc(p.axis);
        if (d.hemisphere !== hemi) return null;
        const o = p.outcome[controller];
        return (
          <circle key={p.index} cx={cx + R * d.x} cy={R + 4 - R * d.y} r={2.2} fill={OUTCOME_COLOURS[o] ?? '#000'}>
            <title>{`case ${p.index}: ${o}, initial error ${p.angleDeg.toFixed(1)}°, η₀ = ${p.eta0.toFixed(3)}`}</title>
          </circle>
        );
      })}
      <text x={cx} y={2 * R + 18} textAnchor="middle">
        {hemi === 1 ? 'axis z ≥ 0 (seen from +z)' : 'axis z < 0 (seen from −z)'}
      </text>
    </g>
  );
  return (
    <div>
      <svg width={4 * R + 24} height={2 * R + 24} role="img" aria-label="initial error axes coloured by outcome">
        {disc(1, R + 4)}
        {disc(-1, 3 * R + 20)}
      </svg>
      <div className="study-legend">
        {OUTCOME_ORDER.filter((o) => counts[o]).map((o) => (
          <span key={o}>
            <i style={{ background: OUTCOME_COLOURS[o] }} /> {o} {counts[o]}
          </span>
        ))}
      </div>
      <div className="muted">Initial error rotation axis (target axes), equal-area projection; hover a point for its angle and case number.</div>
    </div>
  );
}
