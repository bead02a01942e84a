/**
 * Per-controller histograms of the study results as small SVG charts: one chart per quantity,
 * one bar colour per controller (grouped in each bin), the overflow slot at the right, counts of
 * runs on the y axis and the quantity with its unit on the x axis. Layout in histogramModel.ts.
 */
import type { StudySummary } from '../../engine/study';
import { PALETTE } from '../plots/series';
import { layoutHistogram, QUANTITIES, type QuantitySpec } from './histogramModel';

const W = 400;
const H = 168;

function HistogramChart({ summary, q }: { summary: StudySummary; q: QuantitySpec }) {
  const hists = summary.controllers.map((c) => c.histograms[q.key]);
  const names = summary.controllers.map((c) => c.label);
  const L = layoutHistogram(hists, names, q, { width: W, height: H, left: 40, bottom: 34, top: 8, right: 8 });
  const { plot } = L;
  return (
    <figure
      className="study-hist"
      data-testid={`hist-${q.key}`}
      data-max-count={L.maxCount}
      data-totals={L.totals.join(',')}
      title={q.help}
    >
      <figcaption>
        {q.title} <span className="unit">({q.unit})</span>
      </figcaption>
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`${q.title} histogram, runs per bin`}>
        {L.yTicks.map((t) => (
          <g key={t.value}>
            <line x1={plot.left} x2={plot.right} y1={t.y} y2={t.y} className="grid" />
            <text x={plot.left - 4} y={t.y} className="tick" textAnchor="end" dominantBaseline="middle">
              {t.value}
            </text>
          </g>
        ))}
        {L.bars.map((b) =>
          b.count > 0 ? (
            <rect
              key={`${b.controller}-${b.bin}`}
              className="bar"
              x={b.x}
              y={b.y}
              width={b.w}
              height={b.h}
              fill={PALETTE[b.controller % PALETTE.length]}
              data-count={b.count}
              data-controller={b.controller}
            >
              <title>{b.title}</title>
            </rect>
          ) : null,
        )}
        <line x1={L.separatorX} x2={L.separatorX} y1={plot.top} y2={plot.bottom} className="separator" />
        <line x1={plot.left} x2={plot.right} y1={plot.bottom} y2={plot.bottom} className="axis" />
        <line x1={plot.left} x2={plot.left} y1={plot.top} y2={plot.bottom} className="axis" />
        {L.xLabels.map((l, k) => (
          <text key={k} x={l.x} y={plot.bottom + 11} className="tick" textAnchor="middle">
            {l.text}
          </text>
        ))}
        <text x={L.overflow.x} y={plot.bottom + 11} className="tick overflow" textAnchor="middle">
          {L.overflow.text}
        </text>
        <text x={(plot.left + plot.right) / 2} y={H - 4} className="axis-title" textAnchor="middle">
          {q.title.toLowerCase()} ({q.unit})
        </text>
        <text
          x={10}
          y={(plot.top + plot.bottom) / 2}
          className="axis-title"
          textAnchor="middle"
          transform={`rotate(-90 10 ${(plot.top + plot.bottom) / 2})`}
        >
          runs
        </text>
      </svg>
    </figure>
  );
}

export function Histograms({ summary }: { summary: StudySummary }) {
  return (
    <div className="study-hists" data-testid="study-histograms">
      {QUANTITIES.map((q) => (
        <HistogramChart key={q.key} summary={summary} q={q} />
      ))}
    </div>
  );
}

/** Controller colour key shared by the histograms and the tables. */
export function ControllerKey({ summary }: { summary: StudySummary }) {
  return (
    <div className="study-key">
      {summary.controllers.map((c, i) => (
        <span key={c.controllerId} className="study-key-item">
          <span className="swatch" style={{ background: PALETTE[i % PALETTE.length] }} />
          {c.label}
        </span>
      ))}
    </div>
  );
}
