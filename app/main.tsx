/** Renderer entry: wires the app controller (store, clock, worker, bridge) and mounts React. */
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { getBridge } from './bridge';
import { App } from './ui/App';
import { createAppController } from './ui/appController';
import type { WorkerLike } from './ui/worker/client';
import demo from '../assets/lumen6-imaging.scenario.json';
import './ui/styles.css';

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

const app = createAppController({
  bridge: getBridge(),
  spawnWorker: () =>
    new Worker(new URL('./ui/worker/pipeline.worker.ts', import.meta.url), { type: 'module', name: 'pipeline' }) as unknown as WorkerLike,
  fallbackScenario: demo,
  fallbackName: 'lumen6-imaging.scenario.json',
  // Each pass is shared by the workers: one per core beyond the two the window's own processes
  // keep busy (renderer, compositor/GPU), up to 4. Measured on a 2-core machine in Chromium, a
  // second worker made no edit faster (engine 104–135 ms against 117–122 ms) and the cold start slower.
  pipelineWorkers: Math.max(1, Math.min(4, (navigator.hardwareConcurrency || 1) - 2)),
});

// For the end-to-end tests and for debugging from the console: read-only handles, no globals
// the app itself depends on.
(window as unknown as { __slewsmith?: unknown }).__slewsmith = { store: app.store, clock: app.clock };

createRoot(container).render(
  <StrictMode>
    <App app={app} />
  </StrictMode>,
);
