/**
 * A sweep's tables: cells.csv (one row per cell and controller) and sweep.json (the definition,
 * the controllers, every finished cell and the boundaries). Both are pure functions of the
 * result, so the same sweep gives the same bytes whatever the worker count.
 */
import type { ShareReport } from '../math/stats';
import type { SweepResult } from './sweepRun';

export const SWEEP_FORMAT = 'slewsmith-sweep';
export const SWEEP_VERSION = 1;

const num = (x: number | null) => (x === null ? '' : String(x));

function shareCols(r: ShareReport): string[] {
  return [String(r.count), String(r.share), String(r.low), String(r.high), num(r.ruleOfThreeHigh)];
}

/** cells.csv: a header line, then one row per finished cell and controller (cell order, then controller order). */
export function sweepCellsCsv(r: SweepResult): string {
  const axes = r.info.def.axes.map((a) => a.parameter);
  const shareHead = (k: string) => [`${k}_count`, `${k}_share`, `${k}_low95`, `${k}_high95`, `${k}_rule_of_three_high`];
  const head = [
    'cell',
    ...axes.map((a) => `${a}_value`),
    'cell_seed',
    'controller',
    'cases',
    'flyable',
    ...shareHead('settled'),
    ...shareHead('stalled'),
    ...shareHead('unwound'),
    ...shareHead('chattered'),
    'settle_median_s',
    'settle_p95_s',
    'worst_case',
  ];
  const rows = r.cells.flatMap((c) =>
    c.controllers.map((x) =>
      [
        String(c.index),
        ...c.values.map(String),
        String(c.seed),
        x.controllerId,
        String(c.casesDone),
        String(x.flyable),
        ...shareCols(x.settled),
        ...shareCols(x.stalled),
        ...shareCols(x.unwound),
        ...shareCols(x.chattered),
        num(x.settleMedianS),
        num(x.settleP95S),
        num(x.worstCase),
      ].join(','),
    ),
  );
  return [head.join(','), ...rows].join('\n') + '\n';
}

/** sweep.json: everything a map view needs, in a fixed key order. */
export function sweepJson(r: SweepResult, caution: string): string {
  const i = r.info;
  return (
    JSON.stringify(
      {
        format: SWEEP_FORMAT,
        version: SWEEP_VERSION,
        caution,
        scenarioName: i.scenarioName,
        seed: i.def.seed,
        runsPerCell: i.def.runs,
        durationS: i.durationS,
        level: i.def.level,
        axes: i.def.axes,
        controllers: i.controllers,
        cellsTotal: i.cells,
        cellsDone: r.cells.length,
        complete: r.complete,
        cells: r.cells,
        boundaries: r.boundaries,
        theory: r.theory,
      },
      null,
      2,
    ) + '\n'
  );
}
