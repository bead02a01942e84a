// Entry of a sweep worker thread. Worker threads start without the parent's TypeScript loader, so
// register tsx here (resolved from this file, whatever the working directory) and then load the
// TypeScript worker.
import { register } from 'tsx/esm/api';

register();
await import('./sweep-worker.ts');
