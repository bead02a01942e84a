/**
 * Label textures shared between sprites (app/view3d/labels.ts): one canvas texture per text and
 * colour, freed with its last sprite. The outside contract checked is three.js's: a Texture's
 * 'dispose' event is what tells WebGLRenderer to free its GPU copy (three.js docs, Texture.dispose
 * and EventDispatcher), so it must fire exactly once, after the last user's disposeTree, and a
 * label made after that must get a fresh texture. Node has no canvas: a minimal OffscreenCanvas
 * stand-in (measureText returns 10 px per character, common practice for a stub, no source) is
 * installed for the factory.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Group, type Sprite, type SpriteMaterial } from 'three';
import { canvasLabelFactory } from '../../app/view3d/labels';
import { disposeTree } from '../../app/view3d/primitives';

class FakeCanvas {
  width: number;
  height: number;
  constructor(w: number, h: number) {
    this.width = w;
    this.height = h;
  }
  getContext() {
    const noop = () => {};
    return {
      measureText: (t: string) => ({ width: 10 * t.length }),
      strokeText: noop,
      fillText: noop,
    } as unknown as CanvasRenderingContext2D;
  }
}

const g = globalThis as { OffscreenCanvas?: unknown };
const had = g.OffscreenCanvas;
beforeAll(() => {
  g.OffscreenCanvas = FakeCanvas;
});
afterAll(() => {
  g.OffscreenCanvas = had;
});

const tex = (s: unknown) => ((s as Sprite).material as SpriteMaterial).map!;

describe('shared label textures', () => {
  it('same text and colour share one texture; it is freed once, with its last sprite', () => {
    const make = canvasLabelFactory()!;
    const a = make('X_B', { color: '#ff0000' });
    const b = make('X_B', { color: '#ff0000' });
    const other = make('X_B', { color: '#00ff00' });
    expect(tex(a)).toBe(tex(b));
    expect(tex(other)).not.toBe(tex(a));
    // The subscript and the size follow the text as before: width 8 + 10 + (10 + 2) + 8 = 38 px.
    expect((a as Sprite).userData.labelBase.hasSub).toBe(true);
    expect((a as Sprite).userData.labelBase.aspect).toBeCloseTo(38 / Math.ceil(44 * 1.45), 12);
    let freed = 0;
    tex(a).addEventListener('dispose', () => freed++);
    const ga = new Group().add(a);
    const gb = new Group().add(b);
    disposeTree(ga, null);
    expect(freed).toBe(0);
    disposeTree(gb, null);
    expect(freed).toBe(1);
    const c = make('X_B', { color: '#ff0000' });
    expect(tex(c)).not.toBe(tex(a));
  });
});
