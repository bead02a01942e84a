#!/usr/bin/env node
// The `slewsmith` command: runs the TypeScript CLI through tsx (a runtime dependency), so the
// command works straight after `npm ci` with no build step. main/cli/main.ts owns the streams,
// Ctrl-C and the exit status.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../main/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
