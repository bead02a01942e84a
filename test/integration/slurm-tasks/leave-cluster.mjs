// A test process that starts a cluster and is then killed without stopping it (the integration
// test checks that the next start or `cleanup` removes what it left behind).
import { register } from 'tsx/esm/api';

register();
await import('./leave-cluster.ts');
