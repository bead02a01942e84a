/** The renderer's pipeline workers: how to start one, and how many share each pass. */
import type { WorkerLike } from './client';

/** `name` (default 'pipeline'): prestart.ts names the workers that fly the demo at start. */
export function spawnPipelineWorker(name = 'pipeline'): WorkerLike {
  return new Worker(new URL('./pipeline.worker.ts', import.meta.url), { type: 'module', name }) as unknown as WorkerLike;
}

/**
 * One per core beyond the two the window's own processes keep busy (renderer, compositor/GPU), up
 * to 4. Measured on a 2-core machine in Chromium, a second worker made no edit faster (engine
 * 104–135 ms against 117–122 ms) and the cold start slower.
 */
export function pipelineWorkerCount(): number {
  return Math.max(1, Math.min(4, (navigator.hardwareConcurrency || 1) - 2));
}
