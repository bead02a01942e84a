/**
 * The study view's pure parts and its worker wiring:
 * - the Lambert azimuthal equal-area disc (Snyder, "Map Projections — A Working Manual", USGS
 *   PP 1395, 1987, from memory): poles at the centre, the equator on the rim, and equal area —
 *   uniformly spread axes give r² uniform on [0, 1] (KS at α = 0.001, critical value 1.9495/√n);
 * - histogram bar geometry;
 * - browserStudy's Web-Worker port, driven by a fake worker that runs the engine's worker half in
 *   this thread: same records as the single-thread runner;
 * - the React view renders its controls (server-side render, no DOM needed).
 */
import { describe, expect, it } from 'vitest';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { equalAreaDisc, histogramBars } from '../../app/ui/study/studyPlot';
import { startBrowserStudy, type StudyWorkerLike } from '../../app/ui/study/browserStudy';
import { StudyView } from '../../app/ui/study/StudyView';
import { createStudyWorker, type FromWorker, type ToWorker } from '../../app/engine/study/parallel';
import { runStudy } from '../../app/engine/study/runner';
import { makeRng } from '../../app/engine/math/prng';
import { testVehicleScenario } from './study-fixtures';

describe('equal-area outcome map', () => {
  it('poles at the centre, equator on the rim, hemispheres split by the sign of z', () => {
    expect(equalAreaDisc([0, 0, 1])).toEqual({ hemisphere: 1, x: 0, y: 0 });
    expect(equalAreaDisc([0, 0, -1])).toEqual({ hemisphere: -1, x: 0, y: 0 });
    const e = equalAreaDisc([Math.SQRT1_2, Math.SQRT1_2, 0]);
    expect(Math.hypot(e.x, e.y)).toBeCloseTo(1, 14);
    // 60° from the pole: ρ = 2 sin 30° / √2 = 1/√2.
    const d = equalAreaDisc([Math.sin(Math.PI / 3), 0, Math.cos(Math.PI / 3)]);
    expect(d.x).toBeCloseTo(Math.SQRT1_2, 14);
  });

  it('equal area: uniform axes give r² uniform on each disc (KS)', () => {
    const rng = makeRng(5, 0);
    const r2: number[] = [];
    for (let i = 0; i < 20000; i++) {
      const v = [rng.normal(), rng.normal(), rng.normal()];
      const p = equalAreaDisc(v);
      r2.push(p.x * p.x + p.y * p.y);
    }
    r2.sort((a, b) => a - b);
    let D = 0;
    r2.forEach((x, i) => (D = Math.max(D, x - i / r2.length, (i + 1) / r2.length - x)));
    expect(D).toBeLessThan(1.9495 / Math.sqrt(r2.length));
  });

  it('histogram bars scale to the tallest bar and end with the overflow bar', () => {
    const b = histogramBars([1, 4, 2], 2, 80, 40);
    expect(b).toHaveLength(4);
    expect(b[1].height).toBe(40);
    expect(b[0].height).toBe(10);
    expect(b[3].count).toBe(2);
    expect(b[3].x).toBe(60);
  });
});

/** A fake Web Worker: the engine's worker half behind an asynchronous message boundary. */
function fakeWorker(): StudyWorkerLike {
  const w: StudyWorkerLike = {
    onmessage: null,
    onerror: null,
    terminate: () => {},
    postMessage: (m: ToWorker) => {
      if (m.type === 'close') return;
      const copy = structuredClone(m);
      setTimeout(() => handle(copy), 0);
    },
  };
  const handle = createStudyWorker((msg: FromWorker) => {
    const copy = structuredClone(msg);
    setTimeout(() => w.onmessage?.({ data: copy }), 0);
  });
  return w;
}

describe('browser study runner', () => {
  it('two fake Web Workers give the single-thread runner\'s records', async () => {
    const json = testVehicleScenario({ runs: 5, seed: 8, durationS: 100, stopAfterSettledForS: 5, controllers: ['pd', 'hyst'], dispersions: { initialAttitude: { mode: 'uniform' } } });
    const seen: number[] = [];
    const st = startBrowserStudy(json, { spawn: fakeWorker, workers: 2, onProgress: (p) => seen.push(p.done) });
    const r = await st.result;
    const ref = runStudy(json);
    if (!r.ok || !ref.ok) throw new Error('refused');
    expect(r.value.summary).toEqual(ref.value.summary);
    expect(r.value.records.map((x) => x.runs.map((y) => y.settleTimeS))).toEqual(ref.value.records.map((x) => x.runs.map((y) => y.settleTimeS)));
    expect(seen).toEqual([1, 2, 3, 4, 5]);
  }, 60_000);

  it('the view renders its run controls', () => {
    const html = renderToStaticMarkup(createElement(StudyView, { scenario: testVehicleScenario({ runs: 12, seed: 3 }) }));
    expect(html).toContain('Run study');
    expect(html).toContain('value="12"');
    expect(html).toContain('Robustness study');
  });
});
