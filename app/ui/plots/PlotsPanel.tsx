/**
 * The synchronised plots under the 3D view: overlays of every ticked run first, then the per-run
 * plots of the run the picker chooses. Data changes go to uPlot's setData; playback time reaches
 * each chart's playhead through the clock's frame loop, never through React renders.
 */
import { memo, useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { INERTIAL_FRAME } from '../../engine/caution';
import { useApp, useAppState } from '../context';
import { runName } from '../modeNames';
import { createChart, createChartGroup, structureKey, type ChartGroup, type ChartHandle } from './chart';
import { boresightChoices, defaultBoresight, type BoresightChoice } from './overlays';
import { buildDetail, buildOverlays, plotSources, runColor, type PlotSpec, type Series } from './series';
import { WindowBandLegend } from './WindowBandLegend';
import { windowBands } from './windowBands';

const PLOT_HEIGHT = 180;

const join = (tables: Series[][]) => uPlot.join(tables as uPlot.AlignedData[]) as unknown as Series[];

function fileSlug(s: unknown): string {
  const base = typeof s === 'string' && s.trim() ? s : 'slewsmith';
  return (
    base
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 60) || 'slewsmith'
  );
}

interface PlotCardProps {
  spec: PlotSpec;
  group: ChartGroup;
  /** The shown run's scenario name and epoch, for the PNG's caption and file name. */
  scenarioName: string;
  epochUtc: string;
  extra?: ReactNode;
}

/**
 * One chart. Memoised: a card whose spec is the same object (PlotsPanel reuses the specs of plots
 * whose inputs did not change) neither renders nor draws again.
 */
const PlotCard = memo(function PlotCard({ spec, group, scenarioName, epochUtc, extra }: PlotCardProps) {
  const app = useApp();
  const host = useRef<HTMLDivElement>(null);
  const handle = useRef<ChartHandle | null>(null);
  const specRef = useRef(spec);
  specRef.current = spec;
  // Off-screen charts (the per-run plots below the fold, a scrolled-away overlay) take new data
  // only when they come within a screen of the viewport: an edit redraws what can be seen.
  const visible = useRef(true);
  const pending = useRef<PlotSpec | null>(null);
  /** The spec the chart shows (drawn at creation or by the last setData). */
  const shown = useRef<PlotSpec | null>(null);
  const show = (h: ChartHandle, s: PlotSpec) => {
    h.setData(s);
    shown.current = s;
    pending.current = null;
  };
  const key = structureKey(spec);
  const empty = spec.empty;

  useEffect(() => {
    const el = host.current;
    if (!el || empty) return;
    const width = Math.max(200, el.clientWidth);
    const h = createChart(el, specRef.current, { width, height: PLOT_HEIGHT }, group, (t) => {
      app.clock.pause();
      app.clock.setTime(t);
    });
    handle.current = h;
    shown.current = specRef.current;
    h.setPlayhead(app.clock.t);
    const off = app.clock.onFrame((t) => h.setPlayhead(t));
    const ro = new ResizeObserver(() => {
      const w = Math.max(200, el.clientWidth);
      if (Math.abs(w - h.plot.width) > 1) h.resize(w, PLOT_HEIGHT);
    });
    ro.observe(el);
    visible.current = true;
    pending.current = null;
    const io =
      typeof IntersectionObserver === 'function'
        ? new IntersectionObserver(
            (entries) => {
              const e = entries[entries.length - 1];
              if (!e) return;
              visible.current = e.isIntersecting;
              if (e.isIntersecting && pending.current) show(h, pending.current);
            },
            { rootMargin: '100% 0px' },
          )
        : null;
    io?.observe(el);
    return () => {
      io?.disconnect();
      ro.disconnect();
      off();
      h.destroy();
      handle.current = null;
    };
  }, [key, empty, group, app]);

  useEffect(() => {
    if (!handle.current || spec.empty || spec === shown.current) return;
    if (visible.current) show(handle.current, spec);
    else pending.current = spec;
  }, [spec]);

  const exportPng = async () => {
    if (!handle.current) return;
    if (pending.current) show(handle.current, pending.current);
    try {
      // The run's own scenario (the plot shows it), not an edit made since.
      const content = await handle.current.toPng({ scenarioName, epochUtc });
      const r = await app.bridge.exportFile({ suggestedName: `${fileSlug(scenarioName)}-${spec.id}.png`, content });
      if (r.status === 'exported') app.notify(`Exported ${r.file.name}`);
      else if (r.status === 'failed') app.notify(r.message, 'error');
      else if (r.status === 'invalid') app.notify(r.errors.map((e) => e.message).join('; '), 'error');
    } catch (e) {
      app.notify(`PNG export failed: ${(e as Error).message}`, 'error');
    }
  };

  return (
    <div className="plot-card" data-plot={spec.id} data-testid={`plot-${spec.id}`}>
      <div className="plot-head">
        <span className="plot-title" title={spec.title}>
          {spec.title}
        </span>
        {extra}
        {!empty && (
          <button
            className="small"
            onClick={exportPng}
            title="Save this plot as a PNG image with its caption"
            data-testid={`png-${spec.id}`}
          >
            PNG
          </button>
        )}
      </div>
      {spec.note && <div className="plot-note">{spec.note}</div>}
      {empty ? <div className="plot-empty">{empty}</div> : <div className="plot-host" ref={host} />}
    </div>
  );
});

/**
 * `compute()`'s last value while every entry of `deps` is the same (Object.is) as at the last
 * computation; computed again otherwise. Unlike useMemo, the dependency list may vary in length.
 */
function useReused<T>(compute: () => T, deps: readonly unknown[]): T {
  const last = useRef<{ deps: readonly unknown[]; value: T } | null>(null);
  const l = last.current;
  if (l && l.deps.length === deps.length && l.deps.every((d, i) => Object.is(d, deps[i]))) return l.value;
  const value = compute();
  last.current = { deps, value };
  return value;
}

/** The run whose per-run plots are shown: the first ticked run; choosing another ticks it and puts it first. */
function RunPicker({ out, selected }: { out: PipelineOutput; selected: readonly string[] }) {
  const app = useApp();
  const current = selected[0] ?? '';
  return (
    <label className="run-picker">
      <span>Per-run plots for</span>
      <select
        value={current}
        onChange={(e) => app.store.selectRuns([e.target.value, ...selected.filter((k) => k !== e.target.value)])}
        data-testid="detail-run"
        aria-label="run shown in the per-run plots"
      >
        {current === '' && <option value="">(no run ticked)</option>}
        {out.runs.map((r) => (
          <option key={r.key} value={r.key}>
            {runName(r)}
            {selected.includes(r.key) ? '' : ' (not ticked)'}
          </option>
        ))}
      </select>
    </label>
  );
}

function BoresightPicker({
  choices,
  value,
  onChange,
}: {
  choices: BoresightChoice[];
  value: BoresightChoice;
  onChange: (c: BoresightChoice) => void;
}) {
  return (
    <select
      className="axis-picker"
      value={value.key}
      onChange={(e) => onChange(choices.find((c) => c.key === e.target.value) ?? value)}
      aria-label="body axis of the pointing-error plot"
      title="Body axis whose pointing error is plotted"
      data-testid="boresight-axis"
    >
      {choices.map((c) => (
        <option key={c.key} value={c.key}>
          {c.name}
        </option>
      ))}
    </select>
  );
}

export function PlotsPanel() {
  const output = useAppState((s) => s.output);
  const selected = useAppState((s) => s.selectedRunKeys);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const [logError, setLogError] = useState(true);
  const [axisKey, setAxisKey] = useState<string | null>(null);
  const group = useMemo(() => createChartGroup(), []);
  // Everything below is keyed on the parts of the output the plots read (plotSources), which the
  // store keeps as the same objects while unchanged: a gain edit of one law rebuilds only the plots
  // showing that law's runs, and the other cards keep their specs (no render, no redraw).
  const sources = output ? plotSources(output) : [];
  const ticked = output ? selected.map((k) => output.runs.find((r) => r.key === k)) : [];
  const choices = useReused(() => (output ? boresightChoices(output) : []), sources);
  const boresight = useReused(
    () => (output ? (choices.find((c) => c.key === axisKey) ?? defaultBoresight(output)) : null),
    [...sources, choices, axisKey],
  );
  const bands = useReused(() => (output ? windowBands(output) : null), [output?.orbit]);
  const withBands = (p: PlotSpec): PlotSpec => (bands?.length ? { ...p, windowBands: bands } : p);
  // Overlays: every ticked run. Per-run plots: the first ticked run only (with the plan's markers,
  // the vehicle's limits and the bands), so they stay as they are when another run changes.
  const overlaySpecs = useReused(
    () => (output && boresight ? buildOverlays(output, selected, { logError, boresight }, join) : null),
    [...sources, ...ticked, selected.length, logError, boresight],
  );
  const overlays = useReused(() => overlaySpecs?.map(withBands) ?? [], [overlaySpecs, bands]);
  // The per-run plots read the first ticked run, the plan (markers) and the vehicle (limits) only
  // (test/unit/ui-plot-series.test.ts): equal inputs keep the specs shown.
  const detail = useReused(() => {
    const d = output ? buildDetail(output, selected) : null;
    return { run: d?.detail ?? null, plots: d?.detailPlots.map(withBands) ?? [], hiddenNote: d?.hiddenNote ?? null };
  }, [ticked[0], output?.plan, output?.vehicle, bands]);
  const scenarioName = output?.scenario.name ?? '';
  const epochUtc = output?.scenario.epochUtc ?? '';
  // The cards' header controls, kept while their inputs are the same (PlotCard is memoised).
  const logToggle = useMemo(
    () => (
      <label className="check small-toggle" title="Logarithmic error axis (error angle and pointing error)">
        <input type="checkbox" checked={logError} onChange={(e) => setLogError(e.target.checked)} data-testid="log-toggle" /> log
      </label>
    ),
    [logError],
  );
  const boresightPicker = useMemo(
    () => (boresight ? <BoresightPicker choices={choices} value={boresight} onChange={(c) => setAxisKey(c.key)} /> : null),
    [choices, boresight],
  );

  if (!output || !overlaySpecs || !boresight) return <div className="plots panel-empty">Plots appear after the first run.</div>;
  return (
    <div className={`plots ${current ? '' : 'stale'}`} data-testid="plots">
      <div className="plots-head" data-testid="plots-head">
        <span className="plots-title">Ticked runs</span>
        <span className="run-keys">
          {selected.map((k) => {
            const r = output.runs.find((x) => x.key === k);
            return r ? (
              <span key={k} className="run-key">
                <span className="swatch" style={{ background: runColor(output, k) }} />
                {runName(r)}
              </span>
            ) : null;
          })}
        </span>
        <span className="time-note muted" data-testid="time-note">
          t in s from {output.scenario.epochUtc} UTC · frame {INERTIAL_FRAME} · solid line: a slew starts (target number and name), dotted:
          planned arrival
        </span>
        {bands && bands.length > 0 && <WindowBandLegend bands={bands} />}
      </div>
      <div className="plot-grid" data-testid="overlay-plots">
        {overlays.map((p) => (
          <PlotCard
            key={p.id}
            spec={p}
            group={group}
            scenarioName={scenarioName}
            epochUtc={epochUtc}
            extra={p.id === 'error-angle' ? logToggle : p.id === 'boresight' ? boresightPicker : undefined}
          />
        ))}
      </div>
      <div className="plots-head detail-head">
        <RunPicker out={output} selected={selected} />
        {detail.hiddenNote && (
          <span className="hidden-note muted" data-testid="hidden-note">
            {detail.hiddenNote}
          </span>
        )}
      </div>
      {detail.run && (
        <div className="plot-grid" data-testid="detail-plots">
          {detail.plots.map((p) => (
            <PlotCard key={p.id} spec={p} group={group} scenarioName={scenarioName} epochUtc={epochUtc} />
          ))}
        </div>
      )}
    </div>
  );
}
