/**
 * The synchronised plots under the 3D view. Data changes go to uPlot's setData; playback time
 * reaches each chart's playhead through the clock's frame loop, never through React renders.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { useApp, useAppState } from '../context';
import { createChart, createChartGroup, structureKey, type ChartGroup, type ChartHandle } from './chart';
import { buildPlots, type PlotSpec, type Series } from './series';

const PLOT_HEIGHT = 170;

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

function PlotCard({ spec, group, extra }: { spec: PlotSpec; group: ChartGroup; extra?: React.ReactNode }) {
  const app = useApp();
  const host = useRef<HTMLDivElement>(null);
  const handle = useRef<ChartHandle | null>(null);
  const specRef = useRef(spec);
  specRef.current = spec;
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
    h.setPlayhead(app.clock.t);
    const off = app.clock.onFrame((t) => h.setPlayhead(t));
    const ro = new ResizeObserver(() => {
      const w = Math.max(200, el.clientWidth);
      if (Math.abs(w - h.plot.width) > 1) h.resize(w, PLOT_HEIGHT);
    });
    ro.observe(el);
    return () => {
      ro.disconnect();
      off();
      h.destroy();
      handle.current = null;
    };
  }, [key, empty, group, app]);

  useEffect(() => {
    if (handle.current && !spec.empty) handle.current.setData(spec);
  }, [spec]);

  const exportPng = async () => {
    if (!handle.current) return;
    try {
      const content = await handle.current.toPng();
      const name = (app.store.getState().scenario as { name?: unknown } | null)?.name;
      const r = await app.bridge.exportFile({ suggestedName: `${fileSlug(name)}-${spec.id}.png`, content });
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
        <span className="plot-title">{spec.title}</span>
        {extra}
        {!empty && (
          <button className="small" onClick={exportPng} title="Save this plot as a PNG image" data-testid={`png-${spec.id}`}>
            PNG
          </button>
        )}
      </div>
      {empty ? <div className="plot-empty">{empty}</div> : <div className="plot-host" ref={host} />}
    </div>
  );
}

export function PlotsPanel() {
  const output = useAppState((s) => s.output);
  const selected = useAppState((s) => s.selectedRunKeys);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const [logError, setLogError] = useState(true);
  const group = useMemo(() => createChartGroup(), []);
  const plots = useMemo(() => (output ? buildPlots(output, selected, { logError }, join) : []), [output, selected, logError]);

  if (!output) return <div className="plots panel-empty">Plots appear after the first run.</div>;
  return (
    <div className={`plots ${current ? '' : 'stale'}`} data-testid="plots">
      {plots.map((p) => (
        <PlotCard
          key={p.id}
          spec={p}
          group={group}
          extra={
            p.id === 'error-angle' ? (
              <label className="check small-toggle" title="Logarithmic error axis">
                <input type="checkbox" checked={logError} onChange={(e) => setLogError(e.target.checked)} data-testid="log-toggle" /> log
              </label>
            ) : undefined
          }
        />
      ))}
    </div>
  );
}
