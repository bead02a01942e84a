/**
 * The page's first script (app/index.html): it starts the pipeline workers on the bundled demo
 * now (worker/prestart.ts), then loads the app (main.tsx, a chunk of its own). The workers fetch,
 * compile and fly the demo while the main thread fetches, compiles and runs the app, instead of
 * after it; the app's first request takes the pass over when it is the same pass, which it is
 * unless the shell or a test changed what the app starts with.
 *
 * Nothing here uses zod (main.tsx imports no-eval.ts first, before any schema exists).
 */
import { pipelineWorkerCount, spawnPipelineWorker } from './ui/worker/pipelineWorkers';
import { prestartDemoPass } from './ui/worker/prestart';

prestartDemoPass(spawnPipelineWorker, pipelineWorkerCount());

void import('./main');
