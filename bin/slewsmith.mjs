#!/usr/bin/env node
// The `slewsmith` command. It runs the prebuilt bundle (dist/cli, `npm run build:cli`) when that
// exists and is not older than its sources, and otherwise the TypeScript CLI through tsx (a
// runtime dependency), so the command works straight after `npm ci` with no build step.
// bin/cli-bundle.mjs states the rule (SLEWSMITH_CLI=tsx|bundle forces one). main/cli/main.ts
// owns the streams, Ctrl-C and the exit status.
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chooseCli } from './cli-bundle.mjs';
import { prestartStudyWorkers } from './study-prestart.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const choice = chooseCli(root, process.env);
if (choice.kind === 'error') {
  process.stderr.write(`error: ${choice.message}\n`);
  process.exitCode = 2;
} else {
  let main;
  // A study's worker threads start loading now, beside the CLI's own load (bin/study-prestart.mjs).
  const workerFile =
    choice.kind === 'bundle' ? path.join(path.dirname(choice.entry), 'study-worker.mjs') : path.join(root, 'main/cli/study-worker.mjs');
  prestartStudyWorkers(process.argv.slice(2), pathToFileURL(workerFile));
  if (choice.kind === 'bundle') ({ main } = await import(pathToFileURL(choice.entry).href));
  else {
    const { register } = await import('tsx/esm/api');
    register();
    ({ main } = await import('../main/cli/main.ts'));
  }
  process.exitCode = await main(process.argv.slice(2));
}
