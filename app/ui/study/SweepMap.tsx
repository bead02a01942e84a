/**
 * One controller's sweep map (sweepMapModel.ts): a tile per grid cell coloured by its settle
 * share (HTML tiles, so the share printed in a tile is real text on its own background), the
 * measured boundary at the chosen level and the published theory lines drawn over them (SVG, no
 * pointer events), value ticks on both axes. Hovering a tile shows its numbers; clicking it
 * opens the cell's worst case for this controller as a normal run.
 */
import { useMemo, useState } from 'react';
import type { ShareReport } from '../../engine/math/stats';
import type { SweepCell, SweepResult } from '../../engine/study';
import { fmt, pct } from '../format';
import {
  boundaryPixel,
  boundarySegments,
  mapLayout,
  mapTiles,
  polylineData,
  shareColour,
  rgbText,
  theoryPath,
  tileCentre,
  type MapTile,
} from './sweepMapModel';

const MARGIN = { left: 64, right: 14, top: 12, bottom: 46 };
const PLOT_W = 360;
const PLOT_H_2D = 264;
const PLOT_H_STRIP = 56;

/** "42 % (30–55 %)" with the 95 % Wilson interval, "0 % (≤ 14 %)" at zero events (rule of three). */
export function shareWithInterval(r: ShareReport): string {
  if (r.of === 0) return '—';
  if (r.ruleOfThreeHigh !== null) return `${pct(r.share)} (≤ ${pct(r.ruleOfThreeHigh)})`;
  return `${pct(r.share)} (${pct(r.low)}–${pct(r.high)})`;
}

const valueText = (v: number, unit: string) => `${fmt(v, 4)}${unit && unit !== '×' ? ` ${unit}` : unit === '×' ? '×' : ''}`;

function CellTip({
  result,
  cell,
  ci,
  tile,
  plotWidth,
}: {
  result: SweepResult;
  cell: SweepCell;
  ci: number;
  tile: MapTile;
  plotWidth: number;
}) {
  const c = cell.controllers[ci];
  const axes = result.info.def.axes;
  if (!c) return null;
  // none settled: no settle time; some settled but the percentile did not: beyond the case duration
  const settle = (v: number | null) =>
    v !== null ? `${fmt(v, 3)} s` : c.settled.count === 0 ? '—' : `> ${fmt(result.info.durationS, 4)} s`;
  // beside the tile, on the side with room (the plot is about 440 px wide, the tip about 300 px)
  const right = tile.x + tile.width / 2 < plotWidth / 2;
  const style = right ? { left: tile.x + tile.width + 6 } : { left: tile.x - 6, transform: 'translateX(-100%)' };
  return (
    <div className="sweep-tip" style={{ ...style, top: Math.max(0, tile.y - 4) }} data-testid="sweep-tip">
      <div className="tip-head">
        cell {cell.index} · {axes.map((a, k) => `${a.label} ${valueText(cell.values[k]!, a.unit)}`).join(' · ')}
      </div>
      <table>
        <tbody>
          <tr>
            <th>settled</th>
            <td data-testid="tip-settled">{shareWithInterval(c.settled)}</td>
          </tr>
          <tr>
            <th>stalled</th>
            <td>{shareWithInterval(c.stalled)}</td>
          </tr>
          <tr>
            <th>unwound</th>
            <td>{shareWithInterval(c.unwound)}</td>
          </tr>
          <tr>
            <th>chattered</th>
            <td>{shareWithInterval(c.chattered)}</td>
          </tr>
          <tr>
            <th>settle time</th>
            <td>
              median {settle(c.settleMedianS)} · p95 {settle(c.settleP95S)}
            </td>
          </tr>
        </tbody>
      </table>
      <div className="tip-foot">
        {c.flyable} of {cell.casesDone} cases flyable · 95 % intervals (Wilson; rule of three at zero) ·{' '}
        {c.worstCase === null ? 'no case to open' : `click to open worst case ${c.worstCase}`}
      </div>
    </div>
  );
}

export function SweepMap({
  result,
  ci,
  onOpen,
  disabled,
}: {
  result: SweepResult;
  /** Controller index in result.info.controllers. */
  ci: number;
  onOpen: (cellIndex: number, controllerId: string) => void;
  disabled: boolean;
}) {
  const ctrl = result.info.controllers[ci]!;
  const axes = result.info.def.axes;
  const twoD = axes.length === 2;
  const plotH = twoD ? PLOT_H_2D : PLOT_H_STRIP;
  const W = MARGIN.left + PLOT_W + MARGIN.right;
  const H = MARGIN.top + plotH + MARGIN.bottom;
  const [hover, setHover] = useState<number | null>(null);
  const geo = useMemo(() => {
    const layout = mapLayout(
      axes.map((a) => a.values),
      { left: MARGIN.left, top: MARGIN.top, width: PLOT_W, height: plotH },
    );
    const tiles = mapTiles(layout, result.cells, ci);
    const points = result.boundaries[ci]?.points ?? [];
    const segments = boundarySegments(layout, points);
    const markers = twoD ? points.map((p) => boundaryPixel(layout, p)) : [];
    const theory = result.theory.filter((t) => t.controllerId === ctrl.id).map((t) => theoryPath(layout, t));
    return { layout, tiles, segments, markers, theory };
  }, [axes, plotH, result, ci, ctrl.id, twoD]);
  const { layout, tiles, segments, markers, theory } = geo;
  const showText = layout.x.step >= 40 && Math.abs(layout.y?.step ?? plotH) >= 20;
  const hovered = hover === null ? null : tiles.find((t) => t.index === hover);
  const hoveredCell = hover === null ? null : result.cells.find((c) => c.index === hover);
  const pointsCount = result.boundaries[ci]?.points.length ?? 0;
  return (
    <figure
      className="sweep-map"
      data-testid={`sweep-map-${ctrl.id}`}
      data-controller={ctrl.id}
      data-tiles={tiles.length}
      data-boundary-points={pointsCount}
      data-boundary-segments={segments.length}
      data-theory={theory
        .filter((t) => t.points.length > 1)
        .map((t) => t.label)
        .join('|')}
    >
      <figcaption className="study-card-head">
        {ctrl.label} <span className="muted">· {ctrl.law} · settle share per cell</span>
      </figcaption>
      <div className="sweep-plot" style={{ width: W, height: H }} onMouseLeave={() => setHover(null)}>
        {/* tiles not yet run: a dashed frame of the whole grid */}
        <div
          className="sweep-frame"
          style={{ left: layout.box.left, top: layout.box.top, width: layout.box.width, height: layout.box.height }}
        />
        {tiles.map((t) => (
          <button
            key={t.index}
            type="button"
            className={`sweep-tile ${t.share === null ? 'empty' : ''}`}
            style={{ left: t.x, top: t.y, width: t.width, height: t.height, background: t.fill, color: t.text }}
            onMouseEnter={() => setHover(t.index)}
            onFocus={() => setHover(t.index)}
            onClick={() => onOpen(t.index, ctrl.id)}
            disabled={disabled}
            data-testid={`sweep-cell-${ctrl.id}-${t.index}`}
            data-share={t.share ?? ''}
            aria-label={`cell ${t.index}: ${t.share === null ? 'no flyable case' : `${pct(t.share)} settled`}; open its worst case`}
          >
            {showText && (t.share === null ? '—' : pct(t.share))}
          </button>
        ))}
        <svg className="sweep-lines" width={W} height={H} aria-hidden="true">
          {segments.map((s, k) => (
            <g key={`b${k}`} className="boundary">
              <line x1={s.a.x} y1={s.a.y} x2={s.b.x} y2={s.b.y} className="casing" />
              <line x1={s.a.x} y1={s.a.y} x2={s.b.x} y2={s.b.y} className="core" />
            </g>
          ))}
          {markers.map((p, k) => (
            <circle key={`m${k}`} cx={p.x} cy={p.y} r={3.5} className="boundary-marker" />
          ))}
          {theory.map((t, k) =>
            t.points.length > 1 ? (
              <g key={`t${k}`} className="theory" data-testid="sweep-theory-line">
                <path d={polylineData(t.points)} className="casing" />
                <path d={polylineData(t.points)} className="core" />
              </g>
            ) : null,
          )}
        </svg>
        {theory.map((t, k) => {
          const end = t.points[t.points.length - 1];
          if (!end || t.points.length < 2) return null;
          return (
            <span
              key={`tl${k}`}
              className="sweep-theory-label"
              style={{ left: Math.min(end.x + 4, W - 60), top: Math.max(0, end.y - 8) }}
              title={t.source}
            >
              {t.label}
            </span>
          );
        })}
        {/* ticks: every value on a short axis, else about eight */}
        {axes[0]!.values.map((v, k) =>
          k % Math.max(1, Math.ceil(axes[0]!.values.length / 8)) === 0 ? (
            <span
              key={`x${k}`}
              className="sweep-tick x"
              style={{ left: tileCentre(layout.x, k), top: layout.box.top + layout.box.height + 3 }}
            >
              {fmt(v, 3)}
            </span>
          ) : null,
        )}
        <span className="sweep-axis-title x" style={{ left: layout.box.left, width: layout.box.width, top: H - 22 }}>
          {axes[0]!.label}
          {axes[0]!.unit && axes[0]!.unit !== '×' ? `, ${axes[0]!.unit}` : axes[0]!.unit === '×' ? ' (×)' : ''}
        </span>
        {twoD &&
          layout.y &&
          axes[1]!.values.map((v, k) =>
            k % Math.max(1, Math.ceil(axes[1]!.values.length / 8)) === 0 ? (
              <span key={`y${k}`} className="sweep-tick y" style={{ left: 20, width: MARGIN.left - 26, top: tileCentre(layout.y!, k) - 9 }}>
                {fmt(v, 3)}
              </span>
            ) : null,
          )}
        {twoD && (
          <span className="sweep-axis-title y" style={{ left: 0, top: layout.box.top + layout.box.height / 2 }}>
            {axes[1]!.label}
            {axes[1]!.unit && axes[1]!.unit !== '×' ? `, ${axes[1]!.unit}` : axes[1]!.unit === '×' ? ' (×)' : ''}
          </span>
        )}
        {hovered && hoveredCell && <CellTip result={result} cell={hoveredCell} ci={ci} tile={hovered} plotWidth={W} />}
      </div>
      {theory.filter((t) => t.points.length > 1).length > 0 && (
        <div className="sweep-theory-caption" data-testid={`sweep-theory-caption-${ctrl.id}`}>
          {theory
            .filter((t) => t.points.length > 1)
            .map((t, k) => (
              <div key={k}>
                <span className="key theory" /> <strong>{t.label}</strong> — {t.source}
              </div>
            ))}
        </div>
      )}
    </figure>
  );
}

/** The colour scale and the line keys, shared by all maps of a sweep. */
export function SweepLegend({ levelPct }: { levelPct: number }) {
  return (
    <div className="sweep-legend" data-testid="sweep-legend">
      <span className="ramp-block">
        settled share 0 %
        <span className="ramp">
          {Array.from({ length: 24 }, (_, k) => (
            <span key={k} style={{ background: rgbText(shareColour(k / 23)) }} />
          ))}
        </span>
        100 %
      </span>
      <span className="legend-item">
        <span className="key boundary" /> measured boundary: settle share = {fmt(levelPct, 3)} % (linear between cells)
      </span>
      <span className="legend-item">
        <span className="key theory" /> published theory line
      </span>
      <span className="legend-item">
        <span className="key nocase" /> no flyable case
      </span>
    </div>
  );
}
