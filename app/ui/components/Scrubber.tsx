/**
 * Playback bar: time slider, play/pause, speed, step by sample and by jump, and the hybrid time
 * (t, j) read-out. The slider position and the read-outs are written by the clock's frame loop
 * through refs; React renders only when play state, speed or the run change.
 */
import { useEffect, useMemo, useRef } from 'react';
import type { ControllerRun } from '../../engine/pipeline/types';
import { useApp, useAppState } from '../context';
import { SPEEDS } from '../playback/clock';
import { sampleIndexAt, stepJump, stepSample } from '../playback/timeline';
import { useStoreSlice } from '../store/hooks';
import { DEG_PER_RAD } from '../../engine/units';

function isEditable(t: EventTarget | null): boolean {
  const el = t as HTMLElement | null;
  if (!el || typeof el.tagName !== 'string') return false;
  const tag = el.tagName.toLowerCase();
  return (
    (tag === 'input' && (el as HTMLInputElement).type !== 'range' && (el as HTMLInputElement).type !== 'checkbox') ||
    tag === 'textarea' ||
    tag === 'select' ||
    el.isContentEditable
  );
}

export function Scrubber() {
  const app = useApp();
  const clock = app.clock;
  const { playing, speed } = useStoreSlice(clock.controls, (c) => c);
  const output = useAppState((s) => s.output);
  const selected = useAppState((s) => s.selectedRunKeys);
  const run: ControllerRun | undefined = useMemo(() => output?.runs.find((r) => r.key === selected[0]), [output, selected]);
  const slider = useRef<HTMLInputElement>(null);
  const tText = useRef<HTMLSpanElement>(null);
  const jText = useRef<HTMLSpanElement>(null);
  const extra = useRef<HTMLSpanElement>(null);
  const runRef = useRef(run);
  runRef.current = run;
  const jumpTimes = useMemo(() => (run ? run.jumps.map((j) => j.t) : []), [run]);
  const tMax = output ? clock.tMax : 0;

  useEffect(
    () =>
      clock.onFrame((t) => {
        if (slider.current) {
          slider.current.max = String(clock.tMax);
          slider.current.value = String(t);
        }
        if (tText.current) tText.current.textContent = t.toFixed(2);
        const r = runRef.current;
        if (r && r.trace.n > 0) {
          const k = sampleIndexAt(r.trace.t, r.trace.n, t);
          if (jText.current) jText.current.textContent = String(r.trace.j[k]);
          const seg = r.trace.segment[k]!;
          const label = output?.plan.segments[seg]?.label ?? '';
          if (extra.current) extra.current.textContent = `error ${(r.trace.errorAngle[k]! * DEG_PER_RAD).toFixed(3)}° · ${label}`;
        } else {
          if (jText.current) jText.current.textContent = '—';
          if (extra.current) extra.current.textContent = '';
        }
      }),
    [clock, output],
  );

  // Re-show the read-outs when the run changes even if the time did not.
  useEffect(() => clock.emitIfChanged(true), [clock, run]);

  const step = (kind: 'sample' | 'jump', dir: 1 | -1) => {
    clock.pause();
    const r = runRef.current;
    if (!r) return;
    if (kind === 'sample') clock.setTime(stepSample(r.trace.t, r.trace.n, clock.t, dir));
    else {
      const t = stepJump(jumpTimes, clock.t, dir);
      if (t !== null) clock.setTime(t);
    }
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.ctrlKey || e.metaKey || e.altKey || isEditable(e.target)) return;
      if (e.key === ' ') {
        e.preventDefault();
        clock.toggle();
      } else if (e.key === 'ArrowRight' || e.key === 'ArrowLeft') {
        e.preventDefault();
        step(e.shiftKey ? 'jump' : 'sample', e.key === 'ArrowRight' ? 1 : -1);
      } else if (e.key === 'Home') {
        clock.setTime(clock.tMin);
      } else if (e.key === 'End') {
        clock.setTime(clock.tMax);
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const disabled = !run;
  return (
    <footer className="scrubber" data-testid="scrubber">
      <div className="transport">
        <button
          className="icon"
          title="Previous jump (Shift+←)"
          disabled={disabled || jumpTimes.length === 0}
          onClick={() => step('jump', -1)}
        >
          ◀ jump
        </button>
        <button className="icon" title="Previous sample (←)" disabled={disabled} onClick={() => step('sample', -1)}>
          ◀︎
        </button>
        <button className="play" title="Play / pause (Space)" disabled={disabled} onClick={() => clock.toggle()} data-testid="play">
          {playing ? 'Pause' : 'Play'}
        </button>
        <button className="icon" title="Next sample (→)" disabled={disabled} onClick={() => step('sample', 1)}>
          ▶︎
        </button>
        <button className="icon" title="Next jump (Shift+→)" disabled={disabled || jumpTimes.length === 0} onClick={() => step('jump', 1)}>
          jump ▶
        </button>
      </div>
      <label className="speed" title="Simulated seconds per second">
        speed
        <select value={speed} onChange={(e) => clock.setSpeed(Number(e.target.value))} aria-label="playback speed">
          {SPEEDS.map((s) => (
            <option key={s} value={s}>
              {s}×
            </option>
          ))}
        </select>
      </label>
      <input
        ref={slider}
        className="time-slider"
        type="range"
        min={0}
        max={tMax}
        step="any"
        defaultValue={0}
        disabled={disabled}
        aria-label="playback time"
        data-testid="time-slider"
        onInput={(e) => {
          clock.pause();
          clock.setTime(Number((e.target as HTMLInputElement).value));
        }}
      />
      <span className="readout" data-testid="readout">
        t ={' '}
        <span ref={tText} className="mono t" data-testid="readout-t">
          0.00
        </span>{' '}
        s&nbsp;&nbsp; j ={' '}
        <span ref={jText} className="mono j" data-testid="readout-j">
          —
        </span>
        <span className="muted"> / {tMax.toFixed(1)} s</span>
      </span>
      <span ref={extra} className="readout-extra muted" />
    </footer>
  );
}
