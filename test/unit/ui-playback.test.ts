/**
 * Playback clock and timeline stepping (app/ui/playback): time advances at the chosen speed,
 * clamps and stops at the end, listeners fire only when time moved; stepping by sample and by
 * jump lands on neighbouring stored instants. Expected values worked by hand from the inputs.
 */
import { describe, expect, it } from 'vitest';
import { createClock, startFrameLoop } from '../../app/ui/playback/clock';
import { sampleIndexAt, stepJump, stepSample } from '../../app/ui/playback/timeline';

describe('playback clock', () => {
  it('advances at speed × wall time, stops at the end and restarts from the start on play', () => {
    const c = createClock();
    c.setRange(0, 10);
    c.setSpeed(20);
    c.play();
    c.advance(50); // 0.05 s × 20 = 1 s
    expect(c.t).toBeCloseTo(1, 12);
    c.advance(1000); // capped at 100 ms of wall time: +2 s
    expect(c.t).toBeCloseTo(3, 12);
    for (let i = 0; i < 10; i++) c.advance(100);
    expect(c.t).toBe(10);
    expect(c.controls.getState().playing).toBe(false);
    c.play();
    expect(c.t).toBe(0);
  });

  it('clamps times and ignores bad speeds', () => {
    const c = createClock();
    c.setRange(2, 5);
    c.setTime(-1);
    expect(c.t).toBe(2);
    c.setTime(99);
    expect(c.t).toBe(5);
    c.setTime(Number.NaN);
    expect(c.t).toBe(2);
    c.setSpeed(0);
    c.setSpeed(-3);
    expect(c.controls.getState().speed).toBe(10);
  });

  it('calls frame listeners only when the time changed, from one animation loop', () => {
    const c = createClock();
    c.setRange(0, 100);
    const seen: number[] = [];
    const ticks: boolean[] = [];
    c.onFrame((t) => seen.push(t));
    c.onTick((_t, moved) => ticks.push(moved));
    let cb: ((now: number) => void) | null = null;
    const stop = startFrameLoop(
      c,
      (f) => ((cb = f), 1),
      () => (cb = null),
    );
    cb!(0); // first frame: listeners get the initial time
    cb!(16); // paused: nothing moves
    c.setTime(4);
    cb!(32);
    c.setSpeed(100);
    c.play();
    cb!(42); // +10 ms × 100 = +1 s
    expect(seen).toEqual([0, 4, 5]);
    expect(ticks).toEqual([true, false, true, true]);
    stop();
    expect(cb).toBeNull();
  });
});

describe('timeline stepping', () => {
  const t = new Float64Array([0, 0.1, 0.2, 0.3, 0.4]);
  it('finds the sample at a time', () => {
    expect(sampleIndexAt(t, 5, -1)).toBe(0);
    expect(sampleIndexAt(t, 5, 0.25)).toBe(2);
    expect(sampleIndexAt(t, 5, 0.3)).toBe(3);
    expect(sampleIndexAt(t, 5, 9)).toBe(4);
  });
  it('steps to neighbouring samples, from on and between samples', () => {
    expect(stepSample(t, 5, 0.2, 1)).toBe(0.3);
    expect(stepSample(t, 5, 0.25, 1)).toBe(0.3);
    expect(stepSample(t, 5, 0.25, -1)).toBe(0.2);
    expect(stepSample(t, 5, 0.2, -1)).toBe(0.1);
    expect(stepSample(t, 5, 0.4, 1)).toBe(0.4);
    expect(stepSample(t, 5, 0, -1)).toBe(0);
  });
  it('steps between jumps', () => {
    const jumps = [1.5, 3, 7.25];
    expect(stepJump(jumps, 0, 1)).toBe(1.5);
    expect(stepJump(jumps, 1.5, 1)).toBe(3);
    expect(stepJump(jumps, 3, -1)).toBe(1.5);
    expect(stepJump(jumps, 7.25, 1)).toBeNull();
    expect(stepJump(jumps, 1.5, -1)).toBeNull();
  });
});
