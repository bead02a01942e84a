/**
 * A growable RunTrace: the closed loop appends one sample at a time; arrays double when full and
 * are trimmed once at the end, so appending costs no allocation in the steady state.
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
  logic: number;
  errorAngle: number;
  potential: number;
  potentialMin: number;
  gap: number;
  lyapunov: number;
}

export class TraceBuilder {
  private cap: number;
  readonly trace: RunTrace;

  constructor(nWheels: number, initialCapacity = 1024) {
    this.cap = Math.max(16, initialCapacity);
    const c = this.cap;
    const tr: Partial<RunTrace> = { n: 0, nWheels, j: new Int32Array(c), segment: new Int32Array(c) };
    for (const name of TRACE_CHANNELS) (tr as Record<string, unknown>)[name] = new Float64Array(c * channelWidth(name, nWheels));
    this.trace = tr as RunTrace;
  }

  private grow(): void {
    const c = this.cap * 2;
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

  push(s: TraceSample): void {
    if (this.trace.n >= this.cap) this.grow();
    const tr = this.trace;
    const k = tr.n;
    const N = tr.nWheels;
    tr.t[k] = s.t;
    tr.j[k] = s.j;
    tr.segment[k] = s.segment;
    for (let i = 0; i < 4; i++) {
      tr.q[4 * k + i] = s.q[i];
      tr.qRef[4 * k + i] = s.qRef[i];
    }
    for (let i = 0; i < 3; i++) {
      tr.omega[3 * k + i] = s.omega[i];
      tr.omegaRef[3 * k + i] = s.omegaRef[i];
      tr.torqueCmdBody[3 * k + i] = s.torqueCmdBody[i];
      tr.torqueBody[3 * k + i] = s.torqueBody[i];
    }
    for (let i = 0; i < N; i++) {
      tr.hWheel[N * k + i] = s.hWheel[i];
      tr.wheelTorqueCmd[N * k + i] = s.wheelTorqueCmd[i];
      tr.wheelTorque[N * k + i] = s.wheelTorque[i];
    }
    tr.logic[k] = s.logic;
    tr.errorAngle[k] = s.errorAngle;
    tr.potential[k] = s.potential;
    tr.potentialMin[k] = s.potentialMin;
    tr.gap[k] = s.gap;
    tr.lyapunov[k] = s.lyapunov;
    tr.n = k + 1;
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

/** Keep every k-th sample (and always the last), e.g. for exports at a lower rate or study traces. */
export function decimateTrace(tr: RunTrace, every: number): RunTrace {
  const step = Math.max(1, Math.floor(every));
  const idx: number[] = [];
  for (let k = 0; k < tr.n; k += step) idx.push(k);
  if (tr.n > 0 && idx[idx.length - 1] !== tr.n - 1) idx.push(tr.n - 1);
  const out: Partial<RunTrace> = { n: idx.length, nWheels: tr.nWheels, j: new Int32Array(idx.length), segment: new Int32Array(idx.length) };
  idx.forEach((k, m) => {
    out.j![m] = tr.j[k];
    out.segment![m] = tr.segment[k];
  });
  for (const name of TRACE_CHANNELS) {
    const w = channelWidth(name, tr.nWheels);
    const a = new Float64Array(idx.length * w);
    idx.forEach((k, m) => a.set(tr[name].subarray(k * w, k * w + w), m * w));
    (out as Record<string, unknown>)[name] = a;
  }
  return out as RunTrace;
}
