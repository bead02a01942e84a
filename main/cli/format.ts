/**
 * Text tables for the terminal and CSV/JSON renderings of the plan and the comparison.
 */
import type { ComparisonRow, PlanSummary, BestMarks } from '../../app/engine/pipeline/types';
import { DEG_PER_RAD } from '../../app/engine/units';

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
  const notes = plan.segments.map((s) => `  ${s.index + 1}. ${s.feasible ? '' : 'INFEASIBLE: '}${s.reason}`).join('\n');
  const verdict = plan.feasible
    ? `Plan feasible: total ${plan.totalTimeS.toFixed(2)} s (slews plus holds).`
    : 'Plan INFEASIBLE: at least one slew cannot be flown within the wheel limits (see the reasons above).';
  return `${head}\n\n${notes}\n\n${verdict}`;
}

function pct(x: number): string {
  return `${(100 * x).toFixed(1)}%`;
}

const COLUMNS: { key: keyof ComparisonRow; head: string; fmt: (r: ComparisonRow) => string }[] = [
  { key: 'settleTimeS', head: 'settle s', fmt: (r) => (r.settleTimeS === null ? 'never' : r.settleTimeS.toFixed(1)) },
  { key: 'rotationTravelledDeg', head: 'travel deg', fmt: (r) => r.rotationTravelledDeg.toFixed(1) },
  { key: 'shortestRotationDeg', head: 'shortest deg', fmt: (r) => r.shortestRotationDeg.toFixed(1) },
  { key: 'unwound', head: 'unwound', fmt: (r) => (r.unwound ? 'YES' : 'no') },
  { key: 'jumps', head: 'jumps', fmt: (r) => String(r.jumps) },
  { key: 'chatterPerS', head: 'chatter /s', fmt: (r) => r.chatterPerS.toFixed(2) },
  { key: 'peakWheelTorqueFraction', head: 'peak torque', fmt: (r) => pct(r.peakWheelTorqueFraction) },
  { key: 'peakWheelMomentumFraction', head: 'peak mom.', fmt: (r) => pct(r.peakWheelMomentumFraction) },
  { key: 'controlEffortNms', head: 'effort mN·m·s', fmt: (r) => (r.controlEffortNms * 1e3).toFixed(2) },
  { key: 'finalErrorDeg', head: 'final err deg', fmt: (r) => r.finalErrorDeg.toPrecision(3) },
  { key: 'monitorFlags', head: 'W flags', fmt: (r) => String(r.monitorFlags) },
];

export function comparisonTable(rows: readonly ComparisonRow[], best: BestMarks): string {
  const body = rows.map((r) => [`${r.label} [${r.mode}]`, r.status, ...COLUMNS.map((c) => c.fmt(r) + (best[c.key] === r.key ? '*' : ''))]);
  return `${table(['controller [mode]', 'run', ...COLUMNS.map((c) => c.head)], body)}\n(* best in column)`;
}

export function comparisonCsv(rows: readonly ComparisonRow[], caution: string): string {
  const keys: (keyof ComparisonRow)[] = [
    'controllerId',
    'label',
    'mode',
    'status',
    'settleTimeS',
    'rotationTravelledDeg',
    'shortestRotationDeg',
    'unwound',
    'jumps',
    'chatterPerS',
    'peakWheelTorqueFraction',
    'peakWheelMomentumFraction',
    'controlEffortNms',
    'finalErrorDeg',
    'monitorFlags',
  ];
  const units: Record<string, string> = {
    settleTimeS: 'settle_time_s',
    rotationTravelledDeg: 'rotation_travelled_deg',
    shortestRotationDeg: 'shortest_rotation_deg',
    chatterPerS: 'chatter_per_s',
    peakWheelTorqueFraction: 'peak_wheel_torque_fraction',
    peakWheelMomentumFraction: 'peak_wheel_momentum_fraction',
    controlEffortNms: 'control_effort_Nms',
    finalErrorDeg: 'final_error_deg',
    monitorFlags: 'lyapunov_monitor_flags',
  };
  const esc = (v: unknown) => {
    const s = v === null ? '' : String(v);
    return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  };
  return (
    [`# ${caution}`, keys.map((k) => units[k] ?? k).join(','), ...rows.map((r) => keys.map((k) => esc(r[k])).join(','))].join('\n') + '\n'
  );
}
