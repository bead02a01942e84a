#!/usr/bin/env node
// The `slewsmith` command: runs the TypeScript CLI through tsx (a runtime dependency), so the
// command works straight after `npm ci` with no build step.
import { register } from 'tsx/esm/api';

register();
const { runCli } = await import('../main/cli/index.ts');
const code = await runCli(process.argv.slice(2), {
  out: (s) => process.stdout.write(s + '\n'),
  err: (s) => process.stderr.write(s + '\n'),
});
process.exitCode = code;
