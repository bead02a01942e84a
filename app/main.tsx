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
import demoValidation from 'virtual:slewsmith-demo-validation';
import { plantValidation } from './engine/scenario/knownValidation';
import { validateScenarioAfresh } from './engine/scenario/validate';
import './ui/styles.css';

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

// The demo's validation made at build time (main/demo-validation.ts): the first screen does not
// validate the demo again; any other scenario, or the demo once edited, is validated as before.
plantValidation(...demoValidation);

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

// Once the first pass is shown, the validator's first run on the demo in idle time, so that the
// first edit does not pay for it (the planted validation above skipped it at start).
const offWarm = app.store.subscribe(() => {
  if (app.store.getState().output === null) return;
  offWarm();
  requestIdleCallback(() => void validateScenarioAfresh(demo), { timeout: 2000 });
});

// For the end-to-end tests and for debugging from the console: read-only handles, no globals
// the app itself depends on.
(window as unknown as { __slewsmith?: unknown }).__slewsmith = { store: app.store, clock: app.clock };

createRoot(container).render(
  <StrictMode>
    <App app={app} />
  </StrictMode>,
);
