/**
 * The study context built once by the coordinator (study/contextSeed.ts): the certificates it
 * computed travel to the workers as plain data, and a worker that plants them builds the same
 * context without computing them again.
 *
 * References: the worker computing its own certificates (the path before the seed existed) and
 * Node's structured clone (the HTML standard's StructuredSerialize, as postMessage uses it).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { threadPort } from '../../main/cli/study';
import { startStudyParallel } from '../../app/engine/study/parallel';
import { plantStudyContextSeed, studyContextSeed } from '../../app/engine/study/contextSeed';
import { makeStudyContext } from '../../app/engine/study/context';
import { clearCertificateCache, certificateCacheEntries } from '../../app/engine/control/certificate';
import { clearSphereCertificateCache } from '../../app/engine/control/sphere';
import { summaryJson } from '../../app/engine/study/export';

const root = path.resolve(__dirname, '../..');
const load = (name: string) => JSON.parse(readFileSync(path.join(root, 'assets', name), 'utf8')) as Record<string, unknown>;
const tern = load('tern12-reversal.scenario.json');
const petrel = load('petrel16-pointing.scenario.json');
const small = (json: Record<string, unknown>, runs: number) => ({
  ...json,
  study: { ...(json.study as object), runs, controllers: ['hyst', 'syn'] },
});

const clearAll = () => {
  clearCertificateCache();
  clearSphereCertificateCache();
};

const threads: ReturnType<typeof threadPort>[] = [];
function ports(n: number) {
  const t = Array.from({ length: n }, () => threadPort());
  threads.push(...t);
  return t.map((x) => x.port);
}
afterAll(async () => {
  await Promise.all(threads.map((t) => t.worker.terminate()));
});

describe('studyContextSeed', () => {
  it('holds the certificates of the SO(3) and sphere families as structured-clone-able data', () => {
    clearAll();
    const s = studyContextSeed(tern, { controllers: ['syn'] });
    expect(s.certificates.length).toBe(1);
    // Reference: what the worker would compute itself, with an empty cache.
    const [key, planted] = s.certificates[0]!;
    clearAll();
    makeStudyContext(tern, { controllers: ['syn'] });
    const own = certificateCacheEntries();
    expect(own.map(([k]) => k)).toEqual([key]);
    expect(planted).toEqual(own[0]![1]);
    // Survives the structured clone of postMessage unchanged (Infinity, nested arrays, strings).
    expect(structuredClone(s)).toEqual(s);
    clearAll();
    const p = studyContextSeed(petrel, {});
    expect(p.sphereCertificates.length).toBeGreaterThan(0);
    expect(structuredClone(p)).toEqual(p);
  });

  it('a planted certificate is used instead of computed: a planted refusal refuses the study', () => {
    clearAll();
    const s = studyContextSeed(tern, { controllers: ['syn'] });
    const [key, good] = s.certificates[0]!;
    expect(good.admissible).toBe(true);
    clearAll();
    // A tampered result under the real key: if the worker recomputed, the study would be valid.
    const planted = {
      ...good,
      certified: false,
      admissible: false,
      deltaStar: 0,
      issues: [{ path: 'controllers[4]', rule: 'planted', message: 'planted refusal' }],
    };
    plantStudyContextSeed({ certificates: [[key, planted]], sphereCertificates: [] });
    const c = makeStudyContext(tern, { controllers: ['syn'] });
    clearAll();
    expect(c.ok).toBe(false);
    expect(!c.ok && c.errors.some((e) => e.message.includes('planted refusal'))).toBe(true);
    // And the real computation, for the same key, is admissible (the seed, not the file, refused it).
    expect(makeStudyContext(tern, { controllers: ['syn'] }).ok).toBe(true);
  });

  it('the same study bytes with and without the seed, for 1 and 2 worker threads', async () => {
    const json = small(tern, 5);
    const seed = studyContextSeed(json, {});
    const runs = [
      await startStudyParallel(json, ports(1), { chunkSize: 1 }).result,
      await startStudyParallel(json, ports(2), { chunkSize: 1 }).result,
      await startStudyParallel(json, ports(2), { chunkSize: 2, contextSeed: seed }).result,
    ];
    const texts = runs.map((r) => {
      if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
      return summaryJson(r.value.info, r.value.summary, r.value.map);
    });
    expect(texts[0]!.length).toBeGreaterThan(1000);
    for (const t of texts.slice(1)) expect(t).toBe(texts[0]);
  });
});
