/**
 * The 3D attitude view in real Chromium on the bundled demo (Lumen-6), read back from its WebGL
 * canvas: the scene is drawn (not the background alone, with the axis colours present); moving
 * the time scrubber moves the body triad on screen — its X-axis tip, projected with the view's
 * own camera, lands on red X-axis pixels at both times, the pixels there change, and the body's
 * drawn X axis is the trace attitude's X axis (checked with the npm `quaternion` library);
 * screenshots of the scene at the start, mid-slew and end go to test-output/screens/.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import Quaternion from 'quaternion';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { box, colourNear, frames, pixelDiff, projectBodyPoint, setTime, snapshot } from './view3d-helpers';

const screensDir = path.join(repoRoot, 'test-output/screens');

// app/view3d/style.ts: COLORS.axisX/axisY/axisZ and SIZES.bodyTriad (scene units).
const AXIS_X = 0xe5534b;
const AXIS_Y = 0x57ab5a;
const AXIS_Z = 0x539bf5;
const BODY_TRIAD = 1.0;

interface TraceProbe {
  key: string;
  t: number;
  i: number;
  tI: number;
  tI1: number;
  qI: number[];
  qI1: number[];
}

/** The shown run's samples that bracket the clock time (read from the store's output). */
async function bracket(page: Page): Promise<TraceProbe> {
  return page.evaluate(() => {
    type Trace = { n: number; t: Float64Array; q: Float64Array };
    const s = (
      window as unknown as {
        __slewsmith: {
          store: { getState(): { output: { runs: { key: string; trace: Trace }[] }; selectedRunKeys: string[] } };
          clock: { t: number };
        };
      }
    ).__slewsmith;
    const st = s.store.getState();
    const run = st.output.runs.find((r) => r.key === st.selectedRunKeys[0])!;
    const tr = run.trace;
    const t = s.clock.t;
    let i = 0;
    while (i + 1 < tr.n && tr.t[i + 1]! <= t) i++;
    const i1 = Math.min(i + 1, tr.n - 1);
    return {
      key: run.key,
      t,
      i,
      tI: tr.t[i]!,
      tI1: tr.t[i1]!,
      qI: Array.from(tr.q.subarray(4 * i, 4 * i + 4)),
      qI1: Array.from(tr.q.subarray(4 * i1, 4 * i1 + 4)),
    };
  });
}

/** Body X axis in inertial axes for a stored [x, y, z, w] attitude, by the npm quaternion library (v_I = q v_B q*). */
function bodyXInertial(q: number[]): number[] {
  return new Quaternion(q[3], q[0], q[1], q[2]).rotateVector([1, 0, 0]) as number[];
}

const angle = (a: number[], b: number[]) => {
  const d = (a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!) / (Math.hypot(a[0]!, a[1]!, a[2]!) * Math.hypot(b[0]!, b[1]!, b[2]!));
  return Math.acos(Math.min(1, Math.max(-1, d)));
};

async function clickSlider(page: Page, fraction: number): Promise<number> {
  const slider = page.getByTestId('time-slider');
  const bb = (await slider.boundingBox())!;
  await page.mouse.click(bb.x + fraction * bb.width, bb.y + bb.height / 2);
  await frames(page);
  return page.evaluate(() => (window as unknown as { __slewsmith: { clock: { t: number } } }).__slewsmith.clock.t);
}

describe.skipIf(skipBrowser)('3D attitude view on the demo (Chromium, WebGL read-back)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1440, height: 900 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    await page.waitForFunction(() => {
      const v = (window as unknown as { __slewsmithView?: { model: { viewports: { runs: unknown[] }[] } } }).__slewsmithView;
      return !!v && v.model.viewports.length === 1 && v.model.viewports[0]!.runs.length === 1;
    });
    await frames(page);
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('draws the scene: many non-background pixels and the three axis colours', async () => {
    const s = await snapshot(page, 'first', { x: AXIS_X, y: AXIS_Y, z: AXIS_Z });
    expect(s.width).toBeGreaterThan(300);
    expect(s.height).toBeGreaterThan(200);
    // A blank canvas (or one cleared to the background only) has painted = 0; the sphere, triads,
    // bus, labels and inset cover several per cent.
    expect(s.painted / (s.width * s.height)).toBeGreaterThan(0.03);
    for (const k of ['x', 'y', 'z'] as const) expect(s.near[k], k).toBeGreaterThan(20);
  });

  it('moves the body triad on screen when the scrubber moves', async () => {
    const tA = await clickSlider(page, 0.04);
    const A = await bracket(page);
    const tipA = await projectBodyPoint(page, [0.9 * BODY_TRIAD, 0, 0]);
    const originA = await projectBodyPoint(page, [0, 0, 0]);
    await snapshot(page, 'scrub-a');

    const tB = await clickSlider(page, 0.12);
    const B = await bracket(page);
    const tipB = await projectBodyPoint(page, [0.9 * BODY_TRIAD, 0, 0]);
    const originB = await projectBodyPoint(page, [0, 0, 0]);
    await snapshot(page, 'scrub-b');

    // The clicks moved the clock (mid-slew of the first target, which starts at t = 0).
    const tMax = await page.evaluate(() => (window as unknown as { __slewsmith: { clock: { tMax: number } } }).__slewsmith.clock.tMax);
    expect(tA).toBeGreaterThan(0);
    expect(tB - tA).toBeGreaterThan(0.04 * tMax);
    expect(Math.abs(tB - 0.12 * tMax)).toBeLessThan(0.03 * tMax);

    // The tip's projection moved by many pixels; the body centre stays put (it does not translate).
    expect(Math.hypot(tipB.x - tipA.x, tipB.y - tipA.y)).toBeGreaterThan(8);
    expect(Math.hypot(originB.x - originA.x, originB.y - originA.y)).toBeLessThan(0.5);
    for (const p of [tipA, tipB]) {
      expect(p.z).toBeGreaterThan(-1);
      expect(p.z).toBeLessThan(1);
    }
    // What was drawn agrees with the projection: red X-axis pixels at the projected tip at each
    // time, and the pixels around both tips changed between the two frames.
    expect(await colourNear(page, 'scrub-a', tipA.x, tipA.y, 3, AXIS_X)).toBeGreaterThan(0);
    expect(await colourNear(page, 'scrub-b', tipB.x, tipB.y, 3, AXIS_X)).toBeGreaterThan(0);
    expect(await pixelDiff(page, 'scrub-a', 'scrub-b', box(tipA.x, tipA.y, 4))).toBeGreaterThan(5);
    expect(await pixelDiff(page, 'scrub-a', 'scrub-b', box(tipB.x, tipB.y, 4))).toBeGreaterThan(5);

    // The drawn body X axis is the run's attitude at that time: between the X axes of the two
    // bracketing samples (the view interpolates), by an independent quaternion library.
    for (const [probe, tip, origin] of [
      [A, tipA, originA],
      [B, tipB, originB],
    ] as const) {
      expect(probe.tI).toBeLessThanOrEqual(probe.t);
      const drawn = [0, 1, 2].map((k) => tip.world[k]! - origin.world[k]!);
      const x0 = bodyXInertial(probe.qI),
        x1 = bodyXInertial(probe.qI1);
      const step = angle(x0, x1);
      expect(angle(drawn, x0)).toBeLessThanOrEqual(step + 1e-5);
      expect(angle(drawn, x1)).toBeLessThanOrEqual(step + 1e-5);
    }
  });

  it('saves screenshots of the scene at the start, mid-slew and end', async () => {
    const seg = await page.evaluate(() => {
      const st = (
        window as unknown as {
          __slewsmith: { store: { getState(): { output: { plan: { segments: { tStart: number; slewTimeS: number }[] } } } } };
        }
      ).__slewsmith.store.getState();
      return st.output.plan.segments[0]!;
    });
    const tMax = await page.evaluate(() => (window as unknown as { __slewsmith: { clock: { tMax: number } } }).__slewsmith.clock.tMax);
    fs.mkdirSync(screensDir, { recursive: true });
    const canvas = page.getByTestId('view3d');
    const times: [string, number][] = [
      ['start', 0],
      ['mid', seg.tStart + seg.slewTimeS / 2],
      ['end', tMax],
    ];
    const sizes: number[] = [];
    for (const [name, t] of times) {
      const now = await setTime(page, t);
      expect(now).toBeCloseTo(t, 9);
      await snapshot(page, `shot-${name}`);
      const file = path.join(screensDir, `view3d-${name}.png`);
      await canvas.screenshot({ path: file });
      sizes.push(fs.statSync(file).size);
    }
    for (const s of sizes) expect(s).toBeGreaterThan(10_000);
    // Three different scenes.
    expect(await pixelDiff(page, 'shot-start', 'shot-mid')).toBeGreaterThan(500);
    expect(await pixelDiff(page, 'shot-mid', 'shot-end')).toBeGreaterThan(500);
    expect(w.errors).toEqual([]);
  });
});
