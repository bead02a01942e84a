/**
 * Page-side probes for the 3D view tests (test/e2e/view3d-*.test.ts): the WebGL canvas read back
 * through a 2D canvas (the view keeps its drawing buffer, preserveDrawingBuffer), pixel counts and
 * differences computed in the page (an image never crosses to Node), and screen projections of
 * body-frame points with the view's own camera. The app exposes the view handle as
 * `window.__slewsmithView` and the store and clock as `window.__slewsmith` (read-only use).
 */
import type { Page } from 'playwright-core';

/** Background colours of the view (app/view3d/style.ts COLORS.background / insetBackground, and the divider clear). */
const BACKGROUNDS: readonly [number, number, number][] = [
  [0x0f, 0x13, 0x18],
  [0x16, 0x1c, 0x24],
  [0x05, 0x07, 0x0a],
];

export interface CanvasStats {
  width: number;
  height: number;
  /** Pixels farther than the tolerance from every background colour. */
  painted: number;
  /** Pixels within the tolerance of each probe colour (name → count). */
  near: Record<string, number>;
}

/** Waits for `n` animation frames, so the app's frame loop has rendered what was set before. */
export async function frames(page: Page, n = 3): Promise<void> {
  await page.evaluate(
    (count) =>
      new Promise<void>((resolve) => {
        let k = 0;
        const step = () => (++k >= count ? resolve() : requestAnimationFrame(step));
        requestAnimationFrame(step);
      }),
    n,
  );
}

/**
 * Reads the 3D canvas back into the page under `name` (kept for `pixelDiff`) and counts painted
 * pixels and pixels near each probe colour (hex, per-channel tolerance `tol`).
 */
export async function snapshot(page: Page, name: string, probes: Record<string, number> = {}, tol = 24): Promise<CanvasStats> {
  return page.evaluate(
    ({ name, probes, tol, backgrounds }) => {
      const c = document.querySelector<HTMLCanvasElement>('[data-testid=view3d-canvas]');
      if (!c) throw new Error('no 3D canvas');
      const k = document.createElement('canvas');
      k.width = c.width;
      k.height = c.height;
      const ctx = k.getContext('2d', { willReadFrequently: true })!;
      ctx.drawImage(c, 0, 0);
      const d = ctx.getImageData(0, 0, k.width, k.height).data;
      const w = window as unknown as { __v3dShots?: Record<string, { w: number; h: number; d: Uint8ClampedArray }> };
      (w.__v3dShots ??= {})[name] = { w: k.width, h: k.height, d };
      const cols = Object.entries(probes).map(([key, hex]) => [key, (hex >> 16) & 255, (hex >> 8) & 255, hex & 255] as const);
      const near: Record<string, number> = Object.fromEntries(cols.map(([key]) => [key, 0]));
      let painted = 0;
      for (let i = 0; i < d.length; i += 4) {
        const r = d[i]!,
          g = d[i + 1]!,
          b = d[i + 2]!;
        let bg = false;
        for (const [br, bgc, bb] of backgrounds) if (Math.abs(r - br) <= 8 && Math.abs(g - bgc) <= 8 && Math.abs(b - bb) <= 8) bg = true;
        if (!bg) painted++;
        for (const [key, cr, cg, cb] of cols)
          if (Math.abs(r - cr) <= tol && Math.abs(g - cg) <= tol && Math.abs(b - cb) <= tol) near[key]!++;
      }
      return { width: k.width, height: k.height, painted, near };
    },
    { name, probes, tol, backgrounds: BACKGROUNDS },
  );
}

/** A box in canvas pixels, top-left origin, inclusive-exclusive. */
export interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Pixels (optionally inside `box`) whose colour differs between two snapshots by more than `tol` in some channel. */
export async function pixelDiff(page: Page, a: string, b: string, box?: Box, tol = 16): Promise<number> {
  return page.evaluate(
    ({ a, b, box, tol }) => {
      const shots = (window as unknown as { __v3dShots: Record<string, { w: number; h: number; d: Uint8ClampedArray }> }).__v3dShots;
      const A = shots[a],
        B = shots[b];
      if (!A || !B || A.w !== B.w || A.h !== B.h) throw new Error(`snapshots ${a} and ${b} missing or of different sizes`);
      const x0 = Math.max(0, Math.floor(box?.x0 ?? 0)),
        x1 = Math.min(A.w, Math.ceil(box?.x1 ?? A.w));
      const y0 = Math.max(0, Math.floor(box?.y0 ?? 0)),
        y1 = Math.min(A.h, Math.ceil(box?.y1 ?? A.h));
      let n = 0;
      for (let y = y0; y < y1; y++)
        for (let x = x0; x < x1; x++) {
          const i = 4 * (y * A.w + x);
          if (Math.abs(A.d[i]! - B.d[i]!) > tol || Math.abs(A.d[i + 1]! - B.d[i + 1]!) > tol || Math.abs(A.d[i + 2]! - B.d[i + 2]!) > tol)
            n++;
        }
      return n;
    },
    { a, b, box, tol },
  );
}

export interface Projection {
  /** Canvas pixels, top-left origin. */
  x: number;
  y: number;
  /** NDC depth (inside the view volume when in [−1, 1]). */
  z: number;
  /** The point in the inertial (world) frame. */
  world: [number, number, number];
}

/**
 * Projects a point given in the frame of the first viewport's run `runIndex` body group (body
 * axes, scene units) to canvas pixels with the view's camera, as last set up by a render of the
 * single or overlay layout (one viewport across the canvas).
 */
export async function projectBodyPoint(page: Page, point: [number, number, number], runIndex = 0): Promise<Projection> {
  return page.evaluate(
    ({ point, runIndex }) => {
      type V3 = { x: number; y: number; z: number; set(x: number, y: number, z: number): V3; project(c: unknown): V3 };
      const v = (window as unknown as { __slewsmithView: any }).__slewsmithView;
      const rc = v.model.viewports[0].runs[runIndex];
      rc.body.updateWorldMatrix(true, false);
      const p = (v.camera.position.clone() as V3).set(point[0], point[1], point[2]);
      rc.body.localToWorld(p);
      const world: [number, number, number] = [p.x, p.y, p.z];
      p.project(v.camera);
      const c = v.renderer.domElement as HTMLCanvasElement;
      return { x: ((p.x + 1) / 2) * c.width, y: ((1 - p.y) / 2) * c.height, z: p.z, world };
    },
    { point, runIndex },
  );
}

/** Projects an inertial (world) point to canvas pixels with the view's camera. */
export async function projectWorldPoint(page: Page, point: [number, number, number]): Promise<Projection> {
  return page.evaluate((point) => {
    type V3 = { x: number; y: number; z: number; set(x: number, y: number, z: number): V3; project(c: unknown): V3 };
    const v = (window as unknown as { __slewsmithView: any }).__slewsmithView;
    const p = (v.camera.position.clone() as V3).set(point[0], point[1], point[2]);
    p.project(v.camera);
    const c = v.renderer.domElement as HTMLCanvasElement;
    return { x: ((p.x + 1) / 2) * c.width, y: ((1 - p.y) / 2) * c.height, z: p.z, world: point };
  }, point);
}

/** Sets the playback time through the app's clock (as the scrubber does) and waits for the view to render it. */
export async function setTime(page: Page, t: number): Promise<number> {
  const now = await page.evaluate((t) => {
    const clock = (window as unknown as { __slewsmith: { clock: { pause(): void; setTime(t: number): void; t: number } } }).__slewsmith
      .clock;
    clock.pause();
    clock.setTime(t);
    return clock.t;
  }, t);
  await frames(page);
  return now;
}

export function box(cx: number, cy: number, half: number): Box {
  return { x0: cx - half, y0: cy - half, x1: cx + half + 1, y1: cy + half + 1 };
}

/** Pixels of snapshot `name` within `radius` of (x, y) that are within `tol` of colour `hex` in every channel. */
export async function colourNear(page: Page, name: string, x: number, y: number, radius: number, hex: number, tol = 40): Promise<number> {
  return page.evaluate(
    ({ name, x, y, radius, hex, tol }) => {
      const S = (window as unknown as { __v3dShots: Record<string, { w: number; h: number; d: Uint8ClampedArray }> }).__v3dShots[name]!;
      const cr = (hex >> 16) & 255,
        cg = (hex >> 8) & 255,
        cb = hex & 255;
      let n = 0;
      for (let py = Math.max(0, Math.round(y - radius)); py <= Math.min(S.h - 1, Math.round(y + radius)); py++)
        for (let px = Math.max(0, Math.round(x - radius)); px <= Math.min(S.w - 1, Math.round(x + radius)); px++) {
          if ((px - x) ** 2 + (py - y) ** 2 > radius * radius) continue;
          const i = 4 * (py * S.w + px);
          if (Math.abs(S.d[i]! - cr) <= tol && Math.abs(S.d[i + 1]! - cg) <= tol && Math.abs(S.d[i + 2]! - cb) <= tol) n++;
        }
      return n;
    },
    { name, x, y, radius, hex, tol },
  );
}
