/**
 * The comparison table: metrics as rows, every run as a column (the engine's columns, units,
 * definitions, sources and best marks: pipeline/comparison.ts). It scrolls sideways with the
 * metric column and the header row frozen; run names and cells wrap, so every run fits side by side
 * at 1280 px in the band under the centre and right columns. Each metric's definition and source is one click (or
 * Enter) away on its i button. The run checkboxes choose which runs the plots and the 3D view show.
 */
import { PartialNote } from './PartialNote';
import { useEffect, useRef, useState } from 'react';
import type { ComparisonColumn } from '../../engine/pipeline/comparison';
import { COMPARISON_COLUMNS } from '../../engine/pipeline/comparison';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { useApp, useAppState } from '../context';
import { cellText } from '../comparisonCells';
import { MODE_TEXT } from '../modeNames';
import { runColor } from '../plots/series';

const BEST_RULE = 'Lowest value wins, among runs that settled; no mark when two runs tie.';

function unitOf(c: ComparisonColumn): string {
  return c.unit === '%' ? '' : c.unit;
}

/** The definition popover of one metric; Escape or the close button returns focus to its ⓘ button. */
function MetricInfo({ col, anchor, onClose }: { col: ComparisonColumn; anchor: HTMLElement; onClose: () => void }) {
  const box = useRef<HTMLDivElement>(null);
  const [pos, setPos] = useState<{ left: number; top: number } | null>(null);
  useEffect(() => {
    const r = anchor.getBoundingClientRect();
    const w = 340;
    const left = Math.max(8, Math.min(window.innerWidth - w - 8, r.left));
    const below = r.bottom + 4;
    const h = box.current?.offsetHeight ?? 160;
    const top = below + h > window.innerHeight - 8 ? Math.max(8, r.top - h - 4) : below;
    setPos({ left, top });
    box.current?.focus();
  }, [anchor]);
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') {
        e.preventDefault();
        onClose();
      }
    };
    const onDown = (e: MouseEvent) => {
      if (box.current && !box.current.contains(e.target as Node) && e.target !== anchor) onClose();
    };
    window.addEventListener('keydown', onKey);
    window.addEventListener('mousedown', onDown);
    return () => {
      window.removeEventListener('keydown', onKey);
      window.removeEventListener('mousedown', onDown);
    };
  }, [anchor, onClose]);
  const unit = unitOf(col) || (col.unit === '%' ? '% of the wheel’s own limit' : 'none');
  return (
    <div
      ref={box}
      className="metric-info"
      role="dialog"
      aria-label={`${col.label}: definition`}
      tabIndex={-1}
      style={pos ? { left: pos.left, top: pos.top } : { visibility: 'hidden' }}
      data-testid={`metric-info-${col.key}`}
    >
      <div className="metric-info-head">
        <strong>{col.label}</strong>
        <button className="small" onClick={onClose} aria-label="Close the definition">
          close
        </button>
      </div>
      <p>{col.definition}</p>
      <p>
        <span className="muted">Unit:</span> {unit}
      </p>
      <p>
        <span className="muted">Source:</span> {col.source}
      </p>
      {col.marked && (
        <p>
          <span className="muted">Best mark ★:</span> {BEST_RULE}
        </p>
      )}
    </div>
  );
}

function RunHeader({ out, rowKey, selected }: { out: PipelineOutput; rowKey: string; selected: readonly string[] }) {
  const app = useApp();
  const row = out.comparison.find((r) => r.key === rowKey)!;
  const ticked = selected.includes(row.key);
  const detail = selected[0] === row.key;
  const toggle = (on: boolean) => app.store.selectRuns(on ? [...selected, row.key] : selected.filter((k) => k !== row.key));
  return (
    <th className={`run-col ${detail ? 'detail' : ''}`} data-run={row.key} scope="col">
      <label
        className="check run-check"
        title={ticked ? 'Ticked: shown in the plots and the 3D view' : 'Tick to show in the plots and the 3D view'}
      >
        <input type="checkbox" checked={ticked} onChange={(e) => toggle(e.target.checked)} data-testid={`show-${row.key}`} />
        <span className="swatch" style={{ background: runColor(out, row.key) }} aria-hidden="true" />
        <span className="run-name">{row.label}</span>
      </label>
      <div className="run-mode" title={MODE_TEXT[row.mode].long}>
        {MODE_TEXT[row.mode].short}
      </div>
      {ticked && !detail && (
        <button
          className="link"
          onClick={() => app.store.selectRuns([row.key, ...selected.filter((k) => k !== row.key)])}
          title="Show this run in the per-run plots"
        >
          show detail
        </button>
      )}
      {detail && <div className="run-detail-tag">in per-run plots</div>}
    </th>
  );
}

export function ComparisonTable() {
  const [tall, setTall] = useState(false);
  const [info, setInfo] = useState<{ key: string; anchor: HTMLElement } | null>(null);
  // While a pass is partial the table keeps the last complete comparison (marked stale) under an
  // "n of m runs" note, and shows no best marks, rather than a shrunken table of the arrived runs.
  const partial = useAppState((s) => s.partial !== null);
  const output: PipelineOutput | null = useAppState((s) => (s.partial ? (s.completeOutput ?? s.output) : s.output));
  const current = useAppState((s) => s.outputScenario === s.scenario && s.partial === null);
  const selected = useAppState((s) => s.selectedRunKeys);
  if (!output) return <div className="panel-empty">No runs yet.</div>;
  const rows = output.comparison;
  const closeInfo = () => {
    const a = info?.anchor;
    setInfo(null);
    a?.focus();
  };
  const infoCol = info ? COMPARISON_COLUMNS.find((c) => c.key === info.key) : undefined;
  return (
    <div className={`comparison ${current ? '' : 'stale'} ${tall ? 'tall' : ''}`} data-testid="comparison">
      <div className="panel-head">
        Comparison{' '}
        <span className="muted">
          · {rows.length} runs · {partial ? <PartialNote what="comparison" inline /> : 'tick to plot'}
        </span>
        <button
          className="small push-right"
          onClick={() => setTall(!tall)}
          aria-pressed={tall}
          title={tall ? 'Give the plots their room back' : 'Show every metric without scrolling, over the plots'}
          data-testid="comparison-tall"
        >
          {tall ? 'shorter' : 'taller'}
        </button>
      </div>
      <div className="table-scroll" data-testid="comparison-scroll">
        <table className="data-table comparison-table">
          <colgroup>
            <col className="metric-col" />
            {rows.map((r) => (
              <col key={r.key} />
            ))}
          </colgroup>
          <thead>
            <tr>
              <th className="metric-head" scope="col">
                metric
              </th>
              {rows.map((r) => (
                <RunHeader key={r.key} out={output} rowKey={r.key} selected={selected} />
              ))}
            </tr>
          </thead>
          <tbody>
            {COMPARISON_COLUMNS.map((c) => {
              const best = partial ? undefined : output.best[c.key];
              const unit = unitOf(c);
              return (
                <tr key={c.key} data-metric={c.key}>
                  <th className="metric" scope="row">
                    <span className="metric-label">
                      {c.label}
                      {unit && <span className="unit"> {unit}</span>}
                    </span>
                    <button
                      className="info"
                      aria-label={`What is ${c.label}?`}
                      aria-expanded={info?.key === c.key}
                      title="Definition and source"
                      data-testid={`info-${c.key}`}
                      onClick={(e) => (info?.key === c.key ? closeInfo() : setInfo({ key: c.key, anchor: e.currentTarget }))}
                    >
                      i
                    </button>
                  </th>
                  {rows.map((r) => {
                    const run = output.runs.find((x) => x.key === r.key);
                    const isBest = best === r.key;
                    return (
                      <td
                        key={r.key}
                        className={`num ${c.key === 'status' ? 'status' : ''} ${isBest ? 'best' : ''} ${c.key === 'status' && r.verdict !== 'settled' ? 'bad' : ''}`}
                        data-best={isBest ? 'true' : undefined}
                      >
                        {cellText(c.key, r, run)}
                        {isBest && (
                          <span className="star" aria-label="best">
                            {' '}
                            ★
                          </span>
                        )}
                      </td>
                    );
                  })}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <dl className="mode-legend" data-testid="mode-legend">
        <dt>follows the plan</dt>
        <dd>{MODE_TEXT['follow-plan'].long}</dd>
        <dt>target at once</dt>
        <dd>{MODE_TEXT['step-target'].long}</dd>
        <dt>★ best</dt>
        <dd>{BEST_RULE} The i beside a metric gives its definition and source.</dd>
      </dl>
      {info && infoCol && <MetricInfo col={infoCol} anchor={info.anchor} onClose={closeInfo} />}
    </div>
  );
}
