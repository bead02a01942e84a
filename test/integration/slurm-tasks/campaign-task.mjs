// Entry of a Slurm task in the integration test: Slurm runs plain `node`, so register tsx here
// (resolved from this file, whatever the working directory) and load the TypeScript task.
import { register } from 'tsx/esm/api';

register();
await import('./campaign-task.ts');
