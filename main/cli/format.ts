/**
 * Text tables for the terminal and CSV/JSON renderings of the plan and the comparison.
 */
import type { ComparisonRow, PlanSummary, BestMarks } from '../../app/engine/pipeline/types';
import { DEG_PER_RAD, MILLI_PER_SI } from '../../app/engine/units';
import { COMPARISON_COLUMNS } from '../../app/engine/pipeline/comparison';

export function table(headers: string[], rows: string[][]): string {
  const widths = headers.map((h, c) => Math.max(h.length, ...rows.map((r) => (r[c] ?? '').length)));
  const line = (cells: string[]) => cells.map((v, c) => (c === 0 ? v.padEnd(widths[c]!) : v.padStart(widths[c]!))).join('  ');
  return [line(headers), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}

export function planTable(plan: PlanSummary): string {
  const rows = plan.segments.map((s) => [
    `${s.index + 1}. ${s.label}`,
    s.feasible ? 'yes' : 'NO',
    (s.angleRad * DEG_PER_RAD).toFixed(2),
    s.feasible ? s.slewTimeS.toFixed(2) : '-',
    s.holdS.toFixed(1),
    s.feasible ? s.tStart.toFixed(2) : '-',
    s.feasible ? s.binding : '-',
    s.feasible ? (s.peakRateRadPerS * DEG_PER_RAD).toFixed(3) : '-',
    s.feasible ? pct(s.peakTorqueFraction) : '-',
    s.feasible ? pct(s.peakMomentumFraction) : '-',
  ]);
  const head = table(
    ['segment', 'feasible', 'angle deg', 'slew s', 'hold s', 'start s', 'binding', 'peak deg/s', 'torque', 'momentum'],
    rows,
  );
  const notes = plan.segments
    .map((s) => `  ${s.index + 1}. ${s.feasible ? '' : 'INFEASIBLE: '}${s.reason}${s.rollFree ? `\n     ${s.rollFree.summary}` : ''}`)
    .join('\n');
  const violated = plan.constraints?.clear === false;
  const verdict = plan.feasible
    ? `Plan feasible: total ${plan.totalTimeS.toFixed(2)} s (slews plus holds).`
    : violated
      ? 'Plan INFEASIBLE: the planned attitude violates an attitude constraint (see the reasons above).'
      : plan.segments.some((s) => !s.feasible && /window|pass|horizon/.test(s.reason))
        ? 'Plan INFEASIBLE: at least one target cannot be planned within its window or the orbit horizon (see the reasons above).'
        : 'Plan INFEASIBLE: at least one slew cannot be flown within the wheel limits (see the reasons above).';
  return `${head}\n\n${notes}${constraintLines(plan)}\n\n${verdict}`;
}

/** The plan's constraint check, one line per constraint: its smallest margin and when. */
function constraintLines(plan: PlanSummary): string {
  const r = plan.constraints;
  if (!r) return '';
  const lines = r.constraints.map(
    (c) =>
      `  ${c.kind} "${c.name}": ${c.intervals.length ? 'VIOLATED' : 'clear'}, smallest margin ${(c.minMarginRad * DEG_PER_RAD).toFixed(2)} deg at t = ${c.minAtS.toFixed(1)} s`,
  );
  return `\n\nAttitude constraints (planned reference):\n${lines.join('\n')}`;
}

function pct(x: number): string {
  return `${(100 * x).toFixed(1)}%`;
}

/** Text of one comparison cell (the table's units are in its headings). */
const CELL: Partial<Record<keyof ComparisonRow, (r: ComparisonRow) => string>> = {
  settleTimeS: (r) => (r.settleTimeS === null ? 'never' : r.settleTimeS.toFixed(1)),
  trackingErrorPeakDeg: (r) => r.trackingErrorPeakDeg.toPrecision(3),
  trackingErrorRmsDeg: (r) => r.trackingErrorRmsDeg.toPrecision(3),
  rotationTravelledDeg: (r) => r.rotationTravelledDeg.toFixed(1),
  shortestRotationDeg: (r) => r.shortestRotationDeg.toFixed(1),
  unwound: (r) => (r.unwound ? 'YES' : 'no'),
  jumps: (r) => String(r.jumps),
  chatterPerS: (r) => r.chatterPerS.toFixed(2),
  peakWheelTorqueFraction: (r) => pct(r.peakWheelTorqueFraction),
  peakWheelMomentumFraction: (r) => pct(r.peakWheelMomentumFraction),
  controlEffortNms: (r) => (r.controlEffortNms * MILLI_PER_SI).toFixed(2),
  finalErrorDeg: (r) => r.finalErrorDeg.toPrecision(3),
  monitorViolations: (r) => String(r.monitorViolations),
  constraintMarginDeg: (r) => (r.constraintMarginDeg === null ? '-' : r.constraintMarginDeg.toFixed(2)),
};

const TABLE_COLUMNS = COMPARISON_COLUMNS.filter((c) => c.key !== 'status');

export function comparisonTable(rows: readonly ComparisonRow[], best: BestMarks): string {
  const body = rows.map((r) => [
    `${r.label} [${r.mode}]`,
    r.status,
    ...TABLE_COLUMNS.map((c) => (CELL[c.key]?.(r) ?? String(r[c.key])) + (best[c.key] === r.key ? '*' : '')),
  ]);
  const heads = TABLE_COLUMNS.map((c) => (c.unit && c.unit !== '%' ? `${c.label} ${c.unit}` : c.label));
  return `${table(['controller [mode]', 'outcome', ...heads], body)}\n(* best in column: lowest value among the settled runs that kept every constraint, no mark on a tie)`;
}

/** What each column means and where that comes from (compare --help). */
export function comparisonDefinitions(): string {
  return COMPARISON_COLUMNS.map((c) => `  ${c.label}${c.unit ? ` [${c.unit}]` : ''}: ${c.definition} (${c.source})`).join('\n');
}

/** CSV column names, SI and units in the names. */
const CSV_NAMES: Partial<Record<keyof ComparisonRow, string>> = {
  controllerId: 'controller_id',
  label: 'label',
  mode: 'mode',
  verdict: 'verdict',
  status: 'outcome',
  settleTimeS: 'settle_time_s',
  trackingErrorPeakDeg: 'tracking_error_peak_deg',
  trackingErrorRmsDeg: 'tracking_error_rms_deg',
  rotationTravelledDeg: 'rotation_travelled_deg',
  shortestRotationDeg: 'shortest_rotation_deg',
  unwound: 'unwound',
  jumps: 'jumps',
  chatterPerS: 'chatter_per_s',
  peakWheelTorqueFraction: 'peak_wheel_torque_fraction',
  peakWheelMomentumFraction: 'peak_wheel_momentum_fraction',
  controlEffortNms: 'control_effort_Nms',
  finalErrorDeg: 'final_error_deg',
  monitorViolations: 'lyapunov_violations',
};

export function comparisonCsv(rows: readonly ComparisonRow[], caution: string): string {
  const cols: (keyof ComparisonRow)[] = ['controllerId', 'label', 'mode', 'verdict', ...COMPARISON_COLUMNS.map((c) => c.key)];
  const esc = (v: unknown) => {
    const s = v === null ? '' : String(v);
    return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  };
  // SI in the CSV: effort in N·m·s, fractions as fractions, angles in degrees as the names say.
  const header = cols.map((k) => CSV_NAMES[k] ?? k);
  return [`# ${caution}`, header.join(','), ...rows.map((r) => cols.map((k) => esc(r[k])).join(','))].join('\n') + '\n';
}
