/**
 * The bundled demo's certificate cache entries, made at build time (vite.config.ts,
 * main/demo-certificates.ts) for the pipeline worker to plant (pipeline.worker.ts).
 */
declare module 'virtual:slewsmith-demo-certificates' {
  import type { CertificateResult } from '../../engine/control/certificate';
  const entries: [string, CertificateResult][];
  export default entries;
}
