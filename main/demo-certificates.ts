/**
 * The bundled demo's synergy-gap certificates, computed at build time for the renderer's pipeline
 * worker (vite.config.ts turns them into a module the worker plants in its certificate cache).
 * A certificate costs the cold worker some 200 ms of its first pass; the demo is what every first
 * start flies. The cache key (control/certificate.ts) holds every number the certificate depends
 * on (family, δ, options with the field path), and the entries come from the same sources as the
 * worker, built together; a changed scenario computes its own certificate as before.
 *
 * Run directly, it prints the module source: `node --import tsx main/demo-certificates.ts <scenario>`.
 */
import fs from 'node:fs';
import { pathToFileURL } from 'node:url';
import { certificateCacheEntries, clearCertificateCache, type CertificateResult } from '../app/engine/control/certificate';
import { buildControllers, buildVehicle } from '../app/engine/pipeline/build';
import { resolveScenario } from '../app/engine/scenario/resolve';
import { validateScenario } from '../app/engine/scenario/validate';

export type CertificateEntries = [string, CertificateResult][];

/** Every certificate building the scenario's controllers computes (empty for an invalid scenario). */
export function scenarioCertificateEntries(json: unknown): CertificateEntries {
  const valid = validateScenario(json);
  if (!valid.ok) return [];
  const s = resolveScenario(valid.value);
  const vehicle = buildVehicle(s.vehicle);
  if (!vehicle.ok) return [];
  clearCertificateCache();
  buildControllers(s.controllers, vehicle.value.design);
  const entries = certificateCacheEntries();
  clearCertificateCache();
  return entries;
}

/**
 * Plain data as a JavaScript expression that evaluates to an equal value: JSON would turn
 * Infinity and NaN into null, -0 into 0 and a Float64Array into an object. String(x) of a double
 * reads back as the same double (ECMAScript Number::toString, shortest round-trip digits).
 */
export function literal(v: unknown): string {
  if (typeof v === 'number') return Object.is(v, -0) ? '-0' : String(v);
  if (v === undefined) return 'undefined';
  if (v === null || typeof v === 'boolean' || typeof v === 'string') return JSON.stringify(v);
  if (v instanceof Float64Array) return `new Float64Array([${Array.from(v, literal).join(',')}])`;
  if (Array.isArray(v)) return `[${v.map(literal).join(',')}]`;
  if (typeof v === 'object' && Object.getPrototypeOf(v) === Object.prototype)
    return `{${Object.entries(v as Record<string, unknown>)
      .map(([k, x]) => `${JSON.stringify(k)}:${literal(x)}`)
      .join(',')}}`;
  throw new Error(`not plain data: ${Object.prototype.toString.call(v)}`);
}

/** The module the worker imports: `export default [[key, result], …]`. */
export function certificateModuleSource(entries: CertificateEntries): string {
  return `export default ${literal(entries)};\n`;
}

if (process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url) {
  const file = process.argv[2];
  if (!file) throw new Error('usage: node --import tsx main/demo-certificates.ts <scenario.json>');
  process.stdout.write(certificateModuleSource(scenarioCertificateEntries(JSON.parse(fs.readFileSync(file, 'utf8')))));
}
