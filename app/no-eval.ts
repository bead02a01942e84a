/**
 * Loaded by app/index.html ahead of the renderer entry and imported first by every worker entry: the CSP
 * forbids eval, so zod's compiled fast path can never run here. `jitless` also skips zod's
 * `new Function` probe, which a strict CSP reports as a violation even though zod catches it.
 */
import { config } from 'zod';

config({ jitless: true });
