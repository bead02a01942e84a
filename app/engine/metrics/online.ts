/**
 * Run metrics computed as the run goes: a sample sink (sim/sink.ts) the closed loop feeds at every
 * recorded sample, so a run whose history nobody reads (a study case) needs no trace. It yields
 * the SAME RunMetrics as metrics.ts computeMetrics on the finished trace, bit for bit: every
 * definition stays where it is stated (segments.ts, chatter.ts, wheels.ts, metrics.ts) and each
 * quantity here is the same floating-point expression over the same samples in the same order;
 * only the bookkeeping differs:
 * - a look-back over the segment (the settle time: the first sample after the last one outside
 *   the thresholds) becomes a running "settled from" time;
 * - a look-ahead by one sample (the chatter span's end t_{k+1}, the time at a wheel limit summed
 *   over the intervals that start there, the rotation travelled up to the next segment's first
 *   sample) is settled when that sample arrives, or at the end;
 * - the chatter's busiest window slides over the events as they are found.
 * test/property/metrics-online.test.ts checks the equality on dispersed study cases for every law.
 *
 * Also kept, for a study's row: the last attitude and the error-angle channel sampled on a fixed
 * time grid (the first sample at or after each grid time, as study/runCase.ts defines it).
 * One recorder serves many runs (`reset`); it allocates only when its event list grows.
 */
import { qAngleBetween } from '../math/quaternion';
import { PACKED_ERROR_ANGLE, PACKED_T, type PackedSample } from '../sim/trace';
import type { JumpEvent } from '../sim/types';
import { packedNonFiniteSum, type SampleSink } from '../sim/sink';
import { CHATTER_FLOOR_FRACTION } from './chatter';
import type { MetricOptions, RunMetrics } from './metrics';
import {
  DETOUR_MIN_EXTRA_RAD,
  LIFT_DECIDED_ETA,
  pointingErrorBetween,
  segmentAxis,
  UNWIND_MIN_EXTRA_RAD,
  type SegmentMetrics,
} from './segments';
import { AT_LIMIT_FRACTION, type WheelPeak, type WheelSaturation } from './wheels';

/**
 * What a recorder computes: 'all' (RunMetrics in full) or 'study-row' (only what a study row and
 * the run's verdict read, study/runCase.ts caseRunFromParts and pipeline/summarise.ts verdictOf:
 * the tracking error, the control effort and the time at the wheel limits are left out and come
 * back as NaN, NaN and no saturation entries; every other field is the same bits).
 */
export type OnlineParts = 'all' | 'study-row';

/** A fixed time grid for the error-angle channel: t_k = k·stepS for k < count. */
export interface ErrorGrid {
  stepS: number;
  count: number;
}

/** Scalar part of q_target* ⊗ q (Hamilton, [x, y, z, w]); the expression of segments.ts etaAt. */
function etaOf(q: Float64Array, target: Float64Array): number {
  return target[3]! * q[3]! + target[0]! * q[0]! + target[1]! * q[1]! + target[2]! * q[2]!;
}

/** The running state of one segment (segments.ts measureSegment, sample by sample). */
interface OpenSegment {
  segment: number;
  /** No sample taken yet. */
  fresh: boolean;
  tStart: number;
  /** Error to the target (or the reference, moving targets) at the first and latest sample. */
  shortestRad: number;
  lastErrorRad: number;
  eta0: number;
  etaLast: number;
  /** Time of the first sample after the last one outside the settle thresholds (tStart if none). */
  settledFromT: number;
  /** The latest sample was outside the thresholds. */
  lastOutside: boolean;
  travelledRad: number;
  /** Pointing-only: the axis path Σ|ω × b|Δt within the segment, and |ω × b| at the latest sample. */
  axisPathRad: number;
  axisRatePrev: number;
}

export class OnlineMetrics implements SampleSink {
  count = 0;
  lastT = 0;
  /** The attitude at the last sample taken, [x, y, z, w]. */
  readonly lastQ = new Float64Array(4);
  /** Error-angle channel (rad) at the grid times reached so far (`gridFilled` of them). */
  readonly gridErrorRad: Float64Array;
  /** Grid times filled by samples so far; after metrics(): the grid times the run reached (runCase.ts traceCount). */
  gridFilled = 0;
  private lastError = 0;

  private readonly N: number;
  private readonly floor2: number;
  /**
   * The sample's time and |ω|, read by the per-sample steps from here rather than passed: a
   * double passed to a call that is not inlined is boxed, a heap number per call and sample.
   */
  private readonly now = new Float64Array(2);
  private readonly target = new Float64Array(4);
  private readonly axisBuf = new Float64Array(3);
  private readonly trackAxis = new Float64Array(3);
  /** The segment whose axis trackB holds (NaN: none yet), and that axis (null: not pointing-only). */
  private trackSeg = NaN;
  private trackB: Float64Array | null = null;
  private axis: Float64Array | null = null;
  private readonly segs: SegmentMetrics[] = [];
  private open: OpenSegment | null = null;
  // previous sample
  private tPrev = 0;
  private ratePrev = 0;
  private effortPrev = 0;
  private trackPrev = 0;
  // tracking error, effort
  private trackPeak = 0;
  private trackSum = 0;
  private trackSpan = 0;
  private effort = 0;
  private readonly lastOmega = new Float64Array(3);
  // chatter
  private lx = 0;
  private ly = 0;
  private lz = 0;
  private haveLast = false;
  /** t at the sample before the last one above the floor (t_0 when that was the first sample). */
  private tBeforeLast = 0;
  private pending = false;
  private pendingFrom = 0;
  private pendingT = 0;
  private events = new Float64Array(64);
  private nEvents = 0;
  private lo = 0;
  private most = 0;
  // wheels
  private readonly torquePeak: WheelPeak = { fraction: 0, wheel: 0, atS: 0 };
  private readonly momentumPeak: WheelPeak = { fraction: 0, wheel: 0, atS: 0 };
  private readonly satFirst: Float64Array;
  private readonly satTotal: Float64Array;
  private readonly satPrev: Uint8Array;

  constructor(
    nWheels: number,
    private readonly o: MetricOptions,
    private readonly grid: ErrorGrid | null = null,
    private readonly parts: OnlineParts = 'all',
  ) {
    this.N = nWheels;
    const floor = o.chatterFloorNm ?? CHATTER_FLOOR_FRACTION * smallest(o.maxTorqueNm);
    this.floor2 = floor * floor;
    this.gridErrorRad = new Float64Array(grid ? grid.count : 0);
    // [torque wheels..., momentum wheels...]
    this.satFirst = new Float64Array(2 * nWheels);
    this.satTotal = new Float64Array(2 * nWheels);
    this.satPrev = new Uint8Array(2 * nWheels);
    this.reset();
  }

  /** Forget the run so far (the recorder is reused for the next run). */
  reset(): void {
    this.count = 0;
    this.lastT = 0;
    this.gridFilled = 0;
    this.segs.length = 0;
    this.open = null;
    this.trackPeak = this.trackSum = this.trackSpan = this.effort = 0;
    this.trackSeg = NaN;
    this.trackB = null;
    this.lastOmega.fill(0);
    this.lastQ.fill(0);
    this.haveLast = false;
    this.pending = false;
    this.nEvents = this.lo = this.most = 0;
    for (const p of [this.torquePeak, this.momentumPeak]) {
      p.fraction = 0;
      p.wheel = 0;
      p.atS = 0;
    }
    this.satFirst.fill(-1);
    this.satTotal.fill(0);
    this.satPrev.fill(0);
  }

  push(s: PackedSample): boolean {
    if (packedNonFiniteSum(s) !== 0) return false;
    const t = s.scalars[PACKED_T]!;
    const k = this.count;
    const w = s.omega;
    const rate = Math.sqrt(w[0]! * w[0]! + w[1]! * w[1]! + w[2]! * w[2]!);
    this.now[0] = t;
    this.now[1] = rate;

    // Segments: the interval from the previous sample belongs to the previous sample's segment
    // (segments.ts travelledFrom runs on to the next segment's first sample), then a new segment opens.
    let g = this.open;
    if (g && k > 0) g.travelledRad += 0.5 * (this.ratePrev + rate) * (t - this.tPrev);
    if (g && s.segment !== g.segment) {
      this.closeSegment(g, this.tPrev);
      g = null;
    }
    if (!g) g = this.openSegment(s, t);
    this.segmentSample(g, s);

    const all = this.parts === 'all';
    if (all) this.trackingSample(s, k);
    this.chatterSample(s, k);
    this.wheelSample(s, k, all);
    this.gridSample(s);

    this.lastError = s.scalars[PACKED_ERROR_ANGLE]!;
    const lq = this.lastQ,
      lw = this.lastOmega,
      q = s.q;
    lq[0] = q[0]!;
    lq[1] = q[1]!;
    lq[2] = q[2]!;
    lq[3] = q[3]!;
    lw[0] = w[0]!;
    lw[1] = w[1]!;
    lw[2] = w[2]!;
    this.tPrev = t;
    this.ratePrev = rate;
    this.lastT = t;
    this.count = k + 1;
    return true;
  }

  private openSegment(s: PackedSample, t: number): OpenSegment {
    const seg = s.segment;
    const tg = this.target;
    for (let i = 0; i < 4; i++) tg[i] = this.o.segmentTargets[4 * seg + i] ?? (i === 3 ? 1 : 0);
    this.axis = this.o.movingTargets ? null : segmentAxis(this.axisBuf, this.o.segmentAxes, seg);
    const g: OpenSegment = {
      segment: seg,
      fresh: true,
      tStart: t,
      shortestRad: 0,
      lastErrorRad: 0,
      eta0: 0,
      etaLast: 0,
      settledFromT: t,
      lastOutside: false,
      travelledRad: 0,
      axisPathRad: 0,
      axisRatePrev: 0,
    };
    this.open = g;
    return g;
  }

  /** One sample of the open segment: settle, errors, η, the pointed axis' path. */
  private segmentSample(g: OpenSegment, s: PackedSample): void {
    const o = this.o;
    const t = this.now[0]!,
      rate = this.now[1]!;
    const first = g.fresh;
    g.fresh = false;
    let err: number, rateErr: number, eta: number;
    if (o.movingTargets) {
      // measureMovingSegment: against the reference at each sample; |ω − ω_ref| (hypot)
      err = qAngleBetween(s.q, s.qRef);
      const w = s.omega,
        r = s.omegaRef;
      rateErr = Math.hypot(w[0]! - r[0]!, w[1]! - r[1]!, w[2]! - r[2]!);
      eta = etaOf(s.q, s.qRef);
    } else {
      rateErr = rate;
      // The error is read at the segment's first sample (its shortest rotation), by the settle
      // test only when the rate passes it (the test is false at once otherwise), and at the
      // segment's close from its last sample (finalErrorRad): no acos per fast-turning sample.
      err = first || rate < o.settleRateRadPerS ? this.fixedTargetError(s.q) : NaN;
      eta = etaOf(s.q, this.target);
    }
    if (g.lastOutside) g.settledFromT = t;
    // err is NaN only when the rate fails the test: the same answer as with err itself.
    g.lastOutside = !(rateErr < o.settleRateRadPerS && err < o.settleAngleRad);
    if (first) {
      g.shortestRad = o.movingTargets ? qAngleBetween(s.q, this.target) : err;
      g.eta0 = eta;
      if (this.axis) g.axisRatePrev = axisRate(s.omega, this.axis);
    } else if (this.axis) {
      const v = axisRate(s.omega, this.axis);
      g.axisPathRad += 0.5 * (g.axisRatePrev + v) * (t - this.tPrev);
      g.axisRatePrev = v;
    }
    g.lastErrorRad = err;
    g.etaLast = eta;
  }

  /** Error to the fixed target (pointing error on a pointing-only segment), as segments.ts measureSegment. */
  private fixedTargetError(q: Float64Array): number {
    return this.axis ? pointingErrorBetween(q, 0, this.target, 0, this.axis) : qAngleBetween(q, this.target);
  }

  /** Close the open segment; `lastQ` still holds the attitude at its last sample. */
  private closeSegment(g: OpenSegment, tEnd: number): void {
    const o = this.o;
    // The last sample's error when its rate skipped it (fixed targets; never NaN from finite samples).
    if (Number.isNaN(g.lastErrorRad)) g.lastErrorRad = this.fixedTargetError(this.lastQ);
    const settleTimeS = g.lastOutside ? null : g.settledFromT - g.tStart;
    const shortest = g.shortestRad;
    let longWay: boolean, unwound: boolean;
    if (o.movingTargets) {
      longWay = Math.abs(g.etaLast) >= LIFT_DECIDED_ETA && g.etaLast * g.eta0 < 0;
      unwound = longWay && Math.abs(g.eta0) >= (o.boundedNoiseEta ?? 0);
    } else {
      const extra = 2 * Math.PI - 2 * shortest;
      if (this.axis) {
        longWay = g.axisPathRad >= 2 * Math.PI - shortest;
        unwound = longWay && extra >= DETOUR_MIN_EXTRA_RAD;
      } else {
        longWay = Math.abs(g.etaLast) >= LIFT_DECIDED_ETA && g.etaLast * g.eta0 < 0;
        unwound =
          longWay &&
          extra >= ((o.liftDependent ?? true) ? UNWIND_MIN_EXTRA_RAD : DETOUR_MIN_EXTRA_RAD) &&
          Math.abs(g.eta0) >= (o.boundedNoiseEta ?? 0);
      }
    }
    this.segs.push({
      segment: g.segment,
      tStart: g.tStart,
      tEnd,
      settleTimeS,
      finalErrorRad: g.lastErrorRad,
      shortestRad: shortest,
      travelledRad: g.travelledRad,
      longWay,
      unwound,
    });
    this.open = null;
  }

  /** metrics.ts trackingError: peak and trapezoidal RMS of the law's error (pointing error on pointing-only segments). */
  private trackingSample(s: PackedSample, k: number): void {
    const t = this.now[0]!;
    // The segment's pointed axis, looked up again only when the segment changes.
    if (s.segment !== this.trackSeg) {
      this.trackSeg = s.segment;
      this.trackB = segmentAxis(this.trackAxis, this.o.segmentAxes, s.segment);
    }
    const b = this.trackB;
    const e = b ? pointingErrorBetween(s.q, 0, s.qRef, 0, b) : s.scalars[PACKED_ERROR_ANGLE]!;
    if (e > this.trackPeak) this.trackPeak = e;
    if (k > 0) {
      const dt = t - this.tPrev;
      this.trackSum += 0.5 * (this.trackPrev * this.trackPrev + e * e) * dt;
      this.trackSpan += dt;
    }
    this.trackPrev = e;
  }

  /** chatter.ts chatterOf, with each reversal's planned-switch test waiting for the next sample's time. */
  private chatterSample(s: PackedSample, k: number): void {
    const t = this.now[0]!;
    if (this.pending) this.decidePending(t);
    const tc = s.torqueCmdBody;
    const x = tc[0]!,
      y = tc[1]!,
      z = tc[2]!;
    if (!(x * x + y * y + z * z > this.floor2)) return;
    if (this.haveLast && x * this.lx + y * this.ly + z * this.lz < 0) {
      this.pending = true;
      this.pendingFrom = this.tBeforeLast * (1 - 1e-12);
      this.pendingT = t;
    }
    this.lx = x;
    this.ly = y;
    this.lz = z;
    this.tBeforeLast = k > 0 ? this.tPrev : t;
    this.haveLast = true;
  }

  /** The pending reversal's span ends at `tTo` (the next sample's time, or its own at the run's end). */
  private decidePending(tTo: number): void {
    this.pending = false;
    const to = tTo * (1 + 1e-12) + 1e-12;
    const planned = this.o.plannedSwitchTimes ?? [];
    for (let i = 0; i < planned.length; i++) if (planned[i]! >= this.pendingFrom && planned[i]! <= to) return;
    if (this.nEvents === this.events.length) {
      const a = new Float64Array(2 * this.events.length);
      a.set(this.events);
      this.events = a;
    }
    const ev = this.events;
    const hi = this.nEvents++;
    ev[hi] = this.pendingT;
    while (ev[hi]! - ev[this.lo]! > this.o.chatterWindowS) this.lo++;
    this.most = Math.max(this.most, hi - this.lo + 1);
  }

  /** wheels.ts wheelUse: peaks, and with `all` the time at the limits and the effort. */
  private wheelSample(s: PackedSample, k: number, all: boolean): void {
    const N = this.N;
    const o = this.o;
    peakSample(this.torquePeak, s.wheelTorque, o.maxTorqueNm, N, this.now);
    peakSample(this.momentumPeak, s.hWheel, o.maxMomentumNms, N, this.now);
    if (!all) return;
    const t = this.now[0]!;
    const tb = s.torqueBody;
    const m = Math.sqrt(tb[0]! * tb[0]! + tb[1]! * tb[1]! + tb[2]! * tb[2]!);
    if (k > 0) this.effort += 0.5 * (m + this.effortPrev) * (t - this.tPrev);
    this.effortPrev = m;
    // Slots [0, N): wheel torques; [N, 2N): wheel momenta.
    this.limitSample(s.wheelTorque, o.maxTorqueNm, 0);
    this.limitSample(s.hWheel, o.maxMomentumNms, N);
  }

  /** Time at the limit of one kind (torque or momentum) of every wheel; `at0` is its first slot. */
  private limitSample(data: Float64Array, limits: ArrayLike<number>, at0: number): void {
    const t = this.now[0]!;
    const prev = this.satPrev,
      total = this.satTotal,
      first = this.satFirst;
    const dt = t - this.tPrev;
    for (let i = 0; i < this.N; i++) {
      const j = at0 + i;
      if (prev[j]) total[j]! += dt;
      const at = Math.abs(data[i]!) >= AT_LIMIT_FRACTION * limits[i]!;
      prev[j] = at ? 1 : 0;
      if (at && first[j]! < 0) first[j] = t;
    }
  }

  /** The error-angle channel at each grid time reached: the first sample at or after it (study/runCase.ts). */
  private gridSample(s: PackedSample): void {
    const g = this.grid;
    if (!g) return;
    const t = this.now[0]!;
    while (this.gridFilled < g.count && !(t < this.gridFilled * g.stepS - 1e-9))
      this.gridErrorRad[this.gridFilled++] = s.scalars[PACKED_ERROR_ANGLE]!;
  }

  /**
   * The grid as runCase.ts decimates a finished trace: stop at the first grid time past the last
   * sample (+1e-9); a grid time no sample reached by then takes the last sample.
   */
  private finishGrid(): void {
    const g = this.grid;
    if (!g) return;
    let filled = 0;
    for (let k = 0; k < g.count && this.count > 0; k++) {
      if (k * g.stepS > this.lastT + 1e-9) break;
      if (k >= this.gridFilled) this.gridErrorRad[k] = this.lastError;
      filled = k + 1;
    }
    this.gridFilled = filled;
  }

  /** The run's metrics from the samples taken (call once the run has ended; `jumps` as the loop returned them). */
  metrics(jumps: readonly JumpEvent[]): RunMetrics {
    if (this.open) this.closeSegment(this.open, this.lastT);
    if (this.pending) this.decidePending(this.lastT);
    this.finishGrid();
    const segments = this.segs;
    const settled = segments.length > 0 && segments.every((g) => g.settleTimeS !== null);
    const n = this.count;
    const w = this.lastOmega;
    const saturation: WheelSaturation[] = [];
    for (let i = 0; i < 2 * this.N; i++)
      if (this.satFirst[i]! >= 0)
        saturation.push({
          wheel: (i % this.N) + 1,
          kind: i < this.N ? 'torque' : 'momentum',
          firstS: this.satFirst[i]!,
          totalS: this.satTotal[i]!,
        });
    const last = segments[segments.length - 1];
    const all = this.parts === 'all';
    if (!all) saturation.length = 0;
    return {
      settleTimeS: settled ? Math.max(...segments.map((g) => g.settleTimeS!)) : null,
      settled,
      trackingErrorPeakRad: all ? this.trackPeak : NaN,
      trackingErrorRmsRad: !all ? NaN : this.trackSpan > 0 ? Math.sqrt(this.trackSum / this.trackSpan) : this.trackPeak,
      rotationTravelledRad: segments.reduce((sum, g) => sum + g.travelledRad, 0),
      shortestRotationRad: segments.reduce((sum, g) => sum + g.shortestRad, 0),
      longWay: segments.some((g) => g.longWay),
      unwound: segments.some((g) => g.unwound),
      jumps: jumps.length,
      chatterPerS: this.most / this.o.chatterWindowS,
      torqueReversals: this.nEvents,
      peakWheelTorqueFraction: this.torquePeak.fraction,
      peakWheelMomentumFraction: this.momentumPeak.fraction,
      peakTorque: { ...this.torquePeak },
      peakMomentum: { ...this.momentumPeak },
      saturation,
      controlEffortNms: all ? this.effort : NaN,
      finalErrorRad: last ? last.finalErrorRad : 0,
      finalRateRadPerS: n > 0 ? Math.hypot(w[0]!, w[1]!, w[2]!) : 0,
      segments: segments.slice(),
    };
  }
}

/** `now[0]`: the sample's time. */
function peakSample(p: WheelPeak, data: Float64Array, limits: ArrayLike<number>, N: number, now: Float64Array): void {
  const t = now[0]!;
  for (let i = 0; i < N; i++) {
    const f = Math.abs(data[i]!) / limits[i]!;
    if (f > p.fraction) {
      p.fraction = f;
      p.wheel = i + 1;
      p.atS = t;
    }
  }
}

/** |ω × b| (segments.ts axisRate). */
function axisRate(w: Float64Array, b: Float64Array): number {
  const x = w[0]!,
    y = w[1]!,
    z = w[2]!;
  return Math.hypot(y * b[2]! - z * b[1]!, z * b[0]! - x * b[2]!, x * b[1]! - y * b[0]!);
}

function smallest(a: ArrayLike<number>): number {
  let m = Infinity;
  for (let i = 0; i < a.length; i++) m = Math.min(m, a[i]!);
  return Number.isFinite(m) ? m : 0;
}
