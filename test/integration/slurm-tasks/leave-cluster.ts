/** Start a cluster, print what it started as one JSON line, then wait to be killed. */
import { startSlurmCluster } from '../slurm-cluster';

const c = await startSlurmCluster();
console.log(JSON.stringify({ dir: c.dir, conf: c.conf, pids: c.pids }));
setInterval(() => {}, 1 << 30);
