/**
 * The study's time-left estimate (app/ui/study/timeLeft.ts): each worker's first case carries its
 * start-up and must not enter the rate. The model below is a constant-rate study with a slow first
 * case per worker; its exact time left follows from the schedule by arithmetic (common practice,
 * no source), and the estimator must reproduce it, where the old formula elapsed/done × left did not.
 */
import { describe, expect, it } from 'vitest';
import { TimeLeftEstimator } from '../../app/ui/study/timeLeft';

/** Completion times of `total` cases on `workers` workers: start-up `startMs` per worker, then `caseMs` per case. */
function schedule(total: number, workers: number, startMs: number, firstMs: number, caseMs: number) {
  const out: { worker: number; t: number }[] = [];
  const next = Array.from({ length: workers }, (_, w) => startMs * (w + 1) + firstMs);
  const first = next.map(() => true);
  for (let i = 0; i < total; i++) {
    let w = 0;
    for (let k = 1; k < workers; k++) if (next[k]! < next[w]!) w = k;
    out.push({ worker: w, t: next[w]! });
    next[w] = next[w]! + caseMs;
    first[w] = false;
  }
  return out.sort((a, b) => a.t - b.t);
}

describe('study time-left estimate', () => {
  it('is exact for a constant-rate study once every worker has finished two cases', () => {
    const total = 40;
    const done = schedule(total, 2, 500, 3000, 200);
    const end = done[done.length - 1]!.t;
    const est = new TimeLeftEstimator(total);
    let checked = 0;
    done.forEach((c, i) => {
      est.add(c);
      const perWorker = [0, 1].map((w) => done.slice(0, i + 1).filter((x) => x.worker === w).length);
      if (perWorker.every((n) => n >= 2) && i + 1 < total) {
        // Exact: the last case ends at `end`; both workers run at 1/200 per ms from here.
        const exact = end - c.t;
        const got = est.remainingMs(c.t)!;
        expect(Math.abs(got - exact)).toBeLessThanOrEqual(200);
        checked++;
      }
    });
    expect(checked).toBeGreaterThan(30);
    expect(est.remainingMs(end)).toBe(0);
  });

  it('does not carry the start-up into the rate, unlike elapsed / done × left', () => {
    // One worker, a 3000 ms first case, then 200 ms cases (the measured Tern-12 study in one thread).
    const total = 24;
    const done = schedule(total, 1, 0, 3000, 200);
    const est = new TimeLeftEstimator(total);
    est.add(done[0]!);
    expect(est.remainingMs(done[0]!.t)).toBeNull();
    est.add(done[1]!);
    const exact = done[total - 1]!.t - done[1]!.t;
    expect(est.remainingMs(done[1]!.t)).toBeCloseTo(exact, 6);
    const naive = (done[1]!.t / 2) * (total - 2);
    expect(naive / exact).toBeGreaterThan(7);
  });

  it('counts down between completions and never goes below zero', () => {
    const est = new TimeLeftEstimator(10);
    est.add({ worker: 0, t: 0 });
    est.add({ worker: 0, t: 100 });
    expect(est.remainingMs(100)).toBeCloseTo(800, 9);
    expect(est.remainingMs(350)).toBeCloseTo(550, 9);
    expect(est.remainingMs(5000)).toBe(0);
  });
});
