/**
 * Playback time outside React (style.md: fast-changing values never go through React state).
 *
 * `PlaybackClock` is a small mutable object. One requestAnimationFrame loop (`startFrameLoop`)
 * advances it while playing and calls the frame listeners — the plots' playheads, the 3D view and
 * the scrubber's read-out — only when the time actually moved. React only hears about the slow
 * things (playing or not, speed) through `controls`, a regular store.
 */
import { createStore, type Store } from '../store/createStore';

export interface ClockControls {
  playing: boolean;
  /** Simulated seconds per wall-clock second. */
  speed: number;
}

export type FrameListener = (t: number) => void;

export interface PlaybackClock {
  /** Current playback time, s (read by frame listeners; write through setTime). */
  readonly t: number;
  readonly tMin: number;
  readonly tMax: number;
  readonly controls: Store<ClockControls>;
  setTime(t: number): void;
  setRange(tMin: number, tMax: number): void;
  play(): void;
  pause(): void;
  toggle(): void;
  setSpeed(speed: number): void;
  /** Advance by a wall-clock interval (ms); called by the frame loop. Returns true when t moved. */
  advance(wallMs: number): boolean;
  onFrame(listener: FrameListener): () => void;
  /** Every animation frame, with whether the time moved (for views that also animate on input). */
  onTick(listener: (t: number, changed: boolean) => void): () => void;
  /** Run the listeners if anything changed since the last call (or when forced). */
  emitIfChanged(force?: boolean): void;
}

export const SPEEDS = [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000] as const;

export function createClock(): PlaybackClock {
  let t = 0;
  let tMin = 0;
  let tMax = 0;
  let changed = true;
  const listeners = new Set<FrameListener>();
  const tickers = new Set<(t: number, changed: boolean) => void>();
  const controls = createStore<ClockControls>({ playing: false, speed: 10 });

  const clamp = (v: number) => (Number.isFinite(v) ? Math.min(tMax, Math.max(tMin, v)) : tMin);

  const clock: PlaybackClock = {
    get t() {
      return t;
    },
    get tMin() {
      return tMin;
    },
    get tMax() {
      return tMax;
    },
    controls,
    setTime(v) {
      const c = clamp(v);
      if (c !== t) {
        t = c;
        changed = true;
      }
    },
    setRange(a, b) {
      tMin = Number.isFinite(a) ? a : 0;
      tMax = Number.isFinite(b) && b >= tMin ? b : tMin;
      t = clamp(t);
      changed = true;
    },
    play() {
      // Playing from the end starts over, as a media player does.
      if (t >= tMax) clock.setTime(tMin);
      controls.setState({ playing: true });
    },
    pause() {
      controls.setState({ playing: false });
    },
    toggle() {
      if (controls.getState().playing) clock.pause();
      else clock.play();
    },
    setSpeed(speed) {
      if (Number.isFinite(speed) && speed > 0) controls.setState({ speed });
    },
    advance(wallMs) {
      const { playing, speed } = controls.getState();
      if (!playing || !(wallMs > 0)) return false;
      // Long gaps (a background tab) would jump far ahead; cap one frame at 100 ms of wall time.
      const next = t + (Math.min(wallMs, 100) / 1000) * speed;
      if (next >= tMax) {
        clock.setTime(tMax);
        controls.setState({ playing: false });
      } else clock.setTime(next);
      return changed;
    },
    onFrame(listener) {
      listeners.add(listener);
      changed = true;
      return () => {
        listeners.delete(listener);
      };
    },
    onTick(listener) {
      tickers.add(listener);
      return () => {
        tickers.delete(listener);
      };
    },
    emitIfChanged(force = false) {
      const moved = changed || force;
      changed = false;
      if (moved) for (const l of [...listeners]) l(t);
      for (const l of [...tickers]) l(t, moved);
    },
  };
  return clock;
}

/** The single animation loop of the window. Returns a stop function. */
export function startFrameLoop(clock: PlaybackClock, raf = requestAnimationFrame, caf = cancelAnimationFrame): () => void {
  let last = -1;
  let handle = 0;
  const frame = (now: number) => {
    if (last >= 0) clock.advance(now - last);
    last = now;
    clock.emitIfChanged();
    handle = raf(frame);
  };
  handle = raf(frame);
  return () => caf(handle);
}
