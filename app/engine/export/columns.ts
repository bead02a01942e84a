/**
 * The per-sample table shared by the CSV and JSON exports: column names carry their units
 * (SI unless the name says otherwise), plus sample selection for decimation and the number
 * format (shortest round-trip decimal, never "-0", never NaN — the trace is checked first).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { RunTrace } from '../sim/types';
import { DEG_PER_RAD } from '../units';

export interface Column {
  name: string;
  /** Unit for people ('' for dimensionless, 'count' for counters). */
  unit: string;
  description: string;
  integer: boolean;
  /**
   * NaN means "not defined at this sample" (a constraint outside its window): the CSV leaves the
   * cell empty and the JSON writes null. Any other column must be finite everywhere.
   */
  undefinedAsNaN?: boolean;
  get(trace: RunTrace, k: number): number;
}

const XYZ = ['x', 'y', 'z'] as const;
const XYZW = ['x', 'y', 'z', 'w'] as const;

function vecColumns(
  prefix: string,
  suffix: string,
  unit: string,
  what: string,
  channel: 'omega' | 'omegaRef' | 'torqueCmdBody' | 'torqueBody',
): Column[] {
  return XYZ.map((c, i) => ({
    name: `${prefix}_${c}${suffix}`,
    unit,
    description: `${what}, body ${c.toUpperCase()}`,
    integer: false,
    get: (tr: RunTrace, k: number) => tr[channel][3 * k + i]!,
  }));
}

function quatColumns(prefix: string, what: string, channel: 'q' | 'qRef'): Column[] {
  return XYZW.map((c, i) => ({
    name: `${prefix}_${c}`,
    unit: '',
    description: `${what}, component ${c}`,
    integer: false,
    get: (tr: RunTrace, k: number) => tr[channel][4 * k + i]!,
  }));
}

function wheelColumns(
  nW: number,
  key: string,
  unit: string,
  what: string,
  channel: 'wheelTorqueCmd' | 'wheelTorque' | 'wheelTorqueNet' | 'hWheel',
): Column[] {
  const out: Column[] = [];
  for (let i = 0; i < nW; i++) {
    out.push({
      name: `wheel${i + 1}_${key}`,
      unit,
      description: `${what}, wheel ${i + 1}`,
      integer: false,
      get: (tr: RunTrace, k: number) => tr[channel][nW * k + i]!,
    });
  }
  return out;
}

function scalar(
  name: string,
  unit: string,
  description: string,
  channel: 'logic' | 'potential' | 'potentialMin' | 'gap' | 'lyapunov',
): Column {
  return { name, unit, description, integer: false, get: (tr, k) => tr[channel][k]! };
}

/** Columns in export order for an array of `nWheels` wheels. */
export function traceColumns(nWheels: number): Column[] {
  return [
    { name: 't_s', unit: 's', description: 'time from the scenario epoch', integer: false, get: (tr, k) => tr.t[k]! },
    { name: 'j', unit: 'count', description: 'hybrid jump counter (logic jumps)', integer: true, get: (tr, k) => tr.j[k]! },
    {
      name: 'segment',
      unit: 'count',
      description: 'maneuver segment index (target number, from 0)',
      integer: true,
      get: (tr, k) => tr.segment[k]!,
    },
    ...quatColumns('q', 'attitude qInertialFromBody', 'q'),
    ...vecColumns('omega', '_radps', 'rad/s', 'body rate', 'omega'),
    ...quatColumns('qref', 'reference attitude qInertialFromBody', 'qRef'),
    ...vecColumns('omegaref', '_radps', 'rad/s', 'reference body rate', 'omegaRef'),
    ...vecColumns('torque_cmd', '_Nm', 'N m', 'commanded body torque', 'torqueCmdBody'),
    ...vecColumns('torque', '_Nm', 'N m', 'delivered body torque', 'torqueBody'),
    ...wheelColumns(nWheels, 'torque_cmd_Nm', 'N m', 'commanded motor torque (allocation, before the wheel limits)', 'wheelTorqueCmd'),
    ...wheelColumns(nWheels, 'torque_motor_Nm', 'N m', 'delivered motor torque (after the limits; the period average)', 'wheelTorque'),
    ...wheelColumns(
      nWheels,
      'torque_net_Nm',
      'N m',
      'net rotor torque: delivered motor torque minus bearing friction (= dh/dt)',
      'wheelTorqueNet',
    ),
    ...wheelColumns(nWheels, 'h_Nms', 'N m s', 'axial wheel momentum', 'hWheel'),
    scalar('logic', '', 'controller logic value (h in {-1, 1}, synergistic index, 0 for smooth laws)', 'logic'),
    {
      name: 'error_angle_deg',
      unit: 'deg',
      description: 'rotation angle from the attitude to the reference',
      integer: false,
      get: (tr, k) => tr.errorAngle[k]! * DEG_PER_RAD,
    },
    scalar('potential', '', 'active potential V_q (0 where the law has none)', 'potential'),
    scalar('potential_min', '', 'minimum of the potential family', 'potentialMin'),
    scalar('synergy_gap', '', 'synergy gap V_q - min_p V_p', 'gap'),
    scalar('lyapunov', 'J', 'Lyapunov value W', 'lyapunov'),
  ];
}

/** Shortest round-trip decimal; 0 for −0. */
export function formatNumber(x: number): string {
  return x === 0 ? '0' : String(x);
}

/**
 * Sample indices to export. Without a rate: all. With `sampleRateHz`: the first sample at or after
 * each point of the grid t0 + m/sampleRateHz, and always the last sample.
 */
export function selectSamples(trace: RunTrace, sampleRateHz?: number): Result<Int32Array> {
  const n = trace.n;
  if (sampleRateHz === undefined) return ok(Int32Array.from({ length: n }, (_, k) => k));
  if (typeof sampleRateHz !== 'number' || !Number.isFinite(sampleRateHz) || sampleRateHz <= 0) {
    const e: Issue = {
      path: 'options.sampleRateHz',
      rule: 'positive',
      message: `options.sampleRateHz must be a finite number > 0 (got ${String(sampleRateHz)})`,
    };
    return fail([e]);
  }
  const dt = 1 / sampleRateHz;
  const t0 = trace.t[0]!;
  const keep: number[] = [0];
  let next = t0 + dt;
  for (let k = 1; k < n; k++) {
    const t = trace.t[k]!;
    // Relative slack so a sample that sits on the grid up to round-off is taken.
    if (t >= next - 1e-9 * Math.max(1, Math.abs(next))) {
      keep.push(k);
      next = t0 + (Math.floor((t - t0) / dt + 1e-9) + 1) * dt;
    }
  }
  if (keep[keep.length - 1] !== n - 1) keep.push(n - 1);
  return ok(Int32Array.from(keep));
}
