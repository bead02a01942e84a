/**
 * What both 3D scenes (attitude and orbit) keep around their canvas: the host's size followed by a
 * ResizeObserver, and a short "active" window after each pointer or wheel event, during which the
 * scene is drawn every frame so the camera controls' damping settles.
 */
export interface CanvasUpkeep {
  /** True within 1.2 s of the last pointer or wheel event on the canvas. */
  active(): boolean;
  dispose(): void;
}

export function canvasUpkeep(canvas: HTMLCanvasElement, host: HTMLElement, onResize: (w: number, h: number) => void): CanvasUpkeep {
  let activeUntil = 0;
  const poke = () => {
    activeUntil = performance.now() + 1200;
  };
  canvas.addEventListener('pointerdown', poke);
  canvas.addEventListener('pointermove', poke);
  canvas.addEventListener('wheel', poke, { passive: true });
  const ro = new ResizeObserver(() => onResize(host.clientWidth, host.clientHeight));
  ro.observe(host);
  return {
    active: () => performance.now() < activeUntil,
    dispose() {
      ro.disconnect();
      canvas.removeEventListener('pointerdown', poke);
      canvas.removeEventListener('pointermove', poke);
      canvas.removeEventListener('wheel', poke);
    },
  };
}
