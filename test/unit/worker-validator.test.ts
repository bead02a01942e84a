/**
 * The pipeline worker's lazily loaded validator (app/ui/worker/workerValidator.ts): the bundled
 * demo, whose validation is planted as the worker plants it, flies without loading the validator
 * (so without zod's schemas); an edited demo waits for the validator and gets the same result —
 * the same field-named messages — as the pipeline with validateScenario bound (run.ts), as does an
 * input the validator refuses outright. And the worker's script reaches neither the validator nor
 * zod through its static imports (they would be built at the worker's start). (Plumbing, no
 * outside source: the reference is the validator itself.)
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { Result } from '../../app/engine/errors';
import { createOrbitViewCache } from '../../app/engine/orbit/viewSamplesCache';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { clearKnownValidations, plantValidation } from '../../app/engine/scenario/knownValidation';
import { validateScenarioAfresh } from '../../app/engine/scenario/validate';
import { answerRunWith } from '../../app/ui/worker/answerPass';
import type { RunReply, RunRequest } from '../../app/ui/worker/protocol';
import { loadValidator, validatorLoaded, validatorNow } from '../../app/ui/worker/workerValidator';

const demoText = fs.readFileSync(new URL('../../assets/lumen6-imaging.scenario.json', import.meta.url), 'utf8');
const demo = (): Record<string, unknown> => JSON.parse(demoText) as Record<string, unknown>;
const OPTIONS = { controllers: ['pd'], modes: ['follow-plan' as const] };

function request(scenario: unknown): RunRequest {
  return { type: 'run', id: 7, scenario, options: OPTIONS };
}

/** The worker's answer to `scenario`, as pipeline.worker.ts gives it (now, or after loading the validator). */
async function workerAnswer(scenario: unknown): Promise<{ loadedBefore: boolean; result: Result<PipelineOutput> }> {
  const loadedBefore = validatorLoaded();
  const replies: RunReply[] = [];
  const post = (r: RunReply) => replies.push(r);
  const now = validatorNow(scenario);
  const validate = now ?? (await loadValidator()).validateScenario;
  answerRunWith(validate, request(scenario), post, { orbitViewCache: createOrbitViewCache() });
  expect(replies.map((r) => r.type)).toEqual(['result']);
  return { loadedBefore, result: (replies[0] as Extract<RunReply, { type: 'result' }>).result };
}

const issuesOf = (r: Result<unknown>) => ({ errors: r.ok ? [] : r.errors, warnings: r.warnings });

afterEach(() => clearKnownValidations());

// One test, in order: the validator module's state lives for the whole file.
describe('the pipeline worker validator', () => {
  it('flies the demo without loading the validator, then validates edits with the same messages', async () => {
    expect(validatorLoaded()).toBe(false);
    // Nothing planted: even the demo must wait for the validator.
    expect(validatorNow(demo())).toBeNull();
    plantValidation(demo(), validateScenarioAfresh(demo()));

    const first = await workerAnswer(demo());
    expect(first.result.ok).toBe(true);
    expect(validatorLoaded()).toBe(false);
    const reference = runPipeline(demo(), OPTIONS);
    expect(reference.ok).toBe(true);
    if (first.result.ok && reference.ok) {
      expect(first.result.value.runs.map((r) => r.key)).toEqual(reference.value.runs.map((r) => r.key));
      expect(first.result.value.comparison).toEqual(reference.value.comparison);
    }
    expect(issuesOf(first.result)).toEqual(issuesOf(reference));

    // An edit the schema refuses (a negative inertia entry): the validator is loaded for it.
    const edited = demo();
    const vehicle = edited.vehicle as { inertiaKgm2: number[][] };
    vehicle.inertiaKgm2[0]![0] = -1;
    expect(validatorNow(edited)).toBeNull();
    const second = await workerAnswer(edited);
    expect(second.loadedBefore).toBe(false);
    expect(validatorLoaded()).toBe(true);
    expect(second.result.ok).toBe(false);
    expect(issuesOf(second.result)).toEqual(issuesOf(runPipeline(edited, OPTIONS)));
    expect(JSON.stringify(issuesOf(second.result))).toContain('vehicle.inertiaKgm2');

    // Not a scenario at all: the format gate's message, as before.
    const notOurs = await workerAnswer({ format: 'something-else', version: 2 });
    expect(notOurs.result.ok).toBe(false);
    expect(issuesOf(notOurs.result)).toEqual(issuesOf(runPipeline({ format: 'something-else', version: 2 }, OPTIONS)));
    expect(JSON.stringify(issuesOf(notOurs.result))).toContain('format');

    // Loaded: the demo now goes through the validator itself (which still answers from the planted entry).
    expect(validatorNow(demo())).not.toBeNull();
  });
});

/**
 * Relative static imports of a TypeScript source (not `import type`, not dynamic import()), and
 * whether it imports zod. Good enough for our own sources (one import per statement, single quotes).
 */
function staticImports(file: string): { files: string[]; zod: boolean } {
  const src = fs.readFileSync(file, 'utf8');
  const files: string[] = [];
  let zod = false;
  for (const m of src.matchAll(/^(?:import|export)\s+(?!type\b)(?:[^;'"]*?\sfrom\s+)?'([^']+)'/gm)) {
    const spec = m[1]!;
    if (spec === 'zod' || spec.startsWith('zod/')) zod = true;
    if (!spec.startsWith('.')) continue;
    const base = path.resolve(path.dirname(file), spec);
    const found = [base, `${base}.ts`, `${base}.tsx`, path.join(base, 'index.ts')].find((f) => fs.existsSync(f) && fs.statSync(f).isFile());
    if (found && /\.tsx?$/.test(found)) files.push(found);
  }
  return { files, zod };
}

describe("the pipeline worker's static imports", () => {
  it('reach neither zod nor the validator (only the dynamic import does)', () => {
    const entry = path.resolve('app/ui/worker/pipeline.worker.ts');
    const seen = new Set<string>([entry]);
    const queue = [entry];
    const withZod: string[] = [];
    while (queue.length) {
      const f = queue.shift()!;
      const { files, zod } = staticImports(f);
      if (zod) withZod.push(path.relative(process.cwd(), f));
      for (const g of files) {
        if (seen.has(g)) continue;
        seen.add(g);
        queue.push(g);
      }
    }
    const reached = [...seen].map((f) => path.relative(process.cwd(), f).split(path.sep).join('/'));
    // The walk follows the engine (the pipeline, the controllers, the orbit code).
    expect(reached).toContain('app/engine/pipeline/pass.ts');
    expect(reached.length).toBeGreaterThan(50);
    expect(withZod).toEqual([]);
    expect(reached.filter((f) => /scenario\/validate\.ts$|[sS]chema\.ts$|no-eval\.ts$|validatorChunk\.ts$/.test(f))).toEqual([]);
    // The same walk from the lazily loaded module finds them (so the walk can see them).
    const lazy = path.resolve('app/ui/worker/validatorChunk.ts');
    const seen2 = new Set<string>([lazy]);
    const queue2 = [lazy];
    let zodSeen = false;
    while (queue2.length) {
      const { files, zod } = staticImports(queue2.shift()!);
      zodSeen ||= zod;
      for (const g of files) {
        if (seen2.has(g)) continue;
        seen2.add(g);
        queue2.push(g);
      }
    }
    expect(zodSeen).toBe(true);
  });
});
