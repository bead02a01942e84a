/**
 * The bundled demo's certificates computed at build time (main/demo-certificates.ts; planted by
 * the pipeline worker, app/ui/worker/pipeline.worker.ts): the module the build emits evaluates to
 * entries equal to certificates computed here without a cache, a planted entry is what the
 * controller build then uses, and every change of a certificate input misses it.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import {
  certificateCacheEntries,
  clearCertificateCache,
  plantCertificateCache,
  type CertificateResult,
} from '../../app/engine/control/certificate';
import { buildControllers, buildVehicle } from '../../app/engine/pipeline/build';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { validateScenario } from '../../app/engine/scenario/validate';
import { certificateModuleSource, literal, scenarioCertificateEntries, type CertificateEntries } from '../../main/demo-certificates';
import demo from '../../assets/lumen6-imaging.scenario.json';

/** The certificates building a scenario's controllers gives, by controller id (null: none). */
function builtCertificates(json: unknown): Record<string, CertificateResult | null> {
  const v = validateScenario(json);
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  const s = resolveScenario(v.value);
  const veh = buildVehicle(s.vehicle);
  if (!veh.ok) throw new Error('vehicle');
  const built = buildControllers(s.controllers, veh.value.design);
  if (!built.ok) throw new Error(JSON.stringify(built.errors));
  return Object.fromEntries(built.value.map((c) => [c.id, c.controller.certificate ?? null]));
}

/** Imports generated module source the way the bundle does (an ES module with a default export). */
async function importSource(source: string): Promise<CertificateEntries> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-cert-'));
  try {
    const file = path.join(dir, 'certificates.mjs');
    fs.writeFileSync(file, source);
    return ((await import(pathToFileURL(file).href)) as { default: CertificateEntries }).default;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

const synergisticIndex = demo.controllers.findIndex((c) => c.law === 'synergistic');
function withSynergistic(change: Record<string, unknown>): unknown {
  const s = structuredClone(demo) as { controllers: Record<string, unknown>[] };
  s.controllers[synergisticIndex] = { ...s.controllers[synergisticIndex]!, ...change };
  return s;
}

afterEach(() => clearCertificateCache());

describe('build-time certificates of the bundled demo', () => {
  it('literal() reads back as the same value, Infinity, NaN, -0 and Float64Array included', async () => {
    // Number::toString gives the shortest digits that read back as the same double (ECMA-262,
    // Number::toString); JSON would lose the non-finite values and -0.
    let seed = 7;
    const rand = () => ((seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 4294967296 - 0.5) * 10 ** ((seed % 40) - 20);
    const doubles = Array.from({ length: 500 }, rand);
    const value = {
      doubles,
      odd: [Infinity, -Infinity, NaN, -0, 0, Number.MIN_VALUE, Number.MAX_VALUE, 0.1 + 0.2],
      typed: Float64Array.from([1 / 3, -0, 5e-324]),
      text: 'δ* "quoted" \\ \u2028',
      nested: [{ a: null, b: true, c: [[1], []] }],
    };
    const back = (await importSource(`export default ${literal(value)};`)) as unknown as typeof value;
    back.doubles.forEach((x, i) => expect(Object.is(x, doubles[i])).toBe(true));
    expect(back.odd.map((x) => String(Object.is(x, -0) ? '-0' : x))).toEqual([
      'Infinity',
      '-Infinity',
      'NaN',
      '-0',
      '0',
      '5e-324',
      '1.7976931348623157e+308',
      '0.30000000000000004',
    ]);
    expect(back.typed).toBeInstanceOf(Float64Array);
    expect(Object.is(back.typed[1], -0)).toBe(true);
    expect(back.text).toBe(value.text);
    expect(back.nested).toEqual(value.nested);
    expect(() => literal(new Map())).toThrow(/not plain data/);
  });

  it('the emitted entries equal certificates computed without a cache, and the build uses them', async () => {
    const entries = await importSource(certificateModuleSource(scenarioCertificateEntries(demo)));
    expect(entries.length).toBe(demo.controllers.filter((c) => c.law === 'synergistic').length);
    clearCertificateCache();
    const computed = builtCertificates(demo);
    const syn = demo.controllers[synergisticIndex]!.id;
    expect(computed[syn]?.admissible).toBe(true);
    expect(entries[0]![1]).toEqual(computed[syn]);

    // Planted: the build takes the entry (a marked copy proves it is the entry that is used).
    clearCertificateCache();
    const marked = entries.map(([k, r]) => [k, { ...r, summary: 'planted entry' }] as [string, CertificateResult]);
    plantCertificateCache(marked);
    expect(builtCertificates(demo)[syn]?.summary).toBe('planted entry');
    // And the real entries give what the computation gives.
    clearCertificateCache();
    plantCertificateCache(entries);
    expect(builtCertificates(demo)[syn]).toEqual(computed[syn]);
  }, 60_000);

  it('any change of a certificate input misses the planted entry and computes its own', () => {
    const entries = scenarioCertificateEntries(demo);
    expect(entries).toHaveLength(1);
    const [plantedKey] = entries[0]!;
    const marked: CertificateEntries = [[plantedKey, { ...entries[0]![1], summary: 'planted entry' }]];
    const moved = structuredClone(demo) as { controllers: unknown[] };
    moved.controllers.reverse(); // the controller's place is in the key too (its issues name the field)
    const changes: unknown[] = [
      withSynergistic({ gapThreshold: 0.024 }),
      withSynergistic({ warpGain: 1.1 }),
      withSynergistic({ potentialWeights: [0.125, 0.25, 0.4] }),
      moved,
    ];
    for (const changed of changes) {
      const own = scenarioCertificateEntries(changed); // computed without a cache
      expect(own).toHaveLength(1);
      const [key, result] = own[0]!;
      expect(key).not.toBe(plantedKey);
      // With the marked entry planted, building the changed scenario computes its own certificate.
      clearCertificateCache();
      plantCertificateCache(marked);
      const v = validateScenario(changed);
      if (!v.ok) throw new Error(JSON.stringify(v.errors));
      const s = resolveScenario(v.value);
      const veh = buildVehicle(s.vehicle);
      if (!veh.ok) throw new Error('vehicle');
      buildControllers(s.controllers, veh.value.design); // may refuse the law: the certificate is computed all the same
      const after = new Map(certificateCacheEntries());
      expect(after.get(plantedKey)?.summary).toBe('planted entry');
      expect(after.get(key)).toEqual(result);
      expect(result.summary).not.toBe('planted entry');
    }
  }, 120_000);
});
