/**
 * An independent recomputation of every comparison column from a run's exports: the CSV timeline
 * (parsed here, by this file's own reader) and, for what a per-sample table cannot carry, the
 * JSON export of the same run (segment targets, the settings the metrics used, the jump events
 * with W before and after, how the run ended).
 *
 * Written from the column definitions (app/engine/pipeline/comparison.ts COMPARISON_COLUMNS and
 * the definition comments in app/engine/metrics/*.ts), not from the engine's metric code, and
 * importing none of it: the formulas below are this file's own (a different angle formula, the
 * 4-D inner product for the error quaternion's scalar part, and plain loops), so an error in
 * one implementation shows up as a disagreement with the other.
 *
 * Not recomputable from the exports, and taken from the JSON as given:
 * - the monitor's noise energy (monitor.ts: the law's own W evaluated at a 3σ noise state; the
 *   export carries W along the run but not the law's W as a function of the state);
 * - a law's promised decrease per jump (4·k_p·δ or k_R·δ from the law's internal gains);
 * - whether a law picks a lift (a property of the law, exported per run).
 * Recomputable only from an export of EVERY sample (no --rate decimation): the integrals, the
 * peaks, the settle instant and the chatter count all need the samples the run produced.
 */
import Quaternion from 'quaternion';

// ---------------------------------------------------------------------------------------------
// Reading the exports

export interface CsvTable {
  /** The `# ` comment lines, without the marker. */
  comments: string[];
  names: string[];
  /** Column name → values, one per data row. */
  columns: Map<string, Float64Array>;
  rows: number;
  /** Fields whose text does not read back to the same text (a number not in shortest round-trip form). */
  nonCanonical: string[];
}

/** Parses the CSV export: comment lines, one header row, then numbers only (`.` decimal mark, `,` separator). */
export function parseCsv(text: string): CsvTable {
  const lines = text.split(/\r?\n/);
  if (lines[lines.length - 1] === '') lines.pop();
  const comments: string[] = [];
  let i = 0;
  while (i < lines.length && lines[i]!.startsWith('#')) comments.push(lines[i++]!.replace(/^# ?/, ''));
  const names = (lines[i++] ?? '').split(',');
  const body = lines.slice(i);
  const data = names.map(() => new Float64Array(body.length));
  const nonCanonical: string[] = [];
  body.forEach((line, r) => {
    const fields = line.split(',');
    if (fields.length !== names.length) throw new Error(`CSV row ${r + 1} has ${fields.length} fields, header has ${names.length}`);
    fields.forEach((f, c) => {
      const x = Number(f);
      if (f.trim() === '' || !Number.isFinite(x)) throw new Error(`CSV row ${r + 1}, ${names[c]}: "${f}" is not a finite number`);
      // ECMA-262 Number::toString gives the shortest decimal that reads back to the same double, so
      // a field written that way reads back to itself (ECMAScript spec, Number.prototype.toString).
      if (String(x) !== f && nonCanonical.length < 5) nonCanonical.push(`row ${r + 1} ${names[c]}: ${f}`);
      data[c]![r] = x;
    });
  });
  return { comments, names, columns: new Map(names.map((n, c) => [n, data[c]!])), rows: body.length, nonCanonical };
}

export interface WheelLimits {
  torqueNm: number[];
  momentumNms: number[];
}

/** The per-wheel limits from the CSV's `wheel limits:` comment line ("1: axis [..], torque T N m, momentum H N m s; 2: …"). */
export function wheelLimitsFromCsv(t: CsvTable): WheelLimits {
  const line = t.comments.find((c) => c.startsWith('wheel limits:'));
  if (!line) throw new Error('the CSV has no "wheel limits:" line');
  const torqueNm: number[] = [];
  const momentumNms: number[] = [];
  const re = /(\d+): axis \[[^\]]*\], torque (\S+) N m, momentum (\S+) N m s/g;
  for (const m of line.matchAll(re)) {
    if (Number(m[1]) !== torqueNm.length + 1) throw new Error(`wheel limits out of order at wheel ${m[1]}`);
    torqueNm.push(Number(m[2]));
    momentumNms.push(Number(m[3]));
  }
  return { torqueNm, momentumNms };
}

/** What this file reads of the JSON export (the rest of the document is not needed). */
export interface RunJson {
  resolved: { targets: { label: string; qInertialFromBody: number[] }[] };
  wheels: { maxTorqueNm: number[]; maxMomentumNms: number[] };
  jumpEvents: { t: number; j: number; lyapunovBefore?: number; lyapunovAfter?: number }[];
  metricInputs: {
    settleAngleRad: number;
    settleRateRadPerS: number;
    chatterWindowS: number;
    chatterFloorNm: number;
    plannedSwitchTimesS: number[];
    boundedNoiseEta: number;
    liftDependent: boolean;
    unwindMinExtraRad: number;
    liftDecidedEta: number;
    monitor: { relTol: number; absTol: number; noiseEnergy: number; jumpDecrease: number };
  };
  outcome: { status: string; message: string };
  samples: { count: number; ofTrace: number; sampleRateHz: number | null };
}

// ---------------------------------------------------------------------------------------------
// Attitude helpers (own formulas)

type Q = readonly [number, number, number, number];

function quatAt(c: Map<string, Float64Array>, prefix: 'q' | 'qref', k: number): Q {
  return [c.get(`${prefix}_x`)![k]!, c.get(`${prefix}_y`)![k]!, c.get(`${prefix}_z`)![k]!, c.get(`${prefix}_w`)![k]!];
}

/**
 * Rotation angle between two attitudes given as unit quaternions (either sign): with α the angle
 * between them as 4-vectors taken on the same side (p·q ≥ 0), the rotation angle is 2α
 * (θ = 2·arccos|p·q|, the inner-product metric on unit quaternions; Huynh, J. Math. Imaging Vis.
 * 35(2), 2009 — from memory), and α = 2·atan2(|q − p|, |q + p|) for unit vectors, which stays
 * accurate near 0 and π where arccos does not (W. Kahan's angle formula — from memory).
 */
export function rotationAngle(p: Q, q: Q): number {
  const s = p[0] * q[0] + p[1] * q[1] + p[2] * q[2] + p[3] * q[3] < 0 ? -1 : 1;
  let dm = 0,
    dp = 0;
  for (let i = 0; i < 4; i++) {
    dm += (q[i]! - s * p[i]!) ** 2;
    dp += (q[i]! + s * p[i]!) ** 2;
  }
  return 4 * Math.atan2(Math.sqrt(dm), Math.sqrt(dp));
}

/**
 * Scalar part η of the error quaternion q_target* ⊗ q (Hamilton product), computed with the
 * `quaternion` npm package (scalar-first constructor: new Quaternion(w, x, y, z); an outside
 * reference library for the product and the conjugate).
 */
export function errorEta(target: Q, q: Q): number {
  const qt = new Quaternion(target[3], target[0], target[1], target[2]);
  const qq = new Quaternion(q[3], q[0], q[1], q[2]);
  return qt.conjugate().mul(qq).w;
}

const norm3 = (c: Map<string, Float64Array>, prefix: string, suffix: string, k: number): number =>
  Math.hypot(c.get(`${prefix}_x${suffix}`)![k]!, c.get(`${prefix}_y${suffix}`)![k]!, c.get(`${prefix}_z${suffix}`)![k]!);

/** ∫ f dt by the trapezoid rule over samples lo..hi (inclusive). */
function trapezoid(t: Float64Array, f: (k: number) => number, lo: number, hi: number): number {
  let sum = 0;
  for (let k = lo + 1; k <= hi; k++) sum += ((f(k - 1) + f(k)) / 2) * (t[k]! - t[k - 1]!);
  return sum;
}

// ---------------------------------------------------------------------------------------------
// The recomputation

export interface SegmentRecomputed {
  segment: number;
  first: number;
  last: number;
  settleTimeS: number | null;
  shortestRad: number;
  eta0: number;
  etaEnd: number;
  longWay: boolean;
  unwound: boolean;
}

export interface Recomputed {
  verdict: 'settled' | 'unsettled' | 'failed';
  status: string;
  settleTimeS: number | null;
  trackingErrorPeakRad: number;
  trackingErrorRmsRad: number;
  rotationTravelledRad: number;
  shortestRotationRad: number;
  unwound: boolean;
  jumps: number;
  chatterPerS: number;
  chatterReversals: number;
  peakWheelTorqueFraction: number;
  peakWheelMomentumFraction: number;
  controlEffortNms: number;
  finalErrorRad: number;
  monitorViolations: number;
  segments: SegmentRecomputed[];
  /** Per-sample angle between attitude and reference, rad (for the cross-check with error_angle_deg). */
  trackingAngles: Float64Array;
}

/** Segments: maximal runs of equal `segment` values, in order. */
function segmentRuns(seg: Float64Array): { first: number; last: number }[] {
  const out: { first: number; last: number }[] = [];
  let first = 0;
  for (let k = 1; k <= seg.length; k++)
    if (k === seg.length || seg[k] !== seg[first]) {
      out.push({ first, last: k - 1 });
      first = k;
    }
  return out;
}

/**
 * One segment against its target (metrics/segments.ts definitions): the settle instant is the
 * first sample from which every later sample of the segment has the angle to the target AND the
 * body rate magnitude strictly below the thresholds; settle time = that instant − the segment's
 * first sample time, null when the segment's last sample is outside. Long way: the error
 * quaternion's scalar part ends with the opposite sign to its start, once the end is decided
 * (|η_end| ≥ liftDecidedEta). Unwound: went the long way, the long way (2π − θ₀) is at least
 * unwindMinExtraRad longer than the short way θ₀, and the start is outside the noise band, |η₀| ≥ ē.
 */
function segmentOf(c: Map<string, Float64Array>, first: number, last: number, target: Q, mi: RunJson['metricInputs']): SegmentRecomputed {
  const t = c.get('t_s')!;
  let settledFrom = first;
  for (let k = first; k <= last; k++) {
    const inside = rotationAngle(target, quatAt(c, 'q', k)) < mi.settleAngleRad && norm3(c, 'omega', '_radps', k) < mi.settleRateRadPerS;
    if (!inside) settledFrom = k + 1;
  }
  const settleTimeS = settledFrom <= last ? t[settledFrom]! - t[first]! : null;
  const shortestRad = rotationAngle(target, quatAt(c, 'q', first));
  const eta0 = errorEta(target, quatAt(c, 'q', first));
  const etaEnd = errorEta(target, quatAt(c, 'q', last));
  const longWay = Math.abs(etaEnd) >= mi.liftDecidedEta && etaEnd * eta0 < 0;
  const longerBy = 2 * Math.PI - shortestRad - shortestRad;
  const unwound = longWay && longerBy >= mi.unwindMinExtraRad && Math.abs(eta0) >= mi.boundedNoiseEta;
  return { segment: c.get('segment')![first]!, first, last, settleTimeS, shortestRad, eta0, etaEnd, longWay, unwound };
}

/**
 * Chatter (metrics/chatter.ts definition): walk the commanded torques above the floor; a reversal
 * is one pointing more than 90° from the previous one above the floor (negative dot product); it
 * belongs to the plan when a planned switch lies in [t(previous above-floor sample − 1),
 * t(this sample + 1)] (indices clamped to the run); the rest are counted, and chatter is the
 * largest number of them in any closed window of windowS seconds, divided by windowS.
 */
function chatterOf(c: Map<string, Float64Array>, floorNm: number, windowS: number, planned: readonly number[]) {
  const t = c.get('t_s')!;
  const n = t.length;
  const tx = c.get('torque_cmd_x_Nm')!,
    ty = c.get('torque_cmd_y_Nm')!,
    tz = c.get('torque_cmd_z_Nm')!;
  const times: number[] = [];
  let prev = -1;
  for (let k = 0; k < n; k++) {
    if (!(Math.hypot(tx[k]!, ty[k]!, tz[k]!) > floorNm)) continue;
    if (prev >= 0 && tx[k]! * tx[prev]! + ty[k]! * ty[prev]! + tz[k]! * tz[prev]! < 0) {
      const lo = t[Math.max(prev - 1, 0)]!;
      const hi = t[Math.min(k + 1, n - 1)]!;
      // Slack for a switch that sits on a sample instant up to round-off (common practice, no source).
      const slack = 1e-9 * Math.max(1, Math.abs(hi));
      if (!planned.some((p) => p >= lo - slack && p <= hi + slack)) times.push(t[k]!);
    }
    prev = k;
  }
  let most = 0;
  for (let a = 0; a < times.length; a++) {
    let b = a;
    while (b + 1 < times.length && times[b + 1]! <= times[a]! + windowS) b++;
    most = Math.max(most, b - a + 1);
  }
  return { reversals: times.length, perS: most / windowS };
}

/**
 * Lyapunov-monitor violations (metrics/monitor.ts definition): within one flow (consecutive
 * samples with the same jump counter and segment), each maximal stretch over which W increases
 * from every sample to the next is a rise of W(end) − W(start); a rise above
 * tol = relTol·max|W| + noiseEnergy + absTol is a violation unless a planned switch lies in
 * [t(start), t(end)] (then it is a planned reference step). Each jump whose drop W_before −
 * W_after is below the promised decrease (less a 1e-9 relative and absTol allowance) is a weak jump.
 */
function monitorOf(c: Map<string, Float64Array>, doc: RunJson): number {
  const t = c.get('t_s')!,
    W = c.get('lyapunov')!,
    j = c.get('j')!,
    seg = c.get('segment')!;
  const m = doc.metricInputs.monitor;
  const planned = doc.metricInputs.plannedSwitchTimesS;
  let wMax = 0;
  for (const w of W) wMax = Math.max(wMax, Math.abs(w));
  const tol = m.relTol * wMax + m.noiseEnergy + m.absTol;
  let violations = 0;
  let k = 1;
  while (k < W.length) {
    const sameFlow = j[k] === j[k - 1] && seg[k] === seg[k - 1];
    if (!(sameFlow && W[k]! > W[k - 1]!)) {
      k++;
      continue;
    }
    const start = k - 1;
    while (k < W.length && j[k] === j[k - 1] && seg[k] === seg[k - 1] && W[k]! > W[k - 1]!) k++;
    const end = k - 1;
    if (W[end]! - W[start]! > tol) {
      const slack = 1e-9 * Math.max(1, Math.abs(t[end]!));
      const acrossPlan = planned.some((p) => p >= t[start]! - slack && p <= t[end]! + slack);
      if (!acrossPlan) violations++;
    }
  }
  if (m.jumpDecrease > 0)
    for (const ev of doc.jumpEvents) {
      if (ev.lyapunovBefore === undefined || ev.lyapunovAfter === undefined) continue;
      if (ev.lyapunovBefore - ev.lyapunovAfter < m.jumpDecrease * (1 - 1e-9) - m.absTol) violations++;
    }
  return violations;
}

/** Every comparison column of one run, from its CSV text and its JSON export text. */
export function recompute(csvText: string, jsonText: string): Recomputed {
  const table = parseCsv(csvText);
  const doc = JSON.parse(jsonText) as RunJson;
  const c = table.columns;
  const t = c.get('t_s')!;
  const n = table.rows;
  const mi = doc.metricInputs;
  const limits = wheelLimitsFromCsv(table);
  const nW = limits.torqueNm.length;

  // Tracking error: the angle between attitude and reference at every sample; peak, and the
  // time-weighted (trapezoidal) RMS over the run.
  const ang = new Float64Array(n);
  for (let k = 0; k < n; k++) ang[k] = rotationAngle(quatAt(c, 'qref', k), quatAt(c, 'q', k));
  const peak = ang.reduce((a, b) => Math.max(a, b), 0);
  const span = t[n - 1]! - t[0]!;
  const rms = span > 0 ? Math.sqrt(trapezoid(t, (k) => ang[k]! * ang[k]!, 0, n - 1) / span) : peak;

  const segments = segmentRuns(c.get('segment')!).map(({ first, last }) => {
    const s = c.get('segment')![first]!;
    const tg = doc.resolved.targets[s];
    if (!tg) throw new Error(`segment ${s} has no target in the JSON export`);
    const q = tg.qInertialFromBody;
    return segmentOf(c, first, last, [q[0]!, q[1]!, q[2]!, q[3]!], mi);
  });
  const settled = segments.length > 0 && segments.every((s) => s.settleTimeS !== null);
  const settleTimeS = settled ? Math.max(...segments.map((s) => s.settleTimeS!)) : null;

  const chatter = chatterOf(c, mi.chatterFloorNm, mi.chatterWindowS, mi.plannedSwitchTimesS);

  let peakTorque = 0,
    peakMomentum = 0;
  for (let i = 0; i < nW; i++) {
    const tq = c.get(`wheel${i + 1}_torque_motor_Nm`)!;
    const h = c.get(`wheel${i + 1}_h_Nms`)!;
    for (let k = 0; k < n; k++) {
      peakTorque = Math.max(peakTorque, Math.abs(tq[k]!) / limits.torqueNm[i]!);
      peakMomentum = Math.max(peakMomentum, Math.abs(h[k]!) / limits.momentumNms[i]!);
    }
  }

  const lastSeg = segments[segments.length - 1]!;
  const lastTarget = doc.resolved.targets[lastSeg.segment]!.qInertialFromBody;
  const finalErrorRad = rotationAngle([lastTarget[0]!, lastTarget[1]!, lastTarget[2]!, lastTarget[3]!], quatAt(c, 'q', n - 1));

  const verdict = doc.outcome.status !== 'completed' ? 'failed' : settled ? 'settled' : 'unsettled';
  const bad = segments.filter((s) => s.settleTimeS === null).map((s) => s.segment + 1);
  const status =
    verdict === 'failed'
      ? `failed: ${doc.outcome.message}`
      : verdict === 'unsettled'
        ? `not settled (segment${bad.length === 1 ? '' : 's'} ${bad.join(', ')})`
        : `settled in ${settleTimeS!.toFixed(1)} s`;

  const jc = c.get('j')!;
  return {
    verdict,
    status,
    settleTimeS,
    trackingErrorPeakRad: peak,
    trackingErrorRmsRad: rms,
    rotationTravelledRad: trapezoid(t, (k) => norm3(c, 'omega', '_radps', k), 0, n - 1),
    shortestRotationRad: segments.reduce((s, g) => s + g.shortestRad, 0),
    unwound: segments.some((s) => s.unwound),
    jumps: jc[n - 1]! - jc[0]!,
    chatterPerS: chatter.perS,
    chatterReversals: chatter.reversals,
    peakWheelTorqueFraction: peakTorque,
    peakWheelMomentumFraction: peakMomentum,
    controlEffortNms: trapezoid(t, (k) => norm3(c, 'torque', '_Nm', k), 0, n - 1),
    finalErrorRad,
    monitorViolations: monitorOf(c, doc),
    segments,
    trackingAngles: ang,
  };
}
