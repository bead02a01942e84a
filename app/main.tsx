/** Renderer entry: wires the app controller (store, clock, worker, bridge) and mounts React. */
// First, as the workers do: the CSP forbids eval, so zod must not probe it (no-eval.ts).
import './no-eval';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { getBridge } from './bridge';
import { App } from './ui/App';
import { createAppController } from './ui/appController';
import { pipelineWorkerCount, spawnPipelineWorker } from './ui/worker/pipelineWorkers';
import { takePrestartedPass } from './ui/worker/prestart';
import demo from '../assets/lumen6-imaging.scenario.json';
import './ui/styles.css';

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

const app = createAppController({
  bridge: getBridge(),
  spawnWorker: spawnPipelineWorker,
  fallbackScenario: demo,
  fallbackName: 'lumen6-imaging.scenario.json',
  // Each pass is shared by the workers (pipelineWorkers.ts says how many).
  pipelineWorkers: pipelineWorkerCount(),
  // boot.ts has already posted the demo's pass; the controller's first request takes it over.
  prestarted: takePrestartedPass(),
});

// For the end-to-end tests and for debugging from the console: read-only handles, no globals
// the app itself depends on.
(window as unknown as { __slewsmith?: unknown }).__slewsmith = { store: app.store, clock: app.clock };

createRoot(container).render(
  <StrictMode>
    <App app={app} />
  </StrictMode>,
);
