/**
 * A growable RunTrace: the closed loop appends one sample at a time; arrays double when full (but
 * stop at the expected sample count while below it, so a run of known length keeps no unused
 * capacity) and are trimmed once at the end, so appending costs no allocation in the steady state.
 */
import type { RunTrace } from './types';

type ChannelName = Exclude<keyof RunTrace, 'n' | 'nWheels' | 'j' | 'segment'>;

const WIDTH: Record<ChannelName, 'one' | 'three' | 'four' | 'wheels'> = {
  t: 'one',
  q: 'four',
  omega: 'three',
  hWheel: 'wheels',
  qRef: 'four',
  omegaRef: 'three',
  torqueCmdBody: 'three',
  torqueBody: 'three',
  wheelTorqueCmd: 'wheels',
  wheelTorque: 'wheels',
  wheelTorqueNet: 'wheels',
  logic: 'one',
  errorAngle: 'one',
  potential: 'one',
  potentialMin: 'one',
  gap: 'one',
  lyapunov: 'one',
};

export const TRACE_CHANNELS = Object.keys(WIDTH) as ChannelName[];

export function channelWidth(name: ChannelName, nWheels: number): number {
  const w = WIDTH[name];
  return w === 'one' ? 1 : w === 'three' ? 3 : w === 'four' ? 4 : nWheels;
}

export interface TraceSample {
  t: number;
  j: number;
  segment: number;
  q: ArrayLike<number>;
  omega: ArrayLike<number>;
  hWheel: ArrayLike<number>;
  qRef: ArrayLike<number>;
  omegaRef: ArrayLike<number>;
  torqueCmdBody: ArrayLike<number>;
  torqueBody: ArrayLike<number>;
  wheelTorqueCmd: ArrayLike<number>;
  wheelTorque: ArrayLike<number>;
  wheelTorqueNet: ArrayLike<number>;
  logic: number;
  errorAngle: number;
  potential: number;
  potentialMin: number;
  gap: number;
  lyapunov: number;
}

/** Slots of PackedSample.scalars. */
export const PACKED_T = 0;
export const PACKED_LOGIC = 1;
export const PACKED_ERROR_ANGLE = 2;
export const PACKED_POTENTIAL = 3;
export const PACKED_POTENTIAL_MIN = 4;
export const PACKED_GAP = 5;
export const PACKED_LYAPUNOV = 6;
export const PACKED_SCALARS = 7;

/**
 * The same sample as TraceSample with its per-sample numbers in one Float64Array (PACKED_* slots).
 * The closed loop refills one of these per sample: numbers kept in object fields that change every
 * sample are boxed by V8 (an allocation per write and per read), numbers in a typed array are not.
 */
export interface PackedSample {
  j: number;
  segment: number;
  scalars: Float64Array;
  q: Float64Array;
  omega: Float64Array;
  hWheel: Float64Array;
  qRef: Float64Array;
  omegaRef: Float64Array;
  torqueCmdBody: Float64Array;
  torqueBody: Float64Array;
  wheelTorqueCmd: Float64Array;
  wheelTorque: Float64Array;
  wheelTorqueNet: Float64Array;
}

/**
 * A RunTrace with room for `capacity` samples (n = 0). Built as ONE object literal so every trace
 * has the same fast hidden class: adding the channels one by one with computed keys turned the
 * object into a dictionary (slow property lookups in push, metrics, exports and views, and
 * optimized code thrown away between runs).
 */
function allocateTrace(nWheels: number, capacity: number): RunTrace {
  const c = capacity,
    N = nWheels;
  return {
    n: 0,
    nWheels: N,
    t: new Float64Array(c),
    j: new Int32Array(c),
    segment: new Int32Array(c),
    q: new Float64Array(4 * c),
    omega: new Float64Array(3 * c),
    hWheel: new Float64Array(N * c),
    qRef: new Float64Array(4 * c),
    omegaRef: new Float64Array(3 * c),
    torqueCmdBody: new Float64Array(3 * c),
    torqueBody: new Float64Array(3 * c),
    wheelTorqueCmd: new Float64Array(N * c),
    wheelTorque: new Float64Array(N * c),
    wheelTorqueNet: new Float64Array(N * c),
    logic: new Float64Array(c),
    errorAngle: new Float64Array(c),
    potential: new Float64Array(c),
    potentialMin: new Float64Array(c),
    gap: new Float64Array(c),
    lyapunov: new Float64Array(c),
  };
}

/**
 * Memory for the full trace of one run, `capacity` samples, that the runs of a pass record into one
 * after the other (pipeline/run.ts, for runs that keep a display trace): the pass then holds one full
 * trace whatever the garbage collector does, instead of a new one per run beside the last one not
 * yet collected. A trace recorded into it is overwritten by the next run: copy what is kept.
 */
export function traceArena(nWheels: number, capacity: number): RunTrace {
  return allocateTrace(nWheels, Math.max(16, Math.ceil(capacity)));
}

/** A fresh RunTrace (n = 0) over an arena's arrays, built as one object literal like allocateTrace. */
function overArena(a: RunTrace): RunTrace {
  return {
    n: 0,
    nWheels: a.nWheels,
    t: a.t,
    j: a.j,
    segment: a.segment,
    q: a.q,
    omega: a.omega,
    hWheel: a.hWheel,
    qRef: a.qRef,
    omegaRef: a.omegaRef,
    torqueCmdBody: a.torqueCmdBody,
    torqueBody: a.torqueBody,
    wheelTorqueCmd: a.wheelTorqueCmd,
    wheelTorque: a.wheelTorque,
    wheelTorqueNet: a.wheelTorqueNet,
    logic: a.logic,
    errorAngle: a.errorAngle,
    potential: a.potential,
    potentialMin: a.potentialMin,
    gap: a.gap,
    lyapunov: a.lyapunov,
  };
}

/** The trace in memory of its own (every sample, bit for bit): what a run keeps of a trace recorded in an arena. */
export function copyTrace(tr: RunTrace): RunTrace {
  const out = allocateTrace(tr.nWheels, tr.n);
  out.n = tr.n;
  out.j.set(tr.j.subarray(0, tr.n));
  out.segment.set(tr.segment.subarray(0, tr.n));
  for (const name of TRACE_CHANNELS) out[name].set(tr[name].subarray(0, tr.n * channelWidth(name, tr.nWheels)));
  return out;
}

export class TraceBuilder {
  private cap: number;
  readonly trace: RunTrace;

  /**
   * `expected`: the number of samples the run is expected to record (0: unknown). Growth doubles
   * the capacity but does not pass `expected` while below it; past it, it doubles again.
   */
  constructor(
    nWheels: number,
    initialCapacity = 1024,
    private readonly expected = 0,
    arena?: RunTrace,
  ) {
    // An arena (traceArena): record into its memory from sample 0, whatever an earlier run left there.
    if (arena && arena.nWheels === nWheels && arena.t.length >= 16) {
      this.cap = arena.t.length;
      this.trace = overArena(arena);
    } else {
      this.cap = Math.max(16, initialCapacity);
      this.trace = allocateTrace(nWheels, this.cap);
    }
  }

  /** Samples the arrays can hold before they grow. */
  get capacity(): number {
    return this.cap;
  }

  private grow(): void {
    const c = this.cap < this.expected ? Math.min(this.cap * 2, this.expected) : this.cap * 2;
    const tr = this.trace;
    const nj = new Int32Array(c);
    nj.set(tr.j);
    tr.j = nj;
    const ns = new Int32Array(c);
    ns.set(tr.segment);
    tr.segment = ns;
    for (const name of TRACE_CHANNELS) {
      const old = tr[name];
      const a = new Float64Array(c * channelWidth(name, tr.nWheels));
      a.set(old);
      tr[name] = a;
    }
    this.cap = c;
  }

  /** The per-sample vector channels, shared by push and pushPacked. */
  private writeVectors(
    k: number,
    s: Pick<
      TraceSample,
      'q' | 'qRef' | 'omega' | 'omegaRef' | 'torqueCmdBody' | 'torqueBody' | 'hWheel' | 'wheelTorqueCmd' | 'wheelTorque' | 'wheelTorqueNet'
    >,
  ): void {
    const tr = this.trace;
    const N = tr.nWheels;
    for (let i = 0; i < 4; i++) {
      tr.q[4 * k + i] = s.q[i]!;
      tr.qRef[4 * k + i] = s.qRef[i]!;
    }
    for (let i = 0; i < 3; i++) {
      tr.omega[3 * k + i] = s.omega[i]!;
      tr.omegaRef[3 * k + i] = s.omegaRef[i]!;
      tr.torqueCmdBody[3 * k + i] = s.torqueCmdBody[i]!;
      tr.torqueBody[3 * k + i] = s.torqueBody[i]!;
    }
    for (let i = 0; i < N; i++) {
      tr.hWheel[N * k + i] = s.hWheel[i]!;
      tr.wheelTorqueCmd[N * k + i] = s.wheelTorqueCmd[i]!;
      tr.wheelTorque[N * k + i] = s.wheelTorque[i]!;
      tr.wheelTorqueNet[N * k + i] = s.wheelTorqueNet[i]!;
    }
  }

  push(s: TraceSample): void {
    if (this.trace.n >= this.cap) this.grow();
    const tr = this.trace;
    const k = tr.n;
    tr.t[k] = s.t;
    tr.j[k] = s.j;
    tr.segment[k] = s.segment;
    this.writeVectors(k, s);
    tr.logic[k] = s.logic;
    tr.errorAngle[k] = s.errorAngle;
    tr.potential[k] = s.potential;
    tr.potentialMin[k] = s.potentialMin;
    tr.gap[k] = s.gap;
    tr.lyapunov[k] = s.lyapunov;
    tr.n = k + 1;
  }

  /** Append a PackedSample (no allocation in the steady state). */
  pushPacked(s: PackedSample): void {
    if (this.trace.n >= this.cap) this.grow();
    const tr = this.trace;
    const k = tr.n;
    const x = s.scalars;
    tr.t[k] = x[PACKED_T]!;
    tr.j[k] = s.j;
    tr.segment[k] = s.segment;
    this.writeVectors(k, s);
    tr.logic[k] = x[PACKED_LOGIC]!;
    tr.errorAngle[k] = x[PACKED_ERROR_ANGLE]!;
    tr.potential[k] = x[PACKED_POTENTIAL]!;
    tr.potentialMin[k] = x[PACKED_POTENTIAL_MIN]!;
    tr.gap[k] = x[PACKED_GAP]!;
    tr.lyapunov[k] = x[PACKED_LYAPUNOV]!;
    tr.n = k + 1;
  }

  /**
   * Append a PackedSample only when every value in it is finite; false (nothing appended, n
   * unchanged) otherwise. One pass: each value is copied and v·0 summed on the way, which stays 0
   * for finite values and turns NaN for ±∞ or NaN (IEEE 754-2019 §6.1–6.2). The closed loop's
   * per-sample path (loop.ts record); finite.ts firstNonFinite then names the bad value.
   */
  pushPackedIfFinite(s: PackedSample): boolean {
    if (this.trace.n >= this.cap) this.grow();
    const tr = this.trace;
    const k = tr.n;
    const N = tr.nWheels;
    let z = 0;
    const x = s.scalars;
    for (let i = 0; i < PACKED_SCALARS; i++) z += x[i]! * 0;
    z += copyFour(tr.q, 4 * k, s.q) + copyFour(tr.qRef, 4 * k, s.qRef);
    z += copyThree(tr.omega, 3 * k, s.omega) + copyThree(tr.omegaRef, 3 * k, s.omegaRef);
    z += copyThree(tr.torqueCmdBody, 3 * k, s.torqueCmdBody) + copyThree(tr.torqueBody, 3 * k, s.torqueBody);
    z += copyN(tr.hWheel, N * k, s.hWheel, N) + copyN(tr.wheelTorqueCmd, N * k, s.wheelTorqueCmd, N);
    z += copyN(tr.wheelTorque, N * k, s.wheelTorque, N) + copyN(tr.wheelTorqueNet, N * k, s.wheelTorqueNet, N);
    if (z !== 0) return false;
    tr.t[k] = x[PACKED_T]!;
    tr.j[k] = s.j;
    tr.segment[k] = s.segment;
    tr.logic[k] = x[PACKED_LOGIC]!;
    tr.errorAngle[k] = x[PACKED_ERROR_ANGLE]!;
    tr.potential[k] = x[PACKED_POTENTIAL]!;
    tr.potentialMin[k] = x[PACKED_POTENTIAL_MIN]!;
    tr.gap[k] = x[PACKED_GAP]!;
    tr.lyapunov[k] = x[PACKED_LYAPUNOV]!;
    tr.n = k + 1;
    return true;
  }

  /** Trim the arrays to the stored length (views, no copy) and return the trace. */
  finish(): RunTrace {
    const tr = this.trace;
    const n = tr.n;
    tr.j = tr.j.subarray(0, n);
    tr.segment = tr.segment.subarray(0, n);
    for (const name of TRACE_CHANNELS) tr[name] = tr[name].subarray(0, n * channelWidth(name, tr.nWheels));
    return tr;
  }
}

/** dst[o .. o+3] = src[0 .. 3]; returns Σ v·0 (0 when all four are finite, NaN otherwise). */
function copyFour(dst: Float64Array, o: number, src: Float64Array): number {
  const a = src[0]!,
    b = src[1]!,
    c = src[2]!,
    d = src[3]!;
  dst[o] = a;
  dst[o + 1] = b;
  dst[o + 2] = c;
  dst[o + 3] = d;
  return a * 0 + b * 0 + c * 0 + d * 0;
}

function copyThree(dst: Float64Array, o: number, src: Float64Array): number {
  const a = src[0]!,
    b = src[1]!,
    c = src[2]!;
  dst[o] = a;
  dst[o + 1] = b;
  dst[o + 2] = c;
  return a * 0 + b * 0 + c * 0;
}

function copyN(dst: Float64Array, o: number, src: Float64Array, n: number): number {
  let z = 0;
  for (let i = 0; i < n; i++) {
    const v = src[i]!;
    dst[o + i] = v;
    z += v * 0;
  }
  return z;
}

/** Keep every k-th sample (and always the last), e.g. for exports at a lower rate or study traces. */
export function decimateTrace(tr: RunTrace, every: number): RunTrace {
  const step = Math.max(1, Math.floor(every));
  const n = tr.n;
  const m = n === 0 ? 0 : Math.floor((n - 1) / step) + 1 + ((n - 1) % step === 0 ? 0 : 1);
  const idx = new Int32Array(m);
  for (let i = 0, k = 0; k < n; k += step) idx[i++] = k;
  if (m > 0) idx[m - 1] = n - 1;
  return subsetTrace(tr, idx);
}

/**
 * The samples at `idx` (increasing indices into `tr`), every channel copied bit for bit, as a new
 * trace of the same shape (pipeline/displayTrace.ts keeps such a subset of a long run for views).
 */
export function subsetTrace(tr: RunTrace, idx: Int32Array): RunTrace {
  const m = idx.length;
  const out = allocateTrace(tr.nWheels, m);
  out.n = m;
  for (let i = 0; i < m; i++) {
    out.j[i] = tr.j[idx[i]!]!;
    out.segment[i] = tr.segment[idx[i]!]!;
  }
  for (const name of TRACE_CHANNELS) {
    const w = channelWidth(name, tr.nWheels);
    const src = tr[name];
    const a = out[name];
    for (let i = 0; i < m; i++) {
      const o = idx[i]! * w;
      for (let c = 0; c < w; c++) a[i * w + c] = src[o + c]!;
    }
  }
  return out;
}
