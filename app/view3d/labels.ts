/**
 * Text labels as sprites with canvas textures (constant size on screen). A label factory is
 * injected into the scene model so the model also builds in Node (tests, benchmark), where no
 * canvas exists: there the factory is null and labels are simply not built.
 */
import { CanvasTexture, LinearFilter, SRGBColorSpace, Sprite, SpriteMaterial } from 'three';
import type { Object3D } from 'three';
import { CAMERA_FOV_DEG, SIZES } from './style';

export interface LabelStyle {
  /** CSS colour of the text. */
  color: string;
  /** Screen height as a fraction of the viewport height (default SIZES.labelHeight). */
  heightFraction?: number;
  /** Which point of the label sits at its position: (0, 0.5) left-middle, (0.5, 0.5) centre… */
  anchorX?: number;
  anchorY?: number;
  /**
   * For a HUD drawn with an orthographic camera whose view spans y ∈ [−1, 1]: the scale is then
   * 2·heightFraction instead of the perspective formula.
   */
  screenSpace?: boolean;
}

/** Makes a label object for `text`; "X_I" draws I as a subscript. */
export type LabelFactory = (text: string, style: LabelStyle) => Object3D;

type Canvas2D = { width: number; height: number; getContext(id: '2d'): CanvasRenderingContext2D | null };

function makeCanvas(): Canvas2D | null {
  if (typeof document !== 'undefined' && typeof document.createElement === 'function') {
    return document.createElement('canvas');
  }
  if (typeof OffscreenCanvas !== 'undefined') return new OffscreenCanvas(1, 1) as unknown as Canvas2D;
  return null;
}

const FONT_PX = 44;
/** Subscript size relative to the main text. */
const SUB_RATIO = 0.8;
/** Label canvas height over the main glyph size (room for descenders and the outline). */
const LINE_RATIO = 1.45;
/** Smallest text on screen, px (issue 10: canvas labels at least 11 px at 1280×800). */
export const MIN_LABEL_TEXT_PX = 11;
const FONT = 'system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';

/**
 * A sprite-label factory when the environment can draw on a canvas, otherwise null.
 * Sprites use `sizeAttenuation: false`, so for a perspective camera the on-screen height fraction
 * is scale.y · P₁₁ / 2 with P₁₁ = 1/tan(fov/2); the scale is set from CAMERA_FOV_DEG.
 */
export function canvasLabelFactory(): LabelFactory | null {
  if (!makeCanvas()) return null;
  const p11 = 1 / Math.tan((CAMERA_FOV_DEG * Math.PI) / 360);
  /**
   * Textures by text and colour, shared by every sprite showing them: a new run set (every edit)
   * builds its triads and tags again, and drawing and uploading the same text each time cost more
   * than the rest of the swap. Counted: disposing a sprite's material (disposeTree) releases one
   * use, and the texture is freed with its last one.
   */
  const shared = new Map<string, { tex: CanvasTexture; width: number; height: number; uses: number }>();
  const textureFor = (text: string, color: string) => {
    const key = `${color}|${text}`;
    let e = shared.get(key);
    if (!e) {
      const drawn = drawLabel(text, color);
      const entry = { ...drawn, uses: 0 };
      const free = drawn.tex.dispose.bind(drawn.tex);
      drawn.tex.dispose = () => {
        if (--entry.uses > 0) return;
        shared.delete(key);
        free();
      };
      shared.set(key, entry);
      e = entry;
    }
    e.uses++;
    return e;
  };
  return (text, style) => {
    const { tex, width, height } = textureFor(text, style.color);
    const us = text.indexOf('_');
    const mat = new SpriteMaterial({ map: tex, sizeAttenuation: false, depthTest: false, depthWrite: false, transparent: true });
    const sprite = new Sprite(mat);
    const frac = style.heightFraction ?? SIZES.labelHeight;
    const sy = style.screenSpace ? 2 * frac : (2 * frac) / p11;
    sprite.scale.set((sy * width) / height, sy, 1);
    const base: LabelBase = { sy, frac, aspect: width / height, hasSub: us >= 0 && us < text.length - 1, px: 0 };
    sprite.userData.labelBase = base;
    sprite.center.set(style.anchorX ?? 0.5, style.anchorY ?? 0.5);
    sprite.renderOrder = 10;
    sprite.name = `label:${text}`;
    return sprite;
  };
}

/** The label's texture: main text with an optional subscript after '_', outlined for contrast. */
function drawLabel(text: string, color: string): { tex: CanvasTexture; width: number; height: number } {
  const canvas = makeCanvas()!;
  const ctx = canvas.getContext('2d')!;
  const us = text.indexOf('_');
  const main = us >= 0 ? text.slice(0, us) : text;
  const sub = us >= 0 ? text.slice(us + 1) : '';
  const mainFont = `600 ${FONT_PX}px ${FONT}`;
  const subFont = `600 ${Math.round(FONT_PX * SUB_RATIO)}px ${FONT}`;
  ctx.font = mainFont;
  const wMain = ctx.measureText(main).width;
  ctx.font = subFont;
  const wSub = sub ? ctx.measureText(sub).width + 2 : 0;
  const pad = 8;
  const h = Math.ceil(FONT_PX * LINE_RATIO);
  canvas.width = Math.ceil(wMain + wSub + 2 * pad);
  canvas.height = h;
  // Resizing resets the context state.
  ctx.textBaseline = 'middle';
  ctx.lineJoin = 'round';
  ctx.lineWidth = 7;
  ctx.strokeStyle = 'rgba(10, 12, 16, 0.85)';
  ctx.fillStyle = color;
  ctx.font = mainFont;
  ctx.strokeText(main, pad, h * 0.45);
  ctx.fillText(main, pad, h * 0.45);
  if (sub) {
    ctx.font = subFont;
    ctx.strokeText(sub, pad + wMain + 2, h * 0.62);
    ctx.fillText(sub, pad + wMain + 2, h * 0.62);
  }
  const tex = new CanvasTexture(canvas as unknown as HTMLCanvasElement);
  tex.colorSpace = SRGBColorSpace;
  tex.minFilter = LinearFilter;
  tex.generateMipmaps = false;
  return { tex, width: canvas.width, height: canvas.height };
}

interface LabelBase {
  /** Scale at the design height fraction. */
  sy: number;
  frac: number;
  /** Canvas width / height. */
  aspect: number;
  hasSub: boolean;
  /** The viewport height the scale was last set for, px. */
  px: number;
}

/**
 * Keeps every label under `root` readable: a label's design height is a fraction of the viewport,
 * so in a small viewport its text would shrink below MIN_LABEL_TEXT_PX; it is then scaled up so
 * that the smallest glyph (the subscript when there is one) stays at that size.
 * `viewportPx` is the viewport height in CSS px times the camera zoom (1 for a HUD).
 */
export function keepLabelsReadable(root: Object3D, viewportPx: number): void {
  if (!(viewportPx > 0)) return;
  root.traverse((o) => {
    const b = o.userData.labelBase as LabelBase | undefined;
    if (!b || b.px === viewportPx) return;
    b.px = viewportPx;
    // On-screen main glyph height = frac · viewportPx / LINE_RATIO.
    const minMain = MIN_LABEL_TEXT_PX / (b.hasSub ? SUB_RATIO : 1);
    const need = (minMain * LINE_RATIO) / viewportPx;
    const k = Math.max(1, need / b.frac);
    o.scale.set(b.sy * k * b.aspect, b.sy * k, 1);
  });
}
