/**
 * Jump markers in the 3D view (real Chromium), on a near-180° case where the hybrid laws must
 * jump. The shipped Tern-12 reversal (assets/tern12-reversal.scenario.json) starts at rest and no
 * law jumps there (`slewsmith compare` shows 0 jumps for every run), so the test opens a modified
 * copy through the app's Open command:
 *   - reversal 179° instead of 175° (same axis, nearly on the η = 0 boundary);
 *   - initial body rate 12 °/s about that axis but the other way (away from the target);
 *   - wheels 60 instead of 30 mN·m·s (the spin's momentum then fits, so the runs settle);
 *   - direct mode only, 120 s tail.
 * Why the hysteretic law must jump: h(0) = sgn(η(0)) = +1 with η(0) = cos(89.5°) > 0; the spin
 * carries the error through 180°, and a 4 mN·m wheel torque about an axis of inertia ≈ 0.18 kg·m²
 * stops a 12 °/s spin only after ω²/(2α) ≈ 50°, past the 203° where h·η = −δ = −0.2 (hysteresis
 * of the shipped law) — the jump set (MST 2011 hysteretic feedback). The CLI on this copy:
 * hysteretic 1 jump, synergistic 1, PD, sign-switch and eigenaxis 0 (PD travels 292° instead of
 * 179°). The test asserts the view draws exactly the runs' jumps: ≥ 1 marker for the hysteretic
 * and synergistic runs, none for the smooth PD and eigenaxis laws, each marker at the boresight's
 * direction at its jump time, shown only once the time passes the jump, and visible in pixels
 * (toggling "jumps" off changes pixels at the projected marker for a hybrid run, none for PD).
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import Quaternion from 'quaternion';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, outputDir, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { runName } from '../../app/ui/modeNames';
import type { RunMode } from '../../app/engine/pipeline/types';
import { box, frames, pixelDiff, projectWorldPoint, setTime, snapshot } from './view3d-helpers';

const SPIN_NAME = 'Tern-12 spin-through (test copy)';
const SPHERE_RADIUS = 1.5; // app/view3d/style.ts SIZES.sphereRadius

function spinThroughCopy(): string {
  const s = JSON.parse(fs.readFileSync(path.join(repoRoot, 'assets/tern12-reversal.scenario.json'), 'utf8'));
  delete s.study;
  s.name = SPIN_NAME;
  const axis: number[] = s.targets[0].attitude.relative.axis;
  const n = Math.hypot(axis[0]!, axis[1]!, axis[2]!);
  s.targets[0].attitude.relative.angleDeg = 179;
  s.initial.bodyRateDegPerS = axis.map((a) => (-12 * a) / n);
  s.vehicle.wheels.maxMomentumMNms = 60;
  s.simulation.mode = 'step-target';
  s.simulation.tailS = 120;
  fs.mkdirSync(outputDir, { recursive: true });
  const file = path.join(outputDir, 'tern12-spin-through.scenario.json');
  fs.writeFileSync(file, JSON.stringify(s, null, 2));
  return file;
}

interface MarkerProbe {
  label: string;
  count: number;
  /** Marker centres (inertial, scene units), the markers counted so far. */
  positions: [number, number, number][];
}

/** Jump-marker counts and positions read from the view's model, per run of the first viewport. */
async function markers(page: Page): Promise<MarkerProbe[]> {
  return page.evaluate(() => {
    const v = (window as unknown as { __slewsmithView: any }).__slewsmithView;
    return v.model.viewports[0].runs.map((rc: any) => {
      const im = rc.trail.jumpMarkers;
      const m = im.matrix.clone();
      const positions: [number, number, number][] = [];
      for (let k = 0; k < im.count; k++) {
        im.getMatrixAt(k, m);
        positions.push([m.elements[12], m.elements[13], m.elements[14]]);
      }
      return { label: rc.run.label as string, count: im.count as number, positions };
    });
  });
}

interface RunInfo {
  key: string;
  label: string;
  logicKind: string;
  jumps: number[];
  /** Samples bracketing each jump: [tI, tI1, qI, qI1]. */
  brackets: { qI: number[]; qI1: number[] }[];
}

async function runsInfo(page: Page): Promise<RunInfo[]> {
  // The view names a run as the app does everywhere (modeNames.ts runName).
  const raw = await page.evaluate(() => {
    type Run = {
      key: string;
      label: string;
      mode: string;
      logicKind: string;
      jumps: { t: number }[];
      trace: { n: number; t: Float64Array; q: Float64Array };
    };
    const st = (window as unknown as { __slewsmith: { store: { getState(): { output: { runs: Run[] } } } } }).__slewsmith.store.getState();
    return st.output.runs.map((r) => ({
      key: r.key,
      label: r.label,
      mode: r.mode as RunMode,
      logicKind: r.logicKind,
      jumps: r.jumps.map((j) => j.t),
      brackets: r.jumps.map((j) => {
        let i = 0;
        while (i + 1 < r.trace.n && r.trace.t[i + 1]! <= j.t) i++;
        const i1 = Math.min(i + 1, r.trace.n - 1);
        return { qI: Array.from(r.trace.q.subarray(4 * i, 4 * i + 4)), qI1: Array.from(r.trace.q.subarray(4 * i1, 4 * i1 + 4)) };
      }),
    }));
  });
  return raw.map(({ mode, ...r }) => ({ ...r, label: runName({ label: r.label, mode }) }));
}

const rotate = (q: number[], v: number[]): number[] =>
  new Quaternion(q[3], q[0], q[1], q[2]).rotateVector([v[0]!, v[1]!, v[2]!]) as number[];
const angle = (a: number[], b: number[]) => {
  const d = (a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!) / (Math.hypot(a[0]!, a[1]!, a[2]!) * Math.hypot(b[0]!, b[1]!, b[2]!));
  return Math.acos(Math.min(1, Math.max(-1, d)));
};

async function showOnly(page: Page, keys: string[], all: string[]): Promise<void> {
  // Check first, then uncheck, so the selection is never empty on the way.
  for (const k of keys) await page.getByTestId(`show-${k}`).check();
  for (const k of all) if (!keys.includes(k)) await page.getByTestId(`show-${k}`).uncheck();
  await page.waitForFunction(
    (n) =>
      (window as unknown as { __slewsmithView: { model: { viewports: { runs: unknown[] }[] } } }).__slewsmithView.model.viewports[0]?.runs
        .length === n,
    keys.length,
  );
  await frames(page);
}

describe.skipIf(skipBrowser)('jump markers in the 3D view (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;
  let runs: RunInfo[];
  let tMax: number;
  const byLaw = (id: string) => runs.find((r) => r.key === `${id}:step-target`)!;

  beforeAll(async () => {
    const file = spinThroughCopy();
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1440, height: 900 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('cmd-open').click()]);
    await chooser.setFiles(file);
    await page.getByTestId('document-name').filter({ hasText: SPIN_NAME }).waitFor({ timeout: 20_000 });
    // Opening resets the status to waiting at once, so 'done' now means the copy's runs.
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    runs = await runsInfo(page);
    tMax = await page.evaluate(() => (window as unknown as { __slewsmith: { clock: { tMax: number } } }).__slewsmith.clock.tMax);
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('computes the copy as the CLI does: the hybrid laws jump, the smooth ones cannot', () => {
    expect(runs.map((r) => r.key).sort()).toEqual([
      'eigen:step-target',
      'hyst:step-target',
      'pd:step-target',
      'sign:step-target',
      'syn:step-target',
    ]);
    expect(byLaw('hyst').jumps.length).toBeGreaterThanOrEqual(1);
    expect(byLaw('syn').jumps.length).toBeGreaterThanOrEqual(1);
    expect(byLaw('pd').jumps).toEqual([]);
    expect(byLaw('eigen').jumps).toEqual([]);
    expect(byLaw('hyst').logicKind).toBe('sign');
    expect(byLaw('syn').logicKind).toBe('index');
    expect(byLaw('pd').logicKind).toBe('none');
  });

  it('draws one marker per jump for every selected run, at the boresight direction at the jump', async () => {
    const keys = runs.map((r) => r.key);
    await showOnly(page, keys, keys);
    await setTime(page, tMax);
    const drawn = await markers(page);
    expect(drawn).toHaveLength(runs.length);
    const boresight = await page.evaluate(() =>
      Array.from(
        (window as unknown as { __slewsmithView: { model: { options: { boresightBody: Float64Array } } } }).__slewsmithView.model.options
          .boresightBody,
      ),
    );
    for (const r of runs) {
      const d = drawn.find((x) => x.label === r.label);
      expect(d, r.label).toBeDefined();
      expect(d!.count, r.label).toBe(r.jumps.length);
      // Each marker sits on the sphere, between the boresight directions of the samples around its jump.
      d!.positions.forEach((p, k) => {
        expect(Math.hypot(p[0], p[1], p[2])).toBeCloseTo(SPHERE_RADIUS, 6);
        const b0 = rotate(r.brackets[k]!.qI, boresight),
          b1 = rotate(r.brackets[k]!.qI1, boresight);
        const step = angle(b0, b1);
        expect(angle(p, b0)).toBeLessThanOrEqual(step + 1e-6);
        expect(angle(p, b1)).toBeLessThanOrEqual(step + 1e-6);
      });
    }
    expect(drawn.find((x) => x.label === byLaw('hyst').label)!.count).toBeGreaterThanOrEqual(1);
    expect(drawn.find((x) => x.label === byLaw('syn').label)!.count).toBeGreaterThanOrEqual(1);
    expect(drawn.find((x) => x.label === byLaw('pd').label)!.count).toBe(0);
    expect(drawn.find((x) => x.label === byLaw('eigen').label)!.count).toBe(0);
  });

  it('shows a hybrid run’s marker only once the time passes its jump', async () => {
    const hyst = byLaw('hyst');
    await showOnly(
      page,
      [hyst.key],
      runs.map((r) => r.key),
    );
    const tj = hyst.jumps[0]!;
    await setTime(page, tj - 0.05);
    expect((await markers(page))[0]!.count).toBe(0);
    await setTime(page, tj + 0.05);
    expect((await markers(page))[0]!.count).toBe(1);
  });

  it('draws the marker in pixels for the hysteretic run and nothing extra for PD (jumps toggle on vs off)', async () => {
    const toggle = page.locator('.view3d-bar label', { hasText: 'jumps' }).locator('input');
    const all = runs.map((r) => r.key);
    const hyst = byLaw('hyst');
    await showOnly(page, [hyst.key], all);
    await setTime(page, tMax);
    const [m] = (await markers(page))[0]!.positions;
    const at = await projectWorldPoint(page, m!);
    await snapshot(page, 'hyst-on');
    await toggle.uncheck();
    await frames(page);
    await snapshot(page, 'hyst-off');
    await toggle.check();
    await frames(page);
    expect(at.z).toBeGreaterThan(-1);
    expect(at.z).toBeLessThan(1);
    // The marker (radius 0.028 scene units, a few pixels) is the only difference, and it is where
    // the camera projects it.
    const near = await pixelDiff(page, 'hyst-on', 'hyst-off', box(at.x, at.y, 6));
    const everywhere = await pixelDiff(page, 'hyst-on', 'hyst-off');
    expect(near).toBeGreaterThan(3);
    expect(everywhere).toBe(near);
    fs.mkdirSync(path.join(repoRoot, 'test-output/screens'), { recursive: true });
    await page.getByTestId('view3d').screenshot({ path: path.join(repoRoot, 'test-output/screens/view3d-jump-hysteretic.png') });

    await showOnly(page, [byLaw('pd').key], all);
    await setTime(page, tMax);
    await snapshot(page, 'pd-on');
    await toggle.uncheck();
    await frames(page);
    await snapshot(page, 'pd-off');
    await toggle.check();
    expect(await pixelDiff(page, 'pd-on', 'pd-off')).toBe(0);
    expect(w.errors).toEqual([]);
  });
});
